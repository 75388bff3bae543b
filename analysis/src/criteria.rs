//! The published thresholds of the IUCN Red List criteria A and B, as data and plain text.
//!
//! Assessors compare wrackline's figures with these tables, so the tables live beside the
//! figures and travel with them in every result. Sources: IUCN Red List Categories and
//! Criteria v3.1 (2nd ed., 2012) and the Guidelines for Using the IUCN Red List Categories
//! and Criteria (v15.1, 2022; v16, 2024). The functions here say which threshold a figure
//! falls under; they never say a species is threatened.

use serde::Serialize;

/// The caution that travels with every assessment figure.
pub const ASSESSMENT_CAUTION: &str = "These figures are inputs to a threatened-species \
assessment, not a listing decision: the official assessment process weighs them with all \
other evidence and decides.";

/// Why stranding and landing records describe observers as much as animals.
pub const RECORDING_CAUTION: &str = "Stranding and landing records show where people walk, \
fish and report, and where currents and weather carry carcasses; gaps in the records are \
not gaps in the range, and a change in records can be a change in effort or reporting.";

/// A threatened category of the IUCN Red List, from the most to the least severe.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize)]
pub enum Category {
    /// Critically Endangered (CR).
    CriticallyEndangered,
    /// Endangered (EN).
    Endangered,
    /// Vulnerable (VU).
    Vulnerable,
}

impl Category {
    /// The two-letter code used in the criteria (CR, EN, VU).
    pub fn code(self) -> &'static str {
        match self {
            Category::CriticallyEndangered => "CR",
            Category::Endangered => "EN",
            Category::Vulnerable => "VU",
        }
    }

    /// The category's full name.
    pub fn name(self) -> &'static str {
        match self {
            Category::CriticallyEndangered => "Critically Endangered",
            Category::Endangered => "Endangered",
            Category::Vulnerable => "Vulnerable",
        }
    }
}

/// One row of a threshold table: the category and its limit.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Threshold {
    /// The category this limit belongs to.
    pub category: Category,
    /// The limit: an area in km² for criterion B (strictly below), a reduction in percent
    /// for criterion A (at or above).
    pub limit: f64,
}

const fn threshold(category: Category, limit: f64) -> Threshold {
    Threshold { category, limit }
}

/// B1: extent of occurrence below these areas (km²).
pub const B1_EOO_KM2: [Threshold; 3] = [
    threshold(Category::CriticallyEndangered, 100.0),
    threshold(Category::Endangered, 5_000.0),
    threshold(Category::Vulnerable, 20_000.0),
];

/// B2: area of occupancy below these areas (km²).
pub const B2_AOO_KM2: [Threshold; 3] = [
    threshold(Category::CriticallyEndangered, 10.0),
    threshold(Category::Endangered, 500.0),
    threshold(Category::Vulnerable, 2_000.0),
];

/// A1: reductions whose causes are reversible, understood and have ceased (percent).
pub const A1_REDUCTION_PERCENT: [Threshold; 3] = [
    threshold(Category::CriticallyEndangered, 90.0),
    threshold(Category::Endangered, 70.0),
    threshold(Category::Vulnerable, 50.0),
];

/// A2, A3 and A4: all other reductions, past, projected or spanning both (percent).
pub const A2_TO_A4_REDUCTION_PERCENT: [Threshold; 3] = [
    threshold(Category::CriticallyEndangered, 80.0),
    threshold(Category::Endangered, 50.0),
    threshold(Category::Vulnerable, 30.0),
];

/// The most severe criterion-B category whose area limit `area_km2` is strictly below.
pub fn area_band(table: &[Threshold; 3], area_km2: f64) -> Option<Category> {
    table.iter().find(|t| area_km2 < t.limit).map(|t| t.category)
}

/// The most severe criterion-A category whose reduction `reduction_percent` reaches.
pub fn reduction_band(table: &[Threshold; 3], reduction_percent: f64) -> Option<Category> {
    table.iter().find(|t| reduction_percent >= t.limit).map(|t| t.category)
}

/// Criterion B's area tests applied to one EOO and one AOO, with the sentence to show.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CriterionB {
    /// The B1 threshold table.
    pub b1_eoo_km2: [Threshold; 3],
    /// The B2 threshold table.
    pub b2_aoo_km2: [Threshold; 3],
    /// The B1 category the EOO falls under, if any.
    pub eoo_band: Option<Category>,
    /// The B2 category the AOO falls under, if any.
    pub aoo_band: Option<Category>,
    /// A plain-text account of the comparison and its cautions.
    pub text: String,
}

