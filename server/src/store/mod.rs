//! The only module that runs SQL.
//!
//! SQLite is blocking, so every use of a connection runs on tokio's blocking pool.
//! One read-write connection serves every request through [`Store::run`]: SQLite allows
//! one writer at a time anyway, and a single connection behind a mutex makes "check the
//! client id, then insert" atomic without extra locking. The mutex is a `std` mutex held
//! only inside the blocking closure, never across an `.await`.
//!
//! Long reads that may wait on a slow client (exports streamed over HTTP) must not hold
//! that mutex, or one stalled download would stop every submission. They run through
//! [`Store::read`] on read-only connections of their own: in WAL mode readers and the
//! writer work at the same time, each reader seeing the database as it was when its read
//! began. At most [`MAX_READERS`] run at once; more wait their turn.

pub mod duplicates;
pub mod fieldwork;
mod migrate;
pub mod notifications;
pub mod observations;
pub mod occurrences;
pub mod people;
pub mod review;
pub mod synthetic;
pub mod walks;

use std::path::{Path, PathBuf};
use std::sync::{Arc, Mutex};

use rusqlite::{Connection, OpenFlags};

/// How many long reads may run at once, each on its own read-only connection.
pub const MAX_READERS: usize = 4;

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
    path: PathBuf,
    /// Idle read-only connections, kept for the next long read.
    readers: Arc<Mutex<Vec<Connection>>>,
    /// Turns for long reads.
    reading: Arc<tokio::sync::Semaphore>,
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
        Ok(Self {
            conn: Arc::new(Mutex::new(conn)),
            path: path.to_owned(),
            readers: Arc::new(Mutex::new(Vec::new())),
            reading: Arc::new(tokio::sync::Semaphore::new(MAX_READERS)),
        })
    }

    /// Runs `work` on a read-only connection of its own, on a blocking thread, without
    /// holding the writer's mutex: for long reads such as exports, which may block while
    /// a slow client catches up. Waits for a turn when [`MAX_READERS`] are running.
    pub async fn read<T, F>(&self, work: F) -> Result<T, StoreError>
    where
        T: Send + 'static,
        F: FnOnce(&Connection) -> Result<T, StoreError> + Send + 'static,
    {
        let turn = Arc::clone(&self.reading).acquire_owned().await.map_err(|_| StoreError::TaskGone)?;
        let store = self.clone();
        tokio::task::spawn_blocking(move || {
            let _turn = turn;
            let idle = store.readers.lock().unwrap_or_else(|poisoned| poisoned.into_inner()).pop();
            let conn = match idle {
                Some(conn) => conn,
                None => open_reader(&store.path)?,
            };
            let result = work(&conn);
            store.readers.lock().unwrap_or_else(|poisoned| poisoned.into_inner()).push(conn);
            result
        })
        .await
        .map_err(|_| StoreError::TaskGone)?
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

    /// Runs `work` on a read-only connection on the calling thread, for the command line.
    pub fn read_here<T>(&self, work: impl FnOnce(&Connection) -> Result<T, StoreError>) -> Result<T, StoreError> {
        work(&open_reader(&self.path)?)
    }

    /// Runs `work` on the calling thread, for the command line (no runtime needed).
    pub fn run_here<T>(&self, work: impl FnOnce(&mut Connection) -> Result<T, StoreError>) -> Result<T, StoreError> {
        let mut guard = self.conn.lock().unwrap_or_else(|poisoned| poisoned.into_inner());
        work(&mut guard)
    }

    /// Whether the database answers a trivial query (for the health check).
    pub async fn ping(&self) -> Result<(), StoreError> {
        self.run(|conn| Ok(conn.query_row("SELECT 1", [], |_| Ok(()))?)).await
    }
}

/// A read-only connection to the database at `path` (already created and migrated by
/// [`Store::open`]).
fn open_reader(path: &Path) -> Result<Connection, StoreError> {
    let conn = Connection::open_with_flags(
        path,
        OpenFlags::SQLITE_OPEN_READ_ONLY | OpenFlags::SQLITE_OPEN_NO_MUTEX | OpenFlags::SQLITE_OPEN_URI,
    )?;
    conn.busy_timeout(std::time::Duration::from_secs(5))?;
    Ok(conn)
}
