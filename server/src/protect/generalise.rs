//! Public locations, generalised as Chapman 2020 (*Current Best Practices for
//! Generalizing Sensitive Species Occurrence Data*, GBIF) recommends: withhold, or round
//! to a 0.1°, 0.01° or 0.001° grid. [`super::published_place`] decides how far, and why.
//!
//! A rounded position lies in a cell one grid step wide around it, so the uncertainty
//! is raised by that cell's diagonal, measured on the WGS84 ellipsoid at the cell (about
//! 15.7 km, 1.57 km and 157 m at the equator, less further from it). The record says what
//! was done in `dataGeneralizations` and what is missing in `informationWithheld`.

use std::cell::RefCell;
use std::collections::HashMap;

use geo::{Distance as _, Geodesic, Point};
use species_key::Sensitivity;

/// A position as it may be published.
#[derive(Debug, Clone, PartialEq)]
pub struct PublicPlace {
    /// Latitude and longitude, already rounded; `None` when withheld or unknown.
    pub position: Option<(f64, f64)>,
    /// Decimal places worth printing for the position.
    pub decimals: usize,
    /// Metres; `None` when unknown or withheld.
    pub uncertainty_m: Option<f64>,
    /// What was made less precise (Darwin Core `dataGeneralizations`).
    pub generalizations: Option<String>,
    /// What exists but is not shared (Darwin Core `informationWithheld`).
    pub withheld: Option<String>,
    /// Whether photos and free text (remarks, names as typed) must be left out too: they
    /// can give the place, or the species, away.
    pub hide_media_and_remarks: bool,
}

/// The position as recorded, for full exports and species that are not sensitive.
pub fn as_recorded(position: Option<(f64, f64)>, uncertainty_m: Option<f64>) -> PublicPlace {
    PublicPlace {
        position,
        decimals: 6,
        uncertainty_m,
        generalizations: None,
        withheld: None,
        hide_media_and_remarks: false,
    }
}

/// The position to publish at `sensitivity`; `why` says for what, in words ("a
/// sensitive species"), for `dataGeneralizations` and `informationWithheld`.
pub fn public_place(
    position: Option<(f64, f64)>,
    uncertainty_m: Option<f64>,
    sensitivity: Sensitivity,
    why: &str,
) -> PublicPlace {
    if sensitivity.withholds_location() {
        return PublicPlace {
            position: None,
            decimals: 0,
            uncertainty_m: None,
            generalizations: Some(format!("Location withheld for {why} (Chapman 2020, GBIF).")),
            withheld: Some(format!(
                "location, time of day, observer, photos and free text withheld for {why}; assessors may ask the network"
            )),
            hide_media_and_remarks: true,
        };
    }
    let (Some(step), Some((lat, lon))) = (sensitivity.grid_degrees(), position) else {
        return as_recorded(position, uncertainty_m);
    };
    let decimals = (-step.log10()).round() as usize;
    let rounded = (round_to(lat, step).clamp(-90.0, 90.0), round_to(lon, step).clamp(-180.0, 180.0));
    let diagonal = cell_diagonal_m(rounded, step);
    let raised = (uncertainty_m.unwrap_or(0.0) + diagonal).ceil();
    PublicPlace {
        position: Some(rounded),
        decimals,
        uncertainty_m: Some(raised),
        generalizations: Some(format!(
            "Coordinates rounded to the nearest {step} degree for {why} (Chapman 2020, GBIF); \
             coordinateUncertaintyInMeters raised by the cell diagonal, {diagonal:.0} m."
        )),
        withheld: Some(format!(
            "precise location, time of day, observer, photos and free text withheld for {why}; assessors may ask the network"
        )),
        hide_media_and_remarks: true,
    }
}

/// Rounds to the nearest multiple of `step`, working in whole steps so that 0.1° steps
/// do not pick up binary fractions (52.35 → 52.4, not 52.300000000000004).
fn round_to(value: f64, step: f64) -> f64 {
    let per_degree = (1.0 / step).round();
    (value * per_degree).round() / per_degree
}

