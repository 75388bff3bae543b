//! A Darwin Core Archive (TDWG Darwin Core Text Guide): a zip holding the occurrence
//! core, the MeasurementOrFact extension for lengths and necropsy findings, the
//! Identification extension for each organism's identification history, the
//! ResourceRelationship extension for the samples taken from it ([`super::samples`]),
//! `meta.xml` describing them, and `eml.xml` with
//! what the GBIF metadata profile requires plus the licence and the methods. When survey
//! walks pass the filters, the core is the Event table instead, with occurrences (and
//! absences) as its extension ([`super::events`]).
//!
//! Data files are tab-separated with one header line and no quoting; tabs and line
//! breaks inside values become spaces, and values are made safe for spreadsheets
//! ([`super::cells`]). The EML `packageId` is `<dataset>/<version>`: the
//! dataset a UUID derived from this installation's identifier and the export's definition
//! (audience, review states, dates, area, taxon), so the same export always has the same
//! one; the version the first 16 hex digits of the SHA-256 of the data files' bytes, so it
//! changes exactly when the data do ([`package_id`]). The zip is written as a stream (no seeking), so
//! it can go straight to a file, to standard output or down an HTTP response.
//! The records are read once: extension rows wait in temporary files until the core
//! file is complete. What each walk found is read first, from every record made on it
//! whatever the filters, so absences and generalised walks never depend on the filters.
//! A walk passes the area filter by its published start, like a record by its published
//! position.

use std::collections::{HashMap, HashSet};
use std::fs::File;
use std::io::{BufWriter, Seek as _, Write};

use chrono::Utc;
use rusqlite::Connection;
use sha2::{Digest as _, Sha256};
use shared_types::WalkSubmission;
use zip::write::SimpleFileOptions;

use super::cells::spreadsheet_safe;
use super::events::{self, Found};
use super::terms::{
    DWC, EVENT_CORE, EVENT_IDENTIFICATION_EXTENSION, EVENT_MEASUREMENT_EXTENSION, IDENTIFICATION_EXTENSION,
    MEASUREMENT_EXTENSION, OCCURRENCE_CORE, OCCURRENCE_EXTENSION, RELATIONSHIP_EXTENSION, Table,
};
use super::{ExportError, ExportRequest, ExportSummary, Occurrence, each_occurrence};
use crate::export::csv::method;
use crate::export::samples::{necropsy_rows, relationship_rows};
use crate::protect::{Audience, Publisher};
use crate::store::occurrences::{ObserverRow, WalkFind};
use crate::taxa::TaxonIndex;

/// Deflate level 1: a third of the default's time for a slightly larger archive.
const COMPRESSION_LEVEL: i64 = 1;

type Zip<W> = zip::ZipWriter<zip::write::StreamWriter<W>>;

/// The archive being written, with a running SHA-256 of every data file's bytes (the
/// package's version); `meta.xml` and `eml.xml` are written past it.
struct Archive<W: Write> {
    zip: Zip<W>,
    digest: Sha256,
}

impl<W: Write> Archive<W> {
    fn new(out: W) -> Self {
        Self { zip: zip::ZipWriter::new_stream(out), digest: Sha256::new() }
    }

    fn start_file(&mut self, name: &str) -> Result<(), ExportError> {
        self.digest.update(name.as_bytes());
        self.zip.start_file(name, zip_options())?;
        Ok(())
    }
}

impl<W: Write> Write for Archive<W> {
    fn write(&mut self, buf: &[u8]) -> std::io::Result<usize> {
        let written = self.zip.write(buf)?;
        self.digest.update(&buf[..written]);
        Ok(written)
    }

    fn flush(&mut self) -> std::io::Result<()> {
        self.zip.flush()
    }
}

