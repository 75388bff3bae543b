//! Review in the database: the queue's rows, the identification history, the
//! conversation, the audit trail, and review actions applied in one transaction each.
//! Nothing is deleted: a new identification supersedes the old one.

use chrono::{DateTime, Utc};
use rusqlite::{Connection, OptionalExtension, Transaction, params};
use shared_types::{Identification, Message, ReviewEvent, ReviewState, Role};
use uuid::Uuid;

use super::StoreError;
use super::observations::{self, StoredPhoto};

fn now_text(now: DateTime<Utc>) -> String {
    now.to_rfc3339_opts(chrono::SecondsFormat::Millis, true)
}

fn parse_time(text: &str) -> Result<DateTime<Utc>, StoreError> {
    DateTime::parse_from_rfc3339(text)
        .map(|t| t.with_timezone(&Utc))
        .map_err(|err| StoreError::Corrupt(format!("timestamp {text}: {err}")))
}

fn state(code: &str) -> Result<ReviewState, StoreError> {
    ReviewState::from_code(code).ok_or_else(|| StoreError::Corrupt(format!("unknown review state {code}")))
}

/// The observation's number, its state and its observer, by the phone's id.
pub fn observation_of(
    conn: &Connection,
    client_id: Uuid,
) -> Result<Option<(i64, ReviewState, Option<i64>)>, StoreError> {
    let row = conn
        .query_row(
            "SELECT id, review_state, observer_id FROM observations WHERE client_id = ?1",
            [client_id.to_string()],
            |row| Ok((row.get::<_, i64>(0)?, row.get::<_, String>(1)?, row.get::<_, Option<i64>>(2)?)),
        )
        .optional()?;
    row.map(|(id, code, observer)| Ok((id, state(&code)?, observer))).transpose()
}

/// The current identification's name, if any.
pub fn current_taxon(conn: &Connection, observation_id: i64) -> Result<Option<String>, StoreError> {
    Ok(conn
        .query_row(
            "SELECT taxon_name FROM identifications WHERE observation_id = ?1 AND superseded_by IS NULL ORDER BY id DESC LIMIT 1",
            [observation_id],
            |row| row.get(0),
        )
        .optional()?)
}

pub fn identifications(conn: &Connection, observation_id: i64) -> Result<Vec<Identification>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT taxon_name, taxon_rank, identified_by, identified_at, remarks, basis, superseded_by IS NULL
         FROM identifications WHERE observation_id = ?1 ORDER BY id",
    )?;
    let rows = stmt
        .query_map([observation_id], |row| {
            Ok((row.get(0)?, row.get(1)?, row.get(2)?, row.get::<_, String>(3)?, row.get(4)?, row.get(5)?, row.get(6)?))
        })?
        .collect::<Result<Vec<_>, _>>()?;
    rows.into_iter()
        .map(|(taxon_name, taxon_rank, identified_by, at, remarks, basis, current)| {
            Ok(Identification {
                taxon_name,
                taxon_rank,
                identified_by,
                identified_at: parse_time(&at)?,
                remarks,
                basis,
                current,
            })
        })
        .collect()
}

pub fn messages(conn: &Connection, observation_id: i64) -> Result<Vec<Message>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT m.author_role, p.display_name, m.body, m.at FROM messages m LEFT JOIN people p ON p.id = m.person_id
         WHERE m.observation_id = ?1 ORDER BY m.id",
    )?;
    let rows = stmt
        .query_map([observation_id], |row| {
            Ok((row.get::<_, String>(0)?, row.get(1)?, row.get(2)?, row.get::<_, String>(3)?))
        })?
        .collect::<Result<Vec<_>, _>>()?;
    rows.into_iter()
        .map(|(role, author, body, at)| {
            let author_role =
                Role::from_code(&role).ok_or_else(|| StoreError::Corrupt(format!("message role {role}")))?;
            Ok(Message { author_role, author, body, at: parse_time(&at)? })
        })
        .collect()
}

