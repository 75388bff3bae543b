//! The standard normal distribution, for p-values and 95% intervals, and Student's t
//! quantiles for intervals whose scale was estimated from the data.
//!
//! The upper tail is computed from the complementary error function, which stays accurate
//! far into the tail where `1 − Φ(z)` would lose every digit to cancellation.

/// The 97.5% quantile of the standard normal distribution, for two-sided 95% intervals.
pub(crate) const Z_95: f64 = 1.959_963_984_540_054;

/// Two-sided p-value of a standard normal test statistic: P(|Z| ≥ |z|).
pub(crate) fn two_sided_p(z: f64) -> f64 {
    libm::erfc(z.abs() / std::f64::consts::SQRT_2).min(1.0)
}

/// The 97.5% quantile of Student's t with `df` degrees of freedom, for two-sided 95%
/// intervals when the standard error rests on an estimated dispersion (statrs).
pub(crate) fn t_95(df: usize) -> f64 {
    use statrs::distribution::{ContinuousCDF as _, StudentsT};
    // df ≥ 1 always gives a valid distribution; a zero df has no interval to give.
    StudentsT::new(0.0, 1.0, df.max(1) as f64).map_or(f64::INFINITY, |t| t.inverse_cdf(0.975))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn t_quantiles_match_the_printed_tables() {
        // Two-sided 95% points of Student's t, from printed tables (e.g. Fisher & Yates;
        // scipy.stats.t.ppf(0.975, df) gives the same): 12.706, 4.303, 3.182, 2.228, 1.984.
        for (df, expected) in [(1, 12.706), (2, 4.303), (3, 3.182), (10, 2.228), (100, 1.984)] {
            assert!((t_95(df) - expected).abs() < 5e-4, "df {df}: {}", t_95(df));
        }
        assert!(t_95(1_000) > Z_95 && t_95(1_000) - Z_95 < 3e-3, "t approaches the normal");
    }
}
