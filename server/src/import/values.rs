//! Reading the values people type into spreadsheets: "unknown" and its kin, numbers with
//! a decimal comma, coordinates in degrees and minutes, and dates in the formats a
//! network used. Each reader says what it could not read, in words for the operator.

use chrono::{DateTime, FixedOffset, NaiveDate, NaiveDateTime, NaiveTime, TimeZone as _};

/// Cells that say the value is not known, compared ignoring case (common practice in
/// recording spreadsheets); a mapping file may add its own.
pub const UNKNOWN_WORDS: &[&str] =
    &["", "unknown", "unk", "n/a", "na", "-", "--", "?", "not known", "not recorded", "null", "none", "nd"];

/// Whether `cell` says nothing is known (`extra` are the mapping's own words, lowercase).
pub fn is_unknown(cell: &str, extra: &[String]) -> bool {
    let cell = cell.trim().to_lowercase();
    UNKNOWN_WORDS.contains(&cell.as_str()) || extra.contains(&cell)
}

/// A decimal number, with a point or a comma as the decimal separator ("52,41").
pub fn number(text: &str) -> Result<f64, String> {
    let text = text.trim();
    let normal = match (text.contains(','), text.contains('.')) {
        (true, true) => return Err(format!("`{text}` has both a comma and a point; write one decimal separator")),
        (true, false) if text.matches(',').count() == 1 => text.replace(',', "."),
        (true, false) => return Err(format!("`{text}` is not a number")),
        _ => text.to_owned(),
    };
    normal.parse::<f64>().ok().filter(|v| v.is_finite()).ok_or_else(|| format!("`{text}` is not a number"))
}

/// Which coordinate a cell holds: the hemisphere letters it may carry differ.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Axis {
    Latitude,
    Longitude,
}

impl Axis {
    fn hemispheres(self) -> (char, char) {
        match self {
            Self::Latitude => ('N', 'S'),
            Self::Longitude => ('E', 'W'),
        }
    }
}

/// Decimal degrees from a coordinate written as decimal degrees ("52.41", "52,41",
/// "-4.09") or as degrees, minutes and seconds with symbols, spaces or colons between and
/// a hemisphere letter before or after ("52°24.6'N", "4 05 24 W", "N52:24:36"). A
/// letter for the other axis (an `E` in a latitude) is refused.
pub fn coordinate(text: &str, axis: Axis) -> Result<f64, String> {
    let trimmed = text.trim();
    let upper = trimmed.to_uppercase();
    let (plus, minus) = axis.hemispheres();
    let letters: Vec<char> = upper.chars().filter(|c| c.is_ascii_alphabetic()).collect();
    let sign = match letters.as_slice() {
        [] => 1.0,
        [c] if *c == plus => 1.0,
        [c] if *c == minus => -1.0,
        _ => return Err(format!("`{trimmed}`: a {axis:?} ends or starts with {plus} or {minus}, or carries a sign")),
    };
    let body: String = upper.chars().filter(|c| !c.is_ascii_alphabetic()).collect();
    let parts: Vec<&str> = body
        .split(|c: char| c.is_whitespace() || matches!(c, '°' | '\'' | '"' | '′' | '″' | ':' | 'º'))
        .filter(|p| !p.is_empty())
        .collect();
    let value = match parts.as_slice() {
        [degrees] => number(degrees)?,
        [degrees, minutes] => sexagesimal(trimmed, degrees, minutes, "0")?,
        [degrees, minutes, seconds] => sexagesimal(trimmed, degrees, minutes, seconds)?,
        _ => return Err(format!("`{trimmed}` is not a coordinate in decimal degrees or degrees and minutes")),
    };
    if sign < 0.0 && value < 0.0 {
        return Err(format!("`{trimmed}` has both a minus sign and the hemisphere {minus}"));
    }
    Ok(sign * value)
}

fn sexagesimal(shown: &str, degrees: &str, minutes: &str, seconds: &str) -> Result<f64, String> {
    let (d, m, s) = (number(degrees)?, number(minutes)?, number(seconds)?);
    if !(0.0..60.0).contains(&m) || !(0.0..60.0).contains(&s) || d.fract() != 0.0 {
        return Err(format!("`{shown}`: minutes and seconds run from 0 to 59, after whole degrees"));
    }
    let magnitude = d.abs() + m / 60.0 + s / 3600.0;
    Ok(if degrees.trim_start().starts_with('-') { -magnitude } else { magnitude })
}

/// A date that was read, and whether it carried a time of day.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ReadDate {
    pub at: DateTime<FixedOffset>,
    /// False when the source gave only the day: the time is then noon, a placeholder.
    pub has_time: bool,
}

/// The ISO 8601 forms always read, before a mapping's own formats.
const ISO_TIMES: &[&str] = &["%Y-%m-%dT%H:%M:%S%.f", "%Y-%m-%d %H:%M:%S%.f", "%Y-%m-%dT%H:%M", "%Y-%m-%d %H:%M"];
const ISO_DAYS: &[&str] = &["%Y-%m-%d"];

/// When a day alone is given, the record is placed at local noon, so the day stays the
/// same in every offset from −12:00 to +12:00 (common practice for day-precision dates).
pub fn placeholder_time() -> NaiveTime {
    NaiveTime::from_hms_opt(12, 0, 0).unwrap_or_default()
}

