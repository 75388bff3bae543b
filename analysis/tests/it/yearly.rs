//! Yearly encounter-rate trends: each step of the documented procedure against statsmodels
//! (trend.json: the window chosen as the README writes it, Poisson, quasi-Poisson and
//! negative binomial fits, the choice between them, changes and the bands they span), and
//! the refusals and words an assessor reads.

use analysis::criteria::Category;
use analysis::trend::{
    ErrorModel, MAX_WINDOW_OVER_SPAN, PROJECTION_CAP_YEARS, TrendError, YearCount, assessment_window_years,
    yearly_trend,
};

use crate::{assert_close, fixtures};

fn years_of(series: &fixtures::YearlySeries) -> Vec<YearCount> {
    let rows = series.years.iter().zip(&series.counts).zip(&series.effort);
    rows.map(|((&year, &count), &effort)| YearCount { year, count, effort }).collect()
}

fn category(name: &Option<String>) -> Option<Category> {
    name.as_deref().map(|n| match n {
        "CriticallyEndangered" => Category::CriticallyEndangered,
        "Endangered" => Category::Endangered,
        "Vulnerable" => Category::Vulnerable,
        other => panic!("unknown category {other}"),
    })
}

#[test]
fn every_step_matches_statsmodels_on_the_documented_procedure() {
    // Reference: trend.json from make_reference.py — the most recent max(10, 3 × generation)
    // years, statsmodels GLM Poisson (and scale="X2", use_t=True) and NegativeBinomial(nb2),
    // the choice by AIC then Pearson dispersion, exp(window × slope) − 1 with the model's
    // quantile, the A1 and A2–A4 bands at the ends of the interval, pymannkendall on the rates.
    let mut models = Vec::new();
    for s in fixtures::trend().yearly {
        let want = &s.expected;
        let got = yearly_trend(&years_of(&s), s.generation_length).unwrap_or_else(|e| panic!("{}: {e}", s.name));
        assert_eq!(got.window_years, want.window_years, "{}", s.name);
        assert_eq!(
            (got.first_year, got.last_year, got.years),
            (want.first_year, want.last_year, want.years_fitted),
            "{}",
            s.name
        );
        crate::glm::check_against_statsmodels(&s.name, &got.fit, &want.poisson);
        let nb = got.negative_binomial.as_ref().unwrap_or_else(|| panic!("{}: no negative binomial fit", s.name));
        crate::glm::check_negative_binomial(&s.name, nb, &want.negative_binomial, &got.fit);
        assert_eq!(format!("{:?}", got.error_model), want.chosen, "{} model", s.name);
        assert_close(&format!("{} slope", s.name), got.slope_per_year, want.slope, 1e-6);
        assert_close(&format!("{} slope SE", s.name), got.slope_std_error, want.slope_se, 1e-5);
        assert_close(&format!("{} quantile", s.name), got.interval.quantile, want.quantile, 1e-9);
        assert_eq!(got.slope_test.degrees_of_freedom, want.degrees_of_freedom, "{}", s.name);
        assert_close(&format!("{} slope p", s.name), got.slope_test.p_value, want.slope_p, 1e-4);
        let annual = [got.annual_change.estimate, got.annual_change.lower, got.annual_change.upper];
        for (k, (g, w)) in annual.iter().zip(want.annual_change).enumerate() {
            assert_close(&format!("{} annual change {k}", s.name), *g, w, 1e-5);
        }
        // statsmodels' own conf_int for the Poisson fits: the normal with the Poisson scale,
        // Student's t with the Pearson scale (use_t=True).
        let interval = match got.error_model {
            ErrorModel::Poisson => Some(want.poisson.conf_int_95[1]),
            ErrorModel::QuasiPoisson => Some(want.poisson.conf_int_95_scaled_t[1]),
            ErrorModel::NegativeBinomial => None,
        };
        if let Some([lower, upper]) = interval {
            assert_close(&format!("{} annual lower", s.name), got.annual_change.lower, lower.exp_m1(), 1e-6);
            assert_close(&format!("{} annual upper", s.name), got.annual_change.upper, upper.exp_m1(), 1e-6);
        }
        match (&got.window_change, &want.window_change) {
            (Some(g), Some(w)) => {
                for (k, (g, w)) in [g.estimate, g.lower, g.upper].iter().zip(w).enumerate() {
                    assert_close(&format!("{} window change {k}", s.name), *g, *w, 1e-5);
                }
                let span = got.criterion_a.a2_to_a4_span.unwrap();
                let want_span = want.a2_span.as_ref().unwrap();
                assert_eq!(
                    (span.least, span.most),
                    (category(&want_span[0]), category(&want_span[1])),
                    "{} A2",
                    s.name
                );
                let a1 = got.criterion_a.a1_span.unwrap();
                let want_a1 = want.a1_span.as_ref().unwrap();
                assert_eq!((a1.least, a1.most), (category(&want_a1[0]), category(&want_a1[1])), "{} A1", s.name);
            }
            (None, None) => {}
            (g, w) => panic!("{}: window change {g:?} against {w:?}", s.name),
        }
        let mk = &want.mann_kendall;
        assert_eq!(got.mann_kendall.s, mk.s, "{} S", s.name);
        assert_close(&format!("{} MK Var(S)", s.name), got.mann_kendall.var_s, mk.var_s, 1e-9);
        assert_close(&format!("{} MK Z", s.name), got.mann_kendall.z, mk.z, 1e-9);
        assert_close(&format!("{} MK p", s.name), got.mann_kendall.p_value, mk.p_value, 1e-7);
        assert_close(&format!("{} Sen", s.name), got.mann_kendall.sen_slope.unwrap(), mk.sen_slope, 1e-9);
        models.push(got.error_model);
    }
    for model in [ErrorModel::Poisson, ErrorModel::QuasiPoisson, ErrorModel::NegativeBinomial] {
        assert!(models.contains(&model), "the fixture exercises {model:?}");
    }
}

