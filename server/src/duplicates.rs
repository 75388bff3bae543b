//! Finding the same animal reported twice: plain data in, plain data out.
//!
//! A pair of records is scored on four things, each with a documented window, and
//! refused outright on a hard contradiction:
//!
//! - **place**: geodesic distance against the allowed gap, the two positions'
//!   uncertainties added in quadrature plus a drift allowance — [`DRIFT_CARCASS_M`] for
//!   beach strandings and animals floating at sea (tides move a carcass), [`DRIFT_LANDED_M`]
//!   for landed fish;
//! - **time**: the gap against [`WINDOW_CARCASS_H`] (a carcass lies for days) or
//!   [`WINDOW_LANDED_H`] (a landed fish for hours); and a carcass never gets fresher: the
//!   later report may not be in a better condition than the earlier (alive < fresh dead <
//!   decomposed < remains only);
//! - **species**: the same taxon, or one a higher rank of the other (by the checklist), or
//!   one of them unnamed; two different species contradict;
//! - **length**: of the same kind, within [`LENGTH_TOLERANCE_MEASURED`] (both taped) or
//!   [`LENGTH_TOLERANCE_ESTIMATED`] (either estimated) of the larger; other kinds say nothing.
//!
//! The same photo file (SHA-256) in both is decisive on its own: a candidate whatever
//! else, with score 1. Otherwise score = 0.35 place + 0.35 time + 0.15 species + 0.15
//! length (each 0–1), plus [`PHOTOS_ALIKE_BONUS`] when two of their photos look alike
//! (perceptual hashes within `intake::images::NEAR_DUPLICATE_BITS`), and a pair is a
//! candidate at [`CANDIDATE_SCORE`] or more. Photos that look alike never override a
//! contradiction: the hash sees layout, not species. Every
//! candidate keeps its reasons in words. Thresholds are wrackline's own (common practice
//! for plausibility windows), checked by the table in the tests.
//!
//! Candidates are found through an R-tree ([`Index`]) over place and time: unit-sphere
//! points (so distances follow the globe, with no seam at the antimeridian) plus the day,
//! so a query is a small box of space and time wherever on Earth the records are.

use shared_types::codes::from_code;
use chrono::{DateTime, Utc};
use geo::{Distance, Geodesic, Point};
use rstar::primitives::GeomWithData;
use rstar::{AABB, RTree};
use serde::Serialize;
use shared_types::{Condition, LengthKind, Setting};

pub const DRIFT_CARCASS_M: f64 = 2_000.0;
pub const DRIFT_LANDED_M: f64 = 200.0;
pub const WINDOW_CARCASS_H: f64 = 7.0 * 24.0;
pub const WINDOW_LANDED_H: f64 = 12.0;
pub const LENGTH_TOLERANCE_MEASURED: f64 = 0.15;
pub const LENGTH_TOLERANCE_ESTIMATED: f64 = 0.30;
pub const CANDIDATE_SCORE: f64 = 0.5;
pub const PHOTOS_ALIKE_BONUS: f64 = 0.2;
/// Uncertainty assumed for a position given without one (common practice for phone fixes).
pub const UNKNOWN_UNCERTAINTY_M: f64 = 100.0;

const EARTH_RADIUS_M: f64 = 6_371_008.8;

/// What the scoring needs of one record.
#[derive(Debug, Clone, PartialEq)]
pub struct DupRecord {
    pub observation_id: i64,
    pub at: DateTime<Utc>,
    /// Latitude, longitude: the record's own, or its first photo's when it has none.
    pub position: Option<(f64, f64)>,
    pub uncertainty_m: Option<f64>,
    pub setting: Setting,
    pub condition: Condition,
    /// The current identification's taxon, with its higher taxa (most specific first).
    pub taxon: Option<Vec<String>>,
    pub length: Option<(LengthKind, f64, bool)>,
    pub photo_hashes: Vec<String>,
    /// Perceptual hashes of its photos.
    pub photo_phashes: Vec<String>,
}

/// A likely pair, with why.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Candidate {
    pub score: f64,
    pub reasons: Vec<String>,
    pub distance_m: Option<f64>,
    pub gap_hours: f64,
}

