//! Intake: turns what a phone sent into a stored observation, or into a refusal that
//! names what is wrong. Nothing is half-stored: photo files are written (by content,
//! so a retry rewrites nothing) before the one database transaction that links them.

pub mod flags;
pub mod gate;
pub mod images;
pub mod photo_checks;
pub mod photos;
pub mod walks;

use chrono::{DateTime, Utc};
use sha2::{Digest as _, Sha256};
pub use shared_types::exif;
use shared_types::{Receipt, Submission};

use crate::store::Store;
use crate::store::observations::{self, Insertion, NewObservation, StoredPhoto};
use crate::taxa::TaxonIndex;
use images::ImageProblem;
use photos::{MAX_PHOTO_BYTES, MAX_PHOTOS_PER_RECORD, PhotoFormat, Rendition};

/// What intake needs of the server: the store, the photo folder, the turns for decoding
/// and the checklist. Cheap to clone (each part is shared).
#[derive(Clone)]
pub struct Intake {
    pub store: Store,
    pub photos: photos::PhotoFiles,
    pub decode_gate: gate::DecodeGate,
    pub taxa: std::sync::Arc<TaxonIndex>,
}

/// The raw parts of one submission.
#[derive(Debug, Default)]
pub struct Upload {
    pub record_json: Vec<u8>,
    pub photos: Vec<Vec<u8>>,
}

