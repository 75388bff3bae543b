//! How much EOO and AOO rest on a few records: both figures recomputed on resamples of the
//! records (the bootstrap: as many records as there are, drawn with replacement), with the
//! middle 95% of the resampled values.
//!
//! A resample holds on average about 63% of the distinct records (1 − 1/e), so resampled
//! hulls and cell counts are smaller than the full set's by nature: the spread is read as
//! stability — a figure whose resamples keep at least 90% of it rests on many records, one
//! whose resamples can lose half of it rests on a few — not as an interval round the true
//! range, which records can only underestimate. The draws come from [`SplitMix64`] with a
//! stated seed, so the same records give the same intervals, and the reference scripts can
//! draw the same resamples to check every value.
//!
//! A million records resampled 200 times would mean 200 hulls of a million points; instead
//! the hull of a resample is drawn from the records on the outer few convex layers of the
//! whole set, and checked: when it holds every corner of the next layer inside, no deeper
//! record can be a corner either, so it is exact; when it does not, the resample's hull is
//! drawn from all its records.

use serde::Serialize;

use super::RangeSummary;
use super::aoo::CellsOfRecords;
use super::eoo::{GnomonicPlane, polygon_area_km2};
use super::hull::{convex_hull, orientation};
use crate::coordinates::LatLon;
use crate::random::SplitMix64;

/// From this many records on, resampled hulls start from the outer layers.
const LAYERS_FROM: usize = 10_000;
/// How many outer convex layers the resampled hulls start from.
const LAYERS: usize = 4;

/// A figure and the spread of its resampled values.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Spread {
    /// The figure from all the records.
    pub observed: f64,
    /// The median of the resampled values.
    pub median: f64,
    /// The 2.5th percentile of the resampled values.
    pub lower: f64,
    /// The 97.5th percentile of the resampled values.
    pub upper: f64,
}

impl Spread {
    fn of(observed: f64, mut values: Vec<f64>) -> Self {
        values.sort_by(f64::total_cmp);
        Self {
            observed,
            median: percentile(&values, 0.5),
            lower: percentile(&values, 0.025),
            upper: percentile(&values, 0.975),
        }
    }

    /// The share of the figure the low resamples keep, in words.
    fn steadiness(&self) -> &'static str {
        let kept = if self.observed > 0.0 { self.lower / self.observed } else { 1.0 };
        if kept >= 0.9 {
            "stable (resamples keep at least 90% of it)"
        } else if kept >= 0.5 {
            "sensitive to a few records (resamples keep 50–90% of it)"
        } else {
            "resting on a few records (resamples can lose over half of it)"
        }
    }
}

/// Percentile `p` (0–1) of sorted values by linear interpolation between order statistics
/// (Hyndman & Fan 1996 definition 7, numpy's default).
pub(crate) fn percentile(sorted: &[f64], p: f64) -> f64 {
    let h = (sorted.len() - 1) as f64 * p;
    let low = h.floor() as usize;
    let high = (low + 1).min(sorted.len() - 1);
    sorted[low] + (h - low as f64) * (sorted[high] - sorted[low])
}

/// The resampled spread of EOO and AOO.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Stability {
    /// How many resamples were drawn.
    pub resamples: usize,
    /// The generator's seed.
    pub seed: u64,
    /// The raw hull area (km²) and its spread; `None` with no EOO.
    pub eoo_km2: Option<Spread>,
    /// The fixed-grid AOO (km²) and its spread.
    pub aoo_km2: Spread,
    /// What the spread says, in words.
    pub text: String,
}

/// Resamples the records and recomputes EOO (when there is one) and AOO each time.
pub(crate) fn resampled(
    points: &[LatLon],
    plane: Option<&GnomonicPlane>,
    cells: &CellsOfRecords,
    summary: &RangeSummary,
    resamples: usize,
    seed: u64,
) -> Stability {
    let n = points.len();
    let mut rng = SplitMix64::new(seed);
    let hulls = plane.map(|plane| SubsetHull::new(&plane.points));
    let mut counter = CellCounter::new(cells);
    let mut drawn = vec![u32::MAX; n];
    let (mut eoo_values, mut aoo_values) = (Vec::with_capacity(resamples), Vec::with_capacity(resamples));
    for replicate in 0..resamples as u32 {
        counter.start();
        for _ in 0..n {
            let record = rng.below(n);
            drawn[record] = replicate;
            counter.add(record);
        }
        aoo_values.push(counter.count() as f64 * summary.aoo.cell_area_km2);
        if let Some(hulls) = &hulls {
            let corners = hulls.hull_of(|i| drawn[i] == replicate);
            eoo_values.push(area_of(points, &corners));
        }
    }
    let aoo_km2 = Spread::of(summary.aoo.area_km2, aoo_values);
    let eoo_km2 = summary.eoo.as_ref().filter(|_| hulls.is_some()).map(|e| Spread::of(e.area_km2, eoo_values));
    let text = stability_text(resamples, seed, eoo_km2.as_ref(), &aoo_km2);
    Stability { resamples, seed, eoo_km2, aoo_km2, text }
}

/// The geodesic area of the hull with these corners (indices into `points`).
pub(crate) fn area_of(points: &[LatLon], corners: &[usize]) -> f64 {
    let ring: Vec<LatLon> = corners.iter().map(|&i| points[i]).collect();
    polygon_area_km2(&ring)
}

