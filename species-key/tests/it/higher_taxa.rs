//! Stopping at a higher rank: summed probabilities per genus, family, order and
//! superorder, and the most specific well-supported taxon.

use species_key::{Answers, Context, TaxonRank};

use crate::support::{demo_checklist, demo_key};

fn best(answers: &Answers, min_probability: f64) -> (String, TaxonRank) {
    let key = demo_key();
    let ranked = key.rank(answers, &Context::default()).unwrap();
    let best = key.best_supported_taxon(&ranked, min_probability).expect("some rank is supported");
    (best.scientific_name, best.taxon_rank)
}

#[test]
fn a_clear_species_is_offered_as_the_species() {
    let answers = Answers::new()
        .with("gillSlits", "seven")
        .with("dorsalFins", "one")
        .with("headShape", "pointed")
        .with("snout", "medium");
    assert_eq!(best(&answers, 0.9), ("Heptranchias perlo".into(), TaxonRank::Species));
}

#[test]
fn two_unseparable_rays_of_one_genus_stop_at_the_genus() {
    let answers = Answers::new()
        .with("bodyForm", "rayLike")
        .with("markings", "smallDarkSpots")
        .with("snout", "short")
        .with("colour", "sandy");
    assert_eq!(best(&answers, 0.9), ("Raja".into(), TaxonRank::Genus));
}

#[test]
fn unseparable_sharks_of_two_families_stop_at_the_order() {
    // Kitefin (Dalatiidae) and Greenland shark (Somniosidae), both Squaliformes.
    let answers = Answers::new()
        .with("dorsalSpines", "none")
        .with("analFin", "absent")
        .with("undersideColour", "black")
        .with("colour", "blackish")
        .with("bodyForm", "sharkLike")
        .with("snout", "short");
    assert_eq!(best(&answers, 0.9), ("Squaliformes".into(), TaxonRank::Order));
}

#[test]
fn no_answers_support_no_taxon_strongly() {
    let key = demo_key();
    let ranked = key.rank(&Answers::new(), &Context::default()).unwrap();
    assert_eq!(key.best_supported_taxon(&ranked, 0.99), None);
}

#[test]
fn support_at_a_rank_sums_the_species_probabilities() {
    let key = demo_key();
    let checklist = demo_checklist();
    let ranked = key.rank(&Answers::new().with("bodyForm", "rayLike"), &Context::default()).unwrap();
    let families = key.support_at(TaxonRank::Family, &ranked);
    for family in &families {
        let sum: f64 = ranked
            .iter()
            .filter(|c| checklist.taxon(&c.scientific_name).unwrap().family == family.scientific_name)
            .map(|c| c.probability)
            .sum();
        assert!((family.probability - sum).abs() < 1e-12, "{}", family.scientific_name);
        assert_eq!(family.taxon_rank, TaxonRank::Family);
    }
    assert_eq!(families[0].scientific_name, "Rajidae");
    let total: f64 = families.iter().map(|f| f.probability).sum();
    assert!((total - 1.0).abs() < 1e-9);
}
