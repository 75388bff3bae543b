//! Duplicate candidates, decisions and merges in the database. A merge moves every report
//! of the later animal into the earlier one's organism and marks its first report
//! `merged`, remembering each row it changed (`merge_moves`), so undoing it puts every row
//! back as it was; merges are undone latest first where they moved the same reports.
//! Nothing is deleted: an undone merge keeps its row, with who undid it and when.

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
    /// The record's own position (latitude, longitude), if it has one.
    pub position: Option<(f64, f64)>,
    pub accuracy_m: Option<f64>,
    pub setting: String,
    pub condition: String,
    pub taxon_name: Option<String>,
    pub length: Option<(String, f64, String)>,
    /// Its photos, in order.
    pub photos: Vec<RawPhoto>,
}

/// One photo of a record, with both EXIF readings and the flags intake raised.
#[derive(Debug, Clone, Default)]
pub struct RawPhoto {
    /// 1 for the first photo.
    pub number: usize,
    pub sha256: String,
    /// SHA-256 of the original on the phone, when the phone sent it.
    pub original_sha256: Option<String>,
    /// Perceptual hash (16 hex digits).
    pub phash: Option<String>,
    /// Which reading intake compared with the record, field by field: `received_file` or `phone`.
    pub time_reading: Option<String>,
    pub place_reading: Option<String>,
    /// The server's reading of the received file: instant, place, GPSHPositioningError.
    pub file_taken_at: Option<String>,
    pub file_position: Option<(f64, f64)>,
    pub file_error_m: Option<f64>,
    /// The phone's reading of the original (a `PhotoExif` as JSON).
    pub phone_exif_json: Option<String>,
    /// `taken_long_before_record`, `taken_far_from_record`.
    pub flags: Vec<String>,
}

const RAW: &str = "
SELECT o.id, o.observed_at_utc, o.latitude, o.longitude, o.accuracy_m, o.setting, o.condition,
       (SELECT i.taxon_name FROM identifications i WHERE i.observation_id = o.id AND i.superseded_by IS NULL ORDER BY i.id DESC LIMIT 1),
       m.kind, m.value_cm, m.method
FROM observations o LEFT JOIN measurements m ON m.id = (SELECT MIN(k.id) FROM measurements k WHERE k.observation_id = o.id)";

const PHOTOS: &str = "
SELECT op.observation_id, op.position, op.photo_sha256, op.original_sha256, p.phash, op.time_reading, op.exif_taken_at,
       p.exif_latitude, p.exif_longitude, p.exif_h_error_m, op.phone_exif_json, op.place_reading,
       (SELECT group_concat(f.flag) FROM photo_flags f WHERE f.observation_id = op.observation_id AND f.photo_sha256 = op.photo_sha256)
FROM observation_photos op JOIN photos p ON p.sha256 = op.photo_sha256";

fn raw_row(row: &rusqlite::Row) -> rusqlite::Result<RawDup> {
    let lat: Option<f64> = row.get(2)?;
    let lon: Option<f64> = row.get(3)?;
    let kind: Option<String> = row.get(8)?;
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
        photos: Vec::new(),
    })
}

/// (observation id, photo) from a [`PHOTOS`] row; `number` is filled in by the caller.
fn photo_row(row: &rusqlite::Row) -> rusqlite::Result<(i64, RawPhoto)> {
    let lat: Option<f64> = row.get(7)?;
    let lon: Option<f64> = row.get(8)?;
    let flags: Option<String> = row.get(12)?;
    Ok((
        row.get(0)?,
        RawPhoto {
            number: 0,
            sha256: row.get(2)?,
            original_sha256: row.get(3)?,
            phash: row.get(4)?,
            time_reading: row.get(5)?,
            place_reading: row.get(11)?,
            file_taken_at: row.get(6)?,
            file_position: lat.zip(lon),
            file_error_m: row.get(9)?,
            phone_exif_json: row.get(10)?,
            flags: flags.map(|f| f.split(',').map(str::to_owned).collect()).unwrap_or_default(),
        },
    ))
}

