//! Records read for range and trend figures: from the database, from a CSV file, or from
//! a Darwin Core Archive made elsewhere.
//!
//! Stored records are read for an audience ([`crate::protect::Publisher`]): for the
//! public each comes at its published position (generalised, or none when withheld)
//! and under its resolved checklist name only, so every figure made from them — EOO,
//! AOO, sites, hull corners, maps, nearby counts, yearly counts — is made from what the
//! public export shows, and no sequence of requests can narrow a record down further.
//!
//! Every reader gives the same [`PointRecord`]s, so the figures do not care where the
//! records came from. Errors name the file, the line and the column at fault.
//!
//! Only presences count: a row whose `occurrenceStatus` is `absent` or `notDetected`
//! (Darwin Core's older and newer words for a search that found nothing), or whose
//! `individualCount` is 0, is skipped. In an archive whose core is the Event table
//! (sampling-event data, TDWG Darwin Core Text Guide), an occurrence row without its own
//! coordinates or date takes its event's.

use std::collections::HashMap;
use std::fs::File;
use std::io::Read;
use std::path::Path;

use analysis::LatLon;
use shared_types::ReviewState;

use super::dates::DateSpan;
use super::meta::{ArchiveTable, read_meta};
use crate::protect::{Audience, Publisher};
use crate::store::StoreError;
use crate::store::occurrences::{self, OccurrenceRow, RowFilter};

/// One record as the figures need it.
#[derive(Debug, Clone, PartialEq)]
pub struct PointRecord {
    /// What a reviewer looks the record up by: `urn:uuid:<client id>` for stored records
    /// (the exports' occurrenceID), the file's occurrenceID, or its line.
    pub label: String,
    /// The name as written (a scientific name, or an observer's guess).
    pub name: Option<String>,
    /// Where; `None` when the record has no position.
    pub position: Option<LatLon>,
    /// When; `None` when the record has no date.
    pub when: Option<DateSpan>,
    /// How many animals the record is of (1 when the source does not say).
    pub count: u64,
    /// The survey walk it was found on (stored records only).
    pub walk_client_id: Option<String>,
}

/// Why records could not be read.
#[derive(Debug, thiserror::Error)]
pub enum InputError {
    #[error("{file}: {source}")]
    Open { file: String, source: std::io::Error },
    #[error("{file}: {message}")]
    File { file: String, message: String },
    #[error("{file}, line {line}, column {column} ({header}): {message}")]
    Cell { file: String, line: u64, column: usize, header: String, message: String },
}

/// The Darwin Core terms a file must or may carry.
const LATITUDE: &str = "decimalLatitude";
const LONGITUDE: &str = "decimalLongitude";
const NAME: &str = "scientificName";
const DATE: &str = "eventDate";
const COUNT: &str = "individualCount";
const STATUS: &str = "occurrenceStatus";
const OCCURRENCE_ID: &str = "occurrenceID";

/// `occurrenceStatus` values that say nothing was found: `absent` (Darwin Core before the
/// 2025-2026 revision), `notDetected` (after it); compared ignoring case and spaces.
const ABSENT_STATUSES: [&str; 2] = ["absent", "notdetected"];

/// Reads a CSV file with a header row, or a Darwin Core Archive (a zip with `meta.xml`).
pub fn read_file(path: &Path) -> Result<Vec<PointRecord>, InputError> {
    let shown = path.display().to_string();
    let mut file = File::open(path).map_err(|source| InputError::Open { file: shown.clone(), source })?;
    let mut magic = [0u8; 4];
    let read = file.read(&mut magic).map_err(|source| InputError::Open { file: shown.clone(), source })?;
    if read == 4 && &magic == b"PK\x03\x04" {
        read_archive(path, &shown)
    } else {
        let file = File::open(path).map_err(|source| InputError::Open { file: shown.clone(), source })?;
        let reader = csv::ReaderBuilder::new().has_headers(true).flexible(false).from_reader(file);
        read_table(reader, &shown, &Columns::from_header)
    }
}

