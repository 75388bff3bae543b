//! The checklist the app carries: built in, replaced by the server's (`/api/checklist`)
//! whenever one answers, and kept in localStorage so the guided key works in flight
//! mode. The review queue's taxon filter and the downloads' areas read it too. The key
//! asks its questions in the app's language where the checklist has words for it
//! (`translations`), else in the checklist's own; species' names stay as it gives them.

use std::collections::BTreeSet;
use std::sync::Arc;

use leptos::prelude::*;
use species_key::{Checklist, Key};

use crate::data::api;
use crate::data::local;
use crate::data::words;

const STORED_CHECKLIST: &str = "wrackline.checklist";
const BUILT_IN_CHECKLIST: &str = include_str!("../../../demo-records/checklist.json");

/// The checklist kept from the server's last answer, or else the built-in one.
fn current() -> Checklist {
    let stored = local::get(STORED_CHECKLIST).and_then(|text| Checklist::from_json(&text).ok());
    // The built-in checklist is checked by the species-key and server tests.
    stored.unwrap_or_else(|| Checklist::from_json(BUILT_IN_CHECKLIST).expect("built-in checklist is valid"))
}

/// The key over the last checklist the server sent, or the built-in one.
pub fn initial_key() -> Arc<Key> {
    key_in_language(&current())
}

/// A key over `checklist` asking in the app's language.
fn key_in_language(checklist: &Checklist) -> Arc<Key> {
    Arc::new(Key::new(&checklist.in_language(words::language())))
}

thread_local! {
    static ASKED: std::cell::Cell<bool> = const { std::cell::Cell::new(false) };
}

/// Fetches the server's checklist and keeps it for offline use, once per page and only
/// when the key is opened (the first load stays small: the built-in checklist serves
/// until then); quietly keeps the current one when there is no answer or it does not
/// check out.
pub fn refresh_from_server(key: RwSignal<Arc<Key>>) {
    if ASKED.replace(true) {
        return;
    }
    leptos::task::spawn_local(async move {
        let Ok(text) = api::checklist_text().await else { return };
        let Ok(checklist) = Checklist::from_json(&text) else { return };
        local::set(STORED_CHECKLIST, &text);
        key.set(key_in_language(&checklist));
    });
}

/// Every species (scientific and common names) and every genus, family, order and
/// superorder of `checklist`, sorted, for the queue's taxon filter.
pub fn taxon_names(checklist: &Checklist) -> Vec<String> {
    let mut names = BTreeSet::new();
    for taxon in checklist.taxa() {
        names.insert(taxon.scientific_name.clone());
        names.extend(taxon.common_names.iter().cloned());
        for higher in [&taxon.genus, &taxon.family, &taxon.order, &taxon.superorder] {
            names.insert(higher.clone());
        }
    }
    names.into_iter().collect()
}

/// The preferred common name of a species or group in `checklist`, if it gives one.
pub fn common_name_in(checklist: &Checklist, scientific_name: &str) -> Option<String> {
    checklist
        .taxon(scientific_name)
        .and_then(|t| t.common_names.first().cloned())
        .or_else(|| checklist.group_common_name(scientific_name).map(str::to_owned))
}

/// [`common_name_in`] the checklist the app carries.
pub fn common_name(scientific_name: &str) -> Option<String> {
    common_name_in(&current(), scientific_name)
}

/// Names for the queue's taxon filter, from the checklist the app carries.
pub fn known_taxon_names() -> Vec<String> {
    taxon_names(&current())
}

/// The checklist's areas as (code, name).
pub fn areas() -> Vec<(String, String)> {
    current().areas().iter().map(|a| (a.code.clone(), a.name.clone())).collect()
}

/// The areas that have a bounding box, as (name, `SOUTH,WEST,NORTH,EAST`) — the order
/// the export's `bbox` filter reads.
pub fn areas_with_box(checklist: &Checklist) -> Vec<(String, String)> {
    checklist
        .areas()
        .iter()
        .filter_map(|a| {
            a.bounds.map(|[west, south, east, north]| (a.name.clone(), format!("{south},{west},{north},{east}")))
        })
        .collect()
}

