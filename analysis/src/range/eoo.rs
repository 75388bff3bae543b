//! Extent of occurrence: the geodesic area of the minimum convex polygon around the records.
//!
//! The hull is drawn in the plane of longitude and latitude (the usual minimum convex
//! polygon) and its area is then measured on the WGS84 ellipsoid with geodesic edges
//! (Karney 2013, through `geo`), as the IUCN Guidelines ask for an area on the ellipsoid
//! rather than on a flat projection.

use geo::{ConvexHull, Coord, GeodesicArea, LineString, MultiPoint, Point, Polygon};
use serde::Serialize;

use crate::coordinates::LatLon;

/// How longitudes were read before the hull was drawn.
///
/// Rule: when the points have both western (negative) and eastern longitudes, they are
/// read in whichever frame gives the narrower span of longitudes, ties going to
/// [`LongitudeFrame::Signed`]; points all on one side of the Greenwich meridian have the
/// same shape in both frames and stay signed. A set straddling the ±180° meridian, say
/// from 175° E to 175° W, spans 350° in the signed frame but 10° in the positive frame, so
/// its hull is drawn the short way round the globe.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum LongitudeFrame {
    /// Longitudes in [−180°, 180°], as recorded.
    Signed,
    /// Longitudes in [0°, 360°): western longitudes have 360° added.
    Positive,
}

/// The extent of occurrence of a set of records.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Eoo {
    /// Geodesic area of the minimum convex polygon, km²; 0 when the hull has fewer than
    /// three corners (fewer than three distinct points, or all points on one line).
    pub area_km2: f64,
    /// Corners of the hull, anticlockwise, without repeating the first corner.
    pub hull: Vec<LatLon>,
    /// The longitude frame the hull was drawn in; see [`LongitudeFrame`].
    pub longitude_frame: LongitudeFrame,
    /// How many records went in.
    pub point_count: usize,
}

/// Computes the extent of occurrence of `points`.
pub fn eoo(points: &[LatLon]) -> Eoo {
    let longitude_frame = narrower_frame(points);
    let hull = hull_in_frame(points, longitude_frame);
    let corners: Vec<LatLon> = hull.exterior().coords().skip(1).map(|c| to_lat_lon(*c)).collect();
    let area_km2 = if corners.len() < 3 { 0.0 } else { hull.geodesic_area_signed().abs() / 1e6 };
    Eoo { area_km2, hull: corners, longitude_frame, point_count: points.len() }
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

/// Picks the longitude frame with the narrower span, as documented on [`LongitudeFrame`].
fn narrower_frame(points: &[LatLon]) -> LongitudeFrame {
    let has_west = points.iter().any(|p| p.lon() < 0.0);
    let has_east = points.iter().any(|p| p.lon() >= 0.0);
    if !(has_west && has_east) {
        return LongitudeFrame::Signed;
    }
    let signed = longitude_span(points.iter().map(|p| p.lon()));
    let positive = longitude_span(points.iter().map(|p| in_frame(p.lon(), LongitudeFrame::Positive)));
    if positive < signed { LongitudeFrame::Positive } else { LongitudeFrame::Signed }
}

fn longitude_span(lons: impl Iterator<Item = f64>) -> f64 {
    let (min, max) = lons.fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), x| (lo.min(x), hi.max(x)));
    max - min
}

fn in_frame(lon: f64, frame: LongitudeFrame) -> f64 {
    match frame {
        LongitudeFrame::Positive if lon < 0.0 => lon + 360.0,
        _ => lon,
    }
}

fn hull_in_frame(points: &[LatLon], frame: LongitudeFrame) -> Polygon {
    let planar: MultiPoint = points.iter().map(|p| Point::new(in_frame(p.lon(), frame), p.lat())).collect();
    planar.convex_hull()
}

/// Turns a hull corner back into a checked position, folding the positive frame back.
fn to_lat_lon(corner: Coord) -> LatLon {
    let lon = if corner.x > 180.0 { corner.x - 360.0 } else { corner.x };
    LatLon::new(corner.y, lon).expect("hull corners are input points, so they are in range")
}
