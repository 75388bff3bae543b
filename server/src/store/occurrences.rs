//! Organisms as occurrence rows, read one at a time for exports and analyses.
//!
//! One row per organism (an animal, after any merges), taken from its first observation,
//! with the time span of all its observations and the photos of all of them. Rows are
//! handed to a callback as SQLite steps through them, so however many records are
//! stored, only one row is in memory. Observer contacts are never selected.

use shared_types::codes::from_code;
use rusqlite::{Connection, Row, ToSql};
use shared_types::{Condition, HumanSign, LengthKind, MeasureMethod, ReviewState, Setting, Sex};

use super::StoreError;

/// Which organisms to read. Every bound is optional; `None` lets everything through.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct RowFilter {
    /// Review states to take, by the first observation's state.
    pub states: Option<Vec<ReviewState>>,
    /// Earliest first-observation time, inclusive, as UTC `YYYY-MM-DDTHH:MM:SSZ`.
    pub from_utc: Option<String>,
    /// Latest first-observation time, exclusive, as UTC `YYYY-MM-DDTHH:MM:SSZ`.
    pub until_utc: Option<String>,
    /// South, west, north, east in decimal degrees; records without a position fall outside.
    pub bbox: Option<[f64; 4]>,
}

/// The current identification of an observation.
#[derive(Debug, Clone, PartialEq)]
pub struct IdentificationRow {
    pub taxon_name: String,
    pub taxon_rank: Option<String>,
    pub identified_by: Option<String>,
    pub identified_at: String,
    pub basis: String,
    pub remarks: Option<String>,
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

/// One organism, as its first observation describes it.
#[derive(Debug, Clone, PartialEq)]
pub struct OccurrenceRow {
    pub organism_id: i64,
    pub observation_id: i64,
    pub client_id: String,
    /// RFC 3339 with the observer's offset.
    pub observed_at: String,
    /// Earliest and latest observation of this organism, UTC.
    pub first_utc: String,
    pub last_utc: String,
    pub observation_count: i64,
    pub latitude: Option<f64>,
    pub longitude: Option<f64>,
    pub accuracy_m: Option<f64>,
    pub count: i64,
    pub condition: Condition,
    pub setting: Setting,
    pub sex: Sex,
    pub notes: Option<String>,
    /// The observer's chosen display name, nothing else about them.
    pub observer_name: Option<String>,
    pub review_state: ReviewState,
    pub identification: Option<IdentificationRow>,
    pub length: Option<LengthRow>,
    pub human_signs: Vec<HumanSign>,
    /// SHA-256 of every photo of every observation of this organism, in order.
    pub photo_hashes: Vec<String>,
    /// The observer's own words for what it was, as typed.
    pub species_guess: Option<String>,
    /// The survey walk the (first) observation was made on.
    pub walk_client_id: Option<String>,
    /// Client ids of the other reports of this organism (after a merge).
    pub other_reports: Vec<String>,
}

// One observation per organism is read: its first (lowest id). The span and photos of the
// other observations are looked up (see `merged_details`) only for organisms that have more
// than one, so the common case costs a few index probes per row and no temporary b-trees.
const SELECT: &str = "
SELECT o.organism_id, o.id, o.client_id, o.observed_at, o.observed_at_utc, o.observed_at_utc,
       (SELECT COUNT(*) FROM observations c WHERE c.organism_id = o.organism_id),
       o.latitude, o.longitude, o.accuracy_m, o.count, o.condition, o.setting, o.sex, o.notes,
       o.observer_name, o.review_state,
       i.taxon_name, i.taxon_rank, i.identified_by, i.identified_at, i.basis, i.remarks,
       m.kind, m.value, m.unit, m.value_cm, m.method,
       (SELECT group_concat(s.sign, ' ') FROM human_signs s WHERE s.observation_id = o.id),
       (SELECT group_concat(op.photo_sha256, ' ' ORDER BY op.position) FROM observation_photos op WHERE op.observation_id = o.id),
       json_extract(o.submission_json, '$.species_guess'), o.walk_client_id
FROM observations o
LEFT JOIN identifications i ON i.id = (
    SELECT MAX(j.id) FROM identifications j WHERE j.observation_id = o.id AND j.superseded_by IS NULL)
LEFT JOIN measurements m ON m.id = (SELECT MIN(k.id) FROM measurements k WHERE k.observation_id = o.id)
WHERE o.id = (SELECT MIN(r.id) FROM observations r WHERE r.organism_id = o.organism_id)";

/// The time span and the photos of all observations of an organism that has several.
fn merged_details(conn: &Connection, row: &mut OccurrenceRow) -> Result<(), StoreError> {
    let mut span = conn.prepare_cached("SELECT MIN(observed_at_utc), MAX(observed_at_utc) FROM observations WHERE organism_id = ?1")?;
    (row.first_utc, row.last_utc) = span.query_row([row.organism_id], |r| Ok((r.get(0)?, r.get(1)?)))?;
    let mut photos = conn.prepare_cached(
        "SELECT op.photo_sha256 FROM observation_photos op JOIN observations x ON x.id = op.observation_id
         WHERE x.organism_id = ?1 ORDER BY x.observed_at_utc, x.id, op.position",
    )?;
    row.photo_hashes = photos.query_map([row.organism_id], |r| r.get(0))?.collect::<Result<_, _>>()?;
    let mut others = conn.prepare_cached("SELECT client_id FROM observations WHERE organism_id = ?1 AND id != ?2 ORDER BY observed_at_utc, id")?;
    row.other_reports = others.query_map([row.organism_id, row.observation_id], |r| r.get(0))?.collect::<Result<_, _>>()?;
    Ok(())
}

/// Calls `each` with every organism that passes `filter`, in the order of their first
/// observations, and returns
/// how many there were. An error from `each` stops the walk and is returned.
pub fn for_each<E: From<StoreError>>(
    conn: &Connection,
    filter: &RowFilter,
    mut each: impl FnMut(OccurrenceRow) -> Result<(), E>,
) -> Result<u64, E> {
    let (conditions, values) = where_clause(filter);
    let sql = format!("{SELECT}{conditions} ORDER BY o.id");
    let mut stmt = conn.prepare(&sql).map_err(StoreError::from)?;
    let params: Vec<&dyn ToSql> = values.iter().map(|v| v.as_ref() as &dyn ToSql).collect();
    let mut rows = stmt.query(params.as_slice()).map_err(StoreError::from)?;
    let mut seen = 0;
    while let Some(row) = rows.next().map_err(StoreError::from)? {
        let mut occurrence = read_row(row)?;
        if occurrence.observation_count > 1 {
            merged_details(conn, &mut occurrence)?;
        }
        each(occurrence)?;
        seen += 1;
    }
    Ok(seen)
}

/// How many organisms pass `filter` (for a progress bar).
pub fn count(conn: &Connection, filter: &RowFilter) -> Result<u64, StoreError> {
    let (conditions, values) = where_clause(filter);
    let sql = format!(
        "SELECT COUNT(*) FROM observations o WHERE o.id = (SELECT MIN(r.id) FROM observations r WHERE r.organism_id = o.organism_id){conditions}"
    );
    let params: Vec<&dyn ToSql> = values.iter().map(|v| v.as_ref() as &dyn ToSql).collect();
    Ok(conn.query_row(&sql, params.as_slice(), |row| row.get::<_, i64>(0))? as u64)
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
    if let Some([south, west, north, east]) = filter.bbox {
        sql.push_str(" AND o.latitude BETWEEN ? AND ? AND o.longitude BETWEEN ? AND ?");
        values.extend([south, north, west, east].map(|v| Box::new(v) as Box<dyn ToSql>));
    }
    (sql, values)
}

fn read_row(row: &Row) -> Result<OccurrenceRow, StoreError> {
    let observation_id: i64 = row.get(1)?;
    let corrupt = |what: &str, value: &str| StoreError::Corrupt(format!("observation {observation_id}: unknown {what} `{value}`"));
    let condition: String = row.get(11)?;
    let setting: String = row.get(12)?;
    let sex: String = row.get(13)?;
    let state: String = row.get(16)?;
    let identification = row.get::<_, Option<String>>(17)?.map(|taxon_name| -> Result<_, StoreError> {
        Ok(IdentificationRow {
            taxon_name,
            taxon_rank: row.get(18)?,
            identified_by: row.get(19)?,
            identified_at: row.get(20)?,
            basis: row.get(21)?,
            remarks: row.get(22)?,
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
    Ok(OccurrenceRow {
        organism_id: row.get(0)?,
        observation_id,
        client_id: row.get(2)?,
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
        notes: row.get(14)?,
        observer_name: row.get(15)?,
        review_state: ReviewState::from_code(&state).ok_or_else(|| corrupt("review state", &state))?,
        identification: identification.transpose()?,
        length: length.transpose()?,
        human_signs,
        photo_hashes: split(row.get(29)?),
        species_guess: row.get(30)?,
        walk_client_id: row.get(31)?,
        other_reports: Vec::new(),
    })
}

fn split(list: Option<String>) -> Vec<String> {
    list.map(|l| l.split(' ').filter(|s| !s.is_empty()).map(str::to_owned).collect()).unwrap_or_default()
}

