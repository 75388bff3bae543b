//! AOO cell counts against pyproj (PROJ `laea`) + numpy on the same grid rules.

use analysis::LatLon;
use analysis::range::{AooError, AooGrid, aoo};

use crate::{assert_close, fixtures};

#[test]
fn projection_matches_proj_to_the_millimetre() {
    // Reference: pyproj.Proj("+proj=laea ... +ellps=WGS84") forward, range.json "projection".
    for check in fixtures::range().projection {
        let centre = LatLon::new(check.centre[0], check.centre[1]).unwrap();
        let grid = AooGrid::new(2.0, centre).unwrap();
        let [x, y] = grid.project(LatLon::new(check.lat, check.lon).unwrap()).unwrap();
        let miss = (x - check.easting_m).hypot(y - check.northing_m);
        assert!(miss < 1e-3, "({}, {}) about {:?}: {miss} m from PROJ", check.lat, check.lon, check.centre);
    }
}

#[test]
fn cell_counts_match_pyproj_for_the_fixed_and_shifted_grids() {
    // Reference: range.json cell counts from pyproj + numpy floor/unique over 16 origins.
    for set in fixtures::range().sets {
        let result = aoo(&set.lat_lons(), &set.grid()).unwrap();
        let cell_area = set.cell_size_km * set.cell_size_km;
        assert_eq!(result.occupied_cells, set.fixed_grid_cells(), "{} fixed grid", set.name);
        assert_eq!(result.min_occupied_cells, set.min_cells(), "{} minimum over origins", set.name);
        assert_close(&format!("{} AOO", set.name), result.area_km2, set.fixed_grid_cells() as f64 * cell_area, 1e-3);
        assert_eq!(result.origins_tried, 16);
        let first_minimum = set.aoo_cells_by_shift.iter().find(|c| c.cells == set.min_cells()).unwrap();
        let quarter_km = set.cell_size_km / 4.0;
        let expected_shift =
            [first_minimum.east_quarters, first_minimum.north_quarters].map(|q| f64::from(q) * quarter_km);
        assert_eq!(result.min_origin_shift_km, expected_shift, "{} shift of the minimum", set.name);
    }
}

#[test]
fn square_corners_give_four_cells_or_one_depending_on_the_origin() {
    // Guidelines for Using the IUCN Red List Categories and Criteria (v16, 2024): the grid's
    // origin is not fixed and changes the count [checked]. Arithmetic: the four corners of a
    // 1.5 km square fit in one 2 km cell, or fall in four when the square straddles a cell
    // corner. The corners are placed by pyproj's inverse projection across a cell corner.
    let set = fixtures::point_set("square_corners");
    let result = aoo(&set.lat_lons(), &set.grid()).unwrap();
    assert_eq!(result.occupied_cells, 4);
    assert_eq!(result.area_km2, 16.0);
    assert_eq!(result.min_occupied_cells, 1);
    assert_eq!(result.min_area_km2, 4.0);
    assert_eq!(result.min_origin_shift_km, [1.0, 1.0]);
}

#[test]
fn default_grid_is_two_km_cells_on_the_documented_centre() {
    // IUCN Guidelines: 2 × 2 km cells, 4 km² each.
    let grid = AooGrid::default();
    assert_eq!(grid.cell_size_km(), 2.0);
    assert_eq!((grid.centre().lat(), grid.centre().lon()), (52.0, 10.0));
    assert!(grid.proj_string().contains("+proj=laea +lat_0=52 +lon_0=10"));
    let one = [LatLon::new(50.3, -4.1).unwrap()];
    assert_eq!(aoo(&one, &grid).unwrap().area_km2, 4.0);
}

#[test]
fn records_on_the_far_side_of_the_globe_are_refused_by_name() {
    let far = LatLon::new(-40.0, 170.0).unwrap();
    let err = aoo(&[far], &AooGrid::default()).unwrap_err();
    assert_eq!(err, AooError::TooFarFromCentre { lat: -40.0, lon: 170.0 });
    assert!(err.to_string().contains("latitude -40, longitude 170"), "{err}");
}

#[test]
fn unusable_grids_are_refused() {
    let centre = LatLon::new(52.0, 10.0).unwrap();
    assert_eq!(AooGrid::new(0.0, centre), Err(AooError::InvalidCellSize(0.0)));
    assert_eq!(
        AooGrid::new(f64::NAN, centre).unwrap_err().to_string(),
        "cell size must be between 0.01 and 1000 km, got NaN"
    );
    let polar = LatLon::new(85.0, 0.0).unwrap();
    assert_eq!(AooGrid::new(2.0, polar), Err(AooError::CentreTooCloseToPole(85.0)));
}

#[test]
fn no_records_occupy_no_cells() {
    let result = aoo(&[], &AooGrid::default()).unwrap();
    assert_eq!((result.occupied_cells, result.min_occupied_cells, result.area_km2), (0, 0, 0.0));
}

#[test]
fn the_default_grid_rule_centres_far_records_on_them_as_documented() {
    // Reference: range.json "rule_centre" (the rule as the README writes it, computed in
    // numpy) and the cell counts pyproj + numpy give on that grid.
    for set in fixtures::range().sets {
        let points = set.lat_lons();
        let centre = AooGrid::near(&points).map(|g| [g.centre().lat(), g.centre().lon()]);
        let expected = (set.rule_centre != [52.0, 10.0]).then_some(set.rule_centre);
        assert_eq!(centre, expected, "{}", set.name);
        let grid = AooGrid::near(&points)
            .map_or(AooGrid::new(set.cell_size_km, LatLon::new(52.0, 10.0).unwrap()).unwrap(), |g| {
                AooGrid::new(set.cell_size_km, g.centre()).unwrap()
            });
        let result = aoo(&points, &grid).unwrap();
        let fixed =
            set.aoo_cells_by_shift_rule_grid.iter().find(|c| c.east_quarters == 0 && c.north_quarters == 0).unwrap();
        assert_eq!(result.occupied_cells, fixed.cells, "{} on the rule's grid", set.name);
        let min = set.aoo_cells_by_shift_rule_grid.iter().map(|c| c.cells).min().unwrap();
        assert_eq!(result.min_occupied_cells, min, "{} minimum on the rule's grid", set.name);
    }
}
