//! The record as it travels: what the phone submits ([`Submission`]), what the server
//! answers ([`Receipt`]) and how a stored record is shown ([`RecordView`]).
//!
//! A submission is one person's observation. Several observations may later turn out
//! to be one animal (an organism), and identifications form a history; those live on
//! the server, and only their current state is shown here.

use chrono::{DateTime, FixedOffset, Utc};
use serde::{Deserialize, Serialize};
use uuid::Uuid;

use crate::limits::{MAX_EXIF_TEXT_CHARS, MAX_KEY_ANSWERS, MAX_NAME_CHARS, MAX_PHOTOS_PER_RECORD};
use crate::values::{AccuracyM, Count, Latitude, LengthValue, Longitude, Text};

/// Where a position came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum PositionSource {
    /// The phone's location service, with its reported accuracy.
    Device,
    /// Typed by the observer.
    Typed,
    /// The first photo's EXIF GPS, filled in because the device had no fix.
    Photo,
}

/// A point on the WGS84 ellipsoid with its horizontal uncertainty.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Position {
    pub latitude: Latitude,
    pub longitude: Longitude,
    /// Radius in metres; `None` when unknown (never zero).
    pub accuracy_m: Option<AccuracyM>,
    pub source: PositionSource,
}

/// Which length was taken. Rays and skates are measured across or along the disc.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum LengthKind {
    Total,
    Fork,
    Precaudal,
    DiscWidth,
    DiscLength,
}

impl LengthKind {
    pub const ALL: [LengthKind; 5] = [Self::Total, Self::Fork, Self::Precaudal, Self::DiscWidth, Self::DiscLength];

    /// The same kind in the species key's terms.
    pub fn key_kind(self) -> species_key::LengthKind {
        match self {
            Self::Total => species_key::LengthKind::TotalLength,
            Self::Fork => species_key::LengthKind::ForkLength,
            Self::Precaudal => species_key::LengthKind::PrecaudalLength,
            Self::DiscWidth => species_key::LengthKind::DiscWidth,
            Self::DiscLength => species_key::LengthKind::DiscLength,
        }
    }

    /// The plain name, as used in exports (measurementType).
    pub fn label(self) -> &'static str {
        match self {
            Self::Total => "total length",
            Self::Fork => "fork length",
            Self::Precaudal => "precaudal length",
            Self::DiscWidth => "disc width",
            Self::DiscLength => "disc length",
        }
    }
}

/// Whether a length was taken with a tape or judged by eye.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum MeasureMethod {
    Measured,
    Estimated,
}

/// One length of the animal.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Length {
    pub kind: LengthKind,
    #[serde(flatten)]
    pub value: LengthValue,
    pub method: MeasureMethod,
}

/// The state the animal was found in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Condition {
    Alive,
    FreshDead,
    Decomposed,
    RemainsOnly,
}

impl Condition {
    pub const ALL: [Condition; 4] = [Self::Alive, Self::FreshDead, Self::Decomposed, Self::RemainsOnly];

    pub fn label(self) -> &'static str {
        match self {
            Self::Alive => "alive",
            Self::FreshDead => "fresh dead",
            Self::Decomposed => "decomposed",
            Self::RemainsOnly => "remains only",
        }
    }

    /// Darwin Core `vitality`.
    pub fn vitality(self) -> &'static str {
        match self {
            Self::Alive => "alive",
            _ => "dead",
        }
    }
}

/// How the animal came to be seen.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Setting {
    BeachStranding,
    AnglerCatch,
    LandingSiteOrMarket,
    FloatingAtSea,
    DiscardedBycatch,
}

impl Setting {
    pub const ALL: [Setting; 5] = [
        Self::BeachStranding,
        Self::AnglerCatch,
        Self::LandingSiteOrMarket,
        Self::FloatingAtSea,
        Self::DiscardedBycatch,
    ];

