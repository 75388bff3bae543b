//! The forms of the people who go out — a response to a live animal, a sample, a
//! carcass report — as typed text, turned into the checked types both sides speak
//! (`shared_types::fieldwork`) with the same checks the server makes. A problem names its
//! field as the server does (`who_went`, `code`…) so the screen shows it beside that
//! control, whether the form or the server found it. Also the words the screens need for
//! the fixed lists and a map link for a place.

use chrono::{DateTime, FixedOffset, Utc};
use shared_types::{
    BodyCondition, CarcassFate, CarcassReport, CarcassView, FieldProblem, NotificationView, Preservation,
    ResponseOutcome, ResponseReport, SampleInput, SampleKind, SampleView, StomachFill, Text,
};

use crate::data::api::ApiError;
use crate::data::readable;
use crate::data::time::{self, Zone};
use crate::data::words::{t, t_args};

/// A problem with one field of a form: the field's name as the server names it, and the
/// words to show beside its control.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct FormProblem {
    pub field: String,
    pub words: String,
}

impl FormProblem {
    fn at(field: &str, words: impl Into<String>) -> Self {
        Self { field: field.to_owned(), words: words.into() }
    }

    /// The form's own check, as the server words it.
    pub fn from_check(problem: FieldProblem) -> Self {
        Self::at(problem.field, problem.message)
    }

    /// A server's refusal: beside the field it names, else under the form (`field` empty).
    pub fn from_server(err: &ApiError) -> Self {
        Self::at(err.field().unwrap_or_default(), err.to_string())
    }
}

/// The code a fixed-list value travels as (its serde name), for `<option value>`.
pub fn code_of<T: serde::Serialize>(value: &T) -> String {
    serde_json::to_value(value).ok().and_then(|v| v.as_str().map(str::to_owned)).unwrap_or_default()
}

/// The fixed-list value a code names.
fn from_code<T: serde::de::DeserializeOwned>(code: &str) -> Option<T> {
    serde_json::from_value(serde_json::Value::String(code.to_owned())).ok()
}

pub const BODY_CONDITIONS: [BodyCondition; 4] =
    [BodyCondition::Good, BodyCondition::Fair, BodyCondition::Poor, BodyCondition::Emaciated];

pub const STOMACH_FILLS: [StomachFill; 4] =
    [StomachFill::Empty, StomachFill::SomeFood, StomachFill::Full, StomachFill::NotExamined];

fn text(field: &str, value: &str) -> Result<Text, FormProblem> {
    Text::parse(value.trim()).map_err(|err| FormProblem::at(field, err.to_string()))
}

fn optional_text(field: &str, value: &str) -> Result<Option<Text>, FormProblem> {
    if value.trim().is_empty() { Ok(None) } else { text(field, value).map(Some) }
}

fn local_time(zone: &impl Zone, field: &str, value: &str) -> Result<DateTime<FixedOffset>, FormProblem> {
    time::parse_input(zone, value).ok_or_else(|| FormProblem::at(field, t("fieldwork-choose-date-time")))
}

fn chosen<T: serde::de::DeserializeOwned>(field: &str, code: &str) -> Result<T, FormProblem> {
    from_code(code).ok_or_else(|| FormProblem::at(field, t("fieldwork-choose-from-list")))
}

fn optional_choice<T: serde::de::DeserializeOwned>(field: &str, code: &str) -> Result<Option<T>, FormProblem> {
    if code.is_empty() { Ok(None) } else { chosen(field, code).map(Some) }
}

/// The response form as typed.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct ResponseDraft {
    pub who_went: String,
    /// A `datetime-local` value.
    pub went_at: String,
    /// An outcome's code (`returned_to_sea`…); empty until one is chosen.
    pub outcome: String,
    pub notes: String,
}

impl ResponseDraft {
    /// The form's fields, as the server names them in its refusals.
    pub const FIELDS: &[&str] = &["who_went", "went_at", "outcome", "notes"];

