//! A Darwin Core Archive (TDWG Darwin Core Text Guide): a zip holding the occurrence
//! core, the MeasurementOrFact extension for lengths, `meta.xml` describing both, and
//! `eml.xml` with what the GBIF metadata profile requires. When there are survey walks,
//! the core is the Event table instead, with occurrences (and absences) as its extension
//! ([`super::events`]).
//!
//! Data files are tab-separated with one header line and no quoting; tabs and line
//! breaks inside values become spaces. The zip is written as a stream (no seeking), so
//! it can go straight to a file, to standard output or down an HTTP response.
//! The database is read once: lengths are held in a temporary file until the occurrence
//! file is complete.

use std::io::{Seek as _, Write};

use chrono::Utc;
use rusqlite::Connection;
use zip::write::SimpleFileOptions;

use super::events::{self, Found};
use super::terms::{DWC, EVENT_CORE, EVENT_MEASUREMENT_EXTENSION, MEASUREMENT_EXTENSION, OCCURRENCE_CORE, OCCURRENCE_EXTENSION, Table};
use super::{ExportError, ExportRequest, ExportSummary, Occurrence, each_occurrence};
use crate::assess::taxa::TaxonIndex;
use crate::export::csv::method;

/// Deflate level 1: a third of the default's time for a slightly larger archive.
const COMPRESSION_LEVEL: i64 = 1;

pub fn write<W: Write>(
    conn: &Connection,
    names: &TaxonIndex,
    request: &ExportRequest,
    out: W,
    progress: &mut dyn FnMut(),
) -> Result<ExportSummary, ExportError> {
    let walks = walks_in(conn, request)?;
    if !walks.is_empty() {
        return write_with_events(conn, names, request, &walks, out, progress);
    }
    let mut zip = zip::ZipWriter::new_stream(out);
    let options = zip_options();
    zip.start_file(OCCURRENCE_CORE.file, options)?;
    write_line(&mut zip, OCCURRENCE_CORE.terms.iter().copied())?;
    // Lengths wait in an unnamed temporary file (on disk, so memory stays flat) while the
    // occurrence file is written, then follow it into the zip: one pass over the database.
    let mut lengths = std::io::BufWriter::new(tempfile::tempfile()?);
    write_line(&mut lengths, std::iter::once("coreid").chain(MEASUREMENT_EXTENSION.terms.iter().copied()))?;
    let mut measurements = 0;
    let mut summary = each_occurrence(conn, names, request, progress, |o| {
        write_line(&mut zip, o.dwc.iter().map(String::as_str))?;
        if let Some(row) = measurement_row(o) {
            measurements += 1;
            write_line(&mut lengths, row.iter().map(String::as_str))?;
        }
        Ok(())
    })?;
    summary.measurements = measurements;
    let mut lengths = lengths.into_inner().map_err(|err| err.into_error())?;
    lengths.seek(std::io::SeekFrom::Start(0))?;
    zip.start_file(MEASUREMENT_EXTENSION.file, options)?;
    std::io::copy(&mut lengths, &mut zip)?;
    zip.start_file("meta.xml", options)?;
    zip.write_all(meta_xml(&OCCURRENCE_CORE, &[&MEASUREMENT_EXTENSION]).as_bytes())?;
    zip.start_file("eml.xml", options)?;
    zip.write_all(eml_xml(&summary, request).as_bytes())?;
    zip.finish()?.flush()?;
    Ok(summary)
}

fn zip_options() -> SimpleFileOptions {
    SimpleFileOptions::default().compression_method(zip::CompressionMethod::Deflated).compression_level(Some(COMPRESSION_LEVEL))
}

/// The walks whose start falls in the request's time filter.
fn walks_in(conn: &Connection, request: &ExportRequest) -> Result<Vec<crate::store::walks::StoredWalk>, ExportError> {
    let filter = &request.filter;
    let start = |w: &crate::store::walks::StoredWalk| w.walk.started_at.with_timezone(&Utc).format("%Y-%m-%dT%H:%M:%SZ").to_string();
    Ok(crate::store::walks::list_walks(conn)?
        .into_iter()
        .filter(|w| filter.from_utc.as_ref().is_none_or(|from| start(w) >= *from) && filter.until_utc.as_ref().is_none_or(|until| start(w) < *until))
        .collect())
}

