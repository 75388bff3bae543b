//! Local time on the phone. The observer types a record's time as wall-clock time (a
//! `datetime-local` input's "2025-06-01T14:10"); it is kept as an instant with the UTC
//! offset in force *on that date*, which daylight saving may make different from the
//! offset now. The offset comes from the browser's time zone (JavaScript's `Date`), behind
//! [`Zone`], so the rules here can be tested with any zone.

use chrono::{DateTime, FixedOffset, NaiveDateTime, TimeZone};

/// The format of a `datetime-local` input's value.
pub const INPUT_FORMAT: &str = "%Y-%m-%dT%H:%M";

/// A time zone as JavaScript describes it.
pub trait Zone {
    /// Minutes local time is *behind* UTC at the local time `local`, in the convention of
    /// JavaScript's `Date.prototype.getTimezoneOffset`: -60 for UTC+01:00.
    fn minutes_behind_utc(&self, local: &NaiveDateTime) -> f64;
}

/// The browser's own time zone.
pub struct BrowserZone;

impl Zone for BrowserZone {
    fn minutes_behind_utc(&self, local: &NaiveDateTime) -> f64 {
        // A date-time string without an offset is read as local time (ECMA-262, Date.parse).
        let text = local.format("%Y-%m-%dT%H:%M:%S").to_string();
        js_sys::Date::new(&text.into()).get_timezone_offset()
    }
}

fn utc() -> FixedOffset {
    FixedOffset::east_opt(0).expect("zero is a valid offset")
}

/// The zone's UTC offset at a local time (UTC if the zone gives an impossible one).
pub fn offset_at(zone: &impl Zone, local: &NaiveDateTime) -> FixedOffset {
    FixedOffset::west_opt((zone.minutes_behind_utc(local) * 60.0).round() as i32).unwrap_or_else(utc)
}

/// A `datetime-local` value as an instant, with the offset in force at that time;
/// `None` when the text is not such a value.
pub fn parse_input(zone: &impl Zone, text: &str) -> Option<DateTime<FixedOffset>> {
    let local = NaiveDateTime::parse_from_str(text, INPUT_FORMAT).ok()?;
    offset_at(zone, &local).from_local_datetime(&local).single()
}

/// "UTC+01:00": the offset a typed time will be kept with; empty while it is not a time.
pub fn offset_label(zone: &impl Zone, text: &str) -> String {
    NaiveDateTime::parse_from_str(text, INPUT_FORMAT)
        .map(|local| format!("UTC{}", offset_at(zone, &local)))
        .unwrap_or_default()
}

/// Now, with the browser's offset now.
pub fn now() -> DateTime<FixedOffset> {
    let now = js_sys::Date::new_0();
    let offset = FixedOffset::west_opt((now.get_timezone_offset() * 60.0).round() as i32).unwrap_or_else(utc);
    DateTime::from_timestamp_millis(now.get_time() as i64).unwrap_or_default().with_timezone(&offset)
}

/// Now, as a `datetime-local` input wants it.
pub fn now_for_input() -> String {
    now().format(INPUT_FORMAT).to_string()
}
