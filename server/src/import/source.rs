//! Reading an import's rows, streamed: a CSV file (UTF-8 with or without a byte-order
//! mark; `,` `;` or tab, sniffed from the header line or given; quoted fields may hold
//! newlines) or a Darwin Core Archive (TDWG Darwin Core Text Guide: `meta.xml`, an
//! Occurrence core, or an Event core with Occurrence as an extension, and lengths from a
//! MeasurementOrFact extension).
//!
//! Rows are sent one by one through a bounded channel, so memory stays flat however long
//! the file. Two things are held whole: an Event core's dates and places (one per walk
//! or record) and an archive's lengths by occurrence, both a few short strings a row.
//! Anything that is not a CSV or a zip, or that is larger than the limit, is refused
//! before a row is read.

use std::collections::HashMap;
use std::fs::File;
use std::io::{BufRead, BufReader, Read};
use std::path::Path;
use std::sync::Arc;

use super::mapping::{Field, Mapping};
use crate::assess::meta::{ArchiveTable, FieldSource, read_meta};

/// The zip format's local file header signature (PKWARE APPNOTE 4.3.7).
const ZIP_MAGIC: &[u8] = b"PK\x03\x04";
/// The UTF-8 byte-order mark.
const BOM: &[u8] = b"\xEF\xBB\xBF";
/// How much of a file is looked at to tell text from other files.
const SNIFF_BYTES: usize = 64 * 1024;

/// What kind of file an import reads.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    Csv,
    Archive,
}

/// One cell, read as a field, with the column it came from (for refusals).
#[derive(Debug, Clone)]
pub struct Cell {
    pub field: Field,
    pub value: String,
    pub column: Arc<str>,
}

/// One row of the source.
#[derive(Debug, Clone)]
pub enum Row {
    Read {
        line: u64,
        cells: Vec<Cell>,
    },
    /// A row the CSV reader could not read (not UTF-8, a wrong number of fields).
    Unreadable {
        line: u64,
        reason: String,
    },
}

/// Why a source cannot be read at all.
#[derive(Debug, thiserror::Error)]
#[error("{file}: {message}")]
pub struct SourceError {
    pub file: String,
    pub message: String,
}

fn fail(file: &Path, message: impl Into<String>) -> SourceError {
    SourceError { file: file.display().to_string(), message: message.into() }
}

/// Checks the file's size and kind: a zip by its signature, else UTF-8 text.
pub fn sniff(path: &Path, max_bytes: u64) -> Result<Kind, SourceError> {
    let size = std::fs::metadata(path).map_err(|err| fail(path, err.to_string()))?.len();
    if size > max_bytes {
        return Err(fail(path, format!("{size} bytes is larger than the limit of {max_bytes} (--max-bytes)")));
    }
    let mut head = Vec::with_capacity(SNIFF_BYTES);
    File::open(path)
        .and_then(|f| f.take(SNIFF_BYTES as u64).read_to_end(&mut head))
        .map_err(|err| fail(path, err.to_string()))?;
    if head.starts_with(ZIP_MAGIC) {
        return Ok(Kind::Archive);
    }
    if head.starts_with(b"\xFF\xFE") || head.starts_with(b"\xFE\xFF") {
        return Err(fail(path, "the file is UTF-16 text; save it as UTF-8 (CSV UTF-8) and import that"));
    }
    let text = head.strip_prefix(BOM).unwrap_or(&head);
    let valid = match std::str::from_utf8(text) {
        Ok(_) => true,
        // A character cut by the sniff's end is fine; anything else is not UTF-8.
        Err(err) => err.error_len().is_none() && head.len() == SNIFF_BYTES,
    };
    if !valid || text.contains(&0) {
        return Err(fail(path, "not a CSV file (it is not UTF-8 text) nor a zip archive"));
    }
    if text.iter().all(u8::is_ascii_whitespace) {
        return Err(fail(path, "the file is empty"));
    }
    Ok(Kind::Csv)
}

