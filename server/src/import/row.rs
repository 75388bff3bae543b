//! One source row turned into the submission a phone would have sent, and checked by the
//! same code that checks a phone's (`intake::parse_submission`): a row the phone could
//! not send is refused with the phone's reason, named by the source column it came from.
//!
//! Each row gets a stable client id (UUID version 5, RFC 9562, in wrackline's own
//! namespace) from its dataset and its occurrenceID, or, when it has none, from its
//! dataset and a SHA-256 of its values: the same row read again gets the same id, so
//! intake answers it as a resend, and a changed row with the same occurrenceID as a
//! conflict.

use std::collections::BTreeMap;
use std::sync::LazyLock;

use chrono::{DateTime, FixedOffset, Utc};
use serde_json::{Value, json};
use sha2::{Digest as _, Sha256};
use shared_types::{Condition, HumanSign, LengthKind, LengthUnit, LifeStage, Setting, Submission};
use uuid::Uuid;

use super::mapping::{Field, Mapping};
use super::source::Cell;
use super::values::{self, Axis};
use crate::intake::{self, IntakeError};

/// The namespace of imported rows' client ids (made once for wrackline).
const IMPORT_NAMESPACE: Uuid = Uuid::from_u128(0x2b72_051e_8acb_49e6_b0e7_dcb1_4522_3486);

/// A row read as a submission.
#[derive(Debug, Clone)]
pub struct Built {
    pub submission: Submission,
    /// The submission as intake reads it.
    pub json: Vec<u8>,
    /// The source's id for the row (its occurrenceID, or `row-sha256:<hex>`).
    pub source_row_id: String,
    pub dataset_name: String,
}

/// What became of a row that is not imported.
#[derive(Debug, Clone, PartialEq)]
pub enum NotBuilt {
    /// Darwin Core says nothing was found (`occurrenceStatus` absent/notDetected or
    /// `individualCount` 0): an absence, which wrackline keeps with walks, not records.
    Absence,
    /// Refused: the column at fault and why.
    Refused { column: String, reason: String },
}

/// A row's cells by field: the first cell of a field that has a value.
struct RowValues<'a> {
    cells: BTreeMap<Field, &'a Cell>,
    mapping: &'a Mapping,
}

impl<'a> RowValues<'a> {
    fn new(cells: &'a [Cell], mapping: &'a Mapping) -> Self {
        let mut known = BTreeMap::new();
        for cell in cells {
            let value = mapping.replaced(cell.field, &cell.value);
            if !values::is_unknown(value, &mapping.unknown) {
                known.entry(cell.field).or_insert(cell);
            }
        }
        Self { cells: known, mapping }
    }

    /// The field's value after the mapping's replacements; else its default.
    fn get(&self, field: Field) -> Option<&str> {
        match self.cells.get(&field) {
            Some(cell) => Some(self.mapping.replaced(field, &cell.value).trim()),
            None => self.mapping.defaults.get(&field).map(|v| v.trim()).filter(|v| !v.is_empty()),
        }
    }

    /// The column a field came from, for refusals.
    fn column(&self, field: Field) -> String {
        match self.cells.get(&field) {
            Some(cell) => cell.column.to_string(),
            None if self.mapping.defaults.contains_key(&field) => format!("default {}", field.name()),
            None => field.name().to_owned(),
        }
    }

    fn refuse(&self, field: Field, reason: impl Into<String>) -> NotBuilt {
        NotBuilt::Refused { column: self.column(field), reason: reason.into() }
    }
}