fn carcass(setting: Setting) -> bool {
    matches!(setting, Setting::BeachStranding | Setting::FloatingAtSea)
}

fn freshness(condition: Condition) -> u8 {
    match condition {
        Condition::Alive => 0,
        Condition::FreshDead => 1,
        Condition::Decomposed => 2,
        Condition::RemainsOnly => 3,
    }
}

pub fn geodesic_m(a: (f64, f64), b: (f64, f64)) -> f64 {
    Geodesic.distance(Point::new(a.1, a.0), Point::new(b.1, b.0))
}

/// Scores a pair; `None` when they cannot be the same animal.
pub fn score(a: &DupRecord, b: &DupRecord) -> Option<Candidate> {
    let gap_hours = (b.at - a.at).num_seconds().abs() as f64 / 3600.0;
    let distance_m = a.position.zip(b.position).map(|(p, q)| geodesic_m(p, q));
    if let Some(hash) = a.photo_hashes.iter().find(|h| b.photo_hashes.contains(h)) {
        return Some(Candidate { score: 1.0, reasons: vec![format!("the same photo file (SHA-256 {}…)", &hash[..12.min(hash.len())])], distance_m, gap_hours });
    }
    let mut reasons = Vec::new();
    let is_carcass = carcass(a.setting) || carcass(b.setting);
    // Time first: it is the cheapest way to rule a pair out.
    let window = if is_carcass { WINDOW_CARCASS_H } else { WINDOW_LANDED_H };
    if gap_hours > window {
        return None;
    }
    // Place.
    let (p, q) = (a.position?, b.position?);
    let distance = geodesic_m(p, q);
    let u = |r: &DupRecord| r.uncertainty_m.unwrap_or(UNKNOWN_UNCERTAINTY_M);
    let allowed = (u(a).powi(2) + u(b).powi(2)).sqrt() + if is_carcass { DRIFT_CARCASS_M } else { DRIFT_LANDED_M };
    if distance > allowed {
        return None;
    }
    reasons.push(format!("{distance:.0} m apart, within the {allowed:.0} m the uncertainties and drift allow"));
    // Condition.
    let (earlier, later) = if a.at <= b.at { (a, b) } else { (b, a) };
    if freshness(later.condition) < freshness(earlier.condition) {
        return None;
    }
    reasons.push(format!("{gap_hours:.1} h apart, within {window:.0} h; condition {} then {}", earlier.condition.label(), later.condition.label()));
    // Species.
    let species = match (&a.taxon, &b.taxon) {
        (Some(x), Some(y)) if x[0] == y[0] => {
            reasons.push(format!("the same taxon, {}", x[0]));
            1.0
        }
        (Some(x), Some(y)) if x.contains(&y[0]) || y.contains(&x[0]) => {
            reasons.push(format!("{} and {}: one contains the other", x[0], y[0]));
            0.7
        }
        (Some(_), Some(_)) => return None,
        _ => {
            reasons.push("one of them is not named".into());
            0.5
        }
    };
    // Length.
    let length = match (a.length, b.length) {
        (Some((ka, la, ea)), Some((kb, lb, eb))) if ka == kb => {
            let tolerance = if ea || eb { LENGTH_TOLERANCE_ESTIMATED } else { LENGTH_TOLERANCE_MEASURED };
            let difference = (la - lb).abs() / la.max(lb);
            if difference > tolerance {
                return None;
            }
            reasons.push(format!("{la:.0} and {lb:.0} cm {}, {:.0}% apart (within {:.0}%)", ka.label(), difference * 100.0, tolerance * 100.0));
            1.0 - difference / tolerance
        }
        _ => 0.5,
    };
    let mut total = 0.35 * (1.0 - distance / allowed) + 0.35 * (1.0 - gap_hours / window) + 0.15 * species + 0.15 * length;
    let nearest_photos = a
        .photo_phashes
        .iter()
        .flat_map(|x| b.photo_phashes.iter().filter_map(move |y| crate::intake::images::hash_distance(x, y)))
        .min();
    if let Some(bits) = nearest_photos.filter(|bits| *bits <= crate::intake::images::NEAR_DUPLICATE_BITS) {
        total += PHOTOS_ALIKE_BONUS;
        reasons.push(format!("two of their photos look alike (perceptual hashes {bits} bits apart)"));
    }
    (total >= CANDIDATE_SCORE).then_some(Candidate { score: (total * 1000.0).round() / 1000.0, reasons, distance_m, gap_hours })
}