/// Stored organisms whose review state passes `states` (`None`: any state), as
/// `publisher`'s audience may see them.
pub fn read_store(
    conn: &rusqlite::Connection,
    states: Option<Vec<ReviewState>>,
    publisher: &Publisher,
) -> Result<Vec<PointRecord>, StoreError> {
    let filter = RowFilter { states, ..RowFilter::default() };
    let mut records = Vec::new();
    occurrences::for_each(conn, &filter, false, |row: OccurrenceRow| -> Result<(), StoreError> {
        records.push(stored_point(&row, publisher));
        Ok(())
    })?;
    Ok(records)
}

/// One organism as the figures need it: its published position, and for the public its
/// resolved checklist name only (a name typed that resolves to nothing is free text).
fn stored_point(row: &OccurrenceRow, publisher: &Publisher) -> PointRecord {
    let names = publisher.names();
    let resolution = row.identification.as_ref().map(|i| names.resolution(&i.taxon_name));
    let place = publisher.place(
        row.review_state,
        resolution.as_ref(),
        row.walk_client_id.as_deref(),
        row.latitude.zip(row.longitude),
        row.accuracy_m,
    );
    let position = place.position.and_then(|(lat, lon)| LatLon::new(lat, lon).ok());
    // The observer's own calendar day, from the offset the phone recorded (what a
    // generalised record is published under).
    let when = row.observed_at.get(..10).and_then(|day| DateSpan::parse(day).ok());
    let name = match publisher.audience() {
        Audience::Full => row.identification.as_ref().map(|i| i.taxon_name.clone()),
        Audience::Public => resolution.as_ref().and_then(|r| r.taxon()).map(|t| t.scientific_name.clone()),
    };
    PointRecord {
        label: format!("urn:uuid:{}", row.client_id),
        name,
        position,
        when,
        count: row.count.max(0) as u64,
        walk_client_id: row.walk_client_id.clone(),
    }
}

/// Where each wanted term sits in a row, or the constant it always has.
struct Columns {
    names: Vec<String>,
    latitude: Source,
    longitude: Source,
    name: Option<Source>,
    date: Option<Source>,
    count: Option<Source>,
    status: Option<Source>,
    id: Option<Source>,
}

#[derive(Clone)]
enum Source {
    Index(usize),
    Constant(String),
}

impl Columns {
    fn from_header(header: &csv::StringRecord, file: &str) -> Result<Self, InputError> {
        let names: Vec<String> = header.iter().map(|h| h.trim().trim_start_matches('\u{feff}').to_owned()).collect();
        let find = |term: &str| names.iter().position(|n| n == term).map(Source::Index);
        let need = |term: &str| {
            find(term).ok_or_else(|| InputError::File {
                file: file.to_owned(),
                message: format!("line 1 (the header) has no `{term}` column; the columns are: {}", names.join(", ")),
            })
        };
        let (latitude, longitude) = (need(LATITUDE)?, need(LONGITUDE)?);
        Ok(Self::located(latitude, longitude, find, names.clone()))
    }

    /// The columns of an archive table. Coordinates are required unless `events` can
    /// supply them (an occurrence extension of an Event core).
    fn from_table(table: &ArchiveTable, file: &str, events: bool) -> Result<Self, InputError> {
        let find = |term: &str| table.source_of(term).map(Source::from);
        let need = |term: &str| match find(term) {
            Some(source) => Ok(source),
            None if events => Ok(Source::Constant(String::new())),
            None => Err(InputError::File {
                file: file.to_owned(),
                message: format!("meta.xml maps no field of {} to the Darwin Core term `{term}`", table.location),
            }),
        };
        let (latitude, longitude) = (need(LATITUDE)?, need(LONGITUDE)?);
        Ok(Self::located(latitude, longitude, find, table.column_names()))
    }

