//! Confirmed records near a place, counted per checklist species, for the guided key's
//! prior (`species_key::Context::nearby_confirmed`): a species often confirmed nearby is
//! a likelier answer. No HTTP here; `GET /api/checklist/nearby` serves it.
//!
//! Only counts leave the server, never positions. The records come at their published
//! positions ([`super::input::read_store`] for the public): a sensitive species is
//! counted where the public export shows it (Chapman 2020 categories in the checklist:
//! rounded to 0.1°, 0.01° or 0.001°), so moving the query point around cannot narrow a
//! record down further than the export already does; a record whose location is
//! withheld has no position and is not counted at all.

use std::collections::BTreeMap;

use analysis::LatLon;
use geo::{Distance as _, Geodesic, Point};
use serde::Serialize;

use super::input::PointRecord;
use crate::taxa::TaxonIndex;

/// Confirmed records within this distance (geodesic, WGS84) of the query point count as
/// nearby: about a day's stretch of coast either way, and the same distance the out-of-range
/// flag uses (common practice; no published figure).
pub const NEARBY_RADIUS_KM: f64 = 50.0;

/// The answer: how many confirmed records of each species lie within the radius.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct NearbyCounts {
    /// The point asked about.
    pub latitude: f64,
    pub longitude: f64,
    /// The radius used, km.
    pub radius_km: f64,
    /// Confirmed records per checklist scientific name; species with none are left out.
    pub counts: BTreeMap<String, u32>,
    /// What was counted, in words.
    pub note: String,
}

/// Counts `confirmed` records (already filtered to the confirmed state, at their
/// published positions) within [`NEARBY_RADIUS_KM`] of `centre`, per checklist species.
pub fn nearby_counts(confirmed: &[PointRecord], names: &TaxonIndex, centre: LatLon) -> NearbyCounts {
    let here = Point::new(centre.lon(), centre.lat());
    let mut counts: BTreeMap<String, u32> = BTreeMap::new();
    for record in confirmed {
        let (Some(taxon), Some(position)) = (record.name.as_deref().and_then(|n| names.resolve(n)), record.position)
        else {
            continue;
        };
        if Geodesic.distance(here, Point::new(position.lon(), position.lat())) <= NEARBY_RADIUS_KM * 1000.0 {
            *counts.entry(taxon.scientific_name.clone()).or_insert(0) += 1;
        }
    }
    NearbyCounts {
        latitude: centre.lat(),
        longitude: centre.lon(),
        radius_km: NEARBY_RADIUS_KM,
        counts,
        note: format!(
            "confirmed records within {NEARBY_RADIUS_KM} km, per species on the checklist; sensitive species counted \
             from their public (generalised) positions, species whose location is withheld not counted"
        ),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn record(name: &str, lat: f64, lon: f64) -> PointRecord {
        PointRecord {
            label: format!("{name} at {lat}, {lon}"),
            name: Some(name.into()),
            position: LatLon::new(lat, lon).ok(),
            when: None,
            count: 1,
            walk_client_id: None,
        }
    }

    #[test]
    fn records_inside_the_radius_count_per_species_by_their_checklist_name() {
        let names = TaxonIndex::load(None).unwrap();
        let records = [
            record("small-spotted catshark", 52.40, -4.10),
            record("Scyliorhinus canicula", 52.20, -4.30),
            record("Scyliorhinus canicula", 53.40, -4.10), // about 111 km north
            record("sea serpent", 52.40, -4.10),
        ];
        let found = nearby_counts(&records, &names, LatLon::new(52.41, -4.09).unwrap());
        assert_eq!(found.counts, BTreeMap::from([("Scyliorhinus canicula".to_owned(), 2)]));
    }
}