/// A stored record as scoring sees it; `None` when its stored codes do not read.
pub fn from_raw(raw: &crate::store::duplicates::RawDup, names: &crate::assess::taxa::TaxonIndex) -> Option<DupRecord> {
    let at = DateTime::parse_from_rfc3339(&raw.at_utc).ok()?.with_timezone(&Utc);
    let taxon = raw.taxon_name.as_ref().map(|name| match names.resolve(name) {
        Some(t) => {
            let lineage = [t.scientific_name.clone(), t.genus.clone(), t.family.clone(), t.order.clone(), t.superorder.clone()];
            let mut unique: Vec<String> = Vec::new();
            for name in lineage {
                if !unique.contains(&name) {
                    unique.push(name);
                }
            }
            unique
        }
        None => vec![name.clone()],
    });
    let length = match &raw.length {
        Some((kind, cm, method)) => Some((from_code(kind)?, *cm, method == "estimated")),
        None => None,
    };
    Some(DupRecord {
        observation_id: raw.observation_id,
        at,
        position: raw.position,
        uncertainty_m: raw.accuracy_m,
        setting: from_code(&raw.setting)?,
        condition: from_code(&raw.condition)?,
        taxon,
        length,
        photo_hashes: raw.photo_hashes.clone(),
        photo_phashes: raw.photo_phashes.clone(),
    })
}

/// A point on the unit sphere, so straight-line distance follows great-circle distance
/// everywhere (no seams at the antimeridian or the poles).
fn unit_vector((lat, lon): (f64, f64)) -> [f64; 3] {
    let (lat, lon) = (lat.to_radians(), lon.to_radians());
    [lat.cos() * lon.cos(), lat.cos() * lon.sin(), lat.sin()]
}

/// The index of stored records over place and time, with the largest uncertainty among
/// them, so a search box is exactly as large as the widest pair [`score`] may accept.
#[derive(Default)]
pub struct Index {
    tree: RTree<GeomWithData<[f64; 4], i64>>,
    max_uncertainty_m: f64,
}

/// A stored record for the index: id, (latitude, longitude), uncertainty in metres if
/// known, and when it was seen.
pub type IndexedPoint = (i64, (f64, f64), Option<f64>, DateTime<Utc>);

fn uncertainty_or_default(u: Option<f64>) -> f64 {
    u.unwrap_or(UNKNOWN_UNCERTAINTY_M)
}

fn days(at: DateTime<Utc>) -> f64 {
    at.timestamp() as f64 / 86_400.0
}

fn point((lat, lon): (f64, f64), at: DateTime<Utc>) -> [f64; 4] {
    let [x, y, z] = unit_vector((lat, lon));
    [x, y, z, days(at)]
}

impl Index {
    /// Builds the index at once (bulk loading is much faster than one by one).
    pub fn build(points: impl IntoIterator<Item = IndexedPoint>) -> Self {
        let mut max_uncertainty_m: f64 = 0.0;
        let entries = points
            .into_iter()
            .map(|(id, p, u, at)| {
                max_uncertainty_m = max_uncertainty_m.max(uncertainty_or_default(u));
                GeomWithData::new(point(p, at), id)
            })
            .collect();
        Self { tree: RTree::bulk_load(entries), max_uncertainty_m }
    }

    pub fn insert(&mut self, id: i64, position: (f64, f64), uncertainty_m: Option<f64>, at: DateTime<Utc>) {
        self.max_uncertainty_m = self.max_uncertainty_m.max(uncertainty_or_default(uncertainty_m));
        self.tree.insert(GeomWithData::new(point(position, at), id));
    }

