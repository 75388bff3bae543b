//! One stored organism turned into the values an export writes: names matched on the
//! checklist at any rank, the position generalised for the audience, links made
//! absolute, and the organism's identification history.

use std::collections::BTreeMap;

use crate::store::occurrences::{IdentificationRow, LengthRow, OccurrenceRow};
use crate::taxa::{NamedTaxon, TaxonFilter, TaxonIndex};

use crate::protect::generalise::{PublicPlace, as_recorded, public_place};

/// Who an export is for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Audience {
    /// Anyone: sensitive species are generalised.
    Public,
    /// Assessors and admins: positions as recorded.
    Full,
}

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
}

/// What an export did, for the command line and the archive's metadata.
#[derive(Debug, Clone, Default)]
pub struct ExportSummary {
    pub records: u64,
    pub generalised: u64,
    pub withheld: u64,
    /// Lengths written to the archive's MeasurementOrFact extension (archives only).
    pub measurements: u64,
    /// Rows of the archive's Identification extension (archives only).
    pub identifications: u64,
    /// Identifications the checklist does not list, with their counts (at most
    /// [`MAX_NAMES_SHOWN`] names; the rest are counted in `other_unmatched`).
    pub unmatched: BTreeMap<String, u64>,
    pub other_unmatched: u64,
    /// Survey walks written as events (archives with walks only).
    pub events: u64,
    /// Absences written for target groups not found on all-finds walks.
    pub absences: u64,
}

/// How many distinct unmatched names a summary keeps, so memory stays flat.
pub const MAX_NAMES_SHOWN: usize = 50;

