//! Ranking: a table of answers and the species an experienced recorder would expect
//! on top, plus the rules the ranking must keep ("not sure" changes nothing, one wrong
//! answer does not lose the right species, size and range weigh in, reasons are plain).
//! Expected species come from the identification features of each group (from memory).

use std::collections::BTreeMap;

use species_key::{Answer, AnswerError, Answers, Candidate, Context, Effect, LengthKind, Measurement};

use crate::support::demo_key;

fn answers(pairs: &[(&str, &str)]) -> Answers {
    pairs.iter().fold(Answers::new(), |a, (character, state)| a.with(character, state))
}

fn top(answers: &Answers, context: &Context) -> Vec<Candidate> {
    demo_key().rank(answers, context).expect("answers fit the demo checklist")
}

/// The top species for these answers, with no context.
fn check(pairs: &[(&str, &str)], expected_top: &str) {
    let ranked = top(&answers(pairs), &Context::default());
    assert_eq!(ranked[0].scientific_name, expected_top, "answers {pairs:?}; ranking {:?}", names(&ranked));
    assert!(ranked[0].probability > ranked[1].probability, "{expected_top} only ties");
}

fn names(ranked: &[Candidate]) -> Vec<&str> {
    ranked.iter().take(5).map(|c| c.scientific_name.as_str()).collect()
}

fn length(kind: LengthKind, cm: f64) -> Context {
    Context { measurement: Some(Measurement { kind, cm, estimated: false }), ..Context::default() }
}

#[test]
fn answers_lead_to_the_expected_species() {
    // Six gill slits: sixgill; seven: sevengill (hexanchid gill counts, from memory).
    check(&[("gillSlits", "six")], "Hexanchus griseus");
    check(&[("gillSlits", "seven")], "Heptranchias perlo");
    // One covered gill opening and a shark-ish body: a chimaera; the anal fin tells the
    // rabbitfish (separate anal fin) from Hydrolagus (none), from memory.
    check(&[("bodyForm", "chimaeraLike"), ("analFin", "present")], "Chimaera monstrosa");
    check(&[("gillSlits", "one"), ("analFin", "absent")], "Hydrolagus mirabilis");
    // A flat shark with side gill slits is the angelshark.
    check(&[("bodyForm", "flatShark")], "Squatina squatina");
    // Devil rays have the horn-like cephalic fins.
    check(&[("bodyForm", "rayLike"), ("headShape", "hornFlaps")], "Mobula mobular");
    // A ray with a sting and no dorsal fin is a stingray; with a dorsal fin and a raised head, an eagle ray.
    check(&[("bodyForm", "rayLike"), ("tailSpine", "present"), ("dorsalFins", "none")], "Dasyatis pastinaca");
    check(&[("tailSpine", "present"), ("headShape", "standsOut")], "Myliobatis aquila");
    // The thresher's tail; the blue shark's colour; the porbeagle's white fin tip.
    check(&[("caudalLobes", "upperAsLongAsBody")], "Alopias vulpinus");
    check(&[("colour", "blue")], "Prionace glauca");
    check(&[("caudalFinShape", "crescent"), ("markings", "whiteFinTip")], "Lamna nasus");
    check(&[("caudalFinShape", "crescent"), ("colour", "darkBlue")], "Isurus oxyrinchus");
    // Catsharks: many small spots versus fewer large ones.
    check(&[("bodyForm", "sharkLike"), ("markings", "smallDarkSpots")], "Scyliorhinus canicula");
    check(&[("bodyForm", "sharkLike"), ("markings", "largeDarkSpots")], "Scyliorhinus stellaris");
    // Spined dogfishes: black belly is the velvet belly; white spots the spurdog.
    check(&[("dorsalSpines", "both"), ("undersideColour", "black")], "Etmopterus spinax");
    check(&[("dorsalSpines", "both"), ("markings", "paleSpots")], "Squalus acanthias");
    // Smooth-hounds: white spots for the starry; tope has a small second dorsal fin.
    check(
        &[("secondDorsalSize", "nearlyAsLarge"), ("markings", "paleSpots"), ("dorsalSpines", "none")],
        "Mustelus asterias",
    );
    check(&[("secondDorsalSize", "muchSmaller"), ("snout", "long"), ("colour", "grey")], "Galeorhinus galeus");
    // Skates and rays by their patterns.
    check(&[("bodyForm", "rayLike"), ("markings", "eyespots")], "Leucoraja naevus");
    check(&[("bodyForm", "rayLike"), ("markings", "paleLines")], "Raja microocellata");
    check(&[("bodyForm", "rayLike"), ("markings", "darkBands")], "Raja undulata");
    check(&[("bodyForm", "rayLike"), ("snout", "long"), ("undersideColour", "pale")], "Rostroraja alba");
    check(&[("caudalFinShape", "broadRounded"), ("markings", "marbled")], "Torpedo marmorata");
    check(&[("caudalFinShape", "broadRounded"), ("markings", "plain")], "Tetronarce nobiliana");
}

