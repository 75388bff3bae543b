//! Times and photo readings as people read them on a phone screen. A time is
//! "2025-06-01 09:30 +01:00" — the minute and the UTC offset, no seconds, no "T", no
//! fraction — short enough for a table cell on a 390 px screen and exact enough to
//! compare a photo with its record. A photo's time and place are shown with the reading
//! the server compared for each (the received file's or the phone's), saying which.
//! The words (readings, offsets, a photo's gap and distance from its record, with the
//! same unit steps as the server's own words) are in the person's language.

use chrono::{DateTime, FixedOffset, TimeZone, Utc};
use shared_types::{ExifReading, OffsetSource, PhotoCheck, PhotoExif};

use crate::data::words::{self, t, t_args};

/// "2025-06-01 09:30 +01:00".
pub fn time(at: &DateTime<FixedOffset>) -> String {
    at.format("%Y-%m-%d %H:%M %:z").to_string()
}

/// "2025-06-01 08:30 UTC": a moment the server set, in UTC.
pub fn utc_minute(at: &DateTime<Utc>) -> String {
    at.format("%Y-%m-%d %H:%M UTC").to_string()
}

/// "2025-06-01 09:30", in the moment's own offset (which is not shown).
pub fn minute<Tz: TimeZone>(at: &DateTime<Tz>) -> String
where
    Tz::Offset: std::fmt::Display,
{
    at.format("%Y-%m-%d %H:%M").to_string()
}

/// "2025-06-01", in the moment's own offset.
pub fn day<Tz: TimeZone>(at: &DateTime<Tz>) -> String
where
    Tz::Offset: std::fmt::Display,
{
    at.format("%Y-%m-%d").to_string()
}

/// Which reading a photo's comparison with the record used, field by field, in words:
/// "the phone's reading of the original", "the file's EXIF", or both when they differ.
pub fn readings_words(check: &PhotoCheck) -> String {
    match (check.time_reading, check.place_reading) {
        (Some(time), Some(place)) if time != place => {
            t_args("readable-time-and-place-from", &[("time", reader(time).into()), ("place", reader(place).into())])
        }
        (Some(which), _) | (None, Some(which)) => reader(which),
        (None, None) => t("readable-no-exif"),
    }
}

fn reader(which: ExifReading) -> String {
    match which {
        ExifReading::Phone => t("readable-phone-reading"),
        ExifReading::ReceivedFile => t("readable-file-exif"),
    }
}

/// Whose UTC offset turned the photo's local time into an instant.
pub fn offset_words(exif: &PhotoExif) -> String {
    match exif.offset_source {
        Some(OffsetSource::Photo) => t("readable-offset-photo"),
        Some(OffsetSource::Device) => t("readable-offset-phone"),
        Some(OffsetSource::Record) | None => t("readable-offset-record"),
    }
}

/// Hours a photo was taken before or after its record, as people read a gap: hours with
/// one decimal, or days from three days up ("30.0 h", "3.2 days").
pub fn gap(seconds: f64) -> String {
    let hours = seconds / 3600.0;
    if hours.abs() >= 72.0 {
        t_args("readable-gap-days", &[("days", words::number(hours / 24.0, 1).into())])
    } else {
        t_args("readable-gap-hours", &[("hours", words::number(hours, 1).into())])
    }
}

/// A distance: whole metres, or kilometres to a tenth from a kilometre up ("350 m", "2.4 km").
pub fn distance(metres: f64) -> String {
    if metres >= 1000.0 {
        t_args("readable-distance-km", &[("km", words::number(metres / 1000.0, 1).into())])
    } else {
        t_args("readable-distance-m", &[("metres", words::number(metres, 0).into())])
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn check(time: Option<ExifReading>, place: Option<ExifReading>) -> PhotoCheck {
        PhotoCheck {
            time_reading: time,
            place_reading: place,
            seconds_before_record: None,
            metres_from_record: None,
            flags: Vec::new(),
        }
    }

    #[test]
    fn a_time_is_the_minute_and_the_offset() {
        let at = DateTime::parse_from_rfc3339("2025-06-01T09:30:59.75+01:00").unwrap();
        assert_eq!(time(&at), "2025-06-01 09:30 +01:00");
        assert_eq!(minute(&at), "2025-06-01 09:30");
        assert_eq!(day(&at), "2025-06-01");
        assert_eq!(utc_minute(&at.with_timezone(&Utc)), "2025-06-01 08:30 UTC");
    }

    #[test]
    fn the_reading_compared_is_named_and_both_when_they_differ() {
        use ExifReading::{Phone, ReceivedFile};
        assert_eq!(readings_words(&check(Some(ReceivedFile), Some(ReceivedFile))), "the file's EXIF");
        assert_eq!(readings_words(&check(None, Some(Phone))), "the phone's reading of the original");
        assert_eq!(
            readings_words(&check(Some(ReceivedFile), Some(Phone))),
            "time from the file's EXIF, place from the phone's reading of the original"
        );
        assert_eq!(readings_words(&check(None, None)), "no EXIF");
    }

    #[test]
    fn whose_offset_made_the_instant_is_said() {
        let with = |source| PhotoExif { offset_source: source, ..PhotoExif::default() };
        assert_eq!(offset_words(&with(Some(OffsetSource::Photo))), "photo's offset");
        assert_eq!(offset_words(&with(Some(OffsetSource::Device))), "phone's offset then");
        assert_eq!(offset_words(&with(Some(OffsetSource::Record))), "record's offset");
        assert_eq!(offset_words(&with(None)), "record's offset");
    }

    #[test]
    fn gaps_and_distances_have_their_units_and_switch_unit_where_the_server_does() {
        // The same steps as the server's own words for the queue (shared_types::hours_words,
        // distance_words), so the desk and the queue's reasons agree.
        for seconds in [1800.0, 30.0 * 3600.0, 71.9 * 3600.0, 72.0 * 3600.0, 3.25 * 86400.0, -1800.0] {
            assert_eq!(gap(seconds), shared_types::hours_words(seconds), "{seconds} s");
        }
        for metres in [0.4, 349.6, 999.4, 1000.0, 2440.0] {
            assert_eq!(distance(metres), shared_types::distance_words(metres), "{metres} m");
        }
    }
}