/// Reads one row. `dataset` names the source when the row does not (`datasetName`).
pub fn build(cells: &[Cell], mapping: &Mapping, dataset: &str, now: DateTime<Utc>) -> Result<Built, NotBuilt> {
    let row = RowValues::new(cells, mapping);
    if is_absence(&row) {
        return Err(NotBuilt::Absence);
    }
    let dataset_name = row.get(Field::DatasetName).unwrap_or(dataset).to_owned();
    let (client_id, source_row_id) = stable_id(&row, &dataset_name);
    let offset = mapping.utc_offset.unwrap_or_else(|| FixedOffset::east_opt(0).expect("UTC"));
    let date_text = row
        .get(Field::EventDate)
        .ok_or_else(|| row.refuse(Field::EventDate, "no date: every record needs the day it was found"))?;
    let date = values::event_date(date_text, row.get(Field::EventTime), &mapping.date_formats, offset)
        .map_err(|reason| row.refuse(Field::EventDate, reason))?;
    let mut notes = row.get(Field::OccurrenceRemarks).map(str::to_owned);
    if !date.has_time {
        let note = "imported: the source gives the day only; the time of day 12:00 is a placeholder";
        notes = Some(match notes {
            Some(text) => format!("{text} ({note})"),
            None => note.to_owned(),
        });
    }
    let species_guess = [Field::VerbatimIdentification, Field::ScientificName, Field::VernacularName]
        .into_iter()
        .find_map(|f| row.get(f));
    let record = json!({
        "client_id": client_id,
        "observed_at": date.at.to_rfc3339(),
        "position": position(&row)?,
        "species_guess": species_guess,
        "length": length(&row)?,
        "sex": sex(&row)?,
        "count": count(&row)?,
        "condition": condition(&row)?,
        "setting": choice(&row, Field::Setting, &SETTINGS)?,
        "human_signs": human_signs(&row)?,
        "notes": notes,
        "observer_name": row.get(Field::RecordedBy),
        "life_stage": life_stage(&row)?,
    });
    let json = serde_json::to_vec(&record).map_err(|err| row.refuse(Field::OccurrenceId, err.to_string()))?;
    let submission = intake::parse_submission(&json, now).map_err(|err| phone_refusal(&row, err))?;
    Ok(Built { submission, json, source_row_id, dataset_name })
}

/// A phone's refusal, named by the source column of the field it is about.
fn phone_refusal(row: &RowValues, err: IntakeError) -> NotBuilt {
    let IntakeError::Field { field, message } = err else {
        return NotBuilt::Refused { column: String::new(), reason: err.to_string() };
    };
    let source = match field.trim_start_matches('.').split(['.', '[']).collect::<Vec<_>>().as_slice() {
        ["observed_at", ..] => Field::EventDate,
        ["position", "latitude", ..] => Field::DecimalLatitude,
        ["position", "longitude", ..] => Field::DecimalLongitude,
        ["position", ..] => Field::CoordinateUncertaintyInMeters,
        ["species_guess", ..] => [Field::VerbatimIdentification, Field::ScientificName, Field::VernacularName]
            .into_iter()
            .find(|f| row.cells.contains_key(f))
            .unwrap_or(Field::ScientificName),
        ["length", ..] => Field::Length,
        ["count", ..] => Field::IndividualCount,
        ["notes", ..] => Field::OccurrenceRemarks,
        ["observer_name", ..] => Field::RecordedBy,
        ["human_signs", ..] => Field::HumanSigns,
        ["life_stage", ..] => Field::LifeStage,
        ["sex", ..] => Field::Sex,
        ["condition", ..] => Field::Condition,
        ["setting", ..] => Field::Setting,
        _ => Field::OccurrenceId,
    };
    NotBuilt::Refused { column: row.column(source), reason: format!("{field}: {}", without_json_position(&message)) }
}

/// serde's message without its "at line 1 column 392": the position in JSON the row was
/// turned into, which means nothing to whoever typed the row.
fn without_json_position(message: &str) -> &str {
    match message.rfind(" at line ") {
        Some(at) if message[at..].contains(" column ") => &message[..at],
        _ => message,
    }
}

fn is_absence(row: &RowValues) -> bool {
    let status = row.get(Field::OccurrenceStatus).map(|s| s.to_lowercase().replace(' ', ""));
    matches!(status.as_deref(), Some("absent" | "notdetected"))
        || row.get(Field::IndividualCount).and_then(|c| values::number(c).ok()) == Some(0.0)
}

