//! Size limits on every string and list a JSON body may carry, so a stranger cannot make
//! the server keep (and every reviewer's screen show) ten megabytes of one field.
//!
//! The limits run inside serde (`#[serde(deserialize_with = …)]`), so phone and server
//! refuse the same input, a list is refused as soon as it grows past its limit (not
//! after it is read whole), and the refusal names the field: read with
//! `serde_path_to_error`, "key_choice.answers: at most 64 entries…". Free text typed by
//! people is [`crate::Text`] (4,000 characters); these are for everything else.

use std::collections::BTreeMap;
use std::fmt;
use std::marker::PhantomData;

use serde::de::{self, Deserialize, Deserializer, MapAccess, SeqAccess, Visitor};

/// The longest name-like string: a username, a display name, a taxon rank, a key
/// character or its answer (common practice: names run to tens of characters).
pub const MAX_NAME_CHARS: usize = 200;
/// The longest password accepted. Hashing cost grows with length; a passphrase of a
/// few dozen words fits (common practice).
pub const MAX_PASSWORD_CHARS: usize = 1024;
/// The longest EXIF text value the phone may relay (a date and time with sub-seconds is
/// 23 characters, an offset 6; CIPA DC-008).
pub const MAX_EXIF_TEXT_CHARS: usize = 64;
/// The most photos one record or reply may carry, and so the most EXIF readings.
pub const MAX_PHOTOS_PER_RECORD: usize = 12;
/// The most answers to the guided key one record may carry (the key asks about a few
/// dozen characters at most).
pub const MAX_KEY_ANSWERS: usize = 64;
/// The largest `record` (or `reply`) JSON part of an upload, in bytes: a full record
/// with every field at its limit stays well inside it.
pub const MAX_RECORD_JSON_BYTES: usize = 256 * 1024;

/// A string of at most `N` characters.
pub fn string<'de, D: Deserializer<'de>, const N: usize>(deserializer: D) -> Result<String, D::Error> {
    let value = String::deserialize(deserializer)?;
    check_chars::<D::Error>(&value, N)?;
    Ok(value)
}

/// An optional string of at most `N` characters.
pub fn optional_string<'de, D: Deserializer<'de>, const N: usize>(deserializer: D) -> Result<Option<String>, D::Error> {
    let value = Option::<String>::deserialize(deserializer)?;
    if let Some(text) = &value {
        check_chars::<D::Error>(text, N)?;
    }
    Ok(value)
}

fn check_chars<E: de::Error>(text: &str, most: usize) -> Result<(), E> {
    // Counting stops just past the limit: the refusal costs no more than the limit.
    let chars = text.chars().take(most + 1).count();
    if chars > most {
        return Err(E::custom(format!("at most {most} characters are allowed, got {} bytes", text.len())));
    }
    Ok(())
}

/// A list of at most `N` items, refused as soon as item `N + 1` arrives.
pub fn list<'de, D, T, const N: usize>(deserializer: D) -> Result<Vec<T>, D::Error>
where
    D: Deserializer<'de>,
    T: Deserialize<'de>,
{
    deserializer.deserialize_seq(BoundedList::<T, N>(PhantomData))
}

struct BoundedList<T, const N: usize>(PhantomData<T>);

impl<'de, T: Deserialize<'de>, const N: usize> Visitor<'de> for BoundedList<T, N> {
    type Value = Vec<T>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        write!(f, "a list of at most {N} items")
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Vec<T>, A::Error> {
        let mut items = Vec::with_capacity(seq.size_hint().unwrap_or(0).min(N));
        while let Some(item) = seq.next_element()? {
            if items.len() == N {
                return Err(de::Error::custom(format!("at most {N} items are allowed")));
            }
            items.push(item);
        }
        Ok(items)
    }
}

/// A map of at most `N` entries whose keys and values are strings of at most
/// [`MAX_NAME_CHARS`] characters, refused as soon as entry `N + 1` arrives.
pub fn name_map<'de, D: Deserializer<'de>, const N: usize>(
    deserializer: D,
) -> Result<BTreeMap<String, String>, D::Error> {
    deserializer.deserialize_map(BoundedNameMap::<N>)
}

struct BoundedNameMap<const N: usize>;

impl<'de, const N: usize> Visitor<'de> for BoundedNameMap<N> {
    type Value = BTreeMap<String, String>;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        write!(f, "a map of at most {N} entries")
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Self::Value, A::Error> {
        let mut entries = BTreeMap::new();
        while let Some((key, value)) = map.next_entry::<String, String>()? {
            if entries.len() == N {
                return Err(de::Error::custom(format!("at most {N} entries are allowed")));
            }
            check_chars::<A::Error>(&key, MAX_NAME_CHARS).map_err(|err| de::Error::custom(format!("a key: {err}")))?;
            check_chars::<A::Error>(&value, MAX_NAME_CHARS)
                .map_err(|err| de::Error::custom(format!("the value of {key:?}: {err}")))?;
            entries.insert(key, value);
        }
        Ok(entries)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[derive(Debug, serde::Deserialize)]
    struct Sample {
        #[serde(default, deserialize_with = "string::<_, 5>")]
        name: String,
        #[serde(default, deserialize_with = "list::<_, u8, 3>")]
        numbers: Vec<u8>,
        #[serde(default, deserialize_with = "name_map::<_, 2>")]
        answers: BTreeMap<String, String>,
    }

    fn read(json: &str) -> Result<Sample, String> {
        serde_json::from_str(json).map_err(|err| err.to_string())
    }

    #[test]
    fn each_limit_passes_at_its_size_and_refuses_one_past_it() {
        let full = read(r#"{"name": "abcde", "numbers": [1, 2, 3], "answers": {"a": "b", "c": "d"}}"#).unwrap();
        assert_eq!((full.name.as_str(), full.numbers.as_slice(), full.answers.len()), ("abcde", &[1, 2, 3][..], 2));
        // Characters, not bytes: five accented letters are ten bytes of UTF-8.
        assert_eq!(read(r#"{"name": "ééééé"}"#).unwrap().name.len(), 10);
        let too_long = read(r#"{"name": "abcdef"}"#).unwrap_err();
        assert!(too_long.starts_with("at most 5 characters are allowed, got 6 bytes"), "{too_long}");
        let too_many = read(r#"{"numbers": [1, 2, 3, 4]}"#).unwrap_err();
        assert!(too_many.starts_with("at most 3 items are allowed"), "{too_many}");
        let too_many = read(r#"{"answers": {"a": "b", "c": "d", "e": "f"}}"#).unwrap_err();
        assert!(too_many.starts_with("at most 2 entries are allowed"), "{too_many}");
        let long_value = format!(r#"{{"answers": {{"a": "{}"}}}}"#, "x".repeat(MAX_NAME_CHARS + 1));
        let err = read(&long_value).unwrap_err();
        assert!(err.starts_with("the value of \"a\": at most 200 characters"), "{err}");
    }

    #[test]
    fn a_list_is_refused_before_it_is_read_whole() {
        // The refusal comes at item 4: the rest is never parsed (it is not even valid).
        let err = read(r#"{"numbers": [1, 2, 3, 4, "not a number"]}"#).unwrap_err();
        assert!(err.starts_with("at most 3 items are allowed"), "{err}");
    }
}
