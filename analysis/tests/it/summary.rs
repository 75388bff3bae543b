//! The range summary: EOO raised to AOO (IUCN Guidelines §4.9), criterion-B text, and what
//! is said when there is no EOO.

use analysis::criteria::Category;
use analysis::range::summary;

use crate::fixtures;

#[test]
fn eoo_smaller_than_aoo_is_raised_to_aoo_and_both_are_kept() {
    // IUCN Guidelines §4.9: if EOO < AOO, EOO is set equal to AOO. The raw hull area and the
    // cell count come from qhull + pyproj (range.json, "tiny_cluster").
    let set = fixtures::point_set("tiny_cluster");
    let result = summary(&set.lat_lons(), &set.plan());
    let aoo_km2 = set.fixed_cells() as f64 * 4.0;
    assert!(set.expected.eoo_km2.unwrap() < aoo_km2, "fixture must have EOO below AOO");
    assert!(result.eoo_raised_to_aoo);
    assert_eq!(result.eoo_km2, Some(aoo_km2));
    assert!(result.method.contains("reported as the AOO"), "{}", result.method);
}

#[test]
fn five_records_on_60n_are_no_longer_critically_endangered_by_area() {
    // IUCN Criteria v3.1 B1 (CR < 100, EN < 5,000, VU < 20,000 km²): the sphere's 781,020 km²
    // (qhull + pyproj.Geod) is above every B1 limit; a flat hull gave 0, raised to 20 km² (CR).
    let set = fixtures::point_set("five_on_60n_over_60_degrees");
    let result = summary(&set.lat_lons(), &set.plan());
    assert!(!result.eoo_raised_to_aoo);
    assert_eq!(result.criterion_b.eoo_band, None);
    assert!(result.criterion_b.text.contains("EOO 781,020 km²"), "{}", result.criterion_b.text);
}

#[test]
fn records_beyond_one_hemisphere_get_aoo_and_a_reason_instead_of_eoo() {
    let set = fixtures::point_set("round_the_world");
    let result = summary(&set.lat_lons(), &set.plan());
    assert_eq!((result.eoo.as_ref(), result.eoo_km2), (None, None));
    assert!(result.eoo_problem.as_deref().unwrap().contains("one hemisphere"));
    assert!(result.aoo.area_km2 > 0.0);
    assert!(result.criterion_b.text.contains("EOO is not given"), "{}", result.criterion_b.text);
    assert!(result.method.contains("EOO: not given"), "{}", result.method);
}

#[test]
fn summary_carries_the_criterion_b_comparison_and_cautions() {
    // IUCN Criteria v3.1 B1/B2: the channel set's EOO (~37,000 km²) is above every B1
    // limit and its AOO (~1,100 km²) is below the VU limit of 2,000 km² only.
    let set = fixtures::point_set("channel_coast");
    let result = summary(&set.lat_lons(), &set.plan());
    let b = &result.criterion_b;
    assert_eq!((b.eoo_band, b.aoo_band), (None, Some(Category::Vulnerable)));
    assert!(b.text.contains("not a listing decision"), "{}", b.text);
    assert!(b.text.contains("where people walk"), "{}", b.text);
    let json = serde_json::to_value(&result).unwrap();
    assert!(json["aoo"]["min_occupied_cells"].is_u64());
    assert!(result.method.contains("great circles"), "{}", result.method);
}
