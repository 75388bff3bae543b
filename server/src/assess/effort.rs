//! Effort summaries for trends: kilometres and hours walked per stretch of coast per
//! month or year, with how many walks reported every find. Plain data in, plain data
//! out. A walk counts in the month of its start, in the walk's own local time.
//!
//! A walk whose finds the public may not see exactly (`protect::Publisher`) counts
//! under [`WITHHELD_STRETCH`] in public summaries: its stretch's name, matched with the
//! exported walk's date and distance, would say where the find was.

use std::collections::BTreeMap;

use serde::Serialize;

use crate::store::walks::StoredWalk;

/// How finely effort is grouped in time.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Period {
    Month,
    Year,
}

/// Effort on one stretch in one period.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EffortRow {
    /// The stretch's name, or "(no stretch named)".
    pub stretch: String,
    /// `YYYY-MM` or `YYYY`.
    pub period: String,
    pub walks: usize,
    /// Walks on which every shark, ray, skate and egg case found was reported.
    pub all_finds_walks: usize,
    pub kilometres: f64,
    pub hours: f64,
    /// Records made on these walks.
    pub records: usize,
}

pub const NO_STRETCH: &str = "(no stretch named)";
/// Where walks whose stretch is withheld are counted.
pub const WITHHELD_STRETCH: &str = "(stretch withheld: a find on the walk may be a sensitive species)";

/// Sums the walks by stretch and period, in stretch then period order; walks for which
/// `withhold_stretch` says so count under [`WITHHELD_STRETCH`].
pub fn summarise(walks: &[StoredWalk], by: Period, withhold_stretch: &dyn Fn(&StoredWalk) -> bool) -> Vec<EffortRow> {
    let mut rows: BTreeMap<(String, String), EffortRow> = BTreeMap::new();
    for stored in walks {
        let walk = &stored.walk;
        let stretch = if withhold_stretch(stored) {
            WITHHELD_STRETCH.to_owned()
        } else {
            walk.stretch.as_ref().map_or(NO_STRETCH.to_owned(), |s| s.as_str().to_owned())
        };
        let period = match by {
            Period::Month => walk.started_at.format("%Y-%m").to_string(),
            Period::Year => walk.started_at.format("%Y").to_string(),
        };
        let effort = walk.effort();
        let row = rows.entry((stretch.clone(), period.clone())).or_insert_with(|| EffortRow {
            stretch,
            period,
            walks: 0,
            all_finds_walks: 0,
            kilometres: 0.0,
            hours: 0.0,
            records: 0,
        });
        row.walks += 1;
        row.all_finds_walks += usize::from(walk.all_finds_reported);
        row.kilometres += effort.distance_m / 1000.0;
        row.hours += effort.duration_s / 3600.0;
        row.records += stored.record_client_ids.len();
    }
    rows.into_values().collect()
}
