//! The trend in words: which years were fitted, the change per year and over the window
//! (or why none is given), the model and why, and criterion A.

use super::{ErrorModel, MAX_WINDOW_OVER_SPAN, PROJECTION_CAP_YEARS, TrendSummary};
use crate::words::{change_phrase, signed_change};

/// Says how far the trend was carried beyond the years fitted, or why it was not.
pub(super) fn extrapolation_words(window: f64, span: f64, first: i32, last: i32, within_limit: bool) -> Option<String> {
    if window <= span {
        return None;
    }
    Some(if within_limit {
        format!(
            "The {window:.0}-year window is longer than the {span:.0} years fitted ({first}–{last}), so the fitted \
             trend is carried over the rest of it (at most {MAX_WINDOW_OVER_SPAN:.0} times the years fitted)."
        )
    } else {
        format!(
            "the fitted years {first}–{last} cover {span:.0} years, and the {window:.0}-year window is more than \
             {MAX_WINDOW_OVER_SPAN:.0} times that; wrackline does not carry a trend that far beyond its data. The \
             change per year is given; more years of data are needed for the window."
        )
    })
}

/// A test statistic as text: two decimals, with a true minus sign and no "−0.00".
fn statistic_text(value: f64) -> String {
    if value.abs() < 0.005 {
        "0.00".into()
    } else if value < 0.0 {
        format!("\u{2212}{:.2}", -value)
    } else {
        format!("{value:.2}")
    }
}

/// A p-value as text: three decimals, or "< 0.001".
pub fn p_text(p: f64) -> String {
    if p < 0.001 { "< 0.001".into() } else { format!("= {p:.3}") }
}

fn model_words(s: &TrendSummary) -> String {
    match s.error_model {
        ErrorModel::Poisson => "Poisson errors".to_string(),
        ErrorModel::QuasiPoisson => format!(
            "quasi-Poisson errors (scaled by the Pearson dispersion {:.2}), interval from Student's t with {} \
             degrees of freedom",
            s.fit.dispersion.unwrap_or(1.0),
            s.fit.df_residual
        ),
        ErrorModel::NegativeBinomial => format!(
            "negative binomial errors (α = {:.3})",
            s.negative_binomial.as_ref().map_or(f64::NAN, |nb| nb.alpha)
        ),
    }
}

pub(super) fn trend_text(s: &TrendSummary) -> String {
    let left_out = if s.years_left_out > 0 {
        format!(
            " The {} earlier years with data ({}–{}) are not fitted: criterion A looks at the most recent window.",
            s.years_left_out,
            s.data_first_year,
            s.first_year - 1
        )
    } else {
        String::new()
    };
    let window = match &s.window_change {
        Some(c) => format!(
            " Over the {:.0}-year window: {} ({} to {}).{}",
            s.window_years,
            signed_change(c.estimate),
            signed_change(c.lower),
            signed_change(c.upper),
            s.extrapolation.as_deref().map(|e| format!(" {e}")).unwrap_or_default()
        ),
        None => format!(
            " No change over the {:.0}-year window is given: {}",
            s.window_years,
            s.extrapolation.as_deref().unwrap_or("")
        ),
    };
    let projection = match &s.projected_change {
        Some(c) if s.projection_years < s.window_years => format!(
            " Projected forward (A3), the window is capped at {PROJECTION_CAP_YEARS:.0} years: {} over the next {:.0} \
             years if the fitted trend went on.",
            change_phrase(c.estimate),
            s.projection_years
        ),
        _ => String::new(),
    };
    let test = &s.slope_test;
    format!(
        "Encounter rate per unit effort, fitted on {first}–{last} ({n} years with effort).{left_out} Change per \
         year: {annual} (95% interval {alo} to {ahi}; {errors}; {stat} = {value}, p {p}).{window}{projection} \
         {choice} Mann–Kendall on the yearly rates: S = {mk_s}, p = {mk_p:.3}. {criterion}",
        first = s.first_year,
        last = s.last_year,
        n = s.years,
        annual = signed_change(s.annual_change.estimate),
        alo = signed_change(s.annual_change.lower),
        ahi = signed_change(s.annual_change.upper),
        errors = model_words(s),
        stat = test.statistic,
        value = statistic_text(test.value),
        p = p_text(test.p_value),
        choice = s.model_choice.reason,
        mk_s = s.mann_kendall.s,
        mk_p = s.mann_kendall.p_value,
        criterion = s.criterion_a.text,
    )
}