    /// The columns, given where the coordinates are and how to find the optional terms.
    fn located(latitude: Source, longitude: Source, find: impl Fn(&str) -> Option<Source>, names: Vec<String>) -> Self {
        Self {
            latitude,
            longitude,
            name: find(NAME),
            date: find(DATE),
            count: find(COUNT),
            status: find(STATUS),
            id: find(OCCURRENCE_ID),
            names,
        }
    }
}

impl From<super::meta::FieldSource> for Source {
    fn from(source: super::meta::FieldSource) -> Self {
        match source {
            super::meta::FieldSource::Index(i) => Source::Index(i),
            super::meta::FieldSource::Constant(c) => Source::Constant(c),
        }
    }
}

/// One row being read, able to say where a bad cell is.
struct Cells<'a> {
    row: &'a csv::StringRecord,
    file: &'a str,
    columns: &'a Columns,
}

impl Cells<'_> {
    fn text(&self, source: &Source) -> Option<String> {
        let value = match source {
            Source::Index(i) => self.row.get(*i)?.trim().to_owned(),
            Source::Constant(c) => c.clone(),
        };
        (!value.is_empty()).then_some(value)
    }

    fn error(&self, source: &Source, message: String) -> InputError {
        let line = self.row.position().map(|p| p.line()).unwrap_or(0);
        let (column, header) = match source {
            Source::Index(i) => (i + 1, self.columns.names.get(*i).cloned().unwrap_or_default()),
            Source::Constant(_) => (0, "a default in meta.xml".to_owned()),
        };
        InputError::Cell { file: self.file.to_owned(), line, column, header, message }
    }

    fn number(&self, source: &Source) -> Result<Option<f64>, InputError> {
        self.text(source)
            .map(|t| {
                t.parse::<f64>()
                    .ok()
                    .filter(|v| v.is_finite())
                    .ok_or_else(|| self.error(source, format!("`{t}` is not a number")))
            })
            .transpose()
    }

    /// Whether the row records that nothing was found (see [`ABSENT_STATUSES`]).
    fn is_absence(&self) -> Result<bool, InputError> {
        let c = self.columns;
        let status =
            c.status.as_ref().and_then(|s| self.text(s)).map(|t| t.to_lowercase().replace([' ', '_', '-'], ""));
        if status.is_some_and(|s| ABSENT_STATUSES.contains(&s.as_str())) {
            return Ok(true);
        }
        Ok(self.count()? == 0)
    }

    fn count(&self) -> Result<u64, InputError> {
        match &self.columns.count {
            Some(source) => match self.text(source) {
                Some(t) => {
                    t.parse::<u64>().map_err(|_| self.error(source, format!("`{t}` is not a whole number of animals")))
                }
                None => Ok(1),
            },
            None => Ok(1),
        }
    }

    fn point(&self) -> Result<PointRecord, InputError> {
        let c = self.columns;
        let position = match (self.number(&c.latitude)?, self.number(&c.longitude)?) {
            (Some(lat), Some(lon)) => Some(LatLon::new(lat, lon).map_err(|err| {
                let source = if (-90.0..=90.0).contains(&lat) { &c.longitude } else { &c.latitude };
                self.error(source, err.to_string())
            })?),
            (None, None) => None,
            (Some(_), None) => return Err(self.error(&c.longitude, "a latitude is given but no longitude".into())),
            (None, Some(_)) => return Err(self.error(&c.latitude, "a longitude is given but no latitude".into())),
        };
        let when = match &c.date {
            Some(source) => {
                self.text(source).map(|t| DateSpan::parse(&t).map_err(|m| self.error(source, m))).transpose()?
            }
            None => None,
        };
        let line = self.row.position().map(|p| p.line()).unwrap_or(0);
        Ok(PointRecord {
            label: c.id.as_ref().and_then(|s| self.text(s)).unwrap_or_else(|| format!("{} line {line}", self.file)),
            name: c.name.as_ref().and_then(|s| self.text(s)),
            position,
            when,
            count: self.count()?,
            walk_client_id: None,
        })
    }
}

