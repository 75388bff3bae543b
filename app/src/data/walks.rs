//! Survey walks on the phone: a walk started now (optionally on a named stretch, saying
//! whether every find will be reported) or entered by hand afterwards, kept in IndexedDB
//! until the server has it. Records made while a walk is going on are linked to it;
//! following the position is the job of `walk_track`.
//!
//! Sampling on the phone: at most one fix every [`SAMPLE_EVERY_S`] seconds, and fixes
//! worse than ±[`shared_types::MAX_FIX_ACCURACY_M`] m are not kept. The length shown is
//! worked out with the same filter the server uses (`shared_types::track_length`).

use chrono::{DateTime, FixedOffset};
use serde::{Deserialize, Serialize};
use shared_types::{AccuracyM, Latitude, Longitude, Text, TrackPoint, WalkReceipt, WalkSubmission, track_length};
use uuid::Uuid;

use crate::data::device;
use crate::data::time::{self, Zone};
use crate::data::words::{t, t_args};

/// The shortest time between two kept fixes, in seconds.
pub const SAMPLE_EVERY_S: i64 = 10;

/// Where a walk is on its way to the server.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "state", rename_all = "snake_case")]
pub enum WalkState {
    /// Going on now.
    Walking,
    Waiting,
    Sent,
    Received {
        receipt: WalkReceipt,
    },
    Refused {
        reason: String,
    },
}

impl WalkState {
    pub fn label(&self) -> String {
        match self {
            Self::Walking => t("walk-walking-now"),
            Self::Waiting => t("sync-waiting"),
            Self::Sent => t("sync-sent"),
            Self::Received { .. } => t("sync-received"),
            Self::Refused { reason } => t_args("sync-refused", &[("problem", reason.as_str().into())]),
        }
    }

    pub fn wants_sending(&self) -> bool {
        matches!(self, Self::Waiting | Self::Sent)
    }
}

/// One walk on the phone.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct WalkEntry {
    pub client_id: Uuid,
    pub started_at: DateTime<FixedOffset>,
    pub ended_at: Option<DateTime<FixedOffset>>,
    pub stretch: Option<Text>,
    pub all_finds_reported: bool,
    pub track: Vec<TrackPoint>,
    pub typed_distance_m: Option<f64>,
    pub observer_name: Option<Text>,
    pub state: WalkState,
    #[serde(default)]
    pub last_error: Option<String>,
}

impl WalkEntry {
    /// A walk with a new id, in `state`; `stretch` is left out when blank.
    fn new(stretch: &str, all_finds_reported: bool, started_at: DateTime<FixedOffset>, state: WalkState) -> Self {
        Self {
            client_id: Uuid::new_v4(),
            started_at,
            ended_at: None,
            stretch: Text::parse(stretch).ok().filter(|t| !t.as_str().is_empty()),
            all_finds_reported,
            track: Vec::new(),
            typed_distance_m: None,
            observer_name: None,
            state,
            last_error: None,
        }
    }

    /// A walk starting now.
    pub fn start(stretch: &str, all_finds_reported: bool, now: DateTime<FixedOffset>) -> Self {
        Self::new(stretch, all_finds_reported, now, WalkState::Walking)
    }

    /// A past walk typed by hand: its start and end as `datetime-local` values and its
    /// distance in kilometres. The error is the sentence to show.
    pub fn typed(
        zone: &impl Zone,
        stretch: &str,
        all_finds_reported: bool,
        (from, to, km): (&str, &str, &str),
    ) -> Result<Self, String> {
        let (Some(started_at), Some(ended_at)) = (time::parse_input(zone, from), time::parse_input(zone, to)) else {
            return Err(t("walk-give-times"));
        };
        let Some(km) = km.trim().replace(',', ".").parse::<f64>().ok().filter(|k| (0.0..=100.0).contains(k)) else {
            return Err(t("walk-give-distance"));
        };
        if ended_at < started_at {
            return Err(t("walk-ends-before-start"));
        }
        let mut walk = Self::new(stretch, all_finds_reported, started_at, WalkState::Waiting);
        walk.ended_at = Some(ended_at);
        walk.typed_distance_m = Some(km * 1000.0);
        Ok(walk)
    }

    /// Ends a walk going on: it waits to be sent.
    pub fn end(&mut self, now: DateTime<FixedOffset>) {
        self.ended_at = Some(now);
        self.state = WalkState::Waiting;
    }

    /// Whether a fix taken at `at` is due: the first, or [`SAMPLE_EVERY_S`] after the last kept.
    pub fn fix_is_due(&self, at: DateTime<FixedOffset>) -> bool {
        self.track.last().is_none_or(|last| (at - last.at).num_seconds() >= SAMPLE_EVERY_S)
    }

    /// What is sent once the walk has ended.
    pub fn submission(&self) -> Option<WalkSubmission> {
        Some(WalkSubmission {
            client_id: self.client_id,
            started_at: self.started_at,
            ended_at: self.ended_at?,
            stretch: self.stretch.clone(),
            all_finds_reported: self.all_finds_reported,
            track: self.track.clone(),
            typed_distance_m: self.typed_distance_m,
            observer_name: self.observer_name.clone(),
        })
    }

    /// Kilometres so far: typed, or from the track with the server's filter.
    pub fn kilometres(&self) -> f64 {
        self.typed_distance_m.unwrap_or_else(|| track_length(&self.track).length_m) / 1000.0
    }

    pub fn title(&self) -> String {
        let stretch = self.stretch.as_ref().map(|s| s.as_str().to_owned()).unwrap_or_else(|| t("walk-untitled"));
        format!("{stretch}, {}", self.started_at.format("%Y-%m-%d %H:%M"))
    }
}

