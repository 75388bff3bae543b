//! Which model the headline trend comes from, and the slope's test and fitted line under it.
//!
//! The rule: negative binomial when its AIC is lower than the Poisson's (likelihoods
//! compared with one parameter's penalty); otherwise Poisson, with errors scaled by the
//! Pearson dispersion (quasi-Poisson, Student's t on the residual degrees of freedom) when
//! it exceeds [`OVERDISPERSION_THRESHOLD`]. Whatever is chosen, the slope's statistic, its
//! p-value and the intervals all use that model's errors.

use serde::Serialize;

use super::OVERDISPERSION_THRESHOLD;
use super::glm::GlmFit;
use super::negbin::NegBinFit;
use crate::distributions::{Z_95, t_95, two_sided_p, two_sided_t_p};

/// The distribution the 95% intervals take their quantile from.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct IntervalBasis {
    /// `normal` with Poisson or negative binomial errors (likelihood-based), `t` with
    /// quasi-Poisson errors (the dispersion is estimated, so Student's t with the residual
    /// degrees of freedom, as statsmodels does with `use_t=True`).
    pub distribution: String,
    /// Degrees of freedom of the t distribution; `None` for the normal.
    pub degrees_of_freedom: Option<usize>,
    /// The 97.5% quantile used: 1.96 for the normal, larger for t on few years.
    pub quantile: f64,
}

impl IntervalBasis {
    pub(super) fn for_model(model: ErrorModel, df_residual: usize) -> Self {
        match model {
            ErrorModel::QuasiPoisson => {
                Self { distribution: "t".into(), degrees_of_freedom: Some(df_residual), quantile: t_95(df_residual) }
            }
            ErrorModel::Poisson | ErrorModel::NegativeBinomial => {
                Self { distribution: "normal".into(), degrees_of_freedom: None, quantile: Z_95 }
            }
        }
    }
}

/// Which model the headline figures come from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum ErrorModel {
    /// Poisson model-based errors (no overdispersion found).
    Poisson,
    /// The Poisson fit with errors scaled by √dispersion: overdispersed by the Pearson
    /// dispersion, but the negative binomial did not fit better.
    QuasiPoisson,
    /// The negative binomial fit: its AIC is lower than the Poisson's.
    NegativeBinomial,
}

/// The models compared and the rule that chose one.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ModelChoice {
    /// The model the headline figures come from.
    pub chosen: ErrorModel,
    /// AIC of the Poisson fit.
    pub poisson_aic: f64,
    /// AIC of the negative binomial fit; `None` when it could not be fitted.
    pub negative_binomial_aic: Option<f64>,
    /// The Pearson dispersion of the Poisson fit.
    pub dispersion: Option<f64>,
    /// The rule and how it applied, in words.
    pub reason: String,
}

/// The slope's test under the chosen model.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SlopeTest {
    /// `z` (normal) or `t` (Student's t).
    pub statistic: String,
    /// slope ÷ its standard error.
    pub value: f64,
    /// Degrees of freedom for t; `None` for z.
    pub degrees_of_freedom: Option<usize>,
    /// Two-sided p-value of no trend.
    pub p_value: f64,
}

/// The fitted line for drawing: log rate = intercept + slope × (year − mean year), with
/// the covariance of (intercept, slope) under the chosen model.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FittedLine {
    /// The mean of the fitted years (the intercept is the log rate there).
    pub mean_year: f64,
    /// Log rate at the mean year.
    pub intercept: f64,
    /// Change in log rate per year.
    pub slope: f64,
    /// [var intercept, cov, var slope].
    pub covariance: [f64; 3],
    /// The 97.5% quantile the intervals use.
    pub quantile: f64,
}

/// The documented rule: negative binomial when its AIC is below the Poisson's; otherwise
/// Poisson, with quasi-Poisson errors when the Pearson dispersion exceeds the threshold.
pub(super) fn choose_model(poisson: &GlmFit, negative_binomial: Option<&NegBinFit>) -> ModelChoice {
    let dispersion = poisson.dispersion;
    let nb_aic = negative_binomial.map(|nb| nb.aic);
    let overdispersed = dispersion.is_some_and(|d| d > OVERDISPERSION_THRESHOLD);
    let (chosen, why) = match (negative_binomial, overdispersed) {
        (Some(nb), _) if nb.aic < poisson.aic => (
            ErrorModel::NegativeBinomial,
            format!(
                "the negative binomial fit (α = {:.3}) has the lower AIC ({:.1} against the Poisson's {:.1})",
                nb.alpha, nb.aic, poisson.aic
            ),
        ),
        (_, true) => (
            ErrorModel::QuasiPoisson,
            format!(
                "the negative binomial fit does not lower the AIC{}, but the Pearson dispersion {:.2} exceeds \
                 {OVERDISPERSION_THRESHOLD}, so the Poisson errors are scaled by it (quasi-Poisson)",
                nb_aic.map(|a| format!(" ({a:.1} against {:.1})", poisson.aic)).unwrap_or_default(),
                dispersion.unwrap_or(f64::NAN)
            ),
        ),
        _ => (
            ErrorModel::Poisson,
            format!(
                "the negative binomial fit does not lower the AIC{} and the Pearson dispersion {} is at most \
                 {OVERDISPERSION_THRESHOLD}",
                nb_aic.map(|a| format!(" ({a:.1} against {:.1})", poisson.aic)).unwrap_or_default(),
                dispersion.map_or("(not defined)".into(), |d| format!("{d:.2}"))
            ),
        ),
    };
    ModelChoice {
        chosen,
        poisson_aic: poisson.aic,
        negative_binomial_aic: nb_aic,
        dispersion,
        reason: format!(
            "Rule: negative binomial when its AIC is lower than the Poisson's; otherwise Poisson, with errors \
             scaled by the Pearson dispersion when it exceeds {OVERDISPERSION_THRESHOLD}. Here {why}."
        ),
    }
}

/// The fitted line and the slope's test under the chosen model.
pub(super) fn chosen_line(
    model: ErrorModel,
    poisson: &GlmFit,
    negative_binomial: Option<&NegBinFit>,
    mean_year: f64,
    interval: &IntervalBasis,
) -> (FittedLine, SlopeTest) {
    let (intercept, slope, covariance) = match (model, negative_binomial) {
        (ErrorModel::NegativeBinomial, Some(nb)) => {
            let c = &nb.covariance;
            (nb.coefficients[0].estimate, nb.coefficients[1].estimate, [c[0], c[1], c[3]])
        }
        _ => {
            let scale = if model == ErrorModel::QuasiPoisson { poisson.dispersion.unwrap_or(1.0) } else { 1.0 };
            let c = &poisson.covariance;
            let (a, b) = (poisson.coefficients[0].estimate, poisson.coefficients[1].estimate);
            (a, b, [scale * c[0], scale * c[1], scale * c[3]])
        }
    };
    let value = slope / covariance[2].sqrt();
    let test = match interval.degrees_of_freedom {
        Some(df) => {
            SlopeTest { statistic: "t".into(), value, degrees_of_freedom: Some(df), p_value: two_sided_t_p(value, df) }
        }
        None => SlopeTest { statistic: "z".into(), value, degrees_of_freedom: None, p_value: two_sided_p(value) },
    };
    (FittedLine { mean_year, intercept, slope, covariance, quantile: interval.quantile }, test)
}
