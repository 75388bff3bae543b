//! The one writer: a thread that owns the read-write connection and runs every job sent
//! to it, one at a time, in the order they came.
//!
//! Jobs of two kinds share its queue:
//!
//! - **alone** ([`Store::run`](super::Store::run)): runs by itself in autocommit mode, as
//!   any code holding the connection would; it may open its own transaction.
//! - **grouped** ([`Store::write`](super::Store::write)): a group commit. The writer takes
//!   every grouped job waiting in the queue (up to [`MAX_GROUP`]), opens one transaction,
//!   runs each job in a savepoint of its own — a job that fails is rolled back to its
//!   savepoint and affects no other — and commits once. With `synchronous = FULL` that
//!   one commit makes the whole group durable for the cost of one sync, so many
//!   submissions arriving together share it. Each job's caller hears its result only
//!   after the commit returned: success means durable. If the commit itself fails,
//!   every job of the group hears that nothing of it was stored (SQLite rolls the whole
//!   transaction back).
//!
//! Grouped jobs must not open transactions of their own (`Connection::transaction`);
//! they use savepoints, which nest.
//!
//! A job that panics is rolled back like a failed one, and the thread goes on serving
//! the others.

use std::panic::{AssertUnwindSafe, catch_unwind};
use std::sync::mpsc;

use rusqlite::Connection;

use super::StoreError;

/// The most grouped jobs one commit takes. Past this the queue waits for the next
/// commit; it keeps one group's answers from waiting on an unbounded batch.
pub const MAX_GROUP: usize = 512;

/// A job to run on the writer's connection.
pub(super) enum Job {
    Alone(Box<dyn FnOnce(&mut Connection) + Send>),
    Grouped(Box<dyn GroupedJob>),
}

/// A job that joins a group commit: runs, then later hears whether its group committed.
pub(super) trait GroupedJob: Send {
    /// Runs the work (inside its savepoint) and keeps its result; when it failed, a copy
    /// of the SQLite error behind it (or a general one), to tell the group why.
    fn run(&mut self, conn: &mut Connection) -> Result<(), rusqlite::Error>;
    /// Answers the caller: the kept result once the group committed, else `failure`.
    fn answer(self: Box<Self>, failure: Option<StoreError>);
}

/// A grouped job with a typed result, answered through `reply`.
pub(super) struct Typed<T, F> {
    pub work: Option<F>,
    pub result: Option<Result<T, StoreError>>,
    pub reply: Box<dyn FnOnce(Result<T, StoreError>) + Send>,
}

impl<T, F> GroupedJob for Typed<T, F>
where
    T: Send,
    F: FnOnce(&mut Connection) -> Result<T, StoreError> + Send,
{
    fn run(&mut self, conn: &mut Connection) -> Result<(), rusqlite::Error> {
        let Some(work) = self.work.take() else { return Err(general_error("the job ran twice")) };
        let result = catch_unwind(AssertUnwindSafe(|| work(conn))).unwrap_or(Err(StoreError::Panicked));
        let outcome = match &result {
            Ok(_) => Ok(()),
            Err(StoreError::Sqlite(err)) => Err(copy_error(err)),
            Err(other) => Err(general_error(&other.to_string())),
        };
        self.result = Some(result);
        outcome
    }

    fn answer(self: Box<Self>, failure: Option<StoreError>) {
        let result = match (failure, self.result) {
            // A job that failed on its own says why, whatever happened to the group.
            (_, Some(Err(own))) => Err(own),
            (Some(group), _) => Err(group),
            (None, Some(done)) => done,
            (None, None) => Err(StoreError::TaskGone),
        };
        (self.reply)(result);
    }
}

/// Starts the writer thread on `conn`; it ends when every sender is dropped.
pub(super) fn start(conn: Connection) -> std::io::Result<mpsc::Sender<Job>> {
    let (sender, jobs) = mpsc::channel::<Job>();
    std::thread::Builder::new().name("wrackline-writer".into()).spawn(move || serve(conn, jobs))?;
    Ok(sender)
}

