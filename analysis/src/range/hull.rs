//! The convex hull of points in a plane, as indices into the caller's points, with exact
//! orientation tests, fast enough for a million records.
//!
//! Andrew's monotone chain gives the hull of points sorted by x. Sorting a million points
//! is most of the work, so most of them are first dropped: the hull of an evenly spaced
//! sample (every `SAMPLE_STEP`-th point, plus the extremes) is drawn, and a point strictly
//! inside it cannot be a corner of the whole hull, because the sample's hull lies inside
//! the whole hull. A point is dropped only when plain floating-point arithmetic is sure of
//! it (its orientation exceeds the rounding bound of Shewchuk's first stage), so any doubt
//! keeps the point; the chain itself takes its signs from Shewchuk's adaptive exact
//! predicate (the `robust` crate), so nearly collinear corners are decided correctly.

use robust::{Coord, orient2d};

/// One point in this many goes into the sample hull that screens the rest.
const SAMPLE_STEP: usize = 64;
/// Below this many points the screening costs more than it saves.
const SCREEN_FROM: usize = 4_096;

/// Twice the signed area of the triangle a, b, c: positive when they turn anticlockwise.
pub(crate) fn orientation(a: [f64; 2], b: [f64; 2], c: [f64; 2]) -> f64 {
    let coord = |p: [f64; 2]| Coord { x: p[0], y: p[1] };
    orient2d(coord(a), coord(b), coord(c))
}

/// Indices of the hull's corners, anticlockwise, starting from the lowest x (then lowest y).
///
/// Points on an edge between two corners are not corners. Fewer than three corners means
/// the points are all at one place or on one line.
pub(crate) fn convex_hull(points: &[[f64; 2]]) -> Vec<usize> {
    let candidates: Vec<usize> = if points.len() >= SCREEN_FROM {
        let sample = monotone_chain(points, sample_indices(points));
        if sample.len() >= 3 {
            // The sample's own corners are on its boundary, so they are kept.
            let screen = Screen::new(points, &sample);
            (0..points.len()).filter(|&i| !screen.surely_inside(points[i])).collect()
        } else {
            (0..points.len()).collect()
        }
    } else {
        (0..points.len()).collect()
    };
    monotone_chain(points, candidates)
}

/// Every `SAMPLE_STEP`-th point and the four points extreme in x and y.
fn sample_indices(points: &[[f64; 2]]) -> Vec<usize> {
    let mut extremes = [0usize; 4];
    for (i, p) in points.iter().enumerate() {
        let [west, east, south, north] = extremes;
        if p[0] < points[west][0] {
            extremes[0] = i;
        }
        if p[0] > points[east][0] {
            extremes[1] = i;
        }
        if p[1] < points[south][1] {
            extremes[2] = i;
        }
        if p[1] > points[north][1] {
            extremes[3] = i;
        }
    }
    (0..points.len()).step_by(SAMPLE_STEP).chain(extremes).collect()
}

/// Andrew's monotone chain over the given indices.
fn monotone_chain(points: &[[f64; 2]], mut indices: Vec<usize>) -> Vec<usize> {
    indices
        .sort_unstable_by(|&a, &b| points[a][0].total_cmp(&points[b][0]).then(points[a][1].total_cmp(&points[b][1])));
    indices.dedup_by(|a, b| points[*a] == points[*b]);
    if indices.len() < 3 {
        return indices;
    }
    let mut hull = half_hull(points, indices.iter().copied());
    let upper = half_hull(points, indices.iter().rev().copied());
    // Each half ends where the other starts.
    hull.pop();
    hull.extend(&upper[..upper.len() - 1]);
    hull
}

/// The chain of left turns through the points in the given order (the lower half of the
/// hull for increasing x, the upper half for decreasing x).
fn half_hull(points: &[[f64; 2]], ordered: impl Iterator<Item = usize>) -> Vec<usize> {
    let mut chain: Vec<usize> = Vec::with_capacity(64);
    for i in ordered {
        while chain.len() >= 2
            && orientation(points[chain[chain.len() - 2]], points[chain[chain.len() - 1]], points[i]) <= 0.0
        {
            chain.pop();
        }
        chain.push(i);
    }
    chain
}

