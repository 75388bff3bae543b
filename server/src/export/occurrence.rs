//! One stored organism turned into the values an export writes: names matched on the
//! checklist, the position generalised for the audience, links made absolute.

use std::collections::BTreeMap;

use crate::assess::taxa::{TaxonFilter, TaxonIndex};
use crate::store::occurrences::{LengthRow, OccurrenceRow};

use super::generalise::{PublicPlace, as_recorded, public_place};

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
    /// The walk target group the taxon belongs to; `None` when it cannot be placed.
    pub group: Option<super::events::TargetGroup>,
    /// Darwin Core `eventDate`, as in `dwc`.
    pub event_date: String,
}

/// What an export did, for the command line and the archive's metadata.
#[derive(Debug, Clone, Default)]
pub struct ExportSummary {
    pub records: u64,
    pub generalised: u64,
    pub withheld: u64,
    /// Lengths written to the archive's MeasurementOrFact extension (archives only).
    pub measurements: u64,
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
        if self.events > 0 {
            notes.push(format!(
                "{} survey walks as events (effort in sampleSizeValue, kilometres), with {} absences (occurrenceStatus notDetected, individualCount 0) for groups not found on walks where every find was reported.",
                self.events, self.absences
            ));
        }
        let unmatched: u64 = self.unmatched.values().sum::<u64>() + self.other_unmatched;
        if unmatched > 0 {
            let names: Vec<String> = self.unmatched.iter().map(|(n, c)| format!("{n} ({c})")).collect();
            let more = if self.other_unmatched > 0 { format!(" and {} more", self.other_unmatched) } else { String::new() };
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

impl Builder<'_> {
    /// The occurrence for `row`, or `None` when the taxon filter leaves it out.
    pub fn build(&mut self, row: &OccurrenceRow) -> Option<Occurrence> {
        let guess = row.identification.as_ref().map(|i| i.taxon_name.as_str());
        let taxon = guess.and_then(|g| self.names.resolve(g));
        // An identification stopped at a genus, family, order or superorder of the checklist.
        let higher = if taxon.is_none() { guess.and_then(|g| self.names.filter(g)) } else { None };
        let members = |h: &TaxonFilter| self.names.checklist().taxa().iter().filter(|t| h.contains(t)).collect::<Vec<_>>();
        let higher_members = higher.as_ref().map(members).unwrap_or_default();
        if let Some(filter) = self.taxon {
            let wanted = match (taxon, &higher) {
                (Some(t), _) => filter.contains(t),
                (None, Some(h)) => h.rank <= filter.rank && higher_members.first().is_some_and(|t| filter.contains(t)),
                (None, None) => false,
            };
            if !wanted {
                return None;
            }
        }
        let position = row.latitude.zip(row.longitude);
        // A higher taxon is generalised as its most sensitive species would be.
        let sensitivity = taxon.map(|t| t.sensitivity).or_else(|| higher.as_ref().map(|_| strictest(&higher_members)));
        let place = match (self.audience, sensitivity) {
            (Audience::Public, Some(sensitivity)) => public_place(position, row.accuracy_m, sensitivity),
            _ => as_recorded(position, row.accuracy_m),
        };
        self.count(guess, taxon.is_some() || higher.is_some(), &place);
        let named = taxon.map(|t| (t.scientific_name.as_str(), t.taxon_rank)).or(higher.as_ref().map(|h| (h.name.as_str(), h.rank)));
        Some(self.occurrence(row, taxon.or(higher_members.first().copied()), named, place))
    }

    fn count(&mut self, guess: Option<&str>, matched: bool, place: &PublicPlace) {
        self.summary.records += 1;
        if place.generalizations.is_some() {
            if place.position.is_some() { self.summary.generalised += 1 } else { self.summary.withheld += 1 }
        }
        if let (Some(name), false) = (guess, matched) {
            self.summary.note_unmatched(name);
        }
    }

    /// `taxon` places the record in a walk target group (for a higher taxon, one of its
    /// species); `named` is the checklist name and rank it is identified to.
    fn occurrence(&self, row: &OccurrenceRow, taxon: Option<&species_key::Taxon>, named: Option<(&str, species_key::TaxonRank)>, place: PublicPlace) -> Occurrence {
        let identification = row.identification.as_ref();
        let text = |v: Option<&str>| v.unwrap_or_default().to_owned();
        let media: Vec<String> = row.photo_hashes.iter().map(|h| format!("{}/photos/{h}", self.base_url)).collect();
        let (lat, lon) = match place.position {
            Some((lat, lon)) => (format!("{lat:.*}", place.decimals), format!("{lon:.*}", place.decimals)),
            None => (String::new(), String::new()),
        };
        let remarks = if place.hide_media_and_remarks { String::new() } else { text(row.notes.as_deref()) };
        let identification_remarks = match (identification, named) {
            (Some(i), Some(_)) => i.remarks.clone().unwrap_or_else(|| i.basis.clone()),
            (Some(i), None) => format!("{}; the name is not on the checklist, so the location is not generalised", i.basis),
            (None, _) => String::new(),
        };
        let dwc = vec![
            format!("urn:uuid:{}", row.client_id),
            "HumanObservation".into(),
            event_date(row),
            lat,
            lon,
            if place.position.is_some() { "EPSG:4326".into() } else { String::new() },
            place.uncertainty_m.map(|u| format!("{:.0}", u.ceil())).unwrap_or_default(),
            "Animalia".into(),
            named.map(|(name, _)| name.to_owned()).unwrap_or_default(),
            named.map(|(_, rank)| rank_code(rank).to_owned()).unwrap_or_default(),
            text(row.species_guess.as_deref().or(identification.map(|i| i.taxon_name.as_str()))),
            text(identification.and_then(|i| i.identified_by.as_deref())),
            text(identification.map(|i| i.identified_at.as_str())),
            identification_remarks,
            row.review_state.label().into(),
            row.count.to_string(),
            row.sex.dwc().into(),
            row.condition.vitality().into(),
            // The 2026 TDWG vocabulary for occurrenceStatus: `detected` / `notDetected`.
            "detected".into(),
            text(row.observer_name.as_deref()),
            remarks,
            if place.hide_media_and_remarks { String::new() } else { media.join(" | ") },
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
            group: taxon.and_then(super::events::group_of),
            event_date: event_date(row),
        }
    }
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

/// The strictest generalisation among `members` (withholding, then the coarsest grid).
fn strictest(members: &[&species_key::Taxon]) -> species_key::Sensitivity {
    use species_key::Sensitivity;
    let strictness = |s: Sensitivity| match s {
        Sensitivity::None => 0,
        Sensitivity::ThousandthDegree => 1,
        Sensitivity::HundredthDegree => 2,
        Sensitivity::TenthDegree => 3,
        Sensitivity::Withhold => 4,
    };
    members.iter().map(|t| t.sensitivity).max_by_key(|s| strictness(*s)).unwrap_or(Sensitivity::None)
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