#[test]
fn probabilities_sum_to_one_and_are_sorted() {
    let ranked = top(&answers(&[("bodyForm", "sharkLike")]), &Context::default());
    let total: f64 = ranked.iter().map(|c| c.probability).sum();
    assert!((total - 1.0).abs() < 1e-9, "{total}");
    assert!(ranked.windows(2).all(|w| w[0].probability >= w[1].probability));
}

#[test]
fn not_sure_changes_nothing() {
    let with =
        top(&answers(&[("gillSlits", "six")]).with_not_sure("colour").with_not_sure("markings"), &Context::default());
    let without = top(&answers(&[("gillSlits", "six")]), &Context::default());
    assert_eq!(with, without);
}

#[test]
fn no_answers_give_every_species_the_same_probability() {
    let ranked = top(&Answers::new(), &Context::default());
    let first = ranked[0].probability;
    assert!(ranked.iter().all(|c| (c.probability - first).abs() < 1e-12));
}

#[test]
fn one_wrong_answer_lowers_but_does_not_lose_the_species() {
    // Everything a small-spotted catshark shows, except a wrong colour ("blue").
    let catshark = [
        ("bodyForm", "sharkLike"),
        ("gillSlits", "five"),
        ("dorsalFins", "two"),
        ("analFin", "present"),
        ("dorsalSpines", "none"),
        ("headShape", "rounded"),
        ("snout", "short"),
        ("markings", "smallDarkSpots"),
        ("colour", "blue"),
    ];
    let ranked = top(&answers(&catshark), &Context::default());
    assert_eq!(ranked[0].scientific_name, "Scyliorhinus canicula", "{:?}", names(&ranked));
    let against: Vec<&str> =
        ranked[0].reasons.iter().filter(|r| r.effect == Effect::Against).map(|r| r.text.as_str()).collect();
    assert_eq!(against.len(), 1, "{against:?}");
    assert!(against[0].contains("bright blue"), "{against:?}");
}

#[test]
fn a_contradicted_species_is_lowered_not_removed() {
    let ranked = top(&answers(&[("gillSlits", "six")]), &Context::default());
    let catshark = ranked.iter().find(|c| c.scientific_name == "Scyliorhinus canicula").unwrap();
    assert!(catshark.probability > 0.0);
    assert!(catshark.probability < ranked[0].probability / 10.0);
}

#[test]
fn reasons_use_plain_words() {
    let ranked = top(&answers(&[("gillSlits", "six")]), &Context::default());
    let sixgill = &ranked[0];
    assert!(sixgill.reasons.iter().any(|r| r.effect == Effect::Supports && r.text == "6 gill slits"));
    let catshark = ranked.iter().find(|c| c.scientific_name == "Scyliorhinus canicula").unwrap();
    assert!(catshark.reasons.iter().any(|r| r.effect == Effect::Against && r.text.contains("5 gill slits")));
}

#[test]
fn a_length_far_over_the_maximum_counts_strongly_against() {
    // Spurdog reaches about 160 cm total length (from memory); 310 cm is no spurdog.
    let spurdog_answers = answers(&[("dorsalSpines", "both"), ("markings", "paleSpots"), ("colour", "grey")]);
    let unmeasured = top(&spurdog_answers, &Context::default());
    assert_eq!(unmeasured[0].scientific_name, "Squalus acanthias");
    let measured = top(&spurdog_answers, &length(LengthKind::TotalLength, 310.0));
    assert_ne!(measured[0].scientific_name, "Squalus acanthias", "{:?}", names(&measured));
    let spurdog = measured.iter().find(|c| c.scientific_name == "Squalus acanthias").unwrap();
    assert!(
        spurdog.reasons.iter().any(|r| r.effect == Effect::Against
            && r.text == "measured 310 cm is over this species' known maximum of 160 cm"),
        "{:?}",
        spurdog.reasons
    );
}

#[test]
fn a_length_within_the_maximum_does_not_count_against() {
    let spurdog_answers = answers(&[("dorsalSpines", "both"), ("markings", "paleSpots"), ("colour", "grey")]);
    let measured = top(&spurdog_answers, &length(LengthKind::TotalLength, 80.0));
    assert_eq!(measured[0].scientific_name, "Squalus acanthias");
    let unmeasured = top(&spurdog_answers, &Context::default());
    // Squalus keeps its weight; only species whose maximum is under 80 cm lose weight.
    assert!(measured[0].probability >= unmeasured[0].probability);
}

