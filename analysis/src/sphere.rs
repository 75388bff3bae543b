//! Positions as unit vectors: the common ground of the hull, the grid zones, clusters and
//! outliers, so that none of them cares where the antimeridian or the poles are.
//!
//! A position's unit vector is taken from its geodetic latitude and longitude as if the
//! Earth were a sphere (common practice for hulls and neighbourhoods on the globe). Great
//! circles of this sphere are what the minimum convex polygon's edges follow; its area is
//! then measured on the WGS84 ellipsoid (see `range::eoo`). Distances between records
//! (clusters, outliers) are great-circle distances on a sphere of the Earth's mean radius.

use crate::coordinates::LatLon;

/// The Earth's mean radius in km: IUGG R1 = (2a + b) / 3 for WGS84 (Moritz 1980, *Geodetic
/// Reference System 1980*; from memory), used for great-circle distances.
pub const MEAN_EARTH_RADIUS_KM: f64 = 6_371.008_8;

/// A point on the unit sphere (or any direction) as x, y, z.
pub(crate) type Vec3 = [f64; 3];

/// The unit vector of a position: x towards 0° N 0° E, y towards 0° N 90° E, z to the north pole.
pub(crate) fn unit_vector(p: LatLon) -> Vec3 {
    let (sin_lat, cos_lat) = p.lat().to_radians().sin_cos();
    let (sin_lon, cos_lon) = p.lon().to_radians().sin_cos();
    [cos_lat * cos_lon, cos_lat * sin_lon, sin_lat]
}

pub(crate) fn dot(a: Vec3, b: Vec3) -> f64 {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

pub(crate) fn cross(a: Vec3, b: Vec3) -> Vec3 {
    [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]]
}

fn norm(a: Vec3) -> f64 {
    dot(a, a).sqrt()
}

/// `a` scaled to length 1; `None` for a (nearly) zero vector.
pub(crate) fn normalised(a: Vec3) -> Option<Vec3> {
    let length = norm(a);
    (length > 1e-12).then(|| [a[0] / length, a[1] / length, a[2] / length])
}

/// The position a unit vector points at (longitude 0 at the poles).
pub(crate) fn to_lat_lon(v: Vec3) -> LatLon {
    let lat = v[2].clamp(-1.0, 1.0).asin().to_degrees();
    let lon = if v[0].hypot(v[1]) < 1e-15 { 0.0 } else { v[1].atan2(v[0]).to_degrees() };
    LatLon::new(lat, lon).expect("a unit vector's latitude and longitude are in range")
}

/// The angle between two positions seen from the Earth's centre, in degrees.
pub fn arc_degrees(a: LatLon, b: LatLon) -> f64 {
    arc_between(unit_vector(a), unit_vector(b)).to_degrees()
}

/// The angle between two unit vectors in radians, accurate for small and large angles.
pub(crate) fn arc_between(a: Vec3, b: Vec3) -> f64 {
    norm(cross(a, b)).atan2(dot(a, b))
}

/// The great-circle distance between two positions in km, on a sphere of the Earth's mean radius.
pub fn great_circle_km(a: LatLon, b: LatLon) -> f64 {
    arc_between(unit_vector(a), unit_vector(b)) * MEAN_EARTH_RADIUS_KM
}

/// The chord (straight-line distance between unit vectors) of a great-circle distance.
pub(crate) fn chord_of_km(km: f64) -> f64 {
    2.0 * (km / (2.0 * MEAN_EARTH_RADIUS_KM)).min(std::f64::consts::FRAC_PI_2).sin()
}

/// The direction of the sum of the vectors; `None` when they cancel out.
pub(crate) fn mean_direction(vectors: impl Iterator<Item = Vec3>) -> Option<Vec3> {
    normalised(vectors.fold([0.0; 3], |s, v| [s[0] + v[0], s[1] + v[1], s[2] + v[2]]))
}

/// Points on the great circle from `a` to `b` (the shorter way), `a` first, `b` excluded:
/// `steps` of them, evenly spaced. For drawing a hull's edges as they run on the globe.
pub fn great_circle_steps(a: LatLon, b: LatLon, steps: usize) -> Vec<LatLon> {
    let (u, v) = (unit_vector(a), unit_vector(b));
    let angle = arc_between(u, v);
    if angle < 1e-12 || steps == 0 {
        return vec![a];
    }
    (0..steps)
        .map(|i| {
            let t = i as f64 / steps as f64;
            let (wa, wb) = (((1.0 - t) * angle).sin() / angle.sin(), (t * angle).sin() / angle.sin());
            to_lat_lon([wa * u[0] + wb * v[0], wa * u[1] + wb * v[1], wa * u[2] + wb * v[2]])
        })
        .collect()
}

/// The gnomonic projection centred on a direction: great circles become straight lines.
///
/// Coordinates are on the plane touching the unit sphere at the centre, x east and y north;
/// only the open hemisphere round the centre can be projected.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Gnomonic {
    centre: Vec3,
    east: Vec3,
    north: Vec3,
}

impl Gnomonic {
    pub(crate) fn new(centre: Vec3) -> Self {
        // East is along the parallel through the centre; at a pole, towards 90° E.
        let east = normalised([-centre[1], centre[0], 0.0]).unwrap_or([0.0, 1.0, 0.0]);
        let north = cross(centre, east);
        Self { centre, east, north }
    }