#[test]
fn forty_years_are_fitted_on_the_most_recent_window_and_say_so() {
    // 40 years whose last ten fell by three quarters, generation length 3 years: criterion A
    // looks at the last 10 years (IUCN Criteria v3.1), fitted 2014–2024 by statsmodels:
    // about −70% (EN under A2), where the whole series fitted gave about −16% and no band.
    let s = fixtures::trend().yearly.into_iter().find(|s| s.name == "forty_years_last_ten_falling").unwrap();
    let got = yearly_trend(&years_of(&s), 3.0).unwrap();
    assert_eq!((got.first_year, got.last_year, got.years_left_out), (2014, 2024, 29));
    assert_eq!(got.criterion_a.a2_to_a4_band, Some(Category::Endangered));
    assert!(got.text.contains("fitted on 2014–2024"), "{}", got.text);
    assert!(got.text.contains("29 earlier years with data (1985–2013) are not fitted"), "{}", got.text);
}

#[test]
fn the_slope_test_uses_the_chosen_models_errors() {
    // statsmodels GLM(scale="X2", use_t=True): under quasi-Poisson the slope's statistic is t
    // on the residual degrees of freedom with its own p, not the Poisson z and p.
    let s = fixtures::trend().yearly.into_iter().find(|s| s.name == "quasi_poisson_chosen").unwrap();
    let got = yearly_trend(&years_of(&s), s.generation_length).unwrap();
    assert_eq!(got.error_model, ErrorModel::QuasiPoisson);
    assert_eq!((got.slope_test.statistic.as_str(), got.slope_test.degrees_of_freedom), ("t", Some(6)));
    assert_close("t", got.slope_test.value, s.expected.poisson.t_scaled[1], 1e-6);
    assert_close("p", got.slope_test.p_value, s.expected.poisson.p_values_scaled_t[1], 1e-5);
    assert!(got.slope_test.p_value > got.fit.coefficients[1].p_value, "scaled errors give the larger p");
    assert!(got.model_choice.reason.contains("does not lower the AIC"), "{}", got.model_choice.reason);
    assert!(got.text.contains("t = "), "{}", got.text);
}

#[test]
fn an_interval_across_bands_gives_no_single_band() {
    // statsmodels' interval for the five-year overdispersed series runs from below the VU
    // threshold to beyond the CR one: the text names the span, no band is given.
    let s = fixtures::trend().yearly.into_iter().find(|s| s.name == "walks_overdispersed_five_years").unwrap();
    let got = yearly_trend(&years_of(&s), s.generation_length).unwrap();
    let span = got.criterion_a.a2_to_a4_span.unwrap();
    assert_eq!((span.least, span.most), (None, Some(Category::CriticallyEndangered)));
    assert_eq!(got.criterion_a.a2_to_a4_band, None);
    let text = &got.criterion_a.text;
    assert!(
        text.contains("the interval spans from below the Vulnerable (30%) threshold to Critically Endangered (CR)"),
        "{text}"
    );
    assert!(text.contains("no single band is given"), "{text}");
}

#[test]
fn a_window_far_longer_than_the_data_gives_no_change_and_no_band() {
    // Three years of counts, generation length 8 (window 24 years): more than three times the
    // 2 years covered, so only the change per year is given (the limit, stated in words).
    let data = [(2022, 1), (2023, 3), (2024, 20)].map(|(year, count)| YearCount { year, count, effort: 1.0 });
    let got = yearly_trend(&data, 8.0).unwrap();
    assert_eq!((got.window_years, got.window_change), (24.0, None));
    assert_eq!(got.projected_change, None);
    assert_eq!((got.criterion_a.a2_to_a4_band, got.criterion_a.reduction_percent), (None, None));
    assert!(got.text.contains("does not carry a trend that far beyond its data"), "{}", got.text);
    assert!(got.criterion_a.text.contains("no criterion-A band"), "{}", got.criterion_a.text);
    assert!(!got.text.contains("71,728"), "no runaway percentages: {}", got.text);
    assert!(got.window_years > MAX_WINDOW_OVER_SPAN * 2.0);
}

