//! The checklist's questions and answers in other languages: an optional block per
//! language (`translations.cy.characters.bodyForm.question`, `….states.sharkLike`), so the
//! key can ask in the language of the app that shows it. Anything a language leaves out
//! falls back to the checklist's own words; names of species stay as the checklist gives
//! them. The format is described in the crate's README.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

use crate::checklist::Character;
use crate::error::ChecklistError;

/// One language's words for the checklist's characters, by character name.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct Translation {
    /// Character name → its question and its states' labels in this language.
    #[serde(default)]
    pub characters: BTreeMap<String, CharacterWords>,
}

/// A character's question and its states' labels in one language; either may be left out.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct CharacterWords {
    /// The question, as `Character::question`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub question: Option<String>,
    /// State name → its label, as `CharacterState::label`.
    #[serde(default, skip_serializing_if = "BTreeMap::is_empty")]
    pub states: BTreeMap<String, String>,
}

/// `characters` with each question and label replaced by `translation`'s where it gives one.
pub(crate) fn translate(characters: &[Character], translation: &Translation) -> Vec<Character> {
    characters
        .iter()
        .map(|character| {
            let mut character = character.clone();
            if let Some(words) = translation.characters.get(&character.name) {
                if let Some(question) = &words.question {
                    character.question.clone_from(question);
                }
                for state in &mut character.states {
                    if let Some(label) = words.states.get(&state.name) {
                        state.label.clone_from(label);
                    }
                }
            }
            character
        })
        .collect()
}

/// What `translation` leaves out, as `character.question` and `character.state` paths.
pub(crate) fn missing(characters: &[Character], translation: Option<&Translation>) -> Vec<String> {
    let mut left_out = Vec::new();
    for character in characters {
        let words = translation.and_then(|t| t.characters.get(&character.name));
        if words.and_then(|w| w.question.as_ref()).is_none() {
            left_out.push(format!("{}.question", character.name));
        }
        for state in &character.states {
            if words.and_then(|w| w.states.get(&state.name)).is_none() {
                left_out.push(format!("{}.{}", character.name, state.name));
            }
        }
    }
    left_out
}

/// Every language block names a language, and only characters and states the checklist
/// defines, with words that are not blank.
pub(crate) fn check(
    translations: &BTreeMap<String, Translation>,
    characters: &[Character],
) -> Result<(), ChecklistError> {
    for (language, translation) in translations {
        if !is_language_tag(language) {
            return Err(ChecklistError::BadLanguageTag(language.clone()));
        }
        let blank = |at: String| ChecklistError::BlankTranslation { language: language.clone(), at };
        for (name, words) in &translation.characters {
            let character = characters.iter().find(|c| &c.name == name).ok_or_else(|| {
                ChecklistError::UnknownTranslatedCharacter { language: language.clone(), character: name.clone() }
            })?;
            if words.question.as_deref().is_some_and(|q| q.trim().is_empty()) {
                return Err(blank(format!("{name}.question")));
            }
            for (state, label) in &words.states {
                if !character.states.iter().any(|s| &s.name == state) {
                    return Err(ChecklistError::UnknownTranslatedState {
                        language: language.clone(),
                        character: name.clone(),
                        state: state.clone(),
                    });
                }
                if label.trim().is_empty() {
                    return Err(blank(format!("{name}.states.{state}")));
                }
            }
        }
    }
    Ok(())
}

/// A BCP 47 tag's shape (RFC 5646 §2.1): subtags of 1–8 letters or digits joined by
/// hyphens, the first of 2–8 letters.
pub(crate) fn is_language_tag(tag: &str) -> bool {
    let mut subtags = tag.split('-');
    let primary = subtags.next().unwrap_or_default();
    (2..=8).contains(&primary.len())
        && primary.chars().all(|c| c.is_ascii_alphabetic())
        && subtags.all(|s| (1..=8).contains(&s.len()) && s.chars().all(|c| c.is_ascii_alphanumeric()))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn language_tags_have_the_shape_bcp_47_gives_them() {
        // RFC 5646 §2.1: language (2–8 letters), then subtags of up to 8 alphanumerics.
        for good in ["cy", "en", "en-GB", "cy-Latn-GB", "gsw", "de-CH-1996"] {
            assert!(is_language_tag(good), "{good}");
        }
        for bad in ["", " ", "c", "cy_GB", "cy-", "12", "cy-toolongsubtag", "Welsh language"] {
            assert!(!is_language_tag(bad), "{bad}");
        }
    }
}
