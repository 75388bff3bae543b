//! Duplicate candidates, decisions and merges in the database. A merge moves the later
//! report into the earlier one's organism and marks it `merged`, remembering exactly what
//! it changed, so undoing it puts every row back as it was.

use chrono::{DateTime, Utc};
use rusqlite::{Connection, OptionalExtension, Transaction, params};
use shared_types::ReviewState;

use super::StoreError;
use super::review::{AuditRow, audit};

/// What duplicate scoring needs of one stored record, before names are looked up.
#[derive(Debug, Clone)]
pub struct RawDup {
    pub observation_id: i64,
    pub at_utc: String,
    pub position: Option<(f64, f64)>,
    pub accuracy_m: Option<f64>,
    pub setting: String,
    pub condition: String,
    pub taxon_name: Option<String>,
    pub length: Option<(String, f64, String)>,
    pub photo_hashes: Vec<String>,
    /// Perceptual hashes of its photos (16 hex digits each).
    pub photo_phashes: Vec<String>,
}

const RAW: &str = "
SELECT o.id, o.observed_at_utc,
       COALESCE(o.latitude, (SELECT p.exif_latitude FROM observation_photos op JOIN photos p ON p.sha256 = op.photo_sha256
                             WHERE op.observation_id = o.id AND p.exif_latitude IS NOT NULL ORDER BY op.position LIMIT 1)),
       COALESCE(o.longitude, (SELECT p.exif_longitude FROM observation_photos op JOIN photos p ON p.sha256 = op.photo_sha256
                              WHERE op.observation_id = o.id AND p.exif_longitude IS NOT NULL ORDER BY op.position LIMIT 1)),
       o.accuracy_m, o.setting, o.condition,
       (SELECT i.taxon_name FROM identifications i WHERE i.observation_id = o.id AND i.superseded_by IS NULL ORDER BY i.id DESC LIMIT 1),
       m.kind, m.value_cm, m.method,
       (SELECT group_concat(op.photo_sha256, ' ') FROM observation_photos op WHERE op.observation_id = o.id),
       (SELECT group_concat(p.phash, ' ') FROM observation_photos op JOIN photos p ON p.sha256 = op.photo_sha256
        WHERE op.observation_id = o.id AND p.phash IS NOT NULL)
FROM observations o LEFT JOIN measurements m ON m.id = (SELECT MIN(k.id) FROM measurements k WHERE k.observation_id = o.id)";

fn raw_row(row: &rusqlite::Row) -> rusqlite::Result<RawDup> {
    let lat: Option<f64> = row.get(2)?;
    let lon: Option<f64> = row.get(3)?;
    let kind: Option<String> = row.get(8)?;
    let hashes: Option<String> = row.get(11)?;
    let phashes: Option<String> = row.get(12)?;
    Ok(RawDup {
        observation_id: row.get(0)?,
        at_utc: row.get(1)?,
        position: lat.zip(lon),
        accuracy_m: row.get(4)?,
        setting: row.get(5)?,
        condition: row.get(6)?,
        taxon_name: row.get(7)?,
        length: match kind {
            Some(kind) => Some((kind, row.get(9)?, row.get(10)?)),
            None => None,
        },
        photo_hashes: hashes.map(|h| h.split(' ').map(str::to_owned).collect()).unwrap_or_default(),
        photo_phashes: phashes.map(|h| h.split(' ').map(str::to_owned).collect()).unwrap_or_default(),
    })
}

/// The records with these ids, not merged into another.
pub fn raw_records(conn: &Connection, ids: &[i64]) -> Result<Vec<RawDup>, StoreError> {
    let mut stmt = conn.prepare_cached(&format!("{RAW} WHERE o.id = ?1 AND o.review_state != 'merged'"))?;
    let mut out = Vec::with_capacity(ids.len());
    for id in ids {
        if let Some(raw) = stmt.query_row([id], raw_row).optional()? {
            out.push(raw);
        }
    }
    Ok(out)
}

/// Every record with a position (its own or its photo's), for building the index.
pub fn all_positions(conn: &Connection) -> Result<Vec<crate::duplicates::IndexedPoint>, StoreError> {
    let mut stmt = conn.prepare(&format!("{RAW} WHERE o.review_state != 'merged'"))?;
    let rows = stmt.query_map([], raw_row)?;
    let mut out = Vec::new();
    for raw in rows {
        let raw = raw?;
        let at = chrono::DateTime::parse_from_rfc3339(&raw.at_utc).map_err(|err| StoreError::Corrupt(format!("observation {}: {err}", raw.observation_id)))?;
        if let Some(position) = raw.position {
            out.push((raw.observation_id, position, raw.accuracy_m, at.with_timezone(&Utc)));
        }
    }
    Ok(out)
}

