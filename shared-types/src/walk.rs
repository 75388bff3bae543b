//! Survey walks: the effort behind the records. A walk says who walked where, when, how
//! far, and whether every shark, ray, skate and egg case found was reported — which is
//! what lets a walk with no finds count as an absence, and a trend be corrected for how
//! much people looked.
//!
//! The track's length is computed here, so the phone (while walking) and the server
//! (on arrival) get the same number. Lengths are geodesic on WGS84 (`geo`'s Karney
//! geodesics). GPS jitter is filtered in two documented steps, see [`track_length`].

use chrono::{DateTime, FixedOffset};
use geo::{Distance, Geodesic, Point};
use serde::{Deserialize, Serialize};
use uuid::Uuid;

use crate::values::{AccuracyM, Latitude, Longitude, Text};

/// Fixes less accurate than this (metres) are left out of the track.
pub const MAX_FIX_ACCURACY_M: f64 = 50.0;
/// A fix closer than this to the last kept one (or than either fix's accuracy, when
/// larger) is jitter while standing or walking slowly, and is left out.
pub const MIN_STEP_M: f64 = 10.0;
/// A step implying more than this speed (metres per second) is a GPS jump, not a walk
/// (a brisk walk is about 1.5 m/s, a run 3–4 m/s; common practice).
pub const MAX_WALKING_SPEED_M_S: f64 = 4.0;
/// The longest walk accepted, in hours.
pub const MAX_WALK_HOURS: i64 = 24;
/// The most points a track may carry (one fix every 10 s for 24 hours is 8,640).
pub const MAX_TRACK_POINTS: usize = 20_000;

/// One fix of the device's position during a walk.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TrackPoint {
    pub latitude: Latitude,
    pub longitude: Longitude,
    pub accuracy_m: Option<AccuracyM>,
    pub at: DateTime<FixedOffset>,
}

/// What the phone sends for one walk, once it has ended.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WalkSubmission {
    /// Made on the phone when the walk starts; a resend carries the same id.
    pub client_id: Uuid,
    pub started_at: DateTime<FixedOffset>,
    pub ended_at: DateTime<FixedOffset>,
    /// A named stretch of coast, if the network uses them.
    pub stretch: Option<Text>,
    /// "I reported every shark, ray, skate and egg case I found on this walk."
    pub all_finds_reported: bool,
    /// The GPS track, oldest first; empty for a walk entered by hand.
    #[serde(default, deserialize_with = "crate::limits::list::<_, TrackPoint, MAX_TRACK_POINTS>")]
    pub track: Vec<TrackPoint>,
    /// The distance typed by the observer, in metres, for a walk with no track.
    pub typed_distance_m: Option<f64>,
    pub observer_name: Option<Text>,
}

/// Why a walk was refused; the field is named first.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum WalkProblem {
    #[error("ended_at: the walk ends before it starts")]
    EndsBeforeStart,
    #[error("ended_at: a walk may last at most {MAX_WALK_HOURS} hours")]
    TooLong,
    #[error("track: at most {MAX_TRACK_POINTS} points, got {0}")]
    TooManyPoints(usize),
    #[error("track: point {0} is earlier than the point before it")]
    OutOfOrder(usize),
    #[error("typed_distance_m: must be between 0 and 100000 metres, got {0}")]
    BadDistance(f64),
    #[error("typed_distance_m: give either a track or a typed distance, not both")]
    TrackAndDistance,
}

impl WalkSubmission {
    /// Checks what serde cannot check field by field.
    pub fn check(&self) -> Result<(), WalkProblem> {
        if self.ended_at < self.started_at {
            return Err(WalkProblem::EndsBeforeStart);
        }
        if self.ended_at - self.started_at > chrono::Duration::hours(MAX_WALK_HOURS) {
            return Err(WalkProblem::TooLong);
        }
        if self.track.len() > MAX_TRACK_POINTS {
            return Err(WalkProblem::TooManyPoints(self.track.len()));
        }
        if let Some(index) = self.track.windows(2).position(|pair| pair[1].at < pair[0].at) {
            return Err(WalkProblem::OutOfOrder(index + 1));
        }
        if let Some(distance) = self.typed_distance_m {
            if !(0.0..=100_000.0).contains(&distance) {
                return Err(WalkProblem::BadDistance(distance));
            }
            if !self.track.is_empty() {
                return Err(WalkProblem::TrackAndDistance);
            }
        }
        Ok(())
    }

    /// The walk's effort: length from the track (or as typed) and duration.
    pub fn effort(&self) -> WalkEffort {
        let track = track_length(&self.track);
        let (distance_m, distance_source) = match self.typed_distance_m {
            Some(typed) => (typed, DistanceSource::Typed),
            None => (track.length_m, DistanceSource::Track),
        };
        WalkEffort {
            distance_m,
            distance_source,
            duration_s: (self.ended_at - self.started_at).num_milliseconds() as f64 / 1000.0,
            track,
        }
    }
}