fn serve(mut conn: Connection, jobs: mpsc::Receiver<Job>) {
    while let Ok(first) = jobs.recv() {
        let mut next = Some(first);
        while let Some(job) = next.take() {
            match job {
                Job::Alone(work) => {
                    // The job answers its caller itself; a panic there must not end the
                    // thread (an unfinished transaction rolls back as it unwinds).
                    let _ = catch_unwind(AssertUnwindSafe(|| work(&mut conn)));
                    next = jobs.try_recv().ok();
                }
                Job::Grouped(job) => {
                    let mut group = vec![job];
                    // Everything grouped already waiting joins this commit.
                    while group.len() < MAX_GROUP {
                        match jobs.try_recv() {
                            Ok(Job::Grouped(more)) => group.push(more),
                            Ok(alone) => {
                                next = Some(alone);
                                break;
                            }
                            Err(_) => break,
                        }
                    }
                    commit_group(&mut conn, group);
                    if next.is_none() {
                        next = jobs.try_recv().ok();
                    }
                }
            }
        }
    }
}

/// Runs a group in one transaction, each job in its own savepoint, commits, answers all.
fn commit_group(conn: &mut Connection, mut group: Vec<Box<dyn GroupedJob>>) {
    if let Err(err) = sql(conn, "BEGIN IMMEDIATE") {
        return answer_all(group, &err);
    }
    for job in &mut group {
        if let Err(err) = sql(conn, "SAVEPOINT grouped_job") {
            abandon(conn);
            return answer_all(group, &err);
        }
        let ran = job.run(conn);
        let ended = match ran {
            Ok(()) => sql(conn, "RELEASE grouped_job"),
            Err(_) => sql(conn, "ROLLBACK TO grouped_job").and_then(|()| sql(conn, "RELEASE grouped_job")),
        };
        if let Err(err) = ended {
            // SQLite rolls the whole transaction back on some failures (a full disk, an
            // I/O error), taking the savepoint with it: the job's own error says why.
            abandon(conn);
            return answer_all(group, ran.as_ref().err().unwrap_or(&err));
        }
    }
    match sql(conn, "COMMIT") {
        Ok(()) => group.into_iter().for_each(|job| job.answer(None)),
        Err(err) => {
            abandon(conn);
            answer_all(group, &err);
        }
    }
}

/// Runs one statement, prepared once and kept (every group runs the same few).
pub(super) fn sql(conn: &Connection, statement: &str) -> rusqlite::Result<()> {
    conn.prepare_cached(statement)?.execute([]).map(|_| ())
}

/// Rolls back whatever is open, so the next job starts clean.
fn abandon(conn: &mut Connection) {
    if !conn.is_autocommit()
        && let Err(err) = conn.execute_batch("ROLLBACK")
    {
        tracing::error!(error = %err, "rolling back a failed group commit failed");
    }
}

/// Tells every job of a group that nothing of it was stored, with the group's error.
fn answer_all(group: Vec<Box<dyn GroupedJob>>, err: &rusqlite::Error) {
    tracing::warn!(error = %err, jobs = group.len(), "a group commit failed; none of its jobs was stored");
    for job in group {
        job.answer(Some(StoreError::Sqlite(copy_error(err))));
    }
}

/// The same SQLite error again (rusqlite's errors are not `Clone`), keeping its code so
/// callers can still tell a full disk from other failures.
fn copy_error(err: &rusqlite::Error) -> rusqlite::Error {
    match err {
        rusqlite::Error::SqliteFailure(code, message) => rusqlite::Error::SqliteFailure(*code, message.clone()),
        other => general_error(&other.to_string()),
    }
}

fn general_error(message: &str) -> rusqlite::Error {
    rusqlite::Error::SqliteFailure(rusqlite::ffi::Error::new(rusqlite::ffi::SQLITE_ERROR), Some(message.to_owned()))
}
