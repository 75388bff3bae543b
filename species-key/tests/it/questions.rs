//! Choosing the next question: the key's choice must be the question with the
//! largest expected information gain, checked against a brute-force computation
//! written here from the definition (expected drop in entropy over species, each
//! hypothetical answer ranked afresh by the public API).

use std::collections::HashMap;

use species_key::{Answers, Checklist, Context, Key, LengthKind, Measurement, likelihood};

use crate::support::{demo_checklist, demo_key, entropy, key_from_value, tiny_checklist_value};

/// The error rate the README documents: an observer picks a wrong state 5% of the time.
const DOCUMENTED_ERROR_RATE: f64 = 0.05;

/// P(answer | species) from the documented model: allowed states share 1 − ε equally,
/// the other states share ε; a species allowing every state (or with the character
/// missing) answers each state with probability 1 / states.
fn answer_probability(checklist: &Checklist, species: &str, character: &str, state: &str) -> f64 {
    let definition = checklist.characters().iter().find(|c| c.name == character).unwrap();
    let state_count = definition.states.len() as f64;
    let taxon = checklist.taxon(species).unwrap();
    let allowed: Vec<&str> = match taxon.characters.get(character) {
        Some(states) => states.iter().map(String::as_str).collect(),
        None => definition.states.iter().map(|s| s.name.as_str()).collect(),
    };
    let allowed_count = allowed.len() as f64;
    if allowed_count == state_count {
        1.0 / state_count
    } else if allowed.contains(&state) {
        (1.0 - DOCUMENTED_ERROR_RATE) / allowed_count
    } else {
        DOCUMENTED_ERROR_RATE / (state_count - allowed_count)
    }
}

/// Expected information gain (bits) of each unanswered character, by brute force.
fn brute_force_gains(key: &Key, answers: &Answers, context: &Context) -> HashMap<String, f64> {
    let checklist = key.checklist();
    let now: HashMap<String, f64> =
        key.rank(answers, context).unwrap().into_iter().map(|c| (c.scientific_name, c.probability)).collect();
    let entropy_now = entropy(&now.values().copied().collect::<Vec<_>>());
    let mut gains = HashMap::new();
    for character in checklist.characters().iter().filter(|c| answers.get(&c.name).is_none()) {
        let mut expected_entropy = 0.0;
        for state in &character.states {
            let chance_of_answer: f64 = now
                .iter()
                .map(|(species, p)| p * answer_probability(checklist, species, &character.name, &state.name))
                .sum();
            let after = answers.clone().with(&character.name, &state.name);
            let posterior: Vec<f64> = key.rank(&after, context).unwrap().iter().map(|c| c.probability).collect();
            expected_entropy += chance_of_answer * entropy(&posterior);
        }
        gains.insert(character.name.clone(), entropy_now - expected_entropy);
    }
    gains
}

fn check_choice(key: &Key, answers: &Answers, context: &Context) {
    let brute = brute_force_gains(key, answers, context);
    let best_brute = brute.values().copied().fold(f64::MIN, f64::max);
    let choice = key.next_question(answers, context).unwrap().expect("a question is left");
    let brute_of_choice = brute[&choice.character];
    assert!(
        (brute_of_choice - best_brute).abs() < 1e-9,
        "chose {} ({brute_of_choice}) but the best gain is {best_brute}: {brute:?}",
        choice.character
    );
    assert!((choice.expected_gain_bits - brute_of_choice).abs() < 1e-9);
    for question in key.questions_by_gain(answers, context).unwrap() {
        assert!((question.expected_gain_bits - brute[&question.character]).abs() < 1e-9, "{}", question.character);
    }
}

#[test]
fn the_documented_error_rate_is_the_one_used() {
    assert_eq!(likelihood::ANSWER_ERROR_RATE, DOCUMENTED_ERROR_RATE);
}

#[test]
fn the_first_question_maximises_expected_information_gain() {
    check_choice(&demo_key(), &Answers::new(), &Context::default());
}

#[test]
fn later_questions_maximise_expected_information_gain() {
    let key = demo_key();
    let context = Context::default();
    check_choice(&key, &Answers::new().with("bodyForm", "sharkLike"), &context);
    check_choice(&key, &Answers::new().with("bodyForm", "rayLike").with_not_sure("markings"), &context);
    check_choice(&key, &Answers::new().with("dorsalSpines", "both").with("colour", "blue"), &context);
}

#[test]
fn questions_weighted_by_area_nearby_records_and_size_maximise_gain() {
    let key = demo_key();
    let context = Context {
        area_code: Some("cardigan-bay".into()),
        nearby_confirmed: Some([("Raja clavata".to_owned(), 30), ("Scyliorhinus canicula".to_owned(), 50)].into()),
        measurement: Some(Measurement { kind: LengthKind::TotalLength, cm: 70.0, estimated: true }),
    };
    check_choice(&key, &Answers::new(), &context);
    check_choice(&key, &Answers::new().with("bodyForm", "rayLike"), &context);
}

#[test]
fn answered_and_not_sure_questions_are_not_asked_again() {
    let key = demo_key();
    let answers = Answers::new().with("bodyForm", "sharkLike").with_not_sure("markings");
    let asked: Vec<String> =
        key.questions_by_gain(&answers, &Context::default()).unwrap().into_iter().map(|q| q.character).collect();
    assert!(!asked.contains(&"bodyForm".to_owned()) && !asked.contains(&"markings".to_owned()));
    assert_eq!(asked.len(), demo_checklist().characters().len() - 2);
}

#[test]
fn no_question_is_left_when_everything_is_answered() {
    let checklist = demo_checklist();
    let answers = checklist.characters().iter().fold(Answers::new(), |a, c| a.with_not_sure(&c.name));
    assert_eq!(Key::new(&checklist).next_question(&answers, &Context::default()).unwrap(), None);
}

#[test]
fn a_question_that_cannot_split_the_candidates_is_not_asked() {
    // Both tiny species allow both states, so the answer tells nothing.
    let mut value = tiny_checklist_value();
    value["taxa"][0]["characters"]["gillSlits"] = serde_json::json!(["five", "six"]);
    value["taxa"][1]["characters"]["gillSlits"] = serde_json::json!(["five", "six"]);
    let key = key_from_value(&value);
    assert_eq!(key.next_question(&Answers::new(), &Context::default()).unwrap(), None);
}

#[test]
fn the_gain_of_a_clean_two_way_split_matches_a_hand_calculation() {
    // Two equally likely species, one state each. The answer is 50:50 (1 bit) and,
    // given the species, right 95% of the time: H(0.95, 0.05) = 0.2864 bits (hand
    // calculation). Expected gain = 1 − 0.2864 = 0.7136 bits.
    let key = key_from_value(&tiny_checklist_value());
    let choice = key.next_question(&Answers::new(), &Context::default()).unwrap().unwrap();
    assert_eq!(choice.character, "gillSlits");
    assert!((choice.expected_gain_bits - 0.7136).abs() < 1e-4, "{}", choice.expected_gain_bits);
}
