//! "My records": the observer's own records as the server last described them to this
//! phone — review state, current identification and reviewers' messages — fetched with
//! each sync and kept in localStorage, so they can be read offline. Also what each
//! review state means in the observer's words, and how many reviewers' questions wait
//! for an answer (the badge at the top of the page).

use shared_types::{MyRecord, ReviewState, Role};

use crate::data::api;
use crate::data::local;
use crate::data::replies::{ReplyEntry, ReplyState};
use crate::data::words::{t, t_args};

/// A record's review state as its observer reads it: a short label and what it means.
pub fn state_words(record: &MyRecord) -> (String, String) {
    match record.record.review_state {
        ReviewState::AwaitingReview => (t("mine-awaiting"), t("mine-awaiting-means")),
        ReviewState::DetailsRequested => (t("mine-asked"), t("mine-asked-means")),
        ReviewState::Confirmed => (t("mine-confirmed"), t("mine-confirmed-means")),
        ReviewState::NotConfirmable => (
            t("mine-not-confirmable"),
            match &record.state_reason {
                Some(reason) => t_args("mine-not-confirmable-reason", &[("reason", reason.as_str().into())]),
                None => t("mine-not-confirmable-means"),
            },
        ),
        ReviewState::Merged => (t("mine-merged"), t("mine-merged-means")),
    }
}

/// Whether a reviewer's question on this record waits for the observer: the last
/// message is a reviewer's and no answer to it is waiting on this phone.
pub fn question_waits(record: &MyRecord, replies: &[ReplyEntry]) -> bool {
    let asked = record.messages.last().is_some_and(|m| m.author_role != Role::Observer);
    let answered_here = replies
        .iter()
        .any(|r| r.record_client_id == record.record.submission.client_id && r.state == ReplyState::Waiting);
    asked && !answered_here
}

/// How many of the observer's records have a question waiting.
pub fn questions_waiting(records: &[MyRecord], replies: &[ReplyEntry]) -> usize {
    records.iter().filter(|r| question_waits(r, replies)).count()
}

/// The record's name as the observer reads it: the current identification with its
/// common name when the checklist knows one ("nursehound (Scyliorhinus stellaris)"),
/// else their own guess.
pub fn name_shown(record: &MyRecord, common_name: impl Fn(&str) -> Option<String>) -> String {
    match &record.current_taxon {
        Some(scientific) => match common_name(scientific) {
            Some(common) => format!("{common} ({scientific})"),
            None => scientific.clone(),
        },
        None => record
            .record
            .submission
            .species_guess
            .as_ref()
            .map(|g| g.as_str().to_owned())
            .unwrap_or_else(|| t("record-unnamed")),
    }
}

const MY_RECORDS_KEY: &str = "wrackline.my-records";

/// The records as the server last described them to this phone.
pub fn cached() -> Vec<MyRecord> {
    local::get(MY_RECORDS_KEY).and_then(|text| serde_json::from_str(&text).ok()).unwrap_or_default()
}

/// Asks the server for this phone's records and keeps them for offline reading.
pub async fn fetch(token: &str) -> Result<Vec<MyRecord>, String> {
    let records =
        api::my_records(token).await.map_err(|err| t_args("mine-not-fetched", &[("error", err.to_string().into())]))?;
    if let Ok(text) = serde_json::to_string(&records) {
        local::set(MY_RECORDS_KEY, &text);
    }
    Ok(records)
}

#[cfg(test)]
mod tests {
    use shared_types::Message;

    use super::*;

    fn record(state: &str, messages: &[(Role, &str)], current: Option<&str>) -> MyRecord {
        let sub = crate::data::form_fields::tests::filled()
            .to_submission(
                uuid::Uuid::nil(),
                &crate::data::time::tests::LONDON,
                crate::data::form_fields::tests::saved_at(),
            )
            .unwrap();
        let view = serde_json::json!({
            "observation_id": 1, "organism_id": 1, "received_at": "2025-06-01T13:10:00Z",
            "review_state": state, "submission": sub, "photos": []
        });
        MyRecord {
            record: serde_json::from_value(view).unwrap(),
            current_taxon: current.map(str::to_owned),
            messages: messages
                .iter()
                .map(|(role, body)| Message {
                    author_role: *role,
                    author: None,
                    body: (*body).into(),
                    at: chrono::Utc::now(),
                })
                .collect(),
            state_reason: None,
        }
    }

    #[test]
    fn every_review_state_has_words_for_the_observer() {
        let mut refused = record("not_confirmable", &[], None);
        assert_eq!(state_words(&refused).0, "could not be confirmed");
        refused.state_reason = Some("the photo shows only the tail".into());
        assert!(
            state_words(&refused).1.contains("Their reason: “the photo shows only the tail”"),
            "the reason is shown"
        );
        let merged = record("merged", &[], None);
        assert!(state_words(&merged).1.contains("Someone else reported the same animal"));
        for state in ["awaiting_review", "details_requested", "confirmed"] {
            assert!(!state_words(&record(state, &[], None)).1.is_empty(), "{state}");
        }
    }

    #[test]
    fn a_question_waits_until_it_is_answered() {
        let asked = record("details_requested", &[(Role::Reviewer, "Which beach?")], None);
        assert!(question_waits(&asked, &[]));
        let answered =
            record("details_requested", &[(Role::Reviewer, "Which beach?"), (Role::Observer, "Borth")], None);
        assert!(!question_waits(&answered, &[]));
        let reply = ReplyEntry::new(uuid::Uuid::nil(), "Borth", &[]).unwrap();
        assert!(!question_waits(&asked, &[reply]), "an answer waiting on the phone counts");
        assert_eq!(questions_waiting(&[asked.clone(), answered, asked], &[]), 2);
    }

    #[test]
    fn the_current_name_comes_with_its_common_name() {
        let common = |name: &str| (name == "Scyliorhinus stellaris").then(|| "nursehound".to_owned());
        assert_eq!(
            name_shown(&record("confirmed", &[], Some("Scyliorhinus stellaris")), common),
            "nursehound (Scyliorhinus stellaris)"
        );
        assert_eq!(name_shown(&record("confirmed", &[], Some("Rajidae")), common), "Rajidae");
        assert_eq!(name_shown(&record("awaiting_review", &[], None), common), "thornback ray");
    }
}