fn stability_text(resamples: usize, seed: u64, eoo: Option<&Spread>, aoo: &Spread) -> String {
    let line = |name: &str, s: &Spread| {
        format!(
            "{name} {:.0} to {:.0} km² in 95% of resamples (median {:.0}; all records give {:.0}): {}",
            s.lower,
            s.upper,
            s.median,
            s.observed,
            s.steadiness()
        )
    };
    let mut parts = Vec::new();
    if let Some(eoo) = eoo {
        parts.push(line("EOO (hull area)", eoo));
    }
    parts.push(line("AOO", aoo));
    format!(
        "Resampling the records {resamples} times (bootstrap, seed {seed}): {}. A resample holds about two \
         thirds of the distinct records, so resampled figures are smaller by nature; the spread shows how \
         much each figure rests on a few records, not an interval round the true range, which records can \
         only underestimate.",
        parts.join("; ")
    )
}

/// Counts distinct cells among records added since the last start.
pub(crate) struct CellCounter<'a> {
    cells: &'a CellsOfRecords,
    stamp: Vec<u32>,
    round: u32,
    count: usize,
}

impl<'a> CellCounter<'a> {
    pub(crate) fn new(cells: &'a CellsOfRecords) -> Self {
        Self { cells, stamp: vec![0; cells.cells], round: 0, count: 0 }
    }

    pub(crate) fn start(&mut self) {
        self.round += 1;
        self.count = 0;
    }

    pub(crate) fn add(&mut self, record: usize) {
        let cell = self.cells.record_cell[record] as usize;
        if self.stamp[cell] != self.round {
            self.stamp[cell] = self.round;
            self.count += 1;
        }
    }

    pub(crate) fn count(&self) -> usize {
        self.count
    }
}

/// Hulls of subsets of one set of plane points.
pub(crate) struct SubsetHull<'a> {
    points: &'a [[f64; 2]],
    /// Points on the outer layers (all points for small sets).
    candidates: Vec<usize>,
    /// Corners of the next layer in, which a subset's hull must hold for the shortcut;
    /// `None` when the candidates are every point.
    guard: Option<Vec<[f64; 2]>>,
}

impl<'a> SubsetHull<'a> {
    pub(crate) fn new(points: &'a [[f64; 2]]) -> Self {
        if points.len() < LAYERS_FROM {
            return Self { points, candidates: (0..points.len()).collect(), guard: None };
        }
        let mut remaining: Vec<usize> = (0..points.len()).collect();
        let mut candidates = Vec::new();
        for _ in 0..LAYERS {
            let layer = hull_of_indices(points, &remaining);
            let mut on_layer = vec![false; points.len()];
            layer.iter().for_each(|&i| on_layer[i] = true);
            candidates.extend(&layer);
            remaining.retain(|&i| !on_layer[i]);
        }
        let guard = hull_of_indices(points, &remaining).into_iter().map(|i| points[i]).collect();
        Self { points, candidates, guard: Some(guard) }
    }

    /// Corners (indices into the points) of the hull of the points for which `chosen` holds.
    pub(crate) fn hull_of(&self, chosen: impl Fn(usize) -> bool) -> Vec<usize> {
        let subset: Vec<usize> = self.candidates.iter().copied().filter(|&i| chosen(i)).collect();
        let hull = hull_of_indices(self.points, &subset);
        match &self.guard {
            None => hull,
            Some(guard) if hull.len() >= 3 && guard.iter().all(|g| holds(self.points, &hull, *g)) => hull,
            Some(_) => {
                let every: Vec<usize> = (0..self.points.len()).filter(|&i| chosen(i)).collect();
                hull_of_indices(self.points, &every)
            }
        }
    }
}

/// The hull corners of the points at `indices`, as indices into `points`.
pub(crate) fn hull_of_indices(points: &[[f64; 2]], indices: &[usize]) -> Vec<usize> {
    let subset: Vec<[f64; 2]> = indices.iter().map(|&i| points[i]).collect();
    convex_hull(&subset).into_iter().map(|k| indices[k]).collect()
}

/// Whether `p` lies inside or on the anticlockwise hull with these corners.
fn holds(points: &[[f64; 2]], hull: &[usize], p: [f64; 2]) -> bool {
    hull.iter().zip(hull.iter().cycle().skip(1)).all(|(&a, &b)| orientation(points[a], points[b], p) >= 0.0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn percentiles_interpolate_like_numpy() {
        // numpy.percentile([1, 2, 3, 4], [2.5, 50, 97.5]) = 1.075, 2.5, 3.925 (definition 7).
        let values = [1.0, 2.0, 3.0, 4.0];
        assert!((percentile(&values, 0.025) - 1.075).abs() < 1e-12);
        assert_eq!(percentile(&values, 0.5), 2.5);
        assert!((percentile(&values, 0.975) - 3.925).abs() < 1e-12);
    }

    #[test]
    fn layered_hulls_of_subsets_equal_hulls_drawn_from_every_point() {
        // Two ways to one answer: the shortcut through the outer layers, and the plain hull.
        let mut rng = SplitMix64::new(5);
        let points: Vec<[f64; 2]> = (0..30_000).map(|_| [rng.uniform(), rng.uniform() * rng.uniform()]).collect();
        let hulls = SubsetHull::new(&points);
        assert!(hulls.guard.is_some());
        for round in 0..20 {
            let keep: Vec<bool> =
                (0..points.len()).map(|_| rng.uniform() < if round < 10 { 0.6 } else { 0.01 }).collect();
            let mut fast = hulls.hull_of(|i| keep[i]);
            let every: Vec<usize> = (0..points.len()).filter(|&i| keep[i]).collect();
            let mut plain = hull_of_indices(&points, &every);
            fast.sort_unstable();
            plain.sort_unstable();
            assert_eq!(fast, plain, "round {round}");
        }
    }
}
