//! People and review as both sides see them: roles, sign-in, the review actions a
//! reviewer can take, the identification history, the conversation with the observer,
//! and the audit trail.

use chrono::{DateTime, Utc};
use serde::{Deserialize, Serialize};
use uuid::Uuid;

use crate::record::{RecordView, ReviewState};
use crate::values::Text;

/// What a person may do.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Role {
    Observer,
    Reviewer,
    Admin,
}

impl Role {
    pub fn code(self) -> &'static str {
        match self {
            Self::Observer => "observer",
            Self::Reviewer => "reviewer",
            Self::Admin => "admin",
        }
    }

    pub fn from_code(code: &str) -> Option<Self> {
        [Self::Observer, Self::Reviewer, Self::Admin].into_iter().find(|r| r.code() == code)
    }
}

/// `POST /api/session`.
#[derive(Debug, Clone, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LoginRequest {
    pub username: String,
    pub password: String,
}

/// Who is signed in; the CSRF token must come back in `X-CSRF-Token` on every
/// state-changing request made with the session cookie.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SessionInfo {
    pub role: Role,
    pub display_name: String,
    pub csrf_token: String,
}

/// `POST /api/devices`: a phone asks for its identity on first sync.
#[derive(Debug, Clone, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DeviceRequest {
    pub display_name: Option<Text>,
    /// Never exported, never shown to the public.
    pub contact: Option<Text>,
}

/// The phone's identity: sent back as `Authorization: Bearer <token>`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct DeviceIdentity {
    pub token: String,
}

/// What a reviewer decides about a record.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "action", rename_all = "snake_case", deny_unknown_fields)]
pub enum ReviewAction {
    /// Confirm the record, at any rank, possibly changing the identification.
    Confirm { scientific_name: Text, taxon_rank: String, remark: Option<Text> },
    /// Ask the observer for more detail; the message reaches their phone.
    RequestDetails { message: Text },
    /// The record cannot be confirmed from what there is.
    NotConfirmable { reason: Text },
}

impl ReviewAction {
    pub fn code(&self) -> &'static str {
        match self {
            Self::Confirm { .. } => "confirm",
            Self::RequestDetails { .. } => "request_details",
            Self::NotConfirmable { .. } => "not_confirmable",
        }
    }
}

/// One identification in a record's history; the current one has `current: true`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Identification {
    pub taxon_name: String,
    pub taxon_rank: Option<String>,
    pub identified_by: Option<String>,
    pub identified_at: DateTime<Utc>,
    pub remarks: Option<String>,
    /// "observer guess", "observer with the guided key", "reviewer".
    pub basis: String,
    pub current: bool,
}

/// One message about a record.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Message {
    pub author_role: Role,
    pub author: Option<String>,
    pub body: String,
    pub at: DateTime<Utc>,
}

/// One row of the audit trail.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReviewEvent {
    pub action: String,
    pub from_state: ReviewState,
    pub to_state: ReviewState,
    pub by: Option<String>,
    pub detail: Option<String>,
    pub at: DateTime<Utc>,
}

/// A record in the review queue, with why it stands where it does.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct QueueItem {
    pub record: RecordView,
    pub current_taxon: Option<String>,
    pub priority_reasons: Vec<String>,
}

/// Everything a reviewer needs to decide.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReviewDetail {
    pub record: RecordView,
    pub identifications: Vec<Identification>,
    pub messages: Vec<Message>,
    pub events: Vec<ReviewEvent>,
    pub priority_reasons: Vec<String>,
    /// Other reports that may be the same animal, best first.
    #[serde(default)]
    pub duplicates: Vec<DuplicateView>,
}

/// Another report that may show the same animal, for the reviewer to compare.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct DuplicateView {
    pub other: RecordView,
    pub score: f64,
    pub reasons: Vec<String>,
    /// Geodesic distance between the two positions, metres.
    pub distance_m: Option<f64>,
    pub gap_hours: f64,
    /// "same animal" or "different animals", once decided.
    pub decision: Option<String>,
    /// The merge joining them, while it stands (it can be undone).
    pub merge_id: Option<i64>,
}

/// A reviewer's decision on a pair (`POST /api/review/records/{id}/duplicates/{other}`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct PairDecision {
    pub same_animal: bool,
}

/// An observer's own record as their phone shows it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MyRecord {
    pub record: RecordView,
    pub current_taxon: Option<String>,
    pub messages: Vec<Message>,
}

/// An observer's answer to a reviewer (multipart `reply` JSON part, plus `photo` parts).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Reply {
    /// Made on the phone; a resend is not a second reply.
    pub client_id: Uuid,
    pub message: Text,
}
