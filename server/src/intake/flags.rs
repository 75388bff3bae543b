//! Flags raised when a record arrives, for reviewers: a length well over the species'
//! known maximum (**oversize**), or a record outside the species' known areas and far
//! from any confirmed record of it (**out of range**). Plain data in, plain data out:
//! the caller supplies the confirmed positions of the species.
//!
//! Thresholds (our choice, common practice for plausibility checks, documented here and
//! in DEVELOPERS.md): oversize above 1.2 × the maximum for a taped length and 1.5 × for an
//! estimate; "far" is more than 50 km from every confirmed record.

use geo::{Distance, Geodesic, Point};
use shared_types::{FlagKind, RecordFlag, Submission};
use species_key::{Checklist, Measurement, Taxon, TaxonRank};

use crate::taxa::TaxonIndex;

/// A taped length this many times the species' maximum is flagged.
pub const OVERSIZE_MEASURED: f64 = 1.2;
/// An estimated length this many times the species' maximum is flagged.
pub const OVERSIZE_ESTIMATED: f64 = 1.5;
/// A confirmed record of the species closer than this keeps a record in range.
pub const CONFIRMED_NEARBY_KM: f64 = 50.0;

/// The checklist species a record names: the key's pick at species rank, else the
/// observer's guess matched to a scientific or common name (the same matching the
/// exports use, `assess::taxa`).
pub fn species_of<'c>(taxa: &'c TaxonIndex, submission: &Submission) -> Option<&'c Taxon> {
    if let Some(choice) = &submission.key_choice {
        return (choice.taxon_rank == "species")
            .then(|| taxa.checklist().taxon(choice.scientific_name.as_str()))
            .flatten();
    }
    taxa.resolve(submission.species_guess.as_ref()?.as_str()).filter(|taxon| taxon.taxon_rank == TaxonRank::Species)
}

/// Every flag the record earns. `confirmed` are (latitude, longitude) of confirmed
/// records of the same species.
pub fn raise(
    checklist: &Checklist,
    submission: &Submission,
    taxon: &Taxon,
    confirmed: &[(f64, f64)],
) -> Vec<RecordFlag> {
    [oversize(submission, taxon), out_of_range(checklist, submission, taxon, confirmed)].into_iter().flatten().collect()
}

fn oversize(submission: &Submission, taxon: &Taxon) -> Option<RecordFlag> {
    let length = submission.length?;
    let estimated = length.method == shared_types::MeasureMethod::Estimated;
    let measurement = Measurement { kind: length.kind.key_kind(), cm: length.value.centimetres(), estimated };
    let comparable = species_key::length::comparable_length(&measurement, taxon)?;
    let maximum = taxon.max_length.cm;
    let factor = if estimated { OVERSIZE_ESTIMATED } else { OVERSIZE_MEASURED };
    (comparable.cm > factor * maximum).then(|| RecordFlag {
        kind: FlagKind::Oversize,
        reason: format!(
            "{} {:.0} cm {} is over {:.0}% of this species' known maximum of {:.0} cm ({})",
            if estimated { "estimated" } else { "measured" },
            length.value.centimetres(),
            length.kind.label(),
            factor * 100.0,
            maximum,
            taxon.max_length.measure.words(),
        ),
    })
}

fn out_of_range(
    checklist: &Checklist,
    submission: &Submission,
    taxon: &Taxon,
    confirmed: &[(f64, f64)],
) -> Option<RecordFlag> {
    let position = submission.position?;
    let (lat, lon) = (position.latitude.get(), position.longitude.get());
    let area = checklist.area_at(lat, lon);
    if area.is_some_and(|a| taxon.presence.contains(&a.code)) {
        return None;
    }
    let here = Point::new(lon, lat);
    let nearest_km = confirmed
        .iter()
        .map(|&(clat, clon)| Geodesic.distance(here, Point::new(clon, clat)) / 1000.0)
        .fold(f64::INFINITY, f64::min);
    if nearest_km <= CONFIRMED_NEARBY_KM {
        return None;
    }
    let place = match area {
        Some(area) => format!("{} is not among the areas where it is known", area.name),
        None => "the position is outside every area of the checklist".to_owned(),
    };
    let nearest = if nearest_km.is_finite() {
        format!("the nearest confirmed record is {nearest_km:.0} km away")
    } else {
        "there is no confirmed record of it yet".to_owned()
    };
    Some(RecordFlag { kind: FlagKind::OutOfRange, reason: format!("{place}, and {nearest}") })
}
