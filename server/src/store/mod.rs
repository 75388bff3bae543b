//! The only module that runs SQL.
//!
//! SQLite is blocking, so no connection is ever used on an async task. One read-write
//! connection belongs to the writer thread (`writer.rs`), which runs every job sent to
//! it in turn: SQLite allows one writer at a time anyway, and one thread makes "check
//! the client id, then insert" atomic without extra locking. [`Store::run`] sends a job
//! that runs alone; [`Store::write`] one that joins a group commit, so submissions
//! arriving together share one durable commit (see `writer.rs`).
//!
//! Reads go elsewhere so they never queue behind writes. Short reads on a request's
//! way (who is calling, is this a resend) run through [`Store::look`] on pooled
//! read-only connections. Long reads that may wait on a slow client (exports streamed
//! over HTTP) run through [`Store::read`] on read-only connections of their own, at most
//! [`MAX_READERS`] at once, so one stalled download stops neither submissions nor other
//! reads. In WAL mode readers and the writer work at the same time, each reader seeing
//! the database as it was when its read began.

pub mod backup;
pub mod deployment;
pub mod duplicates;
pub mod fieldwork;
pub mod imports;
mod migrate;
pub mod notifications;
pub mod observations;
pub mod occurrences;
pub mod people;
pub mod review;
pub mod synthetic;
pub mod walks;
mod writer;

use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};
use std::sync::{Arc, Mutex, mpsc};

use rusqlite::{Connection, OpenFlags};

pub use writer::MAX_GROUP;

/// How many long reads may run at once, each on its own read-only connection.
pub const MAX_READERS: usize = 4;
/// How many short reads may run at once; idle connections kept for them.
pub const MAX_LOOKS: usize = 16;

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
    #[error("the database work panicked")]
    Panicked,
}

impl StoreError {
    /// The SQLite result code behind the error, if SQLite gave one.
    pub fn sqlite_code(&self) -> Option<rusqlite::ErrorCode> {
        match self {
            Self::Sqlite(err) | Self::Migration { source: err, .. } => err.sqlite_error_code(),
            _ => None,
        }
    }
}

/// A handle to the database; cheap to clone.
#[derive(Clone)]
pub struct Store {
    writer: mpsc::Sender<writer::Job>,
    path: PathBuf,
    /// Idle read-only connections, kept for the next long read.
    readers: Arc<Mutex<Vec<Connection>>>,
    /// Turns for long reads.
    reading: Arc<tokio::sync::Semaphore>,
    /// Idle read-only connections, kept for the next short read.
    lookers: Arc<Mutex<Vec<Connection>>>,
    /// Turns for short reads.
    looking: Arc<tokio::sync::Semaphore>,
    /// Jobs the writer has finished since the store opened, counted after each one's
    /// commit (see [`Store::changes`]).
    changes: Arc<AtomicU64>,
}

impl Store {
    /// Opens the database file, turns on WAL and full syncs, applies migrations and
    /// starts the writer thread.
    pub fn open(path: &Path) -> Result<Self, StoreError> {
        let mut conn = Connection::open(path)?;
        // WAL lets readers work while one writer writes; `synchronous = FULL` makes a
        // commit durable before we answer 2xx (NORMAL may lose the last commits on
        // power loss, which would break "received by the server" on the phone).
        conn.pragma_update(None, "journal_mode", "WAL")?;
        conn.pragma_update(None, "synchronous", "FULL")?;
        conn.pragma_update(None, "foreign_keys", "ON")?;
        conn.busy_timeout(std::time::Duration::from_secs(5))?;
        conn.set_prepared_statement_cache_capacity(STATEMENT_CACHE);
        migrate::apply(&mut conn)?;
        let writer = writer::start(conn).map_err(|err| StoreError::Corrupt(format!("starting the writer: {err}")))?;
        Ok(Self {
            writer,
            path: path.to_owned(),
            readers: Arc::new(Mutex::new(Vec::new())),
            reading: Arc::new(tokio::sync::Semaphore::new(MAX_READERS)),
            lookers: Arc::new(Mutex::new(Vec::new())),
            looking: Arc::new(tokio::sync::Semaphore::new(MAX_LOOKS)),
            changes: Arc::new(AtomicU64::new(0)),
        })
    }

