//! Effort-corrected encounter-rate trends over the window the criteria prescribe.
//!
//! Strandings and landings are counted per year together with the survey effort behind them
//! (walks, kilometres, hours: any unit, used consistently). [`yearly_trend`]:
//!
//! 1. takes the most recent assessment window — the longer of 10 years and three
//!    generations, criterion A — when the data are longer, and says which years it used;
//! 2. refuses plainly when every find lies in one year (the fit would run off to infinity);
//! 3. fits a Poisson log-linear trend with a log(effort) offset ([`poisson_glm`]) and a
//!    negative binomial one beside it ([`negative_binomial_glm`]), and chooses by the rule
//!    in [`ModelChoice`]: negative binomial when its AIC is lower than the Poisson's, else
//!    Poisson, with errors scaled by the Pearson dispersion (quasi-Poisson, t on the
//!    residual degrees of freedom) when it exceeds [`OVERDISPERSION_THRESHOLD`];
//! 4. turns the chosen slope into a change per year and over the window, with the test
//!    statistic (z or t) and p-value of the same error model;
//! 5. carries the fitted trend over the window only up to [`MAX_WINDOW_OVER_SPAN`] times
//!    the years fitted, and says so when it does; a projection (A3) is capped at
//!    [`PROJECTION_CAP_YEARS`];
//! 6. names the criterion-A bands the 95% interval spans, giving a band only when the whole
//!    interval lies in one;
//! 7. adds a Mann–Kendall test on the yearly encounter rates as a distribution-free check.
//!
//! [`poisson_glm`], [`negative_binomial_glm`] and [`mann_kendall`] are available alone.

mod choice;
mod error;
mod glm;
mod linalg;
mod mann_kendall;
mod negbin;
mod text;

use serde::{Deserialize, Serialize};

pub use choice::{ErrorModel, FittedLine, IntervalBasis, ModelChoice, SlopeTest};
pub use error::TrendError;
pub use glm::{Coefficient, Design, GlmFit, QuasiTest, poisson_glm};
pub use mann_kendall::{MannKendall, mann_kendall, mann_kendall_with_times};
pub use negbin::{NegBinCoefficient, NegBinFit, negative_binomial_glm};
pub use text::p_text;

use crate::criteria::{CriterionA, criterion_a, criterion_a_withheld};
use choice::{choose_model, chosen_line};
use text::{extrapolation_words, trend_text};

/// Pearson dispersion above which Poisson standard errors are scaled (quasi-Poisson).
///
/// A rule of thumb (common practice): below 1.5 the extra variation is small next to the
/// uncertainty in the dispersion itself from a few years of data. Errors are never scaled
/// down for dispersion below 1.
pub const OVERDISPERSION_THRESHOLD: f64 = 1.5;

/// The shortest assessment window in years (IUCN criterion A).
pub const MIN_WINDOW_YEARS: f64 = 10.0;
/// The assessment window in generations (IUCN criterion A).
pub const WINDOW_GENERATIONS: f64 = 3.0;
/// The longest projection into the future (IUCN criteria A3 and A4: up to 100 years).
pub const PROJECTION_CAP_YEARS: f64 = 100.0;
/// The fitted trend is carried over a window at most this many times the years it was
/// fitted on (our limit: the IUCN Guidelines' worked extrapolations carry a 10-year decline
/// over three 10-year generations; from memory). Beyond it no window change and no band is
/// given, only the change per year.
pub const MAX_WINDOW_OVER_SPAN: f64 = 3.0;

/// One year's count of animals and the survey effort behind it.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct YearCount {
    /// Calendar year.
    pub year: i32,
    /// Animals recorded that year on surveys counted in `effort` (zero is a real count).
    pub count: u64,
    /// Survey effort that year, in any unit used for every year; must be positive.
    pub effort: f64,
}

/// A change as a fraction (−0.2 is a 20% decline) with its 95% interval.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Change {
    /// Point estimate.
    pub estimate: f64,
    /// Lower end of the 95% interval.
    pub lower: f64,
    /// Upper end of the 95% interval.
    pub upper: f64,
}

impl Change {
    /// The change `exp(years × slope) − 1` with the interval slope ± quantile × error.
    fn over(years: f64, slope: f64, std_error: f64, quantile: f64) -> Self {
        let change = |b: f64| (years * b).exp() - 1.0;
        Self {
            estimate: change(slope),
            lower: change(slope - quantile * std_error),
            upper: change(slope + quantile * std_error),
        }
    }
}

