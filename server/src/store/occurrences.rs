//! Organisms as occurrence rows, read one at a time for exports and analyses.
//!
//! One row per organism (an animal, after any merges). A merge keeps the report with the
//! earliest observation and marks the other `merged`, so the organism is described by its
//! report that is not merged (the earliest, should there be several): its occurrenceID,
//! review state, identification, length and life stage. Merged organisms also gather from
//! every report the time span, the photos, every observer's display name and the most
//! precise position (smallest coordinate uncertainty). Rows are handed to a callback as
//! SQLite steps through them, so however many records are stored, only one row is in
//! memory. Observer and reviewer contacts are never selected: names come from
//! `observations.observer_name` and `people.display_name` / `people.username`, with each
//! observer's profile name, consent to be named and random public id
//! (`people.display_name`, `people.name_public`, `people.public_id`) for exports to
//! choose what to print.
//!
//! Each organism also carries its samples and its carcass report (from any of its
//! reports); most rows have neither, and cost two index probes (samples, carcass) to find that out.
//!
//! Filters here are the ones SQL can apply to stored values without giving anything
//! away: review states and a span of time. Where a record is, and the day a generalised
//! record is published under, are filtered by the export on the published form.

use rusqlite::{Connection, Row, ToSql};
use shared_types::codes::from_code;
use shared_types::{
    CarcassReport, Condition, HumanSign, LengthKind, LifeStage, MeasureMethod, Preservation, ReviewState, SampleKind,
    Setting, Sex,
};

use super::StoreError;

/// Which organisms to read. Every bound is optional; `None` lets everything through.
/// Each applies to the report that stands for the organism.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct RowFilter {
    /// Review states to take.
    pub states: Option<Vec<ReviewState>>,
    /// Earliest observation time, inclusive, as UTC `YYYY-MM-DDTHH:MM:SSZ`.
    pub from_utc: Option<String>,
    /// Latest observation time, exclusive, as UTC `YYYY-MM-DDTHH:MM:SSZ`.
    pub until_utc: Option<String>,
}

/// Who made a report, as an export may name them.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct ObserverRow {
    /// The name given on the record; empty when none was.
    pub name: String,
    /// The name the observer gave in their phone's profile, beside their consent.
    pub profile_name: Option<String>,
    /// Whether the observer agreed to have that name published in open data.
    pub name_public: bool,
    /// Their random public id, when the record came from a known phone.
    pub public_id: Option<String>,
}

/// One identification of a report.
#[derive(Debug, Clone, PartialEq)]
pub struct IdentificationRow {
    pub id: i64,
    /// The report (client id) it was made for.
    pub report: String,
    pub taxon_name: String,
    pub taxon_rank: Option<String>,
    /// The observer's or reviewer's display name (a reviewer's username when they have
    /// none); never a contact.
    pub identified_by: Option<String>,
    pub identified_at: String,
    pub basis: String,
    pub remarks: Option<String>,
    /// Not superseded by a later identification of the same report.
    pub current: bool,
    /// Who made the report it belongs to (who made it, unless a reviewer did).
    pub observer: ObserverRow,
}

/// A length as stored.
#[derive(Debug, Clone, PartialEq)]
pub struct LengthRow {
    pub kind: LengthKind,
    pub value: f64,
    pub unit: String,
    pub value_cm: f64,
    pub method: MeasureMethod,
}

/// A sample taken from an organism, as stored (`samples`).
#[derive(Debug, Clone, PartialEq)]
pub struct SampleRow {
    /// The sample's own id or barcode.
    pub code: String,
    pub kind: SampleKind,
    pub preservation: Preservation,
    pub stored_at: String,
    pub held_by: String,
    pub notes: Option<String>,
    /// When it was added, RFC 3339 UTC.
    pub added_at: String,
}

