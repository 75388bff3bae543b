//! The guided key's logic on the phone, apart from its panel: what the record already
//! tells the key (area, confirmed records nearby, length), which higher taxa of the
//! leading candidates to offer and which to suggest, how a pick is kept on the record
//! ([`KeyChoice`]), and why an answer was set aside when the checklist changed. Also
//! the in-browser benchmark's entry point.

use std::collections::BTreeSet;

use shared_types::{KeyChoice, LengthUnit, Text};
use species_key::{
    Answer, AnswerError, Answers, Candidate, Context, Key, Measurement, QuestionChoice, TaxonRank, TaxonSupport,
};
use wasm_bindgen::prelude::*;

use crate::data::form_fields::FormFields;
use crate::data::nearby;
use crate::data::words::{t, t_args};

/// Below this probability for the best species, the best-supported higher taxon is
/// marked as the suggested stop.
pub const SURE_ENOUGH: f64 = 0.8;
/// How many leading candidates are listed, and whose higher taxa are offered.
pub const SHOWN_CANDIDATES: usize = 5;
/// Higher taxa offered per rank, at most.
const TAXA_PER_RANK: usize = 3;
/// Below this summed probability a higher taxon is offered only when it is the best at its rank.
const MIN_OFFERED_SUPPORT: f64 = 0.01;
/// The ranks an observer may stop at above species. Superorders are left off the
/// observer's screen: few people know them, and "shark" or "ray" is the body-shape question.
pub const OFFERED_RANKS: [TaxonRank; 3] = [TaxonRank::Genus, TaxonRank::Family, TaxonRank::Order];
/// The character a person splits on first — shark, flat shark, ray or skate, chimaera —
/// asked before anything else while nothing is answered, whatever the information gain
/// says (it may prefer markings, which mean little until the body shape is known).
pub const FIRST_SPLIT: &str = "bodyForm";

/// The question to ask now: the first split while nothing is answered (if the checklist
/// has it), then the one the key expects to tell most.
pub fn next_question(key: &Key, answers: &Answers, context: &Context) -> Option<QuestionChoice> {
    let nothing_yet = answers.iter().next().is_none();
    let first = key.checklist().characters().iter().find(|c| c.name == FIRST_SPLIT).filter(|_| nothing_yet);
    match first {
        Some(character) => Some(QuestionChoice {
            character: character.name.clone(),
            question: character.question.clone(),
            states: character.states.clone(),
            expected_gain_bits: 0.0,
        }),
        None => key.next_question(answers, context).ok().flatten(),
    }
}

/// A group as the observer reads it: "catsharks — family Scyliorhinidae", or the rank
/// and name alone when the checklist gives no common name.
pub fn group_label(key: &Key, rank: TaxonRank, scientific_name: &str) -> String {
    match key.checklist().group_common_name(scientific_name) {
        Some(common) => format!("{common} — {} {scientific_name}", rank_name(rank)),
        None => format!("{} {scientific_name}", rank_name(rank)),
    }
}

fn number(text: &str) -> Option<f64> {
    text.trim().replace(',', ".").parse::<f64>().ok()
}

/// The record's position as typed or filled in, if both parts read as numbers.
pub fn position_of(fields: &FormFields) -> Option<(f64, f64)> {
    number(&fields.latitude).zip(number(&fields.longitude))
}

/// What the record already tells the key: its area, the confirmed records near it and
/// its length.
pub fn context_for(key: &Key, fields: &FormFields, nearby_confirmed: Option<nearby::Counts>) -> Context {
    let area_code =
        position_of(fields).and_then(|(lat, lon)| key.checklist().area_at(lat, lon)).map(|area| area.code.clone());
    let measurement = number(&fields.length_value).filter(|v| *v > 0.0).map(|value| Measurement {
        kind: fields.length_kind.unwrap_or(shared_types::LengthKind::Total).key_kind(),
        cm: value * fields.length_unit.unwrap_or(LengthUnit::Cm).cm_per_unit(),
        estimated: fields.length_method == Some(shared_types::MeasureMethod::Estimated),
    });
    Context { area_code, nearby_confirmed, measurement }
}

