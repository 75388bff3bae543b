//! One stored organism turned into the values an export writes: names resolved on the
//! checklist at any rank, the place as [`crate::protect`] publishes it for the audience,
//! the filters on published places and days, observers named as they agreed
//! ([`super::credit`]), links made absolute, the organism's identification history, and
//! its samples and carcass report as far as the audience may read them ([`super::samples`]).
//!
//! A record generalised for the public carries no free text (remarks, names as typed,
//! photos), no observer label, and its date only to the day: an observer's exact
//! records made shortly before and after would otherwise show where it was.

use std::collections::BTreeMap;

use chrono::NaiveDate;

use super::credit;
use super::samples::{self, carcass_for, samples_for};
use super::terms::OCCURRENCE_TERMS;
use super::{ExportRequest, Format};
use crate::protect::generalise::PublicPlace;
use crate::protect::{Audience, Publisher};
use crate::store::occurrences::{IdentificationRow, LengthRow, OccurrenceRow, SampleRow};
use crate::taxa::{Resolution, rank_word};
use shared_types::CarcassReport;

/// An organism ready to write, Darwin Core values in [`super::terms::OCCURRENCE_TERMS`] order.
#[derive(Debug, Clone)]
pub struct Occurrence {
    pub dwc: Vec<String>,
    pub place: PublicPlace,
    pub length: Option<LengthRow>,
    /// Columns of our own for the CSV: condition, setting, human signs, review state.
    pub condition: &'static str,
    pub setting: &'static str,
    pub human_signs: String,
    pub review_state: &'static str,
    /// The survey walk the record was made on, if any (its client id).
    pub walk_client_id: Option<String>,
    /// Darwin Core `eventDate`, as in `dwc`.
    pub event_date: String,
    /// One row per identification, current and superseded, in
    /// [`super::terms::IDENTIFICATION_TERMS`] order.
    pub identifications: Vec<Vec<String>>,
    /// The samples this audience may see named ([`samples::samples_for`]).
    pub samples: Vec<SampleRow>,
    /// The carcass report, with what this audience may read of it ([`samples::carcass_for`]).
    pub carcass: Option<CarcassReport>,
}

impl Occurrence {
    /// The value of the Darwin Core occurrence term `name` (empty for a term not written).
    pub fn term(&self, name: &str) -> &str {
        OCCURRENCE_TERMS.iter().position(|t| *t == name).and_then(|i| self.dwc.get(i)).map_or("", String::as_str)
    }
}

/// What an export did, for the command line and the archive's metadata.
#[derive(Debug, Clone, Default)]
pub struct ExportSummary {
    pub records: u64,
    pub generalised: u64,
    pub withheld: u64,
    /// Lengths and necropsy findings written to the archive's MeasurementOrFact extension (archives only).
    pub measurements: u64,
    /// Rows of the archive's Identification extension (archives only).
    pub identifications: u64,
    /// Identifications that do not resolve to a checklist taxon, with their counts (full
    /// exports only, at most [`MAX_NAMES_SHOWN`] names; the rest, and all of a public
    /// export's, are counted in `other_unmatched`: typed names are free text).
    pub unmatched: BTreeMap<String, u64>,
    pub other_unmatched: u64,
    /// Samples named: rows of the archive's ResourceRelationship extension, or of the register.
    pub samples: u64,
    /// Samples of records whose free text is withheld from the public: counted in
    /// `preparations`, their ids not given (public exports only).
    pub samples_unnamed: u64,
    /// Survey walks written as events (archives with walks only).
    pub events: u64,
    /// Absences written for target groups not found on all-finds walks.
    pub absences: u64,
    /// The archive's EML `packageId` (archives only).
    pub package_id: Option<String>,
}

/// How many distinct unmatched names a summary keeps, so memory stays flat.
pub const MAX_NAMES_SHOWN: usize = 50;

