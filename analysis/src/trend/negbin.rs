//! The negative binomial log-linear model (NB2) fitted by maximum likelihood, beside the
//! Poisson fit: counts whose variance grows as μ + αμ², as yearly strandings do when
//! animals wash up in clusters.
//!
//! `log E[count] = offset + Xβ` as in the Poisson model; α is estimated with β. The fit
//! alternates IRLS for β at fixed α (weights μ / (1 + αμ)) with a golden-section search
//! for log α at fixed β, then polishes (β, α) together by Newton steps on the exact
//! gradient and Hessian of the log-likelihood (Hilbe 2011, *Negative Binomial Regression*,
//! ch. 8; Cameron & Trivedi 2013, §3.3; the derivatives worked out by hand). Standard errors
//! come from the inverse of the observed information in (β, α), as statsmodels'
//! `NegativeBinomial` gives them.

use serde::Serialize;

use super::TrendError;
use super::glm::{Design, GlmFit};
use super::linalg::Cholesky;
use crate::distributions::{digamma, ln_factorial, ln_gamma, trigamma, two_sided_p};

/// Smallest α searched: below it the model is the Poisson model to every printed digit.
const ALPHA_FLOOR: f64 = 1e-8;
/// An α below this is taken as the Poisson boundary: its standard error is not estimable
/// (the likelihood is flat there; statsmodels' Newton fit stops with a singular Hessian).
const POISSON_BOUNDARY_ALPHA: f64 = 1e-6;
/// Largest α searched (a variance thousands of times the mean at a count of ten).
const ALPHA_CEILING: f64 = 1e3;
/// Rounds of IRLS and α search before the joint Newton polish.
const ALTERNATING_ROUNDS: usize = 200;
/// The log-likelihood is settled when a round changes it by less than this, relatively.
const TOLERANCE: f64 = 1e-13;

/// One coefficient of the negative binomial fit.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct NegBinCoefficient {
    /// The design column's name.
    pub name: String,
    /// The estimate β on the log scale.
    pub estimate: f64,
    /// Its standard error from the observed information.
    pub std_error: f64,
    /// `estimate / std_error`.
    pub z: f64,
    /// Two-sided p-value of `z` under the standard normal.
    pub p_value: f64,
}

/// A fitted negative binomial (NB2) log-linear model.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct NegBinFit {
    /// The coefficients in design-column order.
    pub coefficients: Vec<NegBinCoefficient>,
    /// The overdispersion α: the variance is μ + αμ².
    pub alpha: f64,
    /// Its standard error; `None` at the Poisson boundary.
    pub alpha_std_error: Option<f64>,
    /// Whether α fell to (nearly) 0, where the model is the Poisson model and α has no
    /// standard error.
    pub at_poisson_boundary: bool,
    /// The log-likelihood at the fit.
    pub log_likelihood: f64,
    /// Akaike's information criterion, `−2 log-likelihood + 2 × (coefficients + 1)`.
    pub aic: f64,
    /// Fitted means μ, one per observation.
    pub fitted: Vec<f64>,
    /// Covariance of the coefficients (without α), row-major.
    #[serde(skip)]
    pub covariance: Vec<f64>,
}

/// Fits the NB2 model, starting from the Poisson fit of the same design.
pub fn negative_binomial_glm(
    design: &Design,
    counts: &[f64],
    offsets: &[f64],
    poisson: &GlmFit,
) -> Result<NegBinFit, TrendError> {
    let model = Model { design, counts, offsets };
    let mut beta: Vec<f64> = poisson.coefficients.iter().map(|c| c.estimate).collect();
    let mut alpha = model.moment_alpha(&poisson.fitted);
    let mut previous = f64::NEG_INFINITY;
    for _ in 0..ALTERNATING_ROUNDS {
        beta = model.irls(beta, alpha)?;
        alpha = model.best_alpha(&beta);
        let current = model.log_likelihood(&beta, alpha);
        if (current - previous).abs() <= TOLERANCE * (1.0 + current.abs()) {
            break;
        }
        previous = current;
    }
    if alpha >= POISSON_BOUNDARY_ALPHA {
        (beta, alpha) = model.newton_polish(beta, alpha);
    }
    model.finish(design, beta, alpha)
}

/// Counts up to this are summed term by term in the gamma-function differences below;
/// larger counts take the difference of two log-gammas, which costs the same at any count
/// and loses digits only when α is also near 0 (then the model is the Poisson one anyway).
const TERM_BY_TERM_UP_TO: f64 = 1_000.0;
/// Golden-section steps for log α: the bracket shrinks by 0.618 each, 27 → 1e-9 in 60.
const GOLDEN_STEPS: usize = 60;

