//! Compares what a photo's EXIF says with what the record says, to catch an old photo
//! reused for a new record (or a photo from elsewhere): a photo taken long before the
//! record, or far from where the record says, is flagged for the reviewer. A flag is
//! a question for review, never a refusal.

use chrono::Utc;
use geo::{Distance as _, Geodesic, Point};
use shared_types::{ExifReading, PhotoCheck, PhotoExif, PhotoFlag, Submission};

/// A photo taken more than this long before the record's time is flagged. Observers
/// photograph a find when they make the record; a day's grace covers a record written
/// up that evening or the next morning from photos taken on the beach.
pub const TAKEN_BEFORE_LIMIT_HOURS: i64 = 24;

/// A photo whose EXIF position is farther than this from the record's position, beyond
/// both stated uncertainties (the record's accuracy and the photo's
/// GPSHPositioningError), is flagged. 1 km is a short walk along a strandline.
pub const FAR_LIMIT_M: f64 = 1000.0;

/// Which reading to compare: the server's own of the received file when it says when or
/// where, else the phone's of the original (an upload copy carries no EXIF).
pub fn choose<'a>(received: &'a PhotoExif, phone: Option<&'a PhotoExif>) -> Option<(ExifReading, &'a PhotoExif)> {
    let says_something = |exif: &PhotoExif| exif.taken_at.is_some() || (exif.latitude.is_some() && exif.longitude.is_some());
    if says_something(received) {
        Some((ExifReading::ReceivedFile, received))
    } else {
        phone.filter(|p| says_something(p)).map(|p| (ExifReading::Phone, p))
    }
}

/// Time gap and distance between a photo and its record, and the flags they raise.
/// Values are absent when neither reading says (no EXIF time, no position).
pub fn compare(record: &Submission, received: &PhotoExif, phone: Option<&PhotoExif>) -> PhotoCheck {
    let Some((reading, exif)) = choose(received, phone) else {
        return PhotoCheck::default();
    };
    let seconds_before_record = exif
        .taken_at
        .map(|taken| (record.observed_at.with_timezone(&Utc) - taken.with_timezone(&Utc)).num_milliseconds() as f64 / 1000.0);
    let position = record.position.as_ref();
    let metres_from_record = match (position, exif.latitude, exif.longitude) {
        // The phone's reading is what the phone says: take only coordinates that exist.
        (Some(place), Some(lat), Some(lon)) if (-90.0..=90.0).contains(&lat) && (-180.0..=180.0).contains(&lon) => Some(Geodesic.distance(
            Point::new(place.longitude.get(), place.latitude.get()),
            Point::new(lon, lat),
        )),
        _ => None,
    };
    let mut flags = Vec::new();
    if seconds_before_record.is_some_and(|s| s > (TAKEN_BEFORE_LIMIT_HOURS * 3600) as f64) {
        flags.push(PhotoFlag::TakenLongBeforeRecord);
    }
    let allowance = FAR_LIMIT_M
        + position.and_then(|p| p.accuracy_m).map_or(0.0, |a| a.get())
        + exif.horizontal_error_m.filter(|e| e.is_finite() && *e >= 0.0).unwrap_or(0.0);
    if metres_from_record.is_some_and(|m| m > allowance) {
        flags.push(PhotoFlag::TakenFarFromRecord);
    }
    PhotoCheck { reading: Some(reading), seconds_before_record, metres_from_record, flags }
}
