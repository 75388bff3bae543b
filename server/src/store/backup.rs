//! The database side of `wrackline backup`, `restore` and `check`: a consistent copy made
//! with SQLite's online backup API while the server keeps writing, SQLite's own
//! integrity checks, and the list of photo files the database names.

use std::path::Path;

use rusqlite::{Connection, OpenFlags};

use super::StoreError;

/// The database file's name in a data folder (and in a backup, which has the same layout).
pub const DATABASE_FILE: &str = "wrackline.sqlite3";

/// Copies the database at `from` into a new file at `to` with the online backup API, in
/// one step: one read transaction, so the copy is the database as it was at one commit,
/// and (in WAL mode) the server's writes go on meanwhile. Returns the observations the
/// copy holds.
pub fn copy_database(from: &Path, to: &Path) -> Result<i64, StoreError> {
    let source = open_read_only(from)?;
    let mut copy = Connection::open(to)?;
    {
        let backup = rusqlite::backup::Backup::new(&source, &mut copy)?;
        // -1: every page in one step, under one read lock.
        match backup.step(-1)? {
            rusqlite::backup::StepResult::Done => {}
            other => return Err(StoreError::Corrupt(format!("the backup did not finish in one step: {other:?}"))),
        }
    }
    // The copy is a file of its own: no write-ahead log beside it.
    copy.pragma_update(None, "journal_mode", "DELETE")?;
    Ok(copy.query_row("SELECT COUNT(*) FROM observations", [], |row| row.get(0))?)
}

/// Opens a database read-only (a live one, or a backup), without migrating it.
pub fn open_read_only(path: &Path) -> Result<Connection, StoreError> {
    if !path.exists() {
        return Err(StoreError::Corrupt(format!("no database at {}", path.display())));
    }
    let conn = Connection::open_with_flags(path, OpenFlags::SQLITE_OPEN_READ_ONLY | OpenFlags::SQLITE_OPEN_NO_MUTEX)?;
    conn.busy_timeout(std::time::Duration::from_secs(30))?;
    Ok(conn)
}

/// What SQLite finds wrong with the database: `PRAGMA integrity_check` (every page, index
/// and constraint) and `PRAGMA foreign_key_check`; empty when all is well.
pub fn integrity_problems(conn: &Connection) -> Result<Vec<String>, StoreError> {
    let mut problems = Vec::new();
    let mut check = conn.prepare("PRAGMA integrity_check")?;
    for row in check.query_map([], |row| row.get::<_, String>(0))? {
        let line = row?;
        if line != "ok" {
            problems.push(format!("integrity check: {line}"));
        }
    }
    let mut keys = conn.prepare("PRAGMA foreign_key_check")?;
    for row in keys
        .query_map([], |row| Ok((row.get::<_, String>(0)?, row.get::<_, Option<i64>>(1)?, row.get::<_, String>(2)?)))?
    {
        let (table, rowid, parent) = row?;
        problems.push(format!("foreign key: row {} of {table} names a missing row of {parent}", rowid.unwrap_or(-1)));
    }
    Ok(problems)
}

/// Every stored photo: its SHA-256 and its size in bytes.
pub fn stored_photos(conn: &Connection) -> Result<Vec<(String, u64)>, StoreError> {
    let mut stmt = conn.prepare("SELECT sha256, byte_len FROM photos ORDER BY sha256")?;
    let rows = stmt.query_map([], |row| Ok((row.get::<_, String>(0)?, row.get::<_, i64>(1)? as u64)))?;
    Ok(rows.collect::<Result<_, _>>()?)
}

/// How many observations the database holds.
pub fn observation_count(conn: &Connection) -> Result<i64, StoreError> {
    Ok(conn.query_row("SELECT COUNT(*) FROM observations", [], |row| row.get(0))?)
}