    pub fn label(self) -> &'static str {
        match self {
            Self::BeachStranding => "beach stranding",
            Self::AnglerCatch => "angler catch",
            Self::LandingSiteOrMarket => "landing site or market",
            Self::FloatingAtSea => "floating at sea",
            Self::DiscardedBycatch => "discarded bycatch",
        }
    }
}

/// Sex as the observer could tell it. Male sharks and rays carry claspers.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Sex {
    /// Claspers seen.
    Male,
    /// Looked for claspers and saw none.
    Female,
    /// Not looked at, or could not tell.
    Unknown,
}

impl Sex {
    pub const ALL: [Sex; 3] = [Self::Unknown, Self::Male, Self::Female];

    /// Darwin Core `sex` (empty when unknown).
    pub fn dwc(self) -> &'static str {
        match self {
            Self::Male => "male",
            Self::Female => "female",
            Self::Unknown => "",
        }
    }
}

/// The animal's life stage, as the observer could tell it. Sharks, skates and some rays
/// and chimaeras lay eggs in horny cases ("mermaid's purses") that wash up on the
/// strandline; walkers who promise to report every find report these too.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum LifeStage {
    /// An egg case, with or without an embryo inside, or empty after hatching.
    EggCase,
    /// An embryo or pup taken from its mother or its egg case before birth or hatching.
    Embryo,
    Juvenile,
    Adult,
}

impl LifeStage {
    pub const ALL: [LifeStage; 4] = [Self::EggCase, Self::Embryo, Self::Juvenile, Self::Adult];

    /// The plain name shown to people.
    pub fn label(self) -> &'static str {
        match self {
            Self::EggCase => "egg case",
            Self::Embryo => "embryo",
            Self::Juvenile => "juvenile",
            Self::Adult => "adult",
        }
    }

    /// Darwin Core `lifeStage`, from the GBIF Life Stage vocabulary
    /// (rs.gbif.org/vocabulary/gbif/life_stage): `embryo`, `juvenile` and `adult` are its
    /// preferred terms; `egg` is a term it lists under `embryo`, kept because an egg case
    /// may be empty.
    pub fn dwc(self) -> &'static str {
        match self {
            Self::EggCase => "egg",
            Self::Embryo => "embryo",
            Self::Juvenile => "juvenile",
            Self::Adult => "adult",
        }
    }
}

/// Signs that people or fishing gear were involved.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum HumanSign {
    Hook,
    Line,
    NetMarks,
    FinsRemoved,
    BoatStrike,
}

impl HumanSign {
    pub const ALL: [HumanSign; 5] = [Self::Hook, Self::Line, Self::NetMarks, Self::FinsRemoved, Self::BoatStrike];

    pub fn label(self) -> &'static str {
        match self {
            Self::Hook => "hook",
            Self::Line => "line",
            Self::NetMarks => "net marks",
            Self::FinsRemoved => "fins removed",
            Self::BoatStrike => "boat strike",
        }
    }
}

/// What the phone sends for one observation. Photos travel beside it in the same
/// request, in the order they were taken.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Submission {
    /// Made on the phone when the record is first saved; a resend carries the same id,
    /// so the server can tell a retry from a new record.
    pub client_id: Uuid,
    /// When the animal was seen, with the phone's UTC offset at the time.
    pub observed_at: DateTime<FixedOffset>,
    pub position: Option<Position>,
    pub species_guess: Option<Text>,
    pub length: Option<Length>,
    pub sex: Sex,
    pub count: Count,
    pub condition: Condition,
    pub setting: Setting,
    #[serde(default, deserialize_with = "crate::limits::list::<_, HumanSign, { HumanSign::ALL.len() }>")]
    pub human_signs: Vec<HumanSign>,
    pub notes: Option<Text>,
    /// The name the observer chose to be credited with; may be empty.
    pub observer_name: Option<Text>,
    /// What the phone read from each original photo's EXIF, in photo order, before it
    /// made the upload copy (which carries no EXIF). Empty from phones that did not read
    /// it; left out of the JSON when empty, so older records hash as before.
    #[serde(
        default,
        skip_serializing_if = "Vec::is_empty",
        deserialize_with = "crate::limits::list::<_, PhotoExif, MAX_PHOTOS_PER_RECORD>"
    )]
    pub photo_exif: Vec<PhotoExif>,
    /// What the guided key suggested and the observer picked, with the answers given.
    /// Left out of the JSON when absent, so records made without the key keep the
    /// same content fingerprint.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub key_choice: Option<KeyChoice>,
    /// The survey walk this record was made on, if any (the walk's own client id; the
    /// walk itself may arrive later). Left out when absent, like `key_choice`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub walk_client_id: Option<Uuid>,
    /// The life stage, when the observer chose one. Left out when absent, so records made
    /// before it existed keep their content fingerprint.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub life_stage: Option<LifeStage>,
}

