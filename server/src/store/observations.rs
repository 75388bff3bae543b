//! Observations, their photos, lengths and first identification: written in one
//! transaction, read back as [`RecordView`]s.

use shared_types::codes::{code, from_code};
use std::collections::HashMap;

use chrono::{DateTime, Utc};
use rusqlite::{Connection, OptionalExtension, params};
use shared_types::{
    FlagKind, OffsetSource, PhotoCheck, PhotoExif, PhotoFlag, PhotoView, Receipt, RecordFlag, RecordView, ReviewState,
    Submission,
};
use uuid::Uuid;

use super::StoreError;

/// A photo whose file is already durably on disk, ready to be linked to a record.
#[derive(Debug, Clone)]
pub struct StoredPhoto {
    pub sha256: String,
    pub media_type: String,
    pub byte_len: u64,
    /// Pixel size as stored (before orientation).
    pub width: u32,
    pub height: u32,
    /// See `intake::images::perceptual_hash`.
    pub phash: String,
    pub exif: PhotoExif,
    /// What the phone read from the original, when it sent that.
    pub phone_exif: Option<PhotoExif>,
    /// The photo against this record (see `intake::photo_checks`).
    pub check: PhotoCheck,
    /// The file ends before its image data does (see `intake::images::cut_short`).
    pub cut_short: bool,
}

/// Everything intake has checked and is ready to store.
/// A stored photo's perceptual hash, with the observations that carry the photo.
#[derive(Debug, Clone)]
pub struct HashedPhoto {
    pub sha256: String,
    pub phash: String,
    pub observation_ids: Vec<i64>,
}

#[derive(Debug, Clone)]
pub struct NewObservation {
    pub submission: Submission,
    /// SHA-256 over the submission and its photos, to tell a retry from a changed resend.
    pub content_sha256: String,
    pub photos: Vec<StoredPhoto>,
    /// Flags raised on arrival, for reviewers.
    pub flags: Vec<RecordFlag>,
    /// The checklist's scientific name for the observer's guess, when it matched one.
    pub guessed_taxon: Option<String>,
    /// The observer's person id, when the phone sent its device identity.
    pub observer_id: Option<i64>,
}

/// What happened to a submission.
#[derive(Debug, Clone, PartialEq)]
pub enum Insertion {
    Created(Receipt),
    /// The same client id with the same content was stored before: the earlier receipt.
    Replayed(Receipt),
    /// The same client id was stored before with other content.
    Conflict,
}

/// Stores one observation, its own organism, lengths, signs, photos and the
/// observer's guess as the first identification, all or nothing.
pub fn insert_observation(
    conn: &mut Connection,
    new: &NewObservation,
    now: DateTime<Utc>,
) -> Result<Insertion, StoreError> {
    let tx = conn.savepoint()?;
    let client_id = new.submission.client_id.to_string();
    if let Some((stored_hash, receipt)) = existing_receipt(&tx, &client_id)? {
        return Ok(if stored_hash == new.content_sha256 { Insertion::Replayed(receipt) } else { Insertion::Conflict });
    }
    let received_at = now.to_rfc3339_opts(chrono::SecondsFormat::Millis, true);
    tx.prepare_cached("INSERT INTO organisms (created_at) VALUES (?1)")?.execute([&received_at])?;
    let organism_id = tx.last_insert_rowid();
    let observation_id = insert_observation_row(&tx, new, organism_id, &received_at)?;
    insert_details(&tx, observation_id, new)?;
    for (position, photo) in new.photos.iter().enumerate() {
        link_photo(&tx, observation_id, position, photo, &received_at)?;
    }
    for flag in &new.flags {
        tx.prepare_cached(
            "INSERT OR IGNORE INTO observation_flags (observation_id, kind, reason, raised_at) VALUES (?1, ?2, ?3, ?4)",
        )?
        .execute(params![observation_id, code(&flag.kind), flag.reason, received_at])?;
    }
    tx.commit()?;
    Ok(Insertion::Created(Receipt {
        client_id: new.submission.client_id,
        observation_id,
        received_at: parse_utc(&received_at)?,
        photo_count: distinct_photos(&new.photos),
    }))
}

/// How many photos a record holds: the same file sent twice in one record is one photo
/// (kept at its first position), on the first receipt and on a resend's alike.
fn distinct_photos(photos: &[StoredPhoto]) -> usize {
    photos.iter().map(|p| p.sha256.as_str()).collect::<std::collections::HashSet<_>>().len()
}