fn photos_of(conn: &Connection, observation_id: i64) -> Result<Vec<RawPhoto>, StoreError> {
    let mut stmt = conn.prepare_cached(&format!("{PHOTOS} WHERE op.observation_id = ?1 ORDER BY op.position"))?;
    let rows = stmt.query_map([observation_id], photo_row)?;
    let mut photos = Vec::new();
    for (number, row) in rows.enumerate() {
        let (_, photo) = row?;
        photos.push(RawPhoto { number: number + 1, ..photo });
    }
    Ok(photos)
}

/// The records with these ids, not merged into another.
pub fn raw_records(conn: &Connection, ids: &[i64]) -> Result<Vec<RawDup>, StoreError> {
    let mut stmt = conn.prepare_cached(&format!("{RAW} WHERE o.id = ?1 AND o.review_state != 'merged'"))?;
    let mut out = Vec::with_capacity(ids.len());
    for id in ids {
        if let Some(mut raw) = stmt.query_row([id], raw_row).optional()? {
            raw.photos = photos_of(conn, raw.observation_id)?;
            out.push(raw);
        }
    }
    Ok(out)
}

/// The records stored after `id`, merged ones too (a merge can be undone while the
/// server runs, and the record must then be found again): all of them (`id` 0) to build
/// the index at start-up, then those another process stored since.
pub fn records_after(conn: &Connection, id: i64) -> Result<Vec<RawDup>, StoreError> {
    let mut photos: std::collections::HashMap<i64, Vec<RawPhoto>> = std::collections::HashMap::new();
    let mut stmt =
        conn.prepare_cached(&format!("{PHOTOS} WHERE op.observation_id > ?1 ORDER BY op.observation_id, op.position"))?;
    for row in stmt.query_map([id], photo_row)? {
        let (id, photo) = row?;
        let list = photos.entry(id).or_default();
        list.push(RawPhoto { number: list.len() + 1, ..photo });
    }
    let mut stmt = conn.prepare_cached(&format!("{RAW} WHERE o.id > ?1 ORDER BY o.id"))?;
    let rows = stmt.query_map([id], raw_row)?;
    rows.map(|raw| {
        let mut raw = raw?;
        raw.photos = photos.remove(&raw.observation_id).unwrap_or_default();
        Ok(raw)
    })
    .collect()
}

/// Whether the search for duplicates of this record completed.
pub fn searched(conn: &Connection, observation_id: i64) -> Result<bool, StoreError> {
    Ok(conn
        .prepare_cached("SELECT EXISTS (SELECT 1 FROM duplicate_searches WHERE observation_id = ?1)")?
        .query_row([observation_id], |r| r.get(0))?)
}

/// Records stored without a completed search for duplicates.
pub fn unsearched(conn: &Connection) -> Result<Vec<i64>, StoreError> {
    let mut stmt = conn.prepare("SELECT o.id FROM observations o WHERE NOT EXISTS (SELECT 1 FROM duplicate_searches s WHERE s.observation_id = o.id) ORDER BY o.id")?;
    let ids = stmt.query_map([], |row| row.get(0))?;
    Ok(ids.collect::<Result<Vec<_>, _>>()?)
}

