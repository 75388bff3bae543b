//! Whom an export names. Observers are named (Darwin Core `recordedBy`, `identifiedBy`)
//! only when they agreed, on their phone, to be named in open data, and then by the
//! name they gave beside that choice (their profile's), not whatever was typed on a
//! record; otherwise public exports give a pseudonymous label made from their random
//! public id — stable, so a data user can tell one observer's records from another's,
//! and never derived from anything that identifies them. Records from no known phone
//! carry no label. Reviewers' identifications are credited to the network's reviewers,
//! not to a person. Full exports, for reviewers and assessors, carry the names as given
//! on the records.

use crate::protect::Audience;
use crate::store::occurrences::{IdentificationRow, ObserverRow};

/// How reviewers' identifications are credited in public exports.
pub const REVIEWER_CREDIT: &str = "wrackline reviewer";

/// How many hex digits of a public id a label shows: 48 bits, so labels of different
/// observers do not collide in any network's lifetime (birthday bound ~16 million).
const LABEL_DIGITS: usize = 12;

/// What an export prints for one observer, if anything.
pub fn observer(observer: &ObserverRow, audience: Audience) -> Option<String> {
    let typed = observer.name.trim();
    let consented = observer.profile_name.as_deref().map(str::trim).filter(|n| observer.name_public && !n.is_empty());
    match (audience, consented) {
        (Audience::Full, _) => (!typed.is_empty()).then(|| typed.to_owned()),
        (Audience::Public, Some(name)) => Some(name.to_owned()),
        (Audience::Public, None) => observer.public_id.as_deref().map(pseudonym),
    }
}

/// The pseudonymous label of a public id.
pub fn pseudonym(public_id: &str) -> String {
    format!("observer-{}", public_id.chars().take(LABEL_DIGITS).collect::<String>())
}

/// Darwin Core `recordedBy`: each observer once, the primary observer first, " | " between.
pub fn recorded_by(observers: &[ObserverRow], audience: Audience) -> String {
    let mut shown: Vec<String> = Vec::new();
    for label in observers.iter().filter_map(|o| observer(o, audience)) {
        if !shown.contains(&label) {
            shown.push(label);
        }
    }
    shown.join(" | ")
}

/// Darwin Core `identifiedBy` for one identification.
pub fn identified_by(identification: &IdentificationRow, audience: Audience) -> String {
    match audience {
        Audience::Full => identification.identified_by.clone().unwrap_or_default(),
        Audience::Public if identification.basis == "reviewer" => REVIEWER_CREDIT.to_owned(),
        Audience::Public => observer(&identification.observer, audience).unwrap_or_default(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn gwen(name_public: bool) -> ObserverRow {
        ObserverRow {
            name: "Gwen Jones".into(),
            profile_name: Some("Gwen Jones".into()),
            name_public,
            public_id: Some("3f9a2c1d4e5b6a7f8091a2b3c4d5e6f7".into()),
        }
    }

    #[test]
    fn a_name_is_published_only_with_consent() {
        assert_eq!(observer(&gwen(true), Audience::Public).as_deref(), Some("Gwen Jones"));
        assert_eq!(observer(&gwen(false), Audience::Public).as_deref(), Some("observer-3f9a2c1d4e5b"));
        assert_eq!(observer(&gwen(false), Audience::Full).as_deref(), Some("Gwen Jones"), "reviewers see names");
        let typed_for_a_friend = ObserverRow { name: "Tom Friend".into(), ..gwen(true) };
        assert_eq!(
            observer(&typed_for_a_friend, Audience::Public).as_deref(),
            Some("Gwen Jones"),
            "the consented name"
        );
        let unknown_phone = ObserverRow { name: "Sam".into(), profile_name: None, name_public: false, public_id: None };
        assert_eq!(observer(&unknown_phone, Audience::Public), None);
        let both = [gwen(false), gwen(false), unknown_phone];
        assert_eq!(recorded_by(&both, Audience::Public), "observer-3f9a2c1d4e5b");
    }
}