/// The stored content fingerprint and receipt of the record with this client id, if it
/// was stored: a resend is answered from it.
pub fn existing_receipt(conn: &Connection, client_id: &str) -> Result<Option<(String, Receipt)>, StoreError> {
    let row = conn
        .prepare_cached(
            "SELECT o.id, o.content_sha256, o.received_at,
                    (SELECT COUNT(*) FROM observation_photos p WHERE p.observation_id = o.id)
             FROM observations o WHERE o.client_id = ?1",
        )?
        .query_row([client_id], |row| {
            Ok((row.get::<_, i64>(0)?, row.get::<_, String>(1)?, row.get::<_, String>(2)?, row.get::<_, i64>(3)?))
        })
        .optional()?;
    row.map(|(observation_id, hash, received_at, photos)| {
        let client_id = Uuid::parse_str(client_id).map_err(|err| StoreError::Corrupt(err.to_string()))?;
        let receipt =
            Receipt { client_id, observation_id, received_at: parse_utc(&received_at)?, photo_count: photos as usize };
        Ok((hash, receipt))
    })
    .transpose()
}

fn insert_observation_row(
    tx: &Connection,
    new: &NewObservation,
    organism_id: i64,
    received_at: &str,
) -> Result<i64, StoreError> {
    let sub = &new.submission;
    let json = serde_json::to_string(sub).map_err(|err| StoreError::Corrupt(err.to_string()))?;
    let position = sub.position.as_ref();
    tx.prepare_cached(
        "INSERT INTO observations (client_id, content_sha256, organism_id, observed_at, observed_at_utc,
            latitude, longitude, accuracy_m, position_source, count, condition, setting, sex, notes,
            observer_name, review_state, submission_json, received_at, walk_client_id, observer_id, life_stage)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16, ?17, ?18, ?19, ?20, ?21)",
    )?
    .execute(params![
        sub.client_id.to_string(),
        new.content_sha256,
        organism_id,
        sub.observed_at.to_rfc3339(),
        sub.observed_at.with_timezone(&Utc).to_rfc3339_opts(chrono::SecondsFormat::Secs, true),
        position.map(|p| p.latitude.get()),
        position.map(|p| p.longitude.get()),
        position.and_then(|p| p.accuracy_m).map(|a| a.get()),
        position.map(|p| code(&p.source)),
        sub.count.get(),
        code(&sub.condition),
        code(&sub.setting),
        code(&sub.sex),
        sub.notes.as_ref().map(|n| n.as_str()),
        sub.observer_name.as_ref().map(|n| n.as_str()),
        ReviewState::AwaitingReview.code(),
        json,
        received_at,
        sub.walk_client_id.map(|id| id.to_string()),
        new.observer_id,
        sub.life_stage.as_ref().map(code),
    ])?;
    Ok(tx.last_insert_rowid())
}

fn insert_details(tx: &Connection, observation_id: i64, new: &NewObservation) -> Result<(), StoreError> {
    let sub = &new.submission;
    if let Some(length) = &sub.length {
        tx.prepare_cached(
            "INSERT INTO measurements (observation_id, kind, value, unit, value_cm, method) VALUES (?1, ?2, ?3, ?4, ?5, ?6)",
        )?
        .execute(
            params![observation_id, code(&length.kind), length.value.value, length.value.unit.code(), length.value.centimetres(), code(&length.method)],
        )?;
    }
    for sign in &sub.human_signs {
        tx.prepare_cached("INSERT INTO human_signs (observation_id, sign) VALUES (?1, ?2)")?
            .execute(params![observation_id, code(sign)])?;
    }
    let observer = sub.observer_name.as_ref().map(|n| n.as_str());
    // The observer named the record when they made it: the submission's own time (as an
    // instant in UTC, like every identification time), not the server's receipt.
    let named_at = sub.observed_at.with_timezone(&Utc).to_rfc3339_opts(chrono::SecondsFormat::Millis, true);
    if let Some(choice) = &sub.key_choice {
        tx.prepare_cached(
            "INSERT INTO identifications (observation_id, taxon_name, taxon_rank, identified_by, identified_at, remarks, basis)
             VALUES (?1, ?2, ?3, ?4, ?5, ?6, 'observer with the guided key')",
        )?
        .execute(
            params![
                observation_id,
                choice.scientific_name.as_str(),
                choice.taxon_rank,
                observer,
                named_at,
                format!("guided key probability {:.2}", choice.probability)
            ],
        )?;
    } else if let Some(guess) = sub.species_guess.as_ref().filter(|g| !g.as_str().is_empty()) {
        // A guess that names a checklist species is kept under its scientific name.
        let (name, rank) = match &new.guessed_taxon {
            Some(name) => (name.as_str(), Some("species")),
            None => (guess.as_str(), None),
        };
        tx.prepare_cached(
            "INSERT INTO identifications (observation_id, taxon_name, taxon_rank, identified_by, identified_at, remarks, basis)
             VALUES (?1, ?2, ?3, ?4, ?5, ?6, 'observer guess')",
        )?
        .execute(
            params![observation_id, name, rank, observer, named_at, format!("as typed: {}", guess.as_str())],
        )?;
    }
    Ok(())
}