/// Keeps the candidates found for `new` (pairs are stored once, smaller id first) and
/// notes that its search completed, in one transaction. A pair found before keeps its
/// row as it was.
pub fn save_candidates(
    conn: &mut Connection,
    new: i64,
    found: &[(i64, f64, Vec<String>)],
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    let tx = conn.savepoint()?;
    for (other, score, reasons) in found {
        let (a, b) = if new < *other { (new, *other) } else { (*other, new) };
        let reasons = serde_json::to_string(reasons).map_err(|err| StoreError::Corrupt(err.to_string()))?;
        tx.prepare_cached(
            "INSERT OR IGNORE INTO duplicate_candidates (observation_a, observation_b, score, reasons, found_at) VALUES (?1, ?2, ?3, ?4, ?5)",
        )?
        .execute(params![a, b, score, reasons, now.to_rfc3339()])?;
    }
    tx.prepare_cached("INSERT OR IGNORE INTO duplicate_searches (observation_id, searched_at) VALUES (?1, ?2)")?
        .execute(params![new, now.to_rfc3339()])?;
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
    let mut stmt = conn.prepare(&format!(
        "SELECT CASE WHEN c.observation_a = ?1 THEN c.observation_b ELSE c.observation_a END, c.score, c.reasons,
                CASE WHEN oa.organism_id = ob.organism_id THEN 'same animal' ELSE
                    (SELECT d.decision FROM duplicate_decisions d WHERE d.observation_a = c.observation_a AND d.observation_b = c.observation_b ORDER BY d.id DESC LIMIT 1) END,
                {JOINING_MERGE}
         FROM duplicate_candidates c JOIN observations oa ON oa.id = c.observation_a JOIN observations ob ON ob.id = c.observation_b
         WHERE c.observation_a = ?1 OR c.observation_b = ?1 ORDER BY c.score DESC"
    ))?;
    let rows = stmt.query_map([observation], |row| {
        Ok((row.get(0)?, row.get(1)?, row.get::<_, String>(2)?, row.get(3)?, row.get(4)?))
    })?;
    rows.map(|row| {
        let (other, score, reasons, decision, merge_id) = row?;
        let reasons =
            serde_json::from_str(&reasons).map_err(|err| StoreError::Corrupt(format!("candidate reasons: {err}")))?;
        Ok(StoredCandidate { other, score, reasons, decision, merge_id })
    })
    .collect()
}

/// The standing merge that made `oa` and `ob` one animal: of the standing merges that
/// moved exactly one of the two, the latest (later merges move both or neither).
const JOINING_MERGE: &str = "CASE WHEN oa.organism_id = ob.organism_id THEN
    (SELECT m.id FROM merges m WHERE m.undone_at IS NULL
        AND EXISTS (SELECT 1 FROM merge_moves v WHERE v.merge_id = m.id AND v.observation_id = oa.id)
         != EXISTS (SELECT 1 FROM merge_moves v WHERE v.merge_id = m.id AND v.observation_id = ob.id)
     ORDER BY m.id DESC LIMIT 1) END";

/// Observations with a candidate nobody has decided on yet: no decision recorded, and
/// not one animal by a standing merge.
pub fn undecided(conn: &Connection) -> Result<std::collections::HashSet<i64>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT c.observation_a, c.observation_b FROM duplicate_candidates c
         JOIN observations oa ON oa.id = c.observation_a JOIN observations ob ON ob.id = c.observation_b
         WHERE oa.organism_id != ob.organism_id
           AND NOT EXISTS (SELECT 1 FROM duplicate_decisions d WHERE d.observation_a = c.observation_a AND d.observation_b = c.observation_b)",
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
    Merged {
        merge_id: i64,
    },
    KeptApart,
    /// One of them is merged already, or they are one record.
    Refused,
}

fn log_event(
    tx: &Transaction,
    observation_id: i64,
    person: i64,
    action: &str,
    (from_state, to_state): (&str, &str),
    detail: &str,
    at: &str,
) -> Result<(), StoreError> {
    audit(
        tx,
        AuditRow {
            observation_id,
            person_id: Some(person),
            action,
            from_state,
            to_state,
            detail: Some(detail),
            reason: None,
            at,
        },
    )
}

/// A record's review state, organism and time.
struct Standing {
    id: i64,
    state: String,
    organism: i64,
    at_utc: String,
}

fn standing(tx: &Transaction, id: i64) -> Result<Option<Standing>, StoreError> {
    Ok(tx
        .query_row("SELECT review_state, organism_id, observed_at_utc FROM observations WHERE id = ?1", [id], |r| {
            Ok(Standing { id, state: r.get(0)?, organism: r.get(1)?, at_utc: r.get(2)? })
        })
        .optional()?)
}

