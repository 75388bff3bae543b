//! Samples and the carcass in exports: Darwin Core values on the occurrence
//! (`preparations`, `disposition`), one ResourceRelationship row per sample, the necropsy
//! findings as MeasurementOrFact rows, and the sample register (CSV, one row per sample)
//! a lab can import.
//!
//! Why these terms (docs/design/samples-in-exports.md): `preparations` and `disposition`
//! describe the organism's material as a whole and take lists, so they sit on the
//! occurrence; `materialSampleID` and `catalogNumber` name one sample each, and an animal
//! may have several, so each sample is a row of its own that names the occurrence.
//!
//! Protection: what a sample is and how it is kept (fixed words) and the carcass's fate
//! are shown wherever the record is. A sample's id, where it is stored and who holds it
//! are free text a researcher typed (an id may name a beach, a holder a person): the
//! public gets ids only on records published as recorded, and never the place of
//! storage, the holder or notes. Reviewers and admins ([`Audience::Full`]) get everything.

use std::io::Write;

use rusqlite::Connection;
use shared_types::{BodyCondition, CarcassFate, CarcassReport, StomachFill};

use super::cells::spreadsheet_safe;
use super::{ExportError, ExportRequest, ExportSummary, Occurrence, each_occurrence};
use crate::protect::{Audience, Publisher};
use crate::store::occurrences::SampleRow;
use crate::taxa::TaxonIndex;

/// What the words "sample of" in `relationshipOfResource` say: the sample (`resourceID`)
/// was taken from the organism of the occurrence (`relatedResourceID`).
pub const SAMPLE_OF: &str = "sample of";

/// Darwin Core `preparations`: each sample's kind and keeping, " | " between (the term's
/// recommended list separator; its examples read like "whole animal (ETOH) | tissue (EDTA)").
pub fn preparations(samples: &[SampleRow]) -> String {
    samples.iter().map(|s| format!("{} ({})", s.kind.label(), s.preservation.label())).collect::<Vec<_>>().join(" | ")
}

/// Darwin Core `disposition`: what became of the carcass (the organism's material).
pub fn disposition(carcass: Option<&CarcassReport>) -> String {
    let Some(carcass) = carcass else { return String::new() };
    match carcass.fate {
        CarcassFate::Unknown => "carcass fate unknown".to_owned(),
        fate => format!("carcass {}", fate.label()),
    }
}

/// The samples an audience may see named, with what it may read of each: reviewers all;
/// the public only on a record published as recorded (`shown`), and then only the id,
/// kind, keeping and date.
pub fn samples_for(samples: &[SampleRow], audience: Audience, shown: bool) -> Vec<SampleRow> {
    match audience {
        Audience::Full => samples.to_vec(),
        Audience::Public if !shown => Vec::new(),
        Audience::Public => samples
            .iter()
            .map(|s| SampleRow { stored_at: String::new(), held_by: String::new(), notes: None, ..s.clone() })
            .collect(),
    }
}

/// The carcass report an audience may read: where a record's free text is withheld from
/// the public, neither the injuries (free text) nor the examination's time (its date and
/// time of day would narrow the find's). The report's notes are written to no export.
pub fn carcass_for(carcass: Option<&CarcassReport>, audience: Audience, hide_free_text: bool) -> Option<CarcassReport> {
    let mut carcass = carcass?.clone();
    if audience == Audience::Public && hide_free_text {
        carcass.injuries = None;
        carcass.examined_at = None;
    }
    Some(carcass)
}

/// One ResourceRelationship row per sample, in [`super::terms::RELATIONSHIP_TERMS`] order.
pub fn relationship_rows(o: &Occurrence) -> Vec<Vec<String>> {
    let occurrence_id = &o.dwc[0];
    o.samples
        .iter()
        .map(|s| {
            vec![
                format!("{occurrence_id}#sample-{}", s.code),
                s.code.clone(),
                SAMPLE_OF.to_owned(),
                occurrence_id.clone(),
                s.added_at.get(..10).unwrap_or(&s.added_at).to_owned(),
                sample_remarks(s),
            ]
        })
        .collect()
}

/// "tissue for genetics, in ethanol; stored at …; held by …; notes" (the parts present).
fn sample_remarks(s: &SampleRow) -> String {
    let mut parts = vec![format!("{}, {}", s.kind.label(), s.preservation.label())];
    if !s.stored_at.is_empty() {
        parts.push(format!("stored at {}", s.stored_at));
    }
    if !s.held_by.is_empty() {
        parts.push(format!("held by {}", s.held_by));
    }
    parts.extend(s.notes.iter().filter(|n| !n.is_empty()).cloned());
    parts.join("; ")
}