/// One organism, as its standing report describes it.
#[derive(Debug, Clone, PartialEq)]
pub struct OccurrenceRow {
    pub organism_id: i64,
    /// The report that stands for the organism (not merged into another).
    pub observation_id: i64,
    pub client_id: String,
    /// RFC 3339 with the observer's offset.
    pub observed_at: String,
    /// Earliest and latest observation of this organism, UTC.
    pub first_utc: String,
    pub last_utc: String,
    pub observation_count: i64,
    /// The most precise position among the organism's reports.
    pub latitude: Option<f64>,
    pub longitude: Option<f64>,
    pub accuracy_m: Option<f64>,
    pub count: i64,
    pub condition: Condition,
    pub setting: Setting,
    pub sex: Sex,
    pub life_stage: Option<LifeStage>,
    pub notes: Option<String>,
    /// Every observer of the organism, the standing report's first, each once: the name
    /// they gave, their consent and public id; nothing else about them.
    pub observers: Vec<ObserverRow>,
    pub review_state: ReviewState,
    /// The standing report's current identification.
    pub identification: Option<IdentificationRow>,
    /// Every identification of every report of the organism, oldest first (when asked for).
    pub identifications: Vec<IdentificationRow>,
    pub length: Option<LengthRow>,
    pub human_signs: Vec<HumanSign>,
    /// SHA-256 of every photo of every observation of this organism, in order.
    pub photo_hashes: Vec<String>,
    /// The observer's own words for what it was, as typed.
    pub species_guess: Option<String>,
    /// The survey walk the standing report was made on.
    pub walk_client_id: Option<String>,
    /// Client ids of the other reports of this organism (after a merge).
    pub other_reports: Vec<String>,
    /// Where the standing report came from when it was imported (`wrackline import`):
    /// the source dataset's name and the source's id for its row.
    pub imported_from: Option<(String, String)>,
    /// Samples taken from the organism (added on any of its reports), oldest first.
    pub samples: Vec<SampleRow>,
    /// The organism's carcass report (the latest, when two of its reports have one).
    pub carcass: Option<CarcassReport>,
}

/// The report that stands for an organism: not merged, and no earlier one that is not
/// merged either. A merge marks only the later of two standing reports, so every organism
/// has exactly one; the earliest-first tie-break covers reports joined by other means.
/// (Written as NOT EXISTS, which costs one index probe for the usual single report:
/// 2 µs a row against 5 µs for a sorted sub-select, measured on 100,000 rows.)
/// Written for the report `alias`.
fn standing_report(alias: &str) -> String {
    format!(
        "{alias}.review_state != 'merged' AND NOT EXISTS (SELECT 1 FROM observations r
    WHERE r.organism_id = {alias}.organism_id AND r.id != {alias}.id AND r.review_state != 'merged'
      AND (r.observed_at_utc < {alias}.observed_at_utc OR (r.observed_at_utc = {alias}.observed_at_utc AND r.id < {alias}.id)))"
    )
}

/// Who made an identification: the name stored with it, else the reviewer's display
/// name or username. `people.contact` is never read.
const IDENTIFIED_BY: &str = "COALESCE(i.identified_by, p.display_name, p.username)";

// One report per organism is read. The span, photos, observers, position and
// identifications of the other reports are looked up (see `merged_details`) only for
// organisms that have more than one, and the identification history only when asked for
// and there is more than the current one, so the common case costs a few index probes
// per row.
fn select_sql(with_history: bool) -> String {
    let identification_count =
        if with_history { "(SELECT COUNT(*) FROM identifications n WHERE n.observation_id = o.id)" } else { "1" };
    format!(
        "
SELECT o.organism_id, o.id, o.client_id, o.observed_at, o.observed_at_utc, o.observed_at_utc,
       (SELECT COUNT(*) FROM observations c WHERE c.organism_id = o.organism_id),
       o.latitude, o.longitude, o.accuracy_m, o.count, o.condition, o.setting, o.sex, o.notes,
       o.observer_name, o.review_state,
       i.taxon_name, i.taxon_rank, {IDENTIFIED_BY}, i.identified_at, i.basis, i.remarks,
       m.kind, m.value, m.unit, m.value_cm, m.method,
       (SELECT group_concat(s.sign, ' ') FROM human_signs s WHERE s.observation_id = o.id),
       (SELECT group_concat(op.photo_sha256, ' ' ORDER BY op.position) FROM observation_photos op WHERE op.observation_id = o.id),
       json_extract(o.submission_json, '$.species_guess'), o.walk_client_id, o.life_stage, i.id,
       {identification_count}, COALESCE(q.name_public, 0), q.public_id, q.display_name,
       ir.dataset_name, ir.source_row_id,
       (SELECT COUNT(*) FROM samples sm WHERE sm.observation_id = o.id),
       (SELECT c.report_json FROM carcasses c WHERE c.observation_id = o.id)
FROM observations o
LEFT JOIN identifications i ON i.id = (
    SELECT MAX(j.id) FROM identifications j WHERE j.observation_id = o.id AND j.superseded_by IS NULL)
LEFT JOIN people p ON p.id = i.identified_by_id
LEFT JOIN people q ON q.id = o.observer_id
LEFT JOIN measurements m ON m.id = (SELECT MIN(k.id) FROM measurements k WHERE k.observation_id = o.id)
LEFT JOIN imported_records ir ON ir.observation_id = o.id
WHERE {standing}",
        standing = standing_report("o")
    )
}

