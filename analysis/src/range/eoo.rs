//! Extent of occurrence: the minimum convex polygon round the records on the globe, and its
//! area on the WGS84 ellipsoid.
//!
//! The polygon is convex on the globe, not in a map: its edges are great circles. The
//! records are projected by the gnomonic projection centred among them, in which every
//! great circle is a straight line, so the plane hull of the projected records is exactly
//! the hull on the sphere; the centre is the records' mean direction, or one found by
//! iteration when the mean leaves a record behind the horizon (`sphere::hemisphere_centre`).
//! This holds for any set within one hemisphere, across the antimeridian and round a pole
//! alike. Records that do not lie within one hemisphere have no minimum convex polygon
//! smaller than half the Earth; [`EooError::NotInOneHemisphere`] says so.
//!
//! The corners' polygon is then measured with geodesic edges on WGS84 (Karney 2013,
//! through `geo`), as the IUCN Guidelines ask for an area on the ellipsoid. Great circles
//! of the sphere and geodesics of the ellipsoid between the same corners part by under 100 m
//! over 1,000 km (measured with GeographicLib's geodesics for lines between 0° and 70°), so
//! a record that close to an edge may be a corner by one and not by the other; the area
//! then differs by the thin triangle it adds, under 0.1% of any hull with edges that long.

use geo::{Coord, GeodesicArea, LineString, Polygon};
use serde::Serialize;
use thiserror::Error;

use super::hull::convex_hull;
use crate::coordinates::LatLon;
use crate::sphere::{
    Gnomonic, MIN_HEMISPHERE_COSINE, Vec3, dot, great_circle_steps, hemisphere_centre, mean_direction, to_lat_lon,
    unit_vector,
};

/// The extent of occurrence of a set of records.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Eoo {
    /// Geodesic area of the minimum convex polygon, km²; 0 when the hull has fewer than
    /// three corners (fewer than three distinct places, or all on one great circle).
    pub area_km2: f64,
    /// Corners of the hull, anticlockwise seen from above, without repeating the first.
    pub hull: Vec<LatLon>,
    /// Which input records are the corners, in the order of `hull`.
    #[serde(skip)]
    pub hull_indices: Vec<usize>,
    /// Centre of the gnomonic projection the hull was drawn in; `None` with no records.
    pub projection_centre: Option<LatLon>,
    /// How many records went in.
    pub point_count: usize,
}

/// Why an extent of occurrence could not be measured.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum EooError {
    /// No hemisphere holds every record.
    #[error(
        "the {count} records do not lie within one hemisphere, so their minimum convex polygon would cover \
         half the Earth or more (over 255 million km², far above every B1 threshold); no EOO is given"
    )]
    NotInOneHemisphere {
        /// How many records went in.
        count: usize,
    },
}

/// Computes the extent of occurrence of `points`.
pub fn eoo(points: &[LatLon]) -> Result<Eoo, EooError> {
    let vectors: Vec<Vec3> = points.iter().map(|p| unit_vector(*p)).collect();
    eoo_of_vectors(points, &vectors).map(|(eoo, _)| eoo)
}

/// [`eoo`] with the records' unit vectors already at hand; also gives the plane the hull
/// was drawn in (`None` with no records).
pub(crate) fn eoo_of_vectors(points: &[LatLon], vectors: &[Vec3]) -> Result<(Eoo, Option<GnomonicPlane>), EooError> {
    if points.is_empty() {
        let empty =
            Eoo { area_km2: 0.0, hull: Vec::new(), hull_indices: Vec::new(), projection_centre: None, point_count: 0 };
        return Ok((empty, None));
    }
    let plane = GnomonicPlane::of(vectors).ok_or(EooError::NotInOneHemisphere { count: points.len() })?;
    let hull_indices = without_slivers(&plane.points, convex_hull(&plane.points));
    let hull: Vec<LatLon> = hull_indices.iter().map(|&i| points[i]).collect();
    let eoo = Eoo {
        area_km2: polygon_area_km2(&hull),
        hull,
        hull_indices,
        projection_centre: Some(to_lat_lon(plane.centre)),
        point_count: points.len(),
    };
    Ok((eoo, Some(plane)))
}

