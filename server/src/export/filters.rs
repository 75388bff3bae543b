//! Export filters as people write them: an area as `SOUTH,WEST,NORTH,EAST` and days as
//! dates, read the same way by the command line and the HTTP query.

use chrono::NaiveDate;

use crate::store::occurrences::Area;

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
    fn days_run_from_the_first_midnight_to_the_midnight_after_the_last_day() {
        let day = |d| NaiveDate::parse_from_str(d, "%Y-%m-%d").unwrap();
        let (from, to) = day_bounds(Some(day("2025-02-28")), Some(day("2025-02-28")));
        assert_eq!(from.as_deref(), Some("2025-02-28T00:00:00Z"));
        assert_eq!(to.as_deref(), Some("2025-03-01T00:00:00Z"));
    }
}
