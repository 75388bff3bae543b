//! People and sessions: reviewers and admins with password hashes, observers as
//! device identities, sessions by the hash of their token.

use chrono::{DateTime, Utc};
use rusqlite::{Connection, OptionalExtension, params};
use shared_types::Role;

use super::StoreError;

/// A person as access checks need them.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Person {
    pub id: i64,
    pub role: Role,
    pub username: Option<String>,
    pub display_name: Option<String>,
    pub disabled: bool,
}

const PERSON_COLUMNS: &str = "id, role, username, display_name, disabled";

/// id, role, username, display name, disabled — as read, before the role is checked.
type PersonRow = (i64, String, Option<String>, Option<String>, bool);

fn person_row(row: &rusqlite::Row) -> rusqlite::Result<PersonRow> {
    Ok((row.get(0)?, row.get(1)?, row.get(2)?, row.get(3)?, row.get(4)?))
}

fn to_person((id, role, username, display_name, disabled): PersonRow) -> Result<Person, StoreError> {
    let role = Role::from_code(&role).ok_or_else(|| StoreError::Corrupt(format!("person {id}: unknown role {role}")))?;
    Ok(Person { id, role, username, display_name, disabled })
}

fn now_text(now: DateTime<Utc>) -> String {
    now.to_rfc3339_opts(chrono::SecondsFormat::Millis, true)
}

/// Adds a reviewer or admin; `None` when the username is taken.
pub fn add_staff(conn: &Connection, username: &str, role: Role, display_name: &str, password_hash: &str, now: DateTime<Utc>) -> Result<Option<i64>, StoreError> {
    let inserted = conn.execute(
        "INSERT OR IGNORE INTO people (role, username, display_name, password_hash, created_at) VALUES (?1, ?2, ?3, ?4, ?5)",
        params![role.code(), username, display_name, password_hash, now_text(now)],
    )?;
    Ok((inserted == 1).then(|| conn.last_insert_rowid()))
}

/// A signed-in identity's password hash, by username.
pub fn staff_by_username(conn: &Connection, username: &str) -> Result<Option<(Person, String)>, StoreError> {
    let row = conn
        .query_row(
            &format!("SELECT {PERSON_COLUMNS}, password_hash FROM people WHERE username = ?1 AND password_hash IS NOT NULL"),
            [username],
            |row| Ok((person_row(row)?, row.get::<_, String>(5)?)),
        )
        .optional()?;
    row.map(|(person, hash)| Ok((to_person(person)?, hash))).transpose()
}

/// Adds an observer known by their device token's hash.
pub fn add_device(conn: &Connection, token_sha256: &str, display_name: Option<&str>, contact: Option<&str>, now: DateTime<Utc>) -> Result<i64, StoreError> {
    conn.execute(
        "INSERT INTO people (role, display_name, contact, device_token_sha256, created_at) VALUES ('observer', ?1, ?2, ?3, ?4)",
        params![display_name, contact, token_sha256, now_text(now)],
    )?;
    Ok(conn.last_insert_rowid())
}

pub fn person_by_device(conn: &Connection, token_sha256: &str) -> Result<Option<Person>, StoreError> {
    let row = conn
        .query_row(&format!("SELECT {PERSON_COLUMNS} FROM people WHERE device_token_sha256 = ?1"), [token_sha256], person_row)
        .optional()?;
    row.map(to_person).transpose()
}

pub fn add_session(conn: &Connection, token_sha256: &str, person_id: i64, csrf_token: &str, now: DateTime<Utc>, expires: DateTime<Utc>) -> Result<(), StoreError> {
    conn.execute(
        "INSERT INTO sessions (token_sha256, person_id, csrf_token, created_at, expires_at) VALUES (?1, ?2, ?3, ?4, ?5)",
        params![token_sha256, person_id, csrf_token, now_text(now), now_text(expires)],
    )?;
    Ok(())
}

/// The person and CSRF token of a live session.
pub fn session(conn: &Connection, token_sha256: &str, now: DateTime<Utc>) -> Result<Option<(Person, String)>, StoreError> {
    let row = conn
        .query_row(
            "SELECT p.id, p.role, p.username, p.display_name, p.disabled, s.csrf_token FROM sessions s JOIN people p ON p.id = s.person_id
             WHERE s.token_sha256 = ?1 AND s.expires_at > ?2",
            params![token_sha256, now_text(now)],
            |row| Ok((person_row(row)?, row.get::<_, String>(5)?)),
        )
        .optional()?;
    row.map(|(person, csrf)| Ok((to_person(person)?, csrf))).transpose()
}

pub fn end_session(conn: &Connection, token_sha256: &str) -> Result<(), StoreError> {
    conn.execute("DELETE FROM sessions WHERE token_sha256 = ?1", [token_sha256])?;
    Ok(())
}

/// Everyone with a sign-in, for the admin screen (no hashes, no contacts).
pub fn list_staff(conn: &Connection) -> Result<Vec<Person>, StoreError> {
    let mut stmt = conn.prepare(&format!("SELECT {PERSON_COLUMNS} FROM people WHERE username IS NOT NULL ORDER BY username"))?;
    let rows = stmt.query_map([], person_row)?.collect::<Result<Vec<_>, _>>()?;
    rows.into_iter().map(to_person).collect()
}

/// Turns a sign-in off or on again; also ends its sessions when turned off.
pub fn set_disabled(conn: &mut Connection, username: &str, disabled: bool) -> Result<bool, StoreError> {
    let tx = conn.transaction()?;
    let changed = tx.execute("UPDATE people SET disabled = ?1 WHERE username = ?2", params![disabled, username])?;
    if disabled {
        tx.execute("DELETE FROM sessions WHERE person_id = (SELECT id FROM people WHERE username = ?1)", [username])?;
    }
    tx.commit()?;
    Ok(changed == 1)
}