pub async fn save(entry: &WalkEntry) -> Result<(), String> {
    let json = serde_json::to_string(entry).map_err(|err| err.to_string())?;
    device::save_walk(&entry.client_id.to_string(), &json).await
}

/// Every walk, newest first.
pub async fn load_all() -> Result<Vec<WalkEntry>, String> {
    let mut walks = device::list_walks()
        .await?
        .iter()
        .map(|json| {
            serde_json::from_str::<WalkEntry>(json)
                .map_err(|err| t_args("walks-unreadable", &[("error", err.to_string().into())]))
        })
        .collect::<Result<Vec<_>, _>>()?;
    walks.sort_by_key(|w| std::cmp::Reverse(w.started_at));
    Ok(walks)
}

/// A fix from following the position as a track point, its time with `offset`; `None`
/// when the browser gave values out of range.
pub fn track_point(fix: device::TimedFix, offset: &FixedOffset) -> Option<TrackPoint> {
    let utc = DateTime::from_timestamp_millis(fix.at as i64)?;
    Some(TrackPoint {
        latitude: Latitude::parse(fix.latitude).ok()?,
        longitude: Longitude::parse(fix.longitude).ok()?,
        accuracy_m: AccuracyM::parse(fix.accuracy.max(0.01)).ok(),
        at: utc.with_timezone(offset),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::time::tests::LONDON;

    fn typed(from: &str, to: &str, km: &str) -> Result<WalkEntry, String> {
        WalkEntry::typed(&LONDON, " North beach ", true, (from, to, km))
    }

    fn fix(latitude: f64, at_ms: f64) -> device::TimedFix {
        device::TimedFix { latitude, longitude: -4.0829, accuracy: 0.0, at: at_ms }
    }

    #[test]
    fn a_past_walk_typed_by_hand_is_checked_and_waits_to_be_sent() {
        let walk = typed("2025-06-01T09:00", "2025-06-01T10:30", "2,4").unwrap();
        assert_eq!(walk.started_at.to_rfc3339(), "2025-06-01T09:00:00+01:00");
        assert_eq!(walk.ended_at.map(|t| t.to_rfc3339()).as_deref(), Some("2025-06-01T10:30:00+01:00"));
        assert_eq!((walk.typed_distance_m, walk.kilometres()), (Some(2400.0), 2.4));
        assert_eq!(
            (walk.state.clone(), walk.stretch.as_ref().map(Text::as_str)),
            (WalkState::Waiting, Some("North beach"))
        );
        assert!(walk.state.wants_sending());
        let sent = walk.submission().expect("an ended walk is sent");
        assert_eq!(
            (sent.client_id, sent.typed_distance_m, sent.all_finds_reported),
            (walk.client_id, Some(2400.0), true)
        );
    }

    #[test]
    fn a_typed_walk_with_a_problem_says_which() {
        assert_eq!(typed("", "2025-06-01T10:30", "2").unwrap_err(), "Give the walk's start and end.");
        assert_eq!(
            typed("2025-06-01T09:00", "2025-06-01T10:30", "far").unwrap_err(),
            "Give the distance walked in kilometres (0 to 100)."
        );
        assert_eq!(
            typed("2025-06-01T09:00", "2025-06-01T10:30", "100.5").unwrap_err(),
            "Give the distance walked in kilometres (0 to 100)."
        );
        assert_eq!(
            typed("2025-06-01T09:00", "2025-06-01T10:30", "-1").unwrap_err(),
            "Give the distance walked in kilometres (0 to 100)."
        );
        assert_eq!(typed("2025-06-01T10:30", "2025-06-01T09:00", "2").unwrap_err(), "The walk ends before it starts.");
        assert!(typed("2025-06-01T09:00", "2025-06-01T09:00", "0").is_ok(), "an empty walk is still effort");
    }

    #[test]
    fn a_walk_going_on_is_not_sent_until_it_ends() {
        let start = crate::data::time::parse_input(&LONDON, "2025-06-01T09:00").unwrap();
        let mut walk = WalkEntry::start("", false, start);
        assert_eq!((walk.state.label(), walk.stretch.is_none()), ("walking now".to_owned(), true));
        assert!(!walk.state.wants_sending());
        assert_eq!(walk.submission(), None);
        assert_eq!(walk.title(), "walk, 2025-06-01 09:00");
        walk.end(start + chrono::Duration::minutes(40));
        assert_eq!(walk.state, WalkState::Waiting);
        assert_eq!(walk.submission().map(|s| s.ended_at - s.started_at), Some(chrono::Duration::minutes(40)));
    }

    #[test]
    fn a_fix_is_kept_at_most_every_ten_seconds() {
        let offset = FixedOffset::east_opt(3600).unwrap();
        let first = track_point(fix(52.4153, 1_748_768_400_000.0), &offset).unwrap();
        assert_eq!(first.at.to_rfc3339(), "2025-06-01T10:00:00+01:00");
        let mut walk = WalkEntry::start("", false, first.at);
        assert!(walk.fix_is_due(first.at));
        walk.track.push(first);
        assert!(!walk.fix_is_due(first.at + chrono::Duration::seconds(SAMPLE_EVERY_S - 1)));
        assert!(walk.fix_is_due(first.at + chrono::Duration::seconds(SAMPLE_EVERY_S)));
    }

    #[test]
    fn a_fix_out_of_range_is_no_point() {
        let offset = FixedOffset::east_opt(0).unwrap();
        assert!(track_point(fix(91.0, 0.0), &offset).is_none());
        let point = track_point(fix(52.0, 0.0), &offset).unwrap();
        assert_eq!(point.accuracy_m.map(|a| a.get()), Some(0.01), "a zero accuracy is kept as the least");
    }
}
