//! The installation's own identifier (made once, by migration 0014), the stable part of
//! identifiers that must not change between exports.

use rusqlite::Connection;

use super::StoreError;

/// This installation's identifier: 32 lowercase hex digits.
pub fn id(conn: &Connection) -> Result<String, StoreError> {
    Ok(conn.query_row("SELECT id FROM deployment LIMIT 1", [], |row| row.get(0))?)
}
