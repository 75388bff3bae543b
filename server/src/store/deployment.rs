//! The installation's own identifier (made once, by migration 0014), the stable part of
//! identifiers that must not change between exports; and when each version of the
//! published dataset was first built (migration 0020), which must not change either.

use rusqlite::{Connection, OptionalExtension as _, params};

use super::StoreError;

/// This installation's identifier: 32 lowercase hex digits.
pub fn id(conn: &Connection) -> Result<String, StoreError> {
    Ok(conn.query_row("SELECT id FROM deployment LIMIT 1", [], |row| row.get(0))?)
}

/// When the published version `etag` was first built (RFC 3339, whole seconds), if it
/// has been.
pub fn version_published_at(conn: &Connection, etag: &str) -> Result<Option<String>, StoreError> {
    Ok(conn
        .query_row("SELECT first_published_at FROM published_versions WHERE etag = ?1", [etag], |row| row.get(0))
        .optional()?)
}

/// Keeps `at` as when version `etag` was first built, unless a time is kept already;
/// returns the time kept.
pub fn keep_version_published_at(conn: &Connection, etag: &str, at: &str) -> Result<String, StoreError> {
    conn.execute(
        "INSERT OR IGNORE INTO published_versions (etag, first_published_at) VALUES (?1, ?2)",
        params![etag, at],
    )?;
    Ok(version_published_at(conn, etag)?.unwrap_or_else(|| at.to_owned()))
}
