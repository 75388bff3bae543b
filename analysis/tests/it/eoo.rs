//! EOO against an independent construction: the hull on the sphere from qhull's 3-D hull of
//! the records' unit vectors and the Earth's centre (scipy), measured by pyproj.Geod on WGS84
//! (range.json, make_reference.py); the hemisphere test against scipy's linear programme.

use analysis::LatLon;
use analysis::range::{EooError, eoo};

use crate::{assert_close, fixtures};

fn corner_set(corners: &[LatLon]) -> Vec<(u64, u64)> {
    let mut set: Vec<(u64, u64)> = corners.iter().map(|p| (p.lat().to_bits(), p.lon().to_bits())).collect();
    set.sort_unstable();
    set
}

#[test]
fn eoo_matches_the_hull_of_unit_vectors_measured_by_pyproj() {
    // Reference: scipy.spatial.ConvexHull (qhull) of the unit vectors and the centre, corners
    // checked against pyproj's gnomonic projection + shapely; area pyproj.Geod (WGS84).
    let mut checked = 0;
    for set in fixtures::range().sets.iter().filter(|s| s.expected.in_one_hemisphere) {
        let result = eoo(&set.lat_lons()).unwrap_or_else(|e| panic!("{}: {e}", set.name));
        let expected = set.expected.eoo_km2.unwrap();
        assert_close(&format!("{} EOO km²", set.name), result.area_km2, expected, 1e-9);
        let corners = set.expected.hull_corners.as_ref().unwrap();
        if corners.len() >= 3 {
            assert_eq!(corner_set(&result.hull), corner_set(&fixtures::lat_lons(corners)), "{} corners", set.name);
        } else {
            assert!(result.hull.len() < 3, "{}: no area, no polygon", set.name);
        }
        assert_eq!(result.point_count, set.points.len());
        checked += 1;
    }
    assert!(checked >= 20, "the fixture's sets in one hemisphere: {checked}");
}

#[test]
fn five_records_on_one_parallel_enclose_three_quarters_of_a_million_km2() {
    // The sphere, not the map: five records on 60° N over 60° of longitude enclose
    // 781,020 km² (qhull + pyproj.Geod); a hull drawn flat in longitude and latitude has none.
    let set = fixtures::point_set("five_on_60n_over_60_degrees");
    let result = eoo(&set.lat_lons()).unwrap();
    assert_close("five on 60° N", result.area_km2, 781_020.010_528_898_4, 1e-9);
    assert_eq!(result.hull.len(), 5, "every record is a corner: a parallel bends away from the great circles");
}

#[test]
fn rings_round_a_pole_enclose_the_pole() {
    // qhull + pyproj.Geod: the hulls hold the pole, areas of millions of km².
    for name in ["ring_round_the_north_pole", "ring_round_the_south_pole"] {
        let set = fixtures::point_set(name);
        let result = eoo(&set.lat_lons()).unwrap();
        assert_close(name, result.area_km2, set.expected.eoo_km2.unwrap(), 1e-9);
        assert!(result.area_km2 > 1e6, "{name}: {}", result.area_km2);
    }
}

#[test]
fn records_on_one_great_circle_have_no_area() {
    // qhull: records on the equator or on one meridian have a flat hull (area 0).
    for name in ["on_the_equator", "one_meridian"] {
        let result = eoo(&fixtures::point_set(name).lat_lons()).unwrap();
        assert_eq!(result.area_km2, 0.0, "{name}");
    }
}

#[test]
fn records_beyond_one_hemisphere_are_refused_with_the_reason() {
    // scipy.optimize.linprog finds no hemisphere holding the round-the-world set.
    let set = fixtures::point_set("round_the_world");
    assert!(!set.expected.in_one_hemisphere);
    let err = eoo(&set.lat_lons()).unwrap_err();
    assert_eq!(err, EooError::NotInOneHemisphere { count: 60 });
    assert!(err.to_string().contains("do not lie within one hemisphere"), "{err}");
    assert!(err.to_string().contains("far above every B1 threshold"), "{err}");
}

#[test]
fn a_hull_across_the_antimeridian_is_the_same_hull_moved() {
    // Common practice: the ellipsoid is symmetric under a shift of longitude, so a square
    // across ±180° has the area of the same square across the Greenwich meridian.
    let square = |west: f64, east: f64| {
        [(-16.0, west), (-16.0, east), (-17.0, east), (-17.0, west), (-16.5, east)]
            .map(|(lat, lon)| LatLon::new(lat, lon).unwrap())
    };
    let across_antimeridian = eoo(&square(179.5, -179.5)).unwrap();
    let across_greenwich = eoo(&square(-0.5, 0.5)).unwrap();
    assert_close("antimeridian square", across_antimeridian.area_km2, across_greenwich.area_km2, 1e-9);
    assert_eq!(across_antimeridian.hull.len(), 4);
}

#[test]
fn fewer_than_three_distinct_points_have_no_extent() {
    // IUCN Guidelines: a polygon needs three corners; wrackline documents EOO = 0 below that.
    let p = |lat, lon| LatLon::new(lat, lon).unwrap();
    assert_eq!(eoo(&[]).unwrap().area_km2, 0.0);
    assert_eq!(eoo(&[p(50.0, -4.0)]).unwrap().area_km2, 0.0);
    assert_eq!(eoo(&[p(50.0, -4.0), p(50.0, -4.0), p(50.5, -4.2), p(50.5, -4.2)]).unwrap().area_km2, 0.0);
    assert!(eoo(&[p(50.0, -4.0), p(50.5, -4.2), p(50.2, -3.9)]).unwrap().area_km2 > 0.0);
}
