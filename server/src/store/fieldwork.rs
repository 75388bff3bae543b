//! Fieldwork in the database: responses to live animals, samples and carcass reports,
//! each change written with its trail row in one transaction. Samples and carcass
//! reports hang on the record they were added on; the animal's are read through
//! `observations.organism_id`, so merges carry them along.

use chrono::{DateTime, FixedOffset, Utc};
use rusqlite::{Connection, OptionalExtension, Transaction, params};
use shared_types::codes::{code, from_code};
use shared_types::{
    CarcassReport, CarcassView, FieldworkEvent, ResponseReport, ResponseView, SampleInput, SampleLookup, SampleView,
};
use uuid::Uuid;

use super::StoreError;

fn now_text(now: DateTime<Utc>) -> String {
    now.to_rfc3339_opts(chrono::SecondsFormat::Millis, true)
}

fn parse_utc(text: &str) -> Result<DateTime<Utc>, StoreError> {
    parse_offset(text).map(|t| t.with_timezone(&Utc))
}

fn parse_offset(text: &str) -> Result<DateTime<FixedOffset>, StoreError> {
    DateTime::parse_from_rfc3339(text).map_err(|err| StoreError::Corrupt(format!("timestamp {text}: {err}")))
}

fn decoded<T: serde::de::DeserializeOwned>(what: &str, text: &str) -> Result<T, StoreError> {
    from_code(text).ok_or_else(|| StoreError::Corrupt(format!("unknown {what} {text}")))
}

/// Logs a response to the record `observation_id`, with its trail row.
pub fn add_response(
    conn: &mut Connection,
    observation_id: i64,
    report: &ResponseReport,
    person_id: i64,
    now: DateTime<Utc>,
) -> Result<i64, StoreError> {
    let tx = conn.transaction()?;
    tx.execute(
        "INSERT INTO responses (observation_id, who_went, went_at, outcome, notes, person_id, logged_at)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7)",
        params![
            observation_id,
            report.who_went.as_str(),
            report.went_at.to_rfc3339(),
            code(&report.outcome),
            report.notes.as_ref().map(|n| n.as_str()),
            person_id,
            now_text(now)
        ],
    )?;
    let id = tx.last_insert_rowid();
    let detail =
        format!("response logged: {} went at {}: {}", report.who_went.as_str(), report.went_at, report.outcome.label());
    trail(&tx, observation_id, None, person_id, &detail, now)?;
    tx.commit()?;
    Ok(id)
}

/// Every response logged for any report of the animal of `observation_id`, oldest first.
pub fn responses(conn: &Connection, observation_id: i64) -> Result<Vec<ResponseView>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT r.id, r.who_went, r.went_at, r.outcome, r.notes, COALESCE(p.display_name, p.username, ''), r.logged_at
         FROM responses r JOIN people p ON p.id = r.person_id
         WHERE r.observation_id IN (SELECT id FROM observations WHERE organism_id =
               (SELECT organism_id FROM observations WHERE id = ?1))
         ORDER BY r.id",
    )?;
    let rows = stmt
        .query_map([observation_id], |row| {
            Ok((
                row.get::<_, i64>(0)?,
                row.get::<_, String>(1)?,
                row.get::<_, String>(2)?,
                row.get::<_, String>(3)?,
                row.get::<_, Option<String>>(4)?,
                row.get::<_, String>(5)?,
                row.get::<_, String>(6)?,
            ))
        })?
        .collect::<Result<Vec<_>, _>>()?;
    rows.into_iter()
        .map(|(id, who_went, went_at, outcome, notes, logged_by, logged_at)| {
            Ok(ResponseView {
                id,
                who_went,
                went_at: parse_offset(&went_at)?,
                outcome: decoded("response outcome", &outcome)?,
                notes,
                logged_by,
                logged_at: parse_utc(&logged_at)?,
            })
        })
        .collect()
}