/// Geodesic length (WGS84) of the diagonal of the `step`-wide cell centred on `centre`.
/// It depends on the cell's latitude and size only, so each thread remembers the ones it
/// has measured: an export generalises many records in few rows of cells.
fn cell_diagonal_m((lat, lon): (f64, f64), step: f64) -> f64 {
    thread_local! {
        static MEASURED: RefCell<HashMap<(u64, u64), f64>> = RefCell::new(HashMap::new());
    }
    let measure = || {
        let half = step / 2.0;
        let south_west = Point::new(lon - half, (lat - half).max(-90.0));
        let north_east = Point::new(lon + half, (lat + half).min(90.0));
        Geodesic.distance(south_west, north_east)
    };
    MEASURED.with(|measured| {
        let mut measured = measured.borrow_mut();
        if measured.len() > MAX_REMEMBERED_ROWS {
            measured.clear();
        }
        *measured.entry((lat.to_bits(), step.to_bits())).or_insert_with(measure)
    })
}

/// How many rows of cells a thread remembers before it starts again (a few hundred kB).
const MAX_REMEMBERED_ROWS: usize = 10_000;

#[cfg(test)]
mod tests {
    use super::*;

    /// Degree lengths on WGS84 at latitude φ (from memory; good to about 1 m per degree):
    /// meridian 111132.954 − 559.822 cos 2φ, parallel 111412.84 cos φ − 93.5 cos 3φ.
    fn approximate_diagonal_m(lat: f64, step: f64) -> f64 {
        let phi = lat.to_radians();
        let north = (111_132.954 - 559.822 * (2.0 * phi).cos()) * step;
        let east = (111_412.84 * phi.cos() - 93.5 * (3.0 * phi).cos()) * step;
        north.hypot(east)
    }

    #[test]
    fn sensitive_positions_are_generalised_as_chapman_2020_recommends() {
        use Sensitivity::{HundredthDegree, TenthDegree, ThousandthDegree, Withhold};
        // (category, recorded position, recorded uncertainty, published position) — Chapman 2020 (GBIF).
        let cases = [
            (TenthDegree, (52.4321, -4.0876), Some(8.0), Some((52.4, -4.1))),
            (TenthDegree, (52.35, -4.05), None, Some((52.4, -4.1))),
            (HundredthDegree, (52.4321, -4.0876), Some(8.0), Some((52.43, -4.09))),
            (ThousandthDegree, (52.4321, -4.0876), Some(8.0), Some((52.432, -4.088))),
            (TenthDegree, (-33.8568, 151.2153), Some(30.0), Some((-33.9, 151.2))),
            (Withhold, (52.4321, -4.0876), Some(8.0), None),
        ];
        for (category, recorded, uncertainty, published) in cases {
            let place = public_place(Some(recorded), uncertainty, category, "a sensitive species");
            assert_eq!(place.position, published, "{category:?} {recorded:?}");
            assert!(
                place.generalizations.is_some() && place.withheld.is_some(),
                "{category:?}: recorded in dataGeneralizations and informationWithheld"
            );
            assert!(place.hide_media_and_remarks);
            match (published, category.grid_degrees()) {
                (Some((lat, _)), Some(step)) => {
                    let expected = uncertainty.unwrap_or(0.0) + approximate_diagonal_m(lat, step);
                    let got = place.uncertainty_m.unwrap();
                    assert!(
                        (got - expected).abs() < expected * 0.002 + 1.0,
                        "{category:?}: {got} m, expected about {expected} m"
                    );
                }
                _ => assert_eq!(place.uncertainty_m, None, "withheld: no uncertainty"),
            }
        }
    }

    #[test]
    fn cell_diagonals_at_the_equator_match_the_published_figures() {
        // Chapman 2020 (GBIF), via a summary: about 15.7 km, 1.57 km and 157 m at the equator.
        for (step, published) in [(0.1, 15_700.0), (0.01, 1_570.0), (0.001, 157.0)] {
            let diagonal = cell_diagonal_m((0.0, 0.0), step);
            assert!((diagonal - published).abs() < published * 0.005, "{step}°: {diagonal} m");
        }
    }

    #[test]
    fn species_that_are_not_sensitive_keep_their_position() {
        let place = public_place(Some((52.4321, -4.0876)), Some(8.0), Sensitivity::None, "");
        assert_eq!(place, as_recorded(Some((52.4321, -4.0876)), Some(8.0)));
        let no_position = public_place(None, None, Sensitivity::TenthDegree, "a sensitive species");
        assert_eq!(no_position.position, None);
    }
}
