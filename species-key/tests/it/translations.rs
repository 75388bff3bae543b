//! The checklist's questions and answers in other languages: a language's words replace
//! the checklist's own where given and fall back to them where not, what a language
//! leaves out can be listed, and a block naming what the checklist lacks is refused.

use serde_json::{Value, json};
use species_key::Checklist;

use crate::support::{demo_checklist, tiny_checklist_value};

/// The tiny checklist (one character, `gillSlits`: `five`, `six`) with `translations`.
fn with_translations(translations: Value) -> Result<Checklist, String> {
    let mut value = tiny_checklist_value();
    value["metadata"]["language"] = json!("en");
    value["translations"] = translations;
    Checklist::from_json(&value.to_string()).map_err(|err| err.to_string())
}

fn words(checklist: &Checklist) -> (String, Vec<String>) {
    let character = &checklist.characters()[0];
    (character.question.clone(), character.states.iter().map(|s| s.label.clone()).collect())
}

#[test]
fn a_language_with_words_asks_in_them_and_falls_back_where_it_has_none() {
    let checklist = with_translations(json!({ "cy": { "characters": { "gillSlits": {
        "question": "Sawl hollt tagell sydd?", "states": { "six": "6 hollt tagell" } } } } }))
    .unwrap();
    let welsh = checklist.in_language("cy");
    // The state left out keeps the checklist's own label.
    assert_eq!(
        words(&welsh),
        ("Sawl hollt tagell sydd?".to_owned(), vec!["5 gill slits".to_owned(), "6 hollt tagell".to_owned()])
    );
    // A region subtag finds the language's words.
    assert_eq!(words(&checklist.in_language("cy-GB")), words(&welsh));
    // A language with no words at all asks in the checklist's own.
    assert_eq!(words(&checklist.in_language("fr")), words(&checklist));
    assert_eq!(
        words(&checklist),
        ("How many gill slits?".to_owned(), vec!["5 gill slits".into(), "6 gill slits".into()])
    );
    // Names and everything else stay as the checklist gives them.
    assert_eq!(welsh.taxa(), checklist.taxa());
    assert_eq!(welsh.characters()[0].states[0].name, "five");
}

#[test]
fn what_a_language_leaves_out_is_listed_and_the_checklists_own_language_lacks_nothing() {
    let checklist = with_translations(
        json!({ "cy": { "characters": { "gillSlits": { "states": { "six": "6 hollt tagell" } } } } }),
    )
    .unwrap();
    assert_eq!(checklist.words_missing_in("cy"), ["gillSlits.question", "gillSlits.five"]);
    assert_eq!(checklist.words_missing_in("fr"), ["gillSlits.question", "gillSlits.five", "gillSlits.six"]);
    assert!(checklist.words_missing_in("en").is_empty());
    assert!(checklist.words_missing_in("en-GB").is_empty());
}

#[test]
fn words_for_what_the_checklist_lacks_are_refused_with_the_place_named() {
    let refused = |translations: Value, expected: &[&str]| {
        let message = with_translations(translations).expect_err("must be refused");
        for fragment in expected {
            assert!(message.contains(fragment), "{message:?} lacks {fragment:?}");
        }
    };
    refused(json!({ "cy": { "characters": { "finCount": { "question": "?" } } } }), &["translations.cy", "finCount"]);
    refused(
        json!({ "cy": { "characters": { "gillSlits": { "states": { "seven": "7" } } } } }),
        &["translations.cy", "gillSlits.states", "seven"],
    );
    refused(json!({ "cy": { "characters": { "gillSlits": { "question": " " } } } }), &["gillSlits.question is blank"]);
    refused(
        json!({ "cy": { "characters": { "gillSlits": { "states": { "five": "" } } } } }),
        &["gillSlits.states.five is blank"],
    );
    refused(json!({ "cy_GB": {} }), &["\"cy_GB\" is not a language tag"]);
    refused(json!({ "cy": { "characters": {}, "notes": "x" } }), &["unknown field `notes`"]);
    let mut value = tiny_checklist_value();
    value["metadata"]["language"] = json!("en_GB");
    let message = Checklist::from_json(&value.to_string()).expect_err("must be refused").to_string();
    assert!(message.contains("\"en_GB\" is not a language tag"), "{message}");
}

#[test]
fn a_checklist_with_its_translations_reads_back_the_same_from_its_own_json() {
    // The server sends the checklist as it holds it; the phone must read the same words.
    let checklist = demo_checklist();
    let again = Checklist::from_json(&serde_json::to_string(&checklist).unwrap()).unwrap();
    assert_eq!(words(&again.in_language("cy")), words(&checklist.in_language("cy")));
    assert!(again.words_missing_in("cy").is_empty());
}

#[test]
fn the_demo_checklist_says_its_language_and_that_its_welsh_is_a_first_draft() {
    let checklist = demo_checklist();
    assert_eq!(checklist.metadata().language.as_deref(), Some("en"));
    let notice = checklist.metadata().notice.to_lowercase();
    assert!(notice.contains("welsh") && notice.contains("first draft"), "{notice}");
    assert!(checklist.words_missing_in("cy").is_empty(), "{:?}", checklist.words_missing_in("cy"));
}
