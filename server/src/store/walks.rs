//! Survey walks: stored once by the phone's id, listed with their effort, and the
//! link from a record to its walk, which may be made after the record was sent.

use chrono::{DateTime, Utc};
use rusqlite::{Connection, OptionalExtension, params};
use shared_types::{WalkReceipt, WalkSubmission};
use uuid::Uuid;

use super::StoreError;
use super::occurrences::ObserverRow;

/// What happened to a walk submission.
#[derive(Debug, Clone, PartialEq)]
pub enum WalkInsertion {
    Created(WalkReceipt),
    Replayed(WalkReceipt),
    Conflict,
    /// The walk was sent from another phone.
    NotYours,
}

/// Stores a walk with its effort under the phone that sent it (`observer_id`; `None`
/// for the demo loader); a resend with the same content from the same phone gets the
/// first receipt. A walk stored before walks had owners is adopted by the first phone
/// that resends exactly its content (the track is never public, so only its phone can).
pub fn insert_walk(
    conn: &mut Connection,
    walk: &WalkSubmission,
    content_sha256: &str,
    observer_id: Option<i64>,
    now: DateTime<Utc>,
) -> Result<WalkInsertion, StoreError> {
    let tx = conn.savepoint()?;
    let existing = tx
        .query_row(
            "SELECT id, content_sha256, received_at, observer_id FROM walks WHERE client_id = ?1",
            [walk.client_id.to_string()],
            |row| {
                Ok((
                    row.get::<_, i64>(0)?,
                    row.get::<_, Option<String>>(1)?,
                    row.get::<_, String>(2)?,
                    row.get::<_, Option<i64>>(3)?,
                ))
            },
        )
        .optional()?;
    if let Some((walk_id, stored_hash, received_at, owner)) = existing {
        if owner.is_some() && owner != observer_id {
            return Ok(WalkInsertion::NotYours);
        }
        if stored_hash.as_deref() != Some(content_sha256) {
            return Ok(WalkInsertion::Conflict);
        }
        if owner.is_none() && observer_id.is_some() {
            tx.execute("UPDATE walks SET observer_id = ?1 WHERE id = ?2", params![observer_id, walk_id])?;
            tx.commit()?;
        }
        return Ok(WalkInsertion::Replayed(receipt(walk, walk_id, &received_at)?));
    }
    let received_at = now.to_rfc3339_opts(chrono::SecondsFormat::Millis, true);
    let effort = walk.effort();
    let json = serde_json::to_string(walk).map_err(|err| StoreError::Corrupt(err.to_string()))?;
    tx.execute(
        "INSERT INTO walks (client_id, started_at, ended_at, all_finds_reported, distance_m, received_at,
            content_sha256, submission_json, stretch, observer_name, duration_s, distance_source, observer_id)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13)",
        params![
            walk.client_id.to_string(),
            walk.started_at.to_rfc3339(),
            walk.ended_at.to_rfc3339(),
            walk.all_finds_reported,
            effort.distance_m,
            received_at,
            content_sha256,
            json,
            walk.stretch.as_ref().map(|s| s.as_str()),
            walk.observer_name.as_ref().map(|s| s.as_str()),
            effort.duration_s,
            serde_json::to_value(effort.distance_source).ok().and_then(|v| v.as_str().map(str::to_owned)),
            observer_id,
        ],
    )?;
    let walk_id = tx.last_insert_rowid();
    tx.commit()?;
    Ok(WalkInsertion::Created(receipt(walk, walk_id, &received_at)?))
}

fn receipt(walk: &WalkSubmission, walk_id: i64, received_at: &str) -> Result<WalkReceipt, StoreError> {
    let received_at = DateTime::parse_from_rfc3339(received_at)
        .map_err(|err| StoreError::Corrupt(format!("walk {walk_id}: {err}")))?
        .with_timezone(&Utc);
    Ok(WalkReceipt { client_id: walk.client_id, walk_id, received_at, effort: walk.effort() })
}

/// A stored walk with the records made on it.
#[derive(Debug, Clone, serde::Serialize)]
pub struct StoredWalk {
    pub walk_id: i64,
    pub walk: WalkSubmission,
    pub record_client_ids: Vec<Uuid>,
}

