//! The checks beside the range figures against independent computations (range.json,
//! make_reference.py): outliers against scipy's cKDTree nearest neighbours, clusters against
//! scipy's single-linkage hierarchy, leave-one-out influence against qhull + pyproj.Geod on
//! every reduced set, resampling intervals against the same resamples (SplitMix64 written
//! again in Python) measured with qhull + pyproj and numpy.percentile, period comparisons
//! against the same subsamples, and rate ratios against scipy.stats.binomtest.

use analysis::range::{
    FigureOptions, compare_periods, figures, location_guide, outliers, records_change, single_linkage,
};

use crate::{assert_close, fixtures};

fn options(set: &fixtures::PointSet, resamples: usize) -> FigureOptions {
    FigureOptions { plan: set.plan(), resamples, influence_places: 10, ..FigureOptions::default() }
}

#[test]
fn outliers_match_nearest_neighbours_from_scipy() {
    // Reference: scipy.spatial.cKDTree on unit vectors, great-circle distance on 6371.0088 km.
    let mut listed = 0;
    for set in fixtures::range().sets {
        let mut found = outliers(&set.lat_lons(), 500.0);
        // Equally isolated places may come in either order; compare them by record.
        found.sort_by_key(|o| o.records[0]);
        let mut expected: Vec<&fixtures::OutlierReference> = set.expected.outliers_500_km.iter().collect();
        expected.sort_by_key(|o| o.records[0]);
        assert_eq!(found.len(), expected.len(), "{} outliers", set.name);
        for (got, want) in found.iter().zip(&expected) {
            assert_eq!([got.position.lat(), got.position.lon()], want.position, "{}", set.name);
            assert_eq!(got.records, want.records, "{}", set.name);
            assert_close(&format!("{} nearest", set.name), got.nearest_km, want.nearest_km, 1e-9);
        }
        listed += found.len();
    }
    let stray = outliers(&fixtures::point_set("coast_and_a_stray_record").lat_lons(), 500.0);
    assert_eq!(stray.iter().map(|o| o.records.clone()).collect::<Vec<_>>(), [vec![50]], "the record 1,000 km inland");
    assert!(listed >= 3, "the fixture must list outliers to check: {listed}");
}

#[test]
fn clusters_match_scipy_single_linkage() {
    // Reference: scipy.cluster.hierarchy.linkage(method="single") on great-circle distances,
    // fcluster at 10 and 50 km; clusters numbered by their first record on both sides.
    for set in fixtures::range().sets {
        let points = set.lat_lons();
        assert_eq!(single_linkage(&points, 10.0), set.expected.clusters_10_km, "{} at 10 km", set.name);
        assert_eq!(single_linkage(&points, 50.0), set.expected.clusters_50_km, "{} at 50 km", set.name);
    }
}

#[test]
fn the_location_guide_counts_clusters_and_says_it_is_a_guide() {
    // IUCN Guidelines §4.11: a location is defined by the threat; the count is only a guide.
    let set = fixtures::point_set("channel_coast");
    let guide = location_guide(&set.lat_lons(), 10.0);
    assert_eq!(guide.clusters, set.expected.clusters_10_km.iter().max().unwrap() + 1);
    assert!(guide.text.contains("guide only"), "{}", guide.text);
    assert!(guide.text.contains("threatening event"), "{}", guide.text);
}

#[test]
fn leave_one_out_influence_matches_qhull_on_every_reduced_set() {
    // Reference: for each corner place, qhull + pyproj.Geod on the records without it; AOO
    // change from the per-record cells of pyproj laea.
    let mut corners_checked = 0;
    for set in fixtures::range().sets.iter().filter(|s| s.expected.in_one_hemisphere) {
        let result = figures(&set.lat_lons(), &options(set, 0));
        let expected = &set.expected.influence;
        assert_eq!(result.influence.len(), expected.len(), "{} influential places", set.name);
        for (got, want) in result.influence.iter().zip(expected) {
            assert_eq!([got.position.lat(), got.position.lon()], want.position, "{}", set.name);
            assert_eq!(got.records, want.records, "{}", set.name);
            let scale = set.expected.eoo_km2.unwrap();
            let change = got.eoo_change_km2.unwrap();
            assert!(
                (change - want.eoo_change_km2).abs() <= 1e-9 * scale,
                "{}: {change} vs {}",
                set.name,
                want.eoo_change_km2
            );
            assert_eq!(got.aoo_change_km2, want.aoo_change_km2, "{}", set.name);
            corners_checked += 1;
        }
        assert_eq!(result.places_alone_in_their_cell, set.expected.places_alone_in_their_cell, "{}", set.name);
    }
    assert!(corners_checked > 100, "{corners_checked}");
}