fn answers_as_map(answers: &Answers) -> std::collections::BTreeMap<String, String> {
    answers
        .iter()
        .map(|(character, answer)| {
            let value = match answer {
                Answer::NotSure => "notSure".to_owned(),
                Answer::State(state) => state.clone(),
            };
            (character.to_owned(), value)
        })
        .collect()
}

pub fn rank_code(rank: TaxonRank) -> &'static str {
    match rank {
        TaxonRank::Species => "species",
        TaxonRank::Genus => "genus",
        TaxonRank::Family => "family",
        TaxonRank::Order => "order",
        TaxonRank::Superorder => "superorder",
    }
}

/// The rank's name in the person's language ("family").
pub fn rank_name(rank: TaxonRank) -> String {
    match rank {
        TaxonRank::Species => t("key-rank-species"),
        TaxonRank::Genus => t("key-rank-genus"),
        TaxonRank::Family => t("key-rank-family"),
        TaxonRank::Order => t("key-rank-order"),
        TaxonRank::Superorder => t("key-rank-superorder"),
    }
}

/// The name of a rank kept as its code on a record (`KeyChoice::taxon_rank`) in the
/// person's language; the code itself when the key knows no such rank.
pub fn rank_name_of_code(code: &str) -> String {
    let ranks = [TaxonRank::Species, TaxonRank::Genus, TaxonRank::Family, TaxonRank::Order, TaxonRank::Superorder];
    ranks.into_iter().find(|rank| rank_code(*rank) == code).map_or_else(|| code.to_owned(), rank_name)
}

/// Says in words why an answer was set aside.
pub fn set_aside_text(key: &Key, error: &AnswerError) -> String {
    match error {
        AnswerError::UnknownCharacter(character) => {
            t_args("key-set-aside-character", &[("character", character.as_str().into())])
        }
        AnswerError::UnknownState { character, state } => {
            let question = key
                .checklist()
                .characters()
                .iter()
                .find(|c| &c.name == character)
                .map_or(character.as_str(), |c| c.question.as_str());
            t_args("key-set-aside-state", &[("state", state.as_str().into()), ("question", question.into())])
        }
    }
}

/// The genera, families and orders of the leading candidates ([`OFFERED_RANKS`]), each
/// with its summed probability over all candidates, most probable first within a rank.
pub fn higher_taxa(key: &Key, ranking: &[Candidate]) -> Vec<TaxonSupport> {
    let leading: Vec<_> =
        ranking.iter().take(SHOWN_CANDIDATES).filter_map(|c| key.checklist().taxon(&c.scientific_name)).collect();
    OFFERED_RANKS
        .into_iter()
        .flat_map(|rank| {
            let wanted: BTreeSet<&str> = leading.iter().map(|t| t.name_at(rank)).collect();
            key.support_at(rank, ranking)
                .into_iter()
                .filter(move |s| wanted.contains(s.scientific_name.as_str()))
                .take(TAXA_PER_RANK)
                .enumerate()
                // The best at each rank always; others only with some support.
                .filter(|(i, s)| *i == 0 || s.probability >= MIN_OFFERED_SUPPORT)
                .map(|(_, s)| s)
        })
        .collect()
}

pub fn display_name(candidate: &Candidate) -> String {
    match candidate.common_names.first() {
        Some(common) => format!("{common} ({})", candidate.scientific_name),
        None => candidate.scientific_name.clone(),
    }
}

/// The pick as the record keeps it: the name at its rank, the probability when picked
/// (to two places) and the answers given. `None` when the name is not a valid text.
pub fn key_choice(scientific_name: &str, rank: TaxonRank, probability: f64, answers: &Answers) -> Option<KeyChoice> {
    Text::parse(scientific_name).ok().map(|name| KeyChoice {
        scientific_name: name,
        taxon_rank: rank_code(rank).to_owned(),
        probability: (probability * 100.0).round() / 100.0,
        answers: answers_as_map(answers),
    })
}

