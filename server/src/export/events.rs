//! Survey walks as Darwin Core events, and the absences they make possible.
//!
//! When an archive holds walks, its core is the Event table (TDWG Darwin Core Text
//! Guide, sampling-event data): one event per walk — `eventDate` the walk's interval,
//! `samplingProtocol`, `sampleSizeValue` in kilometres walked, `samplingEffort` in words —
//! and one event per record made outside a walk (`samplingProtocol` "incidental record").
//! Occurrences are an extension of their event.
//!
//! On a walk whose observer reported every find, each target group with no find gets an
//! absence: `occurrenceStatus` `notDetected` (the vocabulary the 2026 TDWG term list
//! recommends, replacing `absent`) with `individualCount` 0. The target groups are the
//! ones the walk's promise names: sharks and rays-and-skates (egg cases are recorded as
//! finds of their group). A find the checklist cannot place counts as found for every
//! group, so no absence is claimed beside it.
//!
//! A track is never exported. Public exports give the walk's start rounded to 0.1°
//! (Chapman 2020 grid) with the cell diagonal added to its uncertainty; full exports give
//! the start as recorded.

use species_key::{Sensitivity, Taxon};

use super::Audience;
use super::generalise::{as_recorded, public_place};
use super::terms::OCCURRENCE_TERMS;
use crate::store::walks::StoredWalk;

/// Event terms, in column order; the first is the row's id.
pub const EVENT_TERMS: &[&str] = &[
    "eventID",
    "eventDate",
    "samplingProtocol",
    "sampleSizeValue",
    "sampleSizeUnit",
    "samplingEffort",
    "locality",
    "decimalLatitude",
    "decimalLongitude",
    "geodeticDatum",
    "coordinateUncertaintyInMeters",
    "dataGeneralizations",
    "informationWithheld",
];

/// A group a walk's "every find reported" covers.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TargetGroup {
    Sharks,
    RaysAndSkates,
}

impl TargetGroup {
    pub const ALL: [TargetGroup; 2] = [TargetGroup::Sharks, TargetGroup::RaysAndSkates];

    /// Darwin Core `scientificName` and `taxonRank` of the group (superorders, from memory).
    pub fn name_and_rank(self) -> (&'static str, &'static str) {
        match self {
            Self::Sharks => ("Selachimorpha", "superorder"),
            Self::RaysAndSkates => ("Batoidea", "superorder"),
        }
    }

    fn bit(self) -> u8 {
        match self {
            Self::Sharks => 1,
            Self::RaysAndSkates => 2,
        }
    }
}

/// The group a checklist taxon belongs to, by its superorder.
pub fn group_of(taxon: &Taxon) -> Option<TargetGroup> {
    match taxon.superorder.as_str() {
        "Galeomorphii" | "Squalomorphii" => Some(TargetGroup::Sharks),
        "Batoidea" => Some(TargetGroup::RaysAndSkates),
        _ => None,
    }
}

/// Which groups were found on one walk.
#[derive(Debug, Clone, Copy, Default)]
pub struct Found(u8);

impl Found {
    /// Notes a find: of a group, or (`None`) one the checklist cannot place.
    pub fn add(&mut self, group: Option<TargetGroup>) {
        self.0 |= group.map_or(u8::MAX, TargetGroup::bit);
    }

    fn has(self, group: TargetGroup) -> bool {
        self.0 & group.bit() != 0
    }
}

pub fn walk_event_id(walk_client_id: &str) -> String {
    format!("urn:uuid:{walk_client_id}")
}

/// The event of a record made outside a walk: its occurrence's id with `#event`.
pub fn incidental_event_id(occurrence_id: &str) -> String {
    format!("{occurrence_id}#event")
}

fn hours_and_minutes(seconds: f64) -> String {
    let minutes = (seconds / 60.0).round() as i64;
    format!("{} h {:02} min", minutes / 60, minutes % 60)
}