    /// Plane coordinates of `v`, or `None` when it is not in front of the centre.
    pub(crate) fn forward(&self, v: Vec3) -> Option<[f64; 2]> {
        let depth = dot(v, self.centre);
        (depth > 0.0).then(|| [dot(v, self.east) / depth, dot(v, self.north) / depth])
    }
}

/// Directions closer than this to the edge of the hemisphere round a centre (as a cosine:
/// about 0.00006° inside it) count as outside, so gnomonic coordinates stay finite.
pub(crate) const MIN_HEMISPHERE_COSINE: f64 = 1e-6;

/// How many times [`hemisphere_centre`] widens its working set before it gives up.
const CENTRE_ROUNDS: usize = 12;
/// Steps of the centring iteration on the working set per round.
const CENTRE_STEPS: usize = 2_000;
/// Points added to the working set each round (the farthest from the current centre).
const WORKING_SET_GROWTH: usize = 64;

/// A direction every vector lies more than [`MIN_HEMISPHERE_COSINE`] in front of, or
/// `None` when none was found: the vectors do not lie within one hemisphere (or lie within
/// one only with almost nothing to spare).
///
/// The mean direction serves for most record sets. When it does not, a working set of the
/// vectors farthest from the current centre is centred by the Bădoiu–Clarkson iteration
/// (each step moves the centre a shrinking fraction of the way to the farthest vector,
/// which approaches the centre of the smallest cap holding them), the whole set is checked
/// again, and the farthest failures join the working set.
pub(crate) fn hemisphere_centre(vectors: &[Vec3]) -> Option<Vec3> {
    let first = *vectors.first()?;
    let mut centre = mean_direction(vectors.iter().copied()).unwrap_or(first);
    let mut working: Vec<Vec3> = Vec::new();
    for _ in 0..CENTRE_ROUNDS {
        let mut failures: Vec<(f64, usize)> = vectors
            .iter()
            .enumerate()
            .map(|(i, v)| (dot(*v, centre), i))
            .filter(|(cosine, _)| *cosine <= MIN_HEMISPHERE_COSINE)
            .collect();
        if failures.is_empty() {
            return Some(centre);
        }
        let growth = failures.len().min(WORKING_SET_GROWTH);
        failures.select_nth_unstable_by(growth - 1, |a, b| a.0.total_cmp(&b.0));
        working.extend(failures[..growth].iter().map(|(_, i)| vectors[*i]));
        working.push(centre);
        centre = centred_on(&working, centre);
    }
    None
}

/// The Bădoiu–Clarkson iteration on the sphere: `CENTRE_STEPS` moves towards the farthest vector.
fn centred_on(vectors: &[Vec3], start: Vec3) -> Vec3 {
    let mut centre = start;
    for step in 1..=CENTRE_STEPS {
        let farthest = vectors.iter().copied().min_by(|a, b| dot(*a, centre).total_cmp(&dot(*b, centre)));
        let Some(far) = farthest else { return centre };
        let t = 1.0 / (step as f64 + 1.0);
        let moved = [0, 1, 2].map(|k| centre[k] + t * (far[k] - centre[k]));
        centre = normalised(moved).unwrap_or(centre);
    }
    centre
}

#[cfg(test)]
mod tests {
    use super::*;

    fn at(lat: f64, lon: f64) -> LatLon {
        LatLon::new(lat, lon).unwrap()
    }

    #[test]
    fn distances_follow_the_great_circle() {
        // Arithmetic on the sphere: a quarter of the equator, and one degree of a meridian.
        let quarter = great_circle_km(at(0.0, 0.0), at(0.0, 90.0));
        assert!((quarter - MEAN_EARTH_RADIUS_KM * std::f64::consts::FRAC_PI_2).abs() < 1e-9);
        assert!(
            (great_circle_km(at(10.0, 179.5), at(10.0, -179.5)) - great_circle_km(at(10.0, 0.0), at(10.0, 1.0))).abs()
                < 1e-9
        );
        assert!((arc_degrees(at(89.0, 0.0), at(89.0, 180.0)) - 2.0).abs() < 1e-9);
    }

    #[test]
    fn the_gnomonic_projection_keeps_great_circles_straight() {
        // Common practice (the gnomonic projection's defining property): three points on one
        // great circle project onto one line.
        let g = Gnomonic::new(unit_vector(at(60.0, 20.0)));
        let [a, b] = [at(60.0, 0.0), at(60.0, 40.0)];
        let mid = great_circle_steps(a, b, 2)[1];
        let [p, q, r] = [a, mid, b].map(|x| g.forward(unit_vector(x)).unwrap());
        let area = (q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0]);
        assert!(area.abs() < 1e-12, "{area}");
        assert!(g.forward(unit_vector(at(-30.0, -160.0))).is_none(), "the far side cannot be projected");
    }

    #[test]
    fn a_centre_is_found_when_the_mean_is_not_one() {
        // Many points at 0° E and one at 170° E: the mean leaves the lone point behind the
        // horizon, but the hemisphere centred on 85° E holds them all.
        let mut vectors = vec![unit_vector(at(0.0, 0.0)); 50];
        vectors.push(unit_vector(at(0.0, 170.0)));
        let centre = hemisphere_centre(&vectors).unwrap();
        assert!(vectors.iter().all(|v| dot(*v, centre) > MIN_HEMISPHERE_COSINE));
        let opposite = [at(0.0, 0.0), at(0.0, 120.0), at(0.0, -120.0)].map(unit_vector);
        assert!(hemisphere_centre(&opposite).is_none(), "three points round the equator fit no hemisphere");
    }
}
