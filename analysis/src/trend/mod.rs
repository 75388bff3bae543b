//! Effort-corrected encounter-rate trends over the window the criteria prescribe.
//!
//! Strandings and landings are counted per year together with the survey effort behind them
//! (walks, kilometres, hours: any unit, used consistently). [`yearly_trend`] fits a Poisson
//! log-linear trend with a log(effort) offset, falls back to quasi-Poisson errors when the
//! counts are overdispersed, turns the slope into a change per year and over the assessment
//! window (the longer of 10 years and three generations), and adds a Mann–Kendall test on
//! the yearly encounter rates as a distribution-free check. [`poisson_glm`] and
//! [`mann_kendall`] are available alone.

mod glm;
mod linalg;
mod mann_kendall;

use serde::{Deserialize, Serialize};
use thiserror::Error;

pub use glm::{Coefficient, Design, GlmFit, poisson_glm};
pub use mann_kendall::{MannKendall, mann_kendall, mann_kendall_with_times};

use crate::criteria::{CriterionA, criterion_a};
use crate::normal::{Z_95, t_95};

/// Pearson dispersion above which standard errors are scaled (quasi-Poisson).
///
/// A rule of thumb (common practice): below 1.5 the extra variation is small next to the
/// uncertainty in the dispersion itself from a few years of data. Errors are never scaled
/// down for dispersion below 1.
pub const OVERDISPERSION_THRESHOLD: f64 = 1.5;

/// The shortest assessment window in years (IUCN criterion A).
pub const MIN_WINDOW_YEARS: f64 = 10.0;
/// The assessment window in generations (IUCN criterion A).
pub const WINDOW_GENERATIONS: f64 = 3.0;

/// Why a trend could not be computed.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum TrendError {
    /// The design has no columns.
    #[error("the design matrix needs at least one column")]
    NoColumns,
    /// A design row has the wrong number of values.
    #[error("design row {row} has {got} values but there are {expected} columns")]
    RowLength {
        /// Zero-based row.
        row: usize,
        /// Number of columns.
        expected: usize,
        /// Values in the row.
        got: usize,
    },
    /// Inputs of one observation each do not have one value per observation.
    #[error("{what} has {got} values but there are {expected} observations")]
    LengthMismatch {
        /// Which input.
        what: &'static str,
        /// Number of observations.
        expected: usize,
        /// Values given.
        got: usize,
    },
    /// A value is infinite or not a number.
    #[error("{what} in row {row}{} is not a finite number", column.map(|c| format!(", column {c}")).unwrap_or_default())]
    NotFinite {
        /// Which input.
        what: &'static str,
        /// Zero-based row.
        row: usize,
        /// Zero-based column, for design values.
        column: Option<usize>,
    },
    /// A count is negative.
    #[error("count must be zero or more, got {value} in row {row}")]
    NegativeCount {
        /// Zero-based row.
        row: usize,
        /// The count given.
        value: f64,
    },
    /// More coefficients than observations.
    #[error("{rows} observations cannot fit {columns} coefficients")]
    TooFewObservations {
        /// Observations.
        rows: usize,
        /// Coefficients.
        columns: usize,
    },
    /// Every count is zero, so the rate is zero and its logarithm has no finite fit.
    #[error("every count is zero, so no rate or trend can be fitted")]
    AllCountsZero,
    /// A design column is a linear combination of earlier columns.
    #[error("design column '{column}' is a linear combination of the columns before it")]
    DependentColumns {
        /// The dependent column's name.
        column: String,
    },
    /// IRLS did not settle.
    #[error("the model did not converge after {iterations} iterations")]
    NotConverged {
        /// Iterations run.
        iterations: usize,
    },
    /// Times of a series must increase.
    #[error("times must increase strictly, but value {row} is not later than the one before")]
    TimesNotIncreasing {
        /// Zero-based index of the offending time.
        row: usize,
    },
    /// Effort is zero, negative or not a number.
    #[error("effort must be positive in year {year}, got {effort}")]
    EffortNotPositive {
        /// The year.
        year: i32,
        /// The effort given.
        effort: f64,
    },
    /// The same year appears twice.
    #[error("year {0} appears more than once; give one total per year")]
    DuplicateYear(i32),
    /// Too few years to fit and check a trend.
    #[error("a trend needs at least 3 years with effort, got {0}")]
    TooFewYears(usize),
    /// The generation length is not a positive number of years.
    #[error("generation length must be a positive number of years, got {0}")]
    InvalidGenerationLength(f64),
}

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