/// Where a walk's distance came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum DistanceSource {
    Track,
    Typed,
}

/// Effort figures of one walk.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct WalkEffort {
    pub distance_m: f64,
    pub distance_source: DistanceSource,
    pub duration_s: f64,
    pub track: TrackLength,
}

/// A track's length after filtering, and what the filter left out.
#[derive(Debug, Clone, Copy, Default, PartialEq, Serialize, Deserialize)]
pub struct TrackLength {
    pub length_m: f64,
    pub kept_points: usize,
    pub dropped_inaccurate: usize,
    pub dropped_jitter: usize,
    pub dropped_jumps: usize,
}

/// The geodesic length of a track, with GPS noise filtered:
///
/// 1. fixes with a reported accuracy worse than [`MAX_FIX_ACCURACY_M`] are dropped;
/// 2. walking from the last kept fix, a fix is kept only when it is at least
///    max([`MIN_STEP_M`], its accuracy, the last kept fix's accuracy) away — closer
///    fixes are the scatter of a phone standing still — and when reaching it would not
///    need more than [`MAX_WALKING_SPEED_M_S`] (a jump).
///
/// The length is the sum of geodesic distances (WGS84) between kept fixes.
pub fn track_length(points: &[TrackPoint]) -> TrackLength {
    let mut summary = TrackLength::default();
    let mut last: Option<&TrackPoint> = None;
    for point in points {
        let accuracy = point.accuracy_m.map_or(0.0, |a| a.get());
        if accuracy > MAX_FIX_ACCURACY_M {
            summary.dropped_inaccurate += 1;
            continue;
        }
        let Some(previous) = last else {
            last = Some(point);
            summary.kept_points = 1;
            continue;
        };
        let step = geodesic_m(previous, point);
        let previous_accuracy = previous.accuracy_m.map_or(0.0, |a| a.get());
        if step < MIN_STEP_M.max(accuracy).max(previous_accuracy) {
            summary.dropped_jitter += 1;
            continue;
        }
        let seconds = (point.at - previous.at).num_milliseconds() as f64 / 1000.0;
        if seconds <= 0.0 || step / seconds > MAX_WALKING_SPEED_M_S {
            summary.dropped_jumps += 1;
            continue;
        }
        summary.length_m += step;
        summary.kept_points += 1;
        last = Some(point);
    }
    summary
}

fn geodesic_m(a: &TrackPoint, b: &TrackPoint) -> f64 {
    Geodesic.distance(Point::new(a.longitude.get(), a.latitude.get()), Point::new(b.longitude.get(), b.latitude.get()))
}

/// What the server answers once a walk is stored; a resend gets the same receipt.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct WalkReceipt {
    pub client_id: Uuid,
    pub walk_id: i64,
    pub received_at: DateTime<chrono::Utc>,
    pub effort: WalkEffort,
}

/// Attaches a record to a walk after the fact (`PUT /api/observations/{id}/walk`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WalkLink {
    pub walk_client_id: Uuid,
}

#[cfg(test)]
mod tests {
    use super::*;

    fn point(lat: f64, lon: f64, accuracy: f64, second: i64) -> TrackPoint {
        TrackPoint {
            latitude: Latitude::parse(lat).unwrap(),
            longitude: Longitude::parse(lon).unwrap(),
            accuracy_m: Some(AccuracyM::parse(accuracy).unwrap()),
            at: DateTime::parse_from_rfc3339("2026-05-01T10:00:00+01:00").unwrap() + chrono::Duration::seconds(second),
        }
    }

    #[test]
    fn standing_still_adds_nothing() {
        // Five fixes scattered within 3 m of one spot (1e-5° of latitude is about 1.1 m).
        let still: Vec<_> = (0..5).map(|i| point(52.41 + i as f64 * 1e-5, -4.08, 5.0, i * 10)).collect();
        let summary = track_length(&still);
        assert_eq!(summary.length_m, 0.0);
        assert_eq!(summary.dropped_jitter, 4);
    }

    #[test]
    fn inaccurate_fixes_and_jumps_are_left_out() {
        let track = [
            point(52.4100, -4.08, 5.0, 0),
            point(52.4200, -4.08, 80.0, 30), // too inaccurate
            point(52.4500, -4.08, 5.0, 60),  // 4.4 km in a minute: a jump
            point(52.4105, -4.08, 5.0, 120), // 55 m on: kept
        ];
        let summary = track_length(&track);
        assert_eq!((summary.dropped_inaccurate, summary.dropped_jumps, summary.kept_points), (1, 1, 2));
        assert!((summary.length_m - 55.6).abs() < 1.0, "{summary:?}");
    }
}