/// The row's client id and its source id (see the module doc).
fn stable_id(row: &RowValues, dataset: &str) -> (Uuid, String) {
    if let Some(id) = row.cells.get(&Field::OccurrenceId).map(|c| c.value.trim()) {
        let name = format!("occurrenceID\u{0}{dataset}\u{0}{id}");
        return (Uuid::new_v5(&IMPORT_NAMESPACE, name.as_bytes()), id.to_owned());
    }
    let mut hasher = Sha256::new();
    for (field, cell) in &row.cells {
        hasher.update(field.name().as_bytes());
        hasher.update(b"\0");
        hasher.update(cell.value.trim().as_bytes());
        hasher.update(b"\0");
    }
    let hash = hex::encode(hasher.finalize());
    let name = format!("row\u{0}{dataset}\u{0}{hash}");
    (Uuid::new_v5(&IMPORT_NAMESPACE, name.as_bytes()), format!("row-sha256:{hash}"))
}

fn position(row: &RowValues) -> Result<Value, NotBuilt> {
    let (lat, lon) = (row.get(Field::DecimalLatitude), row.get(Field::DecimalLongitude));
    let (lat, lon) = match (lat, lon) {
        (None, None) => return Ok(Value::Null),
        (Some(lat), Some(lon)) => (lat, lon),
        (Some(_), None) => return Err(row.refuse(Field::DecimalLongitude, "a latitude without a longitude")),
        (None, Some(_)) => return Err(row.refuse(Field::DecimalLatitude, "a longitude without a latitude")),
    };
    let latitude = values::coordinate(lat, Axis::Latitude).map_err(|r| row.refuse(Field::DecimalLatitude, r))?;
    let longitude = values::coordinate(lon, Axis::Longitude).map_err(|r| row.refuse(Field::DecimalLongitude, r))?;
    let accuracy = row
        .get(Field::CoordinateUncertaintyInMeters)
        .map(values::number)
        .transpose()
        .map_err(|r| row.refuse(Field::CoordinateUncertaintyInMeters, r))?;
    Ok(json!({ "latitude": latitude, "longitude": longitude, "accuracy_m": accuracy, "source": "typed" }))
}

fn length(row: &RowValues) -> Result<Value, NotBuilt> {
    let Some(text) = row.get(Field::Length) else { return Ok(Value::Null) };
    let value = values::number(text).map_err(|r| row.refuse(Field::Length, r))?;
    let unit = choice(row, Field::LengthUnit, &UNITS)?;
    let kind = choice(row, Field::LengthKind, &KINDS)?;
    let method = choice(row, Field::LengthMethod, &METHODS)?;
    Ok(json!({ "kind": kind, "value": value, "unit": unit, "method": method }))
}

/// The serde code of one of the shared enums (`fresh_dead`).
fn code<T: serde::Serialize>(value: &T) -> String {
    serde_json::to_value(value).ok().and_then(|v| v.as_str().map(str::to_owned)).unwrap_or_default()
}