    /// The report to send, checked as the server checks it.
    pub fn to_report(&self, zone: &impl Zone, now: DateTime<Utc>) -> Result<ResponseReport, FormProblem> {
        let report = ResponseReport {
            who_went: text("who_went", &self.who_went)?,
            went_at: local_time(zone, "went_at", &self.went_at)?,
            outcome: chosen::<ResponseOutcome>("outcome", &self.outcome)?,
            notes: optional_text("notes", &self.notes)?,
        };
        report.check(now).map_err(FormProblem::from_check)?;
        Ok(report)
    }
}

/// The sample form as typed.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct SampleDraft {
    pub kind: String,
    pub code: String,
    pub preservation: String,
    pub stored_at: String,
    pub held_by: String,
    pub notes: String,
}

impl SampleDraft {
    /// The form's fields, as the server names them in its refusals.
    pub const FIELDS: &[&str] = &["kind", "code", "preservation", "stored_at", "held_by", "notes"];

    /// The form filled with a stored sample, to change it.
    pub fn from_view(sample: &SampleView) -> Self {
        Self {
            kind: code_of(&sample.kind),
            code: sample.code.clone(),
            preservation: code_of(&sample.preservation),
            stored_at: sample.stored_at.clone(),
            held_by: sample.held_by.clone(),
            notes: sample.notes.clone().unwrap_or_default(),
        }
    }

    /// The sample to send, checked as the server checks it.
    pub fn to_input(&self) -> Result<SampleInput, FormProblem> {
        let input = SampleInput {
            kind: chosen::<SampleKind>("kind", &self.kind)?,
            code: self.code.trim().to_owned(),
            preservation: chosen::<Preservation>("preservation", &self.preservation)?,
            stored_at: text("stored_at", &self.stored_at)?,
            held_by: text("held_by", &self.held_by)?,
            notes: optional_text("notes", &self.notes)?,
        };
        input.check().map_err(FormProblem::from_check)?;
        Ok(input)
    }
}

/// The carcass form as typed; the structured findings are optional.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct CarcassDraft {
    pub fate: String,
    /// A `datetime-local` value, or empty when it was not examined.
    pub examined_at: String,
    pub body_condition: String,
    pub stomach: String,
    pub injuries: String,
    pub notes: String,
}

impl CarcassDraft {
    /// The form's fields, as the server names them in its refusals.
    pub const FIELDS: &[&str] = &["fate", "examined_at", "body_condition", "stomach", "injuries", "notes"];

    /// The form filled with the stored report, to correct it.
    pub fn from_view(carcass: &CarcassView, zone: &impl Zone) -> Self {
        let report = &carcass.report;
        Self {
            fate: code_of(&report.fate),
            examined_at: report.examined_at.map(|at| time::input_value_at(zone, &at)).unwrap_or_default(),
            body_condition: report.body_condition.map(|c| code_of(&c)).unwrap_or_default(),
            stomach: report.stomach.map(|s| code_of(&s)).unwrap_or_default(),
            injuries: report.injuries.as_ref().map(|t| t.as_str().to_owned()).unwrap_or_default(),
            notes: report.notes.as_ref().map(|t| t.as_str().to_owned()).unwrap_or_default(),
        }
    }

    /// The report to send, checked as the server checks it.
    pub fn to_report(&self, zone: &impl Zone, now: DateTime<Utc>) -> Result<CarcassReport, FormProblem> {
        let examined_at =
            if self.examined_at.is_empty() { None } else { Some(local_time(zone, "examined_at", &self.examined_at)?) };
        let report = CarcassReport {
            fate: chosen::<CarcassFate>("fate", &self.fate)?,
            examined_at,
            body_condition: optional_choice("body_condition", &self.body_condition)?,
            stomach: optional_choice("stomach", &self.stomach)?,
            injuries: optional_text("injuries", &self.injuries)?,
            notes: optional_text("notes", &self.notes)?,
        };
        report.check(now).map_err(FormProblem::from_check)?;
        Ok(report)
    }
}

