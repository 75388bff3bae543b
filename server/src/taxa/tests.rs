//! Names as people write them, against the demo checklist.

use super::*;

fn demo() -> TaxonIndex {
    TaxonIndex::load(None).unwrap()
}

/// What a typed name should read as: a taxon and rank, or not resolved.
enum Reads {
    As(&'static str, TaxonRank),
    NotResolved,
}

use Reads::{As, NotResolved};
use TaxonRank::{Family, Genus, Order, Species, Superorder};

/// Ways people write the checklist's sensitive taxa (Squatina squatina, Dipturus batis,
/// D. intermedius, Rostroraja alba: `tenthDegree` in the demo checklist) and the groups
/// holding them. Every one must read as a sensitive taxon, or not resolve (which
/// `protect` publishes as the strictest species would be).
const SENSITIVE_VARIANTS: &[(&str, Reads)] = &[
    ("Squatina squatina", As("Squatina squatina", Species)),
    ("squatina squatina", As("Squatina squatina", Species)),
    ("SQUATINA  SQUATINA", As("Squatina squatina", Species)),
    ("Squatina-squatina", As("Squatina squatina", Species)),
    ("Squatína squatina", As("Squatina squatina", Species)),
    ("Ｓｑｕａｔｉｎａ ｓｑｕａｔｉｎａ", As("Squatina squatina", Species)),
    ("Squatina\u{00A0}squatina", As("Squatina squatina", Species)),
    ("Squatina\u{200B}squatina", As("Squatina squatina", Species)),
    ("\u{FEFF}Squatina squatina\u{200D}", As("Squatina squatina", Species)),
    ("Squatina squatina (Linnaeus, 1758)", As("Squatina squatina", Species)),
    ("Squatina squatina L.", As("Squatina squatina", Species)),
    ("Squatina cf. squatina", As("Squatina squatina", Species)),
    ("cf. Squatina squatina", As("Squatina squatina", Species)),
    ("Squatina squatina?", As("Squatina squatina", Species)),
    ("angelshark", As("Squatina squatina", Species)),
    ("Angel shark", As("Squatina squatina", Species)),
    ("angel-shark?", As("Squatina squatina", Species)),
    ("possibly an angel shark", NotResolved),
    ("Squalus squatina", As("Squatina squatina", Species)),
    ("Maelgi", As("Squatina squatina", Species)),
    ("monkfish?", As("Squatina squatina", Species)),
    ("Ange de mer", As("Squatina squatina", Species)),
    ("Squatina sp.", As("Squatina", Genus)),
    ("Squatina spp", As("Squatina", Genus)),
    ("Squatinidae", As("Squatinidae", Family)),
    ("Squatiniformes", As("Squatiniformes", Order)),
    ("Dipturus batis", As("Dipturus batis", Species)),
    ("Raja batis", As("Dipturus batis", Species)),
    ("Dipturus cf batis", As("Dipturus batis", Species)),
    ("blue skate", As("Dipturus batis", Species)),
    ("Pocheteau gris", As("Dipturus batis", Species)),
    ("flapper skate", As("Dipturus intermedius", Species)),
    ("Flapper-Skate", As("Dipturus intermedius", Species)),
    ("Raja intermedia", As("Dipturus intermedius", Species)),
    ("Dipturus intermedius (Parnell, 1837)", As("Dipturus intermedius", Species)),
    ("common skate", As("Dipturus", Genus)),
    ("Common Skate (complex)", As("Dipturus", Genus)),
    ("Dipturus sp.", As("Dipturus", Genus)),
    ("dipturus spp.", As("Dipturus", Genus)),
    ("Dipturus batis/intermedius", NotResolved),
    ("Rostroraja alba", As("Rostroraja alba", Species)),
    ("Rostroraja alba (Lacepède, 1803)", As("Rostroraja alba", Species)),
    ("Raja alba", As("Rostroraja alba", Species)),
    ("white skate", As("Rostroraja alba", Species)),
    ("bottle-nose skate", As("Rostroraja alba", Species)),
    ("raie blanche", As("Rostroraja alba", Species)),
    ("cath for wen", As("Rostroraja alba", Species)),
    ("Rajidae", As("Rajidae", Family)),
    ("Rajiformes sp.", As("Rajiformes", Order)),
    ("Batoidea", As("Batoidea", Superorder)),
    ("Squalomorphii", As("Squalomorphii", Superorder)),
    ("skate?", NotResolved),
    ("big ray", NotResolved),
    ("?", NotResolved),
    ("Squatina squatena", NotResolved),
];

#[test]
fn every_way_of_writing_a_sensitive_taxon_reads_as_a_sensitive_taxon_or_not_at_all() {
    let index = demo();
    assert!(SENSITIVE_VARIANTS.len() >= 30);
    for (typed, expected) in SENSITIVE_VARIANTS {
        let resolution = index.resolution(typed);
        match (expected, resolution.taxon()) {
            (As(name, rank), Some(taxon)) => {
                assert_eq!((taxon.scientific_name.as_str(), taxon.rank), (*name, *rank), "{typed:?}");
                assert_eq!(taxon.sensitivity, Sensitivity::TenthDegree, "{typed:?} reads as a sensitive taxon");
            }
            (NotResolved, None) => {}
            (_, _) => panic!("{typed:?} read as {}", resolution.describe()),
        }
    }
}

#[test]
fn names_of_taxa_that_are_not_sensitive_resolve_the_same_ways() {
    let index = demo();
    let cases = [
        ("Thornback Ray", "Raja clavata", Species),
        ("thornback-ray", "Raja clavata", Species),
        ("Raja clavata Linnaeus, 1758", "Raja clavata", Species),
        ("raie bouclée", "Raja clavata", Species),
        ("Raja sp.", "Raja", Genus),
        ("small spotted catshark", "Scyliorhinus canicula", Species),
        ("lesser-spotted dogfish?", "Scyliorhinus canicula", Species),
        ("Scyliorhinidae", "Scyliorhinidae", Family),
    ];
    for (typed, name, rank) in cases {
        let taxon = index.named(typed).unwrap_or_else(|| panic!("{typed:?}: {}", index.resolution(typed).describe()));
        assert_eq!((taxon.scientific_name.as_str(), taxon.rank, taxon.sensitivity), (name, rank, Sensitivity::None));
    }
    let raja = index.named("Raja").unwrap();
    assert_eq!(raja.sensitivity, Sensitivity::None, "no Raja species is sensitive");
}

#[test]
fn the_resolution_says_what_was_set_aside_and_what_was_not_understood() {
    let index = demo();
    let exact = index.resolution("Squatina squatina");
    assert_eq!(
        exact.describe(),
        "Squatina squatina (species): matched its scientific name \u{201c}Squatina squatina\u{201d}"
    );
    let qualified = index.resolution("Dipturus cf. batis?").describe();
    assert!(qualified.contains("Dipturus batis (species)") && qualified.contains("\u{201c}cf\u{201d}"), "{qualified}");
    assert!(qualified.contains("a question mark"), "{qualified}");
    let authored = index.resolution("Rostroraja alba (Lacepède, 1803)").describe();
    assert!(authored.contains("the authorship \u{201c}(Lacepède, 1803)\u{201d}"), "{authored}");
    let shared = index.resolution("common skate").describe();
    assert!(shared.starts_with("Dipturus (genus): matched a name several species share"), "{shared}");
    let local = index.resolution("maelgi").describe();
    assert!(local.contains("a local name (cy)"), "{local}");
    match index.resolution("juvenile Raja clavata, or a Dipturus") {
        Resolution::NotResolved { found, unread } => {
            let names: Vec<&str> = found.iter().map(|t| t.scientific_name.as_str()).collect();
            assert_eq!(names, ["Raja clavata", "Dipturus"]);
            assert_eq!(unread, ["juvenile", "or", "a"]);
        }
        other => panic!("resolved: {}", other.describe()),
    }
}

#[test]
fn common_and_scientific_names_match_whatever_their_case() {
    let index = demo();
    assert_eq!(index.resolve("Thornback Ray").unwrap().scientific_name, "Raja clavata");
    assert_eq!(index.resolve("  raja CLAVATA ").unwrap().scientific_name, "Raja clavata");
    assert!(index.resolve("thornback").is_none());
    assert!(index.resolve("common skate").is_none(), "a shared name is a group, not one species");
}

#[test]
fn a_higher_taxon_is_as_sensitive_as_its_strictest_species() {
    let index = demo();
    // Demo checklist: both Dipturus species are tenthDegree and protected; Rajidae
    // mixes them with Raja species that are neither; Scyliorhinus has neither.
    let dipturus = index.named("dipturus").unwrap();
    assert_eq!((dipturus.scientific_name.as_str(), dipturus.rank), ("Dipturus", TaxonRank::Genus));
    assert_eq!((dipturus.sensitivity, dipturus.protected), (Sensitivity::TenthDegree, true));
    let rajidae = index.named("Rajidae").unwrap();
    assert_eq!(
        (rajidae.rank, rajidae.sensitivity, rajidae.protected),
        (TaxonRank::Family, Sensitivity::TenthDegree, true)
    );
    assert!(rajidae.members(index.checklist()).all(|t| t.superorder == "Batoidea"));
    let catsharks = index.named("Scyliorhinus").unwrap();
    assert_eq!((catsharks.sensitivity, catsharks.protected), (Sensitivity::None, false));
    assert_eq!(index.named("tope").unwrap().rank, TaxonRank::Species);
    assert!(index.named("Felidae").is_none());
    assert_eq!(index.strictest_sensitivity(), Sensitivity::TenthDegree);
}

#[test]
fn a_filter_takes_in_identifications_at_or_below_its_rank() {
    let index = demo();
    let rajidae = index.filter("Rajidae").unwrap();
    assert!(rajidae.contains_named(index.named("Dipturus").unwrap(), index.checklist()));
    assert!(rajidae.contains_named(index.named("Rajidae").unwrap(), index.checklist()));
    let thornback = index.filter("Raja clavata").unwrap();
    assert!(
        !thornback.contains_named(index.named("Raja").unwrap(), index.checklist()),
        "a genus may be another species"
    );
    assert!(!rajidae.contains_named(index.named("Rajiformes").unwrap(), index.checklist()));
}

#[test]
fn a_family_filter_takes_in_its_species() {
    let index = demo();
    let filter = index.filter("rajidae").unwrap();
    assert_eq!((filter.name.as_str(), filter.rank), ("Rajidae", TaxonRank::Family));
    assert!(filter.contains(index.resolve("blonde ray").unwrap()));
    assert!(!filter.contains(index.resolve("tope").unwrap()));
}
