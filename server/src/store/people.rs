//! People and sessions: reviewers and admins with password hashes, observers as
//! device identities, sessions by the hash of their token. Every change to a sign-in
//! (added, role, password, turned off or on) writes a `people_events` row in the same
//! transaction.

use chrono::{DateTime, Utc};
use rusqlite::{Connection, OptionalExtension, params};
use shared_types::{PersonEvent, Role};

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
    let role =
        Role::from_code(&role).ok_or_else(|| StoreError::Corrupt(format!("person {id}: unknown role {role}")))?;
    Ok(Person { id, role, username, display_name, disabled })
}

fn now_text(now: DateTime<Utc>) -> String {
    now.to_rfc3339_opts(chrono::SecondsFormat::Millis, true)
}

/// Adds a reviewer or admin; `None` when the username is taken. `by`: the admin who
/// added them (`None` on the server's command line).
pub fn add_staff(
    conn: &mut Connection,
    username: &str,
    role: Role,
    display_name: &str,
    password_hash: &str,
    by: Option<i64>,
    now: DateTime<Utc>,
) -> Result<Option<i64>, StoreError> {
    let tx = conn.transaction()?;
    // A plain INSERT: only a taken username means "taken"; any other refusal (a role the
    // schema does not know) is an error, never mistaken for it.
    let inserted = tx.execute(
        "INSERT INTO people (role, username, display_name, password_hash, created_at, public_id)
         VALUES (?1, ?2, ?3, ?4, ?5, lower(hex(randomblob(16))))",
        params![role.code(), username, display_name, password_hash, now_text(now)],
    );
    match inserted {
        Err(rusqlite::Error::SqliteFailure(err, _)) if err.extended_code == rusqlite::ffi::SQLITE_CONSTRAINT_UNIQUE => {
            return Ok(None);
        }
        other => other?,
    };
    let id = tx.last_insert_rowid();
    log(&tx, id, by, "added", Some(&format!("as {}", role.code())), now)?;
    tx.commit()?;
    Ok(Some(id))
}

fn log(
    tx: &rusqlite::Transaction,
    person_id: i64,
    by: Option<i64>,
    action: &str,
    detail: Option<&str>,
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    tx.execute(
        "INSERT INTO people_events (person_id, by_person_id, action, detail, at) VALUES (?1, ?2, ?3, ?4, ?5)",
        params![person_id, by, action, detail, now_text(now)],
    )?;
    Ok(())
}

fn staff_id(tx: &rusqlite::Transaction, username: &str) -> Result<Option<(i64, String)>, StoreError> {
    Ok(tx
        .query_row("SELECT id, role FROM people WHERE username = ?1 AND password_hash IS NOT NULL", [username], |row| {
            Ok((row.get(0)?, row.get(1)?))
        })
        .optional()?)
}

/// A signed-in identity's password hash, by username.
pub fn staff_by_username(conn: &Connection, username: &str) -> Result<Option<(Person, String)>, StoreError> {
    let row = conn
        .query_row(
            &format!(
                "SELECT {PERSON_COLUMNS}, password_hash FROM people WHERE username = ?1 AND password_hash IS NOT NULL"
            ),
            [username],
            |row| Ok((person_row(row)?, row.get::<_, String>(5)?)),
        )
        .optional()?;
    row.map(|(person, hash)| Ok((to_person(person)?, hash))).transpose()
}

/// What an observer chose to tell: a name and a contact (either may be absent), and
/// whether the name may be published with open data.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct ObserverProfile {
    pub display_name: Option<String>,
    /// For reviewers only, on that observer's records; never exported.
    pub contact: Option<String>,
    pub name_public: bool,
}

/// Adds an observer known by their device token's hash, with a fresh random public id
/// (never derived from the token).
pub fn add_device(
    conn: &Connection,
    token_sha256: &str,
    profile: &ObserverProfile,
    now: DateTime<Utc>,
) -> Result<i64, StoreError> {
    conn.execute(
        "INSERT INTO people (role, display_name, contact, name_public, device_token_sha256, created_at, public_id)
         VALUES ('observer', ?1, ?2, ?3, ?4, ?5, lower(hex(randomblob(16))))",
        params![profile.display_name, profile.contact, profile.name_public, token_sha256, now_text(now)],
    )?;
    Ok(conn.last_insert_rowid())
}

pub fn person_by_device(conn: &Connection, token_sha256: &str) -> Result<Option<Person>, StoreError> {
    let row = conn
        .query_row(
            &format!("SELECT {PERSON_COLUMNS} FROM people WHERE device_token_sha256 = ?1"),
            [token_sha256],
            person_row,
        )
        .optional()?;
    row.map(to_person).transpose()
}

pub fn add_session(
    conn: &Connection,
    token_sha256: &str,
    person_id: i64,
    csrf_token: &str,
    now: DateTime<Utc>,
    expires: DateTime<Utc>,
) -> Result<(), StoreError> {
    conn.execute(
        "INSERT INTO sessions (token_sha256, person_id, csrf_token, created_at, expires_at) VALUES (?1, ?2, ?3, ?4, ?5)",
        params![token_sha256, person_id, csrf_token, now_text(now), now_text(expires)],
    )?;
    Ok(())
}

