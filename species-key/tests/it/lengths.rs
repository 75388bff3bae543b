//! Length conversions: published equations give the total lengths their papers do,
//! the checklist carries them as published, and the generic ratio is used (and named)
//! only where a species has no equation.

use species_key::length::{
    ConversionMethod, comparable_length, equation_text, generic_ratio, total_length_by_equation,
};
use species_key::{LengthConversion, LengthKind, Measurement};

use crate::support::demo_checklist;

fn conversion(species: &str, measure: LengthKind) -> LengthConversion {
    demo_checklist().taxon(species).unwrap().conversion_for(measure).unwrap().clone()
}

fn taped(kind: LengthKind, cm: f64) -> Measurement {
    Measurement { kind, cm, estimated: false }
}

#[test]
fn shortfin_mako_fork_length_converts_by_kohler_casey_and_turner() {
    // Shortfin mako FL = 0.9286 × TL − 1.7101 (Kohler, Casey & Turner 1995, Fishery
    // Bulletin 93; from memory, agrees with a secondary copy).
    let mako = conversion("Isurus oxyrinchus", LengthKind::ForkLength);
    assert_eq!((mako.slope, mako.intercept_cm), (0.9286, -1.7101));
    for total in [100.0, 250.0, 400.0] {
        let fork = 0.9286 * total - 1.7101;
        assert!((total_length_by_equation(fork, &mako) - total).abs() < 1e-9, "TL {total}");
    }
    assert_eq!(equation_text(&mako), "FL = 0.9286 × TL − 1.7101");
    assert!(mako.source.contains("Kohler, Casey & Turner 1995"));
}

#[test]
fn blue_shark_fork_length_converts_by_kohler_casey_and_turner() {
    // Blue shark FL = 0.8313 × TL + 1.39 (Kohler, Casey & Turner 1995, Fishery
    // Bulletin 93; from memory, not checked against a copy): TL 300 cm is FL 250.78 cm.
    let blue = conversion("Prionace glauca", LengthKind::ForkLength);
    assert!((total_length_by_equation(250.78, &blue) - 300.0).abs() < 1e-6);
    assert_eq!(equation_text(&blue), "FL = 0.8313 × TL + 1.39");
}

#[test]
fn a_thresher_fork_length_uses_its_own_equation_not_the_generic_ratio() {
    // Threshers' tails are about half their length (common practice), so the generic
    // 0.90 ratio would be far out. FL = 0.5474 × TL + 7.0262 (Kohler, Casey & Turner
    // 1995; from memory, not checked against a copy): FL 250 cm is TL ≈ 443.9 cm.
    let checklist = demo_checklist();
    let thresher = checklist.taxon("Alopias vulpinus").unwrap();
    let length = comparable_length(&taped(LengthKind::ForkLength, 250.0), thresher).unwrap();
    assert!((length.cm - (250.0 - 7.0262) / 0.5474).abs() < 1e-9);
    assert!(matches!(length.method, ConversionMethod::SpeciesEquation { .. }));
}

#[test]
fn without_a_species_equation_the_generic_ratio_is_used_and_named() {
    // Generic FL ≈ 0.90 × TL and PCL ≈ 0.80 × TL (common practice, documented in the README).
    assert_eq!(generic_ratio(LengthKind::ForkLength), Some(0.90));
    assert_eq!(generic_ratio(LengthKind::PrecaudalLength), Some(0.80));
    let checklist = demo_checklist();
    let spurdog = checklist.taxon("Squalus acanthias").unwrap();
    let length = comparable_length(&taped(LengthKind::ForkLength, 90.0), spurdog).unwrap();
    assert!((length.cm - 100.0).abs() < 1e-9);
    assert_eq!(length.method, ConversionMethod::CommonPractice { equation: "FL ≈ 0.90 × TL".into() });
    let precaudal = comparable_length(&taped(LengthKind::PrecaudalLength, 80.0), spurdog).unwrap();
    assert!((precaudal.cm - 100.0).abs() < 1e-9);
}

#[test]
fn a_length_of_the_same_kind_as_the_maximum_is_taken_as_measured() {
    let checklist = demo_checklist();
    let stingray = checklist.taxon("Dasyatis pastinaca").unwrap();
    let length = comparable_length(&taped(LengthKind::DiscWidth, 45.0), stingray).unwrap();
    assert_eq!((length.cm, length.method), (45.0, ConversionMethod::AsMeasured));
}

#[test]
fn lengths_that_cannot_be_compared_are_not() {
    let checklist = demo_checklist();
    // A total length against a maximum disc width, and a disc length against a total length.
    let stingray = checklist.taxon("Dasyatis pastinaca").unwrap();
    assert_eq!(comparable_length(&taped(LengthKind::TotalLength, 100.0), stingray), None);
    let catshark = checklist.taxon("Scyliorhinus canicula").unwrap();
    assert_eq!(comparable_length(&taped(LengthKind::DiscLength, 30.0), catshark), None);
}

#[test]
fn a_skate_disc_width_is_converted_with_its_common_practice_ratio() {
    // Skates: disc width about 0.7 × total length (common practice, named in the checklist).
    let checklist = demo_checklist();
    let thornback = checklist.taxon("Raja clavata").unwrap();
    let length = comparable_length(&taped(LengthKind::DiscWidth, 49.0), thornback).unwrap();
    assert!((length.cm - 70.0).abs() < 1e-9);
    match length.method {
        ConversionMethod::SpeciesEquation { source, .. } => {
            assert!(source.contains("common practice"))
        }
        other => panic!("expected the checklist's ratio, got {other:?}"),
    }
}
