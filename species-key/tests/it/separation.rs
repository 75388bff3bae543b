//! Separation: every demo species can be reached by answering with its own states,
//! and the only species it cannot be told from are the pairs the key lists, which are
//! checked against an independent pairwise comparison of the checklist data.

use std::collections::BTreeSet;

use species_key::{Answers, Checklist, Context, Key};

use crate::support::demo_checklist;

/// The pairs the demo checklist's characters cannot separate, written out so a change
/// to the checklist that merges or splits species shows up here.
const EXPECTED_UNSEPARABLE: [(&str, &str); 3] = [
    // Blue and flapper skates were split from the common skate only in 2010 and are
    // told apart mainly by colour details and size (from memory).
    ("Dipturus batis", "Dipturus intermedius"),
    // Blonde and spotted rays differ in how far the spots reach the disc edge (from memory).
    ("Raja brachyura", "Raja montagui"),
    // Kitefin and Greenland sharks: both spineless, no anal fin, dark; size separates.
    ("Dalatias licha", "Somniosus microcephalus"),
];

/// States a taxon allows for a character; a missing character allows all.
fn allowed<'a>(checklist: &'a Checklist, species: &'a str, character: &'a str) -> BTreeSet<&'a str> {
    let definition = checklist.characters().iter().find(|c| c.name == character).unwrap();
    match checklist.taxon(species).unwrap().characters.get(character) {
        Some(states) => states.iter().map(String::as_str).collect(),
        None => definition.states.iter().map(|s| s.name.as_str()).collect(),
    }
}

fn share_a_state_everywhere(checklist: &Checklist, first: &str, second: &str) -> bool {
    checklist
        .characters()
        .iter()
        .all(|c| !allowed(checklist, first, &c.name).is_disjoint(&allowed(checklist, second, &c.name)))
}

fn key_pairs(key: &Key) -> BTreeSet<(String, String)> {
    key.unseparable_pairs().iter().map(|p| (p.first.clone(), p.second.clone())).collect()
}

#[test]
fn the_key_lists_exactly_the_expected_unseparable_pairs() {
    let key = Key::new(&demo_checklist());
    let expected: BTreeSet<(String, String)> =
        EXPECTED_UNSEPARABLE.iter().map(|(a, b)| (a.to_string(), b.to_string())).collect();
    assert_eq!(key_pairs(&key), expected);
}

#[test]
fn the_unseparable_pairs_agree_with_a_pairwise_comparison() {
    let checklist = demo_checklist();
    let names: Vec<&str> = checklist.taxa().iter().map(|t| t.scientific_name.as_str()).collect();
    let mut brute = BTreeSet::new();
    for (i, first) in names.iter().enumerate() {
        for second in &names[i + 1..] {
            if share_a_state_everywhere(&checklist, first, second) {
                brute.insert((first.to_string(), second.to_string()));
            }
        }
    }
    assert_eq!(key_pairs(&Key::new(&checklist)), brute);
}

#[test]
fn every_species_is_reached_by_its_own_characters() {
    let checklist = demo_checklist();
    let key = Key::new(&checklist);
    for taxon in checklist.taxa() {
        let name = taxon.scientific_name.as_str();
        // For each character pick the species' state that the fewest other species allow.
        let answers = checklist.characters().iter().fold(Answers::new(), |answers, character| {
            let state = allowed(&checklist, name, &character.name)
                .into_iter()
                .min_by_key(|state| {
                    checklist
                        .taxa()
                        .iter()
                        .filter(|other| allowed(&checklist, &other.scientific_name, &character.name).contains(state))
                        .count()
                })
                .unwrap();
            answers.with(&character.name, state)
        });
        let ranked = key.rank(&answers, &Context::default()).unwrap();
        let own = ranked.iter().find(|c| c.scientific_name == name).unwrap().probability;
        let partners = key.cannot_separate_from(name);
        for above in ranked.iter().filter(|c| c.probability > own + 1e-12) {
            assert!(
                partners.contains(&above.scientific_name.as_str()),
                "{name} is outranked by {}, which the key says it can separate",
                above.scientific_name
            );
        }
        assert!(ranked.iter().position(|c| c.scientific_name == name).unwrap() <= partners.len());
        let with_partners: f64 = ranked
            .iter()
            .filter(|c| c.scientific_name == name || partners.contains(&c.scientific_name.as_str()))
            .map(|c| c.probability)
            .sum();
        assert!(with_partners > 0.5, "{name} and its partners reached only {with_partners}");
    }
}

#[test]
fn cannot_separate_from_names_the_partner_both_ways() {
    let key = Key::new(&demo_checklist());
    assert_eq!(key.cannot_separate_from("Raja montagui"), vec!["Raja brachyura"]);
    assert_eq!(key.cannot_separate_from("Raja brachyura"), vec!["Raja montagui"]);
    assert!(key.cannot_separate_from("Raja clavata").is_empty());
}