/// The time span, photos, observers, best position and other reports of an organism
/// that has several.
fn merged_details(conn: &Connection, row: &mut OccurrenceRow) -> Result<(), StoreError> {
    let mut span = conn
        .prepare_cached("SELECT MIN(observed_at_utc), MAX(observed_at_utc) FROM observations WHERE organism_id = ?1")?;
    (row.first_utc, row.last_utc) = span.query_row([row.organism_id], |r| Ok((r.get(0)?, r.get(1)?)))?;
    let mut photos = conn.prepare_cached(
        "SELECT op.photo_sha256 FROM observation_photos op JOIN observations x ON x.id = op.observation_id
         WHERE x.organism_id = ?1 ORDER BY x.observed_at_utc, x.id, op.position",
    )?;
    row.photo_hashes = photos.query_map([row.organism_id], |r| r.get(0))?.collect::<Result<_, _>>()?;
    let mut others = conn.prepare_cached(
        "SELECT client_id FROM observations WHERE organism_id = ?1 AND id != ?2 ORDER BY observed_at_utc, id",
    )?;
    row.other_reports =
        others.query_map([row.organism_id, row.observation_id], |r| r.get(0))?.collect::<Result<_, _>>()?;
    // The standing report's observer first (Darwin Core recordedBy: the primary observer first).
    let mut observers = conn.prepare_cached(
        "SELECT COALESCE(x.observer_name, ''), COALESCE(q.name_public, 0), q.public_id, q.display_name
         FROM observations x LEFT JOIN people q ON q.id = x.observer_id
         WHERE x.organism_id = ?1 ORDER BY x.id != ?2, x.observed_at_utc, x.id",
    )?;
    let all: Vec<ObserverRow> = observers
        .query_map([row.organism_id, row.observation_id], |r| {
            Ok(ObserverRow { name: r.get(0)?, name_public: r.get(1)?, public_id: r.get(2)?, profile_name: r.get(3)? })
        })?
        .collect::<Result<_, _>>()?;
    row.observers.clear();
    for observer in all {
        if !row.observers.contains(&observer) {
            row.observers.push(observer);
        }
    }
    // The most precise position: the smallest uncertainty; an unknown one counts last.
    let mut best = conn.prepare_cached(
        "SELECT latitude, longitude, accuracy_m FROM observations WHERE organism_id = ?1 AND latitude IS NOT NULL AND longitude IS NOT NULL
         ORDER BY accuracy_m IS NULL, accuracy_m, id != ?2, observed_at_utc, id LIMIT 1",
    )?;
    let position = best
        .query_map([row.organism_id, row.observation_id], |r| Ok((r.get(0)?, r.get(1)?, r.get(2)?)))?
        .next()
        .transpose()?;
    if let Some((latitude, longitude, accuracy_m)) = position {
        (row.latitude, row.longitude, row.accuracy_m) = (Some(latitude), Some(longitude), accuracy_m);
    }
    Ok(())
}