fn read_table<R: Read>(
    mut reader: csv::Reader<R>,
    file: &str,
    columns_of: &dyn Fn(&csv::StringRecord, &str) -> Result<Columns, InputError>,
) -> Result<Vec<PointRecord>, InputError> {
    let header = reader.headers().map_err(|err| csv_error(file, err))?.clone();
    let columns = columns_of(&header, file)?;
    read_rows(reader, file, &columns)
}

/// Where and when each event of an Event-core archive was, by its id.
type Events = HashMap<String, EventPlace>;

#[derive(Debug, Clone, Default)]
struct EventPlace {
    position: Option<LatLon>,
    when: Option<DateSpan>,
}

/// An occurrence extension's link to the Event core: its core-id column and the events.
struct EventLink<'a> {
    core_id: usize,
    events: &'a Events,
}

fn read_rows<R: Read>(reader: csv::Reader<R>, file: &str, columns: &Columns) -> Result<Vec<PointRecord>, InputError> {
    read_linked_rows(reader, file, columns, None)
}

/// Reads presences, skipping absences; with `link`, a row without a position or date
/// takes its event's.
fn read_linked_rows<R: Read>(
    mut reader: csv::Reader<R>,
    file: &str,
    columns: &Columns,
    link: Option<EventLink>,
) -> Result<Vec<PointRecord>, InputError> {
    let mut records = Vec::new();
    let mut row = csv::StringRecord::new();
    while reader.read_record(&mut row).map_err(|err| csv_error(file, err))? {
        let cells = Cells { row: &row, file, columns };
        if cells.is_absence()? {
            continue;
        }
        let mut record = cells.point()?;
        if let Some(event) = link.as_ref().and_then(|l| row.get(l.core_id).and_then(|id| l.events.get(id.trim()))) {
            record.position = record.position.or(event.position);
            record.when = record.when.or(event.when);
        }
        records.push(record);
    }
    Ok(records)
}

/// Reads the positions and dates of an Event core, by event id.
fn read_events<R: Read>(mut reader: csv::Reader<R>, file: &str, table: &ArchiveTable) -> Result<Events, InputError> {
    let id_index = table.id_index.ok_or_else(|| InputError::File {
        file: file.to_owned(),
        message: "meta.xml gives the Event core no <id index>".into(),
    })?;
    let columns = Columns::from_table(table, file, true)?;
    let mut events = Events::new();
    let mut row = csv::StringRecord::new();
    while reader.read_record(&mut row).map_err(|err| csv_error(file, err))? {
        let Some(id) = row.get(id_index).map(str::trim).filter(|id| !id.is_empty()) else { continue };
        let point = Cells { row: &row, file, columns: &columns }.point()?;
        events.insert(id.to_owned(), EventPlace { position: point.position, when: point.when });
    }
    Ok(events)
}

fn csv_error(file: &str, err: csv::Error) -> InputError {
    let line = err.position().map(|p| p.line());
    let message = match err.kind() {
        csv::ErrorKind::UnequalLengths { expected_len, len, .. } => {
            format!("this row has {len} fields but the header has {expected_len}")
        }
        csv::ErrorKind::Utf8 { .. } => "the text is not UTF-8".to_owned(),
        _ => err.to_string(),
    };
    match line {
        Some(line) => InputError::File { file: file.to_owned(), message: format!("line {line}: {message}") },
        None => InputError::File { file: file.to_owned(), message },
    }
}