/// Keeps the candidates found for `new` (pairs are stored once, smaller id first).
pub fn save_candidates(conn: &mut Connection, new: i64, found: &[(i64, f64, Vec<String>)], now: DateTime<Utc>) -> Result<(), StoreError> {
    let tx = conn.transaction()?;
    for (other, score, reasons) in found {
        let (a, b) = if new < *other { (new, *other) } else { (*other, new) };
        let reasons = serde_json::to_string(reasons).map_err(|err| StoreError::Corrupt(err.to_string()))?;
        tx.execute(
            "INSERT OR REPLACE INTO duplicate_candidates (observation_a, observation_b, score, reasons, found_at) VALUES (?1, ?2, ?3, ?4, ?5)",
            params![a, b, score, reasons, now.to_rfc3339()],
        )?;
    }
    tx.commit()?;
    Ok(())
}

/// One candidate of a record: the other record, the score and reasons, and any decision.
#[derive(Debug, Clone, PartialEq)]
pub struct StoredCandidate {
    pub other: i64,
    pub score: f64,
    pub reasons: Vec<String>,
    pub decision: Option<String>,
    /// The merge that joined them, when it has not been undone.
    pub merge_id: Option<i64>,
}

pub fn candidates_of(conn: &Connection, observation: i64) -> Result<Vec<StoredCandidate>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT CASE WHEN c.observation_a = ?1 THEN c.observation_b ELSE c.observation_a END, c.score, c.reasons,
                (SELECT d.decision FROM duplicate_decisions d WHERE d.observation_a = c.observation_a AND d.observation_b = c.observation_b ORDER BY d.id DESC LIMIT 1),
                (SELECT m.id FROM merges m WHERE m.undone_at IS NULL AND
                    ((m.kept_observation_id = c.observation_a AND m.merged_observation_id = c.observation_b) OR
                     (m.kept_observation_id = c.observation_b AND m.merged_observation_id = c.observation_a)))
         FROM duplicate_candidates c WHERE c.observation_a = ?1 OR c.observation_b = ?1 ORDER BY c.score DESC",
    )?;
    let rows = stmt.query_map([observation], |row| Ok((row.get(0)?, row.get(1)?, row.get::<_, String>(2)?, row.get(3)?, row.get(4)?)))?;
    rows.map(|row| {
        let (other, score, reasons, decision, merge_id) = row?;
        let reasons = serde_json::from_str(&reasons).map_err(|err| StoreError::Corrupt(format!("candidate reasons: {err}")))?;
        Ok(StoredCandidate { other, score, reasons, decision, merge_id })
    })
    .collect()
}

/// Observations with a candidate nobody has decided on yet.
pub fn undecided(conn: &Connection) -> Result<std::collections::HashSet<i64>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT c.observation_a, c.observation_b FROM duplicate_candidates c
         WHERE NOT EXISTS (SELECT 1 FROM duplicate_decisions d WHERE d.observation_a = c.observation_a AND d.observation_b = c.observation_b)",
    )?;
    let mut ids = std::collections::HashSet::new();
    for pair in stmt.query_map([], |row| Ok((row.get::<_, i64>(0)?, row.get::<_, i64>(1)?)))? {
        let (a, b) = pair?;
        ids.insert(a);
        ids.insert(b);
    }
    Ok(ids)
}

/// What a decision did.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Decided {
    Merged { merge_id: i64 },
    KeptApart,
    /// One of them is merged already, or they are one record.
    Refused,
}

fn log_event(tx: &Transaction, observation_id: i64, person: i64, action: &str, (from_state, to_state): (&str, &str), detail: &str, at: &str) -> Result<(), StoreError> {
    audit(tx, AuditRow { observation_id, person_id: Some(person), action, from_state, to_state, detail: Some(detail), reason: None, at })
}