/// Stores a photo row (once per file) and links it to an observation at `position`.
/// The link is keyed by record and file, so the same file twice in one record is one
/// link at its first position: the server accepts such a record (an older phone may
/// send it) rather than refuse evidence, and the phone refuses to add a photo twice.
pub(super) fn link_photo(
    tx: &Connection,
    observation_id: i64,
    position: usize,
    photo: &StoredPhoto,
    received_at: &str,
) -> Result<(), StoreError> {
    let exif = &photo.exif;
    let phone_json = photo
        .phone_exif
        .as_ref()
        .map(serde_json::to_string)
        .transpose()
        .map_err(|err| StoreError::Corrupt(err.to_string()))?;
    // The same file may already be stored for another record: keep the first row.
    tx.prepare_cached(
        "INSERT OR IGNORE INTO photos (sha256, media_type, byte_len, exif_taken_local, exif_offset, exif_latitude,
            exif_longitude, exif_altitude_m, exif_h_error_m, exif_orientation, stored_at, width, height, phash)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14)",
    )?
    .execute(params![
        photo.sha256,
        photo.media_type,
        photo.byte_len as i64,
        exif.taken_local,
        exif.offset,
        exif.latitude,
        exif.longitude,
        exif.altitude_m,
        exif.horizontal_error_m,
        exif.orientation,
        received_at,
        photo.width,
        photo.height,
        photo.phash
    ])?;
    tx.prepare_cached(
        "INSERT OR IGNORE INTO observation_photos (observation_id, photo_sha256, position, exif_taken_at, offset_source,
            seconds_before_record, metres_from_record, time_reading, place_reading, phone_exif_json, original_sha256)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11)",
    )?
    .execute(
        params![
            observation_id,
            photo.sha256,
            position as i64,
            exif.taken_at.map(|t| t.to_rfc3339()),
            exif.offset_source.as_ref().map(code),
            photo.check.seconds_before_record,
            photo.check.metres_from_record,
            photo.check.time_reading.as_ref().map(code),
            photo.check.place_reading.as_ref().map(code),
            phone_json,
            photo.phone_exif.as_ref().and_then(|p| p.original_sha256.as_ref()).map(|h| h.as_str()),
        ],
    )?;
    for flag in &photo.check.flags {
        tx.prepare_cached(
            "INSERT OR IGNORE INTO photo_flags (observation_id, photo_sha256, flag) VALUES (?1, ?2, ?3)",
        )?
        .execute(params![observation_id, photo.sha256, code(flag)])?;
    }
    Ok(())
}

/// All records, oldest observation first.
pub fn list_records(conn: &Connection) -> Result<Vec<RecordView>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT id, organism_id, received_at, review_state, submission_json, walk_client_id FROM observations ORDER BY observed_at_utc, id",
    )?;
    let rows = stmt.query_map([], record_row)?.collect::<Result<Vec<_>, _>>()?;
    rows.into_iter().map(|row| finish_record(conn, row)).collect()
}

/// One record by the phone's id.
pub fn record_by_client_id(conn: &Connection, client_id: Uuid) -> Result<Option<RecordView>, StoreError> {
    let row = conn
        .query_row(
            "SELECT id, organism_id, received_at, review_state, submission_json, walk_client_id FROM observations WHERE client_id = ?1",
            [client_id.to_string()],
            record_row,
        )
        .optional()?;
    row.map(|row| finish_record(conn, row)).transpose()
}

