//! Invented checklists of any size, for benchmarks (natively and in the browser) and
//! tests of speed. Nothing here describes real animals.

use crate::checklist::Checklist;

/// A small deterministic generator, so every run times the same checklist.
struct Lcg(u64);

impl Lcg {
    fn below(&mut self, bound: usize) -> usize {
        self.0 = self.0.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        ((self.0 >> 33) as usize) % bound
    }
}

fn state_count(character: usize) -> usize {
    2 + character % 7
}

/// A checklist of `species` invented species over `characters` invented characters
/// (2 to 8 states each; a quarter of the species allow two states), the same for the
/// same `seed`.
pub fn checklist(species: usize, characters: usize, seed: u64) -> Checklist {
    let mut random = Lcg(seed);
    let character_list: Vec<serde_json::Value> = (0..characters)
        .map(|c| {
            let states: Vec<_> = (0..state_count(c))
                .map(|s| serde_json::json!({ "name": format!("s{s}"), "label": format!("state {s}") }))
                .collect();
            serde_json::json!({ "name": format!("c{c}"), "question": format!("character {c}?"), "states": states })
        })
        .collect();
    let taxa: Vec<serde_json::Value> = (0..species)
        .map(|i| {
            let traits: serde_json::Map<String, serde_json::Value> = (0..characters)
                .map(|c| {
                    let first = random.below(state_count(c));
                    let mut states = vec![format!("s{first}")];
                    if random.below(4) == 0 {
                        states.push(format!("s{}", (first + 1) % state_count(c)));
                    }
                    (format!("c{c}"), serde_json::json!(states))
                })
                .collect();
            serde_json::json!({
                "scientificName": format!("Genus{} species{i}", i / 10),
                "commonNames": [], "taxonRank": "species",
                "genus": format!("Genus{}", i / 10), "family": format!("Family{}", i / 50),
                "order": "Order", "superorder": "Superorder",
                "characters": traits, "characterSource": "generated for the benchmark",
                "maxLength": { "cm": 50.0 + (i % 40) as f64 * 10.0, "measure": "totalLength", "source": "generated" },
                "presence": ["a"], "sensitivity": "none",
                "generationLength": { "years": 10.0, "source": "generated" }, "protected": false
            })
        })
        .collect();
    let file = serde_json::json!({
        "metadata": { "title": "benchmark", "region": "none", "notice": "generated, invented" },
        "areas": [{ "code": "a", "name": "A" }],
        "characters": character_list,
        "taxa": taxa
    });
    Checklist::from_json(&file.to_string()).expect("generated checklist is valid")
}