/// Ranks an observer may stop the key at (Darwin Core `taxonRank` values).
pub const KEY_RANKS: [&str; 5] = ["species", "genus", "family", "order", "superorder"];

/// The taxon an observer picked with the guided key.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct KeyChoice {
    /// Darwin Core `scientificName` of the pick, at `taxon_rank`.
    pub scientific_name: Text,
    /// Darwin Core `taxonRank`: one of [`KEY_RANKS`].
    #[serde(deserialize_with = "crate::limits::string::<_, MAX_NAME_CHARS>")]
    pub taxon_rank: String,
    /// The key's probability for the pick when it was made, 0 to 1.
    pub probability: f64,
    /// Character → chosen state, or `notSure`.
    #[serde(default, deserialize_with = "crate::limits::name_map::<_, MAX_KEY_ANSWERS>")]
    pub answers: std::collections::BTreeMap<String, String>,
}

/// Refusals of a submission that are about the whole record rather than one value.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SubmissionProblem {
    #[error("key_choice.taxon_rank must be one of {KEY_RANKS:?}, got {0}")]
    UnknownRank(String),
    #[error("key_choice.probability must be between 0 and 1, got {0}")]
    BadProbability(f64),
    #[error("the time {0} is in the future: give the time the animal was seen")]
    InTheFuture(DateTime<FixedOffset>),
    #[error("human_signs lists {0:?} twice")]
    RepeatedSign(HumanSign),
    #[error("length: an egg case has no body length; leave the length empty and write the case's size in the notes")]
    LengthOfEggCase,
}

/// How far ahead of the server's clock a record may claim to be, for phones whose
/// clocks run fast (common practice: a few minutes of drift is normal).
pub const CLOCK_TOLERANCE_MINUTES: i64 = 10;

impl Submission {
    /// A live animal needs trained responders at once: the phone sends such a record
    /// first and the server tells the responders as soon as it is stored.
    pub fn is_urgent(&self) -> bool {
        self.condition == Condition::Alive
    }

    /// Checks what serde cannot check field by field.
    pub fn check(&self, now: DateTime<Utc>) -> Result<(), SubmissionProblem> {
        if self.observed_at.with_timezone(&Utc) > now + chrono::Duration::minutes(CLOCK_TOLERANCE_MINUTES) {
            return Err(SubmissionProblem::InTheFuture(self.observed_at));
        }
        if let Some(choice) = &self.key_choice {
            if !KEY_RANKS.contains(&choice.taxon_rank.as_str()) {
                return Err(SubmissionProblem::UnknownRank(choice.taxon_rank.clone()));
            }
            if !(0.0..=1.0).contains(&choice.probability) {
                return Err(SubmissionProblem::BadProbability(choice.probability));
            }
        }
        let mut signs = self.human_signs.clone();
        signs.sort();
        if let Some(pair) = signs.windows(2).find(|pair| pair[0] == pair[1]) {
            return Err(SubmissionProblem::RepeatedSign(pair[0]));
        }
        // Lengths are body measures (total, fork, disc…): an egg case's size is not one,
        // and taken as one it would raise false "oversize" or size-prior signals.
        if self.life_stage == Some(LifeStage::EggCase) && self.length.is_some() {
            return Err(SubmissionProblem::LengthOfEggCase);
        }
        Ok(())
    }
}