/// One channel's delivery state in words.
pub fn notification_words(n: &NotificationView) -> String {
    let channel = channel_words(&n.channel);
    match (&n.delivered_at, &n.last_error) {
        (Some(at), _) => t_args(
            "fieldwork-notification-delivered",
            &[("channel", channel.into()), ("at", readable::utc_minute(at).into()), ("attempts", n.attempts.into())],
        ),
        (None, Some(error)) => t_args(
            "fieldwork-notification-failing",
            &[("channel", channel.into()), ("attempts", n.attempts.into()), ("error", error.as_str().into())],
        ),
        (None, None) => t_args("fieldwork-notification-waiting", &[("channel", channel.into())]),
    }
}

/// A notification channel's name; a channel the app does not know is shown as it is.
fn channel_words(channel: &str) -> String {
    match channel {
        "email" => t("fieldwork-channel-email"),
        "webhook" => t("fieldwork-channel-webhook"),
        other => other.to_owned(),
    }
}

/// A link that opens the place in the phone's map app (the `geo:` URI, RFC 5870).
pub fn map_link(latitude: f64, longitude: f64) -> String {
    format!("geo:{latitude:.6},{longitude:.6}")
}

/// The same place on OpenStreetMap, for a desk without a map app.
pub fn web_map_link(latitude: f64, longitude: f64) -> String {
    format!("https://www.openstreetmap.org/?mlat={latitude:.6}&mlon={longitude:.6}#map=16/{latitude:.6}/{longitude:.6}")
}

#[cfg(test)]
mod tests {
    use chrono::NaiveDateTime;

    use super::*;

    struct Utc0;
    impl Zone for Utc0 {
        fn minutes_behind_utc(&self, _: &NaiveDateTime) -> f64 {
            0.0
        }
    }

    fn now() -> DateTime<Utc> {
        "2026-05-01T12:00:00Z".parse().unwrap()
    }

    #[test]
    fn a_response_names_the_field_it_lacks() {
        let mut draft = ResponseDraft {
            who_went: "Nia".into(),
            went_at: "2026-05-01T11:30".into(),
            outcome: String::new(),
            notes: String::new(),
        };
        assert_eq!(draft.to_report(&Utc0, now()).unwrap_err().field, "outcome");
        draft.outcome = "returned_to_sea".into();
        let report = draft.to_report(&Utc0, now()).unwrap();
        assert_eq!(report.outcome, ResponseOutcome::ReturnedToSea);
        assert_eq!(report.notes, None, "blank notes are left out");
        draft.who_went = "  ".into();
        assert_eq!(draft.to_report(&Utc0, now()).unwrap_err().field, "who_went");
        draft.who_went = "Nia".into();
        draft.went_at = "2026-05-01T15:00".into();
        assert_eq!(draft.to_report(&Utc0, now()).unwrap_err().field, "went_at", "three hours ahead: the future");
        draft.went_at = "yesterday".into();
        assert_eq!(
            draft.to_report(&Utc0, now()).unwrap_err(),
            FormProblem::at("went_at", "choose a date and time"),
            "the English catalogue's words, beside the field"
        );
        draft.went_at = "2026-05-01T11:30".into();
        draft.outcome = "swam_off".into();
        assert_eq!(draft.to_report(&Utc0, now()).unwrap_err(), FormProblem::at("outcome", "choose one from the list"));
    }

