//! The stored and form codes of plain enums: the snake_case name serde gives each
//! variant (`fresh_dead`, `disc_width`), so a database column, a `<select>` value and
//! the JSON all spell a value the same way.

/// The code of a plain enum value (its serde name); empty for a value serde does not
/// write as a plain string.
pub fn code<T: serde::Serialize>(value: &T) -> String {
    serde_json::to_value(value).ok().and_then(|v| v.as_str().map(str::to_owned)).unwrap_or_default()
}

/// The value with this code, if there is one.
pub fn from_code<T: serde::de::DeserializeOwned>(code: &str) -> Option<T> {
    serde_json::from_value(serde_json::Value::String(code.to_owned())).ok()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::{Condition, LengthKind};

    #[test]
    fn codes_round_trip_and_unknown_codes_are_none() {
        assert_eq!(code(&Condition::FreshDead), "fresh_dead");
        assert_eq!(from_code::<LengthKind>("disc_width"), Some(LengthKind::DiscWidth));
        assert_eq!(from_code::<LengthKind>("wingspan"), None);
    }
}