/// What the server answers once a submission and its photos are durably stored. A
/// resend of the same submission gets the same receipt.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Receipt {
    pub client_id: Uuid,
    /// The server's own number for the observation.
    pub observation_id: i64,
    pub received_at: DateTime<Utc>,
    pub photo_count: usize,
}

/// Review states of an observation.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ReviewState {
    AwaitingReview,
    DetailsRequested,
    Confirmed,
    NotConfirmable,
    Merged,
}

impl ReviewState {
    pub fn label(self) -> &'static str {
        match self {
            Self::AwaitingReview => "awaiting review",
            Self::DetailsRequested => "details requested",
            Self::Confirmed => "confirmed",
            Self::NotConfirmable => "not confirmable",
            Self::Merged => "merged",
        }
    }

    pub fn code(self) -> &'static str {
        match self {
            Self::AwaitingReview => "awaiting_review",
            Self::DetailsRequested => "details_requested",
            Self::Confirmed => "confirmed",
            Self::NotConfirmable => "not_confirmable",
            Self::Merged => "merged",
        }
    }

    pub fn from_code(code: &str) -> Option<Self> {
        [Self::AwaitingReview, Self::DetailsRequested, Self::Confirmed, Self::NotConfirmable, Self::Merged]
            .into_iter()
            .find(|state| state.code() == code)
    }
}

/// Which UTC offset turned a photo's local EXIF time into an instant.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum OffsetSource {
    /// The photo's own OffsetTimeOriginal tag.
    Photo,
    /// The phone's UTC offset at the photo's local time, which the phone sent with its
    /// reading (the photo had no offset of its own). Across a daylight-saving change
    /// this is not the record's offset.
    Device,
    /// The record's UTC offset (the photo had none and the phone sent none).
    Record,
}

/// What a photo's EXIF says, kept apart from what the phone said.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct PhotoExif {
    /// DateTimeOriginal (+ SubSecTimeOriginal) as written: local time, no zone.
    #[serde(default, deserialize_with = "crate::limits::optional_string::<_, MAX_EXIF_TEXT_CHARS>")]
    pub taken_local: Option<String>,
    /// OffsetTimeOriginal, e.g. "+01:00".
    #[serde(default, deserialize_with = "crate::limits::optional_string::<_, MAX_EXIF_TEXT_CHARS>")]
    pub offset: Option<String>,
    /// The instant, when an offset was available.
    pub taken_at: Option<DateTime<FixedOffset>>,
    pub offset_source: Option<OffsetSource>,
    pub latitude: Option<f64>,
    pub longitude: Option<f64>,
    pub altitude_m: Option<f64>,
    /// GPSHPositioningError, metres.
    pub horizontal_error_m: Option<f64>,
    pub orientation: Option<u16>,
    /// The phone's UTC offset at the photo's local time, e.g. "+00:00", which the phone
    /// used because the photo had no OffsetTimeOriginal. Sent by the phone, never read
    /// from a file; left out of the JSON when absent, so older records hash as before.
    #[serde(
        default,
        skip_serializing_if = "Option::is_none",
        deserialize_with = "crate::limits::optional_string::<_, MAX_EXIF_TEXT_CHARS>"
    )]
    pub device_offset: Option<String>,
    /// SHA-256 of the original file the phone read (the phone's reading only; the server
    /// names the file it received by its own hash). Left out of the JSON when absent, so
    /// records sent before phones computed it keep their content fingerprint.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub original_sha256: Option<crate::Sha256Hex>,
}

