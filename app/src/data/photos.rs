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

use crate::data::device::{self, PrepareError};
use crate::data::time::{self, BrowserZone, Zone};
use crate::data::words::{self, t, t_args};

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
    /// SHA-256 of the upload copy, hex, when the browser can hash (the server keys
    /// photos by it): the same photo picked twice makes the same copy.
    pub upload_sha256: Option<String>,
    /// What the original's EXIF said, the instant resolved with this device's offset
    /// at the photo's local time when the photo had none of its own.
    pub exif: PhotoExif,
    /// An object URL of the upload copy, for the thumbnail.
    pub preview_url: String,
}

/// How much of a picked file is read for its EXIF first. A JPEG's EXIF is its APP1
/// segment, at most 64 KiB, near the start (CIPA DC-008 §4.5.4); a quarter megabyte
/// leaves room for the segments some cameras put before it, and spares copying a
/// whole 5–12 MB photo into wasm.
const EXIF_HEAD_BYTES: f64 = 256.0 * 1024.0;

/// Reads and prepares one picked file; the error is a sentence for the observer.
pub async fn pick(file: web_sys::File) -> Result<PickedPhoto, String> {
    let name = file.name();
    let unreadable = |err: String| t_args("photo-unreadable", &[("name", name.as_str().into()), ("error", err.into())]);
    let read = read_exif(&file).await.map_err(unreadable)?;
    let mut exif = with_device_offset(read, &BrowserZone, &time::now().naive_local());
    // Names the original, which is never sent, so the same photo picked on two phones is
    // recognised though their upload copies differ. A browser without a digest sends none.
    let digest = device::original_sha256(&file).await.map_err(unreadable)?;
    exif.original_sha256 = digest.and_then(|hex| shared_types::Sha256Hex::parse(&hex).ok());
    let copy = device::prepare_upload(&file, UPLOAD_LONG_EDGE, UPLOAD_QUALITY).await.map_err(|err| match err {
        PrepareError::Undecodable(detail) => cannot_open(&name, &file.type_(), &detail),
        PrepareError::NoCanvas(detail) => cannot_prepare(&name, &detail),
        PrepareError::Other(detail) => {
            t_args("photo-not-prepared", &[("name", name.as_str().into()), ("detail", detail.into())])
        }
    })?;
    let preview_url = web_sys::Url::create_object_url_with_blob(&copy.blob).unwrap_or_default();
    Ok(PickedPhoto { name, upload: copy.blob, upload_sha256: copy.sha256, exif, preview_url })
}

/// The original's EXIF, read from its start when it is found there (JPEG), else from
/// the whole file (PNG and others may keep it anywhere).
async fn read_exif(file: &web_sys::File) -> Result<PhotoExif, String> {
    if file.size() > EXIF_HEAD_BYTES {
        let head = file.slice_with_f64_and_f64(0.0, EXIF_HEAD_BYTES).map_err(|_| t("photo-start-unreadable"))?;
        if let Some(found) = exif::read_if_present(&device::read_bytes(&head).await?) {
            return Ok(found);
        }
    }
    Ok(exif::read(&device::read_bytes(file).await?))
}

/// Resolves the photo's time. A photo with no offset of its own (no
/// OffsetTimeOriginal) gets the zone's UTC offset at the photo's local time, which
/// travels with the reading (`device_offset`): a photo taken before a daylight-saving
/// change and recorded after it keeps the offset it was taken under. `now` is the
/// phone's local time now, for the offset used when the photo has no time at all.
pub fn with_device_offset(mut read: PhotoExif, zone: &impl Zone, now: &NaiveDateTime) -> PhotoExif {
    let local = read.taken_local.as_deref().and_then(|t| NaiveDateTime::parse_from_str(t, "%Y:%m:%d %H:%M:%S%.f").ok());
    if let (None, Some(local)) = (&read.offset, local) {
        read.device_offset = Some(time::offset_at(zone, &local).to_string());
    }
    exif::resolve_time(read, time::offset_at(zone, now))
}

/// True when a photo whose upload copy has the SHA-256 `picked` is already among
/// `on_form` (the same photo picked twice makes the same copy; the server would keep
/// it once). Without a hash nothing can be told apart.
pub fn already_added<'a>(mut on_form: impl Iterator<Item = Option<&'a str>>, picked: Option<&str>) -> bool {
    picked.is_some() && on_form.any(|sha| sha == picked)
}

/// What to tell the observer when the browser cannot open a photo.
fn cannot_open(name: &str, media_type: &str, detail: &str) -> String {
    let lower = name.to_ascii_lowercase();
    let heic = media_type.contains("heic")
        || media_type.contains("heif")
        || lower.ends_with(".heic")
        || lower.ends_with(".heif");
    if heic {
        t_args("photo-heic", &[("name", name.into())])
    } else {
        t_args("photo-cannot-open", &[("name", name.into()), ("detail", detail.into())])
    }
}

/// What to tell the observer when this browser has no way to make the upload copy
/// (no OffscreenCanvas and no canvas that can save a picture: very old browsers).
fn cannot_prepare(name: &str, detail: &str) -> String {
    t_args("photo-browser-too-old", &[("name", name.into()), ("detail", detail.into())])
}

