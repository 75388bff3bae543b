//! Times and photo readings as people read them on a phone screen. A time is
//! "2025-06-01 09:30 +01:00" — the minute and the UTC offset, no seconds, no "T", no
//! fraction — short enough for a table cell on a 390 px screen and exact enough to
//! compare a photo with its record. A photo's time and place are shown from the reading
//! the server compared for each (the received file's or the phone's), saying which.

use chrono::{DateTime, FixedOffset};
use shared_types::{ExifReading, OffsetSource, PhotoExif, PhotoView};

/// "2025-06-01 09:30 +01:00".
pub fn time(at: &DateTime<FixedOffset>) -> String {
    at.format("%Y-%m-%d %H:%M %:z").to_string()
}

/// A photo's time (for people), latitude, longitude, and a note of where each came from.
pub fn photo_facts(photo: &PhotoView) -> (Option<String>, Option<f64>, Option<f64>, Option<String>) {
    let reading = |which: Option<ExifReading>| match which {
        Some(ExifReading::Phone) => photo.phone_exif.as_ref(),
        _ => Some(&photo.exif),
    };
    let timed = reading(photo.check.time_reading).filter(|e| e.taken_at.is_some());
    let placed = reading(photo.check.place_reading).filter(|e| e.latitude.is_some() && e.longitude.is_some());
    let mut notes = Vec::new();
    if let Some(exif) = timed {
        notes.push(format!("time: {}, {}", reader(photo.check.time_reading), offset_words(exif)));
    }
    if placed.is_some() {
        notes.push(format!("place: {}", reader(photo.check.place_reading)));
    }
    (
        timed.and_then(|e| e.taken_at).map(|at| time(&at)),
        placed.and_then(|e| e.latitude),
        placed.and_then(|e| e.longitude),
        (!notes.is_empty()).then(|| notes.join(" · ")),
    )
}

fn reader(which: Option<ExifReading>) -> &'static str {
    match which {
        Some(ExifReading::Phone) => "phone's reading",
        _ => "file",
    }
}

fn offset_words(exif: &PhotoExif) -> &'static str {
    match exif.offset_source {
        Some(OffsetSource::Photo) => "photo's offset",
        Some(OffsetSource::Device) => "phone's offset then",
        Some(OffsetSource::Record) | None => "record's offset",
    }
}
