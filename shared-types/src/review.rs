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
    /// A trained responder: sees live-animal records and logs what was done.
    Responder,
}

impl Role {
    pub fn code(self) -> &'static str {
        match self {
            Self::Observer => "observer",
            Self::Reviewer => "reviewer",
            Self::Admin => "admin",
            Self::Responder => "responder",
        }
    }

    pub fn from_code(code: &str) -> Option<Self> {
        [Self::Observer, Self::Reviewer, Self::Admin, Self::Responder].into_iter().find(|r| r.code() == code)
    }
}

/// `POST /api/session`.
#[derive(Debug, Clone, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LoginRequest {
    #[serde(deserialize_with = "crate::limits::string::<_, { crate::limits::MAX_NAME_CHARS }>")]
    pub username: String,
    #[serde(deserialize_with = "crate::limits::string::<_, { crate::limits::MAX_PASSWORD_CHARS }>")]
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

/// `POST /api/devices`: a phone asks for its identity on first sync; also
/// `PUT /api/my/profile`, when the observer gives or changes these later.
#[derive(Debug, Clone, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DeviceRequest {
    pub display_name: Option<Text>,
    /// Never exported, never shown to the public.
    pub contact: Option<Text>,
    /// Whether the observer agreed to have their name published with their records in
    /// open data. Absent means no: without it, exports carry a pseudonymous label instead.
    #[serde(default)]
    pub name_public: bool,
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
    Confirm {
        scientific_name: Text,
        #[serde(deserialize_with = "crate::limits::string::<_, { crate::limits::MAX_NAME_CHARS }>")]
        taxon_rank: String,
        remark: Option<Text>,
    },
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

/// One row of the audit trail: who (`by`), when (`at`), what changed (`action`, the
/// states, `detail`) and why (`reason`: the reviewer's reason, remark or question).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReviewEvent {
    pub action: String,
    pub from_state: ReviewState,
    pub to_state: ReviewState,
    pub by: Option<String>,
    pub detail: Option<String>,
    #[serde(default)]
    pub reason: Option<String>,
    pub at: DateTime<Utc>,
}

/// What the queue can be filtered by, and what raises a record in it: the flags raised
/// on arrival, an undecided possible duplicate, and the photo checks.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum QueueFlag {
    Oversize,
    OutOfRange,
    PossibleDuplicate,
    /// A photo's EXIF time is long before the record's.
    TakenLongBeforeRecord,
    /// A photo's EXIF position is far from the record's.
    TakenFarFromRecord,
}

impl QueueFlag {
    pub const ALL: [QueueFlag; 5] = [
        Self::Oversize,
        Self::OutOfRange,
        Self::PossibleDuplicate,
        Self::TakenLongBeforeRecord,
        Self::TakenFarFromRecord,
    ];

    pub fn label(self) -> &'static str {
        match self {
            Self::Oversize => "oversize",
            Self::OutOfRange => "out of range",
            Self::PossibleDuplicate => "possible duplicate",
            Self::TakenLongBeforeRecord => "photo older than the record",
            Self::TakenFarFromRecord => "photo far from the record",
        }
    }
}

/// The guided key run again on the server from a record's stored answers, for the
/// reviewer: the questions with the observer's answers, and the species ranked with
/// the reasons for and against each.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct KeyReplay {
    pub answers: Vec<KeyAnswer>,
    /// Most probable first (at most a handful).
    pub suggestions: Vec<KeySuggestion>,
    /// Why the answers could not be replayed (the checklist changed since), if so.
    pub problem: Option<String>,
}

/// One question of the key and the observer's answer, in words.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct KeyAnswer {
    pub question: String,
    pub answer: String,
}

/// One species the key suggests for the answers.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct KeySuggestion {
    pub scientific_name: String,
    pub common_name: Option<String>,
    pub probability: f64,
    pub reasons: Vec<KeyReason>,
}