/// The higher taxon to suggest stopping at, when the best species is not sure enough:
/// the most specific offered group sure enough ([`SURE_ENOUGH`]).
pub fn suggested_stop(key: &Key, ranking: &[Candidate]) -> Option<TaxonSupport> {
    let unsure = ranking.first().is_some_and(|top| top.probability < SURE_ENOUGH);
    // Offered groups come genus first, so the first sure enough is the most specific.
    unsure.then(|| higher_taxa(key, ranking).into_iter().find(|s| s.probability >= SURE_ENOUGH)).flatten()
}

/// Time in milliseconds to choose the next question over an invented checklist of
/// `species` species, for the in-browser benchmark: the median over 7 batches of the
/// mean of `rounds` calls (the browser's clock is too coarse to time one call).
#[wasm_bindgen]
pub fn bench_next_question(species: usize, rounds: usize) -> f64 {
    let checklist = species_key::synthetic::checklist(species, 15, 2026);
    let key = Key::new(&checklist);
    let answers = Answers::new().with("c0", "s1").with("c3", "s2");
    let performance = web_sys::window().and_then(|w| w.performance());
    let now = || performance.as_ref().map(|p| p.now()).unwrap_or_else(js_sys::Date::now);
    let rounds = rounds.max(1);
    let mut batches: Vec<f64> = (0..7)
        .map(|_| {
            let start = now();
            for _ in 0..rounds {
                std::hint::black_box(key.next_question(&answers, &Context::default()).ok());
            }
            (now() - start) / rounds as f64
        })
        .collect();
    batches.sort_by(f64::total_cmp);
    batches[batches.len() / 2]
}

/// The CSS classes of a reason the server's key replay gives (`supports`, `against`,
/// `neutral`), as on the phone's own key.
pub fn reason_class(effect: &str) -> String {
    format!("reason {effect}")
}

#[cfg(test)]
mod tests {
    use shared_types::{LengthKind, MeasureMethod};

    use super::*;
    use crate::data::checklist::tests::built_in;
    use crate::data::form_fields::FormFields;

    fn key() -> Key {
        Key::new(&built_in())
    }

    #[test]
    fn the_record_tells_the_key_its_area_and_its_length_in_centimetres() {
        let fields = FormFields {
            latitude: "52,4153".into(),
            longitude: "-4.0829".into(),
            length_value: "24.5".into(),
            length_unit: Some(LengthUnit::Inch),
            length_kind: Some(LengthKind::DiscWidth),
            length_method: Some(MeasureMethod::Estimated),
            ..FormFields::default()
        };
        let nearby: nearby::Counts = [("Raja clavata".to_owned(), 3)].into();
        let context = context_for(&key(), &fields, Some(nearby.clone()));
        assert_eq!(context.area_code.as_deref(), Some("cardigan-bay"));
        assert_eq!(context.nearby_confirmed, Some(nearby));
        let measured = context.measurement.expect("a length");
        // The inch is exactly 2.54 cm (international yard and pound agreement, 1959).
        assert!((measured.cm - 62.23).abs() < 1e-9, "{}", measured.cm);
        assert_eq!((measured.kind, measured.estimated), (species_key::LengthKind::DiscWidth, true));
    }

    #[test]
    fn no_position_no_area_and_no_length_no_measurement() {
        let context = context_for(&key(), &FormFields { length_value: "0".into(), ..FormFields::default() }, None);
        assert_eq!((context.area_code, context.measurement), (None, None));
        let far_away = FormFields { latitude: "-33.9".into(), longitude: "18.4".into(), ..FormFields::default() };
        assert_eq!(context_for(&key(), &far_away, None).area_code, None, "outside every checklist area");
    }

