//! The body of every error answer the server sends, shared so that the phone decodes
//! exactly what the server encodes, in one place.

use serde::{Deserialize, Serialize};

/// What went wrong, in words a person can act on, and the field at fault when one is.
///
/// The server sends this as JSON with every 4xx and 5xx answer; a 5xx carries only a
/// general sentence, never internal details.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct ErrorBody {
    /// The message to show.
    pub error: String,
    /// The path of the field at fault in the request, e.g. `position.latitude`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub field: Option<String>,
}

impl ErrorBody {
    /// Reads an error answer's body; `None` when it is not one (a proxy's HTML page,
    /// an empty body).
    pub fn parse(body: &str) -> Option<Self> {
        serde_json::from_str::<Self>(body).ok().filter(|b| !b.error.trim().is_empty())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_body_with_a_field_round_trips() {
        let body = ErrorBody { error: "must be between -90 and 90".into(), field: Some("position.latitude".into()) };
        let json = serde_json::to_string(&body).unwrap();
        assert_eq!(json, r#"{"error":"must be between -90 and 90","field":"position.latitude"}"#);
        assert_eq!(ErrorBody::parse(&json), Some(body));
    }

    #[test]
    fn a_body_without_a_field_leaves_it_out() {
        let body = ErrorBody { error: "not found".into(), field: None };
        assert_eq!(serde_json::to_string(&body).unwrap(), r#"{"error":"not found"}"#);
    }

    #[test]
    fn what_is_not_an_error_body_is_none() {
        assert_eq!(ErrorBody::parse("<html>Bad Gateway</html>"), None);
        assert_eq!(ErrorBody::parse(""), None);
        assert_eq!(ErrorBody::parse(r#"{"error":""}"#), None);
        assert_eq!(ErrorBody::parse(r#"{"message":"x"}"#), None);
    }
}
