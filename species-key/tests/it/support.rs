//! Helpers shared by the test modules: the demo checklist, its key, and a small
//! hand-made checklist for tests that need exact numbers.

use species_key::{Checklist, Key};

/// The demo checklist shipped in `demo-records/`.
pub fn demo_checklist() -> Checklist {
    Checklist::from_json(&demo_json()).expect("the demo checklist parses")
}

/// The demo checklist's text.
pub fn demo_json() -> String {
    include_str!(concat!(env!("CARGO_MANIFEST_DIR"), "/../demo-records/checklist.json")).to_owned()
}

/// A key over the demo checklist.
pub fn demo_key() -> Key {
    Key::new(&demo_checklist())
}

/// A two-species checklist with one two-state character, as a JSON value to mutate.
pub fn tiny_checklist_value() -> serde_json::Value {
    serde_json::json!({
        "metadata": { "title": "tiny", "region": "nowhere", "notice": "invented for tests" },
        "areas": [ { "code": "a", "name": "Area A" }, { "code": "b", "name": "Area B" } ],
        "characters": [
            { "name": "gillSlits", "question": "How many gill slits?", "states": [
                { "name": "five", "label": "5 gill slits" },
                { "name": "six", "label": "6 gill slits" } ] }
        ],
        "taxa": [ tiny_taxon("Fivus alpha", "five", "a"), tiny_taxon("Sixus beta", "six", "b") ]
    })
}

/// One taxon of the tiny checklist.
pub fn tiny_taxon(name: &str, gill_slits: &str, area: &str) -> serde_json::Value {
    serde_json::json!({
        "scientificName": name,
        "commonNames": [format!("{name} fish")],
        "taxonRank": "species",
        "genus": name.split(' ').next().unwrap(),
        "family": "Testidae",
        "order": "Testiformes",
        "superorder": "Testomorphii",
        "characters": { "gillSlits": [gill_slits] },
        "characterSource": "invented for tests",
        "maxLength": { "cm": 100.0, "measure": "totalLength", "source": "invented for tests" },
        "presence": [area],
        "sensitivity": "none",
        "generationLength": { "years": 10.0, "source": "invented for tests" },
        "protected": false
    })
}

/// A key over the tiny checklist, possibly mutated.
pub fn key_from_value(value: &serde_json::Value) -> Key {
    Key::new(&Checklist::from_json(&value.to_string()).expect("test checklist parses"))
}

/// Shannon entropy in bits, written here so tests do not lean on the crate's own.
pub fn entropy(probabilities: &[f64]) -> f64 {
    probabilities.iter().filter(|p| **p > 0.0).map(|p| -p * p.log2()).sum()
}