impl ExportSummary {
    /// Lines for people: what was generalised, and which names were not matched.
    pub fn notes(&self) -> Vec<String> {
        let mut notes = vec![format!(
            "{} records; {} with generalised coordinates and {} with the location withheld (Chapman 2020, GBIF).",
            self.records, self.generalised, self.withheld
        )];
        if self.measurements > 0 {
            notes.push(format!(
                "{} lengths and necropsy findings, in the MeasurementOrFact extension.",
                self.measurements
            ));
        }
        if self.identifications > 0 {
            notes.push(format!(
                "{} identifications, current and superseded, in the Identification extension.",
                self.identifications
            ));
        }
        if self.samples > 0 || self.samples_unnamed > 0 {
            notes.push(format!(
                "{} samples named (ids with \"sample of\" the occurrence); {} more, on records generalised or withheld \
                 for the public, only described in preparations.",
                self.samples, self.samples_unnamed
            ));
        }
        if self.events > 0 {
            notes.push(format!(
                "{} survey walks as events (effort in sampleSizeValue, kilometres), with {} absences (occurrenceStatus notDetected, individualCount 0) for groups not found on walks where every find was reported.",
                self.events, self.absences
            ));
        }
        let unmatched: u64 = self.unmatched.values().sum::<u64>() + self.other_unmatched;
        if unmatched > 0 {
            let mut names: Vec<String> = self.unmatched.iter().map(|(n, c)| format!("{n} ({c})")).collect();
            if !names.is_empty() && self.other_unmatched > 0 {
                names.push(format!("{} more", self.other_unmatched));
            }
            let listed = if names.is_empty() { String::new() } else { format!(": {}", names.join(", ")) };
            notes.push(format!(
                "{unmatched} records have a name not resolved to a checklist taxon; public exports generalise them as \
                 the strictest species on the checklist would be{listed}."
            ));
        }
        notes
    }

    fn note_unmatched(&mut self, name: &str) {
        if let Some(count) = self.unmatched.get_mut(name) {
            *count += 1;
        } else if self.unmatched.len() < MAX_NAMES_SHOWN {
            self.unmatched.insert(name.to_owned(), 1);
        } else {
            self.other_unmatched += 1;
        }
    }
}

/// Builds occurrences from rows, keeping the summary as it goes.
pub struct Builder<'a> {
    pub publisher: &'a Publisher<'a>,
    pub request: &'a ExportRequest,
    pub summary: ExportSummary,
}

/// A stored identification in Darwin Core terms.
struct Named {
    /// `scientificName` and `taxonRank`: the checklist's when the name resolves; for a
    /// name that does not, as stored when a rank was stored with it (the key or a
    /// reviewer) and only where free text may be shown; else empty.
    scientific_name: String,
    rank: String,
    resolved: bool,
}

