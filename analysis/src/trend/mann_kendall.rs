//! The Mann–Kendall trend test and Sen's slope: a check on the fitted trend that assumes no
//! distribution and no straight line, only that later values tend to be larger or smaller.
//!
//! Method: Hirsch, Slack & Smith (1982) and Gilbert (1987, *Statistical Methods for
//! Environmental Pollution Monitoring*, ch. 16–17): S counts concordant minus discordant
//! pairs; its variance is corrected for tied values; Z applies a continuity correction of 1;
//! the p-value is two-sided under the normal approximation. Sen's slope is the median of
//! all pairwise slopes.

use serde::Serialize;

use super::TrendError;
use crate::distributions::two_sided_p;

/// The result of a Mann–Kendall test on one series.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MannKendall {
    /// How many values went in.
    pub n: usize,
    /// Mann–Kendall S: pairs that rise minus pairs that fall.
    pub s: i64,
    /// Variance of S under no trend, corrected for ties.
    pub var_s: f64,
    /// Continuity-corrected normal score: (S − 1)/√Var(S) for S > 0, (S + 1)/√Var(S) for S < 0, else 0.
    pub z: f64,
    /// Two-sided p-value of `z`; 1 when there are too few values to vary.
    pub p_value: f64,
    /// Kendall's τ as S over the number of pairs.
    pub tau: f64,
    /// Sen's slope per unit of time (per step for [`mann_kendall`]); `None` below two values.
    pub sen_slope: Option<f64>,
}

/// Tests equally spaced `values` for a monotonic trend; Sen's slope is per step.
pub fn mann_kendall(values: &[f64]) -> Result<MannKendall, TrendError> {
    let times: Vec<f64> = (0..values.len()).map(|i| i as f64).collect();
    mann_kendall_with_times(&times, values)
}

/// Tests `values` observed at `times` (strictly increasing) for a monotonic trend.
///
/// S depends only on the order of the values; the times set the unit of Sen's slope and
/// let years with no survey be left out without distorting it.
pub fn mann_kendall_with_times(times: &[f64], values: &[f64]) -> Result<MannKendall, TrendError> {
    check_series(times, values)?;
    let n = values.len();
    let s = kendall_s(values);
    let var_s = tie_corrected_variance(values);
    let z = continuity_corrected_z(s, var_s);
    let pairs = (n * n.saturating_sub(1) / 2) as f64;
    Ok(MannKendall {
        n,
        s,
        var_s,
        z,
        p_value: if var_s > 0.0 { two_sided_p(z) } else { 1.0 },
        tau: if pairs > 0.0 { s as f64 / pairs } else { 0.0 },
        sen_slope: sen_slope(times, values),
    })
}

fn check_series(times: &[f64], values: &[f64]) -> Result<(), TrendError> {
    if times.len() != values.len() {
        return Err(TrendError::LengthMismatch { what: "times", expected: values.len(), got: times.len() });
    }
    if let Some(row) = values.iter().position(|v| !v.is_finite()) {
        return Err(TrendError::NotFinite { what: "series value", row, column: None });
    }
    if let Some(row) = times.iter().position(|t| !t.is_finite()) {
        return Err(TrendError::NotFinite { what: "time", row, column: None });
    }
    if let Some(row) = times.windows(2).position(|w| w[1] <= w[0]) {
        return Err(TrendError::TimesNotIncreasing { row: row + 1 });
    }
    Ok(())
}

fn kendall_s(values: &[f64]) -> i64 {
    let mut s = 0;
    for (i, earlier) in values.iter().enumerate() {
        for later in &values[i + 1..] {
            s += sign(later - earlier);
        }
    }
    s
}

fn sign(difference: f64) -> i64 {
    if difference > 0.0 {
        1
    } else if difference < 0.0 {
        -1
    } else {
        0
    }
}

/// Var(S) = [n(n−1)(2n+5) − Σ t(t−1)(2t+5)] / 18, summed over groups of t tied values.
fn tie_corrected_variance(values: &[f64]) -> f64 {
    let term = |t: usize| {
        let t = t as f64;
        t * (t - 1.0) * (2.0 * t + 5.0)
    };
    let mut sorted = values.to_vec();
    sorted.sort_by(f64::total_cmp);
    let ties: f64 = sorted.chunk_by(|a, b| a == b).map(|group| term(group.len())).sum();
    (term(values.len()) - ties) / 18.0
}

fn continuity_corrected_z(s: i64, var_s: f64) -> f64 {
    if var_s <= 0.0 || s == 0 {
        return 0.0;
    }
    let corrected = s - s.signum();
    corrected as f64 / var_s.sqrt()
}

/// The median of all slopes `(v_j − v_i) / (t_j − t_i)` for `i < j`.
fn sen_slope(times: &[f64], values: &[f64]) -> Option<f64> {
    let mut slopes = Vec::with_capacity(values.len() * values.len() / 2);
    for i in 0..values.len() {
        for j in i + 1..values.len() {
            slopes.push((values[j] - values[i]) / (times[j] - times[i]));
        }
    }
    median(&mut slopes)
}

fn median(values: &mut [f64]) -> Option<f64> {
    if values.is_empty() {
        return None;
    }
    values.sort_by(f64::total_cmp);
    let mid = values.len() / 2;
    Some(if values.len() % 2 == 1 { values[mid] } else { (values[mid - 1] + values[mid]) / 2.0 })
}
