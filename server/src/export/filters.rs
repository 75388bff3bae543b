//! Export filters as people write them: an area as `SOUTH,WEST,NORTH,EAST` and days as
//! dates, read the same way by the command line and the HTTP query.
//!
//! Both are applied to a record as it is published ([`crate::protect`]): the area to its
//! published position (a generalised record is inside when its rounded position is; a
//! withheld one never is), the days to its published date. So no sequence of filters
//! can narrow a record down further than the record itself shows.

use chrono::NaiveDate;

/// South, west, north, east in decimal degrees. West greater than east is a box across
/// the antimeridian (170° E to 170° W is `west: 170, east: -170`).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Area {
    pub south: f64,
    pub west: f64,
    pub north: f64,
    pub east: f64,
}

impl Area {
    /// Whether the box crosses the 180° meridian.
    pub fn crosses_antimeridian(&self) -> bool {
        self.west > self.east
    }

    /// Whether a position lies inside (edges included).
    pub fn contains(&self, latitude: f64, longitude: f64) -> bool {
        let in_longitude = if self.crosses_antimeridian() {
            longitude >= self.west || longitude <= self.east
        } else {
            (self.west..=self.east).contains(&longitude)
        };
        (self.south..=self.north).contains(&latitude) && in_longitude
    }
}

/// Days asked for, both ends included; either may be open.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct Days {
    pub from: Option<NaiveDate>,
    pub to: Option<NaiveDate>,
}

impl Days {
    /// Whether a published span of days (`first` to `last`, both included) touches these days.
    pub fn touch(&self, first: NaiveDate, last: NaiveDate) -> bool {
        self.from.is_none_or(|from| last >= from) && self.to.is_none_or(|to| first <= to)
    }

    /// UTC bounds for the store, one day wider on each side than asked: a record's own
    /// calendar day (what a generalised record is published under) may be a day either
    /// side of its UTC day, and the exact test is made on what is published.
    pub fn store_bounds(&self) -> (Option<String>, Option<String>) {
        let widen_back = self.from.and_then(|d| d.checked_sub_days(chrono::Days::new(1)));
        let widen_on = self.to.and_then(|d| d.checked_add_days(chrono::Days::new(1)));
        day_bounds(widen_back, widen_on)
    }
}

/// Reads `SOUTH,WEST,NORTH,EAST`; WEST greater than EAST is a box that crosses the
/// antimeridian (from WEST eastwards over 180° to EAST).
pub fn parse_bbox(text: &str) -> Result<Area, String> {
    let values: Vec<f64> = text
        .split(',')
        .map(|v| v.trim().parse::<f64>().map_err(|_| format!("`{v}` is not a number")))
        .collect::<Result<_, _>>()?;
    let [south, west, north, east] = values[..] else {
        return Err(format!("`{text}` is not SOUTH,WEST,NORTH,EAST (four numbers)"));
    };
    if !(-90.0..=90.0).contains(&south) || !(-90.0..=90.0).contains(&north) || south > north {
        return Err(format!("`{text}`: latitudes must lie in -90..90 with SOUTH ≤ NORTH"));
    }
    if !(-180.0..=180.0).contains(&west) || !(-180.0..=180.0).contains(&east) {
        return Err(format!(
            "`{text}`: longitudes must lie in -180..180 (WEST greater than EAST is a box across the antimeridian)"
        ));
    }
    Ok(Area { south, west, north, east })
}

/// UTC bounds for the store: from the start of `from`, until the start of the day after `to`.
pub fn day_bounds(from: Option<NaiveDate>, to: Option<NaiveDate>) -> (Option<String>, Option<String>) {
    let start = |d: NaiveDate| format!("{d}T00:00:00Z");
    (from.map(start), to.and_then(|d| d.succ_opt()).map(start))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_box_may_cross_the_antimeridian_but_not_the_poles() {
        let fiji = parse_bbox("-19.5,177,-16,-178").unwrap();
        assert!(fiji.crosses_antimeridian() && fiji.contains(-17.0, -179.5) && fiji.contains(-17.0, 178.0));
        assert!(parse_bbox("52,-4.6,52.6,-4").unwrap().contains(52.3, -4.3));
        assert!(parse_bbox("53,0,52,1").unwrap_err().contains("SOUTH ≤ NORTH"));
        assert!(parse_bbox("52,190,53,1").unwrap_err().contains("-180..180"));
        assert!(parse_bbox("52,1,53").unwrap_err().contains("four numbers"));
        assert!(parse_bbox("50,x,52,-3").unwrap_err().contains("`x` is not a number"));
    }

    #[test]
    fn published_days_touch_the_days_asked_for_at_either_end() {
        let day = |d| NaiveDate::parse_from_str(d, "%Y-%m-%d").unwrap();
        let june = Days { from: Some(day("2025-06-01")), to: Some(day("2025-06-30")) };
        assert!(june.touch(day("2025-06-01"), day("2025-06-01")));
        assert!(june.touch(day("2025-05-30"), day("2025-06-02")), "a span reaching into June");
        assert!(!june.touch(day("2025-07-01"), day("2025-07-01")));
        assert!(!june.touch(day("2025-05-31"), day("2025-05-31")));
        assert!(Days::default().touch(day("1990-01-01"), day("1990-01-01")));
        let (from, until) = june.store_bounds();
        assert_eq!((from.as_deref(), until.as_deref()), (Some("2025-05-31T00:00:00Z"), Some("2025-07-02T00:00:00Z")));
    }

    #[test]
    fn days_run_from_the_first_midnight_to_the_midnight_after_the_last_day() {
        let day = |d| NaiveDate::parse_from_str(d, "%Y-%m-%d").unwrap();
        let (from, to) = day_bounds(Some(day("2025-02-28")), Some(day("2025-02-28")));
        assert_eq!(from.as_deref(), Some("2025-02-28T00:00:00Z"));
        assert_eq!(to.as_deref(), Some("2025-03-01T00:00:00Z"));
    }
}