/// The samples and carcass report of an organism. One report: its own (the sample
/// count and carcass report came with the row, so most rows cost no query here);
/// several: those of every report, the latest carcass report.
fn fieldwork(
    conn: &Connection,
    row: &mut OccurrenceRow,
    own_samples: i64,
    own_carcass: Option<String>,
) -> Result<(), StoreError> {
    let merged = row.observation_count > 1;
    let carcass = if merged {
        let mut latest = conn.prepare_cached(
            "SELECT c.report_json FROM carcasses c JOIN observations x ON x.id = c.observation_id
             WHERE x.organism_id = ?1 ORDER BY c.recorded_at DESC LIMIT 1",
        )?;
        latest.query_map([row.organism_id], |r| r.get::<_, String>(0))?.next().transpose()?
    } else {
        own_carcass
    };
    row.carcass = carcass
        .map(|json| {
            serde_json::from_str(&json).map_err(|err| {
                StoreError::Corrupt(format!("observation {}: carcass report: {err}", row.observation_id))
            })
        })
        .transpose()?;
    if merged || own_samples > 0 {
        row.samples = samples_of_organism(conn, row.organism_id)?;
    }
    Ok(())
}

fn samples_of_organism(conn: &Connection, organism_id: i64) -> Result<Vec<SampleRow>, StoreError> {
    let mut stmt = conn.prepare_cached(
        "SELECT s.code, s.kind, s.preservation, s.stored_at, s.held_by, s.notes, s.added_at
         FROM samples s JOIN observations x ON x.id = s.observation_id WHERE x.organism_id = ?1 ORDER BY s.id",
    )?;
    let mut rows = stmt.query([organism_id])?;
    let mut samples = Vec::new();
    while let Some(r) = rows.next()? {
        let (code, kind, preservation): (String, String, String) = (r.get(0)?, r.get(1)?, r.get(2)?);
        let corrupt = |what: &str, value: &str| StoreError::Corrupt(format!("sample {code}: unknown {what} `{value}`"));
        samples.push(SampleRow {
            kind: from_code(&kind).ok_or_else(|| corrupt("kind", &kind))?,
            preservation: from_code(&preservation).ok_or_else(|| corrupt("preservation", &preservation))?,
            stored_at: r.get(3)?,
            held_by: r.get(4)?,
            notes: r.get(5)?,
            added_at: r.get(6)?,
            code,
        });
    }
    Ok(samples)
}

/// Every identification of every report of the organism, oldest first.
fn identification_history(conn: &Connection, organism_id: i64) -> Result<Vec<IdentificationRow>, StoreError> {
    let mut stmt = conn.prepare_cached(&format!(
        "SELECT i.id, x.client_id, i.taxon_name, i.taxon_rank, {IDENTIFIED_BY}, i.identified_at, i.basis, i.remarks, i.superseded_by IS NULL,
                COALESCE(x.observer_name, ''), COALESCE(q.name_public, 0), q.public_id, q.display_name
         FROM identifications i JOIN observations x ON x.id = i.observation_id LEFT JOIN people p ON p.id = i.identified_by_id
         LEFT JOIN people q ON q.id = x.observer_id
         WHERE x.organism_id = ?1 ORDER BY i.identified_at, i.id"
    ))?;
    let rows = stmt.query_map([organism_id], |r| {
        Ok(IdentificationRow {
            id: r.get(0)?,
            report: r.get(1)?,
            taxon_name: r.get(2)?,
            taxon_rank: r.get(3)?,
            identified_by: r.get(4)?,
            identified_at: r.get(5)?,
            basis: r.get(6)?,
            remarks: r.get(7)?,
            current: r.get(8)?,
            observer: ObserverRow {
                name: r.get(9)?,
                name_public: r.get(10)?,
                public_id: r.get(11)?,
                profile_name: r.get(12)?,
            },
        })
    })?;
    Ok(rows.collect::<Result<_, _>>()?)
}