impl Builder<'_> {
    fn audience(&self) -> Audience {
        self.publisher.audience()
    }

    /// The occurrence for `row`, or `None` when a filter leaves it out. Every filter is
    /// tested on what is published: the resolved taxon, the published place and days.
    pub fn build(&mut self, row: &OccurrenceRow) -> Option<Occurrence> {
        let names = self.publisher.names();
        let resolution = row.identification.as_ref().map(|i| names.resolution(&i.taxon_name));
        let taxon = resolution.as_ref().and_then(Resolution::taxon);
        if let Some(filter) = &self.request.taxon
            && !taxon.is_some_and(|t| filter.contains_named(t, names.checklist()))
        {
            return None;
        }
        let position = row.latitude.zip(row.longitude);
        let place = self.publisher.place(
            row.review_state,
            resolution.as_ref(),
            row.walk_client_id.as_deref(),
            position,
            row.accuracy_m,
        );
        let (first, last) = published_days(row, place.hide_media_and_remarks)?;
        if !self.request.days.touch(first, last) {
            return None;
        }
        if let Some(area) = self.request.bbox
            && !place.position.is_some_and(|(lat, lon)| area.contains(lat, lon))
        {
            return None;
        }
        self.count(row.identification.as_ref(), taxon.is_some(), &place);
        let occurrence = self.occurrence(row, resolution.as_ref(), place);
        if matches!(self.request.format, Format::Dwca | Format::Samples) {
            self.summary.samples_unnamed += (row.samples.len() - occurrence.samples.len()) as u64;
        }
        Some(occurrence)
    }

    fn count(&mut self, identification: Option<&IdentificationRow>, resolved: bool, place: &PublicPlace) {
        self.summary.records += 1;
        if place.generalizations.is_some() {
            if place.position.is_some() { self.summary.generalised += 1 } else { self.summary.withheld += 1 }
        }
        match (identification, resolved, self.audience()) {
            (Some(i), false, Audience::Full) => self.summary.note_unmatched(&i.taxon_name),
            (Some(_), false, Audience::Public) => self.summary.other_unmatched += 1,
            _ => {}
        }
    }

    fn occurrence(&self, row: &OccurrenceRow, resolution: Option<&Resolution>, place: PublicPlace) -> Occurrence {
        let audience = self.audience();
        let identification = row.identification.as_ref();
        let hide = place.hide_media_and_remarks;
        let text = |v: Option<&str>| if hide { String::new() } else { v.unwrap_or_default().to_owned() };
        let base_url = &self.request.base_url;
        let media: Vec<String> = row.photo_hashes.iter().map(|h| format!("{base_url}/photos/{h}")).collect();
        let (lat, lon) = match place.position {
            Some((lat, lon)) => (format!("{lat:.*}", place.decimals), format!("{lon:.*}", place.decimals)),
            None => (String::new(), String::new()),
        };
        let named = identification.zip(resolution).map(|(i, r)| named(i, r, hide));
        let resolved = named.as_ref().is_some_and(|n| n.resolved);
        let (scientific_name, rank) = named.map(|n| (n.scientific_name, n.rank)).unwrap_or_default();
        let date = event_date(row, hide);
        let dwc = vec![
            format!("urn:uuid:{}", row.client_id),
            "HumanObservation".into(),
            date.clone(),
            lat,
            lon,
            if place.position.is_some() { "EPSG:4326".into() } else { String::new() },
            place.uncertainty_m.map(|u| format!("{:.0}", u.ceil())).unwrap_or_default(),
            "Animalia".into(),
            scientific_name,
            rank,
            text(row.species_guess.as_deref().or(identification.map(|i| i.taxon_name.as_str()))),
            identification.map(|i| self.identified_by(i, hide)).unwrap_or_default(),
            identification.map(|i| date_identified(i, hide)).unwrap_or_default(),
            identification.map(|i| identification_remarks(i, resolved, hide, audience)).unwrap_or_default(),
            row.review_state.label().into(),
            row.count.to_string(),
            row.sex.dwc().into(),
            row.life_stage.map(|s| s.dwc()).unwrap_or_default().into(),
            row.condition.vitality().into(),
            // Darwin Core occurrenceStatus as revised in 2025-2026 (tdwg/dwc #546, #699):
            // `detected` / `notDetected`, replacing `present` / `absent`. See DEVELOPERS.md.
            "detected".into(),
            // Darwin Core recordedBy: a list, " | " between, the primary observer first.
            if hide { String::new() } else { credit::recorded_by(&row.observers, audience) },
            text(row.notes.as_deref()),
            if hide { String::new() } else { media.join(" | ") },
            format!("organism-{}", row.organism_id),
            place.generalizations.clone().unwrap_or_default(),
            place.withheld.clone().unwrap_or_default(),
            // Darwin Core: the other reports of this organism, "relationship: id", " | " between.
            row.other_reports.iter().map(|id| format!("same organism: urn:uuid:{id}")).collect::<Vec<_>>().join(" | "),
            // An imported record: Darwin Core `datasetName`, the dataset it was kept in
            // before, and `otherCatalogNumbers`, its id there qualified by that name (the
            // term for "previous or alternate identifiers for the same occurrence"). The
            // source id is left out where free text is: it could lead to the source's
            // record at its exact place.
            row.imported_from.as_ref().map(|(dataset, _)| dataset.clone()).unwrap_or_default(),
            match &row.imported_from {
                Some((dataset, source_id)) if !hide => format!("{dataset}:{source_id}"),
                _ => String::new(),
            },
            // Darwin Core preparations: kinds and keeping only (fixed words), on every record.
            samples::preparations(&row.samples),
            samples::disposition(row.carcass.as_ref()),
        ];
        // Sample ids are free text: named to the public only where the record is published as recorded.
        let samples_shown = !hide && place.generalizations.is_none();
        Occurrence {
            dwc,
            place,
            length: row.length.clone(),
            condition: row.condition.label(),
            setting: row.setting.label(),
            human_signs: row.human_signs.iter().map(|s| s.label()).collect::<Vec<_>>().join(" | "),
            review_state: row.review_state.label(),
            walk_client_id: row.walk_client_id.clone(),
            event_date: date,
            identifications: row.identifications.iter().map(|i| self.history_row(row, i, hide)).collect(),
            samples: samples_for(&row.samples, audience, samples_shown),
            carcass: carcass_for(row.carcass.as_ref(), audience, hide),
        }
    }

    /// Darwin Core `identifiedBy`: on a generalised record only the network's reviewers
    /// are credited (an observer's label would link it to their other records).
    fn identified_by(&self, identification: &IdentificationRow, hide: bool) -> String {
        let credit = credit::identified_by(identification, self.audience());
        if hide && credit != credit::REVIEWER_CREDIT { String::new() } else { credit }
    }

    /// One identification as a row of the identification-history extension.
    fn history_row(&self, organism: &OccurrenceRow, identification: &IdentificationRow, hide: bool) -> Vec<String> {
        let resolution = self.publisher.names().resolution(&identification.taxon_name);
        let named = named(identification, &resolution, hide);
        let status = if !identification.current {
            "superseded"
        } else if identification.report == organism.client_id {
            organism.review_state.label()
        } else {
            // The current identification of a report merged into this organism.
            "merged"
        };
        vec![
            format!("urn:uuid:{}#identification-{}", identification.report, identification.id),
            named.scientific_name,
            named.rank,
            if hide { String::new() } else { identification.taxon_name.clone() },
            self.identified_by(identification, hide),
            date_identified(identification, hide),
            identification_remarks(identification, named.resolved, hide, self.audience()),
            status.to_owned(),
        ]
    }
}

