//! The distributions and special functions behind the p-values and intervals: the standard
//! normal, Student's t (for errors scaled by an estimated dispersion), and the gamma
//! function family the negative binomial likelihood needs.
//!
//! The normal upper tail is computed from the complementary error function, which stays
//! accurate far into the tail where `1 − Φ(z)` would lose every digit to cancellation;
//! Student's t, log-gamma and digamma come from statrs.

/// The 97.5% quantile of the standard normal distribution, for two-sided 95% intervals.
pub(crate) const Z_95: f64 = 1.959_963_984_540_054;

/// Two-sided p-value of a standard normal test statistic: P(|Z| ≥ |z|); 1 for a statistic
/// that is not a number (0 ÷ 0).
pub(crate) fn two_sided_p(z: f64) -> f64 {
    if z.is_nan() {
        return 1.0;
    }
    libm::erfc(z.abs() / std::f64::consts::SQRT_2).min(1.0)
}

/// The 97.5% quantile of Student's t with `df` degrees of freedom, for two-sided 95%
/// intervals when the standard error rests on an estimated dispersion (statrs).
pub(crate) fn t_95(df: usize) -> f64 {
    use statrs::distribution::{ContinuousCDF as _, StudentsT};
    // df ≥ 1 always gives a valid distribution; a zero df has no interval to give.
    StudentsT::new(0.0, 1.0, df.max(1) as f64).map_or(f64::INFINITY, |t| t.inverse_cdf(0.975))
}

/// Two-sided p-value of a t statistic with `df` degrees of freedom: P(|T| ≥ |t|).
///
/// A statistic that is not a number (0 ÷ 0: no change and no variation at all) has p = 1,
/// an infinite one p = 0; statrs is only asked about finite values.
pub(crate) fn two_sided_t_p(t: f64, df: usize) -> f64 {
    use statrs::distribution::{ContinuousCDF as _, StudentsT};
    if t.is_nan() {
        return 1.0;
    }
    if t.is_infinite() {
        return 0.0;
    }
    StudentsT::new(0.0, 1.0, df.max(1) as f64).map_or(f64::NAN, |d| (2.0 * d.sf(t.abs())).min(1.0))
}

/// log Γ(x) for x > 0.
pub(crate) fn ln_gamma(x: f64) -> f64 {
    statrs::function::gamma::ln_gamma(x)
}

/// log y! for a whole count y ≥ 0.
pub(crate) fn ln_factorial(y: f64) -> f64 {
    ln_gamma(y + 1.0)
}

/// The digamma function ψ(x) = d log Γ(x) / dx, for x > 0.
pub(crate) fn digamma(x: f64) -> f64 {
    statrs::function::gamma::digamma(x)
}

/// The trigamma function ψ'(x), for x > 0: the recurrence ψ'(x) = ψ'(x + 1) + 1/x² up to
/// x ≥ 10, then the asymptotic series 1/x + 1/(2x²) + Σ B₂ₖ / x²ᵏ⁺¹ (Abramowitz & Stegun
/// 6.4.12; from memory), accurate to about 1e-13 there.
pub(crate) fn trigamma(mut x: f64) -> f64 {
    let mut sum = 0.0;
    while x < 10.0 {
        sum += 1.0 / (x * x);
        x += 1.0;
    }
    let inv = 1.0 / x;
    let inv2 = inv * inv;
    let series = inv
        + inv2 / 2.0
        + inv
            * inv2
            * (1.0 / 6.0 - inv2 * (1.0 / 30.0 - inv2 * (1.0 / 42.0 - inv2 * (1.0 / 30.0 - inv2 * 5.0 / 66.0))));
    sum + series
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

    #[test]
    fn trigamma_matches_known_values() {
        // ψ'(1) = π²/6 and ψ'(1/2) = π²/2 (Abramowitz & Stegun 6.4.2, 6.4.4; from memory), and
        // the recurrence ψ'(x) − ψ'(x + 1) = 1/x² (arithmetic).
        let pi2 = std::f64::consts::PI.powi(2);
        assert!((trigamma(1.0) - pi2 / 6.0).abs() < 1e-12);
        assert!((trigamma(0.5) - pi2 / 2.0).abs() < 1e-12);
        assert!((trigamma(37.5) - trigamma(38.5) - 1.0 / 37.5f64.powi(2)).abs() < 1e-15);
    }

    #[test]
    fn t_p_values_match_the_printed_tables() {
        // Two-sided 5% points from the same tables: p(|T| ≥ 2.228; 10 df) = 0.05.
        assert!((two_sided_t_p(2.228, 10) - 0.05).abs() < 1e-4);
        assert!((two_sided_t_p(-12.706, 1) - 0.05).abs() < 1e-4);
        // 0 ÷ 0 (no change, no variation) and ±∞ have the p-values their limits give.
        assert_eq!((two_sided_t_p(f64::NAN, 3), two_sided_t_p(f64::INFINITY, 3)), (1.0, 0.0));
        assert_eq!(two_sided_p(f64::NAN), 1.0);
    }
}
