//! The checklist format: the demo file parses and is what it claims to be, and each
//! kind of mistake in a checklist gives an error naming the species and field at fault.

use serde_json::Value;
use species_key::{Checklist, LengthKind, Sensitivity, TaxonRank};

use crate::support::{demo_checklist, tiny_checklist_value};

#[test]
fn demo_checklist_has_at_least_thirty_species_and_says_it_is_illustrative() {
    let checklist = demo_checklist();
    assert!(checklist.taxa().len() >= 30, "only {} taxa", checklist.taxa().len());
    let notice = checklist.metadata().notice.to_lowercase();
    assert!(notice.contains("invented") && notice.contains("illustrative"), "{notice}");
}

#[test]
fn demo_checklist_covers_sharks_rays_skates_and_chimaeras() {
    let checklist = demo_checklist();
    // Superorders as commonly used for elasmobranchs and chimaeras (common practice).
    for superorder in ["Galeomorphii", "Squalomorphii", "Batoidea", "Holocephalimorpha"] {
        assert!(checklist.taxa().iter().any(|t| t.superorder == superorder), "no taxon in {superorder}");
    }
    assert!(checklist.taxa().iter().any(|t| t.family == "Rajidae"), "no skates");
}

#[test]
fn rays_measured_across_the_disc_say_so() {
    let checklist = demo_checklist();
    // Stingrays are usually measured by disc width (common practice).
    let stingray = checklist.taxon("Dasyatis pastinaca").unwrap();
    assert_eq!(stingray.max_length.measure, LengthKind::DiscWidth);
    let catshark = checklist.taxon("Scyliorhinus canicula").unwrap();
    assert_eq!(catshark.max_length.measure, LengthKind::TotalLength);
}

#[test]
fn every_demo_species_names_a_source_for_its_characters() {
    for taxon in demo_checklist().taxa() {
        assert!(!taxon.character_source.trim().is_empty(), "{}", taxon.scientific_name);
        assert_eq!(taxon.taxon_rank, TaxonRank::Species);
    }
}

#[test]
fn sensitivity_categories_round_to_the_published_grids() {
    // Grids of Chapman 2020, GBIF best practices for generalising sensitive species data.
    assert_eq!(Sensitivity::TenthDegree.grid_degrees(), Some(0.1));
    assert_eq!(Sensitivity::HundredthDegree.grid_degrees(), Some(0.01));
    assert_eq!(Sensitivity::ThousandthDegree.grid_degrees(), Some(0.001));
    assert_eq!(Sensitivity::None.grid_degrees(), None);
    assert!(Sensitivity::Withhold.withholds_location());
    assert!(!Sensitivity::TenthDegree.withholds_location());
}

#[test]
fn the_tiny_checklist_is_valid_before_it_is_broken() {
    assert!(Checklist::from_json(&tiny_checklist_value().to_string()).is_ok());
}

/// Breaks the tiny checklist's second taxon with `edit` and checks that the error
/// message contains every expected fragment.
fn check_taxon_error(edit: impl FnOnce(&mut Value), expected: &[&str]) {
    let mut value = tiny_checklist_value();
    edit(&mut value["taxa"][1]);
    let message = Checklist::from_json(&value.to_string()).expect_err("broken checklist must be refused").to_string();
    for fragment in expected {
        assert!(message.contains(fragment), "{message:?} lacks {fragment:?}");
    }
}

#[test]
fn a_missing_max_length_names_the_species_and_field() {
    check_taxon_error(
        |taxon| {
            taxon.as_object_mut().unwrap().remove("maxLength");
        },
        &["Sixus beta", "maxLength"],
    );
}

#[test]
fn an_unknown_character_names_the_species_and_character() {
    check_taxon_error(
        |taxon| taxon["characters"]["gillSlit"] = serde_json::json!(["six"]),
        &["Sixus beta", "gillSlit"],
    );
}

#[test]
fn a_state_outside_the_character_names_species_character_and_state() {
    check_taxon_error(
        |taxon| taxon["characters"]["gillSlits"] = serde_json::json!(["six", "eight"]),
        &["Sixus beta", "gillSlits", "eight"],
    );
}

#[test]
fn an_empty_state_list_is_refused() {
    check_taxon_error(|taxon| taxon["characters"]["gillSlits"] = serde_json::json!([]), &["Sixus beta", "gillSlits"]);
}

#[test]
fn a_zero_max_length_is_refused() {
    check_taxon_error(|taxon| taxon["maxLength"]["cm"] = serde_json::json!(0.0), &["Sixus beta", "maxLength.cm"]);
}

#[test]
fn a_max_fork_length_is_refused() {
    check_taxon_error(
        |taxon| taxon["maxLength"]["measure"] = serde_json::json!("forkLength"),
        &["Sixus beta", "maxLength.measure", "forkLength"],
    );
}

#[test]
fn a_blank_character_source_asks_for_a_source() {
    check_taxon_error(
        |taxon| taxon["characterSource"] = serde_json::json!("  "),
        &["Sixus beta", "characterSource", "from memory"],
    );
}

#[test]
fn an_unknown_area_code_is_refused() {
    check_taxon_error(|taxon| taxon["presence"] = serde_json::json!(["z"]), &["Sixus beta", "presence", "z"]);
}

