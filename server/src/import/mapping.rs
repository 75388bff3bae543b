//! Which source column holds which field, and how its values are read: the mapping file
//! (TOML or CSV; README, "Importing records kept elsewhere", and `demo-records/import/`), or, without one,
//! the Darwin Core term names of the columns themselves.
//!
//! The fields are Darwin Core terms where Darwin Core has one, and wrackline's own names
//! for what it records beyond them (condition, setting, human signs, the length's parts).

use std::collections::BTreeMap;
use std::path::Path;

use chrono::FixedOffset;
use serde::Deserialize;

use super::values;

/// What an imported column can hold.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Field {
    OccurrenceId,
    DatasetName,
    EventDate,
    EventTime,
    DecimalLatitude,
    DecimalLongitude,
    CoordinateUncertaintyInMeters,
    VerbatimIdentification,
    ScientificName,
    VernacularName,
    IndividualCount,
    OccurrenceStatus,
    Sex,
    LifeStage,
    Vitality,
    RecordedBy,
    OccurrenceRemarks,
    Condition,
    Setting,
    HumanSigns,
    Length,
    LengthUnit,
    LengthKind,
    LengthMethod,
}

impl Field {
    pub const ALL: [Field; 24] = [
        Self::OccurrenceId,
        Self::DatasetName,
        Self::EventDate,
        Self::EventTime,
        Self::DecimalLatitude,
        Self::DecimalLongitude,
        Self::CoordinateUncertaintyInMeters,
        Self::VerbatimIdentification,
        Self::ScientificName,
        Self::VernacularName,
        Self::IndividualCount,
        Self::OccurrenceStatus,
        Self::Sex,
        Self::LifeStage,
        Self::Vitality,
        Self::RecordedBy,
        Self::OccurrenceRemarks,
        Self::Condition,
        Self::Setting,
        Self::HumanSigns,
        Self::Length,
        Self::LengthUnit,
        Self::LengthKind,
        Self::LengthMethod,
    ];

    /// The field's name: the Darwin Core term, or wrackline's own.
    pub fn name(self) -> &'static str {
        match self {
            Self::OccurrenceId => "occurrenceID",
            Self::DatasetName => "datasetName",
            Self::EventDate => "eventDate",
            Self::EventTime => "eventTime",
            Self::DecimalLatitude => "decimalLatitude",
            Self::DecimalLongitude => "decimalLongitude",
            Self::CoordinateUncertaintyInMeters => "coordinateUncertaintyInMeters",
            Self::VerbatimIdentification => "verbatimIdentification",
            Self::ScientificName => "scientificName",
            Self::VernacularName => "vernacularName",
            Self::IndividualCount => "individualCount",
            Self::OccurrenceStatus => "occurrenceStatus",
            Self::Sex => "sex",
            Self::LifeStage => "lifeStage",
            Self::Vitality => "vitality",
            Self::RecordedBy => "recordedBy",
            Self::OccurrenceRemarks => "occurrenceRemarks",
            Self::Condition => "condition",
            Self::Setting => "setting",
            Self::HumanSigns => "humanSigns",
            Self::Length => "length",
            Self::LengthUnit => "lengthUnit",
            Self::LengthKind => "lengthKind",
            Self::LengthMethod => "lengthMethod",
        }
    }

    /// The field named `name` (case ignored; a term's full IRI is read by its last part).
    pub fn named(name: &str) -> Option<Self> {
        let short = name.trim().rsplit(['/', '#']).next().unwrap_or(name);
        Self::ALL.into_iter().find(|f| f.name().eq_ignore_ascii_case(short))
    }
}

/// How a source's columns become fields.
#[derive(Debug, Clone, Default)]
pub struct Mapping {
    /// Source column name → field; without a mapping file each column named as a field.
    pub columns: Vec<(String, Field)>,
    /// Whether columns named as fields count too (no mapping file, or an archive).
    pub by_name: bool,
    /// Date patterns (chrono strftime) tried after ISO 8601.
    pub date_formats: Vec<String>,
    /// The offset of local times and days that carry none (default UTC).
    pub utc_offset: Option<FixedOffset>,
    /// Replacements per field, applied before reading: lowercase source value → value.
    pub values: BTreeMap<Field, BTreeMap<String, String>>,
    /// A field's value when the row gives none.
    pub defaults: BTreeMap<Field, String>,
    /// More cells that mean "not known", lowercase.
    pub unknown: Vec<String>,
    pub delimiter: Option<u8>,
    pub dataset_name: Option<String>,
}

