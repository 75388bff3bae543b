//! Lengths: what was measured (total, fork or precaudal length; disc width or length),
//! and how a measurement is brought to the same measure as a species' known maximum so
//! the two can be compared. Species equations come from the checklist, each with its
//! source (a paper, or "common practice" where none is known); where a species has
//! none, a generic ratio is used and every reason that relies on it says so.

use serde::{Deserialize, Serialize};

use crate::checklist::{LengthConversion, Taxon};

/// What a length measures (the usual terms of fisheries biology).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "camelCase")]
pub enum LengthKind {
    /// Snout tip to the tip of the tail.
    TotalLength,
    /// Snout tip to the fork of the tail.
    ForkLength,
    /// Snout tip to the front of the tail fin (the precaudal pit).
    PrecaudalLength,
    /// Across the disc of a ray, wing tip to wing tip.
    DiscWidth,
    /// Along the disc of a ray, snout to the rear of the disc.
    DiscLength,
}

impl LengthKind {
    /// The name used in JSON.
    pub fn code(self) -> &'static str {
        match self {
            LengthKind::TotalLength => "totalLength",
            LengthKind::ForkLength => "forkLength",
            LengthKind::PrecaudalLength => "precaudalLength",
            LengthKind::DiscWidth => "discWidth",
            LengthKind::DiscLength => "discLength",
        }
    }

    /// Plain words for reasons.
    pub fn words(self) -> &'static str {
        match self {
            LengthKind::TotalLength => "total length",
            LengthKind::ForkLength => "fork length",
            LengthKind::PrecaudalLength => "precaudal length",
            LengthKind::DiscWidth => "disc width",
            LengthKind::DiscLength => "disc length",
        }
    }

    /// The usual abbreviation, used when writing equations.
    pub fn abbreviation(self) -> &'static str {
        match self {
            LengthKind::TotalLength => "TL",
            LengthKind::ForkLength => "FL",
            LengthKind::PrecaudalLength => "PCL",
            LengthKind::DiscWidth => "DW",
            LengthKind::DiscLength => "DL",
        }
    }
}

/// A length taken from the record.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase")]
pub struct Measurement {
    /// What was measured.
    pub kind: LengthKind,
    /// The length in centimetres.
    pub cm: f64,
    /// True when the length was guessed by eye rather than taped; the key then allows more slack.
    #[serde(default)]
    pub estimated: bool,
}

/// Ratios of a partial length to total length used when a species has no published
/// equation: fork length ≈ 0.90 × TL and precaudal length ≈ 0.80 × TL. These are
/// rough figures for a typical shark tail (common practice, no single source); they
/// are wrong for long-tailed species such as threshers, which carry their own equation.
pub const GENERIC_RATIOS: [(LengthKind, f64); 2] =
    [(LengthKind::ForkLength, 0.90), (LengthKind::PrecaudalLength, 0.80)];

/// How a measurement was brought to the measure of a species' maximum.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase", tag = "method")]
pub enum ConversionMethod {
    /// Measured the same way as the maximum; nothing converted.
    AsMeasured,
    /// Converted with the equation the checklist gives for this species.
    SpeciesEquation {
        /// The equation in the usual printed form, e.g. "FL = 0.9286 × TL − 1.7101".
        equation: String,
        /// Where the checklist says the equation comes from.
        source: String,
    },
    /// Converted with a generic ratio because the species has no equation in the checklist.
    CommonPractice {
        /// The ratio used, e.g. "FL ≈ 0.90 × TL".
        equation: String,
    },
}

/// A measurement expressed in the measure of a species' maximum.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct ComparableLength {
    /// The converted length in centimetres.
    pub cm: f64,
    /// How it was converted.
    pub method: ConversionMethod,
}

/// Brings a measurement to the measure of the taxon's maximum length, or `None` when
/// the two cannot be compared (a disc width against a maximum total length, say).
pub fn comparable_length(measurement: &Measurement, taxon: &Taxon) -> Option<ComparableLength> {
    let cm = comparable_cm(measurement, taxon)?;
    let method = if measurement.kind == taxon.max_length.measure {
        ConversionMethod::AsMeasured
    } else if let Some(conversion) = taxon.conversion_for(measurement.kind) {
        ConversionMethod::SpeciesEquation { equation: equation_text(conversion), source: conversion.source.clone() }
    } else {
        ConversionMethod::CommonPractice {
            equation: format!("{} ≈ {:.2} × TL", measurement.kind.abbreviation(), generic_ratio(measurement.kind)?),
        }
    };
    Some(ComparableLength { cm, method })
}

/// The number alone of [`comparable_length`], without building its description; the
/// key calls this for every species on every ranking.
pub fn comparable_cm(measurement: &Measurement, taxon: &Taxon) -> Option<f64> {
    let target = taxon.max_length.measure;
    if measurement.kind == target {
        Some(measurement.cm)
    } else if target != LengthKind::TotalLength {
        None
    } else if let Some(conversion) = taxon.conversion_for(measurement.kind) {
        Some(total_length_by_equation(measurement.cm, conversion))
    } else {
        generic_ratio(measurement.kind).map(|ratio| measurement.cm / ratio)
    }
}

/// Total length from a partial length with a published equation of the form
/// `measure = slope × TL + intercept`, solved for TL.
pub fn total_length_by_equation(partial_cm: f64, conversion: &LengthConversion) -> f64 {
    (partial_cm - conversion.intercept_cm) / conversion.slope
}

/// The generic ratio of this partial length to total length, if there is one.
pub fn generic_ratio(kind: LengthKind) -> Option<f64> {
    GENERIC_RATIOS.iter().find(|(ratio_kind, _)| *ratio_kind == kind).map(|(_, ratio)| *ratio)
}

/// The equation written the way papers print it, e.g. "FL = 0.9286 × TL − 1.7101".
pub fn equation_text(conversion: &LengthConversion) -> String {
    let sign = if conversion.intercept_cm < 0.0 { '−' } else { '+' };
    format!(
        "{} = {} × TL {sign} {}",
        conversion.measure.abbreviation(),
        conversion.slope,
        conversion.intercept_cm.abs()
    )
}