/// Why intake refused a submission, in words for the observer.
#[derive(Debug, thiserror::Error)]
pub enum IntakeError {
    #[error("the record is not valid JSON: {0}")]
    NotJson(String),
    #[error("{field}: {message}")]
    Field { field: String, message: String },
    #[error("photo {number}: {problem}")]
    Photo { number: usize, problem: PhotoProblem },
    #[error("a record may carry at most {MAX_PHOTOS_PER_RECORD} photos, this one has {0}")]
    TooManyPhotos(usize),
    #[error("record {0} was already received with different content; a changed record needs a new id")]
    Conflict(uuid::Uuid),
    #[error(transparent)]
    Storage(#[from] anyhow::Error),
}

/// What is wrong with one photo. Each is found before anything is stored.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum PhotoProblem {
    #[error("the file is empty")]
    Empty,
    #[error("{0} bytes is over the limit of {mib} MiB ({MAX_PHOTO_BYTES} bytes) for one photo", mib = MAX_PHOTO_BYTES >> 20)]
    TooManyBytes(usize),
    #[error("not a JPEG or PNG image (checked by its first bytes); send the photo as JPEG")]
    NotAnImage,
    #[error("{0}")]
    Image(#[from] ImageProblem),
}

/// The result of a successful intake.
#[derive(Debug, Clone, PartialEq)]
pub struct Accepted {
    pub receipt: Receipt,
    /// True when this was a resend of a record already stored.
    pub replayed: bool,
    /// A live animal: responders must hear of it (`Submission::is_urgent`).
    pub urgent: bool,
}

/// Reads JSON into `T`, naming the field at fault when it does not fit.
pub fn parse_json<T: serde::de::DeserializeOwned>(json: &[u8]) -> Result<T, IntakeError> {
    let mut reader = serde_json::Deserializer::from_slice(json);
    serde_path_to_error::deserialize(&mut reader).map_err(|err| {
        if err.inner().is_syntax() || err.inner().is_eof() {
            return IntakeError::NotJson(err.into_inner().to_string());
        }
        let path = err.path().to_string();
        let message = err.into_inner().to_string();
        // serde names a missing field only in its message; lift it into the path.
        let field = match (path.as_str(), missing_field(&message)) {
            (".", Some(name)) => name.to_owned(),
            (path, Some(name)) => format!("{path}.{name}"),
            (path, None) => path.to_owned(),
        };
        IntakeError::Field { field, message }
    })
}

/// Reads and checks a record submission.
pub fn parse_submission(json: &[u8], now: DateTime<Utc>) -> Result<Submission, IntakeError> {
    let submission: Submission = parse_json(json)?;
    submission.check(now).map_err(|problem| IntakeError::Field {
        field: match problem {
            shared_types::SubmissionProblem::InTheFuture(_) => "observed_at".into(),
            shared_types::SubmissionProblem::RepeatedSign(_) => "human_signs".into(),
            shared_types::SubmissionProblem::UnknownRank(_) => "key_choice.taxon_rank".into(),
            shared_types::SubmissionProblem::BadProbability(_) => "key_choice.probability".into(),
            shared_types::SubmissionProblem::LengthOfEggCase => "length".into(),
        },
        message: problem.to_string(),
    })?;
    Ok(submission)
}

fn missing_field(message: &str) -> Option<&str> {
    message.strip_prefix("missing field `")?.split('`').next()
}

/// Checks, stores and links everything in `upload`. The follow-up stages (the search for
/// duplicates) are `crate::arrival`'s.
pub async fn accept(
    state: &Intake,
    upload: Upload,
    observer_id: Option<i64>,
    now: DateTime<Utc>,
) -> Result<Accepted, IntakeError> {
    let submission = parse_submission(&upload.record_json, now)?;
    if submission.photo_exif.len() > upload.photos.len() {
        return Err(IntakeError::Field {
            field: "photo_exif".into(),
            message: format!(
                "lists EXIF for {} photos but {} came with the record",
                submission.photo_exif.len(),
                upload.photos.len()
            ),
        });
    }
    check_walk_owner(state, &submission, observer_id).await?;
    let mut stored = store_photos(state, upload.photos, *submission.observed_at.offset()).await?;
    compare_photos(&submission, &mut stored, &submission.photo_exif);
    let (flags, guessed_taxon) = arrival_flags(state, &submission).await?;
    let new = NewObservation {
        content_sha256: content_hash(&submission, &stored),
        submission,
        photos: stored,
        flags,
        guessed_taxon,
        observer_id,
    };
    let client_id = new.submission.client_id;
    let urgent = new.submission.is_urgent();
    let outcome = state
        .store
        .run(move |conn| observations::insert_observation(conn, &new, now))
        .await
        .map_err(anyhow::Error::from)?;
    match outcome {
        Insertion::Created(receipt) => Ok(Accepted { receipt, replayed: false, urgent }),
        Insertion::Replayed(receipt) => Ok(Accepted { receipt, replayed: true, urgent }),
        Insertion::Conflict => Err(IntakeError::Conflict(client_id)),
    }
}

/// Refuses a record that names a walk another phone sent (walk ids are public in
/// exports). A walk not stored yet may be named: records can arrive before their walk.
async fn check_walk_owner(
    state: &Intake,
    submission: &Submission,
    observer_id: Option<i64>,
) -> Result<(), IntakeError> {
    let Some(walk) = submission.walk_client_id else { return Ok(()) };
    let owner = state
        .store
        .run(move |conn| crate::store::walks::walk_observer(conn, walk))
        .await
        .map_err(anyhow::Error::from)?;
    match owner {
        Some(Some(owner)) if observer_id != Some(owner) => Err(IntakeError::Field {
            field: "walk_client_id".into(),
            message: format!("walk {walk} was sent from another phone"),
        }),
        _ => Ok(()),
    }
}

/// Adds the phone's readings (`phone`, in photo order) to stored photos and compares each
/// photo with the record's time and place (`photo_checks`). Records and observers'
/// replies go through here alike.
pub fn compare_photos(record: &Submission, stored: &mut [StoredPhoto], phone: &[shared_types::PhotoExif]) {
    let record_offset = *record.observed_at.offset();
    for (index, photo) in stored.iter_mut().enumerate() {
        let reading = phone.get(index);
        photo.phone_exif = reading.map(|reading| phone_reading(reading, record_offset));
        photo.exif = with_device_offset(std::mem::take(&mut photo.exif), reading, record_offset);
        photo.check = photo_checks::compare(record, &photo.exif, photo.phone_exif.as_ref());
    }
}

/// Checks and writes photo files. The cheap checks (count, bytes, magic) run on every
/// photo first; then each is decoded in turn through the server's decode gate (hashing,
/// EXIF, decoding and derivatives are blocking work); only when all have passed are the
/// files written, so a bad photo refuses the record before any file is stored.
pub async fn store_photos(
    state: &Intake,
    photos: Vec<Vec<u8>>,
    record_offset: chrono::FixedOffset,
) -> Result<Vec<StoredPhoto>, IntakeError> {
    if photos.len() > MAX_PHOTOS_PER_RECORD {
        return Err(IntakeError::TooManyPhotos(photos.len()));
    }
    for (index, bytes) in photos.iter().enumerate() {
        check_photo(bytes).map_err(|problem| IntakeError::Photo { number: index + 1, problem })?;
    }
    let mut prepared = Vec::with_capacity(photos.len());
    for (index, bytes) in photos.into_iter().enumerate() {
        let one =
            state.decode_gate.run(move || prepare_photo(bytes, record_offset)).await.map_err(anyhow::Error::from)?;
        prepared.push(one.map_err(|problem| IntakeError::Photo { number: index + 1, problem })?);
    }
    let photo_files = state.photos.clone();
    tokio::task::spawn_blocking(move || write_photo_files(&photo_files, prepared))
        .await
        .map_err(|err| anyhow::anyhow!("photo task failed: {err}"))?
}

/// Flags for reviewers and the species' scientific name, when the record names a
/// checklist species.
async fn arrival_flags(
    state: &Intake,
    submission: &Submission,
) -> Result<(Vec<shared_types::RecordFlag>, Option<String>), IntakeError> {
    let Some(taxon) = crate::intake::flags::species_of(&state.taxa, submission) else {
        return Ok((Vec::new(), None));
    };
    let name = taxon.scientific_name.clone();
    let query_name = name.clone();
    let confirmed = state
        .store
        .run(move |conn| observations::confirmed_positions(conn, &query_name))
        .await
        .map_err(anyhow::Error::from)?;
    Ok((crate::intake::flags::raise(state.taxa.checklist(), submission, taxon, &confirmed), Some(name)))
}

/// Writes each checked photo's original and derivatives durably.
fn write_photo_files(
    files: &photos::PhotoFiles,
    prepared: Vec<(Vec<u8>, images::Derivatives, StoredPhoto)>,
) -> Result<Vec<StoredPhoto>, IntakeError> {
    prepared
        .into_iter()
        .map(|(bytes, derived, stored)| {
            files.put(&stored.sha256, Rendition::Original, &bytes)?;
            files.put(&stored.sha256, Rendition::Display, &derived.display_jpeg)?;
            files.put(&stored.sha256, Rendition::Thumb, &derived.thumb_jpeg)?;
            Ok(stored)
        })
        .collect()
}

/// Everything intake learns from one photo's bytes, without storing anything. Public for
/// the fuzz loop (`server/examples/fuzz_intake.rs`), which drives exactly this.
pub fn prepare_photo(
    bytes: Vec<u8>,
    record_offset: chrono::FixedOffset,
) -> Result<(Vec<u8>, images::Derivatives, StoredPhoto), PhotoProblem> {
    let format = check_photo(&bytes)?;
    let exif = exif::resolve_time(exif::read(&bytes), record_offset);
    let derived = images::derive(&bytes, format, exif.orientation)?;
    let stored = StoredPhoto {
        sha256: photos::sha256_hex(&bytes),
        media_type: format.media_type().to_owned(),
        byte_len: bytes.len() as u64,
        width: derived.width,
        height: derived.height,
        phash: derived.phash.clone(),
        exif,
        phone_exif: None,
        check: shared_types::PhotoCheck::default(),
    };
    Ok((bytes, derived, stored))
}

/// The phone's reading as sent, with the instant worked out here from its local time
/// and offset (the server decides, with the same rule as for its own reading): the
/// photo's own offset, else the offset the phone had at the photo's local time, else
/// the record's.
fn phone_reading(phone: &shared_types::PhotoExif, record_offset: chrono::FixedOffset) -> shared_types::PhotoExif {
    let sent = shared_types::PhotoExif { taken_at: None, offset_source: None, ..phone.clone() };
    exif::resolve_time(sent, record_offset)
}

/// The server's reading of a received file whose EXIF time has no offset of its own,
/// resolved again with the offset the phone had at that photo's local time — when the
/// phone read the same local time from its original, so the offset belongs to it.
fn with_device_offset(
    received: shared_types::PhotoExif,
    phone: Option<&shared_types::PhotoExif>,
    record_offset: chrono::FixedOffset,
) -> shared_types::PhotoExif {
    let Some(phone) =
        phone.filter(|p| p.device_offset.is_some() && p.taken_local.is_some() && p.taken_local == received.taken_local)
    else {
        return received;
    };
    let again = shared_types::PhotoExif {
        taken_at: None,
        offset_source: None,
        device_offset: phone.device_offset.clone(),
        ..received
    };
    let resolved = exif::resolve_time(again, record_offset);
    // The offset is kept with the reading as its instant; the files' table is shared by records.
    shared_types::PhotoExif { device_offset: None, ..resolved }
}

/// The checks made before any decoding: not empty, not too many bytes, a known format
/// by its magic bytes. The pixel-dimension check follows in `images::decode`.
fn check_photo(bytes: &[u8]) -> Result<PhotoFormat, PhotoProblem> {
    if bytes.is_empty() {
        return Err(PhotoProblem::Empty);
    }
    if bytes.len() > MAX_PHOTO_BYTES {
        return Err(PhotoProblem::TooManyBytes(bytes.len()));
    }
    PhotoFormat::sniff(bytes).ok_or(PhotoProblem::NotAnImage)
}

/// The fingerprint of a submission's content: its canonical JSON and its photos'
/// hashes in order. The same record resent gives the same fingerprint.
fn content_hash(submission: &Submission, photos: &[StoredPhoto]) -> String {
    let mut hasher = Sha256::new();
    hasher.update(serde_json::to_vec(submission).unwrap_or_default());
    for photo in photos {
        hasher.update(b"\0photo:");
        hasher.update(photo.sha256.as_bytes());
    }
    hex::encode(hasher.finalize())
}
