//! The guided key replayed for the reviewer from a record's stored answers: the answers
//! in words and the likeliest species with reasons for and against.

use shared_types::{KeyAnswer, KeyReason, KeyReplay, KeySuggestion, Submission};
use species_key::{Answer, Answers, Checklist, Context, Effect, Key, Measurement};

/// How many suggestions the replayed key shows.
pub const KEY_SUGGESTIONS: usize = 5;

/// The guided key run again from the answers the record keeps, with what the record
/// says of its place and length — as the phone ran it, with no nearby-records weight.
pub fn key_replay(checklist: &Checklist, record: &Submission) -> Option<KeyReplay> {
    let choice = record.key_choice.as_ref()?;
    let mut answers = Answers::new();
    let mut shown = Vec::new();
    for (character, state) in &choice.answers {
        let question = checklist.characters().iter().find(|c| &c.name == character);
        let answer = if state == "notSure" {
            answers.set(character, Answer::NotSure);
            "not sure".to_owned()
        } else {
            answers.set(character, Answer::State(state.clone()));
            question
                .and_then(|q| q.states.iter().find(|s| &s.name == state))
                .map_or_else(|| state.clone(), |s| s.label.clone())
        };
        shown.push(KeyAnswer { question: question.map_or_else(|| character.clone(), |q| q.question.clone()), answer });
    }
    let context = Context {
        area_code: record
            .position
            .and_then(|p| checklist.area_at(p.latitude.get(), p.longitude.get()))
            .map(|a| a.code.clone()),
        nearby_confirmed: None,
        measurement: record.length.map(|l| Measurement {
            kind: l.kind.key_kind(),
            cm: l.value.centimetres(),
            estimated: l.method == shared_types::MeasureMethod::Estimated,
        }),
    };
    let (suggestions, problem) = match Key::new(checklist).rank(&answers, &context) {
        Ok(candidates) => (candidates.into_iter().take(KEY_SUGGESTIONS).map(suggestion).collect(), None),
        Err(err) => (Vec::new(), Some(format!("the answers no longer fit the checklist: {err}"))),
    };
    Some(KeyReplay { answers: shown, suggestions, problem })
}

fn suggestion(candidate: species_key::Candidate) -> KeySuggestion {
    let reasons = candidate
        .reasons
        .into_iter()
        .map(|reason| {
            let effect = match reason.effect {
                Effect::Supports => "supports",
                Effect::Against => "against",
                Effect::Neutral => "neutral",
            };
            KeyReason { effect: effect.into(), text: reason.text }
        })
        .collect();
    KeySuggestion {
        scientific_name: candidate.scientific_name,
        common_name: candidate.common_names.into_iter().next(),
        probability: candidate.probability,
        reasons,
    }
}