    /// How many writes have finished since the store opened (work on the writer that
    /// changed no row is not counted). Each is counted after its commit, so a reader that
    /// notes this number before it reads sees every write up to it: an unchanged number
    /// means this process wrote nothing since (a cache of something read may be kept while
    /// it stays the same). Other processes' writes (`wrackline import`) are not counted;
    /// what they add waits for review, so it is not published until a reviewer here acts.
    pub fn changes(&self) -> u64 {
        self.changes.load(Ordering::SeqCst)
    }

    /// Where the database file is.
    pub fn path(&self) -> &Path {
        &self.path
    }

    /// Runs `work` on a read-only connection of its own, on a blocking thread, without
    /// waiting for the writer: for long reads such as exports, which may block while a
    /// slow client catches up. Waits for a turn when [`MAX_READERS`] are running.
    pub async fn read<T, F>(&self, work: F) -> Result<T, StoreError>
    where
        T: Send + 'static,
        F: FnOnce(&Connection) -> Result<T, StoreError> + Send + 'static,
    {
        pooled(&self.reading, &self.readers, &self.path, Reads::Long, work).await
    }

    /// Runs a short read (a lookup on a request's way in) on a pooled read-only
    /// connection: it sees every commit made before it began, and never waits for the
    /// writer or for long reads.
    pub async fn look<T, F>(&self, work: F) -> Result<T, StoreError>
    where
        T: Send + 'static,
        F: FnOnce(&Connection) -> Result<T, StoreError> + Send + 'static,
    {
        pooled(&self.looking, &self.lookers, &self.path, Reads::Short, work).await
    }

    /// Runs `work` alone on the writer's connection (it may open its own transaction).
    pub async fn run<T, F>(&self, work: F) -> Result<T, StoreError>
    where
        T: Send + 'static,
        F: FnOnce(&mut Connection) -> Result<T, StoreError> + Send + 'static,
    {
        let (reply, answer) = tokio::sync::oneshot::channel();
        let changes = self.changes.clone();
        self.send(writer::Job::Alone(Box::new(move |conn| {
            // Only work that changed rows counts as a write: a lookup run here (many
            // handlers' are) must not make caches of what is published build again.
            let before = conn.total_changes();
            let result = guarded(conn, work);
            if conn.total_changes() != before {
                changes.fetch_add(1, Ordering::SeqCst);
            }
            let _ = reply.send(result);
        })))?;
        answer.await.map_err(|_| StoreError::TaskGone)?
    }

    /// Runs `work` in the next group commit, in a savepoint of its own; answers once
    /// the group's commit is durable (or says that it failed). `work` must use
    /// savepoints, not transactions.
    pub async fn write<T, F>(&self, work: F) -> Result<T, StoreError>
    where
        T: Send + 'static,
        F: FnOnce(&mut Connection) -> Result<T, StoreError> + Send + 'static,
    {
        let (reply, answer) = tokio::sync::oneshot::channel();
        let changes = self.changes.clone();
        let job = writer::Typed {
            work: Some(work),
            result: None,
            // Called once the group's commit is over.
            reply: Box::new(move |result| {
                changes.fetch_add(1, Ordering::SeqCst);
                let _ = reply.send(result);
            }),
        };
        self.send(writer::Job::Grouped(Box::new(job)))?;
        answer.await.map_err(|_| StoreError::TaskGone)?
    }

    /// Runs `work` on a read-only connection on the calling thread, for the command line.
    pub fn read_here<T>(&self, work: impl FnOnce(&Connection) -> Result<T, StoreError>) -> Result<T, StoreError> {
        work(&open_reader(&self.path, Reads::Long)?)
    }

    /// Runs `work` alone on the writer's connection and waits for it on the calling
    /// thread, for the command line and start-up (no runtime needed).
    pub fn run_here<T, F>(&self, work: F) -> Result<T, StoreError>
    where
        T: Send + 'static,
        F: FnOnce(&mut Connection) -> Result<T, StoreError> + Send + 'static,
    {
        let (reply, answer) = mpsc::channel();
        let changes = self.changes.clone();
        self.send(writer::Job::Alone(Box::new(move |conn| {
            // Only work that changed rows counts as a write: a lookup run here (many
            // handlers' are) must not make caches of what is published build again.
            let before = conn.total_changes();
            let result = guarded(conn, work);
            if conn.total_changes() != before {
                changes.fetch_add(1, Ordering::SeqCst);
            }
            let _ = reply.send(result);
        })))?;
        answer.recv().map_err(|_| StoreError::TaskGone)?
    }