pub fn write<W: Write>(
    conn: &Connection,
    names: &TaxonIndex,
    request: &ExportRequest,
    out: W,
    progress: &mut dyn FnMut(),
) -> Result<ExportSummary, ExportError> {
    // One pass over what was found on walks: for absences, and for how far the public
    // form generalises each walk's finds.
    let mut found: HashMap<String, Found> = HashMap::new();
    let publisher = Publisher::load_noting(conn, names, request.audience, &mut |find: &WalkFind| {
        let named = find.taxon_name.as_deref().and_then(|n| names.named(n));
        found.entry(find.walk_client_id.clone()).or_default().add(named, names.checklist());
    })?;
    let walks = walks_in(conn, request, &publisher, &found)?;
    if !walks.is_empty() {
        return write_with_events(conn, &publisher, request, &walks, out, progress);
    }
    let mut zip = Archive::new(out);
    zip.start_file(OCCURRENCE_CORE.file)?;
    write_line(&mut zip, OCCURRENCE_CORE.terms.iter().copied())?;
    let mut lengths = Spool::new(&MEASUREMENT_EXTENSION)?;
    let mut identifications = Spool::new(&IDENTIFICATION_EXTENSION)?;
    let mut samples = Spool::new(&RELATIONSHIP_EXTENSION)?;
    let mut summary = each_occurrence(conn, &publisher, request, progress, |o| {
        write_line(&mut zip, o.dwc.iter().map(String::as_str))?;
        let id = o.dwc[0].as_str();
        for row in measurement_rows(o) {
            lengths.line(row.iter().map(String::as_str))?;
        }
        for row in &o.identifications {
            identifications.line(std::iter::once(id).chain(row.iter().map(String::as_str)))?;
        }
        for row in relationship_rows(o) {
            samples.line(std::iter::once(id).chain(row.iter().map(String::as_str)))?;
        }
        Ok(())
    })?;
    summary.measurements = lengths.rows;
    summary.identifications = identifications.rows;
    summary.samples = samples.rows;
    for spool in [lengths, identifications, samples] {
        spool.copy_into(&mut zip)?;
    }
    let meta =
        meta_xml(&OCCURRENCE_CORE, &[&MEASUREMENT_EXTENSION, &IDENTIFICATION_EXTENSION, &RELATIONSHIP_EXTENSION]);
    finish(conn, zip, &meta, &summary, request)
}

fn zip_options() -> SimpleFileOptions {
    SimpleFileOptions::default()
        .compression_method(zip::CompressionMethod::Deflated)
        .compression_level(Some(COMPRESSION_LEVEL))
}

/// `meta.xml` and `eml.xml`, then the zip's directory.
fn finish<W: Write>(
    conn: &Connection,
    archive: Archive<W>,
    meta: &str,
    summary: &ExportSummary,
    request: &ExportRequest,
) -> Result<ExportSummary, ExportError> {
    let Archive { mut zip, digest } = archive;
    let package = package_id(&crate::store::deployment::id(conn)?, request, digest);
    zip.start_file("meta.xml", zip_options())?;
    zip.write_all(meta.as_bytes())?;
    zip.start_file("eml.xml", zip_options())?;
    zip.write_all(eml_xml(summary, request, &package).as_bytes())?;
    zip.finish()?.flush()?;
    Ok(ExportSummary { package_id: Some(package), ..summary.clone() })
}

/// The EML packageId: `<dataset UUID>/<version>` (see the module notes).
pub fn package_id(deployment: &str, request: &ExportRequest, data: Sha256) -> String {
    let version: String = data.finalize().iter().take(8).map(|b| format!("{b:02x}")).collect();
    format!("{}/{version}", dataset_uuid(deployment, request))
}

/// A UUID (version 8: made from our own bytes) of the SHA-256 of the installation's
/// identifier and the export's definition: the same for the same export, every time.
pub fn dataset_uuid(deployment: &str, request: &ExportRequest) -> uuid::Uuid {
    let states: Vec<&str> = request.states.as_ref().map_or(vec!["any"], |s| {
        let mut codes: Vec<&str> = s.iter().map(|state| state.code()).collect();
        codes.sort_unstable();
        codes
    });
    let definition = format!(
        "wrackline dataset\ndeployment {deployment}\naudience {:?}\nstates {}\nfrom {}\nuntil {}\nbbox {}\ntaxon {}\n",
        request.audience,
        states.join(","),
        request.days.from.map_or("-".to_owned(), |d| d.to_string()),
        request.days.to.map_or("-".to_owned(), |d| d.to_string()),
        request.bbox.map_or("-".to_owned(), |b| format!("{},{},{},{}", b.south, b.west, b.north, b.east)),
        request.taxon.as_ref().map_or("-", |t| t.name.as_str()),
    );
    let hash = Sha256::digest(definition.as_bytes());
    let mut bytes = [0u8; 16];
    bytes.copy_from_slice(&hash[..16]);
    uuid::Builder::from_custom_bytes(bytes).into_uuid()
}