#[test]
fn a_misspelt_field_is_refused_with_the_species_named() {
    check_taxon_error(|taxon| taxon["protectd"] = serde_json::json!(true), &["Sixus beta", "protectd"]);
}

#[test]
fn an_unknown_sensitivity_category_is_refused() {
    check_taxon_error(|taxon| taxon["sensitivity"] = serde_json::json!("secret"), &["Sixus beta", "secret"]);
}

#[test]
fn a_conversion_to_total_length_from_total_length_is_refused() {
    check_taxon_error(
        |taxon| {
            taxon["lengthConversions"] = serde_json::json!([
                { "measure": "totalLength", "slope": 1.0, "interceptCm": 0.0, "source": "invented" }
            ])
        },
        &["Sixus beta", "lengthConversions", "totalLength"],
    );
}

#[test]
fn a_species_listed_twice_is_refused() {
    check_taxon_error(
        |taxon| taxon["scientificName"] = serde_json::json!("Fivus alpha"),
        &["Fivus alpha", "more than once"],
    );
}

#[test]
fn a_character_with_one_state_is_refused() {
    let mut value = tiny_checklist_value();
    value["characters"][0]["states"].as_array_mut().unwrap().pop();
    value["taxa"][1]["characters"]["gillSlits"] = serde_json::json!(["five"]);
    let message = Checklist::from_json(&value.to_string()).unwrap_err().to_string();
    assert!(message.contains("gillSlits") && message.contains("two states"), "{message}");
}

#[test]
fn text_that_is_not_json_is_refused() {
    let err = Checklist::from_json("{ not json").unwrap_err();
    assert!(matches!(err, species_key::ChecklistError::Format(_)), "{err:?}");
    // serde_json says where the text stops being JSON.
    assert!(err.to_string().starts_with("checklist is not valid: key must be a string at line 1 column 3"), "{err}");
}

#[test]
fn a_position_is_placed_in_the_first_area_whose_box_holds_it() {
    let checklist = demo_checklist();
    // Aberystwyth harbour (52.41 N, 4.09 W) lies in Cardigan Bay; Douglas, Isle of Man
    // (54.15 N, 4.48 W) in the Irish Sea; Bergen (60.39 N, 5.32 E) in the North Sea box;
    // the middle of the North Atlantic in none (positions from memory).
    let code = |lat: f64, lon: f64| checklist.area_at(lat, lon).map(|a| a.code.clone());
    assert_eq!(code(52.41, -4.09).as_deref(), Some("cardigan-bay"));
    assert_eq!(code(54.15, -4.48).as_deref(), Some("irish-sea"));
    assert_eq!(code(60.39, 5.32).as_deref(), Some("north-sea"));
    assert_eq!(code(40.0, -40.0), None);
}

#[test]
fn an_area_box_the_wrong_way_round_is_refused() {
    let mut value = tiny_checklist_value();
    value["areas"][0]["bounds"] = serde_json::json!([-3.0, 52.0, -5.0, 53.0]);
    let err = Checklist::from_json(&value.to_string()).unwrap_err().to_string();
    assert!(err.contains("bounds must be [west, south, east, north]"), "{err}");
}

#[test]
fn synonyms_and_local_names_need_a_name_a_language_and_a_source() {
    let name = |n: &str| serde_json::json!([{ "name": n, "source": "invented for tests" }]);
    check_taxon_error(|taxon| taxon["synonyms"] = name(" "), &["Sixus beta", "synonyms.name", "blank"]);
    check_taxon_error(
        |taxon| taxon["synonyms"] = serde_json::json!([{ "name": "Sixus olim", "source": "" }]),
        &["Sixus beta", "synonyms.source"],
    );
    let local = |name: &str, language: &str, source: &str| serde_json::json!([{ "name": name, "language": language, "source": source }]);
    check_taxon_error(|taxon| taxon["localNames"] = local("six-gill", "", "x"), &["Sixus beta", "localNames.language"]);
    check_taxon_error(|taxon| taxon["localNames"] = local("six-gill", "en", " "), &["Sixus beta", "localNames.source"]);
    check_taxon_error(|taxon| taxon["localNames"] = local("", "en", "x"), &["Sixus beta", "localNames.name"]);
}

#[test]
fn a_synonym_may_not_be_the_name_of_another_entry() {
    check_taxon_error(
        |taxon| taxon["synonyms"] = serde_json::json!([{ "name": "Fivus alpha", "source": "invented for tests" }]),
        &["Sixus beta", "synonym Fivus alpha", "scientific name of an entry"],
    );
}

#[test]
fn the_demo_checklist_gives_every_sensitive_species_synonyms_and_local_names_with_sources() {
    let checklist = demo_checklist();
    let sensitive: Vec<_> = checklist.taxa().iter().filter(|t| t.sensitivity != Sensitivity::None).collect();
    assert!(sensitive.len() >= 4);
    for taxon in sensitive {
        assert!(!taxon.synonyms.is_empty() && !taxon.local_names.is_empty(), "{}", taxon.scientific_name);
        let invented = taxon.local_names.iter().filter(|l| l.source.contains("invented")).count();
        let sourced = taxon.local_names.iter().filter(|l| l.source.contains("from memory")).count();
        assert_eq!(
            invented + sourced,
            taxon.local_names.len(),
            "{}: each says where it comes from",
            taxon.scientific_name
        );
    }
}
