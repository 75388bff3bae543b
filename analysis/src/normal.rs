//! The standard normal distribution, for p-values and 95% intervals.
//!
//! The upper tail is computed from the complementary error function, which stays accurate
//! far into the tail where `1 − Φ(z)` would lose every digit to cancellation.

/// The 97.5% quantile of the standard normal distribution, for two-sided 95% intervals.
pub(crate) const Z_95: f64 = 1.959_963_984_540_054;

/// Two-sided p-value of a standard normal test statistic: P(|Z| ≥ |z|).
pub(crate) fn two_sided_p(z: f64) -> f64 {
    libm::erfc(z.abs() / std::f64::consts::SQRT_2).min(1.0)
}