/// Every walk, earliest first.
pub fn list_walks(conn: &Connection) -> Result<Vec<StoredWalk>, StoreError> {
    let mut stmt = conn
        .prepare("SELECT id, submission_json FROM walks WHERE submission_json IS NOT NULL ORDER BY started_at, id")?;
    let rows = stmt
        .query_map([], |row| Ok((row.get::<_, i64>(0)?, row.get::<_, String>(1)?)))?
        .collect::<Result<Vec<_>, _>>()?;
    rows.into_iter()
        .map(|(walk_id, json)| {
            let walk: WalkSubmission =
                serde_json::from_str(&json).map_err(|err| StoreError::Corrupt(format!("walk {walk_id}: {err}")))?;
            let record_client_ids = records_on(conn, walk.client_id)?;
            Ok(StoredWalk { walk_id, walk, record_client_ids })
        })
        .collect()
}

/// Calls `each` with every walk, earliest first, one at a time (for exports: no record
/// lists, so memory stays flat however many walks there are), with who walked it as an
/// export may name them (the name given on the walk, their profile name, consent and public id).
pub fn for_each_walk(conn: &Connection, mut each: impl FnMut(WalkSubmission, ObserverRow)) -> Result<(), StoreError> {
    let mut stmt = conn.prepare(
        "SELECT w.id, w.submission_json, COALESCE(q.name_public, 0), q.public_id, q.display_name FROM walks w
         LEFT JOIN people q ON q.id = w.observer_id
         WHERE w.submission_json IS NOT NULL ORDER BY w.started_at, w.id",
    )?;
    let mut rows = stmt.query([])?;
    while let Some(row) = rows.next()? {
        let (walk_id, json): (i64, String) = (row.get(0)?, row.get(1)?);
        let walk: WalkSubmission =
            serde_json::from_str(&json).map_err(|err| StoreError::Corrupt(format!("walk {walk_id}: {err}")))?;
        let name = walk.observer_name.as_ref().map(|n| n.as_str().to_owned()).unwrap_or_default();
        each(walk, ObserverRow { name, name_public: row.get(2)?, public_id: row.get(3)?, profile_name: row.get(4)? });
    }
    Ok(())
}

fn records_on(conn: &Connection, walk: Uuid) -> Result<Vec<Uuid>, StoreError> {
    let mut stmt =
        conn.prepare("SELECT client_id FROM observations WHERE walk_client_id = ?1 ORDER BY observed_at_utc")?;
    let ids = stmt.query_map([walk.to_string()], |row| row.get::<_, String>(0))?.collect::<Result<Vec<_>, _>>()?;
    ids.iter().map(|id| Uuid::parse_str(id).map_err(|err| StoreError::Corrupt(err.to_string()))).collect()
}

/// The phone a stored walk came from: `None` when there is no such walk, `Some(None)`
/// for a walk with no known phone (the demo's, or sent before walks had owners).
pub fn walk_observer(conn: &Connection, walk: Uuid) -> Result<Option<Option<i64>>, StoreError> {
    Ok(conn
        .query_row("SELECT observer_id FROM walks WHERE client_id = ?1", [walk.to_string()], |row| row.get(0))
        .optional()?)
}

/// What linking a record to a walk did.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum LinkOutcome {
    Linked,
    /// The record was on this walk already: nothing changed.
    AlreadyLinked,
    /// The record is on another walk.
    OnAnotherWalk,
    NoSuchRecord,
}

/// Puts a record on a walk unless it is on another one.
pub fn link_record(conn: &mut Connection, record: Uuid, walk: Uuid) -> Result<LinkOutcome, StoreError> {
    let tx = conn.transaction()?;
    let current = tx
        .query_row("SELECT walk_client_id FROM observations WHERE client_id = ?1", [record.to_string()], |row| {
            row.get::<_, Option<String>>(0)
        })
        .optional()?;
    let outcome = match current {
        None => LinkOutcome::NoSuchRecord,
        Some(Some(existing)) if existing == walk.to_string() => LinkOutcome::AlreadyLinked,
        Some(Some(_)) => LinkOutcome::OnAnotherWalk,
        Some(None) => {
            tx.execute(
                "UPDATE observations SET walk_client_id = ?1 WHERE client_id = ?2",
                [walk.to_string(), record.to_string()],
            )?;
            LinkOutcome::Linked
        }
    };
    tx.commit()?;
    Ok(outcome)
}