#[test]
fn resampling_intervals_match_the_same_resamples_measured_by_qhull_and_pyproj() {
    // Reference: SplitMix64 (Steele, Lea & Flood 2014) re-implemented in Python draws the
    // same 200 resamples; qhull + pyproj.Geod and pyproj laea measure each; numpy.percentile.
    let mut checked = 0;
    for set in fixtures::range().sets {
        let Some(want) = &set.expected.stability else { continue };
        let mut options = options(&set, want.resamples);
        options.seed = want.seed;
        let got = figures(&set.lat_lons(), &options).stability.unwrap();
        let pairs =
            [("AOO", Some(&got.aoo_km2), Some(&want.aoo_km2)), ("EOO", got.eoo_km2.as_ref(), want.eoo_km2.as_ref())];
        for (what, got, want) in pairs {
            let (Some(got), Some(want)) = (got, want) else {
                assert!(got.is_none() && want.is_none(), "{} {what}", set.name);
                continue;
            };
            for (part, g, w) in [
                ("observed", got.observed, want.observed),
                ("median", got.median, want.median),
                ("lower", got.lower, want.lower),
                ("upper", got.upper, want.upper),
            ] {
                assert_close(&format!("{} {what} {part}", set.name), g, w, 1e-9);
            }
        }
        assert!(got.text.contains("not an interval round the true range"), "{}", got.text);
        checked += 1;
    }
    assert!(checked >= 6, "{checked}");
}

#[test]
fn periods_compare_at_equal_numbers_of_records_as_the_reference_subsamples_do() {
    // Reference: the same subsamples (SplitMix64, partial Fisher–Yates) measured with qhull +
    // pyproj; rate ratios with scipy.stats.binomtest (exact p, Clopper–Pearson interval).
    for case in fixtures::range().comparisons {
        let (earlier, later) = (fixtures::lat_lons(&case.earlier), fixtures::lat_lons(&case.later));
        let plan = analysis::range::GridPlan::starting_with(analysis::range::AooGrid::default());
        let got = compare_periods(&earlier, &later, case.years, &plan, 200, case.seed);
        let want = &case.expected;
        assert_eq!((got.equal_records, got.resamples), (want.equal_records, want.resamples), "{}", case.name);
        for (what, g, w) in [("EOO", got.eoo.unwrap(), &want.eoo), ("AOO", got.aoo, &want.aoo)] {
            let pairs = [
                ("observed", g.observed_km2, w.observed_km2),
                ("median", g.median_km2, w.median_km2),
                ("lower", g.lower_km2, w.lower_km2),
                ("upper", g.upper_km2, w.upper_km2),
                ("median %", g.median_percent, w.median_percent),
                ("lower %", g.lower_percent, w.lower_percent),
                ("upper %", g.upper_percent, w.upper_percent),
            ];
            for (part, a, b) in pairs {
                assert!((a - b).abs() <= 1e-9 * b.abs().max(1.0), "{} {what} {part}: {a} vs {b}", case.name);
            }
        }
        match (&got.records, &want.records) {
            (Some(g), Some(w)) => check_records_change(g, w),
            (None, None) => {}
            _ => panic!("{}: records change present on one side only", case.name),
        }
    }
}

fn check_records_change(got: &analysis::range::RecordsChange, want: &fixtures::RecordsChangeReference) {
    let name = format!("{:?} over {:?}", want.counts, want.years);
    assert_close(&format!("{name} ratio"), got.rate_ratio, want.rate_ratio, 1e-12);
    assert_close(&format!("{name} lower"), got.lower, want.lower, 1e-7);
    assert_close(&format!("{name} upper"), got.upper, want.upper, 1e-7);
    assert_close(&format!("{name} p"), got.p_value, want.p_value, 1e-9);
}

#[test]
fn rate_ratios_of_records_match_scipy_binomtest() {
    // Reference: scipy.stats.binomtest(later, total, share of years).pvalue and its exact
    // (Clopper–Pearson) interval turned into a ratio of rates.
    for want in fixtures::range().records_changes {
        check_records_change(&records_change(want.counts, want.years), &want);
    }
}