/// Records a reviewer's decision on a pair. "Different animals" is a decision row, never
/// suggested again. "Same animal" merges: the animal whose first report is later (every
/// report of it, not only this one) joins the earlier one's organism; its first report
/// becomes `merged`; each moved row's organism and state are remembered in
/// `merge_moves`. A merge writes no decision row (the standing merge is the decision), so
/// undoing it leaves the decisions and candidates exactly as they were.
pub fn decide(
    conn: &mut Connection,
    x: i64,
    y: i64,
    same: bool,
    person: i64,
    now: DateTime<Utc>,
) -> Result<Decided, StoreError> {
    let tx = conn.transaction()?;
    let (a, b) = if x < y { (x, y) } else { (y, x) };
    let (Some(first), Some(second)) = (standing(&tx, a)?, standing(&tx, b)?) else { return Ok(Decided::Refused) };
    if a == b
        || first.state == ReviewState::Merged.code()
        || second.state == ReviewState::Merged.code()
        || first.organism == second.organism
    {
        return Ok(Decided::Refused);
    }
    let at = now.to_rfc3339_opts(chrono::SecondsFormat::Millis, true);
    if !same {
        tx.execute(
            "INSERT INTO duplicate_decisions (observation_a, observation_b, decision, person_id, at) VALUES (?1, ?2, 'different animals', ?3, ?4)",
            params![a, b, person, at],
        )?;
        for (id, state) in [(a, &first.state), (b, &second.state)] {
            log_event(
                &tx,
                id,
                person,
                "different_animals",
                (state, state),
                &format!("kept apart from record {}", if id == a { b } else { a }),
                &at,
            )?;
        }
        tx.commit()?;
        return Ok(Decided::KeptApart);
    }
    // Neither is merged, so each is the first report of its animal.
    let (kept, joining) = if first.at_utc <= second.at_utc { (first, second) } else { (second, first) };
    let merge_id = merge(&tx, &kept, &joining, person, &at)?;
    tx.commit()?;
    Ok(Decided::Merged { merge_id })
}

/// Moves every report of `joining`'s animal into `kept`'s, remembering each.
fn merge(tx: &Transaction, kept: &Standing, joining: &Standing, person: i64, at: &str) -> Result<i64, StoreError> {
    tx.execute(
        "INSERT INTO merges (kept_observation_id, merged_observation_id, previous_organism_id, previous_state, person_id, at) VALUES (?1, ?2, ?3, ?4, ?5, ?6)",
        params![kept.id, joining.id, joining.organism, joining.state, person, at],
    )?;
    let merge_id = tx.last_insert_rowid();
    tx.execute(
        "INSERT INTO merge_moves (merge_id, observation_id, previous_organism_id, previous_state)
         SELECT ?1, id, organism_id, review_state FROM observations WHERE organism_id = ?2",
        params![merge_id, joining.organism],
    )?;
    tx.execute(
        "UPDATE observations SET organism_id = ?1 WHERE organism_id = ?2",
        params![kept.organism, joining.organism],
    )?;
    tx.execute(
        "UPDATE observations SET review_state = ?1 WHERE id = ?2",
        params![ReviewState::Merged.code(), joining.id],
    )?;
    let mut others = tx.prepare(
        "SELECT observation_id FROM merge_moves WHERE merge_id = ?1 AND observation_id != ?2 ORDER BY observation_id",
    )?;
    let others: Vec<i64> = others.query_map(params![merge_id, joining.id], |r| r.get(0))?.collect::<Result<_, _>>()?;
    let merged = ReviewState::Merged.code();
    log_event(
        tx,
        joining.id,
        person,
        "merge",
        (&joining.state, merged),
        &format!("the same animal as record {} (merge {merge_id})", kept.id),
        at,
    )?;
    for other in &others {
        log_event(
            tx,
            *other,
            person,
            "merge",
            (merged, merged),
            &format!("moved with record {} into the animal of record {} (merge {merge_id})", joining.id, kept.id),
            at,
        )?;
    }
    log_event(
        tx,
        kept.id,
        person,
        "merge",
        (&kept.state, &kept.state),
        &format!(
            "record {} joined this animal, bringing {} other report(s) (merge {merge_id})",
            joining.id,
            others.len()
        ),
        at,
    )?;
    Ok(merge_id)
}

