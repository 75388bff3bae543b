//! The published thresholds of the IUCN Red List criteria A and B, as data and plain text.
//!
//! Assessors compare wrackline's figures with these tables, so the tables live beside the
//! figures and travel with them in every result. Sources: IUCN Red List Categories and
//! Criteria v3.1 (2nd ed., 2012) and the Guidelines for Using the IUCN Red List Categories
//! and Criteria (v15.1, 2022; v16, 2024). The functions here say which threshold a figure
//! falls under; they never say a species is threatened.

use serde::Serialize;

use crate::words::{change_phrase, signed_change};

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
    /// The limit: an area in km² for criterion B (strictly below), a number of locations
    /// for criterion B (at most), a reduction in percent for criterion A (at or above).
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

/// B1 and B2 (a): number of locations at most this many.
pub const LOCATIONS: [Threshold; 3] = [
    threshold(Category::CriticallyEndangered, 1.0),
    threshold(Category::Endangered, 5.0),
    threshold(Category::Vulnerable, 10.0),
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

/// Compares an EOO (`None` when the records span more than a hemisphere) and an AOO (km²)
/// with the criterion-B area thresholds.
///
/// Criterion B also needs severe fragmentation or few locations, and a continuing decline
/// or extreme fluctuation; the text says so, because area alone never meets it.
pub fn criterion_b(eoo_km2: Option<f64>, aoo_km2: f64) -> CriterionB {
    let eoo_band = eoo_km2.and_then(|eoo| area_band(&B1_EOO_KM2, eoo));
    let aoo_band = area_band(&B2_AOO_KM2, aoo_km2);
    let eoo_sentence = match eoo_km2 {
        Some(eoo) => format!("EOO {} km² is {}", format_area(eoo), band_phrase(eoo_band, "B1")),
        None => {
            "EOO is not given (the records span more than a hemisphere) and is outside every B1 threshold".to_owned()
        }
    };
    let text = format!(
        "{eoo_sentence} (B1: CR < 100, EN < 5,000, VU < 20,000 km²). \
         AOO {aoo} km² is {aoo_cmp} (B2: CR < 10, EN < 500, VU < 2,000 km²). \
         Criterion B also needs at least two of: severe fragmentation or few locations \
         (CR 1, EN ≤ 5, VU ≤ 10), a continuing decline, extreme fluctuations. \
         {RECORDING_CAUTION} {ASSESSMENT_CAUTION}",
        aoo = format_area(aoo_km2),
        aoo_cmp = band_phrase(aoo_band, "B2"),
    );
    CriterionB { b1_eoo_km2: B1_EOO_KM2, b2_aoo_km2: B2_AOO_KM2, eoo_band, aoo_band, text }
}

/// The bands a range of reductions reaches under one table: from the least severe (at the
/// smallest reduction; `None` is below the lowest threshold) to the most severe.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct BandSpan {
    /// The band of the smallest reduction in the interval.
    pub least: Option<Category>,
    /// The band of the largest reduction in the interval.
    pub most: Option<Category>,
}

impl BandSpan {
    fn of(table: &[Threshold; 3], smallest: f64, largest: f64) -> Self {
        Self { least: reduction_band(table, smallest), most: reduction_band(table, largest) }
    }

    /// The one band, when the whole interval lies in it.
    pub fn single(&self) -> Option<Option<Category>> {
        (self.least == self.most).then_some(self.most)
    }

    fn words(&self, below: &str) -> String {
        let name = |band: Option<Category>| match band {
            Some(c) => format!("{} ({})", c.name(), c.code()),
            None => format!("below the {below} threshold"),
        };
        match self.single() {
            Some(Some(c)) => format!("the whole interval is within the {} ({}) band", c.name(), c.code()),
            Some(None) => "the whole interval is below every threshold".to_owned(),
            None => format!(
                "the interval spans from {} to {}, so no single band is given",
                name(self.least),
                name(self.most)
            ),
        }
    }
}

