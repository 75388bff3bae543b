//! Geodesic polygon area against GeographicLib's own test polygons (GeographicLib test
//! suite; Karney 2013, "Algorithms for geodesics", J. Geodesy 87) [checked: pyproj 3.7.2's
//! `Geod(ellps="WGS84").polygon_area_perimeter`, which runs Karney's algorithm, gives the
//! same areas to within 1 m²].

use analysis::LatLon;
use analysis::range::polygon_area_km2;

use crate::assert_close;

fn ring(corners: &[(f64, f64)]) -> Vec<LatLon> {
    corners.iter().map(|&(lat, lon)| LatLon::new(lat, lon).unwrap()).collect()
}

#[test]
fn diamond_about_the_origin_matches_geographiclib() {
    // GeographicLib: (0,−1) (−1,0) (0,1) (1,0) → area 24619419146.0 m².
    let area = polygon_area_km2(&ring(&[(0.0, -1.0), (-1.0, 0.0), (0.0, 1.0), (1.0, 0.0)]));
    assert_close("diamond area km²", area, 24_619_419_146.0 / 1e6, 1e-9);
}

#[test]
fn square_round_the_pole_matches_geographiclib() {
    // GeographicLib: (89,0) (89,90) (89,180) (89,270) → area 24952305678.0 m² (270° = −90°).
    let area = polygon_area_km2(&ring(&[(89.0, 0.0), (89.0, 90.0), (89.0, 180.0), (89.0, -90.0)]));
    assert_close("polar square area km²", area, 24_952_305_678.0 / 1e6, 1e-9);
}

#[test]
fn octant_matches_geographiclib() {
    // GeographicLib: (90,0) (0,0) (0,90) → area 63758202715511.0 m², an eighth of the Earth.
    let area = polygon_area_km2(&ring(&[(90.0, 0.0), (0.0, 0.0), (0.0, 90.0)]));
    assert_close("octant area km²", area, 63_758_202_715_511.0 / 1e6, 1e-9);
}

#[test]
fn winding_does_not_change_the_area() {
    // Common practice: an unsigned area is the same for either winding of a small ring.
    let anticlockwise = ring(&[(0.0, -1.0), (-1.0, 0.0), (0.0, 1.0), (1.0, 0.0)]);
    let clockwise: Vec<LatLon> = anticlockwise.iter().rev().copied().collect();
    assert_close("reversed ring", polygon_area_km2(&clockwise), polygon_area_km2(&anticlockwise), 1e-12);
}