/// An effort-corrected trend and what it means over the assessment window.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TrendSummary {
    /// First year fitted.
    pub first_year: i32,
    /// Last year fitted (the last year with data).
    pub last_year: i32,
    /// Number of years fitted.
    pub years: usize,
    /// First year with data, fitted or not.
    pub data_first_year: i32,
    /// Years with data before the window, not fitted.
    pub years_left_out: usize,
    /// The Poisson fit on the fitted years: intercept (log rate at the mean year) and slope.
    pub fit: GlmFit,
    /// The negative binomial fit beside it; `None` when it could not be fitted.
    pub negative_binomial: Option<NegBinFit>,
    /// The models compared and the rule that chose one.
    pub model_choice: ModelChoice,
    /// The model the headline figures come from.
    pub error_model: ErrorModel,
    /// Slope per year on the log scale, under the chosen model.
    pub slope_per_year: f64,
    /// Its standard error under the chosen model.
    pub slope_std_error: f64,
    /// The slope's test under the chosen model.
    pub slope_test: SlopeTest,
    /// Where the intervals' quantile comes from (normal, or t when the dispersion is estimated).
    pub interval: IntervalBasis,
    /// Change in the encounter rate per year.
    pub annual_change: Change,
    /// The assessment window in years: max(10, 3 × generation length).
    pub window_years: f64,
    /// Change over the window, carrying the fitted trend: exp(window × slope) − 1; `None`
    /// when the window is more than [`MAX_WINDOW_OVER_SPAN`] times the years fitted.
    pub window_change: Option<Change>,
    /// Whether the window is longer than the years fitted (the trend is carried beyond them).
    pub window_exceeds_data: bool,
    /// Why there is no window change, or how far it was carried, in words.
    pub extrapolation: Option<String>,
    /// The window for a projection (A3): the assessment window, at most 100 years.
    pub projection_years: f64,
    /// Change over `projection_years` if the fitted trend went on; `None` beyond the limit.
    pub projected_change: Option<Change>,
    /// Mann–Kendall test and Sen's slope (rate per year) on the fitted years' encounter rates.
    pub mann_kendall: MannKendall,
    /// The window change against the criterion-A thresholds.
    pub criterion_a: CriterionA,
    /// The fitted line under the chosen model, for drawing.
    pub line: FittedLine,
    /// A plain-text account of the trend.
    pub text: String,
}

/// Fits the encounter-rate trend of `data` and carries it over the assessment window.
pub fn yearly_trend(data: &[YearCount], generation_length_years: f64) -> Result<TrendSummary, TrendError> {
    let all = checked_years(data, generation_length_years)?;
    let window_years = assessment_window_years(generation_length_years);
    let fitted = recent_window(&all, window_years)?;
    check_separation(&fitted)?;
    let mean_year = fitted.iter().map(|d| f64::from(d.year)).sum::<f64>() / fitted.len() as f64;
    let (design, counts, offsets) = year_design(&fitted, mean_year)?;
    let fit = poisson_glm(&design, &counts, &offsets)?;
    let negative_binomial = negative_binomial_glm(&design, &counts, &offsets, &fit).ok();
    let model_choice = choose_model(&fit, negative_binomial.as_ref());
    let error_model = model_choice.chosen;
    let interval = IntervalBasis::for_model(error_model, fit.df_residual);
    let (line, slope_test) = chosen_line(error_model, &fit, negative_binomial.as_ref(), mean_year, &interval);
    let (slope, slope_std_error) = (line.slope, line.covariance[2].sqrt());
    let (first_year, last_year) = (fitted[0].year, fitted[fitted.len() - 1].year);
    let span = f64::from(last_year - first_year);
    let within_limit = window_years <= MAX_WINDOW_OVER_SPAN * span;
    let quantile = interval.quantile;
    let over = |years: f64| within_limit.then(|| Change::over(years, slope, slope_std_error, quantile));
    let window_change = over(window_years);
    let projection_years = window_years.min(PROJECTION_CAP_YEARS);
    let extrapolation = extrapolation_words(window_years, span, first_year, last_year, within_limit);
    let criterion_a = match (&window_change, &extrapolation) {
        (Some(c), _) => criterion_a(c.estimate, c.lower, c.upper, window_years),
        (None, reason) => criterion_a_withheld(reason.as_deref().unwrap_or("")),
    };
    let mut summary = TrendSummary {
        first_year,
        last_year,
        years: fitted.len(),
        data_first_year: all[0].year,
        years_left_out: all.len() - fitted.len(),
        mann_kendall: rate_mann_kendall(&fitted)?,
        fit,
        negative_binomial,
        model_choice,
        error_model,
        slope_per_year: slope,
        slope_std_error,
        slope_test,
        annual_change: Change::over(1.0, slope, slope_std_error, quantile),
        interval,
        window_years,
        window_change,
        window_exceeds_data: window_years > span,
        extrapolation,
        projection_years,
        projected_change: over(projection_years),
        criterion_a,
        line,
        text: String::new(),
    };
    summary.text = trend_text(&summary);
    Ok(summary)
}

