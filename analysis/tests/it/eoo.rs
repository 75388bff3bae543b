//! EOO against shapely (convex hull) + pyproj.Geod (geodesic area) on generated point sets.

use analysis::LatLon;
use analysis::range::{LongitudeFrame, eoo};

use crate::{assert_close, fixtures};

#[test]
fn eoo_matches_shapely_and_pyproj_within_a_tenth_of_a_percent() {
    // Reference: range.json from make_reference.py (shapely convex hull, pyproj.Geod area).
    for set in fixtures::range().sets {
        let result = eoo(&set.lat_lons());
        assert_close(&format!("{} EOO km²", set.name), result.area_km2, set.eoo_km2, 1e-3);
        let frame = format!("{:?}", result.longitude_frame);
        assert_eq!(frame, set.longitude_frame, "{} longitude frame", set.name);
        if set.eoo_km2 > 0.0 {
            assert_eq!(result.hull.len(), set.hull_corners, "{} hull corners", set.name);
        }
        assert_eq!(result.point_count, set.points.len());
    }
}

#[test]
fn hull_straddling_the_antimeridian_is_drawn_the_short_way() {
    // Common practice: the ellipsoid is symmetric under a shift of longitude, so a square
    // across ±180° must have the area of the same square across the Greenwich meridian.
    let square = |west: f64, east: f64| {
        [(-16.0, west), (-16.0, east), (-17.0, east), (-17.0, west), (-16.5, east)]
            .map(|(lat, lon)| LatLon::new(lat, lon).unwrap())
    };
    let across_antimeridian = eoo(&square(179.5, -179.5));
    let across_greenwich = eoo(&square(-0.5, 0.5));
    assert_eq!(across_antimeridian.longitude_frame, LongitudeFrame::Positive);
    assert_eq!(across_greenwich.longitude_frame, LongitudeFrame::Signed);
    assert_close("antimeridian square", across_antimeridian.area_km2, across_greenwich.area_km2, 1e-9);
    assert!(across_antimeridian.hull.iter().all(|p| p.lon().abs() >= 179.5), "corners stay on the antimeridian");
}

#[test]
fn fewer_than_three_distinct_points_have_no_extent() {
    // IUCN Guidelines: a polygon needs three corners; wrackline documents EOO = 0 below that.
    let p = |lat, lon| LatLon::new(lat, lon).unwrap();
    assert_eq!(eoo(&[]).area_km2, 0.0);
    assert_eq!(eoo(&[p(50.0, -4.0)]).area_km2, 0.0);
    assert_eq!(eoo(&[p(50.0, -4.0), p(50.0, -4.0), p(50.5, -4.2), p(50.5, -4.2)]).area_km2, 0.0);
    assert!(eoo(&[p(50.0, -4.0), p(50.5, -4.2), p(50.2, -3.9)]).area_km2 > 0.0);
}