/// Twice the signed area of a, b, c in plain floating point, and whether its sign is sure:
/// beyond the error bound of Shewchuk's first stage, (3 + 16ε)ε times the sum of the
/// products' magnitudes (Shewchuk 1997, "Adaptive precision floating-point arithmetic and
/// fast robust geometric predicates", §4.1; from memory).
fn sure_orientation(a: [f64; 2], b: [f64; 2], c: [f64; 2]) -> Option<f64> {
    let left = (b[0] - a[0]) * (c[1] - a[1]);
    let right = (b[1] - a[1]) * (c[0] - a[0]);
    let det = left - right;
    let bound = (3.0 + 16.0 * f64::EPSILON) * f64::EPSILON * (left.abs() + right.abs());
    (det.abs() > bound).then_some(det)
}

/// Buckets of direction round the screen's centre, for finding a point's fan triangle.
const DIRECTION_BUCKETS: usize = 512;
/// Directions (pseudo-angles) this far inside a wedge surely belong to it.
const WEDGE_MARGIN: f64 = 1e-9;

/// A convex polygon that screens out points surely inside it: the polygon is a fan of
/// triangles round an interior point, and a point is dropped when it is surely strictly
/// inside the triangle whose directions hold it (found through a table of directions).
struct Screen {
    centre: [f64; 2],
    /// Corners in order of direction from the centre, starting from the smallest.
    corners: Vec<[f64; 2]>,
    /// Each corner's direction from the centre, as a pseudo-angle in [0, 4).
    directions: Vec<f64>,
    /// For each bucket of direction, the last corner at or before its start (or the last
    /// corner, for buckets before the first corner's direction).
    first_corner: Vec<usize>,
    /// An axis-aligned box inside the polygon: points in it need no further test.
    inner_box: Option<[f64; 4]>,
}

/// A number that increases with the direction of (dx, dy), 0 along +x, 1 along +y, 2
/// along −x, 3 along −y, without trigonometry.
fn pseudo_angle(dx: f64, dy: f64) -> f64 {
    let sum = dx.abs() + dy.abs();
    match (dx >= 0.0, dy >= 0.0) {
        (true, true) => dy / sum,
        (false, true) => 1.0 - dx / sum,
        (false, false) => 2.0 - dy / sum,
        (true, false) => 3.0 + dx / sum,
    }
}

impl Screen {
    fn new(points: &[[f64; 2]], hull: &[usize]) -> Self {
        let n = hull.len() as f64;
        let centre = hull.iter().fold([0.0, 0.0], |c, &i| [c[0] + points[i][0] / n, c[1] + points[i][1] / n]);
        let mut corners: Vec<([f64; 2], f64)> = hull
            .iter()
            .map(|&i| (points[i], pseudo_angle(points[i][0] - centre[0], points[i][1] - centre[1])))
            .collect();
        corners.sort_by(|a, b| a.1.total_cmp(&b.1));
        let directions: Vec<f64> = corners.iter().map(|c| c.1).collect();
        let first_corner = (0..DIRECTION_BUCKETS)
            .map(|b| {
                let start = 4.0 * b as f64 / DIRECTION_BUCKETS as f64;
                directions.iter().rposition(|&d| d <= start).unwrap_or(directions.len() - 1)
            })
            .collect();
        let corners: Vec<[f64; 2]> = corners.into_iter().map(|c| c.0).collect();
        let inner_box = inner_box(&corners);
        Self { centre, corners, directions, first_corner, inner_box }
    }

    /// True only when `p` is surely strictly inside the polygon.
    fn surely_inside(&self, p: [f64; 2]) -> bool {
        if let Some([west, south, east, north]) = self.inner_box
            && p[0] > west
            && p[0] < east
            && p[1] > south
            && p[1] < north
        {
            return true;
        }
        let (dx, dy) = (p[0] - self.centre[0], p[1] - self.centre[1]);
        if dx == 0.0 && dy == 0.0 {
            return true;
        }
        let direction = pseudo_angle(dx, dy);
        let bucket = ((direction / 4.0 * DIRECTION_BUCKETS as f64) as usize).min(DIRECTION_BUCKETS - 1);
        let n = self.corners.len();
        let mut k = self.first_corner[bucket];
        // Step on to the last corner whose direction is at or before the point's.
        while k + 1 < n && self.directions[k + 1] <= direction {
            k += 1;
        }
        let (a, b) = (self.corners[k], self.corners[(k + 1) % n]);
        let positive = |u, v| sure_orientation(u, v, p).is_some_and(|d| d > 0.0);
        // Well between the two corners' directions, the point is surely in this triangle's
        // wedge (pseudo-angles are good to a few units in the last place); then only the
        // outer edge needs testing.
        let next_direction = if k + 1 < n { self.directions[k + 1] } else { self.directions[0] + 4.0 };
        let well_inside_wedge =
            direction > self.directions[k] + WEDGE_MARGIN && direction + WEDGE_MARGIN < next_direction;
        (well_inside_wedge || (positive(self.centre, a) && positive(b, self.centre))) && positive(a, b)
    }
}