/// The distribution the 95% intervals take their quantile from.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct IntervalBasis {
    /// `normal` with Poisson errors (the scale is known), `t` with scaled errors (the
    /// dispersion is estimated, so Student's t with the residual degrees of freedom, as
    /// statsmodels does with `use_t=True`).
    pub distribution: String,
    /// Degrees of freedom of the t distribution; `None` for the normal.
    pub degrees_of_freedom: Option<usize>,
    /// The 97.5% quantile used: 1.96 for the normal, larger for t on few years.
    pub quantile: f64,
}

impl IntervalBasis {
    fn for_model(model: ErrorModel, df_residual: usize) -> Self {
        match model {
            ErrorModel::Poisson => Self { distribution: "normal".into(), degrees_of_freedom: None, quantile: Z_95 },
            ErrorModel::QuasiPoisson => {
                Self { distribution: "t".into(), degrees_of_freedom: Some(df_residual), quantile: t_95(df_residual) }
            }
        }
    }
}

/// Which standard errors the trend's intervals use.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum ErrorModel {
    /// Poisson model-based errors (dispersion at or below the threshold).
    Poisson,
    /// Errors scaled by √dispersion because the counts are overdispersed.
    QuasiPoisson,
}

/// An effort-corrected trend and what it means over the assessment window.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TrendSummary {
    /// First year with data.
    pub first_year: i32,
    /// Last year with data.
    pub last_year: i32,
    /// Number of years with data.
    pub years: usize,
    /// The Poisson fit: intercept (log rate at the mean year) and slope per year.
    pub fit: GlmFit,
    /// Whether the intervals use Poisson or scaled errors.
    pub error_model: ErrorModel,
    /// Slope per year on the log scale.
    pub slope_per_year: f64,
    /// Standard error of the slope under `error_model`.
    pub slope_std_error: f64,
    /// Where the intervals' quantile comes from (normal, or t when the dispersion is estimated).
    pub interval: IntervalBasis,
    /// Change in the encounter rate per year.
    pub annual_change: Change,
    /// The assessment window in years: max(10, 3 × generation length).
    pub window_years: f64,
    /// Change over the window, extrapolating the fitted trend: exp(window × slope) − 1.
    pub window_change: Change,
    /// Whether the window is longer than the years the data cover (an extrapolation).
    pub window_exceeds_data: bool,
    /// Mann–Kendall test and Sen's slope (rate per year) on the yearly encounter rates.
    pub mann_kendall: MannKendall,
    /// The window change against the criterion-A thresholds.
    pub criterion_a: CriterionA,
    /// A plain-text account of the trend.
    pub text: String,
}