/// [`areas_with_box`] of the checklist the app carries.
pub fn download_areas() -> Vec<(String, String)> {
    areas_with_box(&current())
}

#[cfg(test)]
pub(crate) mod tests {
    use super::*;

    pub(crate) fn built_in() -> Checklist {
        Checklist::from_json(BUILT_IN_CHECKLIST).expect("built-in checklist is valid")
    }

    #[test]
    fn the_key_has_words_for_every_question_and_answer_in_every_language_the_app_speaks() {
        let checklist = built_in();
        for (code, _, _) in words::LANGUAGES {
            assert_eq!(checklist.words_missing_in(code), Vec::<String>::new(), "{code}: no words for these");
            // Each language's words are its own: none is left in the checklist's English.
            let own = checklist.in_language(code);
            if code != "en" {
                let english = checklist.characters().iter().zip(own.characters());
                for (english, theirs) in english {
                    assert_ne!(english.question, theirs.question, "{code}: {}", english.name);
                }
            }
        }
    }

    #[test]
    fn a_question_or_answer_with_no_words_in_the_language_keeps_the_checklists_own() {
        let mut value: serde_json::Value = serde_json::from_str(BUILT_IN_CHECKLIST).unwrap();
        let welsh = &mut value["translations"]["cy"]["characters"]["gillSlits"];
        welsh.as_object_mut().unwrap().remove("question");
        welsh["states"].as_object_mut().unwrap().remove("six");
        let checklist = Checklist::from_json(&value.to_string()).unwrap();
        let asked = checklist.in_language("cy");
        let gills = asked.characters().iter().find(|c| c.name == "gillSlits").unwrap();
        assert_eq!(gills.question, "How many gill openings are there on each side?");
        let label = |state: &str| gills.states.iter().find(|s| s.name == state).unwrap().label.as_str();
        assert_eq!((label("five"), label("six")), ("5 hollt tagell", "6 gill slits"));
        assert_eq!(checklist.words_missing_in("cy"), ["gillSlits.question", "gillSlits.six"]);
        // A language the checklist has no words for asks in its own.
        assert_eq!(checklist.in_language("fr").characters(), checklist.characters());
    }

    #[test]
    fn the_taxon_filter_offers_species_common_names_and_every_higher_rank_once() {
        let names = taxon_names(&built_in());
        for name in ["Raja clavata", "small-spotted catshark", "Raja", "Rajidae", "Rajiformes", "Batoidea"] {
            assert!(names.iter().any(|n| n == name), "{name} is offered");
        }
        assert_eq!(names.iter().filter(|n| *n == "Rajidae").count(), 1);
        assert!(names.windows(2).all(|w| w[0] < w[1]), "sorted, without repeats");
    }

    #[test]
    fn species_and_groups_have_their_common_names() {
        let checklist = built_in();
        assert_eq!(common_name_in(&checklist, "Scyliorhinus stellaris").as_deref(), Some("nursehound"));
        assert_eq!(common_name_in(&checklist, "Rajidae").as_deref(), Some("skates"));
        assert_eq!(common_name_in(&checklist, "Felis catus"), None);
    }

    #[test]
    fn an_areas_box_is_given_in_the_order_the_export_reads_it() {
        // The checklist keeps [west, south, east, north]; `/api/export?bbox=` reads
        // SOUTH,WEST,NORTH,EAST (server/src/commands/export.rs, parse_bbox).
        let areas = areas_with_box(&built_in());
        let cardigan = areas.iter().find(|(name, _)| name == "Cardigan Bay").expect("Cardigan Bay has a box");
        assert_eq!(cardigan.1, "51.95,-5,52.85,-3.9");
        for (name, bbox) in &areas {
            let v: Vec<f64> = bbox.split(',').map(|x| x.parse().unwrap()).collect();
            assert!(v[0] <= v[2] && (-90.0..=90.0).contains(&v[0]) && (-90.0..=90.0).contains(&v[2]), "{name}: {bbox}");
        }
    }
}