/// log Γ(y + θ) − log Γ(θ) for a whole count y: Σ log(θ + j) over j < y, which keeps every
/// digit when θ is huge (α near 0), where the difference of two log-gammas would lose them.
fn ln_gamma_ratio(y: f64, theta: f64) -> f64 {
    if y <= TERM_BY_TERM_UP_TO {
        (0..y as u64).map(|j| (theta + j as f64).ln()).sum()
    } else {
        ln_gamma(y + theta) - ln_gamma(theta)
    }
}

/// ψ(y + θ) − ψ(θ) = Σ 1 / (θ + j) over j < y (the digamma recurrence).
fn digamma_step(y: f64, theta: f64) -> f64 {
    if y <= TERM_BY_TERM_UP_TO {
        (0..y as u64).map(|j| 1.0 / (theta + j as f64)).sum()
    } else {
        digamma(y + theta) - digamma(theta)
    }
}

/// ψ'(y + θ) − ψ'(θ) = −Σ 1 / (θ + j)² over j < y (the trigamma recurrence).
fn trigamma_step(y: f64, theta: f64) -> f64 {
    if y <= TERM_BY_TERM_UP_TO {
        -(0..y as u64).map(|j| (theta + j as f64).powi(-2)).sum::<f64>()
    } else {
        trigamma(y + theta) - trigamma(theta)
    }
}

struct Model<'a> {
    design: &'a Design,
    counts: &'a [f64],
    offsets: &'a [f64],
}

