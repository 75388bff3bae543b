//! For the people who go out: what responders did about a live animal, the samples
//! researchers took from a carcass, and what became of it. Both sides speak these types:
//! the server checks and stores them, the reviewer's screen shows them.

use chrono::{DateTime, FixedOffset, Utc};
use serde::{Deserialize, Serialize};
use uuid::Uuid;

use crate::record::RecordView;
use crate::values::Text;

/// What happened after a live animal was reported.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ResponseOutcome {
    ReturnedToSea,
    Died,
    EuthanisedByVet,
    NotFound,
    CarcassRemoved,
}

impl ResponseOutcome {
    pub const ALL: [Self; 5] =
        [Self::ReturnedToSea, Self::Died, Self::EuthanisedByVet, Self::NotFound, Self::CarcassRemoved];

    pub fn label(self) -> &'static str {
        match self {
            Self::ReturnedToSea => "returned to sea",
            Self::Died => "died",
            Self::EuthanisedByVet => "euthanised by a vet",
            Self::NotFound => "not found",
            Self::CarcassRemoved => "carcass removed",
        }
    }
}

/// `POST /api/review/records/{client_id}/responses`: who went to a live animal, when,
/// and what happened.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ResponseReport {
    /// The people who went, as they want to be named in the log.
    pub who_went: Text,
    /// When they reached the animal (or gave up looking), with their UTC offset.
    pub went_at: DateTime<FixedOffset>,
    pub outcome: ResponseOutcome,
    pub notes: Option<Text>,
}

/// A field refused by a fieldwork form's own check: its name and why.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct FieldProblem {
    pub field: &'static str,
    pub message: String,
}

fn problem(field: &'static str, message: impl Into<String>) -> Result<(), FieldProblem> {
    Err(FieldProblem { field, message: message.into() })
}

/// How far ahead of the server's clock a time may be (a phone's clock drifts).
const CLOCK_TOLERANCE: chrono::Duration = chrono::Duration::minutes(10);

fn not_in_future(
    field: &'static str,
    at: Option<DateTime<FixedOffset>>,
    now: DateTime<Utc>,
) -> Result<(), FieldProblem> {
    match at {
        Some(at) if at.with_timezone(&Utc) > now + CLOCK_TOLERANCE => problem(field, format!("{at} is in the future")),
        _ => Ok(()),
    }
}

fn not_empty(field: &'static str, text: &Text) -> Result<(), FieldProblem> {
    if text.as_str().is_empty() { problem(field, "must not be empty") } else { Ok(()) }
}

impl ResponseReport {
    /// Checks what serde cannot: names given, a time not in the future.
    pub fn check(&self, now: DateTime<Utc>) -> Result<(), FieldProblem> {
        not_empty("who_went", &self.who_went)?;
        not_in_future("went_at", Some(self.went_at), now)
    }
}

impl SampleInput {
    /// Checks what serde cannot: a usable code, a place and a holder.
    pub fn check(&self) -> Result<(), FieldProblem> {
        if let Some(message) = sample_code_problem(&self.code) {
            return problem("code", message);
        }
        not_empty("stored_at", &self.stored_at)?;
        not_empty("held_by", &self.held_by)
    }
}

impl CarcassReport {
    /// Checks what serde cannot: an examination time not in the future.
    pub fn check(&self, now: DateTime<Utc>) -> Result<(), FieldProblem> {
        not_in_future("examined_at", self.examined_at, now)
    }
}

/// A logged response, as reviewers and responders read it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ResponseView {
    pub id: i64,
    pub who_went: String,
    pub went_at: DateTime<FixedOffset>,
    pub outcome: ResponseOutcome,
    pub notes: Option<String>,
    /// The display name of the person who logged it.
    pub logged_by: String,
    pub logged_at: DateTime<Utc>,
}

/// A live-animal record and what has been done about it, for responders.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct UrgentItem {
    pub record: RecordView,
    pub responses: Vec<ResponseView>,
    /// How the responders were told of it, by each channel.
    #[serde(default)]
    pub notifications: Vec<NotificationView>,
    /// The finder's name and contact as they gave it: for reviewers and admins only,
    /// never for responders (`None` for them).
    #[serde(default)]
    pub finder: Option<crate::review::ObserverContact>,
}