/// The delimiter of a header line: whichever of `,` `;` tab occurs most outside quotes
/// (`,` on a tie).
pub fn sniff_delimiter(header_line: &str) -> u8 {
    let mut counts = [(b',', 0usize), (b';', 0), (b'\t', 0)];
    let mut quoted = false;
    for byte in header_line.bytes() {
        match byte {
            b'"' => quoted = !quoted,
            b'\r' | b'\n' if !quoted => break,
            _ if !quoted => counts.iter_mut().filter(|(d, _)| *d == byte).for_each(|(_, n)| *n += 1),
            _ => {}
        }
    }
    counts.iter().rev().max_by_key(|(_, n)| *n).filter(|(_, n)| *n > 0).map_or(b',', |(d, _)| *d)
}

/// A reader that skips a UTF-8 byte-order mark.
fn without_bom<R: Read>(read: R) -> std::io::Result<BufReader<R>> {
    let mut reader = BufReader::with_capacity(64 * 1024, read);
    if reader.fill_buf()?.starts_with(BOM) {
        reader.consume(BOM.len());
    }
    Ok(reader)
}

/// How many data rows the source has, for the progress line (one quick pass).
pub fn count_rows(path: &Path, kind: Kind, mapping: &Mapping) -> Result<u64, SourceError> {
    match kind {
        Kind::Csv => {
            let (reader, _) = csv_reader(path, mapping)?;
            Ok(reader.into_byte_records().filter(Result::is_ok).count() as u64)
        }
        Kind::Archive => {
            let mut archive = open_zip(path)?;
            let tables = archive_tables(&mut archive, path)?;
            let occurrences = occurrence_table(&tables, path)?;
            let reader = table_reader(&mut archive, occurrences, path, u64::MAX)?;
            Ok(reader.into_byte_records().filter(Result::is_ok).count().saturating_sub(occurrences.header_lines) as u64)
        }
    }
}

fn csv_reader(path: &Path, mapping: &Mapping) -> Result<(csv::Reader<BufReader<File>>, Vec<String>), SourceError> {
    let file = File::open(path).map_err(|err| fail(path, err.to_string()))?;
    let mut buffered = without_bom(file).map_err(|err| fail(path, err.to_string()))?;
    let delimiter = match mapping.delimiter {
        Some(d) => d,
        None => sniff_delimiter(&String::from_utf8_lossy(buffered.fill_buf().map_err(|e| fail(path, e.to_string()))?)),
    };
    let mut reader = csv::ReaderBuilder::new().delimiter(delimiter).flexible(true).from_reader(buffered);
    let headers = reader
        .headers()
        .map_err(|err| fail(path, format!("the header line cannot be read: {err}")))?
        .iter()
        .map(|h| h.trim().to_owned())
        .collect();
    Ok((reader, headers))
}

/// Sends every row of a CSV file to `send`, stopping early when it returns false.
pub fn read_csv(path: &Path, mapping: &Mapping, mut send: impl FnMut(Row) -> bool) -> Result<(), SourceError> {
    let (mut reader, headers) = csv_reader(path, mapping)?;
    let fields = mapping.fields_of(&headers).map_err(|message| fail(path, message))?;
    let labels: Vec<Arc<str>> = headers.iter().map(|h| Arc::from(h.as_str())).collect();
    let defaults = Vec::new();
    let mut record = csv::StringRecord::new();
    loop {
        let line = reader.position().line() + 1;
        let row = match reader.read_record(&mut record) {
            Ok(false) => return Ok(()),
            Ok(true) if record.len() != headers.len() => Row::Unreadable {
                line: record.position().map_or(line, |p| p.line()),
                reason: format!("the row has {} fields, the header has {}", record.len(), headers.len()),
            },
            Ok(true) => Row::Read {
                line: record.position().map_or(line, |p| p.line()),
                cells: cells_of(&record, &fields, &labels, &defaults),
            },
            Err(err) => match err.kind() {
                csv::ErrorKind::Utf8 { pos, .. } => Row::Unreadable {
                    line: pos.as_ref().map_or(line, |p| p.line()),
                    reason: "the row is not UTF-8 text".into(),
                },
                _ => return Err(fail(path, err.to_string())),
            },
        };
        if !send(row) {
            return Ok(());
        }
    }
}

