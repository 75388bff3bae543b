//! Intake: turns what a phone sent into a stored observation, or into a refusal that
//! names what is wrong. Nothing is half-stored: photo files are written (by content,
//! so a retry rewrites nothing) before the one database savepoint that links them, and
//! a request that fails removes the files it placed (`photos.rs`).
//!
//! The order keeps refusals cheap: the record's JSON is checked first; a resend is
//! answered from the stored receipt (and a changed resend refused) before any photo is
//! decoded or written; the free-space guard runs before anything is written.

pub mod flags;
pub mod gate;
pub mod images;
pub mod photo_checks;
pub mod photos;
pub mod rate;
pub mod received;
pub mod walks;

use chrono::{DateTime, Utc};
use sha2::{Digest as _, Sha256};
pub use shared_types::exif;
use shared_types::{Receipt, Submission};

use crate::store::Store;
use crate::store::observations::{self, Insertion, NewObservation, StoredPhoto};
use crate::taxa::TaxonIndex;
use images::ImageProblem;
use photos::{MAX_PHOTO_BYTES, MAX_PHOTOS_PER_RECORD, PhotoFormat, PhotoPin, Rendition};
use received::ReceivedPhoto;

/// What intake needs of the server: the store, the photo folder, the turns for decoding,
/// the checklist and the free space to keep. Cheap to clone (each part is shared).
#[derive(Clone)]
pub struct Intake {
    pub store: Store,
    pub photos: photos::PhotoFiles,
    pub decode_gate: gate::DecodeGate,
    pub taxa: std::sync::Arc<TaxonIndex>,
    /// Refuse to write when less than this many bytes are free on the data disk.
    pub min_free_bytes: u64,
}

/// The parts of one submission: the record's JSON and its photos, already received
/// into scratch files.
#[derive(Debug, Default)]
pub struct Upload {
    pub record_json: Vec<u8>,
    pub photos: Vec<ReceivedPhoto>,
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
    /// The data disk is full (or below the free space the operator keeps): nothing of
    /// this request was kept.
    #[error("the server's disk is full, so this was not stored; it can be sent again later")]
    NoRoom,
    /// The data folder cannot be written (a read-only disk): nothing of this request was kept.
    #[error("the server cannot write to its data folder just now, so this was not stored; it can be sent again later")]
    Unwritable,
    #[error(transparent)]
    Storage(anyhow::Error),
}

impl From<anyhow::Error> for IntakeError {
    /// A failure to store, told apart when it is the disk's: full or read-only.
    fn from(err: anyhow::Error) -> Self {
        match storage_trouble(&err) {
            Some(StorageTrouble::Full) => Self::NoRoom,
            Some(StorageTrouble::ReadOnly) => Self::Unwritable,
            None => Self::Storage(err),
        }
    }
}

/// What is wrong with the data disk, when a write failed because of it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StorageTrouble {
    Full,
    ReadOnly,
}

/// Whether `err` (or anything behind it) says the disk is full or read-only: an I/O
/// error of that kind, or SQLite's SQLITE_FULL / SQLITE_READONLY.
pub fn storage_trouble(err: &anyhow::Error) -> Option<StorageTrouble> {
    err.chain().find_map(|cause| {
        if let Some(io) = cause.downcast_ref::<std::io::Error>() {
            return io_trouble(io);
        }
        let code = cause
            .downcast_ref::<crate::store::StoreError>()
            .and_then(|e| e.sqlite_code())
            .or_else(|| cause.downcast_ref::<rusqlite::Error>().and_then(|e| e.sqlite_error_code()))?;
        match code {
            rusqlite::ErrorCode::DiskFull => Some(StorageTrouble::Full),
            rusqlite::ErrorCode::ReadOnly => Some(StorageTrouble::ReadOnly),
            _ => None,
        }
    })
}

fn io_trouble(err: &std::io::Error) -> Option<StorageTrouble> {
    match err.kind() {
        std::io::ErrorKind::StorageFull | std::io::ErrorKind::QuotaExceeded => Some(StorageTrouble::Full),
        std::io::ErrorKind::ReadOnlyFilesystem => Some(StorageTrouble::ReadOnly),
        _ => None,
    }
}

/// What is wrong with one photo. Each is found before anything is stored.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum PhotoProblem {
    #[error("the file is empty")]
    Empty,
    #[error("it is larger than the limit of {mib} MiB ({MAX_PHOTO_BYTES} bytes) for one photo", mib = MAX_PHOTO_BYTES >> 20)]
    TooManyBytes,
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
    /// Why the follow-up work failed, when it ran and failed (the record is stored).
    pub follow_up_failed: Option<String>,
    /// A live animal: responders must hear of it (`Submission::is_urgent`).
    pub urgent: bool,
}

