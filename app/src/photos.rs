//! Photos picked for a record. Each original is read for its EXIF (time, place,
//! orientation; CIPA DC-008) before anything re-encodes it, then turned into the upload
//! copy: upright, long edge at most 2048 px, JPEG, made by the browser's own decoder
//! and canvas (measured faster than decoding with the `image` crate in wasm; see
//! DEVELOPERS.md). The copy carries no EXIF, so what was read travels with the record
//! as data (`Submission::photo_exif`), with the SHA-256 of the original file. Only the
//! copy is kept on the phone.

use chrono::NaiveDateTime;
use shared_types::PhotoExif;
use shared_types::exif;

use crate::device::{self, PrepareError};
use crate::form::offset_at;

/// Long edge of the upload copy, pixels: enough for a reviewer to count gill slits and
/// see spines, a fifth of a 12 MP original's bytes (common practice for evidence photos).
pub const UPLOAD_LONG_EDGE: u32 = 2048;
/// JPEG quality of the upload copy (0–1, as canvas takes it).
pub const UPLOAD_QUALITY: f64 = 0.88;

/// A photo ready to keep with a record.
#[derive(Debug, Clone)]
pub struct PickedPhoto {
    pub name: String,
    /// The upload copy.
    pub upload: web_sys::Blob,
    /// What the original's EXIF said, the instant resolved with this device's offset
    /// when the photo had none of its own.
    pub exif: PhotoExif,
    /// An object URL of the upload copy, for the thumbnail.
    pub preview_url: String,
}

/// Reads and prepares one picked file; the error is a sentence for the observer.
pub async fn pick(file: web_sys::File) -> Result<PickedPhoto, String> {
    let name = file.name();
    let bytes = device::read_bytes(&file).await.map_err(|err| format!("“{name}” could not be read: {err}"))?;
    let read = exif::read(&bytes);
    drop(bytes);
    let offset = read
        .taken_local
        .as_deref()
        .and_then(|t| NaiveDateTime::parse_from_str(t, "%Y:%m:%d %H:%M:%S%.f").ok())
        .map(|local| offset_at(&local))
        .unwrap_or_else(|| offset_at(&chrono::Local::now().naive_local()));
    let mut exif = exif::resolve_time(read, offset);
    // Names the original, which is never sent, so the same photo picked on two phones is
    // recognised though their upload copies differ. A browser without a digest sends none.
    let digest = device::original_sha256(&file).await.map_err(|err| format!("“{name}” could not be read: {err}"))?;
    exif.original_sha256 = digest.and_then(|hex| shared_types::Sha256Hex::parse(&hex).ok());
    let copy = device::prepare_upload(&file, UPLOAD_LONG_EDGE, UPLOAD_QUALITY).await.map_err(|err| match err {
        PrepareError::Undecodable(detail) => cannot_open(&name, &file.type_(), &detail),
        PrepareError::Other(detail) => format!("“{name}” could not be prepared for sending: {detail}"),
    })?;
    let preview_url = web_sys::Url::create_object_url_with_blob(&copy.blob).unwrap_or_default();
    Ok(PickedPhoto { name, upload: copy.blob, exif, preview_url })
}

/// What to tell the observer when the browser cannot open a photo.
fn cannot_open(name: &str, media_type: &str, detail: &str) -> String {
    let lower = name.to_ascii_lowercase();
    let heic = media_type.contains("heic") || media_type.contains("heif") || lower.ends_with(".heic") || lower.ends_with(".heif");
    if heic {
        format!(
            "“{name}” is a HEIC photo, which this browser cannot open. Take the photo with “Add photo” here \
             (it saves JPEG), or set the camera to JPEG (on an iPhone: Settings › Camera › Formats › Most Compatible) \
             and pick it again."
        )
    } else {
        format!("“{name}” could not be opened as a picture by this browser ({detail}). Pick a JPEG or PNG photo instead.")
    }
}

/// "photo says: 2025-06-01 14:05:09 (+01:00, its own) · 52.41530, -4.08290 ±7 m".
pub fn photo_says(exif: &PhotoExif) -> String {
    let when = match (&exif.taken_at, &exif.offset_source) {
        (Some(at), Some(shared_types::OffsetSource::Photo)) => format!("{} ({}, its own offset)", at.format("%Y-%m-%d %H:%M:%S"), at.offset()),
        (Some(at), _) => format!("{} ({}, this phone's offset)", at.format("%Y-%m-%d %H:%M:%S"), at.offset()),
        (None, _) => "no time".to_owned(),
    };
    let place = match (exif.latitude, exif.longitude) {
        (Some(lat), Some(lon)) => {
            let error = exif.horizontal_error_m.map(|e| format!(" ±{e:.0} m")).unwrap_or_default();
            format!("{lat:.5}, {lon:.5}{error}")
        }
        _ => "no position".to_owned(),
    };
    format!("photo says: {when} · {place}")
}
