//! Dates of records and the periods figures are computed for.
//!
//! A record's date is a span of days: `2019-05-03` is one day, `2019-05` a month, `2019` a
//! year, `2019-05-03/2019-05-07` an interval (ISO 8601, as Darwin Core `eventDate` allows).
//! A record counts in a period only when its whole span lies inside the period.

use chrono::{Datelike as _, NaiveDate};
use serde::Serialize;

/// The days a record may have happened on, first and last inclusive.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct DateSpan {
    pub first: NaiveDate,
    pub last: NaiveDate,
}

/// A period of whole days, first and last inclusive, with the label it is shown under.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Period {
    pub label: String,
    pub first: NaiveDate,
    pub last: NaiveDate,
}

impl DateSpan {
    /// Reads an ISO 8601 date, partial date or interval; any time of day is ignored.
    pub fn parse(text: &str) -> Result<Self, String> {
        let text = text.trim();
        match text.split_once('/') {
            Some((start, end)) => {
                let first = partial(start)?.first;
                let last = partial(end)?.last;
                if last < first {
                    return Err(format!("the interval `{text}` ends before it starts"));
                }
                Ok(Self { first, last })
            }
            None => partial(text),
        }
    }

    /// The calendar year the span starts in.
    pub fn year(&self) -> i32 {
        self.first.year()
    }
}

impl Period {
    /// Reads `2015-2019` (whole years, inclusive) or `2015` (one year).
    pub fn parse_years(text: &str) -> Result<Self, String> {
        let year = |t: &str| {
            t.trim()
                .parse::<i32>()
                .ok()
                .filter(|y| (1000..=9999).contains(y))
                .ok_or_else(|| format!("`{text}` is not a period of years; write it as 2015-2019 or 2015"))
        };
        let (first, last) = match text.split_once('-') {
            Some((a, b)) => (year(a)?, year(b)?),
            None => (year(text)?, year(text)?),
        };
        if last < first {
            return Err(format!("the period `{text}` ends before it starts"));
        }
        Ok(Self {
            label: if first == last { first.to_string() } else { format!("{first}–{last}") },
            first: NaiveDate::from_ymd_opt(first, 1, 1).expect("1 January exists"),
            last: NaiveDate::from_ymd_opt(last, 12, 31).expect("31 December exists"),
        })
    }

    /// The period between two optional dates (`YYYY-MM-DD`), open ends reaching as far as needed.
    pub fn between(from: Option<NaiveDate>, to: Option<NaiveDate>) -> Self {
        let first = from.unwrap_or(NaiveDate::MIN);
        let last = to.unwrap_or(NaiveDate::MAX);
        let show = |d: Option<NaiveDate>, open: &str| d.map(|d| d.to_string()).unwrap_or_else(|| open.to_owned());
        Self { label: format!("{} to {}", show(from, "the first record"), show(to, "the last record")), first, last }
    }

    /// Whether the whole of `span` lies in this period.
    pub fn holds(&self, span: DateSpan) -> bool {
        self.first <= span.first && span.last <= self.last
    }
}

/// `YYYY`, `YYYY-MM` or `YYYY-MM-DD`, with any `T…` time part dropped.
fn partial(text: &str) -> Result<DateSpan, String> {
    let bad = || format!("`{text}` is not an ISO 8601 date such as 2019-05-03, 2019-05 or 2019");
    let date_part = text.split('T').next().unwrap_or_default();
    let parts: Vec<&str> = date_part.split('-').collect();
    let number = |t: &str| t.parse::<u32>().map_err(|_| bad());
    let year =
        parts.first().filter(|y| y.len() == 4).ok_or_else(bad).and_then(|y| y.parse::<i32>().map_err(|_| bad()))?;
    let day = |m: u32, d: u32| NaiveDate::from_ymd_opt(year, m, d).ok_or_else(bad);
    match parts.as_slice() {
        [_] => Ok(DateSpan { first: day(1, 1)?, last: day(12, 31)? }),
        [_, m] => {
            let m = number(m)?;
            let first = day(m, 1)?;
            let next =
                if m == 12 { NaiveDate::from_ymd_opt(year + 1, 1, 1) } else { NaiveDate::from_ymd_opt(year, m + 1, 1) };
            Ok(DateSpan { first, last: next.ok_or_else(bad)?.pred_opt().ok_or_else(bad)? })
        }
        [_, m, d] => {
            let one = day(number(m)?, number(d)?)?;
            Ok(DateSpan { first: one, last: one })
        }
        _ => Err(bad()),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn d(text: &str) -> NaiveDate {
        text.parse().unwrap()
    }

    #[test]
    fn partial_dates_and_intervals_read_as_spans_of_days() {
        // ISO 8601 forms that Darwin Core `eventDate` allows (TDWG Darwin Core).
        let cases = [
            ("2019-05-03", "2019-05-03", "2019-05-03"),
            ("2019-05-03T08:40Z", "2019-05-03", "2019-05-03"),
            ("2024-02", "2024-02-01", "2024-02-29"),
            ("2019", "2019-01-01", "2019-12-31"),
            ("2019-05-03/2019-06", "2019-05-03", "2019-06-30"),
        ];
        for (text, first, last) in cases {
            assert_eq!(DateSpan::parse(text), Ok(DateSpan { first: d(first), last: d(last) }), "{text}");
        }
        assert!(DateSpan::parse("03/05/2019").is_err());
        assert!(DateSpan::parse("2019-13-01").is_err());
    }

    #[test]
    fn a_record_counts_in_a_period_only_when_wholly_inside() {
        let period = Period::parse_years("2015-2019").unwrap();
        assert!(period.holds(DateSpan::parse("2019-12-31").unwrap()));
        assert!(!period.holds(DateSpan::parse("2019-12-31/2020-01-01").unwrap()));
        assert!(Period::parse_years("2019-2015").is_err());
    }
}