/// A hull this thin (twice its area over its perimeter squared; about its width over eight
/// times its length) is records on one great circle whose projected positions differ from a
/// line only by rounding: 8 µm across 1,000 km. It is taken as the line it is.
const FLAT_HULL_RATIO: f64 = 1e-12;

/// The corners, or the line's two ends when the hull is a sliver of rounding (see
/// [`FLAT_HULL_RATIO`]), so that records on one great circle have no area, as on the sphere.
fn without_slivers(points: &[[f64; 2]], corners: Vec<usize>) -> Vec<usize> {
    if corners.len() < 3 {
        return corners;
    }
    let ring = corners.iter().zip(corners.iter().cycle().skip(1)).map(|(&a, &b)| (points[a], points[b]));
    let (twice_area, perimeter) = ring.fold((0.0, 0.0), |(area, length), (p, q)| {
        (area + p[0] * q[1] - q[0] * p[1], length + (q[0] - p[0]).hypot(q[1] - p[1]))
    });
    if twice_area.abs() > FLAT_HULL_RATIO * perimeter * perimeter {
        return corners;
    }
    let distance = |a: usize, b: usize| (points[a][0] - points[b][0]).hypot(points[a][1] - points[b][1]);
    let pairs = corners.iter().flat_map(|&a| corners.iter().map(move |&b| (a, b)));
    let (a, b) = pairs.max_by(|x, y| distance(x.0, x.1).total_cmp(&distance(y.0, y.1))).expect("three corners");
    vec![a, b]
}

/// The records projected onto the gnomonic plane centred among them.
pub(crate) struct GnomonicPlane {
    pub(crate) centre: Vec3,
    pub(crate) points: Vec<[f64; 2]>,
}

impl GnomonicPlane {
    /// `None` when no hemisphere holds every vector.
    ///
    /// The mean direction is tried first, checking each record as it is projected; only
    /// when a record lies behind (or on) its horizon is a centre searched for.
    pub(crate) fn of(vectors: &[Vec3]) -> Option<Self> {
        let mean = mean_direction(vectors.iter().copied()).or_else(|| vectors.first().copied())?;
        if let Some(points) = project_all(vectors, mean) {
            return Some(Self { centre: mean, points });
        }
        let centre = hemisphere_centre(vectors)?;
        Some(Self { centre, points: project_all(vectors, centre)? })
    }
}

/// Every vector's gnomonic coordinates about `centre`, or `None` when one lies within
/// [`MIN_HEMISPHERE_COSINE`] of the horizon or beyond it.
fn project_all(vectors: &[Vec3], centre: Vec3) -> Option<Vec<[f64; 2]>> {
    let projection = Gnomonic::new(centre);
    vectors
        .iter()
        .map(|v| if dot(*v, centre) > MIN_HEMISPHERE_COSINE { projection.forward(*v) } else { None })
        .collect()
}

/// Geodesic area in km² of the polygon with these corners in order (either winding).
///
/// Edges are geodesics on WGS84. The polygon must be smaller than half the Earth; a ring
/// with fewer than three corners has area 0.
pub fn polygon_area_km2(corners: &[LatLon]) -> f64 {
    if corners.len() < 3 {
        return 0.0;
    }
    let ring: LineString = corners.iter().map(|p| Coord { x: p.lon(), y: p.lat() }).collect();
    Polygon::new(ring, vec![]).geodesic_area_signed().abs() / 1e6
}

/// The hull's outline for drawing: each edge followed along its great circle in
/// `steps_per_edge` pieces, the ring closed.
pub fn hull_outline(hull: &[LatLon], steps_per_edge: usize) -> Vec<LatLon> {
    let mut outline: Vec<LatLon> = hull
        .iter()
        .zip(hull.iter().cycle().skip(1))
        .flat_map(|(a, b)| great_circle_steps(*a, *b, steps_per_edge))
        .collect();
    outline.extend(hull.first());
    outline
}
