//! Times and photo readings as people read them on a phone screen. A time is
//! "2025-06-01 09:30 +01:00" — the minute and the UTC offset, no seconds, no "T", no
//! fraction — short enough for a table cell on a 390 px screen and exact enough to
//! compare a photo with its record. A photo's time and place are shown with the reading
//! the server compared for each (the received file's or the phone's), saying which.

use chrono::{DateTime, FixedOffset};
use shared_types::{ExifReading, OffsetSource, PhotoCheck, PhotoExif};

/// "2025-06-01 09:30 +01:00".
pub fn time(at: &DateTime<FixedOffset>) -> String {
    at.format("%Y-%m-%d %H:%M %:z").to_string()
}

/// Which reading a photo's comparison with the record used, field by field, in words:
/// "the phone's reading of the original", "the file's EXIF", or both when they differ.
pub fn readings_words(check: &PhotoCheck) -> String {
    match (check.time_reading, check.place_reading) {
        (Some(time), Some(place)) if time != place => {
            format!("time from {}, place from {}", reader(Some(time)), reader(Some(place)))
        }
        (Some(which), _) | (None, Some(which)) => reader(Some(which)).to_owned(),
        (None, None) => "no EXIF".to_owned(),
    }
}

fn reader(which: Option<ExifReading>) -> &'static str {
    match which {
        Some(ExifReading::Phone) => "the phone's reading of the original",
        _ => "the file's EXIF",
    }
}

/// Whose UTC offset turned the photo's local time into an instant.
pub fn offset_words(exif: &PhotoExif) -> &'static str {
    match exif.offset_source {
        Some(OffsetSource::Photo) => "photo's offset",
        Some(OffsetSource::Device) => "phone's offset then",
        Some(OffsetSource::Record) | None => "record's offset",
    }
}