#[test]
fn a_fifth_lost_per_decade_is_about_half_over_three_generations() {
    // Arithmetic: a 20% decline in 10 years is 1 − 0.8³ = 48.8% over 30 years. Counts
    // follow that rate exactly (rounded on a large effort); 11 years span 10, and 30 is
    // within three times that, so the trend is carried over the window and says so.
    let data: Vec<YearCount> = (0..11)
        .map(|i| {
            let effort = 1e6;
            let count = (effort * 0.8_f64.powf(f64::from(i) / 10.0)).round() as u64;
            YearCount { year: 2010 + i, count, effort }
        })
        .collect();
    let result = yearly_trend(&data, 10.0).unwrap();
    assert_eq!(result.window_years, 30.0);
    let change = result.window_change.unwrap();
    assert_close("30-year change", change.estimate, -0.488, 1e-4);
    assert!(change.lower < change.estimate && change.estimate < change.upper);
    assert!(result.window_exceeds_data, "10 years covered for a 30-year window");
    assert_eq!(result.criterion_a.a2_to_a4_band, Some(Category::Vulnerable));
    assert!(result.text.contains("\u{2212}48.8%"), "{}", result.text);
    assert!(result.text.contains("carried over the rest of it"), "{}", result.text);
}

#[test]
fn projections_are_capped_at_a_hundred_years() {
    // IUCN Criteria v3.1, A3 and A4: up to a maximum of 100 years. Generation length 40
    // gives a 120-year window; the projection is over 100 years (statsmodels slope, trend.json).
    let s = fixtures::trend().yearly.into_iter().find(|s| s.name == "sixty_years_long_lived").unwrap();
    let got = yearly_trend(&years_of(&s), 40.0).unwrap();
    assert_eq!((got.window_years, got.projection_years), (120.0, PROJECTION_CAP_YEARS));
    let projected = got.projected_change.unwrap();
    assert_close("100-year projection", projected.estimate, (100.0 * s.expected.slope).exp_m1(), 1e-6);
    assert!(got.text.contains("capped at 100 years"), "{}", got.text);
}

#[test]
fn finds_in_one_year_are_refused_in_words() {
    // Separation: with every find in one year the fitted rate runs off without limit.
    let data =
        [0, 0, 0, 0, 7].iter().enumerate().map(|(i, &count)| YearCount { year: 2020 + i as i32, count, effort: 5.0 });
    let err = yearly_trend(&data.collect::<Vec<_>>(), 8.0).unwrap_err();
    assert_eq!(err, TrendError::FindsInOneYear { year: 2024, animals: 7, first: 2020, last: 2024 });
    let text = err.to_string();
    assert!(text.contains("all 7 animals in 2020–2024 were found in one year (2024)"), "{text}");
    assert!(!text.contains("linear combination"), "{text}");
}

#[test]
fn a_flat_series_says_no_change() {
    // Arithmetic: a constant rate has slope 0; the text says "no change", never "−0.0%".
    let data: Vec<YearCount> = (2015..2025).map(|year| YearCount { year, count: 10, effort: 2.0 }).collect();
    let got = yearly_trend(&data, 3.0).unwrap();
    assert!(got.criterion_a.text.contains("shows no change over 10 years"), "{}", got.criterion_a.text);
    assert!(!got.text.contains("-0.0") && !got.text.contains("\u{2212}0.0"), "{}", got.text);
}

#[test]
fn counts_without_any_variation_give_figures_and_no_panic() {
    // One animal a year on the same effort: the fit is exact (dispersion 0), so a scaled
    // error is 0 and its t is 0 ÷ 0; statrs panics if asked about it (regression: the
    // server's trend handler panicked on four such years).
    let data: Vec<YearCount> = (2021..2025).map(|year| YearCount { year, count: 1, effort: 1.0 }).collect();
    let got = yearly_trend(&data, 8.0).unwrap();
    assert_eq!(got.fit.coefficients[1].quasi, None, "no scaled errors below a dispersion of 1");
    assert!(got.slope_test.p_value.is_finite());
    assert!(serde_json::to_string(&got).is_ok());
}

#[test]
fn window_is_the_longer_of_ten_years_and_three_generations() {
    // IUCN Criteria v3.1, criterion A: 10 years or three generations, whichever is longer.
    assert_eq!(assessment_window_years(2.0), 10.0);
    assert_eq!(assessment_window_years(3.4), 10.2);
    assert_eq!(assessment_window_years(25.0), 75.0);
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
    let gap = [year(1990, 3, 1.0), year(1991, 4, 1.0), year(2023, 2, 1.0), year(2024, 5, 1.0)];
    let err = yearly_trend(&gap, 3.0).unwrap_err();
    assert_eq!(err, TrendError::TooFewYearsInWindow { first: 2014, last: 2024, years: 2 });
}