/// A reason a species rose or fell: `supports`, `against` or `neutral`, and the words.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct KeyReason {
    pub effect: String,
    pub text: String,
}

/// One change to a sign-in, for the admin's audit trail.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct PersonEvent {
    /// Whose sign-in changed.
    pub username: String,
    /// `added`, `role_changed`, `password_reset`, `turned_off`, `turned_on`.
    pub action: String,
    pub detail: Option<String>,
    /// The admin's username; absent when done on the server's command line.
    pub by: Option<String>,
    pub at: DateTime<Utc>,
}

/// A record in the review queue, with why it stands where it does.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct QueueItem {
    pub record: RecordView,
    pub current_taxon: Option<String>,
    pub priority_reasons: Vec<PriorityReason>,
}

/// One reason a record stands where it does in the queue: what it says, as data, for the
/// desk to put in its reviewer's language, and the server's English words for it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct PriorityReason {
    pub said: PrioritySaid,
    pub text: String,
}

/// What a priority reason says.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum PrioritySaid {
    /// A live animal, and no responder has logged what was done.
    LiveAnimalNoResponse,
    /// The record's taxon is protected (`holds_species`: a higher taxon holding one that is).
    Protected { taxon: String, holds_species: bool },
    /// The record's taxon is sensitive: its public locations are generalised.
    Sensitive { taxon: String, holds_species: bool },
    /// A flag raised on arrival; its reason is the server's words alone (`text`).
    Arrival { flag: crate::record::FlagKind },
    /// Possibly the same animal as another report.
    PossibleDuplicate,
    /// Photo `photo` (from 1) was taken `seconds` before the record, over `limit_hours`.
    PhotoOlder { photo: usize, seconds: Option<f64>, limit_hours: i64 },
    /// Photo `photo` was taken `metres` from the record's place, over `limit_km` beyond
    /// both uncertainties.
    PhotoFar { photo: usize, metres: Option<f64>, limit_km: f64 },
    /// Photo `photo`'s file ends before its picture does.
    PhotoCutShort { photo: usize },
}

impl PriorityReason {
    /// A reason whose English the server makes from what it says.
    pub fn from_said(said: PrioritySaid) -> Self {
        let text = said.english();
        Self { said, text }
    }

    /// A flag raised on arrival, with the reason it was raised with.
    pub fn arrival(flag: crate::record::FlagKind, reason: String) -> Self {
        Self { said: PrioritySaid::Arrival { flag }, text: reason }
    }
}

impl PrioritySaid {
    /// The server's English (an arrival flag's reason is kept as it was raised).
    fn english(&self) -> String {
        let may_be = |holds: &bool| if *holds { " (or holds species that are)" } else { "" };
        match self {
            Self::LiveAnimalNoResponse => "a live animal: no response logged yet".into(),
            Self::Protected { taxon, holds_species } => format!("{taxon} is protected{}", may_be(holds_species)),
            Self::Sensitive { taxon, holds_species } => {
                format!("{taxon} is sensitive{}: its public locations are generalised", may_be(holds_species))
            }
            Self::Arrival { flag } => format!("{flag:?}"),
            Self::PossibleDuplicate => "possibly the same animal as another report: compare them".into(),
            Self::PhotoOlder { photo, seconds, limit_hours } => format!(
                "photo older than the record: photo {photo} was taken {} before it (more than {limit_hours} h): an older photo reused?",
                seconds.map_or("long".into(), hours_words)
            ),
            Self::PhotoFar { photo, metres, limit_km } => format!(
                "photo far from the record: photo {photo} was taken {} from its place (more than {limit_km:.0} km beyond both uncertainties)",
                metres.map_or("far".into(), distance_words)
            ),
            Self::PhotoCutShort { photo } => {
                format!("photo {photo}'s file is cut short: part of the picture is missing")
            }
        }
    }
}

