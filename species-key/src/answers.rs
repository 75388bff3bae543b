//! What the observer has said so far, and what else is known about the record (where
//! it is, what was measured, which species are confirmed nearby). Both are plain,
//! serialisable values so the app can keep them in a draft and the server can replay them.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

use crate::length::Measurement;

/// One answer to a character's question.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase")]
pub enum Answer {
    /// The observer could not tell. Always allowed; it changes nothing.
    NotSure,
    /// The observer chose this state.
    State(String),
}

/// The answers given so far, by character name.
#[derive(Debug, Clone, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(transparent)]
pub struct Answers(BTreeMap<String, Answer>);

impl Answers {
    /// No answers yet.
    pub fn new() -> Answers {
        Answers::default()
    }

    /// These answers with `character` answered as `state`.
    pub fn with(mut self, character: &str, state: &str) -> Answers {
        self.set(character, Answer::State(state.to_owned()));
        self
    }

    /// These answers with `character` answered "not sure".
    pub fn with_not_sure(mut self, character: &str) -> Answers {
        self.set(character, Answer::NotSure);
        self
    }

    /// Records (or replaces) the answer to `character`.
    pub fn set(&mut self, character: &str, answer: Answer) {
        self.0.insert(character.to_owned(), answer);
    }

    /// Forgets the answer to `character`, so the key may ask it again.
    pub fn clear(&mut self, character: &str) {
        self.0.remove(character);
    }

    /// The answer to `character`, if one was given.
    pub fn get(&self, character: &str) -> Option<&Answer> {
        self.0.get(character)
    }

    /// All answers, by character name.
    pub fn iter(&self) -> impl Iterator<Item = (&str, &Answer)> {
        self.0.iter().map(|(name, answer)| (name.as_str(), answer))
    }
}

/// What is known about the record besides the answers. Everything is optional.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase")]
pub struct Context {
    /// The checklist area code the record falls in.
    pub area_code: Option<String>,
    /// Confirmed records nearby per scientific name, as counted by the caller. When
    /// given, a species missing from the map counts as zero records.
    pub nearby_confirmed: Option<BTreeMap<String, u32>>,
    /// The record's length measurement.
    pub measurement: Option<Measurement>,
}