/// One record by the server's number for it.
pub fn record_by_observation_id(conn: &Connection, id: i64) -> Result<Option<RecordView>, StoreError> {
    let row = conn
        .query_row(
            "SELECT id, organism_id, received_at, review_state, submission_json, walk_client_id FROM observations WHERE id = ?1",
            [id],
            record_row,
        )
        .optional()?;
    row.map(|row| finish_record(conn, row)).transpose()
}

/// Whether a stored photo row names the file with this hash.
pub fn photo_is_stored(conn: &Connection, sha256: &str) -> Result<bool, StoreError> {
    Ok(conn.query_row("SELECT EXISTS (SELECT 1 FROM photos WHERE sha256 = ?1)", [sha256], |row| row.get(0))?)
}

/// The hashes of stored photos that start with `prefix` (two hex digits: one folder of
/// the photo files).
pub fn photo_hashes_starting(conn: &Connection, prefix: &str) -> Result<std::collections::HashSet<String>, StoreError> {
    // Hex digits sort below 'g', so the prefix followed by 'g' is past every hash with it.
    let mut stmt = conn.prepare("SELECT sha256 FROM photos WHERE sha256 >= ?1 AND sha256 < ?2")?;
    let rows = stmt.query_map([prefix.to_owned(), format!("{prefix}g")], |row| row.get(0))?;
    Ok(rows.collect::<Result<_, _>>()?)
}

/// How many observations are stored.
pub fn count_observations(conn: &Connection) -> Result<i64, StoreError> {
    Ok(conn.query_row("SELECT COUNT(*) FROM observations", [], |row| row.get(0))?)
}

/// The media type and EXIF Orientation of a stored photo, if the hash is known.
pub fn photo_file_facts(conn: &Connection, sha256: &str) -> Result<Option<(String, Option<u16>)>, StoreError> {
    Ok(conn
        .query_row("SELECT media_type, exif_orientation FROM photos WHERE sha256 = ?1", [sha256], |row| {
            Ok((row.get(0)?, row.get(1)?))
        })
        .optional()?)
}

/// Records the size and perceptual hash of a photo whose derivatives were made again
/// (photos stored before migration 0002 have none).
pub fn set_photo_pixels(
    conn: &Connection,
    sha256: &str,
    width: u32,
    height: u32,
    phash: &str,
) -> Result<(), StoreError> {
    conn.execute(
        "UPDATE photos SET width = ?2, height = ?3, phash = ?4 WHERE sha256 = ?1 AND phash IS NULL",
        params![sha256, width, height, phash],
    )?;
    Ok(())
}

type RecordRow = (i64, i64, String, String, String, Option<String>);

fn record_row(row: &rusqlite::Row) -> rusqlite::Result<RecordRow> {
    Ok((row.get(0)?, row.get(1)?, row.get(2)?, row.get(3)?, row.get(4)?, row.get(5)?))
}

fn finish_record(conn: &Connection, row: RecordRow) -> Result<RecordView, StoreError> {
    let id = row.0;
    record_from(row, photos_of(conn, id)?, flags_of(conn, id)?)
}

fn record_from(
    (id, organism_id, received_at, state, json, walk): RecordRow,
    photos: Vec<PhotoView>,
    flags: Vec<RecordFlag>,
) -> Result<RecordView, StoreError> {
    let submission: Submission =
        serde_json::from_str(&json).map_err(|err| StoreError::Corrupt(format!("observation {id}: {err}")))?;
    Ok(RecordView {
        observation_id: id,
        organism_id,
        received_at: parse_utc(&received_at)?,
        review_state: ReviewState::from_code(&state)
            .ok_or_else(|| StoreError::Corrupt(format!("observation {id}: unknown review state {state}")))?,
        submission,
        photos,
        flags,
        walk_client_id: walk
            .map(|w| Uuid::parse_str(&w))
            .transpose()
            .map_err(|err| StoreError::Corrupt(format!("observation {id}: walk id {err}")))?,
    })
}

fn flag(observation_id: i64, kind: &str, reason: String) -> Result<RecordFlag, StoreError> {
    let kind = from_code::<FlagKind>(kind)
        .ok_or_else(|| StoreError::Corrupt(format!("observation {observation_id}: unknown flag {kind}")))?;
    Ok(RecordFlag { kind, reason })
}