/// Rows of one extension waiting in an unnamed temporary file (on disk, so memory stays
/// flat) while the core file is written, then copied into the zip after it.
struct Spool {
    table: &'static Table,
    file: BufWriter<File>,
    rows: u64,
}

impl Spool {
    fn new(table: &'static Table) -> Result<Self, ExportError> {
        let mut file = BufWriter::new(tempfile::tempfile()?);
        write_line(&mut file, std::iter::once("coreid").chain(table.terms.iter().copied()))?;
        Ok(Self { table, file, rows: 0 })
    }

    fn line<'a>(&mut self, values: impl Iterator<Item = &'a str>) -> std::io::Result<()> {
        self.rows += 1;
        write_line(&mut self.file, values)
    }

    fn copy_into<W: Write>(self, zip: &mut Archive<W>) -> Result<(), ExportError> {
        let mut file = self.file.into_inner().map_err(|err| err.into_error())?;
        file.seek(std::io::SeekFrom::Start(0))?;
        zip.start_file(self.table.file)?;
        std::io::copy(&mut file, zip)?;
        Ok(())
    }
}

/// A walk in the archive: its event row and its absences, made as it was read.
struct ExportedWalk {
    client_id: String,
    event: Vec<String>,
    absences: Vec<Vec<String>>,
}

/// Whether a walk passes the request's date filter (by its start's UTC day) and area
/// filter (its published start inside: for the public the rounded start, for a full
/// export any fix of its track; a walk with no track has no place and falls outside).
fn walk_passes(walk: &WalkSubmission, request: &ExportRequest, published_start: Option<(f64, f64)>) -> bool {
    let day = walk.started_at.with_timezone(&Utc).date_naive();
    let inside = |area: &super::filters::Area| match request.audience {
        Audience::Public => published_start.is_some_and(|(lat, lon)| area.contains(lat, lon)),
        Audience::Full => walk.track.iter().any(|p| area.contains(p.latitude.get(), p.longitude.get())),
    };
    request.days.touch(day, day) && request.bbox.as_ref().is_none_or(inside)
}

/// The walks that pass the request's filters, earliest first, with their event rows and absences.
fn walks_in(
    conn: &Connection,
    request: &ExportRequest,
    publisher: &Publisher,
    found: &HashMap<String, Found>,
) -> Result<Vec<ExportedWalk>, ExportError> {
    let mut walks = Vec::new();
    crate::store::walks::for_each_walk(conn, |walk, observer: ObserverRow| {
        let client_id = walk.client_id.to_string();
        let sensitivity = publisher.walk_sensitivity(&client_id);
        let event = events::walk_event(&walk, request.audience, sensitivity);
        if walk_passes(&walk, request, event.start) {
            let walk_found = found.get(&client_id).copied().unwrap_or_default();
            walks.push(ExportedWalk {
                event: event.row,
                absences: events::absences(&walk, walk_found, &observer, request.audience),
                client_id,
            });
        }
    })?;
    Ok(walks)
}

