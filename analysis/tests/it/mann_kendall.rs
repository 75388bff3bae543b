//! Mann–Kendall and Sen's slope against a worked series, pymannkendall and scipy.

use analysis::trend::{mann_kendall, mann_kendall_with_times};

use crate::{assert_close, fixtures};

#[test]
fn worked_series_with_ties_gives_the_published_values() {
    // Hirsch et al. 1982; Gilbert 1987, the worked values checked with pymannkendall and scipy:
    // y = 5,7,7,6,4,4,3,5,2,2 → S = −29, Var(S) = 121, Z = −2.545455, p = 0.010914, Sen −0.5.
    let result = mann_kendall(&[5.0, 7.0, 7.0, 6.0, 4.0, 4.0, 3.0, 5.0, 2.0, 2.0]).unwrap();
    assert_eq!(result.s, -29);
    assert_eq!(result.var_s, 121.0);
    assert!((result.z - -2.545455).abs() < 1e-6, "Z {}", result.z);
    assert!((result.p_value - 0.010914).abs() < 1e-6, "p {}", result.p_value);
    assert_eq!(result.sen_slope, Some(-0.5));
}

#[test]
fn generated_series_match_pymannkendall_and_scipy() {
    // Reference: pymannkendall.original_test for equally spaced series; for the gappy one, S
    // and Var(S) recovered from scipy.stats.kendalltau and Sen's slope from scipy's Theil–Sen.
    for series in fixtures::trend().mann_kendall {
        let result = mann_kendall_with_times(&series.times, &series.values).unwrap();
        assert_eq!(result.s, series.s, "{} S", series.name);
        assert_close(&format!("{} Var(S)", series.name), result.var_s, series.var_s, 1e-9);
        assert_close(&format!("{} Z", series.name), result.z, series.z, 1e-9);
        assert_close(&format!("{} p", series.name), result.p_value, series.p_value, 1e-7);
        assert_close(&format!("{} Sen", series.name), result.sen_slope.unwrap(), series.sen_slope, 1e-12);
    }
}

#[test]
fn constant_and_short_series_show_no_trend() {
    // Common practice: with no variation S = 0 and the test cannot reject no trend.
    let flat = mann_kendall(&[3.0; 6]).unwrap();
    assert_eq!((flat.s, flat.z, flat.p_value, flat.sen_slope), (0, 0.0, 1.0, Some(0.0)));
    let single = mann_kendall(&[3.0]).unwrap();
    assert_eq!((single.s, single.p_value, single.sen_slope), (0, 1.0, None));
}

#[test]
fn unordered_times_and_missing_values_are_refused() {
    let err = mann_kendall_with_times(&[2000.0, 2002.0, 2001.0], &[1.0, 2.0, 3.0]).unwrap_err();
    assert_eq!(err.to_string(), "times must increase strictly, but value 2 is not later than the one before");
    let err = mann_kendall(&[1.0, f64::NAN]).unwrap_err();
    assert_eq!(err.to_string(), "series value in row 1 is not a finite number");
}