/// The necropsy findings as MeasurementOrFact rows, in
/// [`super::terms::EVENT_MEASUREMENT_TERMS`] order (the occurrence's id first).
pub fn necropsy_rows(o: &Occurrence) -> Vec<[String; 8]> {
    let Some(carcass) = &o.carcass else { return Vec::new() };
    let id = &o.dwc[0];
    let examined = carcass.examined_at.map(|at| at.to_rfc3339()).unwrap_or_default();
    let row = |what: &str, kind: &str, value: String| {
        [
            id.clone(),
            format!("{id}#{what}"),
            kind.to_owned(),
            value,
            String::new(),
            NECROPSY_METHOD.to_owned(),
            String::new(),
            examined.clone(),
        ]
    };
    let mut rows = Vec::new();
    if let Some(condition) = carcass.body_condition {
        rows.push(row("body-condition", "body condition", body_condition_word(condition).to_owned()));
    }
    if let Some(stomach) = carcass.stomach {
        rows.push(row("stomach", "stomach fullness", stomach_word(stomach).to_owned()));
    }
    if let Some(injuries) = carcass.injuries.as_ref().filter(|i| !i.as_str().is_empty()) {
        rows.push(row("injuries", "injuries", injuries.as_str().to_owned()));
    }
    rows
}

/// `measurementMethod` of every necropsy finding.
const NECROPSY_METHOD: &str = "seen at examination of the carcass";

fn body_condition_word(condition: BodyCondition) -> &'static str {
    match condition {
        BodyCondition::Good => "good",
        BodyCondition::Fair => "fair",
        BodyCondition::Poor => "poor",
        BodyCondition::Emaciated => "emaciated",
    }
}

fn stomach_word(stomach: StomachFill) -> &'static str {
    match stomach {
        StomachFill::Empty => "empty",
        StomachFill::SomeFood => "some food",
        StomachFill::Full => "full",
        StomachFill::NotExamined => "not examined",
    }
}

/// The register's own columns for each sample, first in each row: Darwin Core term
/// names where one fits, plain names of our own for the rest. The occurrence terms
/// ([`REGISTER_OCCURRENCE_TERMS`]) follow them.
const SAMPLE_COLUMNS: &[&str] =
    &["materialSampleID", "sampleKind", "preservation", "storedAt", "heldBy", "sampleRemarks", "sampleAddedAt"];

/// The occurrence terms the register repeats on each of an organism's samples.
const REGISTER_OCCURRENCE_TERMS: &[&str] = &[
    "occurrenceID",
    "organismID",
    "scientificName",
    "taxonRank",
    "eventDate",
    "decimalLatitude",
    "decimalLongitude",
    "coordinateUncertaintyInMeters",
    "dataGeneralizations",
    "disposition",
    "identificationVerificationStatus",
];

/// The sample register: one row per sample of every organism the request takes, UTF-8
/// CSV with a header row, every value made safe for spreadsheets.
pub fn write_register<W: Write>(
    conn: &Connection,
    names: &TaxonIndex,
    request: &ExportRequest,
    out: W,
    progress: &mut dyn FnMut(),
) -> Result<ExportSummary, ExportError> {
    let mut writer = ::csv::Writer::from_writer(out);
    writer.write_record(SAMPLE_COLUMNS.iter().chain(REGISTER_OCCURRENCE_TERMS))?;
    let publisher = Publisher::load(conn, names, request.audience)?;
    let mut written = 0;
    let mut summary = each_occurrence(conn, &publisher, request, progress, |o| {
        for sample in &o.samples {
            let own = [
                sample.code.as_str(),
                sample.kind.label(),
                sample.preservation.label(),
                sample.stored_at.as_str(),
                sample.held_by.as_str(),
                sample.notes.as_deref().unwrap_or_default(),
                sample.added_at.as_str(),
            ];
            let repeated = REGISTER_OCCURRENCE_TERMS.iter().map(|term| o.term(term));
            for value in own.into_iter().chain(repeated) {
                writer.write_field(spreadsheet_safe(value).as_bytes())?;
            }
            writer.write_record(None::<&[u8]>)?;
            written += 1;
        }
        Ok(())
    })?;
    writer.flush()?;
    summary.samples = written;
    Ok(summary)
}