#[test]
fn an_estimated_length_gets_more_slack_than_a_taped_one() {
    let catshark_answers = answers(&[("bodyForm", "sharkLike"), ("markings", "smallDarkSpots")]);
    let probability_at = |estimated| {
        let context = Context {
            measurement: Some(Measurement { kind: LengthKind::TotalLength, cm: 115.0, estimated }),
            ..Context::default()
        };
        top(&catshark_answers, &context)
            .into_iter()
            .find(|c| c.scientific_name == "Scyliorhinus canicula")
            .unwrap()
            .probability
    };
    assert!(probability_at(true) > probability_at(false));
}

#[test]
fn a_fork_length_is_converted_with_the_species_equation_and_named() {
    let mako_answers = answers(&[("caudalFinShape", "crescent"), ("colour", "darkBlue")]);
    let ranked = top(&mako_answers, &length(LengthKind::ForkLength, 250.0));
    let mako = ranked.iter().find(|c| c.scientific_name == "Isurus oxyrinchus").unwrap();
    // FL = 0.9286 × TL − 1.7101 (Kohler, Casey & Turner 1995, Fishery Bulletin 93; from
    // memory, agrees with a secondary copy): FL 250 cm is TL (250 + 1.7101) / 0.9286 ≈ 271 cm.
    let size = mako.reasons.iter().find(|r| r.text.contains("fork length")).expect("a size reason");
    assert!(size.text.contains("FL = 0.9286 × TL − 1.7101"), "{}", size.text);
    assert!(size.text.contains("Kohler"), "{}", size.text);
    assert!(size.text.contains("about 271 cm total length"), "{}", size.text);
}

#[test]
fn a_fork_length_without_a_species_equation_says_common_practice() {
    let ranked = top(&answers(&[("dorsalSpines", "both")]), &length(LengthKind::ForkLength, 90.0));
    let spurdog = ranked.iter().find(|c| c.scientific_name == "Squalus acanthias").unwrap();
    let size = spurdog.reasons.iter().find(|r| r.text.contains("fork length")).expect("a size reason");
    assert!(size.text.contains("common practice"), "{}", size.text);
}

#[test]
fn a_disc_width_is_not_compared_with_a_maximum_total_length_of_a_shark() {
    let ranked = top(&answers(&[("gillSlits", "six")]), &length(LengthKind::DiscWidth, 900.0));
    let sixgill = &ranked[0];
    assert_eq!(sixgill.scientific_name, "Hexanchus griseus");
    assert!(sixgill.reasons.iter().any(|r| r.effect == Effect::Neutral && r.text.contains("cannot be compared")));
}

#[test]
fn the_record_area_lowers_species_not_known_there() {
    // Greenland and kitefin sharks share every character listed; only the Greenland
    // shark is listed for the North Sea in the demo checklist.
    let sleeper = answers(&[("dorsalSpines", "none"), ("analFin", "absent"), ("undersideColour", "black")]);
    let context = Context { area_code: Some("north-sea".into()), ..Context::default() };
    let ranked = top(&sleeper, &context);
    assert_eq!(ranked[0].scientific_name, "Somniosus microcephalus", "{:?}", names(&ranked));
    let kitefin = ranked.iter().find(|c| c.scientific_name == "Dalatias licha").unwrap();
    assert!(kitefin.reasons.iter().any(|r| r.effect == Effect::Against && r.text.contains("North Sea")));
}

#[test]
fn nearby_confirmed_records_tip_a_close_call() {
    // Blonde and spotted rays share every listed character.
    let spotted_skate = answers(&[("bodyForm", "rayLike"), ("markings", "smallDarkSpots"), ("snout", "short")]);
    for (favoured, other) in [("Raja montagui", "Raja brachyura"), ("Raja brachyura", "Raja montagui")] {
        let counts = BTreeMap::from([(favoured.to_owned(), 12), (other.to_owned(), 1)]);
        let context = Context { nearby_confirmed: Some(counts), ..Context::default() };
        let ranked = top(&spotted_skate, &context);
        assert_eq!(ranked[0].scientific_name, favoured);
        assert!(ranked[0].reasons.iter().any(|r| r.text == "12 confirmed records nearby"));
    }
}

#[test]
fn an_unknown_area_code_is_ignored_and_said() {
    let context = Context { area_code: Some("atlantis".into()), ..Context::default() };
    let ranked = top(&answers(&[("gillSlits", "six")]), &context);
    assert_eq!(ranked[0].scientific_name, "Hexanchus griseus");
    assert!(ranked[0].reasons.iter().any(|r| r.effect == Effect::Neutral && r.text.contains("atlantis")));
}