    #[test]
    fn a_pick_keeps_its_rank_its_probability_to_two_places_and_the_answers() {
        let answers = Answers::new().with("bodyForm", "rayLike").with("gillSlits", "five");
        let choice = key_choice("Rajidae", TaxonRank::Family, 0.87654, &answers).unwrap();
        assert_eq!(
            (choice.scientific_name.as_str(), choice.taxon_rank.as_str(), choice.probability),
            ("Rajidae", "family", 0.88)
        );
        assert_eq!(choice.answers.get("bodyForm").map(String::as_str), Some("rayLike"));
        let unsure = key_choice("Raja clavata", TaxonRank::Species, 0.5, &Answers::new().with("bodyForm", "rayLike"));
        assert_eq!(unsure.map(|c| c.taxon_rank), Some("species".to_owned()));
    }

    #[test]
    fn when_the_best_species_is_unsure_a_higher_taxon_is_offered_and_suggested() {
        let key = key();
        let answers = Answers::new().with("bodyForm", "rayLike");
        let ranking = key.rank(&answers, &Context::default()).unwrap();
        let offered = higher_taxa(&key, &ranking);
        assert!(
            offered.iter().any(|t| t.scientific_name == "Rajidae" && t.taxon_rank == TaxonRank::Family),
            "{offered:?}"
        );
        let ranks: Vec<TaxonRank> = offered.iter().map(|t| t.taxon_rank).collect();
        let mut in_order = ranks.clone();
        in_order.sort_by_key(|r| {
            [TaxonRank::Genus, TaxonRank::Family, TaxonRank::Order, TaxonRank::Superorder].iter().position(|x| x == r)
        });
        assert_eq!(ranks, in_order, "genera first, orders last");
        assert!(!ranks.contains(&TaxonRank::Superorder), "ranks above order stay off the observer's screen");
        // With the body shape alone only the superorder (rays and skates) is sure; it is
        // not offered, so nothing is suggested.
        assert_eq!(suggested_stop(&key, &ranking), None);
        let skate = Answers::new().with("bodyForm", "rayLike").with("dorsalFins", "two").with("tailSpine", "absent");
        let ranking = key.rank(&skate, &Context::default()).unwrap();
        assert!(ranking[0].probability < SURE_ENOUGH);
        let stop = suggested_stop(&key, &ranking).expect("a suggested stop");
        assert!(stop.probability >= SURE_ENOUGH && OFFERED_RANKS.contains(&stop.taxon_rank), "{stop:?}");
    }

    #[test]
    fn the_first_question_is_the_body_shape_and_then_the_key_chooses() {
        let key = key();
        let context = Context::default();
        let first = next_question(&key, &Answers::new(), &context).expect("a question");
        assert_eq!(first.character, FIRST_SPLIT);
        let labels: Vec<&str> = first.states.iter().map(|s| s.name.as_str()).collect();
        assert!(labels.contains(&"sharkLike") && labels.contains(&"rayLike") && labels.contains(&"chimaeraLike"));
        // "Not sure" about the shape counts as an answer: the key picks the next question.
        let unsure = Answers::new().with_not_sure(FIRST_SPLIT);
        let next = next_question(&key, &unsure, &context).expect("a question");
        assert_ne!(next.character, FIRST_SPLIT);
        assert_eq!(Some(next), key.next_question(&unsure, &context).unwrap());
    }

    #[test]
    fn groups_read_with_their_common_names() {
        let key = key();
        assert_eq!(group_label(&key, TaxonRank::Family, "Scyliorhinidae"), "catsharks — family Scyliorhinidae");
        assert_eq!(group_label(&key, TaxonRank::Family, "Rajidae"), "skates — family Rajidae");
        assert_eq!(
            group_label(&key, TaxonRank::Genus, "Raja"),
            "genus Raja",
            "no common name given: the rank and name"
        );
    }

    #[test]
    fn an_answer_the_checklist_no_longer_knows_is_said_in_words() {
        let key = key();
        let gone = AnswerError::UnknownCharacter("finColour".into());
        assert_eq!(set_aside_text(&key, &gone), "your answer about finColour (the checklist no longer asks it)");
        let changed = AnswerError::UnknownState { character: "bodyForm".into(), state: "eelLike".into() };
        assert_eq!(
            set_aside_text(&key, &changed),
            "your answer \"eelLike\" to \"What shape is the body?\" (no longer one of its answers)"
        );
    }
}