/// (code, label) pairs a field's value is matched against.
type Choices = Vec<(String, &'static str)>;

fn choices<T: serde::Serialize>(all: &[T], label: fn(&T) -> &'static str) -> Choices {
    all.iter().map(|v| (code(v), label(v))).collect()
}

static CONDITIONS: LazyLock<Choices> = LazyLock::new(|| choices(&Condition::ALL, |c| c.label()));
static SETTINGS: LazyLock<Choices> = LazyLock::new(|| choices(&Setting::ALL, |s| s.label()));
static KINDS: LazyLock<Choices> = LazyLock::new(|| choices(&LengthKind::ALL, |k| k.label()));
static UNITS: LazyLock<Choices> = LazyLock::new(|| choices(&LengthUnit::ALL, |u| u.code()));
static SIGNS: LazyLock<Choices> = LazyLock::new(|| choices(&HumanSign::ALL, |s| s.label()));
static STAGES: LazyLock<Choices> = LazyLock::new(|| {
    let mut stages = choices(&LifeStage::ALL, |s| s.label());
    stages.extend(choices(&LifeStage::ALL, |s| s.dwc()));
    stages
});
static METHODS: LazyLock<Choices> =
    LazyLock::new(|| vec![("measured".into(), "measured"), ("estimated".into(), "estimated")]);
static SEXES: LazyLock<Choices> =
    LazyLock::new(|| vec![("male".into(), "male"), ("female".into(), "female"), ("unknown".into(), "undetermined")]);

/// A value that must be one of `choices` (code, label), matched ignoring case, spaces
/// and underscores; refused when missing (no column and no default) or unknown.
fn choice(row: &RowValues, field: Field, choices: &[(String, &'static str)]) -> Result<Value, NotBuilt> {
    let fold = |s: &str| s.trim().to_lowercase().replace(['_', ' ', '-'], "");
    let Some(text) = row.get(field) else {
        let codes: Vec<&str> = choices.iter().map(|(c, _)| c.as_str()).collect();
        return Err(row.refuse(
            field,
            format!(
                "not given: name a column for {name} or a default ({}), e.g. --default {name}={}",
                codes.join(", "),
                codes[0],
                name = field.name()
            ),
        ));
    };
    choices
        .iter()
        .find(|(c, label)| fold(c) == fold(text) || fold(label) == fold(text))
        .map(|(c, _)| json!(c))
        .ok_or_else(|| {
            let codes: Vec<&str> = choices.iter().map(|(c, _)| c.as_str()).collect();
            row.refuse(field, format!("`{text}` is not one of {}", codes.join(", ")))
        })
}

fn sex(row: &RowValues) -> Result<Value, NotBuilt> {
    match row.get(Field::Sex) {
        None => Ok(json!("unknown")),
        Some(_) => choice(row, Field::Sex, &SEXES),
    }
}

fn count(row: &RowValues) -> Result<Value, NotBuilt> {
    let Some(text) = row.get(Field::IndividualCount) else { return Ok(json!(1)) };
    let number = values::number(text).map_err(|r| row.refuse(Field::IndividualCount, r))?;
    if number.fract() != 0.0 || number < 0.0 {
        return Err(row.refuse(Field::IndividualCount, format!("`{text}` is not a whole number of animals")));
    }
    Ok(json!(number as u64))
}

/// `condition`, else Darwin Core `vitality`: `alive` is alive; `dead` does not say how
/// long dead, so it takes the default condition when that is a dead one.
fn condition(row: &RowValues) -> Result<Value, NotBuilt> {
    let conditions = &*CONDITIONS;
    if row.cells.contains_key(&Field::Condition) {
        return choice(row, Field::Condition, conditions);
    }
    match row.get(Field::Vitality).map(str::to_lowercase).as_deref() {
        None => choice(row, Field::Condition, conditions),
        Some("alive") => Ok(json!("alive")),
        Some("dead") => match choice(row, Field::Condition, conditions)? {
            alive if alive == json!("alive") => Err(row.refuse(
                Field::Vitality,
                "`dead`, but the default condition is alive; give --default condition=fresh_dead, decomposed or remains_only",
            )),
            dead => Ok(dead),
        },
        Some(other) => Err(row.refuse(Field::Vitality, format!("`{other}` is not alive or dead"))),
    }
}

fn human_signs(row: &RowValues) -> Result<Value, NotBuilt> {
    let Some(text) = row.get(Field::HumanSigns) else { return Ok(json!([])) };
    let signs = &*SIGNS;
    let mut codes = Vec::new();
    for part in text.split(['|', ';', ',']).map(str::trim).filter(|p| !p.is_empty()) {
        let fold = |s: &str| s.to_lowercase().replace(['_', ' '], "");
        let found = signs.iter().find(|(c, l)| fold(c) == fold(part) || fold(l) == fold(part));
        match found {
            Some((c, _)) => codes.push(json!(c)),
            None => {
                let known: Vec<&str> = signs.iter().map(|(c, _)| c.as_str()).collect();
                return Err(row.refuse(Field::HumanSigns, format!("`{part}` is not one of {}", known.join(", "))));
            }
        }
    }
    Ok(Value::Array(codes))
}

/// Darwin Core `lifeStage` (GBIF Life Stage vocabulary words, and wrackline's own).
fn life_stage(row: &RowValues) -> Result<Value, NotBuilt> {
    if row.get(Field::LifeStage).is_none() {
        return Ok(Value::Null);
    }
    choice(row, Field::LifeStage, &STAGES)
}
