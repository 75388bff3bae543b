//! Integration tests of the analysis crate against sources outside the project.
//!
//! Each check names its source: published worked examples (GeographicLib's test polygons,
//! Dobson & Barnett's British doctors data, a Mann–Kendall worked series), the IUCN
//! Guidelines, and fixtures computed by `tests/reference/make_reference.py` with scipy
//! (qhull, linprog, cKDTree, hierarchy, binomtest), pyproj, shapely, statsmodels and
//! pymannkendall on generated data, by methods other than the crate's. No fixture holds
//! output of this crate.

mod aoo;
mod checks;
mod coordinates;
mod criteria;
mod eoo;
mod fixtures;
mod geodesic;
mod glm;
mod mann_kendall;
mod summary;
mod yearly;

/// Asserts `actual` is within `relative` of `expected` (or within `relative` absolutely
/// when `expected` is zero), naming `what` on failure.
pub fn assert_close(what: &str, actual: f64, expected: f64, relative: f64) {
    let scale = expected.abs().max(if expected == 0.0 { 1.0 } else { 0.0 });
    assert!(
        (actual - expected).abs() <= relative * scale,
        "{what}: got {actual}, expected {expected} (tolerance {relative} relative)"
    );
}