/// Calls `each` with every organism that passes `filter`, in the order of their standing
/// reports, and returns how many there were; `with_history` fills
/// [`OccurrenceRow::identifications`] (left empty otherwise). An error from `each` stops
/// the walk and is returned.
pub fn for_each<E: From<StoreError>>(
    conn: &Connection,
    filter: &RowFilter,
    with_history: bool,
    mut each: impl FnMut(OccurrenceRow) -> Result<(), E>,
) -> Result<u64, E> {
    let (conditions, values) = where_clause(filter);
    let sql = format!("{}{conditions} ORDER BY o.id", select_sql(with_history));
    let mut stmt = conn.prepare(&sql).map_err(StoreError::from)?;
    let params: Vec<&dyn ToSql> = values.iter().map(|v| v.as_ref() as &dyn ToSql).collect();
    let mut rows = stmt.query(params.as_slice()).map_err(StoreError::from)?;
    let mut seen = 0;
    while let Some(row) = rows.next().map_err(StoreError::from)? {
        let identification_count: i64 = row.get(34).map_err(StoreError::from)?;
        let mut occurrence = read_row(row)?;
        if occurrence.observation_count > 1 {
            merged_details(conn, &mut occurrence)?;
        }
        let sample_count: i64 = row.get(40).map_err(StoreError::from)?;
        let carcass: Option<String> = row.get(41).map_err(StoreError::from)?;
        fieldwork(conn, &mut occurrence, sample_count, carcass)?;
        if with_history {
            occurrence.identifications = if occurrence.observation_count > 1 || identification_count > 1 {
                identification_history(conn, occurrence.organism_id)?
            } else {
                occurrence.identification.iter().cloned().collect()
            };
        }
        each(occurrence)?;
        seen += 1;
    }
    Ok(seen)
}

/// How many organisms pass `filter` (for a progress bar).
pub fn count(conn: &Connection, filter: &RowFilter) -> Result<u64, StoreError> {
    let (conditions, values) = where_clause(filter);
    let sql = format!("SELECT COUNT(*) FROM observations o WHERE {}{conditions}", standing_report("o"));
    let params: Vec<&dyn ToSql> = values.iter().map(|v| v.as_ref() as &dyn ToSql).collect();
    Ok(conn.query_row(&sql, params.as_slice(), |row| row.get::<_, i64>(0))? as u64)
}

/// One find made on a walk, as the organism it is of stands: the standing report's
/// review state and current identification.
#[derive(Debug, Clone, PartialEq)]
pub struct WalkFind {
    pub walk_client_id: String,
    pub state: ReviewState,
    pub taxon_name: Option<String>,
}

/// Calls `each` with every report made on a walk, whatever its state or place: what was
/// found on each walk, for absences and for generalising walks (and their finds) as far
/// as their most sensitive find. A report merged into another counts as its organism's
/// standing report says (looked up only for those: a plain scan costs half as much as
/// joining every report to its standing one, measured on 500,000 finds); any other
/// report as itself.
pub fn for_each_find_on_walks(conn: &Connection, mut each: impl FnMut(&WalkFind)) -> Result<(), StoreError> {
    let current = |alias: &str| {
        format!(
            "LEFT JOIN identifications i ON i.id = (
             SELECT MAX(j.id) FROM identifications j WHERE j.observation_id = {alias}.id AND j.superseded_by IS NULL)"
        )
    };
    let mut stmt = conn.prepare(&format!(
        "SELECT o.walk_client_id, o.review_state, i.taxon_name, o.organism_id FROM observations o {}
         WHERE o.walk_client_id IS NOT NULL",
        current("o")
    ))?;
    let mut standing = conn.prepare(&format!(
        "SELECT s.review_state, i.taxon_name FROM observations s {} WHERE s.organism_id = ?1 AND {}",
        current("s"),
        standing_report("s")
    ))?;
    let mut rows = stmt.query([])?;
    while let Some(row) = rows.next()? {
        let (mut state, mut taxon_name): (String, Option<String>) = (row.get(1)?, row.get(2)?);
        if state == ReviewState::Merged.code() {
            let organism: i64 = row.get(3)?;
            (state, taxon_name) = standing.query_row([organism], |r| Ok((r.get(0)?, r.get(1)?)))?;
        }
        let find = WalkFind {
            walk_client_id: row.get(0)?,
            state: ReviewState::from_code(&state)
                .ok_or_else(|| StoreError::Corrupt(format!("unknown review state `{state}`")))?,
            taxon_name,
        };
        each(&find);
    }
    Ok(())
}