pub fn events(conn: &Connection, observation_id: i64) -> Result<Vec<ReviewEvent>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT e.action, e.from_state, e.to_state, p.display_name, e.detail, e.reason, e.at FROM review_events e
         LEFT JOIN people p ON p.id = e.person_id WHERE e.observation_id = ?1 ORDER BY e.id",
    )?;
    let rows = stmt
        .query_map([observation_id], |row| {
            let texts = (row.get::<_, String>(0)?, row.get::<_, String>(1)?, row.get::<_, String>(2)?);
            Ok((texts, row.get(3)?, row.get(4)?, row.get(5)?, row.get::<_, String>(6)?))
        })?
        .collect::<Result<Vec<_>, _>>()?;
    rows.into_iter()
        .map(|((action, from, to), by, detail, reason, at)| {
            Ok(ReviewEvent {
                action,
                from_state: state(&from)?,
                to_state: state(&to)?,
                by,
                detail,
                reason,
                at: parse_time(&at)?,
            })
        })
        .collect()
}

/// One change a review action makes, decided by the caller from the current state.
#[derive(Debug, Clone)]
pub struct Change {
    pub action: &'static str,
    pub to_state: ReviewState,
    /// What changed, in words.
    pub detail: Option<String>,
    /// Why: the reviewer's reason, remark or question.
    pub reason: Option<String>,
    /// A new identification (name, rank, remark) superseding the current one.
    pub identification: Option<(String, String, Option<String>)>,
    /// A message for the observer.
    pub message: Option<String>,
}

/// Applies `decide(current state)` to a record in one transaction, with its audit row.
pub fn apply<E>(
    conn: &mut Connection,
    client_id: Uuid,
    person_id: i64,
    now: DateTime<Utc>,
    decide: impl FnOnce(ReviewState) -> Result<Change, E>,
) -> Result<Option<Result<ReviewState, E>>, StoreError> {
    let tx = conn.transaction()?;
    let Some((observation_id, current, _)) = observation_of(&tx, client_id)? else { return Ok(None) };
    let change = match decide(current) {
        Ok(change) => change,
        Err(refusal) => return Ok(Some(Err(refusal))),
    };
    let at = now_text(now);
    let mut detail = change.detail.clone();
    if let Some((name, rank, remark)) = &change.identification {
        if let Some(before) = current_taxon(&tx, observation_id)?.filter(|before| before != name) {
            detail = detail.map(|d| format!("{d}; was {before}"));
        }
        supersede_identification(&tx, observation_id, person_id, name, rank, remark.as_deref(), &at)?;
    }
    if let Some(body) = &change.message {
        tx.execute(
            "INSERT INTO messages (observation_id, person_id, author_role, body, at) VALUES (?1, ?2, 'reviewer', ?3, ?4)",
            params![observation_id, person_id, body, at],
        )?;
    }
    let row = AuditRow {
        observation_id,
        person_id: Some(person_id),
        action: change.action,
        from_state: current.code(),
        to_state: change.to_state.code(),
        detail: detail.as_deref(),
        reason: change.reason.as_deref(),
        at: &at,
    };
    set_state(&tx, row)?;
    tx.commit()?;
    Ok(Some(Ok(change.to_state)))
}

fn supersede_identification(
    tx: &Transaction,
    observation_id: i64,
    person_id: i64,
    name: &str,
    rank: &str,
    remark: Option<&str>,
    at: &str,
) -> Result<(), StoreError> {
    let reviewer: Option<String> = tx
        .query_row("SELECT display_name FROM people WHERE id = ?1", [person_id], |row| row.get(0))
        .optional()?
        .flatten();
    tx.execute(
        "INSERT INTO identifications (observation_id, taxon_name, taxon_rank, identified_by, identified_by_id, identified_at, remarks, basis)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, 'reviewer')",
        params![observation_id, name, rank, reviewer, person_id, at, remark],
    )?;
    let new_id = tx.last_insert_rowid();
    tx.execute(
        "UPDATE identifications SET superseded_by = ?1 WHERE observation_id = ?2 AND superseded_by IS NULL AND id != ?1",
        params![new_id, observation_id],
    )?;
    Ok(())
}