fn cells_of(record: &csv::StringRecord, fields: &[Option<Field>], labels: &[Arc<str>], extra: &[Cell]) -> Vec<Cell> {
    let mut cells: Vec<Cell> = record
        .iter()
        .zip(fields)
        .zip(labels)
        .filter_map(|((value, field), column)| {
            field.map(|field| Cell { field, value: value.to_owned(), column: column.clone() })
        })
        .collect();
    cells.extend(extra.iter().cloned());
    cells
}

fn open_zip(path: &Path) -> Result<zip::ZipArchive<File>, SourceError> {
    let file = File::open(path).map_err(|err| fail(path, err.to_string()))?;
    zip::ZipArchive::new(file).map_err(|err| fail(path, format!("not a readable zip archive: {err}")))
}

fn archive_tables(archive: &mut zip::ZipArchive<File>, path: &Path) -> Result<Vec<ArchiveTable>, SourceError> {
    let mut meta = String::new();
    archive
        .by_name("meta.xml")
        .map_err(|_| fail(path, "this zip has no meta.xml, so it is not a Darwin Core Archive"))?
        .take(1 << 20)
        .read_to_string(&mut meta)
        .map_err(|err| fail(path, format!("meta.xml could not be read: {err}")))?;
    read_meta(&meta).map_err(|message| fail(path, format!("meta.xml: {message}")))
}

fn is_row_type(table: &ArchiveTable, class: &str) -> bool {
    table.row_type.rsplit('/').next() == Some(class)
}

fn occurrence_table<'a>(tables: &'a [ArchiveTable], path: &Path) -> Result<&'a ArchiveTable, SourceError> {
    tables.iter().find(|t| is_row_type(t, "Occurrence")).ok_or_else(|| {
        fail(path, "meta.xml describes no Occurrence file (rowType …/dwc/terms/Occurrence); nothing to import")
    })
}

fn table_reader<'a>(
    archive: &'a mut zip::ZipArchive<File>,
    table: &ArchiveTable,
    path: &Path,
    max_bytes: u64,
) -> Result<csv::Reader<BufReader<std::io::Take<zip::read::ZipFile<'a, File>>>>, SourceError> {
    let entry = archive
        .by_name(&table.location)
        .map_err(|_| fail(path, format!("meta.xml names {} but the zip has no such file", table.location)))?;
    if entry.size() > max_bytes {
        return Err(fail(path, format!("{} unpacks to more than the limit of {max_bytes} bytes", table.location)));
    }
    // A zip may claim a small size and unpack to more: read no further than the limit.
    let reader = without_bom(entry.take(max_bytes)).map_err(|err| fail(path, err.to_string()))?;
    Ok(csv::ReaderBuilder::new()
        .delimiter(table.delimiter)
        .quoting(table.quote.is_some())
        .quote(table.quote.unwrap_or(b'"'))
        .has_headers(false)
        .flexible(true)
        .from_reader(reader))
}

/// Column labels (`occurrence.txt: decimalLatitude`) and fields by column index, with the
/// id column read as `id_field` when no field of its own names it.
fn table_columns(table: &ArchiveTable, id_field: Option<Field>) -> (Vec<Option<Field>>, Vec<Arc<str>>) {
    let names = table.column_names();
    let width = names.len().max(table.id_index.map_or(0, |i| i + 1));
    let mut fields = vec![None; width];
    let mut labels: Vec<Arc<str>> =
        (0..width).map(|i| Arc::from(format!("{} column {}", table.location, i + 1))).collect();
    for (index, name) in names.iter().enumerate() {
        if let Some(field) = Field::named(name).filter(|_| !name.is_empty()) {
            fields[index] = Some(field);
            labels[index] = Arc::from(format!("{}: {name}", table.location));
        }
    }
    if let (Some(index), Some(field)) = (table.id_index, id_field)
        && !fields.contains(&Some(field))
    {
        fields[index] = Some(field);
        labels[index] = Arc::from(format!("{}: id", table.location));
    }
    (fields, labels)
}