/// Records a reviewer's decision on a pair. "Same animal" merges the later report into
/// the earlier one's organism.
pub fn decide(conn: &mut Connection, x: i64, y: i64, same: bool, person: i64, now: DateTime<Utc>) -> Result<Decided, StoreError> {
    let tx = conn.transaction()?;
    let (a, b) = if x < y { (x, y) } else { (y, x) };
    let state_of = |id: i64| tx.query_row("SELECT review_state, organism_id, observed_at_utc FROM observations WHERE id = ?1", [id], |r| Ok((r.get::<_, String>(0)?, r.get::<_, i64>(1)?, r.get::<_, String>(2)?))).optional();
    let (Some(first), Some(second)) = (state_of(a)?, state_of(b)?) else { return Ok(Decided::Refused) };
    if a == b || first.0 == "merged" || second.0 == "merged" {
        return Ok(Decided::Refused);
    }
    let at = now.to_rfc3339_opts(chrono::SecondsFormat::Millis, true);
    let decision = if same { "same animal" } else { "different animals" };
    tx.execute(
        "INSERT INTO duplicate_decisions (observation_a, observation_b, decision, person_id, at) VALUES (?1, ?2, ?3, ?4, ?5)",
        params![a, b, decision, person, at],
    )?;
    if !same {
        for (id, state) in [(a, &first.0), (b, &second.0)] {
            log_event(&tx, id, person, "different_animals", (state, state), &format!("kept apart from record {}", if id == a { b } else { a }), &at)?;
        }
        tx.commit()?;
        return Ok(Decided::KeptApart);
    }
    // The earlier observation keeps its organism; the later joins it.
    let ((kept, kept_row), (merged, merged_row)) = if first.2 <= second.2 { ((a, first), (b, second)) } else { ((b, second), (a, first)) };
    tx.execute(
        "INSERT INTO merges (kept_observation_id, merged_observation_id, previous_organism_id, previous_state, person_id, at) VALUES (?1, ?2, ?3, ?4, ?5, ?6)",
        params![kept, merged, merged_row.1, merged_row.0, person, at],
    )?;
    let merge_id = tx.last_insert_rowid();
    tx.execute("UPDATE observations SET organism_id = ?1, review_state = 'merged' WHERE id = ?2", params![kept_row.1, merged])?;
    log_event(&tx, merged, person, "merge", (&merged_row.0, ReviewState::Merged.code()), &format!("the same animal as record {kept} (merge {merge_id})"), &at)?;
    log_event(&tx, kept, person, "merge", (&kept_row.0, &kept_row.0), &format!("record {merged} joined this animal (merge {merge_id})"), &at)?;
    tx.commit()?;
    Ok(Decided::Merged { merge_id })
}

/// Undoes a merge exactly: the merged record gets back its organism and its state.
/// `false` when there is no such merge or it was undone already.
pub fn undo_merge(conn: &mut Connection, merge_id: i64, person: i64, now: DateTime<Utc>) -> Result<bool, StoreError> {
    let tx = conn.transaction()?;
    let merge = tx
        .query_row(
            "SELECT kept_observation_id, merged_observation_id, previous_organism_id, previous_state FROM merges WHERE id = ?1 AND undone_at IS NULL",
            [merge_id],
            |r| Ok((r.get::<_, i64>(0)?, r.get::<_, i64>(1)?, r.get::<_, i64>(2)?, r.get::<_, String>(3)?)),
        )
        .optional()?;
    let Some((kept, merged, organism, state)) = merge else { return Ok(false) };
    let at = now.to_rfc3339_opts(chrono::SecondsFormat::Millis, true);
    tx.execute("UPDATE observations SET organism_id = ?1, review_state = ?2 WHERE id = ?3", params![organism, state, merged])?;
    tx.execute("UPDATE merges SET undone_at = ?1, undone_by = ?2 WHERE id = ?3", params![at, person, merge_id])?;
    // The decision is superseded by a new one, never deleted.
    let (a, b) = if kept < merged { (kept, merged) } else { (merged, kept) };
    tx.execute(
        "INSERT INTO duplicate_decisions (observation_a, observation_b, decision, person_id, at) VALUES (?1, ?2, 'different animals', ?3, ?4)",
        params![a, b, person, at],
    )?;
    log_event(&tx, merged, person, "undo_merge", (ReviewState::Merged.code(), &state), &format!("merge {merge_id} undone"), &at)?;
    let kept_state: String = tx.query_row("SELECT review_state FROM observations WHERE id = ?1", [kept], |r| r.get(0))?;
    log_event(&tx, kept, person, "undo_merge", (&kept_state, &kept_state), &format!("merge {merge_id} undone: record {merged} is its own animal again"), &at)?;
    tx.commit()?;
    Ok(true)
}

/// Other records holding one of this record's photo files.
pub fn sharing_a_photo(conn: &Connection, observation: i64) -> Result<Vec<i64>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT DISTINCT other.observation_id FROM observation_photos mine JOIN observation_photos other
         ON other.photo_sha256 = mine.photo_sha256 AND other.observation_id != mine.observation_id WHERE mine.observation_id = ?1",
    )?;
    let ids = stmt.query_map([observation], |row| row.get(0))?;
    Ok(ids.collect::<Result<Vec<_>, _>>()?)
}
