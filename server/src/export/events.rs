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
//! finds of their group). What was found on a walk is read from every record made on it,
//! whatever an export's filters leave out, so a filtered archive never claims a false
//! absence. A find identified at any rank counts for the group all its species share (a
//! skate identified only to Rajidae is a ray-and-skate find); a find the checklist cannot
//! place counts as found for every group, so no absence is claimed beside it; a find
//! outside the target groups (a chimaera) counts for none.
//!
//! A track is never exported. Public exports give the walk's start rounded to 0.1°
//! (Chapman 2020 grid) with the cell diagonal added to its uncertainty; full exports give
//! the start as recorded. A walk with a find the public may not see exactly (a sensitive
//! species, a name that does not resolve, a find not yet confirmed: see
//! [`crate::protect::Publisher`]) is generalised at least as far as that find: its
//! stretch name (`locality`) is withheld, its start is rounded to the coarser of 0.1°
//! and the find's grid, or withheld with the find's location, and `dataGeneralizations`
//! / `informationWithheld` say so. An absence names the walker as every record does
//! ([`super::credit`]).

use shared_types::WalkSubmission;
use species_key::{Checklist, Sensitivity};

use super::Audience;
use super::credit;
use super::terms::OCCURRENCE_TERMS;
use crate::protect::generalise::{as_recorded, public_place};
use crate::store::occurrences::ObserverRow;
use crate::taxa::{NamedTaxon, stricter};

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

/// Where a find stands against a walk's target groups.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Placement {
    /// In one target group.
    Group(TargetGroup),
    /// Placed on the checklist, outside every target group (a chimaera).
    Outside,
    /// Not on the checklist, or its species span groups: it may be of any group.
    Unknown,
}

/// The group a superorder belongs to.
fn group_of_superorder(superorder: &str) -> Option<TargetGroup> {
    match superorder {
        "Galeomorphii" | "Squalomorphii" => Some(TargetGroup::Sharks),
        "Batoidea" => Some(TargetGroup::RaysAndSkates),
        _ => None,
    }
}

/// Where a find identified as `named` (at any rank) stands: the group all its species share.
pub fn placement(named: Option<&NamedTaxon>, checklist: &Checklist) -> Placement {
    let Some(named) = named else { return Placement::Unknown };
    let mut groups = named.members(checklist).map(|t| group_of_superorder(&t.superorder));
    let Some(first) = groups.next() else { return Placement::Unknown };
    if !groups.all(|g| g == first) {
        return Placement::Unknown;
    }
    first.map_or(Placement::Outside, Placement::Group)
}

/// What was found on one walk: which groups.
#[derive(Debug, Clone, Copy, Default)]
pub struct Found {
    groups: u8,
}

impl Found {
    /// Notes a find identified as `named` (`None`: a name the checklist does not know).
    pub fn add(&mut self, named: Option<&NamedTaxon>, checklist: &Checklist) {
        self.groups |= match placement(named, checklist) {
            Placement::Group(group) => group.bit(),
            Placement::Outside => 0,
            Placement::Unknown => u8::MAX,
        };
    }

    fn has(self, group: TargetGroup) -> bool {
        self.groups & group.bit() != 0
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

/// A walk's event row and its start as published (for the area filter).
pub struct WalkEvent {
    pub row: Vec<String>,
    pub start: Option<(f64, f64)>,
}

/// The event row of a walk; `sensitivity` is how far its most sensitive find is
/// generalised for the public ([`crate::protect::Publisher::walk_sensitivity`]).
pub fn walk_event(walk: &WalkSubmission, audience: Audience, sensitivity: Sensitivity) -> WalkEvent {
    let effort = walk.effort();
    let protocol = if walk.all_finds_reported {
        "beach survey walk; every shark, ray, skate and egg case found was reported"
    } else {
        "beach survey walk; not every find was reported"
    };
    let start = walk.track.first().map(|p| (p.latitude.get(), p.longitude.get()));
    let accuracy = walk.track.first().and_then(|p| p.accuracy_m).map(|a| a.get());
    let sensitive = audience == Audience::Public && sensitivity != Sensitivity::None;
    let (place, generalised) = match audience {
        Audience::Public => {
            let why = if sensitive { "a walk with a sensitive or unconfirmed find" } else { "a survey walk" };
            let place = public_place(start, accuracy, stricter(Sensitivity::TenthDegree, sensitivity), why);
            // Never finer than 0.1°, so a sensitive find's grid (0.01°, 0.001°) changes nothing
            // here; a withheld one withholds the start too.
            let said = match (start, place.position) {
                (None, _) => "",
                (Some(_), None) => {
                    "Start of the walk withheld: a find on it may be a sensitive species (Chapman 2020, GBIF)."
                }
                (Some(_), Some(_)) => {
                    "Start of the walk rounded to 0.1 degree; coordinateUncertaintyInMeters raised by the cell diagonal (Chapman 2020 grid)."
                }
            };
            (place, said.to_owned())
        }
        Audience::Full => (as_recorded(start, accuracy), String::new()),
    };
    let (lat, lon) = place.position.map_or((String::new(), String::new()), |(lat, lon)| {
        (format!("{lat:.*}", place.decimals), format!("{lon:.*}", place.decimals))
    });
    let mut generalizations = generalised;
    let mut withheld = "the walk's GPS track is not published".to_owned();
    if sensitive {
        generalizations =
            format!("{generalizations} Locality withheld: a find on this walk may be a sensitive species.")
                .trim()
                .to_owned();
        withheld.push_str("; the stretch's name and the precise start are withheld because a find on this walk may be a sensitive species; assessors may ask the network");
    }
    let row = vec![
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
        if sensitive {
            String::new()
        } else {
            walk.stretch.as_ref().map(|s| s.as_str().to_owned()).unwrap_or_default()
        },
        lat.clone(),
        lon,
        if lat.is_empty() { String::new() } else { "EPSG:4326".into() },
        place.uncertainty_m.map(|u| format!("{:.0}", u.ceil())).unwrap_or_default(),
        generalizations,
        withheld,
    ];
    WalkEvent { row, start: place.position }
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
/// not find; none for a walk that did not promise every find. `observer` walked it.
pub fn absences(walk: &WalkSubmission, found: Found, observer: &ObserverRow, audience: Audience) -> Vec<Vec<String>> {
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
                    "recordedBy" => credit::observer(observer, audience).unwrap_or_default(),
                    "occurrenceRemarks" => "none found on a survey walk on which every find was reported".into(),
                    _ => String::new(),
                }
            };
            OCCURRENCE_TERMS.iter().map(|term| value(term)).collect()
        })
        .collect()
}
