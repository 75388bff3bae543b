//! Names as people type them, folded so that writing that does not change the name does
//! not stop a match: case, spacing, hyphens and other punctuation, accents, compatibility
//! forms (fullwidth letters, ligatures), invisible characters; qualifiers that leave the
//! taxon as it is ("cf.", "aff.", "sp.", "spp.", "possibly"…); and a scientific name's
//! authorship ("(Linnaeus, 1758)").
//!
//! A name is indexed under its *key*: its words run together, so "angel shark",
//! "Angel-Shark" and "angelshark" are one key.

use unicode_normalization::UnicodeNormalization as _;

/// Words that say how sure the observer is, or that the animal is an unnamed species of
/// a genus, without changing which taxon the rest names (open nomenclature: cf., aff.,
/// sp., spp., ssp., indet., nr.; common practice in field records for the hedges).
pub const QUALIFIERS: &[&str] = &[
    "cf", "aff", "sp", "spp", "ssp", "subsp", "indet", "nr", "possibly", "probably", "maybe", "perhaps", "poss", "prob",
];

/// Words of an authorship that join authors' names ("Müller & Henle", "de Buen").
const AUTHOR_JOINERS: &[&str] = &["and", "et", "ex", "in", "de", "da", "du", "del", "der", "van", "von", "le", "la"];

/// The most words of a name looked at; a longer text is read up to here.
pub const MAX_WORDS: usize = 32;

/// The lowercase words of `text`: compatibility-decomposed (NFKD), accents and other
/// combining marks dropped, split at every character that is not a letter or a digit.
pub fn words(text: &str) -> Vec<String> {
    let mut words = Vec::new();
    let mut current = String::new();
    for c in text.nfkd().filter(|c| !unicode_normalization::char::is_combining_mark(*c)) {
        if c.is_alphanumeric() {
            current.extend(c.to_lowercase());
        } else if !current.is_empty() {
            words.push(std::mem::take(&mut current));
        }
        if words.len() == MAX_WORDS {
            return words;
        }
    }
    if !current.is_empty() {
        words.push(current);
    }
    words
}

/// The key of a run of words: the words run together.
pub fn key_of(words: &[String]) -> String {
    words.concat()
}

/// The key `text` is indexed under.
pub fn key(text: &str) -> String {
    key_of(&words(text))
}

/// The words of `words` that are not [`QUALIFIERS`], and the qualifiers set aside.
pub fn without_qualifiers(words: &[String]) -> (Vec<String>, Vec<String>) {
    words.iter().cloned().partition(|w| !QUALIFIERS.contains(&w.as_str()))
}

/// Splits a scientific name from its authorship, when it has one: `Rostroraja alba
/// (Lacepède, 1803)` gives (`Rostroraja alba`, `(Lacepède, 1803)`). The name is a
/// capitalised genus and up to three lowercase words (epithets, qualifiers); the
/// authorship starts with a capital or a year and holds only authors' names, joining
/// words and years. Anything else is not split (`None`).
pub fn split_authority(text: &str) -> Option<(&str, &str)> {
    let text = text.trim();
    let tokens: Vec<(usize, &str)> =
        text.split_whitespace().map(|token| (token.as_ptr() as usize - text.as_ptr() as usize, token)).collect();
    let genus = tokens.first()?.1;
    if !genus.chars().next()?.is_uppercase() {
        return None;
    }
    let start = (1..tokens.len().min(5)).find(|&i| starts_authority(tokens[i].1))?;
    if !tokens[1..start].iter().all(|(_, t)| t.chars().next().is_some_and(char::is_lowercase)) {
        return None;
    }
    if !tokens[start..].iter().all(|(_, t)| authority_word(t)) {
        return None;
    }
    let at = tokens[start].0;
    Some((text[..at].trim_end(), text[at..].trim()))
}

fn bare(token: &str) -> &str {
    token.trim_matches(|c: char| !c.is_alphanumeric() && c != '\'')
}

fn is_year(token: &str) -> bool {
    let bare = bare(token);
    bare.len() == 4 && bare.chars().all(|c| c.is_ascii_digit())
}

/// A year, or an author's name: capitalised, perhaps after `d'` ("d'Orbigny").
fn starts_authority(token: &str) -> bool {
    let bare = bare(token);
    let name = bare.strip_prefix("d'").unwrap_or(bare);
    is_year(token) || name.chars().next().is_some_and(char::is_uppercase)
}

fn authority_word(token: &str) -> bool {
    let bare = bare(token);
    bare.is_empty() || starts_authority(token) || AUTHOR_JOINERS.contains(&bare)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn words_fold_case_accents_punctuation_and_compatibility_forms() {
        assert_eq!(words("  Squatína-squatina? "), ["squatina", "squatina"]);
        assert_eq!(words("Ｓｑｕａｔｉｎａ"), ["squatina"], "fullwidth letters (NFKD)");
        assert_eq!(words("cath fôr wen"), ["cath", "for", "wen"]);
        assert_eq!(words("angel\u{200B}shark"), ["angel", "shark"], "a zero-width space separates");
        assert_eq!(words("common skate (complex)"), ["common", "skate", "complex"]);
        assert_eq!(key("Angel-Shark"), key("angelshark"));
        assert!(words(&"a ".repeat(100)).len() == MAX_WORDS, "long texts are read up to MAX_WORDS words");
    }

    #[test]
    fn authorities_are_split_off_scientific_names_only() {
        assert_eq!(split_authority("Rostroraja alba (Lacepède, 1803)"), Some(("Rostroraja alba", "(Lacepède, 1803)")));
        assert_eq!(split_authority("Squatina squatina L."), Some(("Squatina squatina", "L.")));
        assert_eq!(split_authority("Dipturus batis Linnaeus 1758"), Some(("Dipturus batis", "Linnaeus 1758")));
        assert_eq!(split_authority("Mustelus asterias Cloquet, 1819"), Some(("Mustelus asterias", "Cloquet, 1819")));
        assert_eq!(
            split_authority("Squatina cf. squatina (Linnaeus 1758)"),
            Some(("Squatina cf. squatina", "(Linnaeus 1758)"))
        );
        assert_eq!(
            split_authority("Galeus melastomus Rafinesque, 1810"),
            Some(("Galeus melastomus", "Rafinesque, 1810"))
        );
        assert_eq!(split_authority("Raja montagui Fowler 1910"), Some(("Raja montagui", "Fowler 1910")));
        assert_eq!(split_authority("Raja undulata d'Auteur, 1800"), Some(("Raja undulata", "d'Auteur, 1800")));
        assert_eq!(split_authority("squatina squatina Linnaeus"), None, "a name starts with a capitalised genus");
        assert_eq!(split_authority("Squatina squatina dead on the beach"), None, "not an authorship");
        assert_eq!(split_authority("Squatina"), None);
    }
}
