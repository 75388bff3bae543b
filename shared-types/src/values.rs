//! Checked values: a value of one of these types exists only if it is valid
//! ("parse, don't validate"). Each rejects bad input with a message that names the
//! problem, and serde uses the same checks when a submission is read.

use serde::{Deserialize, Serialize};
use thiserror::Error;

/// Why a value was refused. The message is meant for the person who typed it.
#[derive(Debug, Clone, PartialEq, Error)]
#[error("{0}")]
pub struct ValueError(String);

macro_rules! bounded_f64 {
    ($(#[$doc:meta])* $name:ident, $what:literal, $min:expr, $max:expr, $unit:literal) => {
        $(#[$doc])*
        #[derive(Debug, Clone, Copy, PartialEq, PartialOrd, Serialize, Deserialize)]
        #[serde(try_from = "f64", into = "f64")]
        pub struct $name(f64);

        impl $name {
            /// Checks the range; NaN and infinities are refused.
            pub fn parse(value: f64) -> Result<Self, ValueError> {
                if value.is_finite() && ($min..=$max).contains(&value) {
                    Ok(Self(value))
                } else {
                    Err(ValueError(format!(
                        concat!($what, " must be between {} and {}", $unit, ", got {}"),
                        $min, $max, value
                    )))
                }
            }

            /// The plain number.
            pub fn get(self) -> f64 {
                self.0
            }
        }

        impl TryFrom<f64> for $name {
            type Error = ValueError;
            fn try_from(value: f64) -> Result<Self, Self::Error> {
                Self::parse(value)
            }
        }

        impl From<$name> for f64 {
            fn from(value: $name) -> f64 {
                value.0
            }
        }
    };
}

bounded_f64!(
    /// Latitude in decimal degrees, WGS84.
    Latitude, "latitude", -90.0, 90.0, " degrees"
);
bounded_f64!(
    /// Longitude in decimal degrees, WGS84.
    Longitude, "longitude", -180.0, 180.0, " degrees"
);
bounded_f64!(
    /// Horizontal uncertainty of a position in metres (Darwin Core's
    /// coordinateUncertaintyInMeters, which may not be zero).
    AccuracyM, "position accuracy", 0.01, 1_000_000.0, " metres"
);

/// How many animals one record describes: at least one (a walk that found nothing is
/// recorded as a walk, not as a record with count zero).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(try_from = "u32", into = "u32")]
pub struct Count(u32);

impl Count {
    /// The largest count one record may carry; beyond this it is a mass event that
    /// deserves several records or a conversation with a reviewer.
    pub const MAX: u32 = 10_000;

    pub fn parse(value: u32) -> Result<Self, ValueError> {
        if (1..=Self::MAX).contains(&value) {
            Ok(Self(value))
        } else {
            Err(ValueError(format!("count must be between 1 and {}, got {value}", Self::MAX)))
        }
    }

    pub fn get(self) -> u32 {
        self.0
    }
}

impl TryFrom<u32> for Count {
    type Error = ValueError;
    fn try_from(value: u32) -> Result<Self, Self::Error> {
        Self::parse(value)
    }
}

impl From<Count> for u32 {
    fn from(value: Count) -> u32 {
        value.0
    }
}

/// Free text typed by an observer, trimmed, at most [`Text::MAX_CHARS`] characters.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(try_from = "String", into = "String")]
pub struct Text(String);

impl Text {
    pub const MAX_CHARS: usize = 4000;

    pub fn parse(value: &str) -> Result<Self, ValueError> {
        let trimmed = value.trim();
        let chars = trimmed.chars().count();
        if chars > Self::MAX_CHARS {
            return Err(ValueError(format!(
                "text is {chars} characters long; at most {} are allowed",
                Self::MAX_CHARS
            )));
        }
        Ok(Self(trimmed.to_owned()))
    }

    pub fn as_str(&self) -> &str {
        &self.0
    }
}

impl TryFrom<String> for Text {
    type Error = ValueError;
    fn try_from(value: String) -> Result<Self, Self::Error> {
        Self::parse(&value)
    }
}

impl From<Text> for String {
    fn from(value: Text) -> String {
        value.0
    }
}

/// A SHA-256 digest written as 64 hexadecimal digits, kept in lower case: how the phone
/// names the original file of a photo (which it never sends), so the same original
/// picked on two phones is recognised although their upload copies differ.
#[derive(Debug, Clone, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(try_from = "String", into = "String")]
pub struct Sha256Hex(String);

impl Sha256Hex {
    pub fn parse(value: &str) -> Result<Self, ValueError> {
        if value.len() == 64 && value.bytes().all(|b| b.is_ascii_hexdigit()) {
            Ok(Self(value.to_ascii_lowercase()))
        } else {
            Err(ValueError(format!(
                "a SHA-256 digest must be 64 hexadecimal digits, got {:?}",
                value.chars().take(80).collect::<String>()
            )))
        }
    }

    pub fn as_str(&self) -> &str {
        &self.0
    }
}

impl TryFrom<String> for Sha256Hex {
    type Error = ValueError;
    fn try_from(value: String) -> Result<Self, Self::Error> {
        Self::parse(&value)
    }
}

impl From<Sha256Hex> for String {
    fn from(value: Sha256Hex) -> String {
        value.0
    }
}

/// A length as typed, with its unit. Converted to centimetres for storage and export.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(try_from = "UncheckedLength")]
pub struct LengthValue {
    pub value: f64,
    pub unit: LengthUnit,
}

/// A length as it arrives, before [`LengthValue::parse`] has checked it.
#[derive(Deserialize)]
struct UncheckedLength {
    value: f64,
    unit: LengthUnit,
}

impl TryFrom<UncheckedLength> for LengthValue {
    type Error = ValueError;
    fn try_from(raw: UncheckedLength) -> Result<Self, Self::Error> {
        Self::parse(raw.value, raw.unit)
    }
}

/// Units an observer may type a length in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum LengthUnit {
    Mm,
    Cm,
    M,
    Inch,
}

impl LengthUnit {
    pub const ALL: [LengthUnit; 4] = [Self::Cm, Self::Mm, Self::M, Self::Inch];

    /// Centimetres in one of this unit (the inch is exactly 2.54 cm, by definition).
    pub fn cm_per_unit(self) -> f64 {
        match self {
            Self::Mm => 0.1,
            Self::Cm => 1.0,
            Self::M => 100.0,
            Self::Inch => 2.54,
        }
    }

    pub fn code(self) -> &'static str {
        match self {
            Self::Mm => "mm",
            Self::Cm => "cm",
            Self::M => "m",
            Self::Inch => "in",
        }
    }
}

