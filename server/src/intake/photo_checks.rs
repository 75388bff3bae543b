//! Compares what a photo's EXIF says with what the record says, to catch an old photo
//! reused for a new record (or a photo from elsewhere): a photo taken long before the
//! record, or far from where the record says, is flagged for the reviewer. A flag is
//! a question for review, never a refusal.

use chrono::{DateTime, FixedOffset, Utc};
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

/// When the photo was taken, and whose reading said so: the server's own reading of the
/// received file when it has a time, else the phone's reading of the original (an
/// upload copy carries no EXIF).
pub fn time_of(received: &PhotoExif, phone: Option<&PhotoExif>) -> Option<(ExifReading, DateTime<FixedOffset>)> {
    let from = |reading, exif: &PhotoExif| exif.taken_at.map(|at| (reading, at));
    from(ExifReading::ReceivedFile, received).or_else(|| phone.and_then(|p| from(ExifReading::Phone, p)))
}

/// Where the photo was taken (latitude, longitude and GPSHPositioningError), and whose
/// reading said so, chosen the same way as the time but on its own: a file with a time
/// and no GPS does not hide the phone's GPS. Only coordinates that exist are taken.
pub fn place_of(received: &PhotoExif, phone: Option<&PhotoExif>) -> Option<(ExifReading, Place)> {
    let from = |reading, exif: &PhotoExif| match (exif.latitude, exif.longitude) {
        (Some(lat), Some(lon)) if (-90.0..=90.0).contains(&lat) && (-180.0..=180.0).contains(&lon) => {
            Some((reading, Place { latitude: lat, longitude: lon, error_m: exif.horizontal_error_m }))
        }
        _ => None,
    };
    from(ExifReading::ReceivedFile, received).or_else(|| phone.and_then(|p| from(ExifReading::Phone, p)))
}

/// A photo's EXIF position.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Place {
    pub latitude: f64,
    pub longitude: f64,
    /// GPSHPositioningError, metres.
    pub error_m: Option<f64>,
}

/// Time gap and distance between a photo and its record, the flags they raise, and
/// whose reading gave each. Values are absent when neither reading says.
pub fn compare(record: &Submission, received: &PhotoExif, phone: Option<&PhotoExif>) -> PhotoCheck {
    let time = time_of(received, phone);
    let place = place_of(received, phone);
    let seconds_before_record = time.map(|(_, taken)| {
        (record.observed_at.with_timezone(&Utc) - taken.with_timezone(&Utc)).num_milliseconds() as f64 / 1000.0
    });
    let position = record.position.as_ref();
    let metres_from_record =
        match (position, place) {
            (Some(at), Some((_, photo))) => Some(Geodesic.distance(
                Point::new(at.longitude.get(), at.latitude.get()),
                Point::new(photo.longitude, photo.latitude),
            )),
            _ => None,
        };
    let mut flags = Vec::new();
    if seconds_before_record.is_some_and(|s| s > (TAKEN_BEFORE_LIMIT_HOURS * 3600) as f64) {
        flags.push(PhotoFlag::TakenLongBeforeRecord);
    }
    let allowance = FAR_LIMIT_M
        + position.and_then(|p| p.accuracy_m).map_or(0.0, |a| a.get())
        + place.and_then(|(_, p)| p.error_m).filter(|e| e.is_finite() && *e >= 0.0).unwrap_or(0.0);
    if metres_from_record.is_some_and(|m| m > allowance) {
        flags.push(PhotoFlag::TakenFarFromRecord);
    }
    PhotoCheck {
        time_reading: time.map(|(reading, _)| reading),
        place_reading: place.map(|(reading, _)| reading),
        seconds_before_record,
        metres_from_record,
        flags,
    }
}