/// The mapping file as TOML.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct TomlMapping {
    dataset_name: Option<String>,
    delimiter: Option<String>,
    #[serde(default)]
    columns: BTreeMap<String, String>,
    #[serde(default)]
    dates: TomlDates,
    #[serde(default)]
    values: BTreeMap<String, BTreeMap<String, String>>,
    #[serde(default)]
    defaults: BTreeMap<String, String>,
    #[serde(default)]
    unknown: Vec<String>,
}

#[derive(Debug, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct TomlDates {
    #[serde(default)]
    formats: Vec<String>,
    utc_offset: Option<String>,
}

impl Mapping {
    /// No mapping file: columns are read by their Darwin Core (or wrackline) names.
    pub fn by_column_names() -> Self {
        Self { by_name: true, ..Self::default() }
    }

    /// Reads a mapping file: `.toml`, or `.csv` (columns `column,field,value`).
    pub fn load(path: &Path) -> Result<Self, String> {
        let text = std::fs::read_to_string(path).map_err(|err| format!("{}: {err}", path.display()))?;
        let text = text.strip_prefix('\u{feff}').unwrap_or(&text);
        let is_csv = path.extension().is_some_and(|e| e.eq_ignore_ascii_case("csv"));
        let read = if is_csv { Self::from_csv(text) } else { Self::from_toml(text) };
        read.map_err(|err| format!("mapping file {}: {err}", path.display()))
    }

    fn from_toml(text: &str) -> Result<Self, String> {
        let raw: TomlMapping = toml::from_str(text).map_err(|err| err.to_string())?;
        let mut mapping = Self {
            dataset_name: raw.dataset_name,
            date_formats: raw.dates.formats,
            utc_offset: raw.dates.utc_offset.as_deref().map(values::utc_offset).transpose()?,
            unknown: raw.unknown.iter().map(|w| w.trim().to_lowercase()).collect(),
            delimiter: raw.delimiter.as_deref().map(delimiter).transpose()?,
            ..Self::default()
        };
        for (column, field) in raw.columns {
            mapping.columns.push((column, field_named(&field, "columns")?));
        }
        for (field, replacements) in raw.values {
            let field = field_named(&field, "values")?;
            let table = mapping.values.entry(field).or_default();
            table.extend(replacements.into_iter().map(|(from, to)| (from.trim().to_lowercase(), to)));
        }
        for (field, value) in raw.defaults {
            mapping.defaults.insert(field_named(&field, "defaults")?, value);
        }
        Ok(mapping)
    }

    /// The CSV form: one row per column (`Date found,eventDate,%d/%m/%Y`: the value is a
    /// date format for eventDate, a unit for length, `from=to` for any other field); a
    /// row with no column sets a default (`,setting,beach_stranding`) or an option
    /// (`,utcOffset,+01:00`, `,delimiter,;`, `,unknown,not rec.`).
    fn from_csv(text: &str) -> Result<Self, String> {
        let mut reader = csv::ReaderBuilder::new().flexible(true).from_reader(text.as_bytes());
        let mut mapping = Self::default();
        for (index, row) in reader.records().enumerate() {
            let row = row.map_err(|err| err.to_string())?;
            let line = index + 2;
            let cell = |i: usize| row.get(i).unwrap_or("").trim().to_owned();
            let (column, field, value) = (cell(0), cell(1), cell(2));
            match (column.is_empty(), field.as_str()) {
                (true, "utcOffset") => mapping.utc_offset = Some(values::utc_offset(&value)?),
                (true, "delimiter") => mapping.delimiter = Some(delimiter(&value)?),
                (true, "unknown") => mapping.unknown.push(value.to_lowercase()),
                (true, name) => {
                    let field = field_named(name, &format!("line {line}"))?;
                    if field == Field::DatasetName {
                        mapping.dataset_name = Some(value.clone());
                    }
                    mapping.defaults.insert(field, value);
                }
                (false, name) => {
                    let field = field_named(name, &format!("line {line}"))?;
                    if !mapping.columns.iter().any(|(c, f)| *c == column && *f == field) {
                        mapping.columns.push((column.clone(), field));
                    }
                    mapping.add_option(field, &value, line)?;
                }
            }
        }
        Ok(mapping)
    }