/// The assessment window of criterion A: the longer of 10 years and three generations.
pub fn assessment_window_years(generation_length_years: f64) -> f64 {
    (WINDOW_GENERATIONS * generation_length_years).max(MIN_WINDOW_YEARS)
}

/// Validates the yearly data and returns it sorted by year.
fn checked_years(data: &[YearCount], generation_length_years: f64) -> Result<Vec<YearCount>, TrendError> {
    if !(generation_length_years > 0.0 && generation_length_years.is_finite()) {
        return Err(TrendError::InvalidGenerationLength(generation_length_years));
    }
    if let Some(bad) = data.iter().find(|d| !(d.effort > 0.0 && d.effort.is_finite())) {
        return Err(TrendError::EffortNotPositive { year: bad.year, effort: bad.effort });
    }
    let mut sorted = data.to_vec();
    sorted.sort_by_key(|d| d.year);
    if let Some(pair) = sorted.windows(2).find(|w| w[0].year == w[1].year) {
        return Err(TrendError::DuplicateYear(pair[0].year));
    }
    if sorted.len() < 3 {
        return Err(TrendError::TooFewYears(sorted.len()));
    }
    Ok(sorted)
}

/// The years within the most recent window: from `last − window` (whole years) to the last.
fn recent_window(sorted: &[YearCount], window_years: f64) -> Result<Vec<YearCount>, TrendError> {
    let last = sorted[sorted.len() - 1].year;
    let first = last - window_years.floor() as i32;
    let inside: Vec<YearCount> = sorted.iter().copied().filter(|d| d.year >= first).collect();
    if inside.len() < 3 {
        return Err(TrendError::TooFewYearsInWindow { first, last, years: inside.len() });
    }
    Ok(inside)
}

/// Refuses a series whose finds all lie in one year.
fn check_separation(fitted: &[YearCount]) -> Result<(), TrendError> {
    let mut with_finds = fitted.iter().filter(|d| d.count > 0);
    let Some(first_find) = with_finds.next() else { return Err(TrendError::AllCountsZero) };
    if with_finds.next().is_none() {
        return Err(TrendError::FindsInOneYear {
            year: first_find.year,
            animals: first_find.count,
            first: fitted[0].year,
            last: fitted[fitted.len() - 1].year,
        });
    }
    Ok(())
}

/// The design `log E[count] = log(effort) + a + b (year − mean year)`.
///
/// Centring the year keeps the intercept meaningful (log rate mid-series) and the
/// information matrix well conditioned; the slope is unchanged by it.
fn year_design(data: &[YearCount], mean_year: f64) -> Result<(Design, Vec<f64>, Vec<f64>), TrendError> {
    let rows: Vec<Vec<f64>> = data.iter().map(|d| vec![1.0, f64::from(d.year) - mean_year]).collect();
    let design = Design::new(vec!["intercept".into(), "year".into()], &rows)?;
    let counts: Vec<f64> = data.iter().map(|d| d.count as f64).collect();
    let offsets: Vec<f64> = data.iter().map(|d| d.effort.ln()).collect();
    Ok((design, counts, offsets))
}

fn rate_mann_kendall(data: &[YearCount]) -> Result<MannKendall, TrendError> {
    let years: Vec<f64> = data.iter().map(|d| f64::from(d.year)).collect();
    let rates: Vec<f64> = data.iter().map(|d| d.count as f64 / d.effort).collect();
    mann_kendall_with_times(&years, &rates)
}