/// `meta.xml` defaults (constant values) of a table, as cells.
fn constants(table: &ArchiveTable) -> Vec<Cell> {
    let column: Arc<str> = Arc::from(format!("meta.xml default for {}", table.location));
    table
        .fields
        .iter()
        .filter_map(|(term, source)| match source {
            FieldSource::Constant(value) => {
                Field::named(term).map(|field| Cell { field, value: value.clone(), column: column.clone() })
            }
            FieldSource::Index(_) => None,
        })
        .collect()
}

/// Cells keyed by a row id, read whole from a small table (events, lengths).
type Keyed = HashMap<String, Vec<Cell>>;

/// Reads `table` into cells of `wanted` fields keyed by the value of `key` (a field of
/// the table, or its id column). The first row for a key counts.
fn keyed_cells(
    archive: &mut zip::ZipArchive<File>,
    table: &ArchiveTable,
    path: &Path,
    max_bytes: u64,
    key: KeyColumn,
    wanted: &[(&str, Field)],
) -> Result<Keyed, SourceError> {
    let names = table.column_names();
    let key_index = match key {
        KeyColumn::Term(term) => names.iter().position(|n| n == term).or(table.id_index),
        KeyColumn::Id => table.id_index,
    }
    .ok_or_else(|| fail(path, format!("{} has no column to join it to its rows by", table.location)))?;
    let columns: Vec<(usize, Field, Arc<str>)> = wanted
        .iter()
        .filter_map(|(term, field)| {
            let index = names.iter().position(|n| n == term)?;
            Some((index, *field, Arc::from(format!("{}: {term}", table.location))))
        })
        .collect();
    let mut reader = table_reader(archive, table, path, max_bytes)?;
    let mut keyed = Keyed::new();
    for record in reader.records().skip(table.header_lines) {
        let record = record.map_err(|err| fail(path, format!("{}: {err}", table.location)))?;
        let Some(id) = record.get(key_index).filter(|id| !id.is_empty()) else { continue };
        let cells = columns
            .iter()
            .filter_map(|(index, field, column)| {
                let value = record.get(*index)?.trim();
                (!value.is_empty()).then(|| Cell { field: *field, value: value.to_owned(), column: column.clone() })
            })
            .collect();
        keyed.entry(id.to_owned()).or_insert(cells);
    }
    Ok(keyed)
}