/// One row of the audit trail: who, when, what changed and why.
pub(super) struct AuditRow<'a> {
    pub observation_id: i64,
    pub person_id: Option<i64>,
    pub action: &'a str,
    pub from_state: &'a str,
    pub to_state: &'a str,
    /// What changed, in words.
    pub detail: Option<&'a str>,
    /// Why, in the words of whoever did it.
    pub reason: Option<&'a str>,
    pub at: &'a str,
}

/// Writes one audit row; every review action and merge goes through here.
pub(super) fn audit(tx: &Transaction, row: AuditRow) -> Result<(), StoreError> {
    tx.execute(
        "INSERT INTO review_events (observation_id, person_id, action, from_state, to_state, detail, reason, at) VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8)",
        params![row.observation_id, row.person_id, row.action, row.from_state, row.to_state, row.detail, row.reason, row.at],
    )?;
    Ok(())
}

/// Moves a record to `row.to_state` and writes its audit row.
fn set_state(tx: &Transaction, row: AuditRow) -> Result<(), StoreError> {
    tx.execute("UPDATE observations SET review_state = ?1 WHERE id = ?2", params![row.to_state, row.observation_id])?;
    audit(tx, row)
}

/// The client ids of one observer's records, newest first.
pub fn records_of_observer(conn: &Connection, observer_id: i64) -> Result<Vec<Uuid>, StoreError> {
    let mut stmt =
        conn.prepare("SELECT client_id FROM observations WHERE observer_id = ?1 ORDER BY observed_at_utc DESC")?;
    let ids = stmt.query_map([observer_id], |row| row.get::<_, String>(0))?.collect::<Result<Vec<_>, _>>()?;
    ids.iter().map(|id| Uuid::parse_str(id).map_err(|err| StoreError::Corrupt(err.to_string()))).collect()
}

/// What an observer's reply did.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ReplyOutcome {
    Added,
    /// The same reply was received before.
    AlreadyThere,
    NotTheirs,
}

/// Stores an observer's reply and its photos, and puts the record back in the queue.
pub fn add_reply(
    conn: &mut Connection,
    client_id: Uuid,
    observer_id: i64,
    reply_id: Uuid,
    body: &str,
    photos: &[StoredPhoto],
    now: DateTime<Utc>,
) -> Result<ReplyOutcome, StoreError> {
    let tx = conn.transaction()?;
    let Some((observation_id, current, owner)) = observation_of(&tx, client_id)? else {
        return Ok(ReplyOutcome::NotTheirs);
    };
    if owner != Some(observer_id) {
        return Ok(ReplyOutcome::NotTheirs);
    }
    let at = now_text(now);
    let inserted = tx.execute(
        "INSERT OR IGNORE INTO messages (client_id, observation_id, person_id, author_role, body, at) VALUES (?1, ?2, ?3, 'observer', ?4, ?5)",
        params![reply_id.to_string(), observation_id, observer_id, body, at],
    )?;
    if inserted == 0 {
        return Ok(ReplyOutcome::AlreadyThere);
    }
    let first_position: i64 =
        tx.query_row("SELECT COUNT(*) FROM observation_photos WHERE observation_id = ?1", [observation_id], |row| {
            row.get(0)
        })?;
    for (index, photo) in photos.iter().enumerate() {
        observations::link_photo(&tx, observation_id, first_position as usize + index, photo, &at)?;
    }
    let back_to = if matches!(current, ReviewState::DetailsRequested) { ReviewState::AwaitingReview } else { current };
    let detail = format!("the observer answered with {} new photo(s)", photos.len());
    let row = AuditRow {
        observation_id,
        person_id: Some(observer_id),
        action: "observer_reply",
        from_state: current.code(),
        to_state: back_to.code(),
        detail: Some(&detail),
        reason: Some(body).filter(|b| !b.is_empty()),
        at: &at,
    };
    set_state(&tx, row)?;
    tx.commit()?;
    Ok(ReplyOutcome::Added)
}