/// The event-core archive: walk events first, then (in the one pass over the records)
/// an incidental event for each record made outside an exported walk; occurrences,
/// absences, lengths and identifications wait in temporary files and follow the events.
fn write_with_events<W: Write>(
    conn: &Connection,
    publisher: &Publisher,
    request: &ExportRequest,
    walks: &[ExportedWalk],
    out: W,
    progress: &mut dyn FnMut(),
) -> Result<ExportSummary, ExportError> {
    let mut zip = Archive::new(out);
    zip.start_file(EVENT_CORE.file)?;
    write_line(&mut zip, EVENT_CORE.terms.iter().copied())?;
    for walk in walks {
        write_line(&mut zip, walk.event.iter().map(String::as_str))?;
    }
    let exported: HashSet<&str> = walks.iter().map(|w| w.client_id.as_str()).collect();
    let mut occurrences = Spool::new(&OCCURRENCE_EXTENSION)?;
    let mut lengths = Spool::new(&EVENT_MEASUREMENT_EXTENSION)?;
    let mut identifications = Spool::new(&EVENT_IDENTIFICATION_EXTENSION)?;
    let mut samples = Spool::new(&RELATIONSHIP_EXTENSION)?;
    let mut summary = each_occurrence(conn, publisher, request, progress, |o| {
        let occurrence_id = o.dwc[0].as_str();
        let core_id = match o.walk_client_id.as_deref().filter(|w| exported.contains(w)) {
            Some(walk) => events::walk_event_id(walk),
            None => {
                write_line(
                    &mut zip,
                    events::incidental_event(occurrence_id, &o.event_date).iter().map(String::as_str),
                )?;
                events::incidental_event_id(occurrence_id)
            }
        };
        let core_id = core_id.as_str();
        occurrences.line(std::iter::once(core_id).chain(o.dwc.iter().map(String::as_str)))?;
        for row in measurement_rows(o) {
            lengths.line(std::iter::once(core_id).chain(row.iter().map(String::as_str)))?;
        }
        for row in &o.identifications {
            identifications.line([core_id, occurrence_id].into_iter().chain(row.iter().map(String::as_str)))?;
        }
        for row in relationship_rows(o) {
            samples.line(std::iter::once(core_id).chain(row.iter().map(String::as_str)))?;
        }
        Ok(())
    })?;
    for walk in walks {
        let event_id = events::walk_event_id(&walk.client_id);
        for absence in &walk.absences {
            summary.absences += 1;
            occurrences.line(std::iter::once(event_id.as_str()).chain(absence.iter().map(String::as_str)))?;
        }
    }
    summary.measurements = lengths.rows;
    summary.identifications = identifications.rows;
    summary.samples = samples.rows;
    summary.events = walks.len() as u64;
    for spool in [occurrences, lengths, identifications, samples] {
        spool.copy_into(&mut zip)?;
    }
    let meta = meta_xml(
        &EVENT_CORE,
        &[
            &OCCURRENCE_EXTENSION,
            &EVENT_MEASUREMENT_EXTENSION,
            &EVENT_IDENTIFICATION_EXTENSION,
            &RELATIONSHIP_EXTENSION,
        ],
    );
    finish(conn, zip, &meta, &summary, request)
}

fn write_line<'a>(out: &mut impl Write, values: impl Iterator<Item = &'a str>) -> std::io::Result<()> {
    let mut line = String::with_capacity(512);
    for (i, value) in values.enumerate() {
        if i > 0 {
            line.push('\t');
        }
        // Most values hold no tab or line break: copy them whole (char by char was a tenth
        // of an archive's CPU time).
        let value = spreadsheet_safe(value);
        if value.bytes().any(|b| matches!(b, b'\t' | b'\n' | b'\r')) {
            line.extend(value.chars().map(|c| if matches!(c, '\t' | '\n' | '\r') { ' ' } else { c }));
        } else {
            line.push_str(&value);
        }
    }
    line.push('\n');
    out.write_all(line.as_bytes())
}

/// The length, then the necropsy findings, as MeasurementOrFact rows (the occurrence's id first).
fn measurement_rows(o: &Occurrence) -> Vec<[String; 8]> {
    let id = &o.dwc[0];
    let length = o.length.as_ref().map(|length| {
        [
            id.clone(),
            format!("{id}#length"),
            length.kind.label().to_owned(),
            format!("{:.1}", length.value_cm),
            "cm".to_owned(),
            method(length.method).to_owned(),
            format!("as recorded: {} {}", length.value, length.unit),
            String::new(),
        ]
    });
    length.into_iter().chain(necropsy_rows(o)).collect()
}

