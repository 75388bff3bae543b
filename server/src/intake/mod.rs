//! Intake: turns what a phone sent into a stored observation, or into a refusal that
//! names what is wrong. Nothing is half-stored: photo files are written (by content,
//! so a retry rewrites nothing) before the one database transaction that links them.

pub mod exif;
pub mod photos;
pub mod walks;

use chrono::{DateTime, Utc};
use sha2::{Digest as _, Sha256};
use shared_types::{Receipt, Submission};

use crate::AppState;
use crate::store::observations::{self, Insertion, NewObservation, StoredPhoto};
use photos::{MAX_PHOTO_BYTES, MAX_PHOTOS_PER_RECORD, PhotoFormat};

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
    #[error("photo {number}: {message}")]
    Photo { number: usize, message: String },
    #[error("a record may carry at most {MAX_PHOTOS_PER_RECORD} photos, this one has {0}")]
    TooManyPhotos(usize),
    #[error("record {0} was already received with different content; a changed record needs a new id")]
    Conflict(uuid::Uuid),
    #[error(transparent)]
    Storage(#[from] anyhow::Error),
}

/// The result of a successful intake.
#[derive(Debug, Clone, PartialEq)]
pub struct Accepted {
    pub receipt: Receipt,
    /// True when this was a resend of a record already stored.
    pub replayed: bool,
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
        },
        message: problem.to_string(),
    })?;
    Ok(submission)
}

fn missing_field(message: &str) -> Option<&str> {
    message.strip_prefix("missing field `")?.split('`').next()
}

/// Checks, stores and links everything in `upload`.
pub async fn accept(state: &AppState, upload: Upload, observer_id: Option<i64>, now: DateTime<Utc>) -> Result<Accepted, IntakeError> {
    let submission = parse_submission(&upload.record_json, now)?;
    let record_offset = *submission.observed_at.offset();
    let stored = store_photos(state, upload.photos, record_offset).await?;
    let (flags, guessed_taxon) = arrival_flags(state, &submission).await?;
    let new = NewObservation { content_sha256: content_hash(&submission, &stored), submission, photos: stored, flags, guessed_taxon, observer_id };
    let client_id = new.submission.client_id;
    let outcome = state.store.run(move |conn| observations::insert_observation(conn, &new, now)).await.map_err(anyhow::Error::from)?;
    match outcome {
        Insertion::Created(receipt) => {
            find_duplicates(state, receipt.observation_id, Utc::now()).await?;
            Ok(Accepted { receipt, replayed: false })
        }
        Insertion::Replayed(receipt) => Ok(Accepted { receipt, replayed: true }),
        Insertion::Conflict => Err(IntakeError::Conflict(client_id)),
    }
}

/// Looks for other reports of the same animal among stored records and keeps the
/// candidates for reviewers. The index lock covers the query and the insert together,
/// so of two arrivals of one animal the second always finds the first.
async fn find_duplicates(state: &AppState, observation_id: i64, now: DateTime<Utc>) -> Result<(), IntakeError> {
    let names = state.taxa.clone();
    let index = state.duplicates.clone();
    state
        .store
        .run(move |conn| {
            let Some(new) = crate::store::duplicates::raw_records(conn, &[observation_id])?.pop() else { return Ok(()) };
            let Some(new) = crate::duplicates::from_raw(&new, &names) else { return Ok(()) };
            let Some(position) = new.position else { return Ok(()) };
            let mut near = {
                let mut index = index.lock().unwrap_or_else(|p| p.into_inner());
                let near = index.possible_pairs(position, new.uncertainty_m, new.at);
                index.insert(observation_id, position, new.uncertainty_m, new.at);
                near
            };
            // The same photo file is a candidate at any distance and time.
            near.extend(crate::store::duplicates::sharing_a_photo(conn, observation_id)?);
            let others: Vec<_> = crate::store::duplicates::raw_records(conn, &near)?.iter().filter_map(|r| crate::duplicates::from_raw(r, &names)).collect();
            let found: Vec<_> = crate::duplicates::candidates(&new, &others).into_iter().map(|(id, c)| (id, c.score, c.reasons)).collect();
            crate::store::duplicates::save_candidates(conn, observation_id, &found, now)
        })
        .await
        .map_err(anyhow::Error::from)?;
    Ok(())
}

/// Checks and writes photo files (blocking work, so on the blocking pool).
pub async fn store_photos(state: &AppState, photos: Vec<Vec<u8>>, record_offset: chrono::FixedOffset) -> Result<Vec<StoredPhoto>, IntakeError> {
    if photos.len() > MAX_PHOTOS_PER_RECORD {
        return Err(IntakeError::TooManyPhotos(photos.len()));
    }
    let photo_files = state.photos.clone();
    tokio::task::spawn_blocking(move || store_photo_files(&photo_files, photos, record_offset))
        .await
        .map_err(|err| anyhow::anyhow!("photo task failed: {err}"))?
}

/// Flags for reviewers and the species' scientific name, when the record names a
/// checklist species.
async fn arrival_flags(state: &AppState, submission: &Submission) -> Result<(Vec<shared_types::RecordFlag>, Option<String>), IntakeError> {
    let Some(taxon) = crate::flags::species_of(&state.taxa, submission) else {
        return Ok((Vec::new(), None));
    };
    let name = taxon.scientific_name.clone();
    let query_name = name.clone();
    let confirmed = state.store.run(move |conn| observations::confirmed_positions(conn, &query_name)).await.map_err(anyhow::Error::from)?;
    Ok((crate::flags::raise(state.checklist(), submission, taxon, &confirmed), Some(name)))
}

fn store_photo_files(
    files: &photos::PhotoFiles,
    photos: Vec<Vec<u8>>,
    record_offset: chrono::FixedOffset,
) -> Result<Vec<StoredPhoto>, IntakeError> {
    let checked = photos
        .iter()
        .enumerate()
        .map(|(index, bytes)| check_photo(index + 1, bytes))
        .collect::<Result<Vec<_>, _>>()?;
    checked
        .into_iter()
        .zip(photos)
        .map(|(format, bytes)| {
            let sha256 = photos::sha256_hex(&bytes);
            files.put(&sha256, &bytes)?;
            Ok(StoredPhoto {
                media_type: format.media_type().to_owned(),
                byte_len: bytes.len() as u64,
                exif: exif::resolve_time(exif::read(&bytes), record_offset),
                sha256,
            })
        })
        .collect()
}

fn check_photo(number: usize, bytes: &[u8]) -> Result<PhotoFormat, IntakeError> {
    let refuse = |message: String| IntakeError::Photo { number, message };
    if bytes.is_empty() {
        return Err(refuse("the file is empty".into()));
    }
    if bytes.len() > MAX_PHOTO_BYTES {
        return Err(refuse(format!("{} bytes is over the limit of {MAX_PHOTO_BYTES} bytes", bytes.len())));
    }
    PhotoFormat::sniff(bytes).ok_or_else(|| refuse("not a JPEG or PNG image (checked by its first bytes)".into()))
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