    fn add_option(&mut self, field: Field, value: &str, line: usize) -> Result<(), String> {
        if value.is_empty() {
            return Ok(());
        }
        match field {
            Field::EventDate => self.date_formats.push(value.to_owned()),
            Field::Length => {
                self.defaults.insert(Field::LengthUnit, value.to_owned());
            }
            _ => {
                let (from, to) = value
                    .split_once('=')
                    .ok_or_else(|| format!("line {line}: the value for {} must read from=to", field.name()))?;
                self.values.entry(field).or_default().insert(from.trim().to_lowercase(), to.trim().to_owned());
            }
        }
        Ok(())
    }

    /// The field each header column holds (`None`: not used), checking that a mapped
    /// column is present. Two columns for one field: the first that has a value counts.
    pub fn fields_of(&self, headers: &[String]) -> Result<Vec<Option<Field>>, String> {
        for (column, _) in &self.columns {
            if !headers.iter().any(|h| h.trim() == column.trim()) {
                return Err(format!("the mapping names a column `{column}` the file does not have"));
            }
        }
        Ok(headers
            .iter()
            .map(|header| {
                self.columns
                    .iter()
                    .find(|(column, _)| column.trim() == header.trim())
                    .map(|(_, field)| *field)
                    .or_else(|| if self.by_name { Field::named(header) } else { None })
            })
            .collect())
    }

    /// `cell` after the mapping's replacements for `field`.
    pub fn replaced<'a>(&'a self, field: Field, cell: &'a str) -> &'a str {
        self.values.get(&field).and_then(|table| table.get(&cell.trim().to_lowercase())).map_or(cell, String::as_str)
    }
}

fn field_named(name: &str, place: &str) -> Result<Field, String> {
    Field::named(name).ok_or_else(|| {
        let known: Vec<&str> = Field::ALL.iter().map(|f| f.name()).collect();
        format!("{place}: `{name}` is not a field wrackline imports; fields are {}", known.join(", "))
    })
}

/// A delimiter written as itself, or `tab` / `\t`.
pub fn delimiter(text: &str) -> Result<u8, String> {
    match text {
        "tab" | "\\t" | "\t" => Ok(b'\t'),
        "," | ";" | "|" => Ok(text.as_bytes()[0]),
        other => Err(format!("delimiter `{other}` must be one of `,` `;` `|` or `tab`")),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_csv_mapping_and_a_toml_mapping_say_the_same() {
        let toml = Mapping::from_toml(
            r#"
delimiter = ";"
[columns]
"Date found" = "eventDate"
"Sex" = "sex"
[dates]
formats = ["%d/%m/%Y"]
utc_offset = "+01:00"
[values.sex]
M = "male"
[defaults]
setting = "beach_stranding"
"#,
        )
        .unwrap();
        let csv = Mapping::from_csv(
            "column,field,value\nDate found,eventDate,%d/%m/%Y\nSex,sex,M=male\n,setting,beach_stranding\n,utcOffset,+01:00\n,delimiter,;\n",
        )
        .unwrap();
        for mapping in [&toml, &csv] {
            assert_eq!(mapping.delimiter, Some(b';'));
            assert_eq!(mapping.date_formats, ["%d/%m/%Y"]);
            assert_eq!(mapping.replaced(Field::Sex, "m"), "male");
            assert_eq!(mapping.defaults[&Field::Setting], "beach_stranding");
            assert_eq!(mapping.utc_offset.unwrap().local_minus_utc(), 3600);
        }
        let headers = vec!["Sex".to_owned(), "Date found".to_owned(), "Notes".to_owned()];
        assert_eq!(toml.fields_of(&headers).unwrap(), [Some(Field::Sex), Some(Field::EventDate), None]);
    }

    #[test]
    fn a_mapping_names_its_mistakes() {
        let wrong = Mapping::from_toml("[columns]\nDate = \"whenever\"\n").unwrap_err();
        assert!(wrong.contains("whenever") && wrong.contains("eventDate"), "{wrong}");
        let missing = Mapping::from_toml("[columns]\nDate = \"eventDate\"\n").unwrap();
        assert!(missing.fields_of(&["When".to_owned()]).unwrap_err().contains("`Date`"));
    }
}