/// Work to run right after a new record is inserted, in the same commit but in a
/// savepoint of its own: when it fails only it is rolled back, and the record is still
/// stored and answered. Given the record's observation id.
pub type FollowUp = Box<dyn FnOnce(&mut rusqlite::Connection, i64) -> Result<(), crate::store::StoreError> + Send>;

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

/// Checks, stores and links everything in `upload`, and runs `follow_up` (the search for
/// duplicates, from `crate::arrival`) in the commit that stores a new record.
pub async fn accept(
    state: &Intake,
    upload: Upload,
    observer_id: Option<i64>,
    now: DateTime<Utc>,
    follow_up: Option<FollowUp>,
) -> Result<Accepted, IntakeError> {
    let submission = parse_submission(&upload.record_json, now)?;
    if upload.photos.len() > MAX_PHOTOS_PER_RECORD {
        return Err(IntakeError::TooManyPhotos(upload.photos.len()));
    }
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
    let hashes: Vec<&str> = upload.photos.iter().map(|p| p.sha256()).collect();
    let content_sha256 = content_hash(&submission, &hashes);
    let species = flags::species_of(&state.taxa, &submission);
    let known = look_up(state, &submission, species.map(|t| t.scientific_name.clone())).await?;
    if let Some((hash, receipt)) = known.earlier {
        // A resend, answered before any photo is decoded or written. Two copies sent at
        // once may both pass here; the insert itself decides between them.
        return if hash == content_sha256 {
            Ok(Accepted { receipt, replayed: true, follow_up_failed: None, urgent: submission.is_urgent() })
        } else {
            Err(IntakeError::Conflict(submission.client_id))
        };
    }
    check_walk_owner(&submission, known.walk_owner, observer_id)?;
    check_room(state)?;
    let placed = store_photos(state, upload.photos, *submission.observed_at.offset()).await?;
    let mut stored = placed.photos.clone();
    compare_photos(&submission, &mut stored, &submission.photo_exif);
    let (flags, guessed_taxon) = match species {
        Some(taxon) => {
            let raised = flags::raise(state.taxa.checklist(), &submission, taxon, &known.confirmed);
            (raised, Some(taxon.scientific_name.clone()))
        }
        None => (Vec::new(), None),
    };
    let new = NewObservation { content_sha256, submission, photos: stored, flags, guessed_taxon, observer_id };
    let client_id = new.submission.client_id;
    let urgent = new.submission.is_urgent();
    let outcome = state
        .store
        .write(move |conn| {
            let outcome = observations::insert_observation(conn, &new, now)?;
            let followed = match (&outcome, follow_up) {
                (Insertion::Created(receipt), Some(work)) => {
                    let id = receipt.observation_id;
                    // Caught here, a panic in the follow-up undoes only the follow-up.
                    let guarded = |conn: &mut rusqlite::Connection| {
                        std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| work(conn, id)))
                            .unwrap_or(Err(crate::store::StoreError::Panicked))
                    };
                    crate::store::nested(conn, guarded).err().map(|err| err.to_string())
                }
                _ => None,
            };
            Ok((outcome, followed))
        })
        .await;
    let (outcome, follow_up_failed) = match outcome {
        Ok(outcome) => outcome,
        Err(err) => {
            placed.discard(state).await;
            return Err(state.diagnose(err.into()));
        }
    };
    match outcome {
        Insertion::Created(receipt) => Ok(Accepted { receipt, replayed: false, follow_up_failed, urgent }),
        Insertion::Replayed(receipt) => Ok(Accepted { receipt, replayed: true, follow_up_failed: None, urgent }),
        Insertion::Conflict => {
            placed.discard(state).await;
            Err(IntakeError::Conflict(client_id))
        }
    }
}

impl Intake {
    /// A failure to store, told apart when the disk is its cause: by the error itself, or,
    /// for an I/O error SQLite reports without its cause, by looking at the disk (mounted
    /// read-only, or nothing left free).
    pub fn diagnose(&self, err: anyhow::Error) -> IntakeError {
        if storage_trouble(&err).is_some() {
            return err.into();
        }
        let io_failure = err.chain().any(|cause| {
            cause.downcast_ref::<crate::store::StoreError>().and_then(|e| e.sqlite_code())
                == Some(rusqlite::ErrorCode::SystemIoFailure)
        });
        if io_failure {
            if self.photos.read_only().unwrap_or(false) {
                return IntakeError::Unwritable;
            }
            if self.photos.free_bytes().is_ok_and(|free| free < NEARLY_FULL_BYTES) {
                return IntakeError::NoRoom;
            }
        }
        IntakeError::Storage(err)
    }
}