/// Compares an EOO and an AOO (km²) with the criterion-B area thresholds.
///
/// Criterion B also needs severe fragmentation or few locations, and a continuing decline
/// or extreme fluctuation; the text says so, because area alone never meets it.
pub fn criterion_b(eoo_km2: f64, aoo_km2: f64) -> CriterionB {
    let eoo_band = area_band(&B1_EOO_KM2, eoo_km2);
    let aoo_band = area_band(&B2_AOO_KM2, aoo_km2);
    let text = format!(
        "EOO {eoo} km² is {eoo_cmp} (B1: CR < 100, EN < 5,000, VU < 20,000 km²). \
         AOO {aoo} km² is {aoo_cmp} (B2: CR < 10, EN < 500, VU < 2,000 km²). \
         Criterion B also needs at least two of: severe fragmentation or few locations \
         (CR 1, EN ≤ 5, VU ≤ 10), a continuing decline, extreme fluctuations. \
         {RECORDING_CAUTION} {ASSESSMENT_CAUTION}",
        eoo = format_area(eoo_km2),
        eoo_cmp = band_phrase(eoo_band, "B1"),
        aoo = format_area(aoo_km2),
        aoo_cmp = band_phrase(aoo_band, "B2"),
    );
    CriterionB { b1_eoo_km2: B1_EOO_KM2, b2_aoo_km2: B2_AOO_KM2, eoo_band, aoo_band, text }
}

/// Criterion A's reduction tests applied to one estimated change, with the sentence to show.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CriterionA {
    /// The A1 threshold table.
    pub a1_percent: [Threshold; 3],
    /// The A2–A4 threshold table.
    pub a2_to_a4_percent: [Threshold; 3],
    /// The estimated reduction in percent (positive for a decline, negative for an increase).
    pub reduction_percent: f64,
    /// The A1 category the reduction reaches, if any.
    pub a1_band: Option<Category>,
    /// The A2–A4 category the reduction reaches, if any.
    pub a2_to_a4_band: Option<Category>,
    /// A plain-text account of the comparison and its cautions.
    pub text: String,
}

/// Compares a reduction over the assessment window with the criterion-A thresholds.
///
/// `change_fraction` is the estimated change (−0.488 for a 48.8% decline) over
/// `window_years`, the longer of 10 years and three generations.
pub fn criterion_a(change_fraction: f64, window_years: f64) -> CriterionA {
    let reduction_percent = -100.0 * change_fraction;
    let a1_band = reduction_band(&A1_REDUCTION_PERCENT, reduction_percent);
    let a2_to_a4_band = reduction_band(&A2_TO_A4_REDUCTION_PERCENT, reduction_percent);
    let change_words = if reduction_percent >= 0.0 {
        format!("a reduction of {reduction_percent:.1}%")
    } else {
        format!("an increase of {:.1}%", -reduction_percent)
    };
    let text = format!(
        "The encounter rate shows {change_words} over {window_years:.0} years (the longer of \
         10 years and three generations). This is {a1} (A1: CR ≥ 90, EN ≥ 70, VU ≥ 50%) and \
         {a2} (A2–A4: CR ≥ 80, EN ≥ 50, VU ≥ 30%). Projections for A3 and A4 are capped at \
         100 years. An encounter rate is an index of abundance only where detection and \
         reporting stayed comparable. {RECORDING_CAUTION} {ASSESSMENT_CAUTION}",
        a1 = band_phrase(a1_band, "A1"),
        a2 = band_phrase(a2_to_a4_band, "A2–A4"),
    );
    CriterionA {
        a1_percent: A1_REDUCTION_PERCENT,
        a2_to_a4_percent: A2_TO_A4_REDUCTION_PERCENT,
        reduction_percent,
        a1_band,
        a2_to_a4_band,
        text,
    }
}

fn band_phrase(band: Option<Category>, subcriterion: &str) -> String {
    match band {
        Some(category) => {
            format!("within the {} ({}) threshold for {subcriterion}", category.name(), category.code())
        }
        None => format!("outside every {subcriterion} threshold"),
    }
}

/// Formats an area with thousands separators and sensible precision for text.
fn format_area(km2: f64) -> String {
    if km2 < 100.0 {
        return format!("{km2:.1}");
    }
    let whole = km2.round() as u64;
    let digits = whole.to_string();
    let mut grouped = String::new();
    for (i, digit) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i).is_multiple_of(3) {
            grouped.push(',');
        }
        grouped.push(digit);
    }
    grouped
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn areas_are_grouped_in_thousands() {
        assert_eq!(format_area(12.34), "12.3");
        assert_eq!(format_area(1_234_567.4), "1,234,567");
        assert_eq!(format_area(999.6), "1,000");
    }
}