/// The event-core archive: walk events first, then (in the one pass over the records)
/// an incidental event for each record made outside a walk; occurrences, absences and
/// lengths wait in temporary files and follow the events into the zip.
fn write_with_events<W: Write>(
    conn: &Connection,
    names: &TaxonIndex,
    request: &ExportRequest,
    walks: &[crate::store::walks::StoredWalk],
    out: W,
    progress: &mut dyn FnMut(),
) -> Result<ExportSummary, ExportError> {
    let mut zip = zip::ZipWriter::new_stream(out);
    let options = zip_options();
    zip.start_file(EVENT_CORE.file, options)?;
    write_line(&mut zip, EVENT_CORE.terms.iter().copied())?;
    let mut found: std::collections::HashMap<String, Found> = std::collections::HashMap::new();
    for walk in walks {
        write_line(&mut zip, events::walk_event(walk, request.audience).iter().map(String::as_str))?;
        found.insert(walk.walk.client_id.to_string(), Found::default());
    }
    let mut occurrences = std::io::BufWriter::new(tempfile::tempfile()?);
    write_line(&mut occurrences, std::iter::once("coreid").chain(OCCURRENCE_EXTENSION.terms.iter().copied()))?;
    let mut lengths = std::io::BufWriter::new(tempfile::tempfile()?);
    write_line(&mut lengths, std::iter::once("coreid").chain(EVENT_MEASUREMENT_EXTENSION.terms.iter().copied()))?;
    let mut measurements = 0;
    let mut summary = each_occurrence(conn, names, request, progress, |o| {
        let occurrence_id = &o.dwc[0];
        let on_walk = o.walk_client_id.as_ref().and_then(|w| found.get_mut(w).map(|f| (w, f)));
        let core_id = match on_walk {
            Some((walk, found)) => {
                found.add(o.group);
                events::walk_event_id(walk)
            }
            None => {
                write_line(&mut zip, events::incidental_event(occurrence_id, &o.event_date).iter().map(String::as_str))?;
                events::incidental_event_id(occurrence_id)
            }
        };
        write_line(&mut occurrences, std::iter::once(core_id.as_str()).chain(o.dwc.iter().map(String::as_str)))?;
        if let Some(row) = measurement_row(o) {
            measurements += 1;
            write_line(&mut lengths, std::iter::once(core_id.as_str()).chain(row.iter().map(String::as_str)))?;
        }
        Ok(())
    })?;
    for walk in walks {
        let walk_found = found.get(&walk.walk.client_id.to_string()).copied().unwrap_or_default();
        let event_id = events::walk_event_id(&walk.walk.client_id.to_string());
        for absence in events::absences(walk, walk_found) {
            summary.absences += 1;
            write_line(&mut occurrences, std::iter::once(event_id.as_str()).chain(absence.iter().map(String::as_str)))?;
        }
    }
    summary.measurements = measurements;
    summary.events = walks.len() as u64;
    for (table, file) in [(&OCCURRENCE_EXTENSION, occurrences), (&EVENT_MEASUREMENT_EXTENSION, lengths)] {
        let mut file = file.into_inner().map_err(|err| err.into_error())?;
        file.seek(std::io::SeekFrom::Start(0))?;
        zip.start_file(table.file, options)?;
        std::io::copy(&mut file, &mut zip)?;
    }
    zip.start_file("meta.xml", options)?;
    zip.write_all(meta_xml(&EVENT_CORE, &[&OCCURRENCE_EXTENSION, &EVENT_MEASUREMENT_EXTENSION]).as_bytes())?;
    zip.start_file("eml.xml", options)?;
    zip.write_all(eml_xml(&summary, request).as_bytes())?;
    zip.finish()?.flush()?;
    Ok(summary)
}

fn write_line<'a>(out: &mut impl Write, values: impl Iterator<Item = &'a str>) -> std::io::Result<()> {
    let mut line = String::new();
    for (i, value) in values.enumerate() {
        if i > 0 {
            line.push('\t');
        }
        line.extend(value.chars().map(|c| if matches!(c, '\t' | '\n' | '\r') { ' ' } else { c }));
    }
    line.push('\n');
    out.write_all(line.as_bytes())
}