/// Records (by observation id) whose animal has a logged response.
pub fn responded(conn: &Connection) -> Result<std::collections::HashSet<i64>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT o.id FROM observations o WHERE o.organism_id IN
           (SELECT r_o.organism_id FROM responses r JOIN observations r_o ON r_o.id = r.observation_id)",
    )?;
    let ids = stmt.query_map([], |row| row.get::<_, i64>(0))?.collect::<Result<_, _>>()?;
    Ok(ids)
}

/// What adding or changing a sample came to.
#[derive(Debug, Clone, PartialEq)]
pub enum SampleWrite {
    Written,
    /// Another sample already has this code.
    CodeTaken,
    /// No sample has this code (when changing one).
    NoSuchSample,
}

fn trail(
    tx: &Transaction,
    observation_id: i64,
    sample: Option<&str>,
    person_id: i64,
    detail: &str,
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    tx.execute(
        "INSERT INTO fieldwork_events (observation_id, sample_code, person_id, detail, at) VALUES (?1, ?2, ?3, ?4, ?5)",
        params![observation_id, sample, person_id, detail, now_text(now)],
    )?;
    Ok(())
}

fn sample_words(input: &SampleInput) -> String {
    format!(
        "{} ({}), {}, stored at {}, held by {}",
        input.code,
        input.kind.label(),
        input.preservation.label(),
        input.stored_at.as_str(),
        input.held_by.as_str()
    )
}

/// Adds a sample taken from the animal of the record `observation_id`.
pub fn add_sample(
    conn: &mut Connection,
    observation_id: i64,
    input: &SampleInput,
    person_id: i64,
    now: DateTime<Utc>,
) -> Result<SampleWrite, StoreError> {
    let tx = conn.transaction()?;
    let inserted = tx.execute(
        "INSERT OR IGNORE INTO samples (code, observation_id, kind, preservation, stored_at, held_by, notes, person_id, added_at)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9)",
        params![
            input.code,
            observation_id,
            code(&input.kind),
            code(&input.preservation),
            input.stored_at.as_str(),
            input.held_by.as_str(),
            input.notes.as_ref().map(|n| n.as_str()),
            person_id,
            now_text(now)
        ],
    )?;
    if inserted == 0 {
        return Ok(SampleWrite::CodeTaken);
    }
    trail(&tx, observation_id, Some(&input.code), person_id, &format!("sample added: {}", sample_words(input)), now)?;
    tx.commit()?;
    Ok(SampleWrite::Written)
}

/// Changes the sample with code `code` (its kind, code, keeping, place, holder, notes).
pub fn change_sample(
    conn: &mut Connection,
    current_code: &str,
    input: &SampleInput,
    person_id: i64,
    now: DateTime<Utc>,
) -> Result<SampleWrite, StoreError> {
    let tx = conn.transaction()?;
    let Some(before) = sample_by_code(&tx, current_code)? else { return Ok(SampleWrite::NoSuchSample) };
    if input.code != current_code && sample_by_code(&tx, &input.code)?.is_some() {
        return Ok(SampleWrite::CodeTaken);
    }
    let observation_id: i64 =
        tx.query_row("SELECT observation_id FROM samples WHERE code = ?1", [current_code], |row| row.get(0))?;
    tx.execute(
        "UPDATE samples SET code = ?1, kind = ?2, preservation = ?3, stored_at = ?4, held_by = ?5, notes = ?6, changed_at = ?7
         WHERE code = ?8",
        params![
            input.code,
            code(&input.kind),
            code(&input.preservation),
            input.stored_at.as_str(),
            input.held_by.as_str(),
            input.notes.as_ref().map(|n| n.as_str()),
            now_text(now),
            current_code
        ],
    )?;
    let was = format!(
        "{} ({}), {}, stored at {}, held by {}",
        before.code,
        before.kind.label(),
        before.preservation.label(),
        before.stored_at,
        before.held_by
    );
    let detail = format!("sample changed: was {was}; now {}", sample_words(input));
    trail(&tx, observation_id, Some(&input.code), person_id, &detail, now)?;
    tx.commit()?;
    Ok(SampleWrite::Written)
}