/// What an undo did.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Undo {
    Undone,
    /// No such merge, or it was undone already.
    NotFound,
    /// A later merge, still standing, moved some of the same reports: undo that first.
    Blocked {
        by: i64,
    },
}

/// Undoes a merge exactly: every report it moved gets back its organism and its review
/// state, and the merge is marked undone (kept, with who and when) and written to the
/// audit trail. Decisions and candidates are untouched, so the pair is a candidate again.
pub fn undo_merge(conn: &mut Connection, merge_id: i64, person: i64, now: DateTime<Utc>) -> Result<Undo, StoreError> {
    let tx = conn.transaction()?;
    let kept: Option<i64> = tx
        .query_row("SELECT kept_observation_id FROM merges WHERE id = ?1 AND undone_at IS NULL", [merge_id], |r| {
            r.get(0)
        })
        .optional()?;
    let Some(kept) = kept else { return Ok(Undo::NotFound) };
    let later: Option<i64> = tx
        .query_row(
            "SELECT MIN(m.id) FROM merges m JOIN merge_moves v ON v.merge_id = m.id
             WHERE m.id > ?1 AND m.undone_at IS NULL AND v.observation_id IN (SELECT observation_id FROM merge_moves WHERE merge_id = ?1)",
            [merge_id],
            |r| r.get(0),
        )?;
    if let Some(by) = later {
        return Ok(Undo::Blocked { by });
    }
    let at = now.to_rfc3339_opts(chrono::SecondsFormat::Millis, true);
    let mut stmt = tx.prepare("SELECT observation_id, previous_organism_id, previous_state FROM merge_moves WHERE merge_id = ?1 ORDER BY observation_id")?;
    let moves: Vec<(i64, i64, String)> =
        stmt.query_map([merge_id], |r| Ok((r.get(0)?, r.get(1)?, r.get(2)?)))?.collect::<Result<_, _>>()?;
    drop(stmt);
    for (observation, organism, state) in &moves {
        let now_state: String =
            tx.query_row("SELECT review_state FROM observations WHERE id = ?1", [observation], |r| r.get(0))?;
        tx.execute(
            "UPDATE observations SET organism_id = ?1, review_state = ?2 WHERE id = ?3",
            params![organism, state, observation],
        )?;
        log_event(
            &tx,
            *observation,
            person,
            "undo_merge",
            (&now_state, state),
            &format!("merge {merge_id} undone"),
            &at,
        )?;
    }
    tx.execute("UPDATE merges SET undone_at = ?1, undone_by = ?2 WHERE id = ?3", params![at, person, merge_id])?;
    let kept_state: String =
        tx.query_row("SELECT review_state FROM observations WHERE id = ?1", [kept], |r| r.get(0))?;
    log_event(
        &tx,
        kept,
        person,
        "undo_merge",
        (&kept_state, &kept_state),
        &format!("merge {merge_id} undone: {} report(s) are their own animal again", moves.len()),
        &at,
    )?;
    tx.commit()?;
    Ok(Undo::Undone)
}

/// Other records holding one of this record's photo files, or a photo made from the same
/// original on a phone.
pub fn sharing_a_photo(conn: &Connection, observation: i64) -> Result<Vec<i64>, StoreError> {
    let mut stmt = conn.prepare_cached(
        "SELECT other.observation_id FROM observation_photos mine JOIN observation_photos other
           ON other.photo_sha256 = mine.photo_sha256 AND other.observation_id != mine.observation_id WHERE mine.observation_id = ?1
         UNION
         SELECT other.observation_id FROM observation_photos mine JOIN observation_photos other
           ON other.original_sha256 = mine.original_sha256 AND other.observation_id != mine.observation_id
         WHERE mine.observation_id = ?1 AND mine.original_sha256 IS NOT NULL",
    )?;
    let ids = stmt.query_map([observation], |row| row.get(0))?;
    Ok(ids.collect::<Result<Vec<_>, _>>()?)
}