fn measurement_row(o: &Occurrence) -> Option<[String; 7]> {
    let length = o.length.as_ref()?;
    let id = &o.dwc[0];
    Some([
        id.clone(),
        format!("{id}#length"),
        length.kind.label().to_owned(),
        format!("{:.1}", length.value_cm),
        "cm".to_owned(),
        method(length.method).to_owned(),
        format!("as recorded: {} {}", length.value, length.unit),
    ])
}

/// `meta.xml` for a core and its extensions. Column 0 of the core is its id and of each
/// extension the core id; the other columns follow in the table's term order, 0-based.
pub fn meta_xml(core: &Table, extensions: &[&Table]) -> String {
    let mut xml = String::from("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<archive xmlns=\"http://rs.tdwg.org/dwc/text/\" metadata=\"eml.xml\">\n");
    xml.push_str(&table_xml("core", "id", core, true));
    for extension in extensions {
        xml.push_str(&table_xml("extension", "coreid", extension, false));
    }
    xml.push_str("</archive>\n");
    xml
}

fn table_xml(element: &str, id_element: &str, table: &Table, id_is_first_term: bool) -> String {
    let mut xml = format!(
        "  <{element} encoding=\"UTF-8\" fieldsTerminatedBy=\"\\t\" linesTerminatedBy=\"\\n\" fieldsEnclosedBy=\"\" \
         ignoreHeaderLines=\"1\" rowType=\"{}\">\n    <files><location>{}</location></files>\n    <{id_element} index=\"0\"/>\n",
        table.row_type, table.file
    );
    // In the core, column 0 is both the id and the first term (occurrenceID); in an
    // extension, column 0 is only the core id and the terms start at column 1.
    let first_index = if id_is_first_term { 0 } else { 1 };
    for (i, term) in table.terms.iter().enumerate() {
        xml.push_str(&format!("    <field index=\"{}\" term=\"{DWC}{term}\"/>\n", i + first_index));
    }
    xml.push_str(&format!("  </{element}>\n"));
    xml
}

/// `eml.xml` with the GBIF metadata profile's required parts: `packageId`,
/// `scope="system"`, `system`; a dataset with title, creator, pubDate, abstract, contact.
fn eml_xml(summary: &ExportSummary, request: &ExportRequest) -> String {
    let audience = match request.audience {
        super::Audience::Public => "Public export: sensitive species are generalised as Chapman 2020 (GBIF) recommends.",
        super::Audience::Full => "Full export for assessors: positions as recorded. Do not publish it as it is.",
    };
    let mut paragraphs = vec![
        "Sharks, rays, skates and chimaeras found stranded on beaches or landed by anglers and fishers, recorded by \
         citizen observers with wrackline. One occurrence per animal; lengths are in the MeasurementOrFact extension."
            .to_owned(),
        audience.to_owned(),
        "Stranding and landing records show where people look; they are inputs to an assessment, not a listing decision."
            .to_owned(),
    ];
    paragraphs.extend(summary.notes());
    let abstract_xml: String = paragraphs.iter().map(|p| format!("      <para>{}</para>\n", escape(p))).collect();
    let organisation = "wrackline recording network";
    format!(
        "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n\
<eml:eml xmlns:eml=\"eml://ecoinformatics.org/eml-2.1.1\" xmlns:dc=\"http://purl.org/dc/terms/\" \
xmlns:xsi=\"http://www.w3.org/2001/XMLSchema-instance\" \
xsi:schemaLocation=\"eml://ecoinformatics.org/eml-2.1.1 http://rs.gbif.org/schema/eml-gbif-profile/1.2/eml.xsd\" \
packageId=\"urn:uuid:{package}\" system=\"wrackline\" scope=\"system\" xml:lang=\"en\">\n\
  <dataset>\n\
    <title>wrackline records of stranded and landed elasmobranchs</title>\n\
    <creator><organizationName>{organisation}</organizationName></creator>\n\
    <pubDate>{date}</pubDate>\n\
    <language>en</language>\n\
    <abstract>\n{abstract_xml}    </abstract>\n\
    <contact><organizationName>{organisation}</organizationName></contact>\n\
  </dataset>\n\
</eml:eml>\n",
        package = uuid::Uuid::new_v4(),
        date = Utc::now().format("%Y-%m-%d"),
    )
}

fn escape(text: &str) -> String {
    text.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}
