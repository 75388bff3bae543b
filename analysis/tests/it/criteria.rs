//! Threshold tables against the IUCN Red List Categories and Criteria v3.1 (2012), and the
//! words a comparison is given in.

use analysis::criteria::{
    A1_REDUCTION_PERCENT, A2_TO_A4_REDUCTION_PERCENT, B1_EOO_KM2, B2_AOO_KM2, Category, LOCATIONS, area_band,
    criterion_a, criterion_b, reduction_band,
};

use Category::{CriticallyEndangered as Cr, Endangered as En, Vulnerable as Vu};

fn limits(table: &[analysis::criteria::Threshold; 3]) -> Vec<(Category, f64)> {
    table.iter().map(|t| (t.category, t.limit)).collect()
}

#[test]
fn tables_hold_the_published_limits() {
    // IUCN Red List Categories and Criteria v3.1 (2nd ed., 2012): B1 < 100 / 5,000 /
    // 20,000 km²; B2 < 10 / 500 / 2,000 km² (CR and EN checked; VU from memory); locations
    // 1 / ≤ 5 / ≤ 10 (from memory); A1 ≥ 90/70/50 %; A2–A4 ≥ 80/50/30 % [checked].
    assert_eq!(limits(&B1_EOO_KM2), [(Cr, 100.0), (En, 5_000.0), (Vu, 20_000.0)]);
    assert_eq!(limits(&B2_AOO_KM2), [(Cr, 10.0), (En, 500.0), (Vu, 2_000.0)]);
    assert_eq!(limits(&LOCATIONS), [(Cr, 1.0), (En, 5.0), (Vu, 10.0)]);
    assert_eq!(limits(&A1_REDUCTION_PERCENT), [(Cr, 90.0), (En, 70.0), (Vu, 50.0)]);
    assert_eq!(limits(&A2_TO_A4_REDUCTION_PERCENT), [(Cr, 80.0), (En, 50.0), (Vu, 30.0)]);
}

#[test]
fn area_limits_are_strict_and_reductions_inclusive() {
    // IUCN Criteria v3.1 wording: B is "less than", A is "≥".
    let cases = [(99.9, Some(Cr)), (100.0, Some(En)), (4_999.0, Some(En)), (5_000.0, Some(Vu)), (20_000.0, None)];
    for (area, expected) in cases {
        assert_eq!(area_band(&B1_EOO_KM2, area), expected, "B1 at {area} km²");
    }
    let cases = [(80.0, Some(Cr)), (79.9, Some(En)), (50.0, Some(En)), (30.0, Some(Vu)), (29.9, None), (-10.0, None)];
    for (reduction, expected) in cases {
        assert_eq!(reduction_band(&A2_TO_A4_REDUCTION_PERCENT, reduction), expected, "A2 at {reduction}%");
    }
}

#[test]
fn texts_name_the_band_and_the_cautions() {
    let b = criterion_b(Some(4_000.0), 12.0);
    assert_eq!((b.eoo_band, b.aoo_band), (Some(En), Some(En)));
    assert!(b.text.contains("EOO 4,000 km² is within the Endangered (EN) threshold for B1"), "{}", b.text);
    assert!(b.text.contains("inputs to a threatened-species assessment"), "{}", b.text);

    // Arithmetic: a steady 20% in 10 years is 1 − 0.8³ = 48.8% over 30 years; an interval
    // from 40% to 55% lies in VU for A2–A4 only partly (55% is EN).
    let a = criterion_a(-0.488, -0.55, -0.40, 30.0);
    assert_eq!((a.a1_band, a.a2_to_a4_band), (None, None));
    let span = a.a2_to_a4_span.unwrap();
    assert_eq!((span.least, span.most), (Some(Vu), Some(En)));
    assert!(a.text.contains("a reduction of 48.8% over 30 years"), "{}", a.text);
    assert!(a.text.contains("A2–A4 (CR ≥ 80, EN ≥ 50, VU ≥ 30% reduction): the interval spans from Vulnerable (VU) to Endangered (EN), so no single band is given"), "{}", a.text);
    let narrow = criterion_a(-0.6, -0.65, -0.55, 10.0);
    assert_eq!(narrow.a2_to_a4_band, Some(En));
    assert!(narrow.text.contains("the whole interval is within the Endangered (EN) band"), "{}", narrow.text);
    assert!(criterion_a(0.25, 0.1, 0.4, 10.0).text.contains("an increase of 25.0%"));
}
