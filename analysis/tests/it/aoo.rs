//! AOO cell counts against pyproj (PROJ `laea`) + numpy on the documented zone rule, written
//! again in make_reference.py from the README and module notes.

use analysis::LatLon;
use analysis::range::{AooError, AooGrid, GridPlan, aoo};

use crate::{assert_close, fixtures};

#[test]
fn projection_matches_proj_to_the_millimetre_oblique_and_polar() {
    // Reference: pyproj.Proj("+proj=laea ... +ellps=WGS84") forward, range.json "projection",
    // centres including both poles and 85° N.
    let checks = fixtures::range().projection;
    assert!(checks.iter().any(|c| c.centre[0] == 90.0) && checks.iter().any(|c| c.centre[0] == -90.0));
    for check in checks {
        let centre = LatLon::new(check.centre[0], check.centre[1]).unwrap();
        let grid = AooGrid::new(2.0, centre).unwrap();
        let [x, y] = grid.project(LatLon::new(check.lat, check.lon).unwrap()).unwrap();
        let miss = (x - check.easting_m).hypot(y - check.northing_m);
        assert!(miss < 1e-3, "({}, {}) about {:?}: {miss} m from PROJ", check.lat, check.lon, check.centre);
    }
}

#[test]
fn cell_counts_match_pyproj_zone_by_zone_for_every_origin() {
    // Reference: range.json zones, cells from pyproj laea + numpy floor/unique over 16 origins.
    for set in fixtures::range().sets {
        let result = aoo(&set.lat_lons(), &set.plan());
        let zones = &set.expected.zones;
        assert_eq!(result.zones.len(), zones.len(), "{} zones", set.name);
        for (got, want) in result.zones.iter().zip(zones) {
            let centre = [got.grid.centre().lat(), got.grid.centre().lon()];
            assert_eq!(centre, want.centre, "{} zone centre", set.name);
            assert_eq!(got.records, want.records, "{} records in zone {centre:?}", set.name);
            assert_eq!(got.occupied_cells, want.fixed_cells(), "{} fixed grid in zone {centre:?}", set.name);
            assert_eq!(got.min_occupied_cells, want.least_cells(), "{} least in zone {centre:?}", set.name);
            let first_least = want.cells_by_shift.iter().find(|c| c.cells == want.least_cells()).unwrap();
            let quarter = set.cell_size_km / 4.0;
            let shift = [first_least.east_quarters, first_least.north_quarters].map(|q| f64::from(q) * quarter);
            assert_eq!(got.min_origin_shift_km, shift, "{} shift of the least count", set.name);
        }
        let cell_area = set.cell_size_km * set.cell_size_km;
        assert_close(&format!("{} AOO", set.name), result.area_km2, set.fixed_cells() as f64 * cell_area, 1e-12);
        let least: usize = zones.iter().map(fixtures::ZoneReference::least_cells).sum();
        assert_eq!(result.min_occupied_cells, least, "{}", set.name);
        assert_eq!(result.records_near_zone_edges, set.expected.records_near_zone_edges, "{}", set.name);
    }
}

#[test]
fn one_far_record_gets_a_zone_of_its_own_instead_of_stopping_the_count() {
    // pyproj + numpy on the zone rule: the coast on the default grid, the record on the far
    // side of the globe on a grid centred at 40° S, 175° E, one cell (4 km²) of its own.
    let set = fixtures::point_set("coast_and_an_antipodal_record");
    let result = aoo(&set.lat_lons(), &set.plan());
    let centres: Vec<[f64; 2]> = result.zones.iter().map(|z| [z.grid.centre().lat(), z.grid.centre().lon()]).collect();
    assert_eq!(centres, [[52.0, 10.0], [-40.0, 175.0]]);
    assert_eq!((result.zones[1].records, result.zones[1].occupied_cells), (1, 1));
}

#[test]
fn records_round_the_world_are_counted_on_several_grids() {
    // pyproj + numpy on the zone rule (range.json "round_the_world": seven zones).
    let set = fixtures::point_set("round_the_world");
    let result = aoo(&set.lat_lons(), &set.plan());
    assert_eq!(result.zones.len(), 7);
    assert_eq!(result.zones.iter().map(|z| z.records).sum::<usize>(), 60);
}

#[test]
fn square_corners_give_four_cells_or_one_depending_on_the_origin() {
    // Guidelines for Using the IUCN Red List Categories and Criteria (v16, 2024): the grid's
    // origin is not fixed and changes the count [checked]. Arithmetic: the four corners of a
    // 1.5 km square fit in one 2 km cell, or fall in four when the square straddles a cell
    // corner. The corners are placed by pyproj's inverse projection across a cell corner.
    let set = fixtures::point_set("square_corners");
    let result = aoo(&set.lat_lons(), &set.plan());
    assert_eq!((result.occupied_cells, result.area_km2), (4, 16.0));
    assert_eq!((result.min_occupied_cells, result.min_area_km2), (1, 4.0));
    assert_eq!(result.zones[0].min_origin_shift_km, [1.0, 1.0]);
}

#[test]
fn default_grid_is_two_km_cells_on_the_documented_centre() {
    // IUCN Guidelines: 2 × 2 km cells, 4 km² each.
    let grid = AooGrid::default();
    assert_eq!(grid.cell_size_km(), 2.0);
    assert_eq!((grid.centre().lat(), grid.centre().lon()), (52.0, 10.0));
    assert!(grid.proj_string().contains("+proj=laea +lat_0=52 +lon_0=10"));
    let one = [LatLon::new(50.3, -4.1).unwrap()];
    assert_eq!(aoo(&one, &GridPlan::starting_with(grid)).area_km2, 4.0);
}

#[test]
fn the_first_grid_rule_centres_far_records_on_them_as_documented() {
    // Reference: range.json "near_centre" (the rule as the README writes it, in numpy).
    for set in fixtures::range().sets {
        let centre = AooGrid::near(&set.lat_lons()).map(|g| [g.centre().lat(), g.centre().lon()]);
        assert_eq!(centre, set.expected.near_centre, "{}", set.name);
    }
}

#[test]
fn one_grid_alone_still_refuses_a_record_beyond_its_reach_by_name() {
    let far = LatLon::new(-40.0, 170.0).unwrap();
    let err = AooGrid::default().project(far).unwrap_err();
    assert_eq!(err, AooError::TooFarFromCentre { lat: -40.0, lon: 170.0 });
    assert!(err.to_string().contains("latitude -40, longitude 170"), "{err}");
}

#[test]
fn unusable_cell_sizes_are_refused() {
    let centre = LatLon::new(52.0, 10.0).unwrap();
    assert_eq!(AooGrid::new(0.0, centre), Err(AooError::InvalidCellSize(0.0)));
    assert_eq!(
        AooGrid::new(f64::NAN, centre).unwrap_err().to_string(),
        "cell size must be between 0.01 and 1000 km, got NaN"
    );
    assert!(AooGrid::new(2.0, LatLon::new(90.0, 0.0).unwrap()).is_ok(), "a grid on a pole is polar, not refused");
}

#[test]
fn no_records_occupy_no_cells() {
    let result = aoo(&[], &GridPlan::starting_with(AooGrid::default()));
    assert_eq!((result.occupied_cells, result.min_occupied_cells, result.area_km2), (0, 0, 0.0));
}