const SAMPLE_SELECT: &str =
    "SELECT s.code, s.kind, s.preservation, s.stored_at, s.held_by, s.notes, o.client_id, o.organism_id,
        COALESCE(p.display_name, p.username, ''), s.added_at, s.changed_at
     FROM samples s JOIN observations o ON o.id = s.observation_id JOIN people p ON p.id = s.person_id";

type SampleRow = (String, String, String, String, String, Option<String>, String, i64, String, String, Option<String>);

fn sample_row(row: &rusqlite::Row) -> rusqlite::Result<SampleRow> {
    Ok((
        row.get(0)?,
        row.get(1)?,
        row.get(2)?,
        row.get(3)?,
        row.get(4)?,
        row.get(5)?,
        row.get(6)?,
        row.get(7)?,
        row.get(8)?,
        row.get(9)?,
        row.get(10)?,
    ))
}

fn to_sample(row: SampleRow) -> Result<SampleView, StoreError> {
    let (code, kind, preservation, stored_at, held_by, notes, client_id, organism_id, added_by, added_at, changed) =
        row;
    Ok(SampleView {
        kind: decoded("sample kind", &kind)?,
        preservation: decoded("preservation", &preservation)?,
        record_client_id: Uuid::parse_str(&client_id)
            .map_err(|err| StoreError::Corrupt(format!("client id {client_id}: {err}")))?,
        code,
        stored_at,
        held_by,
        notes,
        organism_id,
        added_by,
        added_at: parse_utc(&added_at)?,
        changed_at: changed.as_deref().map(parse_utc).transpose()?,
    })
}

/// The sample with this code, if any.
pub fn sample_by_code(conn: &Connection, sample_code: &str) -> Result<Option<SampleView>, StoreError> {
    let row = conn.query_row(&format!("{SAMPLE_SELECT} WHERE s.code = ?1"), [sample_code], sample_row).optional()?;
    row.map(to_sample).transpose()
}

/// Every sample of the animal whose report is `observation_id`, oldest first.
pub fn samples_of_animal(conn: &Connection, observation_id: i64) -> Result<Vec<SampleView>, StoreError> {
    let mut stmt = conn.prepare(&format!(
        "{SAMPLE_SELECT} WHERE o.organism_id = (SELECT organism_id FROM observations WHERE id = ?1) ORDER BY s.id"
    ))?;
    let rows = stmt.query_map([observation_id], sample_row)?.collect::<Result<Vec<_>, _>>()?;
    rows.into_iter().map(to_sample).collect()
}

/// Every sample, oldest first (the register).
pub fn all_samples(conn: &Connection) -> Result<Vec<SampleView>, StoreError> {
    let mut stmt = conn.prepare(&format!("{SAMPLE_SELECT} ORDER BY s.id"))?;
    let rows = stmt.query_map([], sample_row)?.collect::<Result<Vec<_>, _>>()?;
    rows.into_iter().map(to_sample).collect()
}

/// The record a sample was added on, and the kept report of its animal (the report
/// the animal's other reports were merged into).
pub fn animal_of_sample(conn: &Connection, sample_code: &str) -> Result<Option<(i64, i64)>, StoreError> {
    Ok(conn
        .query_row(
            "SELECT s.observation_id, (SELECT k.id FROM observations k WHERE k.organism_id = o.organism_id
                                       ORDER BY (k.review_state = 'merged'), k.id LIMIT 1)
             FROM samples s JOIN observations o ON o.id = s.observation_id WHERE s.code = ?1",
            [sample_code],
            |row| Ok((row.get(0)?, row.get(1)?)),
        )
        .optional()?)
}