fn where_clause(filter: &RowFilter) -> (String, Vec<Box<dyn ToSql>>) {
    let mut sql = String::new();
    let mut values: Vec<Box<dyn ToSql>> = Vec::new();
    if let Some(states) = &filter.states {
        let marks = vec!["?"; states.len()].join(", ");
        sql.push_str(&format!(" AND o.review_state IN ({marks})"));
        values.extend(states.iter().map(|s| Box::new(s.code()) as Box<dyn ToSql>));
        if states.is_empty() {
            sql = " AND 0".to_owned();
        }
    }
    if let Some(from) = &filter.from_utc {
        sql.push_str(" AND o.observed_at_utc >= ?");
        values.push(Box::new(from.clone()));
    }
    if let Some(until) = &filter.until_utc {
        sql.push_str(" AND o.observed_at_utc < ?");
        values.push(Box::new(until.clone()));
    }
    (sql, values)
}

fn read_row(row: &Row) -> Result<OccurrenceRow, StoreError> {
    let observation_id: i64 = row.get(1)?;
    let client_id: String = row.get(2)?;
    let corrupt = |what: &str, value: &str| {
        StoreError::Corrupt(format!("observation {observation_id}: unknown {what} `{value}`"))
    };
    let condition: String = row.get(11)?;
    let setting: String = row.get(12)?;
    let sex: String = row.get(13)?;
    let state: String = row.get(16)?;
    let observer = ObserverRow {
        name: row.get::<_, Option<String>>(15)?.unwrap_or_default(),
        name_public: row.get(35)?,
        public_id: row.get(36)?,
        profile_name: row.get(37)?,
    };
    let identification = row.get::<_, Option<String>>(17)?.map(|taxon_name| -> Result<_, StoreError> {
        Ok(IdentificationRow {
            id: row.get(33)?,
            report: client_id.clone(),
            taxon_name,
            taxon_rank: row.get(18)?,
            identified_by: row.get(19)?,
            identified_at: row.get(20)?,
            basis: row.get(21)?,
            remarks: row.get(22)?,
            current: true,
            observer: observer.clone(),
        })
    });
    let length = row.get::<_, Option<String>>(23)?.map(|kind| -> Result<_, StoreError> {
        let method: String = row.get(27)?;
        Ok(LengthRow {
            kind: from_code(&kind).ok_or_else(|| corrupt("length kind", &kind))?,
            value: row.get(24)?,
            unit: row.get(25)?,
            value_cm: row.get(26)?,
            method: from_code(&method).ok_or_else(|| corrupt("length method", &method))?,
        })
    });
    let signs: Option<String> = row.get(28)?;
    let human_signs = split(signs)
        .into_iter()
        .map(|code| from_code(&code).ok_or_else(|| corrupt("human sign", &code)))
        .collect::<Result<Vec<_>, _>>()?;
    let life_stage = row
        .get::<_, Option<String>>(32)?
        .map(|code| from_code(&code).ok_or_else(|| corrupt("life stage", &code)))
        .transpose()?;
    Ok(OccurrenceRow {
        organism_id: row.get(0)?,
        observation_id,
        client_id,
        observed_at: row.get(3)?,
        first_utc: row.get(4)?,
        last_utc: row.get(5)?,
        observation_count: row.get(6)?,
        latitude: row.get(7)?,
        longitude: row.get(8)?,
        accuracy_m: row.get(9)?,
        count: row.get(10)?,
        condition: from_code(&condition).ok_or_else(|| corrupt("condition", &condition))?,
        setting: from_code(&setting).ok_or_else(|| corrupt("setting", &setting))?,
        sex: from_code(&sex).ok_or_else(|| corrupt("sex", &sex))?,
        life_stage,
        notes: row.get(14)?,
        observers: vec![observer],
        review_state: ReviewState::from_code(&state).ok_or_else(|| corrupt("review state", &state))?,
        identification: identification.transpose()?,
        identifications: Vec::new(),
        length: length.transpose()?,
        human_signs,
        photo_hashes: split(row.get(29)?),
        species_guess: row.get(30)?,
        walk_client_id: row.get(31)?,
        other_reports: Vec::new(),
        imported_from: row.get::<_, Option<String>>(38)?.zip(row.get::<_, Option<String>>(39)?),
        samples: Vec::new(),
        carcass: None,
    })
}

fn split(list: Option<String>) -> Vec<String> {
    list.map(|l| l.split(' ').filter(|s| !s.is_empty()).map(str::to_owned).collect()).unwrap_or_default()
}