fn read_archive(path: &Path, shown: &str) -> Result<Vec<PointRecord>, InputError> {
    let file = File::open(path).map_err(|source| InputError::Open { file: shown.to_owned(), source })?;
    let bad = |message: String| InputError::File { file: shown.to_owned(), message };
    let mut archive = zip::ZipArchive::new(file).map_err(|err| bad(format!("not a readable zip archive: {err}")))?;
    let mut meta = String::new();
    archive
        .by_name("meta.xml")
        .map_err(|_| bad("this zip has no meta.xml, so it is not a Darwin Core Archive".into()))?
        .read_to_string(&mut meta)
        .map_err(|err| bad(format!("meta.xml could not be read: {err}")))?;
    let tables = read_meta(&meta).map_err(|message| bad(format!("meta.xml: {message}")))?;
    let table = tables
        .iter()
        .find(|t| t.row_type.ends_with("/Occurrence"))
        .ok_or_else(|| bad("meta.xml describes no Occurrence file (rowType …/dwc/terms/Occurrence)".into()))?;
    // Sampling-event data: occurrences extend an Event core that may hold their place and date.
    let event_core = tables.iter().find(|t| t.core && t.row_type.ends_with("/Event")).filter(|_| !table.core);
    let events = match event_core {
        Some(core) => {
            Some(read_events(table_reader(&mut archive, core, shown)?, &format!("{shown}:{}", core.location), core)?)
        }
        None => None,
    };
    let inner = format!("{shown}:{}", table.location);
    let columns = Columns::from_table(table, &inner, events.is_some())?;
    let link = match (&events, table.id_index) {
        (Some(events), Some(core_id)) => Some(EventLink { core_id, events }),
        (Some(_), None) => {
            return Err(bad(format!(
                "meta.xml gives {} no <coreid index>, so its rows cannot be joined to their events",
                table.location
            )));
        }
        _ => None,
    };
    read_linked_rows(table_reader(&mut archive, table, shown)?, &inner, &columns, link)
}