    #[test]
    fn a_notification_says_its_channel_its_state_and_its_attempts() {
        let delivered = "2026-05-01T11:02:40Z".parse().ok();
        let mut n =
            NotificationView { channel: "webhook".into(), attempts: 1, delivered_at: delivered, last_error: None };
        assert_eq!(notification_words(&n), "webhook: delivered 2026-05-01 11:02 UTC after 1 attempt");
        n.attempts = 3;
        assert_eq!(notification_words(&n), "webhook: delivered 2026-05-01 11:02 UTC after 3 attempts");
        n.delivered_at = None;
        n.last_error = Some("connection refused".into());
        assert_eq!(
            notification_words(&n),
            "webhook: not delivered yet after 3 attempts; the last failed: connection refused"
        );
        n.last_error = None;
        n.channel = "email".into();
        assert_eq!(notification_words(&n), "email: waiting to be sent");
        n.channel = "pager".into();
        assert_eq!(notification_words(&n), "pager: waiting to be sent", "a channel the app does not know, as it is");
    }

    #[test]
    fn a_sample_is_checked_as_the_server_checks_it_and_round_trips_from_its_view() {
        let draft = SampleDraft {
            kind: "vertebrae".into(),
            code: " V-1 ".into(),
            preservation: "frozen".into(),
            stored_at: "freezer 2".into(),
            held_by: "the museum".into(),
            notes: String::new(),
        };
        let input = draft.to_input().unwrap();
        assert_eq!((input.kind, input.code.as_str()), (SampleKind::Vertebrae, "V-1"));
        let view = SampleView {
            code: input.code.clone(),
            kind: input.kind,
            preservation: input.preservation,
            stored_at: "freezer 2".into(),
            held_by: "the museum".into(),
            notes: None,
            record_client_id: uuid::Uuid::nil(),
            organism_id: 1,
            added_by: "R".into(),
            added_at: now(),
            changed_at: None,
        };
        assert_eq!(SampleDraft::from_view(&view).to_input().unwrap(), input);
        let spaced = SampleDraft { code: "V 1".into(), ..draft.clone() };
        assert_eq!(spaced.to_input().unwrap_err().field, "code");
        let unkept = SampleDraft { stored_at: String::new(), ..draft.clone() };
        assert_eq!(unkept.to_input().unwrap_err().field, "stored_at");
        let unknown = SampleDraft { kind: "bone".into(), ..draft };
        assert_eq!(unknown.to_input().unwrap_err().field, "kind");
    }

    #[test]
    fn a_carcass_report_takes_optional_findings_and_refuses_a_future_examination() {
        let mut draft = CarcassDraft { fate: "taken_for_study".into(), ..Default::default() };
        let bare = draft.to_report(&Utc0, now()).unwrap();
        assert_eq!((bare.fate, bare.examined_at, bare.stomach), (CarcassFate::TakenForStudy, None, None));
        draft.stomach = "some_food".into();
        draft.body_condition = "poor".into();
        draft.examined_at = "2026-05-01T09:00".into();
        let full = draft.to_report(&Utc0, now()).unwrap();
        assert_eq!((full.stomach, full.body_condition), (Some(StomachFill::SomeFood), Some(BodyCondition::Poor)));
        draft.examined_at = "2026-05-02T09:00".into();
        assert_eq!(draft.to_report(&Utc0, now()).unwrap_err().field, "examined_at");
        draft.fate = String::new();
        assert_eq!(draft.to_report(&Utc0, now()).unwrap_err().field, "fate");
    }

    #[test]
    fn list_codes_are_the_serde_names_the_server_reads() {
        assert_eq!(code_of(&ResponseOutcome::EuthanisedByVet), "euthanised_by_vet");
        assert_eq!(code_of(&StomachFill::NotExamined), "not_examined");
        assert_eq!(from_code::<CarcassFate>("washed_away"), Some(CarcassFate::WashedAway));
    }

    #[test]
    fn map_links_carry_the_coordinates() {
        // geo URI: RFC 5870 §3 ("geo:" latitude "," longitude, WGS 84 decimal degrees).
        assert_eq!(map_link(52.4153, -4.0829), "geo:52.415300,-4.082900");
        assert!(web_map_link(52.4153, -4.0829).contains("mlat=52.415300&mlon=-4.082900"));
    }
}
