//! The only module that runs SQL.
//!
//! SQLite is blocking, so every use of the connection runs on tokio's blocking pool
//! through [`Store::run`]. One connection serves everything: SQLite allows one writer
//! at a time anyway, and a single connection behind a mutex makes "check the client id,
//! then insert" atomic without extra locking. The mutex is a `std` mutex held only
//! inside the blocking closure, never across an `.await`.

mod migrate;
pub mod observations;
pub mod occurrences;
pub mod duplicates;
pub mod people;
pub mod review;
pub mod synthetic;
pub mod walks;

use std::path::Path;
use std::sync::{Arc, Mutex};

use rusqlite::Connection;

#[derive(Debug, thiserror::Error)]
pub enum StoreError {
    #[error("database error: {0}")]
    Sqlite(#[from] rusqlite::Error),
    #[error("stored data could not be read back: {0}")]
    Corrupt(String),
    #[error("migration {name} failed: {source}")]
    Migration { name: &'static str, source: rusqlite::Error },
    #[error("the database task stopped unexpectedly")]
    TaskGone,
}

/// A handle to the database; cheap to clone.
#[derive(Clone)]
pub struct Store {
    conn: Arc<Mutex<Connection>>,
}

impl Store {
    /// Opens the database file, turns on WAL and full syncs, and applies migrations.
    pub fn open(path: &Path) -> Result<Self, StoreError> {
        let mut conn = Connection::open(path)?;
        // WAL lets readers work while one writer writes; `synchronous = FULL` makes a
        // commit durable before we answer 2xx (NORMAL may lose the last commits on
        // power loss, which would break "received by the server" on the phone).
        conn.pragma_update(None, "journal_mode", "WAL")?;
        conn.pragma_update(None, "synchronous", "FULL")?;
        conn.pragma_update(None, "foreign_keys", "ON")?;
        conn.busy_timeout(std::time::Duration::from_secs(5))?;
        migrate::apply(&mut conn)?;
        Ok(Self { conn: Arc::new(Mutex::new(conn)) })
    }

    /// Runs `work` with the connection on a blocking thread.
    pub async fn run<T, F>(&self, work: F) -> Result<T, StoreError>
    where
        T: Send + 'static,
        F: FnOnce(&mut Connection) -> Result<T, StoreError> + Send + 'static,
    {
        let conn = Arc::clone(&self.conn);
        tokio::task::spawn_blocking(move || {
            // A panic in another closure poisons the mutex; the connection itself is
            // still sound (SQLite rolls back an unfinished transaction), so go on.
            let mut guard = conn.lock().unwrap_or_else(|poisoned| poisoned.into_inner());
            work(&mut guard)
        })
        .await
        .map_err(|_| StoreError::TaskGone)?
    }

    /// Runs `work` on the calling thread, for the command line (no runtime needed).
    pub fn run_here<T>(&self, work: impl FnOnce(&mut Connection) -> Result<T, StoreError>) -> Result<T, StoreError> {
        let mut guard = self.conn.lock().unwrap_or_else(|poisoned| poisoned.into_inner());
        work(&mut guard)
    }
}