/// Everything a reviewer needs to decide.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReviewDetail {
    pub record: RecordView,
    pub identifications: Vec<Identification>,
    pub messages: Vec<Message>,
    pub events: Vec<ReviewEvent>,
    pub priority_reasons: Vec<PriorityReason>,
    /// Other reports that may be the same animal, best first.
    #[serde(default)]
    pub duplicates: Vec<DuplicateView>,
    /// The guided key replayed from the record's answers, when the observer used it.
    #[serde(default)]
    pub key: Option<KeyReplay>,
    /// A live animal: responders must hear of it; it stays first in the queue until a
    /// response is logged.
    #[serde(default)]
    pub urgent: bool,
    /// How the responders were told (for an urgent record), by each channel.
    #[serde(default)]
    pub notifications: Vec<crate::fieldwork::NotificationView>,
    /// What responders did, oldest first.
    #[serde(default)]
    pub responses: Vec<crate::fieldwork::ResponseView>,
    /// Samples taken from the animal (from any of its reports), oldest first.
    #[serde(default)]
    pub samples: Vec<crate::fieldwork::SampleView>,
    /// The carcass's fate and what an examination found.
    #[serde(default)]
    pub carcass: Option<crate::fieldwork::CarcassView>,
    /// Who sent it and how to reach them, as the observer gave it ("About you"): for
    /// reviewers only, never exported or shown to anyone else.
    #[serde(default)]
    pub observer: Option<ObserverContact>,
    /// How the current identification reads against the checklist, and what the public
    /// sees of the record's place because of it (`None`: no identification yet).
    #[serde(default)]
    pub name_reading: Option<NameReading>,
}

/// The name and contact an observer chose to give, shown to reviewers on their records.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ObserverContact {
    pub display_name: Option<String>,
    pub contact: Option<String>,
}

/// A typed name as the server reads it, for the reviewer.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct NameReading {
    /// The current identification as written.
    pub typed: String,
    /// What it was read as and how ("Squatina squatina (species): matched a common
    /// name …"), or that it did not resolve and why.
    pub reading: String,
    /// Whether it resolved to a checklist taxon.
    pub resolved: bool,
    /// Where the public sees the record, in words: as recorded, or generalised and why.
    pub public_place: String,
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
    /// Why the record is in its state, in the reviewer's words, when they gave one: the
    /// reason a record is not confirmable, a confirmation's remark.
    #[serde(default)]
    pub state_reason: Option<String>,
}

/// An observer's answer to a reviewer (multipart `reply` JSON part, plus `photo` parts).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Reply {
    /// Made on the phone; a resend is not a second reply.
    pub client_id: Uuid,
    pub message: Text,
    /// What the phone read from each original photo's EXIF, in photo order, before it
    /// made the upload copy (as `Submission::photo_exif`). Left out when empty.
    #[serde(
        default,
        skip_serializing_if = "Vec::is_empty",
        deserialize_with = "crate::limits::list::<_, crate::record::PhotoExif, { crate::limits::MAX_PHOTOS_PER_RECORD }>"
    )]
    pub photo_exif: Vec<crate::record::PhotoExif>,
}

/// A time gap in words: "30.0 h", or "3.2 days" from three days up.
pub fn hours_words(seconds: f64) -> String {
    let hours = seconds / 3600.0;
    if hours.abs() >= 72.0 { format!("{:.1} days", hours / 24.0) } else { format!("{hours:.1} h") }
}

/// A distance in words: "350 m", or "2.4 km" from a kilometre up.
pub fn distance_words(metres: f64) -> String {
    if metres >= 1000.0 { format!("{:.1} km", metres / 1000.0) } else { format!("{metres:.0} m") }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn gaps_and_distances_read_with_their_units() {
        assert_eq!(hours_words(30.0 * 3600.0), "30.0 h");
        assert_eq!(hours_words(-1800.0), "-0.5 h");
        assert_eq!(hours_words(3.0 * 86400.0), "3.0 days");
        assert_eq!(distance_words(349.6), "350 m");
        assert_eq!(distance_words(2440.0), "2.4 km");
    }
}