/// Free space below which an I/O failure is taken for a full disk: less than a few
/// database pages (SQLite's default page is 4 KiB).
const NEARLY_FULL_BYTES: u64 = 64 * 1024;

/// What intake asks the database about a submission before deciding on it, read in one
/// short read: the receipt of a record already stored under its id, the phone that sent
/// the walk it names, and where the species it names has been confirmed before.
#[derive(Debug, Default)]
struct Known {
    earlier: Option<(String, Receipt)>,
    /// `None`: no walk named; `Some(None)`: a walk not stored yet (records may come first).
    walk_owner: Option<Option<i64>>,
    confirmed: Vec<(f64, f64)>,
}

async fn look_up(state: &Intake, submission: &Submission, species: Option<String>) -> Result<Known, IntakeError> {
    let (client_id, walk) = (submission.client_id.to_string(), submission.walk_client_id);
    let known = state
        .store
        .look(move |conn| {
            Ok(Known {
                earlier: observations::existing_receipt(conn, &client_id)?,
                walk_owner: walk
                    .map(|walk| crate::store::walks::walk_observer(conn, walk))
                    .transpose()?
                    .map(Option::flatten),
                confirmed: match species {
                    Some(name) => observations::confirmed_positions(conn, &name)?,
                    None => Vec::new(),
                },
            })
        })
        .await;
    Ok(known.map_err(anyhow::Error::from)?)
}

/// The free-space guard: refuses before anything is written when the data disk has
/// less than the operator's minimum free.
pub fn check_room(state: &Intake) -> Result<(), IntakeError> {
    let free = state.photos.free_bytes().map_err(|err| anyhow::Error::from(err).context("reading the free space"))?;
    if free < state.min_free_bytes {
        tracing::warn!(free, keep = state.min_free_bytes, "refused a submission: the data disk is nearly full");
        return Err(IntakeError::NoRoom);
    }
    Ok(())
}