/// A question the server raises about a photo, for the reviewer.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum PhotoFlag {
    /// The photo's EXIF time is long before the record's time: an old photo reused?
    TakenLongBeforeRecord,
    /// The photo's EXIF position is far from the record's: a photo from elsewhere?
    TakenFarFromRecord,
    /// The file ends before its image data does (a JPEG with no end-of-image marker
    /// after its scan): the picture decodes only as far as the data goes. Kept, since it
    /// may be the only evidence, and flagged for the reviewer.
    CutShort,
}

impl PhotoFlag {
    pub fn label(self) -> &'static str {
        match self {
            Self::TakenLongBeforeRecord => "photo taken long before the record",
            Self::TakenFarFromRecord => "photo taken far from the record's place",
            Self::CutShort => "photo file cut short: part of the picture is missing",
        }
    }
}

/// Who read the EXIF facts a comparison used.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ExifReading {
    /// The server, from the file it received.
    ReceivedFile,
    /// The phone, from the original before it made the upload copy.
    Phone,
}

/// A photo compared with the record it came with (the same photo in two records is
/// compared with each).
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct PhotoCheck {
    /// Whose EXIF time was compared: the server's reading of the file it received, or
    /// (when that file had no time, as upload copies do) the phone's of the original.
    pub time_reading: Option<ExifReading>,
    /// Whose EXIF position was compared, chosen the same way on its own: a file with a
    /// time but no GPS still has its position from the phone's reading.
    pub place_reading: Option<ExifReading>,
    /// Record time minus the photo's EXIF time, seconds (negative: photo after record).
    pub seconds_before_record: Option<f64>,
    /// Geodesic distance (WGS84) from the record's position to the photo's, metres.
    pub metres_from_record: Option<f64>,
    pub flags: Vec<PhotoFlag>,
}

/// A stored photo as listed with its record. `/photos/{sha256}` is its display copy,
/// `/photos/{sha256}/thumb` its thumbnail (neither carries EXIF), and
/// `/photos/{sha256}/original` the file as received (reviewers only).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct PhotoView {
    /// SHA-256 of the original file, hex.
    pub sha256: String,
    /// Media type of the original.
    pub media_type: String,
    pub byte_len: u64,
    /// Pixel size of the original as stored (before orientation); absent for photos
    /// stored before sizes were kept.
    #[serde(default)]
    pub width: Option<u32>,
    #[serde(default)]
    pub height: Option<u32>,
    /// 64-bit DCT perceptual hash of the upright image, 16 hex digits: near-duplicates
    /// differ in few bits.
    #[serde(default)]
    pub phash: Option<String>,
    /// The server's reading of the file it received.
    pub exif: PhotoExif,
    /// The phone's reading of the original, as the phone sent it (with the instant
    /// resolved by the server), when it sent one.
    #[serde(default)]
    pub phone_exif: Option<PhotoExif>,
    /// The photo's EXIF against this record's time and place; absent before migration 0003.
    #[serde(default)]
    pub check: PhotoCheck,
}

/// A stored photo that looks like another (perceptual hashes close), for duplicate review.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct SimilarPhoto {
    pub sha256: String,
    /// Differing bits between the two 64-bit perceptual hashes (0 = alike).
    pub distance_bits: u32,
    /// Observations that carry this photo.
    pub observation_ids: Vec<i64>,
}

/// Something a reviewer should look at, with the reason in plain words.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RecordFlag {
    pub kind: FlagKind,
    pub reason: String,
}

/// Kinds of flag raised on arrival.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum FlagKind {
    /// The length is well over the species' known maximum.
    Oversize,
    /// Outside the species' known areas and far from any confirmed record of it.
    OutOfRange,
}