enum KeyColumn {
    Term(&'static str),
    Id,
}

/// Sends every occurrence of an archive to `send`, with its event's date and place when
/// it has none of its own and its length from the MeasurementOrFact extension.
pub fn read_archive(path: &Path, max_bytes: u64, mut send: impl FnMut(Row) -> bool) -> Result<(), SourceError> {
    let mut archive = open_zip(path)?;
    let tables = archive_tables(&mut archive, path)?;
    let occurrences = occurrence_table(&tables, path)?.clone();
    let events = match tables.iter().find(|t| t.core && is_row_type(t, "Event")) {
        Some(core) if !occurrences.core => {
            let wanted = [
                ("eventDate", Field::EventDate),
                ("decimalLatitude", Field::DecimalLatitude),
                ("decimalLongitude", Field::DecimalLongitude),
                ("coordinateUncertaintyInMeters", Field::CoordinateUncertaintyInMeters),
            ];
            keyed_cells(&mut archive, core, path, max_bytes, KeyColumn::Id, &wanted)?
        }
        _ => Keyed::new(),
    };
    let lengths = match tables.iter().find(|t| is_row_type(t, "MeasurementOrFact")) {
        Some(table) => {
            let wanted = [
                ("measurementType", Field::LengthKind),
                ("measurementValue", Field::Length),
                ("measurementUnit", Field::LengthUnit),
                ("measurementMethod", Field::LengthMethod),
            ];
            let key = if occurrences.core { KeyColumn::Id } else { KeyColumn::Term("occurrenceID") };
            keyed_cells(&mut archive, table, path, max_bytes, key, &wanted)?
        }
        None => Keyed::new(),
    };
    let id_field = occurrences.core.then_some(Field::OccurrenceId);
    let (fields, labels) = table_columns(&occurrences, id_field);
    let fixed = constants(&occurrences);
    let occurrence_key = fields.iter().position(|f| *f == Some(Field::OccurrenceId));
    let event_key = if occurrences.core { None } else { occurrences.id_index };
    let mut reader = table_reader(&mut archive, &occurrences, path, max_bytes)?;
    let mut record = csv::StringRecord::new();
    let mut index = 0usize;
    loop {
        let read = reader.read_record(&mut record);
        let line = record.position().map_or(0, |p| p.line());
        let row = match read {
            Ok(false) => return Ok(()),
            Ok(true) if index < occurrences.header_lines => {
                index += 1;
                continue;
            }
            Ok(true) => {
                let mut cells = cells_of(&record, &fields, &labels, &fixed);
                if let Some(found) = occurrence_key.and_then(|i| record.get(i)).and_then(|id| lengths.get(id))
                    && gives_a_length(found)
                {
                    cells.extend(found.iter().cloned());
                }
                if let Some(found) = event_key.and_then(|i| record.get(i)).and_then(|id| events.get(id)) {
                    let missing = |c: &Cell| !cells.iter().any(|own| own.field == c.field && !own.value.is_empty());
                    let add: Vec<Cell> = found.iter().filter(|c| missing(c)).cloned().collect();
                    cells.extend(add);
                }
                Row::Read { line, cells }
            }
            Err(err) => match err.kind() {
                csv::ErrorKind::Utf8 { .. } => Row::Unreadable { line, reason: "the row is not UTF-8 text".into() },
                _ => return Err(fail(path, format!("{}: {err}", occurrences.location))),
            },
        };
        index += 1;
        if !send(row) {
            return Ok(());
        }
    }
}

/// A MeasurementOrFact row gives a length only when its type is one of wrackline's
/// length kinds ("total length", "disc width"…).
fn gives_a_length(row: &[Cell]) -> bool {
    row.iter().any(|c| {
        c.field == Field::LengthKind
            && shared_types::LengthKind::ALL.iter().any(|k| k.label().eq_ignore_ascii_case(c.value.trim()))
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_delimiter_is_the_commonest_outside_quotes() {
        assert_eq!(sniff_delimiter("a;b;c\n1,2;3"), b';');
        assert_eq!(sniff_delimiter("a\tb\tc"), b'\t');
        assert_eq!(sniff_delimiter("\"a;b;c\",d,e"), b',');
        assert_eq!(sniff_delimiter("single"), b',');
    }

    #[test]
    fn binary_files_and_utf16_are_refused_before_any_row() {
        let dir = tempfile::tempdir().unwrap();
        let binary = dir.path().join("photo.csv");
        std::fs::write(&binary, [0xFF, 0xD8, 0xFF, 0xE0, 0, 0x10, b'J', b'F']).unwrap();
        assert!(sniff(&binary, 1 << 20).unwrap_err().to_string().contains("not a CSV"));
        let wide = dir.path().join("wide.csv");
        std::fs::write(&wide, [0xFF, 0xFE, b'a', 0]).unwrap();
        assert!(sniff(&wide, 1 << 20).unwrap_err().to_string().contains("UTF-16"));
        let big = dir.path().join("big.csv");
        std::fs::write(&big, "eventDate\n2020-01-01\n").unwrap();
        assert!(sniff(&big, 10).unwrap_err().to_string().contains("larger than the limit of 10"));
        assert_eq!(sniff(&big, 1 << 20).unwrap(), Kind::Csv);
    }
}