/// Reads `text` as an ISO 8601 time with its offset, a local time or a day (ISO 8601 or
/// one of `formats`, chrono strftime patterns), with `time` (a separate time-of-day cell)
/// joined to a day. Local times are taken at `offset`. An interval (`start/end`) is
/// refused: a record is one find at one time.
pub fn event_date(text: &str, time: Option<&str>, formats: &[String], offset: FixedOffset) -> Result<ReadDate, String> {
    let text = text.trim();
    if text.contains('/') && text.split('/').all(|part| part.len() >= 10 && part.as_bytes()[4] == b'-') {
        return Err(format!("`{text}` is an interval; a record is one find: give the day it was found"));
    }
    if let Ok(at) = DateTime::parse_from_rfc3339(text) {
        return Ok(ReadDate { at, has_time: true });
    }
    let own: Vec<&str> = formats.iter().map(String::as_str).collect();
    for pattern in ISO_TIMES.iter().chain(&own) {
        if let Ok(local) = NaiveDateTime::parse_from_str(text, pattern) {
            return local_at(local, offset, text).map(|at| ReadDate { at, has_time: true });
        }
    }
    for pattern in ISO_DAYS.iter().chain(&own) {
        if let Ok(day) = NaiveDate::parse_from_str(text, pattern) {
            return with_time(day, time, offset, text);
        }
    }
    let tried = if formats.is_empty() { String::new() } else { format!(" or {}", formats.join(", ")) };
    Err(format!("`{text}` is not a date in ISO 8601 (YYYY-MM-DD, with a time if known){tried}"))
}

fn with_time(day: NaiveDate, time: Option<&str>, offset: FixedOffset, shown: &str) -> Result<ReadDate, String> {
    let Some(time) = time.map(str::trim).filter(|t| !t.is_empty()) else {
        return local_at(day.and_time(placeholder_time()), offset, shown).map(|at| ReadDate { at, has_time: false });
    };
    let clock = ["%H:%M:%S", "%H:%M", "%H.%M", "%H%M"]
        .iter()
        .find_map(|pattern| NaiveTime::parse_from_str(time, pattern).ok())
        .ok_or_else(|| format!("`{time}` is not a time of day (HH:MM)"))?;
    local_at(day.and_time(clock), offset, shown).map(|at| ReadDate { at, has_time: true })
}

fn local_at(local: NaiveDateTime, offset: FixedOffset, shown: &str) -> Result<DateTime<FixedOffset>, String> {
    offset.from_local_datetime(&local).single().ok_or_else(|| format!("`{shown}` cannot be placed at {offset}"))
}

/// A UTC offset written `+01:00`, `-03:30` or `Z`.
pub fn utc_offset(text: &str) -> Result<FixedOffset, String> {
    let text = text.trim();
    if text.eq_ignore_ascii_case("z") {
        return FixedOffset::east_opt(0).ok_or_else(|| "no UTC".to_owned());
    }
    DateTime::parse_from_rfc3339(&format!("2000-01-01T00:00:00{text}"))
        .map(|d| *d.offset())
        .map_err(|_| format!("`{text}` is not a UTC offset such as +01:00"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn coordinates_in_degrees_and_minutes_read_as_decimal_degrees() {
        // 52°24.6' = 52 + 24.6/60 = 52.41 (arithmetic of the sexagesimal system).
        assert!((coordinate("52°24.6'N", Axis::Latitude).unwrap() - 52.41).abs() < 1e-9);
        assert!((coordinate("4 05 24 W", Axis::Longitude).unwrap() + 4.09).abs() < 1e-9);
        assert!((coordinate("N52:24:36", Axis::Latitude).unwrap() - 52.41).abs() < 1e-9);
        assert!((coordinate("52,41", Axis::Latitude).unwrap() - 52.41).abs() < 1e-9);
        assert!((coordinate("-4.09", Axis::Longitude).unwrap() + 4.09).abs() < 1e-9);
        assert!(coordinate("52°24.6'E", Axis::Latitude).is_err(), "an E is not a latitude's");
        assert!(coordinate("52°75'N", Axis::Latitude).is_err(), "75 minutes");
        assert!(coordinate("beach", Axis::Latitude).is_err());
    }

    #[test]
    fn numbers_take_a_decimal_comma_but_not_two_separators() {
        assert_eq!(number("48,5").unwrap(), 48.5);
        assert!(number("1,234.5").is_err());
        assert!(number("1,2,3").is_err());
    }

    #[test]
    fn dates_read_in_iso_and_the_mappings_formats() {
        let plus_one = utc_offset("+01:00").unwrap();
        let formats = vec!["%d/%m/%Y".to_owned(), "%d.%m.%Y %H:%M".to_owned()];
        let day = event_date("14/03/2019", None, &formats, plus_one).unwrap();
        assert_eq!(day.at.to_rfc3339(), "2019-03-14T12:00:00+01:00");
        assert!(!day.has_time);
        let timed = event_date("14.03.2019 09:30", None, &formats, plus_one).unwrap();
        assert_eq!(timed.at.to_rfc3339(), "2019-03-14T09:30:00+01:00");
        let joined = event_date("2019-03-14", Some("07:45"), &[], plus_one).unwrap();
        assert_eq!(joined.at.to_rfc3339(), "2019-03-14T07:45:00+01:00");
        let own_offset = event_date("2019-03-14T09:30:00-03:00", None, &[], plus_one).unwrap();
        assert_eq!(own_offset.at.offset().local_minus_utc(), -3 * 3600);
        assert!(event_date("2019-03-14/2019-03-20", None, &[], plus_one).is_err());
        assert!(event_date("March", None, &formats, plus_one).unwrap_err().contains("%d/%m/%Y"));
    }

    #[test]
    fn unknown_words_are_unknown_in_any_case() {
        assert!(is_unknown(" Unknown ", &[]));
        assert!(is_unknown("N/A", &[]));
        assert!(is_unknown("not rec.", &["not rec.".to_owned()]));
        assert!(!is_unknown("female", &[]));
    }
}