fn flags_of(conn: &Connection, observation_id: i64) -> Result<Vec<RecordFlag>, StoreError> {
    let mut stmt =
        conn.prepare("SELECT kind, reason FROM observation_flags WHERE observation_id = ?1 ORDER BY kind")?;
    let rows = stmt.query_map([observation_id], |row| Ok((row.get::<_, String>(0)?, row.get::<_, String>(1)?)))?;
    rows.map(|row| {
        let (kind, reason) = row?;
        flag(observation_id, &kind, reason)
    })
    .collect()
}

/// Positions of confirmed records whose current identification is `scientific_name`.
pub fn confirmed_positions(conn: &Connection, scientific_name: &str) -> Result<Vec<(f64, f64)>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT o.latitude, o.longitude FROM observations o
         JOIN identifications i ON i.observation_id = o.id AND i.superseded_by IS NULL
         WHERE o.review_state = 'confirmed' AND i.taxon_name = ?1 AND o.latitude IS NOT NULL AND o.longitude IS NOT NULL",
    )?;
    let rows = stmt.query_map([scientific_name], |row| Ok((row.get(0)?, row.get(1)?)))?;
    Ok(rows.collect::<Result<Vec<_>, _>>()?)
}

/// The photo columns of `observation_photos op JOIN photos p`, with `op.observation_id` first.
const PHOTO_QUERY: &str = "SELECT op.observation_id, p.sha256, p.media_type, p.byte_len, p.exif_taken_local, p.exif_offset, p.exif_latitude,
                p.exif_longitude, p.exif_altitude_m, p.exif_h_error_m, p.exif_orientation, op.exif_taken_at, op.offset_source,
                p.width, p.height, p.phash, op.seconds_before_record, op.metres_from_record,
                (SELECT group_concat(f.flag) FROM photo_flags f
                 WHERE f.observation_id = op.observation_id AND f.photo_sha256 = op.photo_sha256),
                op.time_reading, op.phone_exif_json, op.place_reading
         FROM observation_photos op JOIN photos p ON p.sha256 = op.photo_sha256";

fn photo_row(row: &rusqlite::Row) -> rusqlite::Result<(i64, PhotoView)> {
    let taken_at: Option<String> = row.get(11)?;
    let offset_source: Option<String> = row.get(12)?;
    let view = PhotoView {
        sha256: row.get(1)?,
        media_type: row.get(2)?,
        byte_len: row.get::<_, i64>(3)? as u64,
        width: row.get(13)?,
        height: row.get(14)?,
        phash: row.get(15)?,
        phone_exif: row.get::<_, Option<String>>(20)?.and_then(|json| serde_json::from_str(&json).ok()),
        check: PhotoCheck {
            time_reading: row.get::<_, Option<String>>(19)?.and_then(|c| from_code(&c)),
            place_reading: row.get::<_, Option<String>>(21)?.and_then(|c| from_code(&c)),
            seconds_before_record: row.get(16)?,
            metres_from_record: row.get(17)?,
            flags: flags_from(row.get::<_, Option<String>>(18)?),
        },
        exif: PhotoExif {
            taken_local: row.get(4)?,
            offset: row.get(5)?,
            latitude: row.get(6)?,
            longitude: row.get(7)?,
            altitude_m: row.get(8)?,
            horizontal_error_m: row.get(9)?,
            orientation: row.get(10)?,
            taken_at: taken_at.and_then(|t| chrono::DateTime::parse_from_rfc3339(&t).ok()),
            offset_source: offset_source.and_then(|s| from_code::<OffsetSource>(&s)),
            device_offset: None,
            original_sha256: None,
        },
    };
    Ok((row.get(0)?, view))
}

fn photos_of(conn: &Connection, observation_id: i64) -> Result<Vec<PhotoView>, StoreError> {
    let mut stmt = conn.prepare(&format!("{PHOTO_QUERY} WHERE op.observation_id = ?1 ORDER BY op.position"))?;
    let rows = stmt.query_map([observation_id], photo_row)?;
    Ok(rows.map(|row| row.map(|(_, view)| view)).collect::<Result<Vec<_>, _>>()?)
}

/// `states` as one parameter for `instr`: ",a,b," (empty: every state).
fn state_list(states: &[ReviewState]) -> String {
    if states.is_empty() {
        String::new()
    } else {
        format!(",{},", states.iter().map(|s| s.code()).collect::<Vec<_>>().join(","))
    }
}

const IN_STATES: &str = "(?1 = '' OR instr(?1, ',' || o.review_state || ',') > 0)";