/// Refuses a record that names a walk another phone sent (walk ids are public in
/// exports). A walk not stored yet may be named: records can arrive before their walk.
fn check_walk_owner(
    submission: &Submission,
    walk_owner: Option<Option<i64>>,
    observer_id: Option<i64>,
) -> Result<(), IntakeError> {
    match (submission.walk_client_id, walk_owner) {
        (Some(walk), Some(Some(owner))) if observer_id != Some(owner) => Err(IntakeError::Field {
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
        if photo.cut_short {
            photo.check.flags.push(shared_types::PhotoFlag::CutShort);
        }
    }
}

/// Photo files a request has placed, held (pinned) until its record is stored, so they
/// can be removed again if it is not.
#[derive(Debug, Default)]
pub struct PlacedPhotos {
    /// The checked photos, in the order they came.
    pub photos: Vec<StoredPhoto>,
    /// Hashes whose files this request created (not those already there).
    created: Vec<String>,
    _pins: Vec<PhotoPin>,
}

impl PlacedPhotos {
    /// Removes the files this request created, where no other request holds them and
    /// no stored row names them: the request failed, so nothing of it is kept.
    pub async fn discard(self, state: &Intake) {
        for sha256 in &self.created {
            let (files, store) = (state.photos.clone(), state.store.clone());
            let sha = sha256.clone();
            let removed = tokio::task::spawn_blocking(move || {
                files.discard_if_unused(&sha, |sha| {
                    let sha = sha.to_owned();
                    Ok(store.read_here(move |conn| observations::photo_is_stored(conn, &sha))?)
                })
            })
            .await;
            match removed {
                Ok(Ok(_)) => {}
                Ok(Err(err)) => {
                    tracing::warn!(photo = %sha256, error = %err, "could not remove a photo file after a failed request")
                }
                Err(err) => tracing::warn!(photo = %sha256, error = %err, "the task removing a photo file failed"),
            }
        }
    }
}

/// Checks and writes photo files. The cheap checks (count, bytes, magic) run on every
/// photo first; then each is decoded in turn through the server's decode gate (EXIF,
/// decoding and derivatives are blocking work); only when all have passed are the
/// files placed, so a bad photo refuses the record before any file is stored.
pub async fn store_photos(
    state: &Intake,
    photos: Vec<ReceivedPhoto>,
    record_offset: chrono::FixedOffset,
) -> Result<PlacedPhotos, IntakeError> {
    if photos.len() > MAX_PHOTOS_PER_RECORD {
        return Err(IntakeError::TooManyPhotos(photos.len()));
    }
    for (index, photo) in photos.iter().enumerate() {
        check_received(photo).map_err(|problem| IntakeError::Photo { number: index + 1, problem })?;
    }
    let mut prepared = Vec::with_capacity(photos.len());
    for (index, photo) in photos.into_iter().enumerate() {
        let one = state
            .decode_gate
            .run(move || {
                let bytes =
                    photo.read().map_err(|err| PhotoProblem::Image(ImageProblem::Undecodable(err.to_string())))?;
                prepare_photo(bytes, record_offset).map(|(_, derived, stored)| (photo, derived, stored))
            })
            .await
            .map_err(anyhow::Error::from)?;
        prepared.push(one.map_err(|problem| IntakeError::Photo { number: index + 1, problem })?);
    }
    if !prepared.is_empty() {
        check_room(state)?;
    }
    let pins: Vec<PhotoPin> = prepared.iter().map(|(_, _, stored)| state.photos.pin(&stored.sha256)).collect();
    let photo_files = state.photos.clone();
    let written = tokio::task::spawn_blocking(move || write_photo_files(&photo_files, prepared))
        .await
        .map_err(|err| anyhow::anyhow!("photo task failed: {err}"))?;
    match written {
        Ok((photos, created)) => Ok(PlacedPhotos { photos, created, _pins: pins }),
        Err((err, created)) => {
            PlacedPhotos { photos: Vec::new(), created, _pins: pins }.discard(state).await;
            Err(err.into())
        }
    }
}

/// The photos written and the hashes whose files the writing created.
type Written = (Vec<StoredPhoto>, Vec<String>);
/// Why writing stopped, and the hashes whose files it created before (to be removed again).
type WriteFailure = (anyhow::Error, Vec<String>);

/// Places each checked photo's original and writes its derivatives durably.
fn write_photo_files(
    files: &photos::PhotoFiles,
    prepared: Vec<(ReceivedPhoto, images::Derivatives, StoredPhoto)>,
) -> Result<Written, WriteFailure> {
    let mut created = Vec::new();
    let mut stored_photos = Vec::with_capacity(prepared.len());
    for (received, derived, stored) in prepared {
        let written = (|| {
            let placed = files.place(received)?;
            files.put(&stored.sha256, Rendition::Display, &derived.display_jpeg)?;
            files.put(&stored.sha256, Rendition::Thumb, &derived.thumb_jpeg)?;
            anyhow::Ok(placed)
        })();
        match written {
            Ok(true) => created.push(stored.sha256.clone()),
            Ok(false) => {}
            Err(err) => {
                // Whatever of this photo was written goes too, unless it was there before.
                created.push(stored.sha256.clone());
                return Err((err, created));
            }
        }
        stored_photos.push(stored);
    }
    Ok((stored_photos, created))
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
    let cut_short = images::cut_short(&bytes, format);
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
        cut_short,
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
    check_size_and_magic(bytes.len(), bytes)
}

/// [`check_photo`] on a received photo, from its length and first bytes alone.
fn check_received(photo: &ReceivedPhoto) -> Result<PhotoFormat, PhotoProblem> {
    check_size_and_magic(photo.byte_len(), photo.head())
}

fn check_size_and_magic(len: usize, head: &[u8]) -> Result<PhotoFormat, PhotoProblem> {
    if len == 0 {
        return Err(PhotoProblem::Empty);
    }
    if len > MAX_PHOTO_BYTES {
        return Err(PhotoProblem::TooManyBytes);
    }
    PhotoFormat::sniff(head).ok_or(PhotoProblem::NotAnImage)
}

/// The fingerprint of a submission's content: its canonical JSON and its photos'
/// hashes in order. The same record resent gives the same fingerprint (an import's dry
/// run compares rows with stored records by it).
pub fn content_hash(submission: &Submission, photo_hashes: &[&str]) -> String {
    let mut hasher = Sha256::new();
    hasher.update(serde_json::to_vec(submission).unwrap_or_default());
    for sha256 in photo_hashes {
        hasher.update(b"\0photo:");
        hasher.update(sha256.as_bytes());
    }
    hex::encode(hasher.finalize())
}