    /// Every stored record [`score`] could accept beside a new one: within the largest
    /// allowed gap (both uncertainties and the carcass drift) and the longest time window.
    /// (A record with the very same photo is a candidate at any distance; those are found
    /// by hash, not here.)
    pub fn possible_pairs(&self, position: (f64, f64), uncertainty_m: Option<f64>, at: DateTime<Utc>) -> Vec<i64> {
        let reach = (uncertainty_or_default(uncertainty_m).powi(2) + self.max_uncertainty_m.powi(2)).sqrt() + DRIFT_CARCASS_M;
        let chord = 2.0 * (reach / (2.0 * EARTH_RADIUS_M)).sin();
        let [x, y, z, t] = point(position, at);
        let window = WINDOW_CARCASS_H / 24.0;
        let corners = ([x - chord, y - chord, z - chord, t - window], [x + chord, y + chord, z + chord, t + window]);
        self.tree.locate_in_envelope(&AABB::from_corners(corners.0, corners.1)).map(|p| p.data).collect()
    }

    pub fn len(&self) -> usize {
        self.tree.size()
    }

    pub fn is_empty(&self) -> bool {
        self.tree.size() == 0
    }

}

/// Candidates for `new` among `others` (already narrowed by the index), best first.
pub fn candidates<'a>(new: &DupRecord, others: impl IntoIterator<Item = &'a DupRecord>) -> Vec<(i64, Candidate)> {
    let mut found: Vec<(i64, Candidate)> = others
        .into_iter()
        .filter(|o| o.observation_id != new.observation_id)
        .filter_map(|o| score(new, o).map(|c| (o.observation_id, c)))
        .collect();
    found.sort_by(|a, b| b.1.score.total_cmp(&a.1.score));
    found
}

#[cfg(test)]
mod tests {
    use super::*;

    fn at(hours: f64) -> DateTime<Utc> {
        DateTime::parse_from_rfc3339("2026-03-01T08:00:00Z").unwrap().with_timezone(&Utc) + chrono::Duration::seconds((hours * 3600.0) as i64)
    }

    /// A thornback ray stranded at Borth; tests change what they need.
    fn ray(id: i64) -> DupRecord {
        DupRecord {
            observation_id: id,
            at: at(0.0),
            position: Some((52.4890, -4.0530)),
            uncertainty_m: Some(10.0),
            setting: Setting::BeachStranding,
            condition: Condition::FreshDead,
            taxon: Some(vec!["Raja clavata".into(), "Raja".into(), "Rajidae".into()]),
            length: Some((LengthKind::DiscWidth, 50.0, false)),
            photo_hashes: vec![],
            photo_phashes: vec![],
        }
    }

    /// 1e-3° of latitude is about 111.3 m near 52.5°N (common practice).
    fn north(record: &mut DupRecord, metres: f64) {
        let (lat, lon) = record.position.unwrap();
        record.position = Some((lat + metres / 111_300.0, lon));
    }

    #[test]
    fn the_pair_table() {
        type Edit = fn(&mut DupRecord);
        let cases: &[(&str, Edit, bool)] = &[
            ("the same animal a day later, 500 m along the beach", |r| { r.at = at(24.0); north(r, 500.0); r.condition = Condition::Decomposed; }, true),
            ("just inside the place window (2,014 m allowed)", |r| { north(r, 1_990.0); r.at = at(2.0); }, true),
            ("just outside the place window", |r| north(r, 2_050.0), false),
            ("just inside seven days", |r| r.at = at(167.0), true),
            ("just outside seven days", |r| r.at = at(169.0), false),
            ("a carcass does not get fresher", |r| { r.at = at(5.0); r.condition = Condition::Alive; }, false),
            ("a genus contains the species", |r| r.taxon = Some(vec!["Raja".into(), "Rajidae".into()]), true),
            ("another species contradicts", |r| r.taxon = Some(vec!["Raja brachyura".into(), "Raja".into()]), false),
            ("an unnamed record may still be it", |r| r.taxon = None, true),
            ("14% longer, taped: inside 15%", |r| r.length = Some((LengthKind::DiscWidth, 58.0, false)), true),
            ("17% longer, taped: outside 15%", |r| r.length = Some((LengthKind::DiscWidth, 60.0, false)), false),
            ("17% longer, estimated: inside 30%", |r| r.length = Some((LengthKind::DiscWidth, 60.0, true)), true),
        ];
        for (name, edit, expected) in cases {
            let mut other = ray(2);
            edit(&mut other);
            let found = score(&ray(1), &other);
            assert_eq!(found.is_some(), *expected, "{name}: {found:?}");
            assert_eq!(score(&other, &ray(1)).is_some(), *expected, "{name} (either order)");
        }
    }