/// Sets (or corrects) the carcass report on the record `observation_id`.
pub fn set_carcass(
    conn: &mut Connection,
    observation_id: i64,
    report: &CarcassReport,
    person_id: i64,
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    let tx = conn.transaction()?;
    let json = serde_json::to_string(report).map_err(|err| StoreError::Corrupt(err.to_string()))?;
    let had: Option<String> = tx
        .query_row("SELECT report_json FROM carcasses WHERE observation_id = ?1", [observation_id], |row| row.get(0))
        .optional()?;
    tx.execute(
        "INSERT INTO carcasses (observation_id, report_json, person_id, recorded_at) VALUES (?1, ?2, ?3, ?4)
         ON CONFLICT (observation_id) DO UPDATE SET report_json = ?2, person_id = ?3, recorded_at = ?4",
        params![observation_id, json, person_id, now_text(now)],
    )?;
    let detail = match had {
        None => format!("carcass report: {} ({json})", report.fate.label()),
        Some(before) => format!("carcass report corrected: was {before}; now {json}"),
    };
    trail(&tx, observation_id, None, person_id, &detail, now)?;
    tx.commit()?;
    Ok(())
}

/// The animal's carcass report (the latest, when two of its reports have one).
pub fn carcass_of_animal(conn: &Connection, observation_id: i64) -> Result<Option<CarcassView>, StoreError> {
    let row = conn
        .query_row(
            "SELECT c.report_json, COALESCE(p.display_name, p.username, ''), c.recorded_at
             FROM carcasses c JOIN observations o ON o.id = c.observation_id JOIN people p ON p.id = c.person_id
             WHERE o.organism_id = (SELECT organism_id FROM observations WHERE id = ?1)
             ORDER BY c.recorded_at DESC LIMIT 1",
            [observation_id],
            |row| Ok((row.get::<_, String>(0)?, row.get::<_, String>(1)?, row.get::<_, String>(2)?)),
        )
        .optional()?;
    row.map(|(json, recorded_by, at)| {
        let report =
            serde_json::from_str(&json).map_err(|err| StoreError::Corrupt(format!("carcass report: {err}")))?;
        Ok(CarcassView { report, recorded_by, recorded_at: parse_utc(&at)? })
    })
    .transpose()
}

/// The trail of samples and carcass reports of the animal of `observation_id`.
pub fn events_of_animal(conn: &Connection, observation_id: i64) -> Result<Vec<FieldworkEvent>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT e.at, COALESCE(p.display_name, p.username, ''), e.sample_code, e.detail
         FROM fieldwork_events e JOIN observations o ON o.id = e.observation_id JOIN people p ON p.id = e.person_id
         WHERE o.organism_id = (SELECT organism_id FROM observations WHERE id = ?1) ORDER BY e.id",
    )?;
    let rows = stmt
        .query_map([observation_id], |row| Ok((row.get::<_, String>(0)?, row.get(1)?, row.get(2)?, row.get(3)?)))?
        .collect::<Result<Vec<_>, _>>()?;
    rows.into_iter()
        .map(|(at, by, sample_code, detail)| Ok(FieldworkEvent { at: parse_utc(&at)?, by, sample_code, detail }))
        .collect()
}

/// Everything about the sample `code`, for the screen and `wrackline sample show`.
pub fn lookup(conn: &Connection, code: &str) -> Result<Option<SampleLookup>, StoreError> {
    let (Some(sample), Some((added_on, kept))) = (sample_by_code(conn, code)?, animal_of_sample(conn, code)?) else {
        return Ok(None);
    };
    let Some(record) = super::observations::record_by_observation_id(conn, kept)? else { return Ok(None) };
    Ok(Some(SampleLookup {
        sample,
        record,
        samples_of_the_animal: samples_of_animal(conn, added_on)?,
        carcass: carcass_of_animal(conn, added_on)?,
        events: events_of_animal(conn, added_on)?,
    }))
}