    /// Whether the database answers a trivial query (for the health check).
    pub async fn ping(&self) -> Result<(), StoreError> {
        self.look(|conn| Ok(conn.query_row("SELECT 1", [], |_| Ok(()))?)).await
    }

    fn send(&self, job: writer::Job) -> Result<(), StoreError> {
        self.writer.send(job).map_err(|_| StoreError::TaskGone)
    }
}

/// Runs `work` in a savepoint of its own inside whatever transaction is open: when it
/// fails, only what it did is rolled back.
pub fn nested<T>(
    conn: &mut Connection,
    work: impl FnOnce(&mut Connection) -> Result<T, StoreError>,
) -> Result<T, StoreError> {
    writer::sql(conn, "SAVEPOINT nested_work")?;
    match work(conn) {
        Ok(result) => {
            writer::sql(conn, "RELEASE nested_work")?;
            Ok(result)
        }
        Err(err) => {
            writer::sql(conn, "ROLLBACK TO nested_work")?;
            writer::sql(conn, "RELEASE nested_work")?;
            Err(err)
        }
    }
}

/// Runs `work`, turning a panic into an error (the writer thread goes on).
fn guarded<T>(
    conn: &mut Connection,
    work: impl FnOnce(&mut Connection) -> Result<T, StoreError>,
) -> Result<T, StoreError> {
    std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| work(conn))).unwrap_or(Err(StoreError::Panicked))
}

/// Runs `work` on a blocking thread with an idle connection from `pool` (or a new one),
/// after taking a turn from `turns`.
async fn pooled<T, F>(
    turns: &Arc<tokio::sync::Semaphore>,
    pool: &Arc<Mutex<Vec<Connection>>>,
    path: &Path,
    reads: Reads,
    work: F,
) -> Result<T, StoreError>
where
    T: Send + 'static,
    F: FnOnce(&Connection) -> Result<T, StoreError> + Send + 'static,
{
    let turn = Arc::clone(turns).acquire_owned().await.map_err(|_| StoreError::TaskGone)?;
    let (pool, path) = (Arc::clone(pool), path.to_owned());
    tokio::task::spawn_blocking(move || {
        let _turn = turn;
        let idle = pool.lock().unwrap_or_else(|poisoned| poisoned.into_inner()).pop();
        let conn = match idle {
            Some(conn) => conn,
            None => open_reader(&path, reads)?,
        };
        let result = work(&conn);
        pool.lock().unwrap_or_else(|poisoned| poisoned.into_inner()).push(conn);
        result
    })
    .await
    .map_err(|_| StoreError::TaskGone)?
}

/// What a read-only connection is for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Reads {
    /// Lookups of a few pages on a request's way in.
    Short,
    /// Exports and the command line, which read much of the file once.
    Long,
}

/// A read-only connection to the database at `path` (already created and migrated by
/// [`Store::open`]).
fn open_reader(path: &Path, reads: Reads) -> Result<Connection, StoreError> {
    let conn = Connection::open_with_flags(
        path,
        OpenFlags::SQLITE_OPEN_READ_ONLY | OpenFlags::SQLITE_OPEN_NO_MUTEX | OpenFlags::SQLITE_OPEN_URI,
    )?;
    conn.busy_timeout(std::time::Duration::from_secs(5))?;
    conn.set_prepared_statement_cache_capacity(STATEMENT_CACHE);
    // Every commit invalidates a reader's page cache, so each lookup fetches its pages
    // again; mapped, a fetch is a pointer into the file rather than a copy by `pread`.
    // Long reads are not mapped: a mapped page they touch counts towards the process's
    // memory until it is unmapped, and an export touches the whole file.
    if reads == Reads::Short {
        conn.pragma_update(None, "mmap_size", READER_MMAP_BYTES)?;
    }
    Ok(conn)
}

/// Statements each connection keeps prepared: a record's way in runs a few dozen
/// distinct ones, and preparing is a good part of what a small statement costs.
const STATEMENT_CACHE: usize = 96;

/// How much of the database file a lookup connection maps (SQLite's `mmap_size`).
const READER_MMAP_BYTES: i64 = 256 * 1024 * 1024;
