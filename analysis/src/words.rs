//! Changes as a person reads them: signed percentages with a true minus sign, "no change"
//! rather than "−0.0%", and multiples rather than runaway percentages.
//!
//! A rate that grows tenfold is "+900%"; beyond that, percentages stop meaning anything to
//! a reader ("+71,728,862,701%"), so changes of tenfold or more are written as multiples,
//! and anything beyond a thousandfold as "more than ×1,000".

/// A change of this fraction or more (tenfold, +900%) is written as a multiple.
const MULTIPLE_FROM: f64 = 9.0;
/// Multiples beyond this are written as "more than ×1,000".
const LARGEST_MULTIPLE: f64 = 1_000.0;

/// A change (−0.2 for a 20% decline) as a signed percentage or a multiple.
pub fn signed_change(fraction: f64) -> String {
    if !fraction.is_finite() {
        return "not defined".into();
    }
    let percent = 100.0 * fraction;
    if percent.abs() < 0.05 {
        "0.0%".into()
    } else if fraction >= MULTIPLE_FROM {
        multiple(1.0 + fraction)
    } else if percent < 0.0 {
        format!("\u{2212}{:.1}%", -percent)
    } else {
        format!("+{percent:.1}%")
    }
}

/// A change in words: "a reduction of 48.8%", "an increase of 25.0%", "no change".
pub fn change_phrase(fraction: f64) -> String {
    let percent = 100.0 * fraction;
    if percent.abs() < 0.05 {
        "no change".into()
    } else if fraction >= MULTIPLE_FROM {
        let factor = 1.0 + fraction;
        if factor > LARGEST_MULTIPLE {
            "an increase to more than 1,000 times the rate".into()
        } else {
            format!("an increase to {factor:.0} times the rate")
        }
    } else if percent < 0.0 {
        format!("a reduction of {:.1}%", -percent)
    } else {
        format!("an increase of {percent:.1}%")
    }
}

fn multiple(factor: f64) -> String {
    if factor > LARGEST_MULTIPLE { "more than ×1,000".into() } else { format!("×{factor:.0}") }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn changes_read_plainly_at_every_size() {
        assert_eq!(signed_change(-0.488), "\u{2212}48.8%");
        assert_eq!(signed_change(0.25), "+25.0%");
        assert_eq!(signed_change(-0.0001), "0.0%");
        assert_eq!(signed_change(24.0), "×25");
        assert_eq!(signed_change(717_288_627.0), "more than ×1,000");
        assert_eq!(change_phrase(-0.0), "no change");
        assert_eq!(change_phrase(-0.73), "a reduction of 73.0%");
        assert_eq!(change_phrase(49.0), "an increase to 50 times the rate");
    }
}
