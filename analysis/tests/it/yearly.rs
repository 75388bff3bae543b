//! Yearly encounter-rate trends: statsmodels fits, the window rule and exponential
//! extrapolation from the IUCN Guidelines, and the errors a caller can make.

use analysis::trend::{
    ErrorModel, OVERDISPERSION_THRESHOLD, TrendError, YearCount, assessment_window_years, yearly_trend,
};

use crate::{assert_close, fixtures};

fn years_of(series: &fixtures::YearlySeries) -> Vec<YearCount> {
    let rows = series.years.iter().zip(&series.counts).zip(&series.effort);
    rows.map(|((&year, &count), &effort)| YearCount { year, count, effort }).collect()
}

#[test]
fn slope_and_its_error_match_statsmodels_with_the_documented_error_model() {
    // Reference: statsmodels GLM(Poisson, offset log effort) on centred years, with
    // scale="X2" for the scaled errors; the branch follows statsmodels' own dispersion.
    let series = fixtures::trend().yearly;
    let mut models = Vec::new();
    for s in &series {
        let result = yearly_trend(&years_of(s), 5.0).unwrap();
        let dispersion = s.fit.pearson_chi2 / s.fit.df_resid as f64;
        let (model, se) = if dispersion > OVERDISPERSION_THRESHOLD {
            (ErrorModel::QuasiPoisson, s.fit.bse_scaled_pearson[1])
        } else {
            (ErrorModel::Poisson, s.fit.bse[1])
        };
        assert_eq!(result.error_model, model, "{} error model", s.name);
        assert_close(&format!("{} slope", s.name), result.slope_per_year, s.fit.params[1], 1e-7);
        assert_close(&format!("{} slope SE", s.name), result.slope_std_error, se, 1e-6);
        crate::glm::check_against_statsmodels(&s.name, &result.fit, &s.fit);
        let expected = (s.fit.params[1]).exp() - 1.0;
        assert_close(&format!("{} annual change", s.name), result.annual_change.estimate, expected, 1e-7);
        // statsmodels' conf_int: normal with the Poisson scale, Student's t on the
        // residual degrees of freedom with the estimated (Pearson) scale and use_t=True.
        let [lower, upper] = match model {
            ErrorModel::Poisson => s.fit.conf_int_95[1],
            ErrorModel::QuasiPoisson => s.fit.conf_int_95_scaled_t[1],
        };
        for (what, got, slope) in
            [("lower", result.annual_change.lower, lower), ("upper", result.annual_change.upper, upper)]
        {
            assert_close(&format!("{} annual {what}", s.name), got, slope.exp() - 1.0, 1e-6);
        }
        models.push(result.error_model);
    }
    assert!(models.contains(&ErrorModel::Poisson) && models.contains(&ErrorModel::QuasiPoisson));
}

#[test]
fn five_overdispersed_years_get_the_wider_t_interval() {
    // statsmodels GLM(scale="X2", use_t=True).conf_int(): t with 3 residual degrees of
    // freedom (5 years, 2 coefficients), quantile 3.182 against the normal's 1.960.
    let series = fixtures::trend().yearly.into_iter().find(|s| s.name == "walks_overdispersed_five_years").unwrap();
    let result = yearly_trend(&years_of(&series), 5.0).unwrap();
    assert_eq!(result.error_model, ErrorModel::QuasiPoisson);
    assert_eq!((result.interval.distribution.as_str(), result.interval.degrees_of_freedom), ("t", Some(3)));
    let [lower, upper] = series.fit.conf_int_95_scaled_t[1];
    assert_close(
        "slope interval half-width",
        result.interval.quantile * result.slope_std_error,
        (upper - lower) / 2.0,
        1e-7,
    );
    assert_close("annual lower", result.annual_change.lower, lower.exp() - 1.0, 1e-7);
    let normal_upper = (series.fit.params[1] + 1.959963984540054 * result.slope_std_error).exp() - 1.0;
    assert!(result.annual_change.upper > normal_upper + 1e-3, "wider than the normal interval");
    assert!(result.text.contains("Student's t with 3 degrees of freedom"), "{}", result.text);
}

#[test]
fn a_fifth_lost_per_decade_is_about_half_over_three_generations() {
    // Arithmetic: a 20% decline in 10 years is 1 − 0.8³ = 48.8% over 30 years. Counts
    // follow that rate exactly (rounded on a large effort).
    let data: Vec<YearCount> = (0..12)
        .map(|i| {
            let effort = 1e6;
            let count = (effort * 0.8_f64.powf(f64::from(i) / 10.0)).round() as u64;
            YearCount { year: 2010 + i, count, effort }
        })
        .collect();
    let result = yearly_trend(&data, 10.0).unwrap();
    assert_eq!(result.window_years, 30.0);
    assert_close("30-year change", result.window_change.estimate, -0.488, 1e-4);
    assert!(result.window_change.lower < result.window_change.estimate);
    assert!(result.window_change.upper > result.window_change.estimate);
    assert!(result.window_exceeds_data, "11 years of data for a 30-year window");
    assert_eq!(result.criterion_a.a2_to_a4_band, Some(analysis::criteria::Category::Vulnerable));
    assert!(result.text.contains("-48.8%"), "{}", result.text);
    assert!(result.text.contains("beyond them"), "{}", result.text);
}

#[test]
fn window_is_the_longer_of_ten_years_and_three_generations() {
    // IUCN Criteria v3.1, criterion A: 10 years or three generations, whichever is longer.
    assert_eq!(assessment_window_years(2.0), 10.0);
    assert_eq!(assessment_window_years(3.4), 10.2);
    assert_eq!(assessment_window_years(25.0), 75.0);
}

#[test]
fn mann_kendall_runs_on_yearly_rates() {
    // Gilbert 1987: a strictly falling rate has S = −n(n−1)/2.
    let data: Vec<YearCount> =
        (0..8).map(|i| YearCount { year: 2015 + i, count: 100 - 10 * i as u64, effort: 10.0 }).collect();
    let result = yearly_trend(&data, 3.0).unwrap();
    assert_eq!(result.mann_kendall.s, -28);
    assert_close("Sen slope of rates", result.mann_kendall.sen_slope.unwrap(), -1.0, 1e-12);
}

#[test]
fn bad_yearly_data_is_refused_with_what_is_wrong() {
    let year = |year, count, effort| YearCount { year, count, effort };
    let good = [year(2018, 3, 10.0), year(2019, 4, 12.0), year(2020, 2, 9.0)];
    let err = yearly_trend(&[good[0], year(2019, 4, 0.0), good[2]], 5.0).unwrap_err();
    assert_eq!(err.to_string(), "effort must be positive in year 2019, got 0");
    assert_eq!(yearly_trend(&[good[0], good[1], good[1]], 5.0).unwrap_err(), TrendError::DuplicateYear(2019));
    assert_eq!(yearly_trend(&good[..2], 5.0).unwrap_err(), TrendError::TooFewYears(2));
    let err = yearly_trend(&good, -1.0).unwrap_err();
    assert_eq!(err.to_string(), "generation length must be a positive number of years, got -1");
    let none = [year(2018, 0, 10.0), year(2019, 0, 12.0), year(2020, 0, 9.0)];
    assert_eq!(yearly_trend(&none, 5.0).unwrap_err(), TrendError::AllCountsZero);
}