/// The event row of a walk.
pub fn walk_event(stored: &StoredWalk, audience: Audience) -> Vec<String> {
    let walk = &stored.walk;
    let effort = walk.effort();
    let protocol = if walk.all_finds_reported {
        "beach survey walk; every shark, ray, skate and egg case found was reported"
    } else {
        "beach survey walk; not every find was reported"
    };
    let start = walk.track.first().map(|p| (p.latitude.get(), p.longitude.get()));
    let accuracy = walk.track.first().and_then(|p| p.accuracy_m).map(|a| a.get());
    let (place, generalised) = match audience {
        Audience::Public => (public_place(start, accuracy, Sensitivity::TenthDegree), start.map(|_| "Start of the walk rounded to 0.1 degree; coordinateUncertaintyInMeters raised by the cell diagonal (Chapman 2020 grid).")),
        Audience::Full => (as_recorded(start, accuracy), None),
    };
    let (lat, lon) = place.position.map_or((String::new(), String::new()), |(lat, lon)| (format!("{lat:.*}", place.decimals), format!("{lon:.*}", place.decimals)));
    vec![
        walk_event_id(&walk.client_id.to_string()),
        format!("{}/{}", walk.started_at.to_rfc3339(), walk.ended_at.to_rfc3339()),
        protocol.to_owned(),
        format!("{:.3}", effort.distance_m / 1000.0),
        "kilometres".to_owned(),
        format!(
            "1 observer walked {:.2} km ({}) in {}",
            effort.distance_m / 1000.0,
            match effort.distance_source {
                shared_types::DistanceSource::Track => "from the GPS track",
                shared_types::DistanceSource::Typed => "as entered",
            },
            hours_and_minutes(effort.duration_s)
        ),
        walk.stretch.as_ref().map(|s| s.as_str().to_owned()).unwrap_or_default(),
        lat.clone(),
        lon,
        if lat.is_empty() { String::new() } else { "EPSG:4326".into() },
        place.uncertainty_m.map(|u| format!("{:.0}", u.ceil())).unwrap_or_default(),
        generalised.unwrap_or_default().to_owned(),
        "the walk's GPS track is not published".to_owned(),
    ]
}

/// The event row of a record made outside a walk.
pub fn incidental_event(occurrence_id: &str, event_date: &str) -> Vec<String> {
    let mut row = vec![String::new(); EVENT_TERMS.len()];
    row[0] = incidental_event_id(occurrence_id);
    row[1] = event_date.to_owned();
    row[2] = "incidental record".to_owned();
    row
}

/// Absence occurrences (as Occurrence-term rows) for the groups an all-finds walk did
/// not find; none for a walk that did not promise every find.
pub fn absences(stored: &StoredWalk, found: Found) -> Vec<Vec<String>> {
    let walk = &stored.walk;
    if !walk.all_finds_reported {
        return Vec::new();
    }
    let event_id = walk_event_id(&walk.client_id.to_string());
    TargetGroup::ALL
        .into_iter()
        .filter(|group| !found.has(*group))
        .map(|group| {
            let (name, rank) = group.name_and_rank();
            let value = |term: &str| -> String {
                match term {
                    "occurrenceID" => format!("{event_id}#absent-{name}"),
                    "basisOfRecord" => "HumanObservation".into(),
                    "eventDate" => format!("{}/{}", walk.started_at.to_rfc3339(), walk.ended_at.to_rfc3339()),
                    "kingdom" => "Animalia".into(),
                    "scientificName" => name.into(),
                    "taxonRank" => rank.into(),
                    "individualCount" => "0".into(),
                    "occurrenceStatus" => "notDetected".into(),
                    "recordedBy" => walk.observer_name.as_ref().map(|n| n.as_str().to_owned()).unwrap_or_default(),
                    "occurrenceRemarks" => "none found on a survey walk on which every find was reported".into(),
                    _ => String::new(),
                }
            };
            OCCURRENCE_TERMS.iter().map(|term| value(term)).collect()
        })
        .collect()
}
