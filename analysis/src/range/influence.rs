//! Which places the figures rest on: EOO and AOO recomputed without each place in turn
//! (leave one out), so that a reviewer checks first the records whose removal would change
//! the figures most.
//!
//! A place is a distinct position; leaving it out removes every record made there. Only a
//! corner of the hull changes EOO when left out: without corner v, the hull is that of the
//! other corners and of the records inside the triangle v makes with its two neighbouring
//! corners (the only region the hull loses), so each corner costs one pass over the records.
//! A place changes AOO only when it is alone in its cell, and then by one cell.

use serde::Serialize;

use super::aoo::CellsOfRecords;
use super::clusters::Places;
use super::eoo::{Eoo, GnomonicPlane};
use super::hull::orientation;
use super::stability::{area_of, hull_of_indices};
use crate::coordinates::LatLon;

/// What leaving one place out does to the figures.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Influence {
    /// The place.
    pub position: LatLon,
    /// The records made there (indices into the records given).
    pub records: Vec<usize>,
    /// Change in the hull area (km²) without this place; `None` with no EOO.
    pub eoo_change_km2: Option<f64>,
    /// Change in the fixed-grid AOO (km²) without this place.
    pub aoo_change_km2: f64,
}

/// The `top` places whose removal changes EOO most (the hull's corners, largest loss
/// first, each with its AOO change), and how many places are alone in their cell.
pub(crate) fn leave_one_place_out(
    points: &[LatLon],
    plane: Option<&GnomonicPlane>,
    eoo: Option<&Eoo>,
    cells: &CellsOfRecords,
    cell_area_km2: f64,
    top: usize,
) -> (Vec<Influence>, usize) {
    let places = Places::of(points);
    let mut places_in_cell = vec![0usize; cells.cells];
    for records in &places.records {
        places_in_cell[cells.record_cell[records[0]] as usize] += 1;
    }
    let alone = |records: &[usize]| places_in_cell[cells.record_cell[records[0]] as usize] == 1;
    let alone_count = places.records.iter().filter(|r| alone(r)).count();
    let (Some(plane), Some(eoo)) = (plane, eoo) else { return (Vec::new(), alone_count) };
    let place_of_record = {
        let mut place_of = vec![0usize; points.len()];
        for (place, records) in places.records.iter().enumerate() {
            records.iter().for_each(|&r| place_of[r] = place);
        }
        place_of
    };
    let corners = &eoo.hull_indices;
    let mut found: Vec<Influence> = if corners.len() < 3 {
        Vec::new()
    } else {
        (0..corners.len())
            .map(|k| {
                let place = place_of_record[corners[k]];
                let without = hull_without_corner(&plane.points, corners, k, |i| place_of_record[i] == place);
                let records = places.records[place].clone();
                Influence {
                    position: places.positions[place],
                    eoo_change_km2: Some(area_of(points, &without) - eoo.area_km2),
                    aoo_change_km2: if alone(&records) { -cell_area_km2 } else { 0.0 },
                    records,
                }
            })
            .collect()
    };
    found.sort_by(|a, b| {
        let loss = |i: &Influence| i.eoo_change_km2.unwrap_or(0.0);
        loss(a).total_cmp(&loss(b)).then(a.records[0].cmp(&b.records[0]))
    });
    found.truncate(top);
    (found, alone_count)
}

/// The hull's corners once corner `k` (and every record `removed` says belongs with it) is gone.
fn hull_without_corner(
    points: &[[f64; 2]],
    corners: &[usize],
    k: usize,
    removed: impl Fn(usize) -> bool,
) -> Vec<usize> {
    let n = corners.len();
    let (previous, corner, next) = (points[corners[(k + n - 1) % n]], points[corners[k]], points[corners[(k + 1) % n]]);
    let xs = [previous[0], corner[0], next[0]];
    let ys = [previous[1], corner[1], next[1]];
    let (west, east) =
        (xs.iter().copied().fold(f64::INFINITY, f64::min), xs.iter().copied().fold(f64::NEG_INFINITY, f64::max));
    let (south, north) =
        (ys.iter().copied().fold(f64::INFINITY, f64::min), ys.iter().copied().fold(f64::NEG_INFINITY, f64::max));
    let in_triangle = |p: [f64; 2]| {
        (west..=east).contains(&p[0])
            && (south..=north).contains(&p[1])
            && orientation(previous, corner, p) >= 0.0
            && orientation(corner, next, p) >= 0.0
            && orientation(next, previous, p) >= 0.0
    };
    let mut candidates: Vec<usize> = corners.iter().enumerate().filter(|(j, _)| *j != k).map(|(_, &i)| i).collect();
    candidates.extend((0..points.len()).filter(|&i| !removed(i) && in_triangle(points[i])));
    hull_of_indices(points, &candidates)
}
