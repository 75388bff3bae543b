//! Local time on the phone. The observer types a record's time as wall-clock time (a
//! `datetime-local` input's "2025-06-01T14:10"); it is kept as an instant with the UTC
//! offset in force *on that date*, which daylight saving may make different from the
//! offset now. The offset comes from the browser's time zone (JavaScript's `Date`), behind
//! [`Zone`], so the rules here can be tested with any zone.

use chrono::{DateTime, FixedOffset, NaiveDateTime, TimeZone};

use crate::data::words::t_args;

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

/// An instant as a `datetime-local` value in the zone's local time (the offset the zone
/// has at that moment, so a photo from before a daylight-saving change reads as the
/// clock on the wall read then).
pub fn input_value_at(zone: &impl Zone, at: &DateTime<FixedOffset>) -> String {
    let utc = at.naive_utc();
    let shift = |offset: FixedOffset| utc + chrono::Duration::seconds(i64::from(offset.local_minus_utc()));
    let guess = shift(offset_at(zone, &utc));
    shift(offset_at(zone, &guess)).format(INPUT_FORMAT).to_string()
}

/// A span of time as people say it: "5 min", "2 h 40 min", "3 days".
pub fn span_words(span: chrono::Duration) -> String {
    let minutes = span.num_minutes().max(0);
    match minutes {
        0..60 => t_args("span-minutes", &[("minutes", minutes.into())]),
        60..2880 => match minutes % 60 {
            0 => t_args("span-hours", &[("hours", (minutes / 60).into())]),
            rest => t_args("span-hours-minutes", &[("hours", (minutes / 60).into()), ("minutes", rest.into())]),
        },
        _ => t_args("span-days", &[("days", (minutes / 1440).into())]),
    }
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

#[cfg(test)]
pub(crate) mod tests {
    use chrono::Offset;
    use chrono_tz::Tz;

    use super::*;

    /// An IANA time zone (the tz database, through the chrono-tz crate) answering as a
    /// browser set to it answers `getTimezoneOffset`: minutes behind UTC at that time.
    pub(crate) struct IanaZone(pub Tz);

    impl Zone for IanaZone {
        fn minutes_behind_utc(&self, local: &NaiveDateTime) -> f64 {
            let offset = self.0.offset_from_local_datetime(local).earliest().expect("a local time that exists").fix();
            -f64::from(offset.local_minus_utc()) / 60.0
        }
    }

    pub(crate) const LONDON: IanaZone = IanaZone(chrono_tz::Europe::London);

    fn local(text: &str) -> NaiveDateTime {
        NaiveDateTime::parse_from_str(text, INPUT_FORMAT).unwrap()
    }

    #[test]
    fn the_offset_is_the_one_in_force_on_that_date_not_today() {
        // EU summer time starts on the last Sunday of March at 01:00 UTC and ends on the
        // last Sunday of October (Directive 2000/84/EC): 30 March and 26 October in 2025.
        assert_eq!(offset_at(&LONDON, &local("2025-03-29T14:00")).to_string(), "+00:00");
        assert_eq!(offset_at(&LONDON, &local("2025-03-31T14:00")).to_string(), "+01:00");
        assert_eq!(offset_at(&LONDON, &local("2025-10-25T14:00")).to_string(), "+01:00");
        assert_eq!(offset_at(&LONDON, &local("2025-10-27T14:00")).to_string(), "+00:00");
    }

    #[test]
    fn javascripts_sign_is_turned_round_east_of_greenwich_and_west() {
        // getTimezoneOffset is UTC minus local time: -330 in India, +300 in New York in
        // winter (ECMA-262, Date.prototype.getTimezoneOffset).
        let india = IanaZone(chrono_tz::Asia::Kolkata);
        assert_eq!(india.minutes_behind_utc(&local("2025-01-15T12:00")), -330.0);
        assert_eq!(offset_at(&india, &local("2025-01-15T12:00")).to_string(), "+05:30");
        let new_york = IanaZone(chrono_tz::America::New_York);
        assert_eq!(offset_at(&new_york, &local("2025-01-15T12:00")).to_string(), "-05:00");
        // Southern hemisphere: summer time in January (AEDT, UTC+11), not in July.
        let sydney = IanaZone(chrono_tz::Australia::Sydney);
        assert_eq!(offset_at(&sydney, &local("2025-01-15T12:00")).to_string(), "+11:00");
        assert_eq!(offset_at(&sydney, &local("2025-07-15T12:00")).to_string(), "+10:00");
    }

    #[test]
    fn a_typed_time_becomes_the_instant_it_names() {
        let summer = parse_input(&LONDON, "2025-06-01T14:10").unwrap();
        assert_eq!(summer.to_rfc3339(), "2025-06-01T14:10:00+01:00");
        assert_eq!(summer.naive_utc().to_string(), "2025-06-01 13:10:00");
        let winter = parse_input(&LONDON, "2025-12-01T14:10").unwrap();
        assert_eq!(winter.naive_utc().to_string(), "2025-12-01 14:10:00");
    }

    #[test]
    fn what_is_not_a_datetime_local_value_is_no_time() {
        for text in ["", "2025-06-01", "2025-06-01 14:10", "2025-13-01T14:10", "yesterday"] {
            assert_eq!(parse_input(&LONDON, text), None, "{text:?}");
            assert_eq!(offset_label(&LONDON, text), "", "{text:?}");
        }
    }

    #[test]
    fn the_label_names_the_offset_a_typed_time_will_get() {
        assert_eq!(offset_label(&LONDON, "2025-03-29T23:30"), "UTC+00:00");
        assert_eq!(offset_label(&LONDON, "2025-03-30T23:30"), "UTC+01:00");
    }

    #[test]
    fn an_instant_reads_as_the_wall_clock_of_its_own_date() {
        // A photo taken at 13:00 UTC on 29 March 2025 (GMT, before the change on the 30th)
        // reads 13:00 in London; the same UTC time on 1 June reads 14:00 (BST).
        let winter = DateTime::parse_from_rfc3339("2025-03-29T13:00:00Z").unwrap();
        assert_eq!(input_value_at(&LONDON, &winter), "2025-03-29T13:00");
        let summer = DateTime::parse_from_rfc3339("2025-06-01T11:00:00-02:00").unwrap();
        assert_eq!(input_value_at(&LONDON, &summer), "2025-06-01T14:00");
        assert_eq!(parse_input(&LONDON, &input_value_at(&LONDON, &summer)), Some(summer));
    }

    #[test]
    fn spans_read_in_minutes_hours_or_days() {
        let minutes = chrono::Duration::minutes;
        assert_eq!(span_words(minutes(5)), "5 min");
        assert_eq!(span_words(minutes(160)), "2 h 40 min");
        assert_eq!(span_words(minutes(120)), "2 h");
        assert_eq!(span_words(minutes(3 * 1440 + 7)), "3 days");
        assert_eq!(span_words(minutes(-3)), "0 min");
    }

    #[test]
    fn an_impossible_offset_falls_back_to_utc() {
        struct Broken;
        impl Zone for Broken {
            fn minutes_behind_utc(&self, _: &NaiveDateTime) -> f64 {
                f64::from(24 * 60 + 1)
            }
        }
        assert_eq!(offset_at(&Broken, &local("2025-06-01T12:00")), utc());
    }
}
