//! The range summary: EOO raised to AOO (IUCN Guidelines §4.9) and criterion-B text.

use analysis::range::summary;

use crate::fixtures;

#[test]
fn eoo_smaller_than_aoo_is_raised_to_aoo_and_both_are_kept() {
    // IUCN Guidelines §4.9: if EOO < AOO, EOO is set equal to AOO. The raw hull area and the
    // cell count come from shapely/pyproj (range.json, "tiny_cluster").
    let set = fixtures::point_set("tiny_cluster");
    let result = summary(&set.lat_lons(), &set.grid()).unwrap();
    let aoo_km2 = set.fixed_grid_cells() as f64 * 4.0;
    assert!(set.eoo_km2 < aoo_km2, "fixture must have EOO below AOO");
    assert!(result.eoo_raised_to_aoo);
    assert_eq!(result.eoo_km2, aoo_km2);
    assert!((result.eoo.area_km2 - set.eoo_km2).abs() < 1e-3 * set.eoo_km2);
    assert!(result.method.contains("reported as the AOO"), "{}", result.method);
}

#[test]
fn eoo_larger_than_aoo_is_reported_as_measured() {
    let set = fixtures::point_set("channel_coast");
    let result = summary(&set.lat_lons(), &set.grid()).unwrap();
    assert!(!result.eoo_raised_to_aoo);
    assert_eq!(result.eoo_km2, result.eoo.area_km2);
}

#[test]
fn summary_carries_the_criterion_b_comparison_and_cautions() {
    // IUCN Criteria v3.1 B1/B2: the channel set's EOO (~37,000 km²) is above every B1
    // limit and its AOO (~1,100 km²) is below the VU limit of 2,000 km² only.
    let set = fixtures::point_set("channel_coast");
    let result = summary(&set.lat_lons(), &set.grid()).unwrap();
    let b = &result.criterion_b;
    assert_eq!(b.eoo_band, None);
    assert_eq!(b.aoo_band, Some(analysis::criteria::Category::Vulnerable));
    assert!(b.text.contains("not a listing decision"), "{}", b.text);
    assert!(b.text.contains("where people walk"), "{}", b.text);
    let json = serde_json::to_value(&result).unwrap();
    assert!(json["aoo"]["min_occupied_cells"].is_u64());
}