/// Every record in the given review states (all when empty), oldest observation first,
/// read in four queries however many there are (records, photos, flags, current
/// identifications), with each one's current identification.
pub fn records_in_states(
    conn: &Connection,
    states: &[ReviewState],
) -> Result<Vec<(RecordView, Option<String>)>, StoreError> {
    let states = state_list(states);
    let mut photos: HashMap<i64, Vec<PhotoView>> = HashMap::new();
    let mut stmt = conn.prepare(&format!("{PHOTO_QUERY} JOIN observations o ON o.id = op.observation_id WHERE {IN_STATES} ORDER BY op.observation_id, op.position"))?;
    for row in stmt.query_map([&states], photo_row)? {
        let (id, view) = row?;
        photos.entry(id).or_default().push(view);
    }
    let mut flags: HashMap<i64, Vec<RecordFlag>> = HashMap::new();
    let mut stmt = conn.prepare(&format!("SELECT f.observation_id, f.kind, f.reason FROM observation_flags f JOIN observations o ON o.id = f.observation_id WHERE {IN_STATES} ORDER BY f.kind"))?;
    for row in stmt
        .query_map([&states], |row| Ok((row.get::<_, i64>(0)?, row.get::<_, String>(1)?, row.get::<_, String>(2)?)))?
    {
        let (id, kind, reason) = row?;
        flags.entry(id).or_default().push(flag(id, &kind, reason)?);
    }
    let mut taxa: HashMap<i64, String> = HashMap::new();
    let mut stmt = conn.prepare(&format!(
        "SELECT i.observation_id, i.taxon_name FROM identifications i JOIN observations o ON o.id = i.observation_id
         WHERE i.superseded_by IS NULL AND {IN_STATES} ORDER BY i.id"
    ))?;
    for row in stmt.query_map([&states], |row| Ok((row.get::<_, i64>(0)?, row.get::<_, String>(1)?)))? {
        let (id, name) = row?;
        taxa.insert(id, name);
    }
    let mut stmt = conn.prepare(&format!(
        "SELECT o.id, o.organism_id, o.received_at, o.review_state, o.submission_json, o.walk_client_id FROM observations o
         WHERE {IN_STATES} ORDER BY o.observed_at_utc, o.id"
    ))?;
    let rows = stmt.query_map([&states], record_row)?.collect::<Result<Vec<_>, _>>()?;
    rows.into_iter()
        .map(|row| {
            let id = row.0;
            let record =
                record_from(row, photos.remove(&id).unwrap_or_default(), flags.remove(&id).unwrap_or_default())?;
            Ok((record, taxa.remove(&id)))
        })
        .collect()
}

/// Flags stored as codes, comma-joined by the query; unknown codes are skipped.
fn flags_from(joined: Option<String>) -> Vec<PhotoFlag> {
    let mut flags: Vec<PhotoFlag> = joined.unwrap_or_default().split(',').filter_map(from_code).collect();
    flags.sort();
    flags
}

fn parse_utc(text: &str) -> Result<DateTime<Utc>, StoreError> {
    DateTime::parse_from_rfc3339(text)
        .map(|t| t.with_timezone(&Utc))
        .map_err(|err| StoreError::Corrupt(format!("timestamp {text}: {err}")))
}

/// A stored photo's perceptual hash and every other stored photo's, each with the
/// observations it belongs to; `None` when the photo is not stored or has no hash.
pub fn photo_hashes(conn: &Connection, sha256: &str) -> Result<Option<(String, Vec<HashedPhoto>)>, StoreError> {
    let Some(Some(own)) = conn
        .query_row("SELECT phash FROM photos WHERE sha256 = ?1", [sha256], |row| row.get::<_, Option<String>>(0))
        .optional()?
    else {
        return Ok(None);
    };
    let mut stmt = conn.prepare(
        "SELECT p.sha256, p.phash, group_concat(op.observation_id) FROM photos p
         LEFT JOIN observation_photos op ON op.photo_sha256 = p.sha256
         WHERE p.phash IS NOT NULL AND p.sha256 <> ?1 GROUP BY p.sha256",
    )?;
    let rows = stmt.query_map([sha256], |row| {
        let observations: Option<String> = row.get(2)?;
        Ok(HashedPhoto {
            sha256: row.get(0)?,
            phash: row.get(1)?,
            observation_ids: observations.unwrap_or_default().split(',').filter_map(|id| id.parse().ok()).collect(),
        })
    })?;
    Ok(Some((own, rows.collect::<Result<_, _>>()?)))
}