/// How the responders were told of an urgent record, by one channel.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct NotificationView {
    /// `webhook` or `email`.
    pub channel: String,
    pub attempts: u32,
    /// When the receiver acknowledged it; `None` while it is still being retried.
    pub delivered_at: Option<DateTime<Utc>>,
    /// Why the last attempt failed, in the server's words.
    pub last_error: Option<String>,
}

/// What a sample is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum SampleKind {
    /// A small piece of fin or muscle, for genetics.
    TissueForGenetics,
    /// Vertebrae, for ageing from their growth bands.
    Vertebrae,
    StomachContents,
    /// The whole carcass, taken for examination.
    WholeCarcass,
    Other,
}

impl SampleKind {
    pub const ALL: [Self; 5] =
        [Self::TissueForGenetics, Self::Vertebrae, Self::StomachContents, Self::WholeCarcass, Self::Other];

    pub fn label(self) -> &'static str {
        match self {
            Self::TissueForGenetics => "tissue for genetics",
            Self::Vertebrae => "vertebrae",
            Self::StomachContents => "stomach contents",
            Self::WholeCarcass => "whole carcass",
            Self::Other => "other",
        }
    }
}

/// How a sample is kept.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Preservation {
    Ethanol,
    Frozen,
    Dried,
    Formalin,
    Other,
}

impl Preservation {
    pub const ALL: [Self; 5] = [Self::Ethanol, Self::Frozen, Self::Dried, Self::Formalin, Self::Other];

    pub fn label(self) -> &'static str {
        match self {
            Self::Ethanol => "in ethanol",
            Self::Frozen => "frozen",
            Self::Dried => "dried",
            Self::Formalin => "in formalin",
            Self::Other => "other",
        }
    }
}

/// `POST /api/review/records/{client_id}/samples` and `PUT /api/samples/{code}`: a
/// sample taken from the animal of a record.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SampleInput {
    pub kind: SampleKind,
    /// The sample's own id or barcode, as written on its tube or bag: letters, digits,
    /// `.`, `-`, `_` and `:`, at most [`SAMPLE_CODE_MAX`] characters.
    pub code: String,
    pub preservation: Preservation,
    /// Where it is stored (a freezer, a shelf, a collection).
    pub stored_at: Text,
    /// Who holds it (a person or an institution).
    pub held_by: Text,
    pub notes: Option<Text>,
}

/// The longest sample code accepted.
pub const SAMPLE_CODE_MAX: usize = 64;

/// Why a sample code is refused; `None` when it is fine.
pub fn sample_code_problem(code: &str) -> Option<String> {
    if code.is_empty() {
        return Some("the sample's id must not be empty".into());
    }
    if code.chars().count() > SAMPLE_CODE_MAX {
        return Some(format!("the sample's id may have at most {SAMPLE_CODE_MAX} characters"));
    }
    if let Some(bad) = code.chars().find(|c| !(c.is_ascii_alphanumeric() || ".-_:".contains(*c))) {
        return Some(format!("the sample's id may hold letters, digits, '.', '-', '_' and ':', not {bad:?}"));
    }
    None
}

/// A stored sample.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SampleView {
    pub code: String,
    pub kind: SampleKind,
    pub preservation: Preservation,
    pub stored_at: String,
    pub held_by: String,
    pub notes: Option<String>,
    /// The record it was added on (the animal may have other reports).
    pub record_client_id: Uuid,
    pub organism_id: i64,
    pub added_by: String,
    pub added_at: DateTime<Utc>,
    pub changed_at: Option<DateTime<Utc>>,
}

/// What became of a carcass.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum CarcassFate {
    LeftWhereFound,
    Buried,
    RemovedForDisposal,
    TakenForStudy,
    WashedAway,
    Unknown,
}

impl CarcassFate {
    pub const ALL: [Self; 6] = [
        Self::LeftWhereFound,
        Self::Buried,
        Self::RemovedForDisposal,
        Self::TakenForStudy,
        Self::WashedAway,
        Self::Unknown,
    ];

    pub fn label(self) -> &'static str {
        match self {
            Self::LeftWhereFound => "left where found",
            Self::Buried => "buried",
            Self::RemovedForDisposal => "removed for disposal",
            Self::TakenForStudy => "taken for study",
            Self::WashedAway => "washed away",
            Self::Unknown => "unknown",
        }
    }
}