#[test]
fn answers_to_unknown_characters_or_states_are_errors() {
    let key = demo_key();
    let context = Context::default();
    assert_eq!(
        key.rank(&answers(&[("fins", "two")]), &context).unwrap_err(),
        AnswerError::UnknownCharacter("fins".into())
    );
    assert_eq!(
        key.next_question(&answers(&[("gillSlits", "eight")]), &context).unwrap_err(),
        AnswerError::UnknownState { character: "gillSlits".into(), state: "eight".into() }
    );
}

#[test]
fn answers_a_changed_checklist_no_longer_knows_are_set_aside_with_the_reason() {
    let key = demo_key();
    let given = answers(&[("gillSlits", "six"), ("fins", "two"), ("tailSpine", "many")])
        .with_not_sure("colour")
        .with_not_sure("mood");
    let (usable, dropped) = key.usable_answers(&given);
    assert_eq!(usable, answers(&[("gillSlits", "six")]).with_not_sure("colour"));
    assert_eq!(
        dropped,
        vec![
            AnswerError::UnknownCharacter("fins".into()),
            AnswerError::UnknownCharacter("mood".into()),
            AnswerError::UnknownState { character: "tailSpine".into(), state: "many".into() },
        ]
    );
    // What is left ranks as the same answers given alone.
    let context = Context::default();
    assert_eq!(
        key.rank(&usable, &context).unwrap(),
        key.rank(&answers(&[("gillSlits", "six")]).with_not_sure("colour"), &context).unwrap()
    );
}

#[test]
fn answers_round_trip_through_json_for_drafts() {
    let given = answers(&[("gillSlits", "six")]).with_not_sure("colour");
    let json = serde_json::to_string(&given).unwrap();
    assert_eq!(json, r#"{"colour":"notSure","gillSlits":{"state":"six"}}"#);
    let back: Answers = serde_json::from_str(&json).unwrap();
    assert_eq!(back, given);
    assert_eq!(back.get("colour"), Some(&Answer::NotSure));
}

#[test]
fn a_character_missing_for_a_species_counts_for_nothing_and_says_so() {
    let mut value = crate::support::tiny_checklist_value();
    value["characters"].as_array_mut().unwrap().push(serde_json::json!({
        "name": "colour", "question": "What colour?", "states": [
            { "name": "grey", "label": "grey" }, { "name": "brown", "label": "brown" } ] }));
    value["taxa"][0]["characters"]["colour"] = serde_json::json!(["grey"]);
    let key = crate::support::key_from_value(&value);
    let ranked = key.rank(&Answers::new().with("colour", "brown"), &Context::default()).unwrap();
    // The species with no colour recorded keeps an uninformative 1/2; the grey one falls to 5%.
    assert_eq!(ranked[0].scientific_name, "Sixus beta");
    assert!((ranked[0].probability - 0.5 / (0.5 + 0.05)).abs() < 1e-12);
    assert!(ranked[0].reasons.iter().any(|r| r.effect == Effect::Neutral && r.text.contains("nothing on this")));
}

#[test]
fn a_small_animal_is_no_giant_species() {
    // A 62 cm shark with a crescent tail: the basking shark (born at about 1.5 m, grows
    // to 12 m; from memory) fits the answers but not the size, and must not lead.
    let big_tail = answers(&[("bodyForm", "sharkLike"), ("caudalFinShape", "crescent")]);
    let basking =
        |ranked: &[Candidate]| ranked.iter().find(|c| c.scientific_name == "Cetorhinus maximus").cloned().unwrap();
    let unmeasured = basking(&top(&big_tail, &Context::default()));
    let ranked = top(&big_tail, &length(LengthKind::TotalLength, 62.0));
    assert_ne!(ranked[0].scientific_name, "Cetorhinus maximus", "{:?}", names(&ranked));
    let measured = basking(&ranked);
    assert!(
        measured.probability < unmeasured.probability / 10.0,
        "{} → {}",
        unmeasured.probability,
        measured.probability
    );
    let reasons = &measured.reasons;
    assert!(
        reasons
            .iter()
            .any(|r| r.effect == Effect::Against && r.text.contains("smaller than a newborn of this species")),
        "{reasons:?}"
    );
    // A newborn-sized catshark (10 cm of 100) is not held against its species.
    let catshark = answers(&[("bodyForm", "sharkLike"), ("markings", "smallDarkSpots")]);
    let hatchling = top(&catshark, &length(LengthKind::TotalLength, 10.0));
    assert_eq!(hatchling[0].scientific_name, "Scyliorhinus canicula", "{:?}", names(&hatchling));
}