/// The person and CSRF token of a live session.
pub fn session(
    conn: &Connection,
    token_sha256: &str,
    now: DateTime<Utc>,
) -> Result<Option<(Person, String)>, StoreError> {
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
    let mut stmt =
        conn.prepare(&format!("SELECT {PERSON_COLUMNS} FROM people WHERE username IS NOT NULL ORDER BY username"))?;
    let rows = stmt.query_map([], person_row)?.collect::<Result<Vec<_>, _>>()?;
    rows.into_iter().map(to_person).collect()
}

/// Turns a sign-in off or on again; also ends its sessions when turned off.
pub fn set_disabled(
    conn: &mut Connection,
    username: &str,
    disabled: bool,
    by: Option<i64>,
    now: DateTime<Utc>,
) -> Result<bool, StoreError> {
    let tx = conn.transaction()?;
    let Some((id, _)) = staff_id(&tx, username)? else { return Ok(false) };
    tx.execute("UPDATE people SET disabled = ?1 WHERE id = ?2", params![disabled, id])?;
    if disabled {
        tx.execute("DELETE FROM sessions WHERE person_id = ?1", [id])?;
    }
    log(&tx, id, by, if disabled { "turned_off" } else { "turned_on" }, None, now)?;
    tx.commit()?;
    Ok(true)
}

/// What changing a role did.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum RoleChange {
    Changed { from: Role },
    Unchanged,
    NoSuchPerson,
}

/// Gives a reviewer or admin another role. Sessions go on: access checks read the role
/// at every request. (An admin cannot change their own role — the handler refuses — so
/// there is always an admin left.)
pub fn set_role(
    conn: &mut Connection,
    username: &str,
    role: Role,
    by: Option<i64>,
    now: DateTime<Utc>,
) -> Result<RoleChange, StoreError> {
    let tx = conn.transaction()?;
    let Some((id, current)) = staff_id(&tx, username)? else { return Ok(RoleChange::NoSuchPerson) };
    let from =
        Role::from_code(&current).ok_or_else(|| StoreError::Corrupt(format!("person {id}: unknown role {current}")))?;
    if from == role {
        return Ok(RoleChange::Unchanged);
    }
    tx.execute("UPDATE people SET role = ?1 WHERE id = ?2", params![role.code(), id])?;
    log(&tx, id, by, "role_changed", Some(&format!("{} → {}", from.code(), role.code())), now)?;
    tx.commit()?;
    Ok(RoleChange::Changed { from })
}

/// Gives a sign-in a new password hash and ends its sessions, so the old password and
/// whoever held it are out. `false` when there is no such sign-in.
pub fn set_password(
    conn: &mut Connection,
    username: &str,
    password_hash: &str,
    by: Option<i64>,
    now: DateTime<Utc>,
) -> Result<bool, StoreError> {
    let tx = conn.transaction()?;
    let Some((id, _)) = staff_id(&tx, username)? else { return Ok(false) };
    tx.execute("UPDATE people SET password_hash = ?1 WHERE id = ?2", params![password_hash, id])?;
    tx.execute("DELETE FROM sessions WHERE person_id = ?1", [id])?;
    log(&tx, id, by, "password_reset", Some("sessions ended"), now)?;
    tx.commit()?;
    Ok(true)
}

/// The audit trail of sign-ins, newest first.
pub fn events(conn: &Connection) -> Result<Vec<PersonEvent>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT p.username, e.action, e.detail, b.username, e.at FROM people_events e
         JOIN people p ON p.id = e.person_id LEFT JOIN people b ON b.id = e.by_person_id ORDER BY e.id DESC",
    )?;
    let rows = stmt
        .query_map([], |row| {
            Ok((row.get::<_, Option<String>>(0)?, row.get(1)?, row.get(2)?, row.get(3)?, row.get::<_, String>(4)?))
        })?
        .collect::<Result<Vec<_>, _>>()?;
    rows.into_iter()
        .map(|(username, action, detail, by, at)| {
            let at = DateTime::parse_from_rfc3339(&at)
                .map_err(|err| StoreError::Corrupt(format!("people event time {at}: {err}")))?
                .with_timezone(&Utc);
            Ok(PersonEvent { username: username.unwrap_or_default(), action, detail, by, at })
        })
        .collect()
}

/// The name and contact the observer of an observation gave, for the reviewers' view of
/// that record (no other route sends the contact out).
pub fn observer_of_observation(
    conn: &Connection,
    observation_id: i64,
) -> Result<Option<shared_types::ObserverContact>, StoreError> {
    Ok(conn
        .query_row(
            "SELECT p.display_name, p.contact FROM observations o JOIN people p ON p.id = o.observer_id WHERE o.id = ?1",
            [observation_id],
            |row| Ok(shared_types::ObserverContact { display_name: row.get(0)?, contact: row.get(1)? }),
        )
        .optional()?)
}

/// The name, contact and naming consent an observer gave (the contact is for
/// reviewers, on that observer's records; no other route sends it out).
pub fn set_observer_profile(conn: &Connection, observer_id: i64, profile: &ObserverProfile) -> Result<(), StoreError> {
    conn.execute(
        "UPDATE people SET display_name = ?1, contact = ?2, name_public = ?3 WHERE id = ?4 AND role = 'observer'",
        params![profile.display_name, profile.contact, profile.name_public, observer_id],
    )?;
    Ok(())
}