/// A reader over one data file of the archive, past its header lines.
fn table_reader<'a>(
    archive: &'a mut zip::ZipArchive<File>,
    table: &ArchiveTable,
    shown: &str,
) -> Result<csv::Reader<zip::read::ZipFile<'a, File>>, InputError> {
    let inner = format!("{shown}:{}", table.location);
    let entry = archive.by_name(&table.location).map_err(|_| InputError::File {
        file: shown.to_owned(),
        message: format!("meta.xml names {} but the zip has no such file", table.location),
    })?;
    let mut builder = csv::ReaderBuilder::new();
    builder.has_headers(false).flexible(true).delimiter(table.delimiter);
    match table.quote {
        Some(q) => builder.quote(q),
        None => builder.quoting(false),
    };
    let mut reader = builder.from_reader(entry);
    let mut skip = csv::StringRecord::new();
    for _ in 0..table.header_lines {
        reader.read_record(&mut skip).map_err(|err| csv_error(&inner, err))?;
    }
    Ok(reader)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn read_csv_text(text: &str) -> Result<Vec<PointRecord>, InputError> {
        let reader = csv::ReaderBuilder::new().from_reader(text.as_bytes());
        read_table(reader, "test.csv", &Columns::from_header)
    }

    #[test]
    fn a_bad_latitude_is_named_by_line_and_column() {
        let err = read_csv_text(
            "scientificName,decimalLatitude,decimalLongitude\nRaja clavata,52.1,-4.2\nRaja clavata,95,-4.2\n",
        )
        .unwrap_err();
        assert_eq!(
            err.to_string(),
            "test.csv, line 3, column 2 (decimalLatitude): latitude must be between -90 and 90 degrees, got 95"
        );
    }

    #[test]
    fn absences_and_zero_counts_are_not_records() {
        let records = read_csv_text(
            "scientificName,decimalLatitude,decimalLongitude,occurrenceStatus,individualCount\n\
             Raja clavata,52.1,-4.2,detected,1\n\
             Raja clavata,52.2,-4.2,notDetected,0\n\
             Raja clavata,52.3,-4.2,absent,\n\
             Raja clavata,52.4,-4.2,Not Detected,\n\
             Raja clavata,52.5,-4.2,present,0\n\
             Raja clavata,52.6,-4.2,present,2\n",
        )
        .unwrap();
        // TDWG Darwin Core occurrenceStatus: `absent` (before 2025) and `notDetected` (after);
        // individualCount 0 is a non-detection too (common practice; GBIF reads it so).
        let latitudes: Vec<f64> = records.iter().map(|r| r.position.unwrap().lat()).collect();
        assert_eq!(latitudes, [52.1, 52.6]);
        assert_eq!(records[1].count, 2);
    }

    /// Writes a zip with these (name, text) files.
    fn zip_of(files: &[(&str, &str)]) -> tempfile::NamedTempFile {
        use std::io::Write as _;
        let file = tempfile::NamedTempFile::new().unwrap();
        let mut zip = zip::ZipWriter::new(file.reopen().unwrap());
        for (name, text) in files {
            zip.start_file(*name, zip::write::SimpleFileOptions::default()).unwrap();
            zip.write_all(text.as_bytes()).unwrap();
        }
        zip.finish().unwrap();
        file
    }

    #[test]
    fn occurrences_of_an_event_core_archive_take_their_events_place_and_date() {
        // TDWG Darwin Core Text Guide: an Event core, occurrences as an extension joined by coreid.
        let meta = r#"<archive xmlns="http://rs.tdwg.org/dwc/text/">
  <core rowType="http://rs.tdwg.org/dwc/terms/Event" fieldsTerminatedBy="\t" fieldsEnclosedBy="" ignoreHeaderLines="1">
    <files><location>event.txt</location></files><id index="0"/>
    <field index="0" term="http://rs.tdwg.org/dwc/terms/eventID"/>
    <field index="1" term="http://rs.tdwg.org/dwc/terms/eventDate"/>
    <field index="2" term="http://rs.tdwg.org/dwc/terms/decimalLatitude"/>
    <field index="3" term="http://rs.tdwg.org/dwc/terms/decimalLongitude"/>
  </core>
  <extension rowType="http://rs.tdwg.org/dwc/terms/Occurrence" fieldsTerminatedBy="\t" fieldsEnclosedBy="" ignoreHeaderLines="1">
    <files><location>occurrence.txt</location></files><coreid index="0"/>
    <field index="1" term="http://rs.tdwg.org/dwc/terms/occurrenceID"/>
    <field index="2" term="http://rs.tdwg.org/dwc/terms/scientificName"/>
    <field index="3" term="http://rs.tdwg.org/dwc/terms/occurrenceStatus"/>
    <field index="4" term="http://rs.tdwg.org/dwc/terms/decimalLatitude"/>
    <field index="5" term="http://rs.tdwg.org/dwc/terms/decimalLongitude"/>
  </extension>
</archive>"#;
        let events = "eventID\teventDate\tdecimalLatitude\tdecimalLongitude\n\
                      walk-1\t2024-05-02/2024-05-02\t52.48\t-4.05\n\
                      walk-2\t2024-06-10\t52.10\t-4.40\n";
        let occurrences = "coreid\toccurrenceID\tscientificName\toccurrenceStatus\tdecimalLatitude\tdecimalLongitude\n\
                           walk-1\tocc-1\tRaja clavata\tdetected\t\t\n\
                           walk-1\tocc-2\tBatoidea\tnotDetected\t\t\n\
                           walk-2\tocc-3\tRaja clavata\tdetected\t52.11\t-4.41\n";
        let zip = zip_of(&[("meta.xml", meta), ("event.txt", events), ("occurrence.txt", occurrences)]);
        let records = read_file(zip.path()).unwrap();
        assert_eq!(records.len(), 2, "the notDetected row is not a record: {records:?}");
        let first = &records[0];
        assert_eq!((first.position.unwrap().lat(), first.position.unwrap().lon()), (52.48, -4.05), "the event's place");
        assert_eq!(first.when, Some(DateSpan::parse("2024-05-02").unwrap()), "the event's date");
        assert_eq!(records[1].position.unwrap().lat(), 52.11, "its own place wins");
        assert_eq!(records[1].when, Some(DateSpan::parse("2024-06-10").unwrap()));
    }

    #[test]
    fn a_file_without_a_longitude_column_says_which_columns_it_has() {
        let err = read_csv_text("scientificName,decimalLatitude\nRaja clavata,52.1\n").unwrap_err();
        assert!(
            err.to_string().contains("no `decimalLongitude` column; the columns are: scientificName, decimalLatitude"),
            "{err}"
        );
    }
}