/// `meta.xml` for a core and its extensions. Column 0 of the core is its id and of each
/// extension the core id; the other columns follow in the table's term order, 0-based.
pub fn meta_xml(core: &Table, extensions: &[&Table]) -> String {
    let mut xml = String::from(
        "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<archive xmlns=\"http://rs.tdwg.org/dwc/text/\" metadata=\"eml.xml\">\n",
    );
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
/// `scope="system"`, `system`; a dataset with title, creator, pubDate, abstract, contact;
/// and, in the profile's order, `intellectualRights` (the licence, as GBIF's tools write
/// it: a sentence with a `ulink` to the legal code) and `methods` (how records are made,
/// checked and generalised, and the occurrenceStatus vocabulary).
fn eml_xml(summary: &ExportSummary, request: &ExportRequest, package: &str) -> String {
    let states = crate::assess::describe_states(&request.states);
    let audience = match request.audience {
        Audience::Public => format!(
            "Public export of {states}. Public exports hold confirmed records unless another review state is asked \
             for. A record is published where it was recorded only when a reviewer has confirmed it and its \
             identification is a checklist taxon that is not sensitive; everything else is generalised as Chapman \
             2020 (GBIF) recommends (see the methods). Observers are named only with their consent."
        ),
        Audience::Full => {
            format!(
                "Full export of {states} for assessors: positions and names as recorded. Do not publish it as it is."
            )
        }
    };
    let mut paragraphs = vec![
        "Sharks, rays, skates and chimaeras found stranded on beaches or landed by anglers and fishers, recorded by \
         citizen observers with wrackline. One occurrence per animal; lengths and necropsy findings are in the \
         MeasurementOrFact extension, every identification (current and superseded) in the Identification extension, \
         each sample taken in the ResourceRelationship extension (the sample's id \"sample of\" the occurrence)."
            .to_owned(),
        audience,
        "Stranding and landing records show where people look; they are inputs to an assessment, not a listing decision."
            .to_owned(),
    ];
    paragraphs.extend(summary.notes());
    let abstract_xml: String = paragraphs.iter().map(|p| format!("      <para>{}</para>\n", escape(p))).collect();
    let methods: String = METHOD_STEPS
        .iter()
        .map(|step| {
            format!("      <methodStep><description><para>{}</para></description></methodStep>\n", escape(step))
        })
        .collect();
    let licence = request.licence;
    let dataset = &request.dataset;
    let organisation = escape(dataset.publisher());
    format!(
        "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n\
<eml:eml xmlns:eml=\"eml://ecoinformatics.org/eml-2.1.1\" xmlns:dc=\"http://purl.org/dc/terms/\" \
xmlns:xsi=\"http://www.w3.org/2001/XMLSchema-instance\" \
xsi:schemaLocation=\"eml://ecoinformatics.org/eml-2.1.1 http://rs.gbif.org/schema/eml-gbif-profile/1.2/eml.xsd\" \
packageId=\"{package}\" system=\"wrackline\" scope=\"system\" xml:lang=\"en\">\n\
  <dataset>\n\
    <alternateIdentifier>urn:uuid:{dataset}</alternateIdentifier>\n\
    <title>{title}</title>\n\
    <creator><organizationName>{organisation}</organizationName></creator>\n\
    <pubDate>{date}</pubDate>\n\
    <language>en</language>\n\
    <abstract>\n{abstract_xml}    </abstract>\n\
    <intellectualRights>\n      <para>{rights}</para>\n    </intellectualRights>\n\
{coverage}\
    <contact>{contact}</contact>\n\
    <publisher><organizationName>{organisation}</organizationName></publisher>\n\
    <methods>\n{methods}    </methods>\n\
  </dataset>\n\
</eml:eml>\n",
        package = escape(package),
        dataset = package.split('/').next().unwrap_or_default(),
        date = Utc::now().format("%Y-%m-%d"),
        title = escape(dataset.title()),
        rights = licence_sentence(licence, dataset.publisher()),
        coverage = coverage_xml(dataset),
        contact = contact_xml(dataset),
    )
}

/// The archive's licence in a sentence of our own, linking the legal code (as the GBIF
/// metadata profile expects: a `ulink` in `intellectualRights`).
fn licence_sentence(licence: crate::settings::Licence, publisher: &str) -> String {
    let link = format!("<ulink url=\"{}\"><citetitle>{}</citetitle></ulink>", licence.url(), escape(licence.title()));
    let publisher = escape(publisher);
    match licence {
        crate::settings::Licence::Cc0 => format!(
            "{publisher} has placed these records in the public domain ({link}): anyone may copy, change and use them \
             for any purpose without asking."
        ),
        crate::settings::Licence::CcBy => format!(
            "{publisher} shares these records under the Creative Commons licence {link}: anyone may copy, change and use them for any purpose, \
             provided they credit {publisher} and the observers as the dataset's citation says."
        ),
        crate::settings::Licence::CcByNc => format!(
            "{publisher} shares these records under the Creative Commons licence {link}: anyone may copy, change and use them, except for \
             commercial purposes, provided they credit {publisher} and the observers as the dataset's citation says."
        ),
    }
}

/// The contact: the person named, or else the publisher, with the email address when set.
fn contact_xml(dataset: &crate::settings::Dataset) -> String {
    let mut xml = match &dataset.contact_name {
        Some(name) => format!("<individualName><surName>{}</surName></individualName>", escape(name)),
        None => String::new(),
    };
    xml.push_str(&format!("<organizationName>{}</organizationName>", escape(dataset.publisher())));
    if let Some(email) = &dataset.contact_email {
        xml.push_str(&format!("<electronicMailAddress>{}</electronicMailAddress>", escape(email)));
    }
    xml
}

/// `coverage` with the area the records come from, when its bounds are set (EML needs
/// both a description and bounding coordinates in a geographic coverage).
fn coverage_xml(dataset: &crate::settings::Dataset) -> String {
    let Some(bounds) = dataset.bounds else { return String::new() };
    let description = dataset.coverage.as_deref().unwrap_or("The area the recording network covers.");
    format!(
        "    <coverage><geographicCoverage><geographicDescription>{}</geographicDescription><boundingCoordinates>\
<westBoundingCoordinate>{}</westBoundingCoordinate><eastBoundingCoordinate>{}</eastBoundingCoordinate>\
<northBoundingCoordinate>{}</northBoundingCoordinate><southBoundingCoordinate>{}</southBoundingCoordinate>\
</boundingCoordinates></geographicCoverage></coverage>\n",
        escape(description),
        bounds.west,
        bounds.east,
        bounds.north,
        bounds.south
    )
}

/// The `methods` of every archive, one step each.
const METHOD_STEPS: &[&str] = &[
    "Observers record each find on a phone with photos, the device's position and its accuracy, the time with its \
     UTC offset, a length with its kind and whether it was measured or estimated, sex, life stage, condition and \
     signs of fishing; a guided key helps them name it, at species or a higher rank.",
    "Reviewers confirm or correct each identification from the photos (every identification is kept, see the \
     Identification extension), ask observers for detail, and merge reports of the same animal: one occurrence per \
     animal, its other reports in associatedOccurrences, its position the most precise of its reports.",
    "Survey walks are events with their effort (sampleSizeValue in kilometres). On a walk whose observer reported every \
     find, each target group (sharks; rays and skates) with no find is an occurrence with occurrenceStatus \
     notDetected and individualCount 0. Finds are occurrenceStatus detected. These are the values Darwin Core \
     recommends since the 2025-2026 revision of occurrenceStatus (detected / notDetected replacing present / \
     absent); readers that know only the older values should treat notDetected as absent, which individualCount 0 \
     also says.",
    "Public exports generalise sensitive species as Chapman 2020 (GBIF) recommends (withheld, or rounded to 0.1, \
     0.01 or 0.001 degree with the uncertainty raised by the cell's diagonal), including the start and locality of \
     a survey walk on which one was found and every other find of that walk; a taxon above species is treated as \
     its most sensitive species.",
    "Public exports fail closed: a record not yet confirmed by a reviewer, or whose name does not resolve to a \
     checklist taxon, may be of any species, so it is generalised as the strictest species on the checklist would \
     be and never finer than 0.1 degree. A generalised record carries no photos, no free text and no observer, and \
     its date only to the day. Area and date filters are applied to what is published.",
    "Observers are named in recordedBy only when they agreed on their phone to be named in open data; otherwise a \
     stable pseudonymous label (observer-followed by 12 hex digits of a random id) stands in. Reviewers' \
     identifications are credited to \"wrackline reviewer\". Values that a spreadsheet would read as a formula \
     start with an apostrophe.",
    "Samples taken from a carcass: preparations lists each sample's kind and keeping, disposition the carcass's \
     fate; the necropsy findings (body condition, stomach fullness, injuries) are MeasurementOrFact rows, and each \
     sample is a ResourceRelationship row (its id as resourceID, \"sample of\" the occurrence). Public exports name \
     sample ids only on records published as recorded (an id is free text and may name a place) and never say \
     where a sample is stored or who holds it; the network's reviewers keep the sample register with both.",
];

fn escape(text: &str) -> String {
    text.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}