/// Criterion A's reduction tests applied to an estimated change and its interval.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CriterionA {
    /// The A1 threshold table.
    pub a1_percent: [Threshold; 3],
    /// The A2–A4 threshold table.
    pub a2_to_a4_percent: [Threshold; 3],
    /// The estimated reduction in percent (positive for a decline, negative for an
    /// increase); `None` when no change over the window is given.
    pub reduction_percent: Option<f64>,
    /// The reductions at the ends of the 95% interval, smallest first.
    pub reduction_interval_percent: Option<[f64; 2]>,
    /// The A1 band, only when the whole interval lies in one band.
    pub a1_band: Option<Category>,
    /// The A2–A4 band, only when the whole interval lies in one band.
    pub a2_to_a4_band: Option<Category>,
    /// The A1 bands the interval spans.
    pub a1_span: Option<BandSpan>,
    /// The A2–A4 bands the interval spans.
    pub a2_to_a4_span: Option<BandSpan>,
    /// A plain-text account of the comparison and its cautions.
    pub text: String,
}

/// Compares a change over the assessment window (`estimate`, `lower`, `upper` as fractions:
/// −0.488 for a 48.8% decline) with the criterion-A thresholds.
///
/// A band is given only when the whole 95% interval lies in it; otherwise the text names
/// the bands the interval spans.
pub fn criterion_a(estimate: f64, lower: f64, upper: f64, window_years: f64) -> CriterionA {
    let reduction = -100.0 * estimate;
    let (smallest, largest) = (-100.0 * upper, -100.0 * lower);
    let a1_span = BandSpan::of(&A1_REDUCTION_PERCENT, smallest, largest);
    let a2_span = BandSpan::of(&A2_TO_A4_REDUCTION_PERCENT, smallest, largest);
    let text = format!(
        "The encounter rate shows {change} over {window_years:.0} years (95% interval {lo} to {hi}). \
         A2–A4 (CR ≥ 80, EN ≥ 50, VU ≥ 30% reduction): {a2}. A1 (CR ≥ 90, EN ≥ 70, VU ≥ 50%): {a1}. \
         {CRITERION_A_CAUTIONS} {RECORDING_CAUTION} {ASSESSMENT_CAUTION}",
        change = change_phrase(estimate),
        lo = signed_change(lower),
        hi = signed_change(upper),
        a2 = a2_span.words("Vulnerable (30%)"),
        a1 = a1_span.words("Vulnerable (50%)"),
    );
    CriterionA {
        a1_percent: A1_REDUCTION_PERCENT,
        a2_to_a4_percent: A2_TO_A4_REDUCTION_PERCENT,
        reduction_percent: Some(reduction),
        reduction_interval_percent: Some([smallest, largest]),
        a1_band: a1_span.single().flatten(),
        a2_to_a4_band: a2_span.single().flatten(),
        a1_span: Some(a1_span),
        a2_to_a4_span: Some(a2_span),
        text,
    }
}

/// Criterion A when no change over the window is given, saying why.
pub fn criterion_a_withheld(reason: &str) -> CriterionA {
    CriterionA {
        a1_percent: A1_REDUCTION_PERCENT,
        a2_to_a4_percent: A2_TO_A4_REDUCTION_PERCENT,
        reduction_percent: None,
        reduction_interval_percent: None,
        a1_band: None,
        a2_to_a4_band: None,
        a1_span: None,
        a2_to_a4_span: None,
        text: format!(
            "No reduction over the assessment window is given, so no criterion-A band: {reason} \
             {RECORDING_CAUTION} {ASSESSMENT_CAUTION}"
        ),
    }
}

/// What every criterion-A comparison of an encounter-rate trend must say.
const CRITERION_A_CAUTIONS: &str = "An encounter rate is an index of abundance only where detection and \
reporting stayed comparable; the reduction assumes the fitted exponential trend held over the whole window.";

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