/// "photo says: 2025-06-01 14:05:09 (UTC+01:00, the camera's own time zone) · 52.41530,
/// -4.08290 within 7 m".
pub fn photo_says(exif: &PhotoExif) -> String {
    let when = match (&exif.taken_at, &exif.offset_source) {
        (Some(at), source) => {
            let time = at.format("%Y-%m-%d %H:%M:%S").to_string();
            let args = [("time", time.into()), ("offset", at.offset().to_string().into())];
            match source {
                Some(shared_types::OffsetSource::Photo) => t_args("photo-time-camera-zone", &args),
                _ => t_args("photo-time-phone-zone", &args),
            }
        }
        (None, _) => t("photo-no-time"),
    };
    let place = match (exif.latitude, exif.longitude) {
        (Some(lat), Some(lon)) => {
            let within = exif.horizontal_error_m.map(|e| words::number(e, 0));
            place_words(&words::number(lat, 5), &words::number(lon, 5), within)
        }
        _ => t("photo-no-position"),
    };
    t_args("photo-says", &[("when", when.into()), ("place", place.into())])
}

/// A position as people read it, "52.41530, -4.08290 within 7 m", the radius left out
/// when there is none (each number already written for the language).
pub fn place_words(latitude: &str, longitude: &str, within_m: Option<String>) -> String {
    match within_m {
        Some(metres) => t_args(
            "photo-place-within",
            &[("lat", latitude.into()), ("lon", longitude.into()), ("metres", metres.into())],
        ),
        None => t_args("photo-place", &[("lat", latitude.into()), ("lon", longitude.into())]),
    }
}

/// Where the server serves a received photo's copy, by the original's SHA-256.
pub fn served(sha256: &str) -> String {
    format!("/photos/{sha256}")
}

/// Where the server serves a received photo's thumbnail.
pub fn served_thumb(sha256: &str) -> String {
    format!("/photos/{sha256}/thumb")
}

/// Where the server serves a received photo's original file, EXIF and all.
pub fn served_original(sha256: &str) -> String {
    format!("/photos/{sha256}/original")
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::time::tests::LONDON;

    fn read_at(taken_local: &str, offset: Option<&str>) -> PhotoExif {
        PhotoExif { taken_local: Some(taken_local.into()), offset: offset.map(str::to_owned), ..PhotoExif::default() }
    }

    fn now_local(text: &str) -> NaiveDateTime {
        NaiveDateTime::parse_from_str(text, "%Y-%m-%d %H:%M").unwrap()
    }

    #[test]
    fn a_photo_without_an_offset_keeps_the_one_in_force_when_it_was_taken() {
        // Taken on 29 March 2025 (GMT), recorded on 2 April (BST): the photo's instant
        // uses +00:00, not the +01:00 of the day it was recorded.
        let resolved =
            with_device_offset(read_at("2025:03:29 14:00:00", None), &LONDON, &now_local("2025-04-02 10:00"));
        assert_eq!(resolved.device_offset.as_deref(), Some("+00:00"));
        assert_eq!(resolved.taken_at.map(|t| t.to_rfc3339()).as_deref(), Some("2025-03-29T14:00:00+00:00"));
        assert_eq!(resolved.offset_source, Some(shared_types::OffsetSource::Device));
        assert_eq!(
            photo_says(&resolved),
            "photo says: 2025-03-29 14:00:00 (UTC+00:00, this phone's time zone on that date) · no position"
        );
    }

    #[test]
    fn a_photo_with_its_own_offset_keeps_it() {
        let read = read_at("2025:06:01 14:05:09", Some("+02:00"));
        let resolved = with_device_offset(read, &LONDON, &now_local("2025-06-01 14:10"));
        assert_eq!(resolved.device_offset, None);
        assert_eq!(resolved.taken_at.map(|t| t.to_rfc3339()).as_deref(), Some("2025-06-01T14:05:09+02:00"));
        let placed =
            PhotoExif { latitude: Some(52.4153), longitude: Some(-4.0829), horizontal_error_m: Some(7.0), ..resolved };
        assert_eq!(
            photo_says(&placed),
            "photo says: 2025-06-01 14:05:09 (UTC+02:00, the camera's own time zone) · 52.41530, -4.08290 within 7 m"
        );
    }

    #[test]
    fn a_photo_with_no_time_says_so() {
        let resolved = with_device_offset(PhotoExif::default(), &LONDON, &now_local("2025-06-01 14:10"));
        assert_eq!((resolved.taken_at, resolved.device_offset.as_deref()), (None, None));
        assert_eq!(photo_says(&resolved), "photo says: no time · no position");
    }

    #[test]
    fn the_same_upload_copy_twice_is_one_photo() {
        let on_form = [Some("aa"), None, Some("bb")];
        assert!(already_added(on_form.into_iter(), Some("bb")));
        assert!(!already_added(on_form.into_iter(), Some("cc")));
        assert!(!already_added(on_form.into_iter(), None), "without a hash nothing is told apart");
    }

    #[test]
    fn a_heic_photo_the_browser_cannot_open_gets_what_to_do() {
        for (name, media_type) in [("IMG_0001.HEIC", ""), ("ray.jpg", "image/heic"), ("skate.heif", "image/heif")] {
            let said = cannot_open(name, media_type, "decode failed");
            assert!(said.contains("is a HEIC photo") && said.contains("Most Compatible"), "{said}");
        }
        let other = cannot_open("ray.tiff", "image/tiff", "decode failed");
        assert_eq!(
            other,
            "“ray.tiff” could not be opened as a picture by this browser (decode failed). Pick a JPEG or PNG photo instead."
        );
    }
}