/// The longest shark or ray length accepted, in centimetres. The largest fish alive
/// reach about 18–20 m (common practice); anything beyond this is a typing slip.
pub const MAX_LENGTH_CM: f64 = 2500.0;

impl LengthValue {
    /// Checks the number is positive and no longer than [`MAX_LENGTH_CM`].
    pub fn parse(value: f64, unit: LengthUnit) -> Result<Self, ValueError> {
        let cm = value * unit.cm_per_unit();
        if !value.is_finite() || value <= 0.0 {
            return Err(ValueError(format!("length must be a positive number, got {value}")));
        }
        if cm > MAX_LENGTH_CM {
            return Err(ValueError(format!(
                "length {value} {} is {cm:.0} cm, longer than any shark or ray ({MAX_LENGTH_CM:.0} cm)",
                unit.code()
            )));
        }
        Ok(Self { value, unit })
    }

    pub fn centimetres(self) -> f64 {
        self.value * self.unit.cm_per_unit()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn latitude_outside_the_globe_is_refused_with_its_value() {
        let err = Latitude::parse(91.5).unwrap_err();
        assert!(err.to_string().contains("91.5"), "{err}");
        let err = Latitude::parse(f64::NAN).unwrap_err();
        assert_eq!(err.to_string(), "latitude must be between -90 and 90 degrees, got NaN");
        assert_eq!(Latitude::parse(-90.0).unwrap().get(), -90.0);
    }

    #[test]
    fn serde_applies_the_same_checks() {
        let err = serde_json::from_str::<Longitude>("181").unwrap_err();
        assert!(err.to_string().contains("longitude must be between"), "{err}");
        let err = serde_json::from_str::<Count>("0").unwrap_err();
        assert!(err.to_string().contains("count must be between 1"), "{err}");
        let err = serde_json::from_str::<LengthValue>(r#"{"value": -2, "unit": "cm"}"#).unwrap_err();
        assert!(err.to_string().contains("positive"), "{err}");
    }

    #[test]
    fn lengths_convert_to_centimetres() {
        // 1 in = 2.54 cm exactly (international yard and pound agreement, 1959).
        assert_eq!(LengthValue::parse(10.0, LengthUnit::Inch).unwrap().centimetres(), 25.4);
        assert_eq!(LengthValue::parse(1.5, LengthUnit::M).unwrap().centimetres(), 150.0);
        let err = LengthValue::parse(26.0, LengthUnit::M).unwrap_err();
        assert!(err.to_string().contains("is 2600 cm, longer than any shark or ray"), "{err}");
        let err = LengthValue::parse(0.0, LengthUnit::Cm).unwrap_err();
        assert_eq!(err.to_string(), "length must be a positive number, got 0");
    }

    #[test]
    fn text_is_trimmed_and_bounded() {
        assert_eq!(Text::parse("  spurdog \n").unwrap().as_str(), "spurdog");
        let err = Text::parse(&"x".repeat(Text::MAX_CHARS + 1)).unwrap_err();
        assert_eq!(err.to_string(), "text is 4001 characters long; at most 4000 are allowed");
    }

    #[test]
    fn a_sha256_digest_is_64_hex_digits_kept_in_lower_case() {
        // FIPS 180-4: SHA-256 gives 256 bits, 64 hexadecimal digits. The digest of the
        // empty input (FIPS 180-4 test vectors, common practice to quote).
        let empty = "E3B0C44298FC1C149AFBF4C8996FB92427AE41E4649B934CA495991B7852B855";
        assert_eq!(Sha256Hex::parse(empty).unwrap().as_str(), empty.to_ascii_lowercase());
        for (wrong, why) in [(empty[..63].to_owned(), "63 digits"), (format!("{}g", &empty[..63]), "not hex")] {
            let err = Sha256Hex::parse(&wrong).unwrap_err();
            assert!(err.to_string().starts_with("a SHA-256 digest must be 64 hexadecimal digits"), "{why}: {err}");
        }
        let err = serde_json::from_str::<Sha256Hex>("\"abc\"").unwrap_err();
        assert!(err.to_string().contains("64 hexadecimal digits"), "{err}");
    }
}