/// A stored identification's name in Darwin Core terms (see [`Named`]).
fn named(identification: &IdentificationRow, resolution: &Resolution, hide_free_text: bool) -> Named {
    match (resolution.taxon(), &identification.taxon_rank) {
        (Some(taxon), _) => Named {
            scientific_name: taxon.scientific_name.clone(),
            rank: rank_word(taxon.rank).to_owned(),
            resolved: true,
        },
        (None, Some(rank)) if !hide_free_text => {
            Named { scientific_name: identification.taxon_name.clone(), rank: rank.clone(), resolved: false }
        }
        (None, _) => Named { scientific_name: String::new(), rank: String::new(), resolved: false },
    }
}

/// Darwin Core `identificationRemarks`: how the identification was made, then its remark
/// (left out where a generalised record's free text is withheld), then a note when the
/// name does not resolve to a checklist taxon.
fn identification_remarks(
    identification: &IdentificationRow,
    resolved: bool,
    hide_free_text: bool,
    audience: Audience,
) -> String {
    let mut remarks = match identification.basis.as_str() {
        "reviewer" => "identified by a reviewer from the photos and details".to_owned(),
        basis => basis.to_owned(),
    };
    if let Some(remark) = identification.remarks.as_deref().filter(|r| !hide_free_text && !r.is_empty()) {
        remarks.push_str("; ");
        remarks.push_str(remark);
    }
    if !resolved {
        remarks.push_str(match audience {
            Audience::Public => {
                "; the name is not resolved to a checklist taxon, so the location is generalised as the strictest species on the checklist would be"
            }
            Audience::Full => "; the name is not resolved to a checklist taxon",
        });
    }
    remarks
}

/// Darwin Core `dateIdentified`: to the day on a generalised record.
fn date_identified(identification: &IdentificationRow, to_the_day: bool) -> String {
    let at = identification.identified_at.as_str();
    if to_the_day { at.get(..10).unwrap_or(at).to_owned() } else { at.to_owned() }
}

/// The published `eventDate`. One observation: its time with the observer's offset, or
/// on a generalised record only the observer's calendar day. Several (after a merge)
/// that differ: the interval from the first to the last, in UTC (ISO 8601
/// `start/end`); on a generalised record from the first day to the last.
fn event_date(row: &OccurrenceRow, to_the_day: bool) -> String {
    let day = |time: &str| time.get(..10).unwrap_or(time).to_owned();
    let interval = row.observation_count > 1 && row.first_utc != row.last_utc;
    match (interval, to_the_day) {
        (true, false) => format!("{}/{}", row.first_utc, row.last_utc),
        (true, true) if day(&row.first_utc) != day(&row.last_utc) => {
            format!("{}/{}", day(&row.first_utc), day(&row.last_utc))
        }
        (true, true) => day(&row.first_utc),
        (false, false) => row.observed_at.clone(),
        (false, true) => day(&row.observed_at),
    }
}

/// The first and last day a record is published under, for the day filter: the UTC days
/// of its time span, or on a generalised record the days its `eventDate` shows.
fn published_days(row: &OccurrenceRow, to_the_day: bool) -> Option<(NaiveDate, NaiveDate)> {
    let day = |time: &str| time.get(..10).and_then(|d| d.parse::<NaiveDate>().ok());
    let interval = row.observation_count > 1 && row.first_utc != row.last_utc;
    if to_the_day && !interval {
        let own = day(&row.observed_at)?;
        return Some((own, own));
    }
    Some((day(&row.first_utc)?, day(&row.last_utc)?))
}