impl ExportSummary {
    /// Lines for people: what was generalised, and which names were not matched.
    pub fn notes(&self) -> Vec<String> {
        let mut notes = vec![format!(
            "{} records; {} with generalised coordinates and {} with the location withheld (sensitive species, Chapman 2020, GBIF).",
            self.records, self.generalised, self.withheld
        )];
        if self.measurements > 0 {
            notes.push(format!("{} lengths, in the MeasurementOrFact extension.", self.measurements));
        }
        if self.identifications > 0 {
            notes.push(format!(
                "{} identifications, current and superseded, in the Identification extension.",
                self.identifications
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
            let names: Vec<String> = self.unmatched.iter().map(|(n, c)| format!("{n} ({c})")).collect();
            let more =
                if self.other_unmatched > 0 { format!(" and {} more", self.other_unmatched) } else { String::new() };
            notes.push(format!(
                "{unmatched} records have an identification the checklist does not list, so they are not generalised \
                 even if sensitive: {}{more}.",
                names.join(", ")
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
    pub names: &'a TaxonIndex,
    pub audience: Audience,
    pub taxon: Option<&'a TaxonFilter>,
    pub base_url: &'a str,
    pub summary: ExportSummary,
}

/// A stored identification in Darwin Core terms.
struct Named<'a> {
    /// The checklist taxon, at any rank, when the name is on the checklist.
    taxon: Option<&'a NamedTaxon>,
    /// `scientificName` and `taxonRank`: the checklist's, else as stored when a rank was
    /// stored with it (the key or a reviewer), else empty (a free-text guess).
    scientific_name: String,
    rank: String,
}

impl Builder<'_> {
    /// The occurrence for `row`, or `None` when the taxon filter leaves it out.
    pub fn build(&mut self, row: &OccurrenceRow) -> Option<Occurrence> {
        let names = self.names;
        let named = row.identification.as_ref().map(|i| name_of(names, i));
        let taxon = named.as_ref().and_then(|n| n.taxon);
        if let Some(filter) = self.taxon
            && !taxon.is_some_and(|t| filter.contains_named(t, self.names.checklist()))
        {
            return None;
        }
        let position = row.latitude.zip(row.longitude);
        let place = match (self.audience, taxon) {
            (Audience::Public, Some(t)) => public_place(position, row.accuracy_m, t.sensitivity),
            _ => as_recorded(position, row.accuracy_m),
        };
        self.count(row.identification.as_ref(), taxon.is_some(), &place);
        Some(self.occurrence(row, named, place))
    }

    fn count(&mut self, identification: Option<&IdentificationRow>, matched: bool, place: &PublicPlace) {
        self.summary.records += 1;
        if place.generalizations.is_some() {
            if place.position.is_some() { self.summary.generalised += 1 } else { self.summary.withheld += 1 }
        }
        if let (Some(i), false) = (identification, matched) {
            self.summary.note_unmatched(&i.taxon_name);
        }
    }

    fn occurrence(&self, row: &OccurrenceRow, named: Option<Named>, place: PublicPlace) -> Occurrence {
        let identification = row.identification.as_ref();
        let text = |v: Option<&str>| v.unwrap_or_default().to_owned();
        let media: Vec<String> = row.photo_hashes.iter().map(|h| format!("{}/photos/{h}", self.base_url)).collect();
        let (lat, lon) = match place.position {
            Some((lat, lon)) => (format!("{lat:.*}", place.decimals), format!("{lon:.*}", place.decimals)),
            None => (String::new(), String::new()),
        };
        let hide = place.hide_media_and_remarks;
        let remarks = if hide { String::new() } else { text(row.notes.as_deref()) };
        let matched = named.as_ref().is_some_and(|n| n.taxon.is_some());
        let (scientific_name, rank) = named.map(|n| (n.scientific_name, n.rank)).unwrap_or_default();
        let dwc = vec![
            format!("urn:uuid:{}", row.client_id),
            "HumanObservation".into(),
            event_date(row),
            lat,
            lon,
            if place.position.is_some() { "EPSG:4326".into() } else { String::new() },
            place.uncertainty_m.map(|u| format!("{:.0}", u.ceil())).unwrap_or_default(),
            "Animalia".into(),
            scientific_name,
            rank,
            text(row.species_guess.as_deref().or(identification.map(|i| i.taxon_name.as_str()))),
            text(identification.and_then(|i| i.identified_by.as_deref())),
            text(identification.map(|i| i.identified_at.as_str())),
            identification.map(|i| identification_remarks(i, matched, hide)).unwrap_or_default(),
            row.review_state.label().into(),
            row.count.to_string(),
            row.sex.dwc().into(),
            row.life_stage.map(|s| s.dwc()).unwrap_or_default().into(),
            row.condition.vitality().into(),
            // Darwin Core occurrenceStatus as revised in 2025-2026 (tdwg/dwc #546, #699):
            // `detected` / `notDetected`, replacing `present` / `absent`. See DEVELOPERS.md.
            "detected".into(),
            // Darwin Core recordedBy: a list, " | " between, the primary observer first.
            row.observer_names.join(" | "),
            remarks,
            if hide { String::new() } else { media.join(" | ") },
            format!("organism-{}", row.organism_id),
            place.generalizations.clone().unwrap_or_default(),
            place.withheld.clone().unwrap_or_default(),
            // Darwin Core: the other reports of this organism, "relationship: id", " | " between.
            row.other_reports.iter().map(|id| format!("same organism: urn:uuid:{id}")).collect::<Vec<_>>().join(" | "),
        ];
        Occurrence {
            dwc,
            place,
            length: row.length.clone(),
            condition: row.condition.label(),
            setting: row.setting.label(),
            human_signs: row.human_signs.iter().map(|s| s.label()).collect::<Vec<_>>().join(" | "),
            review_state: row.review_state.label(),
            walk_client_id: row.walk_client_id.clone(),
            event_date: event_date(row),
            identifications: row.identifications.iter().map(|i| self.history_row(row, i, hide)).collect(),
        }
    }

    /// One identification as a row of the identification-history extension.
    fn history_row(&self, organism: &OccurrenceRow, identification: &IdentificationRow, hide: bool) -> Vec<String> {
        let named = name_of(self.names, identification);
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
            identification.taxon_name.clone(),
            identification.identified_by.clone().unwrap_or_default(),
            identification.identified_at.clone(),
            identification_remarks(identification, named.taxon.is_some(), hide),
            status.to_owned(),
        ]
    }
}

/// A stored identification's name on the checklist, at any rank.
fn name_of<'n>(names: &'n TaxonIndex, identification: &IdentificationRow) -> Named<'n> {
    match names.named(&identification.taxon_name) {
        Some(taxon) => Named {
            taxon: Some(taxon),
            scientific_name: taxon.scientific_name.clone(),
            rank: rank_code(taxon.rank).to_owned(),
        },
        None => match &identification.taxon_rank {
            Some(rank) => Named { taxon: None, scientific_name: identification.taxon_name.clone(), rank: rank.clone() },
            None => Named { taxon: None, scientific_name: String::new(), rank: String::new() },
        },
    }
}

/// Darwin Core `identificationRemarks`: how the identification was made, then its remark
/// (left out where a sensitive record's free text is withheld), then a warning when the
/// name is not on the checklist.
fn identification_remarks(identification: &IdentificationRow, matched: bool, hide_free_text: bool) -> String {
    let mut remarks = match identification.basis.as_str() {
        "reviewer" => "identified by a reviewer from the photos and details".to_owned(),
        basis => basis.to_owned(),
    };
    if let Some(remark) = identification.remarks.as_deref().filter(|r| !hide_free_text && !r.is_empty()) {
        remarks.push_str("; ");
        remarks.push_str(remark);
    }
    if !matched {
        remarks.push_str("; the name is not on the checklist, so the location is not generalised");
    }
    remarks
}

/// One observation: its time with the observer's offset. Several (after a merge) that
/// differ: the interval from the first to the last, in UTC (ISO 8601 `start/end`).
fn event_date(row: &OccurrenceRow) -> String {
    if row.observation_count > 1 && row.first_utc != row.last_utc {
        format!("{}/{}", row.first_utc, row.last_utc)
    } else {
        row.observed_at.clone()
    }
}

fn rank_code(rank: species_key::TaxonRank) -> &'static str {
    match rank {
        species_key::TaxonRank::Species => "species",
        species_key::TaxonRank::Genus => "genus",
        species_key::TaxonRank::Family => "family",
        species_key::TaxonRank::Order => "order",
        species_key::TaxonRank::Superorder => "superorder",
    }
}