/// A box well inside a convex polygon (anticlockwise corners): over the middle `share` of
/// its width, the polygon's lower edge is highest and its upper edge lowest at the ends
/// (the lower boundary is convex, the upper concave), so the box between them fits; the
/// widest of a few shares is kept, shrunk by a millionth of the polygon's size for
/// rounding. `None` when no box fits.
fn inner_box(corners: &[[f64; 2]]) -> Option<[f64; 4]> {
    let (west, east) = corners.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(w, e), p| (w.min(p[0]), e.max(p[0])));
    let span = east - west;
    let margin = 1e-6 * span.max(corners.iter().fold(0.0_f64, |m, p| m.max(p[1].abs())));
    let mut best: Option<([f64; 4], f64)> = None;
    for share in [0.3, 0.5, 0.7, 0.9] {
        let (x0, x1) = (west + span * (1.0 - share) / 2.0, east - span * (1.0 - share) / 2.0);
        let ([low0, high0], [low1, high1]) = (vertical_extent(corners, x0)?, vertical_extent(corners, x1)?);
        let (south, north) = (low0.max(low1) + margin, high0.min(high1) - margin);
        let area = (x1 - x0) * (north - south);
        if north > south && best.is_none_or(|(_, a)| area > a) {
            best = Some(([x0 + margin, south, x1 - margin, north], area));
        }
    }
    best.map(|(b, _)| b)
}

/// The lowest and highest y of the polygon's boundary at `x`.
fn vertical_extent(corners: &[[f64; 2]], x: f64) -> Option<[f64; 2]> {
    let mut found: Option<[f64; 2]> = None;
    for (a, b) in corners.iter().zip(corners.iter().cycle().skip(1)) {
        if (a[0] <= x && x <= b[0]) || (b[0] <= x && x <= a[0]) {
            let y = if a[0] == b[0] { a[1].min(b[1]) } else { a[1] + (b[1] - a[1]) * (x - a[0]) / (b[0] - a[0]) };
            found = Some(found.map_or([y, y], |[low, high]| [low.min(y), high.max(y)]));
        }
    }
    found
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_square_with_inner_and_edge_points_has_its_four_corners() {
        // Arithmetic: the corners of the unit square, anticlockwise from the lowest x and y.
        let points = [[0.5, 0.5], [0.0, 0.0], [1.0, 0.0], [0.5, 0.0], [1.0, 1.0], [0.0, 1.0], [0.0, 1.0]];
        assert_eq!(convex_hull(&points), vec![1, 2, 4, 5]);
        assert!(convex_hull(&[[0.0, 0.0], [1.0, 1.0], [2.0, 2.0]]).len() < 3, "collinear points have no area");
    }

    #[test]
    fn screening_a_large_set_gives_the_same_corners_as_the_plain_chain() {
        // Two ways to one answer: the screened hull and the chain over every point.
        let mut state = 7u64;
        let mut next = || {
            state = state.wrapping_mul(6_364_136_223_846_793_005).wrapping_add(1_442_695_040_888_963_407);
            (state >> 11) as f64 / (1u64 << 53) as f64
        };
        for shape in 0..3 {
            let points: Vec<[f64; 2]> = (0..20_000)
                .map(|_| {
                    let (a, r) = (next() * std::f64::consts::TAU, next());
                    match shape {
                        0 => [next(), next()],
                        1 => [a.cos(), a.sin()],
                        _ => [r * a.cos() * 3.0, (a * 5.0).sin() * 0.1 + r],
                    }
                })
                .collect();
            let mut screened = convex_hull(&points);
            let mut plain = monotone_chain(&points, (0..points.len()).collect());
            screened.sort_unstable();
            plain.sort_unstable();
            assert_eq!(screened, plain, "shape {shape}");
        }
    }
}