    #[test]
    fn a_landed_fish_has_hours_and_metres_not_days_and_kilometres() {
        let mut a = ray(1);
        a.setting = Setting::LandingSiteOrMarket;
        let mut b = a.clone();
        b.observation_id = 2;
        b.at = at(11.0);
        assert!(score(&a, &b).is_some(), "11 h later at the same place");
        b.at = at(13.0);
        assert!(score(&a, &b).is_none(), "13 h is past the 12 h window");
        b.at = at(1.0);
        north(&mut b, 150.0);
        assert!(score(&a, &b).is_some(), "150 m away an hour later");
        b.at = at(11.0);
        let edge = score(&a, &b);
        assert!(edge.is_none(), "near the edge of both windows the score falls below {CANDIDATE_SCORE}: {edge:?}");
        b.at = at(1.0);
        north(&mut b, 200.0);
        assert!(score(&a, &b).is_none(), "350 m is past the 214 m allowed");
    }

    #[test]
    fn photos_that_look_alike_lift_a_pair_over_the_line_but_never_a_contradiction() {
        // Near both windows' edges the score alone falls short (see the landed-fish test).
        let mut a = ray(1);
        a.setting = Setting::LandingSiteOrMarket;
        let mut b = a.clone();
        b.observation_id = 2;
        b.at = at(11.0);
        north(&mut b, 150.0);
        assert!(score(&a, &b).is_none());
        a.photo_phashes = vec!["f0f0f0f0f0f0f0f0".into()];
        b.photo_phashes = vec!["f0f0f0f0f0f0f0f3".into()]; // 2 bits apart
        let lifted = score(&a, &b).expect("photos alike lift it");
        assert!(lifted.reasons.iter().any(|r| r.contains("2 bits apart")), "{lifted:?}");
        b.photo_phashes = vec!["0f0f0f0f0f0f0f0f".into()]; // 64 bits apart
        assert!(score(&a, &b).is_none());
        b.photo_phashes = vec!["f0f0f0f0f0f0f0f3".into()];
        b.taxon = Some(vec!["Squalus acanthias".into()]);
        assert!(score(&a, &b).is_none(), "another species still contradicts");
    }

    #[test]
    fn the_same_photo_file_decides_on_its_own() {
        let mut a = ray(1);
        let mut b = ray(2);
        a.photo_hashes = vec!["ab".repeat(32)];
        b.photo_hashes = vec!["ab".repeat(32)];
        b.at = at(24.0 * 30.0);
        b.taxon = Some(vec!["Squalus acanthias".into()]);
        let found = score(&a, &b).unwrap();
        assert_eq!(found.score, 1.0);
        assert!(found.reasons[0].contains("the same photo file"));
    }

    #[test]
    fn the_index_finds_neighbours_across_the_antimeridian_and_only_in_the_time_window() {
        let index = Index::build([
            (1, (0.0, 179.9999), None, at(0.0)),
            (2, (0.0, -179.9999), None, at(1.0)),
            (3, (0.0, 170.0), None, at(0.0)),
            (4, (0.0, 179.9999), None, at(24.0 * 30.0)),
        ]);
        let mut near = index.possible_pairs((0.0, 179.9999), None, at(0.0));
        near.sort();
        // 0.0002° of longitude at the equator is about 22 m (common practice); record 4
        // is a month later.
        assert_eq!(near, [1, 2]);
    }

    #[test]
    fn the_search_reaches_as_far_as_a_pair_may_be_apart() {
        // Two records 2,300 m apart with ±300 m each: allowed 424 + 2,000 = 2,424 m.
        let a = DupRecord { uncertainty_m: Some(300.0), ..ray(1) };
        let mut b = DupRecord { uncertainty_m: Some(300.0), ..ray(2) };
        north(&mut b, 2_300.0);
        b.at = at(1.0);
        assert!(score(&a, &b).is_some());
        let index = Index::build([(2, b.position.unwrap(), b.uncertainty_m, b.at)]);
        assert_eq!(index.possible_pairs(a.position.unwrap(), a.uncertainty_m, a.at), [2]);
    }
}
