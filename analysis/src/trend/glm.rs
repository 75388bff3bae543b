//! Poisson log-linear models fitted by iteratively reweighted least squares (IRLS).
//!
//! Encounter counts over unequal effort are modelled as `log E[count] = log(effort) + Xβ`,
//! with `log(effort)` as an offset. The design matrix is general, so the same fit serves a
//! yearly trend and the published worked examples the tests reproduce (Dobson & Barnett's
//! British doctors data). The fit reports the deviance and the Pearson dispersion, and
//! standard errors both as the Poisson model gives them and scaled by the dispersion
//! (quasi-Poisson), for counts more variable than Poisson.

use serde::Serialize;

use super::TrendError;
use super::linalg::Cholesky;
use crate::distributions::{ln_factorial, two_sided_p, two_sided_t_p};

/// IRLS stops when the deviance changes by less than this, relative to its size.
const CONVERGENCE_TOLERANCE: f64 = 1e-12;
/// IRLS gives up after this many iterations.
const MAX_ITERATIONS: usize = 100;

/// A design matrix: one row per observation, one named column per coefficient.
#[derive(Debug, Clone, PartialEq)]
pub struct Design {
    names: Vec<String>,
    values: Vec<f64>,
    rows: usize,
}

impl Design {
    /// Builds a design from column names and rows; every row needs one finite value per name.
    pub fn new(names: Vec<String>, rows: &[Vec<f64>]) -> Result<Self, TrendError> {
        if names.is_empty() {
            return Err(TrendError::NoColumns);
        }
        for (row, values) in rows.iter().enumerate() {
            if values.len() != names.len() {
                return Err(TrendError::RowLength { row, expected: names.len(), got: values.len() });
            }
            if let Some(column) = values.iter().position(|v| !v.is_finite()) {
                return Err(TrendError::NotFinite { what: "design value", row, column: Some(column) });
            }
        }
        Ok(Self { names, values: rows.concat(), rows: rows.len() })
    }

    /// The column names, one per coefficient.
    pub fn names(&self) -> &[String] {
        &self.names
    }

    /// The number of observations.
    pub fn rows(&self) -> usize {
        self.rows
    }

    fn columns(&self) -> usize {
        self.names.len()
    }

    pub(crate) fn row(&self, i: usize) -> &[f64] {
        let p = self.columns();
        &self.values[i * p..(i + 1) * p]
    }
}

/// One fitted coefficient.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Coefficient {
    /// The design column's name.
    pub name: String,
    /// The estimate β on the log scale.
    pub estimate: f64,
    /// The Poisson (model-based) standard error.
    pub std_error: f64,
    /// Wald statistic `estimate / std_error` (Poisson errors).
    pub z: f64,
    /// Two-sided p-value of `z` under the standard normal (Poisson errors).
    pub p_value: f64,
    /// The same coefficient tested with quasi-Poisson errors; `None` with no residual
    /// degrees of freedom, or when the Pearson dispersion is below 1 (scaled errors are for
    /// overdispersion; below 1 they would shrink the Poisson errors, down to nothing for
    /// counts that fit exactly, and their t would be rounding over rounding).
    pub quasi: Option<QuasiTest>,
}

/// A coefficient tested with errors scaled by the Pearson dispersion (quasi-Poisson):
/// t on the residual degrees of freedom, as statsmodels does with `scale="X2", use_t=True`.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct QuasiTest {
    /// `std_error × √dispersion`.
    pub std_error: f64,
    /// `estimate / std_error`.
    pub t: f64,
    /// Two-sided p-value of `t` under Student's t with the residual degrees of freedom.
    pub p_value: f64,
}

/// A fitted Poisson log-linear model.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct GlmFit {
    /// The coefficients in design-column order.
    pub coefficients: Vec<Coefficient>,
    /// Residual deviance `2 Σ [y log(y/μ) − (y − μ)]`.
    pub deviance: f64,
    /// Pearson's statistic `Σ (y − μ)² / μ`.
    pub pearson_chi2: f64,
    /// Observations minus coefficients.
    pub df_residual: usize,
    /// Pearson dispersion `pearson_chi2 / df_residual`; near 1 for Poisson counts.
    pub dispersion: Option<f64>,
    /// The Poisson log-likelihood at the fit, `Σ [y log μ − μ − log y!]`.
    pub log_likelihood: f64,
    /// Akaike's information criterion, `−2 log-likelihood + 2 × coefficients`.
    pub aic: f64,
    /// Fitted means μ, one per observation.
    pub fitted: Vec<f64>,
    /// IRLS iterations used.
    pub iterations: usize,
    /// The inverse Fisher information (the Poisson covariance of the coefficients), row-major.
    #[serde(skip)]
    pub covariance: Vec<f64>,
}

/// Fits `log E[counts] = offsets + design · β` by IRLS.
///
/// `offsets` are on the log scale (pass `ln(effort)`); counts must be non-negative and not
/// all zero, and the design columns must be linearly independent.
pub fn poisson_glm(design: &Design, counts: &[f64], offsets: &[f64]) -> Result<GlmFit, TrendError> {
    check_inputs(design, counts, offsets)?;
    let mean_count = counts.iter().sum::<f64>() / counts.len() as f64;
    let mut fitted: Vec<f64> = counts.iter().map(|y| (y + mean_count) / 2.0).collect();
    let mut deviance = poisson_deviance(counts, &fitted);
    for iteration in 1..=MAX_ITERATIONS {
        let beta = weighted_least_squares_step(design, counts, offsets, &fitted)?;
        fitted = means(design, offsets, &beta);
        if fitted.iter().any(|mu| !mu.is_finite() || *mu <= 0.0) {
            return Err(TrendError::NotConverged { iterations: iteration });
        }
        let previous = deviance;
        deviance = poisson_deviance(counts, &fitted);
        if (previous - deviance).abs() / (deviance.abs() + 0.1) < CONVERGENCE_TOLERANCE {
            return finish(design, counts, beta, fitted, deviance, iteration);
        }
    }
    Err(TrendError::NotConverged { iterations: MAX_ITERATIONS })
}