/// Fits the encounter-rate trend of `data` and projects it over the assessment window.
pub fn yearly_trend(data: &[YearCount], generation_length_years: f64) -> Result<TrendSummary, TrendError> {
    let data = checked_years(data, generation_length_years)?;
    let fit = fit_year_trend(&data)?;
    let slope = &fit.coefficients[1];
    let dispersion = fit.dispersion.unwrap_or(1.0);
    let (error_model, slope_std_error) = match slope.quasi_std_error {
        Some(scaled) if dispersion > OVERDISPERSION_THRESHOLD => (ErrorModel::QuasiPoisson, scaled),
        _ => (ErrorModel::Poisson, slope.std_error),
    };
    let slope_per_year = slope.estimate;
    let interval = IntervalBasis::for_model(error_model, fit.df_residual);
    let window_years = assessment_window_years(generation_length_years);
    let window_change = Change::over(window_years, slope_per_year, slope_std_error, interval.quantile);
    let (first_year, last_year) = (data[0].year, data[data.len() - 1].year);
    let years_covered = f64::from(last_year - first_year);
    let mann_kendall = rate_mann_kendall(&data)?;
    let criterion_a = criterion_a(window_change.estimate, window_years);
    let mut summary = TrendSummary {
        first_year,
        last_year,
        years: data.len(),
        fit,
        error_model,
        slope_per_year,
        slope_std_error,
        annual_change: Change::over(1.0, slope_per_year, slope_std_error, interval.quantile),
        interval,
        window_years,
        window_change,
        window_exceeds_data: window_years > years_covered,
        mann_kendall,
        criterion_a,
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

/// Fits `log E[count] = log(effort) + a + b (year − mean year)`.
///
/// Centring the year keeps the intercept meaningful (log rate mid-series) and the
/// information matrix well conditioned; the slope is unchanged by it.
fn fit_year_trend(data: &[YearCount]) -> Result<GlmFit, TrendError> {
    let mean_year = data.iter().map(|d| f64::from(d.year)).sum::<f64>() / data.len() as f64;
    let rows: Vec<Vec<f64>> = data.iter().map(|d| vec![1.0, f64::from(d.year) - mean_year]).collect();
    let design = Design::new(vec!["intercept".into(), "year".into()], &rows)?;
    let counts: Vec<f64> = data.iter().map(|d| d.count as f64).collect();
    let offsets: Vec<f64> = data.iter().map(|d| d.effort.ln()).collect();
    poisson_glm(&design, &counts, &offsets)
}

fn rate_mann_kendall(data: &[YearCount]) -> Result<MannKendall, TrendError> {
    let years: Vec<f64> = data.iter().map(|d| f64::from(d.year)).collect();
    let rates: Vec<f64> = data.iter().map(|d| d.count as f64 / d.effort).collect();
    mann_kendall_with_times(&years, &rates)
}

fn trend_text(s: &TrendSummary) -> String {
    let percent = |x: f64| format!("{:+.1}%", 100.0 * x);
    let errors = match s.error_model {
        ErrorModel::Poisson => "Poisson errors".to_string(),
        ErrorModel::QuasiPoisson => format!(
            "errors scaled for overdispersion (Pearson dispersion {:.2} > {OVERDISPERSION_THRESHOLD}), \
             interval from Student's t with {} degrees of freedom",
            s.fit.dispersion.unwrap_or(1.0),
            s.fit.df_residual
        ),
    };
    let extrapolation = if s.window_exceeds_data {
        format!(
            " The window is longer than the {} years the data cover, so this extends the fitted trend beyond them.",
            s.last_year - s.first_year
        )
    } else {
        String::new()
    };
    format!(
        "Encounter rate per unit effort, {first}–{last} ({n} years): {annual} a year \
         (95% interval {alo} to {ahi}; {errors}). Over the {window:.0}-year window: {w} \
         ({wlo} to {whi}).{extrapolation} Mann–Kendall on yearly rates: S = {mk_s}, \
         p = {mk_p:.3}. {criterion}",
        first = s.first_year,
        last = s.last_year,
        n = s.years,
        annual = percent(s.annual_change.estimate),
        alo = percent(s.annual_change.lower),
        ahi = percent(s.annual_change.upper),
        window = s.window_years,
        w = percent(s.window_change.estimate),
        wlo = percent(s.window_change.lower),
        whi = percent(s.window_change.upper),
        mk_s = s.mann_kendall.s,
        mk_p = s.mann_kendall.p_value,
        criterion = s.criterion_a.text,
    )
}