/// How well fed the animal looked inside.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum BodyCondition {
    Good,
    Fair,
    Poor,
    Emaciated,
}

/// What the stomach held.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum StomachFill {
    Empty,
    SomeFood,
    Full,
    NotExamined,
}

/// `PUT /api/review/records/{client_id}/carcass`: the carcass's fate and what an
/// examination found, in a few structured fields and free notes.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CarcassReport {
    pub fate: CarcassFate,
    /// When the carcass was examined, if it was.
    pub examined_at: Option<DateTime<FixedOffset>>,
    pub body_condition: Option<BodyCondition>,
    pub stomach: Option<StomachFill>,
    /// Wounds, hooks, net marks or disease seen inside or out.
    pub injuries: Option<Text>,
    pub notes: Option<Text>,
}

/// The stored carcass report.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CarcassView {
    #[serde(flatten)]
    pub report: CarcassReport,
    pub recorded_by: String,
    pub recorded_at: DateTime<Utc>,
}

/// One change to a sample or a carcass report, for the audit trail.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FieldworkEvent {
    pub at: DateTime<Utc>,
    pub by: String,
    /// The sample's code, when the change was to a sample.
    pub sample_code: Option<String>,
    /// What changed, in words.
    pub detail: String,
}

/// `GET /api/samples/{code}`: a sample and everything needed to trace it back.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SampleLookup {
    pub sample: SampleView,
    /// The animal's kept report (the one it was merged into, when reports were merged).
    pub record: RecordView,
    /// Every sample of the same animal, this one included, oldest first.
    pub samples_of_the_animal: Vec<SampleView>,
    pub carcass: Option<CarcassView>,
    pub events: Vec<FieldworkEvent>,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sample_codes_are_plain_and_short() {
        assert_eq!(sample_code_problem("WRK-2026:0042_a.1"), None);
        assert!(sample_code_problem("").unwrap().contains("empty"));
        assert!(sample_code_problem("tube 4").unwrap().contains("' '"));
        assert!(sample_code_problem("a/b").unwrap().contains("'/'"));
        assert!(sample_code_problem(&"x".repeat(SAMPLE_CODE_MAX + 1)).unwrap().contains("64"));
    }

    #[test]
    fn reports_are_checked_beyond_their_types() {
        let now: DateTime<Utc> = "2026-05-01T12:00:00Z".parse().unwrap();
        let report = |who: &str, at: &str| ResponseReport {
            who_went: Text::parse(who).unwrap(),
            went_at: DateTime::parse_from_rfc3339(at).unwrap(),
            outcome: ResponseOutcome::NotFound,
            notes: None,
        };
        assert_eq!(report("Nia", "2026-05-01T12:05:00+00:00").check(now), Ok(()), "within the clock tolerance");
        assert_eq!(report("  ", "2026-05-01T11:00:00+00:00").check(now).unwrap_err().field, "who_went");
        assert_eq!(report("Nia", "2026-05-01T14:00:00+01:00").check(now).unwrap_err().field, "went_at");
        let sample = |code: &str, held: &str| SampleInput {
            kind: SampleKind::Vertebrae,
            code: code.into(),
            preservation: Preservation::Frozen,
            stored_at: Text::parse("freezer 2").unwrap(),
            held_by: Text::parse(held).unwrap(),
            notes: None,
        };
        assert_eq!(sample("V-1", "the museum").check(), Ok(()));
        assert_eq!(sample("V 1", "the museum").check().unwrap_err().field, "code");
        assert_eq!(sample("V-1", "").check().unwrap_err().field, "held_by");
    }

    #[test]
    fn a_response_report_refuses_unknown_outcomes_and_fields() {
        let ok = r#"{"who_went":"Nia and Tom","went_at":"2026-05-01T10:20:00+01:00","outcome":"returned_to_sea","notes":null}"#;
        assert_eq!(serde_json::from_str::<ResponseReport>(ok).unwrap().outcome, ResponseOutcome::ReturnedToSea);
        let unknown = ok.replace("returned_to_sea", "released");
        assert!(serde_json::from_str::<ResponseReport>(&unknown).unwrap_err().to_string().contains("unknown variant"));
        let extra = ok.replace(r#""notes":null"#, r#""notes":null,"phone":"0"#);
        assert!(serde_json::from_str::<ResponseReport>(&extra).unwrap_err().to_string().contains("unknown field"));
    }
}