fn check_inputs(design: &Design, counts: &[f64], offsets: &[f64]) -> Result<(), TrendError> {
    let rows = design.rows();
    for (what, got) in [("counts", counts.len()), ("offsets", offsets.len())] {
        if got != rows {
            return Err(TrendError::LengthMismatch { what, expected: rows, got });
        }
    }
    if rows < design.columns() {
        return Err(TrendError::TooFewObservations { rows, columns: design.columns() });
    }
    if let Some(row) = offsets.iter().position(|v| !v.is_finite()) {
        return Err(TrendError::NotFinite { what: "offset", row, column: None });
    }
    if let Some(row) = counts.iter().position(|v| !(*v >= 0.0 && v.is_finite())) {
        return Err(TrendError::NegativeCount { row, value: counts[row] });
    }
    if counts.iter().all(|y| *y == 0.0) {
        return Err(TrendError::AllCountsZero);
    }
    Ok(())
}

/// One IRLS step: the weighted least-squares solution for the working response at `fitted`.
fn weighted_least_squares_step(
    design: &Design,
    counts: &[f64],
    offsets: &[f64],
    fitted: &[f64],
) -> Result<Vec<f64>, TrendError> {
    let p = design.columns();
    let mut rhs = vec![0.0; p];
    for i in 0..design.rows() {
        let mu = fitted[i];
        let working = mu.ln() - offsets[i] + (counts[i] - mu) / mu;
        for (r, x) in rhs.iter_mut().zip(design.row(i)) {
            *r += mu * x * working;
        }
    }
    Ok(information_factor(design, fitted)?.solve(&rhs))
}

/// Cholesky factor of the Fisher information `Xᵀ W X` with Poisson weights `W = diag(μ)`.
fn information_factor(design: &Design, fitted: &[f64]) -> Result<Cholesky, TrendError> {
    let p = design.columns();
    let mut information = vec![0.0; p * p];
    for (i, mu) in fitted.iter().enumerate() {
        let x = design.row(i);
        for a in 0..p {
            for b in 0..p {
                information[a * p + b] += mu * x[a] * x[b];
            }
        }
    }
    Cholesky::factor(&information, p)
        .map_err(|e| TrendError::DependentColumns { column: design.names[e.column].clone() })
}

fn means(design: &Design, offsets: &[f64], beta: &[f64]) -> Vec<f64> {
    (0..design.rows())
        .map(|i| {
            let linear: f64 = design.row(i).iter().zip(beta).map(|(x, b)| x * b).sum();
            (offsets[i] + linear).exp()
        })
        .collect()
}

fn poisson_deviance(counts: &[f64], fitted: &[f64]) -> f64 {
    let unit = |y: f64, mu: f64| {
        if y > 0.0 { y * (y / mu).ln() - (y - mu) } else { mu }
    };
    2.0 * counts.iter().zip(fitted).map(|(y, mu)| unit(*y, *mu)).sum::<f64>()
}

fn finish(
    design: &Design,
    counts: &[f64],
    beta: Vec<f64>,
    fitted: Vec<f64>,
    deviance: f64,
    iterations: usize,
) -> Result<GlmFit, TrendError> {
    let covariance = information_factor(design, &fitted)?.inverse();
    let p = design.columns();
    let variances: Vec<f64> = (0..p).map(|a| covariance[a * p + a]).collect();
    let pearson_chi2: f64 = counts.iter().zip(&fitted).map(|(y, mu)| (y - mu).powi(2) / mu).sum();
    let df_residual = design.rows() - design.columns();
    let dispersion = (df_residual > 0).then(|| pearson_chi2 / df_residual as f64);
    let coefficients = design
        .names
        .iter()
        .zip(beta.iter().zip(&variances))
        .map(|(name, (&estimate, &variance))| {
            let std_error = variance.sqrt();
            let z = estimate / std_error;
            let quasi = dispersion.filter(|d| *d >= 1.0).map(|d| {
                let scaled = std_error * d.sqrt();
                let t = estimate / scaled;
                QuasiTest { std_error: scaled, t, p_value: two_sided_t_p(t, df_residual) }
            });
            Coefficient { name: name.clone(), estimate, std_error, z, p_value: two_sided_p(z), quasi }
        })
        .collect();
    let log_likelihood = poisson_log_likelihood(counts, &fitted);
    let aic = -2.0 * log_likelihood + 2.0 * design.columns() as f64;
    Ok(GlmFit {
        coefficients,
        deviance,
        pearson_chi2,
        df_residual,
        dispersion,
        log_likelihood,
        aic,
        fitted,
        iterations,
        covariance,
    })
}

/// `Σ [y log μ − μ − log y!]`.
pub(crate) fn poisson_log_likelihood(counts: &[f64], fitted: &[f64]) -> f64 {
    counts.iter().zip(fitted).map(|(y, mu)| if *y > 0.0 { y * mu.ln() } else { 0.0 } - mu - ln_factorial(*y)).sum()
}