impl Model<'_> {
    fn means(&self, beta: &[f64]) -> Vec<f64> {
        (0..self.design.rows())
            .map(|i| (self.offsets[i] + self.design.row(i).iter().zip(beta).map(|(x, b)| x * b).sum::<f64>()).exp())
            .collect()
    }

    /// A start for α from the moments: Σ[(y − μ)² − y] / Σ μ² (Cameron & Trivedi 2013).
    fn moment_alpha(&self, fitted: &[f64]) -> f64 {
        let excess: f64 = self.counts.iter().zip(fitted).map(|(y, mu)| (y - mu).powi(2) - y).sum();
        let scale: f64 = fitted.iter().map(|mu| mu * mu).sum();
        (excess / scale).clamp(ALPHA_FLOOR, ALPHA_CEILING)
    }

    fn log_likelihood(&self, beta: &[f64], alpha: f64) -> f64 {
        let theta = 1.0 / alpha;
        self.counts
            .iter()
            .zip(self.means(beta))
            .map(|(&y, mu)| {
                ln_gamma_ratio(y, theta) - ln_factorial(y) - theta * (alpha * mu).ln_1p()
                    + if y > 0.0 { y * (alpha * mu / (1.0 + alpha * mu)).ln() } else { 0.0 }
            })
            .sum()
    }

    /// IRLS for β at fixed α until the coefficients settle.
    fn irls(&self, mut beta: Vec<f64>, alpha: f64) -> Result<Vec<f64>, TrendError> {
        let p = self.design.names().len();
        for _ in 0..100 {
            let fitted = self.means(&beta);
            let mut information = vec![0.0; p * p];
            let mut rhs = vec![0.0; p];
            for (i, &mu) in fitted.iter().enumerate() {
                let x = self.design.row(i);
                let weight = mu / (1.0 + alpha * mu);
                let working = mu.ln() - self.offsets[i] + (self.counts[i] - mu) / mu;
                for a in 0..p {
                    rhs[a] += weight * x[a] * working;
                    for b in 0..p {
                        information[a * p + b] += weight * x[a] * x[b];
                    }
                }
            }
            let next = Cholesky::factor(&information, p)
                .map_err(|e| TrendError::DependentColumns { column: self.design.names()[e.column].clone() })?
                .solve(&rhs);
            let change = next.iter().zip(&beta).map(|(a, b)| (a - b).abs()).fold(0.0, f64::max);
            beta = next;
            if change < 1e-13 {
                break;
            }
        }
        Ok(beta)
    }

    /// The α that maximises the likelihood at fixed β: golden-section search on log α.
    fn best_alpha(&self, beta: &[f64]) -> f64 {
        let f = |log_alpha: f64| self.log_likelihood(beta, log_alpha.exp());
        let golden = (5f64.sqrt() - 1.0) / 2.0;
        let (mut low, mut high) = (ALPHA_FLOOR.ln(), ALPHA_CEILING.ln());
        let mut left = high - golden * (high - low);
        let mut right = low + golden * (high - low);
        let (mut f_left, mut f_right) = (f(left), f(right));
        for _ in 0..GOLDEN_STEPS {
            if f_left >= f_right {
                high = right;
                (right, f_right) = (left, f_left);
                left = high - golden * (high - low);
                f_left = f(left);
            } else {
                low = left;
                (left, f_left) = (right, f_right);
                right = low + golden * (high - low);
                f_right = f(right);
            }
        }
        ((low + high) / 2.0).exp()
    }

    /// Gradient and Hessian of the log-likelihood in (β, α), each (p + 1) long / square.
    fn derivatives(&self, beta: &[f64], alpha: f64) -> (Vec<f64>, Vec<f64>) {
        let p = beta.len();
        let q = p + 1;
        let (mut gradient, mut hessian) = (vec![0.0; q], vec![0.0; q * q]);
        let theta = 1.0 / alpha;
        for (i, mu) in self.means(beta).into_iter().enumerate() {
            let (y, x) = (self.counts[i], self.design.row(i));
            let one_plus = 1.0 + alpha * mu;
            for a in 0..p {
                gradient[a] += x[a] * (y - mu) / one_plus;
                for b in 0..p {
                    hessian[a * q + b] -= x[a] * x[b] * mu * (1.0 + alpha * y) / (one_plus * one_plus);
                }
                let cross = -x[a] * mu * (y - mu) / (one_plus * one_plus);
                hessian[a * q + p] += cross;
                hessian[p * q + a] += cross;
            }
            let big_a = -digamma_step(y, theta) + one_plus.ln();
            gradient[p] += big_a / (alpha * alpha) + (y - mu) / (alpha * one_plus);
            let d_big_a = trigamma_step(y, theta) / (alpha * alpha) + mu / one_plus;
            hessian[p * q + p] += -2.0 * big_a / alpha.powi(3) + d_big_a / (alpha * alpha)
                - (y - mu) * (1.0 + 2.0 * alpha * mu) / (alpha * alpha * one_plus * one_plus);
        }
        (gradient, hessian)
    }

    /// Newton steps on (β, α) together, halving any step that lowers the likelihood.
    fn newton_polish(&self, mut beta: Vec<f64>, mut alpha: f64) -> (Vec<f64>, f64) {
        let p = beta.len();
        for _ in 0..50 {
            let (gradient, hessian) = self.derivatives(&beta, alpha);
            let negative: Vec<f64> = hessian.iter().map(|h| -h).collect();
            let Ok(factor) = Cholesky::factor(&negative, p + 1) else { break };
            let step = factor.solve(&gradient);
            let before = self.log_likelihood(&beta, alpha);
            let mut scale = 1.0;
            let accepted = loop {
                let trial_beta: Vec<f64> = beta.iter().zip(&step).map(|(b, s)| b + scale * s).collect();
                let trial_alpha = alpha + scale * step[p];
                if trial_alpha > ALPHA_FLOOR && self.log_likelihood(&trial_beta, trial_alpha) >= before - 1e-12 {
                    break Some((trial_beta, trial_alpha));
                }
                scale /= 2.0;
                if scale < 1e-6 {
                    break None;
                }
            };
            let Some((next_beta, next_alpha)) = accepted else { break };
            let size = step.iter().map(|s| (s * scale).abs()).fold(0.0, f64::max);
            (beta, alpha) = (next_beta, next_alpha);
            if size < 1e-12 {
                break;
            }
        }
        (beta, alpha)
    }

    fn finish(&self, design: &Design, beta: Vec<f64>, alpha: f64) -> Result<NegBinFit, TrendError> {
        let p = beta.len();
        let q = p + 1;
        let (_, hessian) = self.derivatives(&beta, alpha);
        let dependent =
            |column: usize| TrendError::DependentColumns { column: design.names()[column.min(p - 1)].clone() };
        let full: Vec<f64> = hessian.iter().map(|h| -h).collect();
        // At the boundary α is not estimable; β's errors then come from the β block alone.
        let joint = (alpha >= POISSON_BOUNDARY_ALPHA).then(|| Cholesky::factor(&full, q).ok()).flatten();
        let at_poisson_boundary = joint.is_none();
        let (size, inverse) = match joint {
            Some(factor) => (q, factor.inverse()),
            None => {
                let block: Vec<f64> = (0..p * p).map(|k| full[(k / p) * q + k % p]).collect();
                (p, Cholesky::factor(&block, p).map_err(|e| dependent(e.column))?.inverse())
            }
        };
        let coefficients = design
            .names()
            .iter()
            .enumerate()
            .map(|(a, name)| {
                let std_error = inverse[a * size + a].sqrt();
                let z = beta[a] / std_error;
                NegBinCoefficient { name: name.clone(), estimate: beta[a], std_error, z, p_value: two_sided_p(z) }
            })
            .collect();
        let covariance = (0..p * p).map(|k| inverse[(k / p) * size + k % p]).collect();
        let log_likelihood = self.log_likelihood(&beta, alpha);
        Ok(NegBinFit {
            coefficients,
            alpha,
            alpha_std_error: (!at_poisson_boundary).then(|| inverse[p * size + p].sqrt()),
            at_poisson_boundary,
            log_likelihood,
            aic: -2.0 * log_likelihood + 2.0 * q as f64,
            fitted: self.means(&beta),
            covariance,
        })
    }
}