/// A stored observation as the server shows it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RecordView {
    pub observation_id: i64,
    pub organism_id: i64,
    pub received_at: DateTime<Utc>,
    pub review_state: ReviewState,
    pub submission: Submission,
    pub photos: Vec<PhotoView>,
    #[serde(default)]
    pub flags: Vec<RecordFlag>,
    /// The walk the record is on: as submitted, or linked after the fact.
    #[serde(default)]
    pub walk_client_id: Option<Uuid>,
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample() -> &'static str {
        r#"{"client_id":"2f1c9a3e-55b4-4c61-9a8e-0d5a54c1f0aa",
            "observed_at":"2026-03-14T09:30:00+01:00",
            "position":{"latitude":52.41,"longitude":-4.09,"accuracy_m":8,"source":"device"},
            "species_guess":"thornback ray",
            "length":{"kind":"disc_width","value":48,"unit":"cm","method":"measured"},
            "sex":"female","count":1,"condition":"fresh_dead","setting":"beach_stranding",
            "human_signs":["hook"],"notes":null,"observer_name":"Gwen"}"#
    }

    #[test]
    fn a_full_submission_reads_back() {
        let sub: Submission = serde_json::from_str(sample()).unwrap();
        assert_eq!(sub.length.unwrap().value.centimetres(), 48.0);
        assert_eq!(sub.observed_at.offset().local_minus_utc(), 3600);
        let again: Submission = serde_json::from_str(&serde_json::to_string(&sub).unwrap()).unwrap();
        assert_eq!(again, sub);
    }

    #[test]
    fn a_record_from_the_future_is_refused() {
        let sub: Submission = serde_json::from_str(sample()).unwrap();
        let long_ago = DateTime::parse_from_rfc3339("2020-01-01T00:00:00Z").unwrap().with_timezone(&Utc);
        assert!(matches!(sub.check(long_ago), Err(SubmissionProblem::InTheFuture(_))));
        assert!(sub.check(DateTime::parse_from_rfc3339("2026-03-14T09:00:00Z").unwrap().with_timezone(&Utc)).is_ok());
    }

    #[test]
    fn a_life_stage_is_optional_and_leaves_older_records_unchanged() {
        let sub: Submission = serde_json::from_str(sample()).unwrap();
        assert_eq!(sub.life_stage, None);
        assert!(
            !serde_json::to_string(&sub).unwrap().contains("life_stage"),
            "absent stays out of the JSON (same fingerprint)"
        );
        let mut egg: serde_json::Value = serde_json::from_str(sample()).unwrap();
        egg["life_stage"] = "egg_case".into();
        egg["length"] = serde_json::Value::Null;
        egg["count"] = 3.into();
        let egg: Submission = serde_json::from_value(egg).unwrap();
        assert_eq!(egg.life_stage, Some(LifeStage::EggCase));
        let later = DateTime::parse_from_rfc3339("2026-03-14T09:00:00Z").unwrap().with_timezone(&Utc);
        assert!(egg.check(later).is_ok(), "an egg case needs a count, not a length");
    }

    #[test]
    fn an_egg_case_with_a_body_length_is_refused() {
        let mut sub: Submission = serde_json::from_str(sample()).unwrap();
        sub.life_stage = Some(LifeStage::EggCase);
        let later = DateTime::parse_from_rfc3339("2026-03-14T09:00:00Z").unwrap().with_timezone(&Utc);
        assert_eq!(sub.check(later), Err(SubmissionProblem::LengthOfEggCase));
        sub.life_stage = Some(LifeStage::Embryo);
        assert!(sub.check(later).is_ok(), "an embryo has a total length");
    }

    #[test]
    fn life_stages_map_to_the_gbif_life_stage_vocabulary() {
        // GBIF Life Stage vocabulary (rs.gbif.org/vocabulary/gbif/life_stage.xml): preferred
        // terms embryo, juvenile, adult; `egg` listed as an alternative term of embryo.
        let dwc: Vec<&str> = LifeStage::ALL.iter().map(|s| s.dwc()).collect();
        assert_eq!(dwc, ["egg", "embryo", "juvenile", "adult"]);
    }

    #[test]
    fn review_state_codes_round_trip() {
        for state in [ReviewState::AwaitingReview, ReviewState::Merged, ReviewState::Confirmed] {
            assert_eq!(ReviewState::from_code(state.code()), Some(state));
        }
    }
}
