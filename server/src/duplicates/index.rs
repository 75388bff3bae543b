//! The R-tree over place and time that narrows the search for duplicates to the
//! records that could be the same animal.

use chrono::{DateTime, Utc};
use rstar::primitives::{GeomWithData, Rectangle};
use rstar::{AABB, RTree, RTreeObject as _};

use super::judge::*;
use super::records::sightings;

/// A point on the unit sphere, so straight-line distance follows great-circle distance
/// everywhere (no seams at the antimeridian or the poles).
fn unit_vector((lat, lon): (f64, f64)) -> [f64; 3] {
    let (lat, lon) = (lat.to_radians(), lon.to_radians());
    [lat.cos() * lon.cos(), lat.cos() * lon.sin(), lat.sin()]
}

/// A stored place for the index: id, (latitude, longitude), uncertainty in metres if
/// known, and when.
pub type IndexedPoint = (i64, (f64, f64), Option<f64>, DateTime<Utc>);

type Entry = GeomWithData<Rectangle<[f64; 4]>, i64>;

/// The places and times of stored records. Each place is a box of half-width
/// `reach(u) = (u + DRIFT_CARCASS_M / 2) × 1.01` (as a chord of the unit sphere), so two
/// boxes meet whenever the two places are within u₁ + u₂ + DRIFT_CARCASS_M ≥ the
/// quadrature gap [`judge`] allows; a search is the new record's box over ± the carcass
/// window. A record with a large uncertainty makes only its own box large.
///
/// Two trees, because rstar's bulk loading (0.12) may leave leaves at different depths
/// when places cluster (many records at one beach), and its insertion assumes they are
/// all at one depth: inserting into such a tree panics ("This is a bug in rstar"). So
/// the places stored before the start are bulk-loaded into a tree that is only ever
/// queried ([`Settled`] has no insert), and places arriving later go into a tree built
/// by insertion alone, which stays balanced. A search asks both.
///
/// The index also knows the newest record id it has taken in, so a search can first take
/// in records another process stored since (`wrackline import` beside a running server).
#[derive(Default)]
pub struct Index {
    settled: Settled,
    arrived: RTree<Entry>,
    newest: i64,
    catching_up: bool,
}

/// A bulk-loaded tree, for queries only: it offers no way to insert.
#[derive(Default)]
struct Settled(RTree<Entry>);

impl Settled {
    fn intersecting<'a>(&'a self, envelope: &'a AABB<[f64; 4]>) -> impl Iterator<Item = &'a Entry> + 'a {
        self.0.locate_in_envelope_intersecting(envelope)
    }
}

fn days(at: DateTime<Utc>) -> f64 {
    at.timestamp() as f64 / 86_400.0
}

/// Half the side of a place's box, as a chord of the unit sphere.
fn half_width(uncertainty_m: f64) -> f64 {
    let reach = (uncertainty_m + DRIFT_CARCASS_M / 2.0) * (1.0 + SPHERE_MARGIN);
    2.0 * (reach / (2.0 * EARTH_RADIUS_M)).min(std::f64::consts::FRAC_PI_2).sin()
}

/// The box of a place over the days `from..=to`; `None` when the place is too uncertain
/// to compare.
fn place_box(position: (f64, f64), uncertainty_m: Option<f64>, from: f64, to: f64) -> Option<AABB<[f64; 4]>> {
    let u = effective_uncertainty(uncertainty_m);
    if u > MAX_USEFUL_UNCERTAINTY_M {
        return None;
    }
    let h = half_width(u);
    let [x, y, z] = unit_vector(position);
    Some(AABB::from_corners([x - h, y - h, z - h, from], [x + h, y + h, z + h, to]))
}

fn entry((id, position, uncertainty_m, at): IndexedPoint) -> Option<Entry> {
    place_box(position, uncertainty_m, days(at), days(at)).map(|aabb| GeomWithData::new(Rectangle::from(aabb), id))
}

impl Index {
    /// Builds the index of the places stored so far at once (bulk loading is much faster
    /// than one by one).
    pub fn build(points: impl IntoIterator<Item = IndexedPoint>) -> Self {
        let mut newest = 0;
        let entries = points.into_iter().inspect(|point| newest = newest.max(point.0)).filter_map(entry).collect();
        Self { settled: Settled(RTree::bulk_load(entries)), arrived: RTree::new(), newest, catching_up: false }
    }

    /// The newest record id taken in (0 when none).
    pub fn newest(&self) -> i64 {
        self.newest
    }

    /// Starts taking in records stored elsewhere, unless that is under way already
    /// (then `false`).
    pub fn begin_catching_up(&mut self) -> bool {
        !std::mem::replace(&mut self.catching_up, true)
    }

    pub fn end_catching_up(&mut self) {
        self.catching_up = false;
    }

    /// Notes that every record up to `id` has been taken in, places or not.
    pub fn taken_in_up_to(&mut self, id: i64) {
        self.newest = self.newest.max(id);
    }

    /// Adds a place; adding the same place of the same record again changes nothing.
    pub fn insert(&mut self, point: IndexedPoint) {
        self.taken_in_up_to(point.0);
        let Some(new) = entry(point) else { return };
        let envelope = new.geom().envelope();
        let known = self.settled.intersecting(&envelope).chain(self.arrived.locate_in_envelope_intersecting(&envelope));
        if !known.into_iter().any(|e| e == &new) {
            self.arrived.insert(new);
        }
    }

    /// Every stored record [`judge`] could place beside this place: boxes that meet, in
    /// the longest time window. (A record with the very same photo is a candidate at any
    /// distance; those are found by hash, not here.)
    pub fn possible_pairs(&self, position: (f64, f64), uncertainty_m: Option<f64>, at: DateTime<Utc>) -> Vec<i64> {
        let window = WINDOW_CARCASS_H / 24.0;
        let Some(envelope) = place_box(position, uncertainty_m, days(at) - window, days(at) + window) else {
            return Vec::new();
        };
        let mut ids: Vec<i64> = self
            .settled
            .intersecting(&envelope)
            .chain(self.arrived.locate_in_envelope_intersecting(&envelope))
            .map(|e| e.data)
            .collect();
        ids.sort_unstable();
        ids.dedup();
        ids
    }

    pub fn len(&self) -> usize {
        self.settled.0.size() + self.arrived.size()
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }
}

/// The places of a record the index keeps: each of its sightings with a position.
pub fn index_points(record: &DupRecord) -> Vec<IndexedPoint> {
    record
        .sightings
        .iter()
        .filter_map(|s| s.position.map(|p| (record.observation_id, p, s.uncertainty_m, s.at)))
        .collect()
}

/// The places of a stored record the index keeps, read straight from the store (no
/// names looked up); empty when its time does not read.
pub fn raw_index_points(raw: &crate::store::duplicates::RawDup) -> Vec<IndexedPoint> {
    let Ok(at) = DateTime::parse_from_rfc3339(&raw.at_utc) else { return Vec::new() };
    sightings(raw, at.with_timezone(&Utc))
        .iter()
        .filter_map(|s| s.position.map(|p| (raw.observation_id, p, s.uncertainty_m, s.at)))
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn hour(hours: i64) -> DateTime<Utc> {
        DateTime::from_timestamp(1_750_000_000 + hours * 3_600, 0).unwrap()
    }

    /// `count` stored records clustered at one beach over two days (50 × 13 spots a few
    /// metres apart), as a busy weekend leaves them.
    fn one_beach(count: i64) -> Vec<IndexedPoint> {
        let spot = |i: i64| (52.4 + (i % 50) as f64 * 1e-4, -4.05 + (i % 13) as f64 * 1e-4);
        (0..count).map(|i| (i, spot(i), Some(10.0), hour(i % 48))).collect()
    }

    /// rstar 0.12's bulk loading left these trees with leaves at two depths, and the
    /// inserts below panicked inside rstar ("This is a bug in rstar") — after a restart
    /// the server answered 500 to records it had stored.
    #[test]
    fn thousands_of_arrivals_at_clustered_places_after_a_bulk_load_never_panic() {
        for stored in [103, 1_552, 1_608, 1_650, 1_692, 4_000] {
            let mut index = Index::build(one_beach(stored));
            for i in 0..2_000 {
                let place = (52.4 + (i % 3) as f64 * 0.01 + (i % 7) as f64 * 1e-5, -4.05 + (i % 5) as f64 * 1e-5);
                index.insert((stored + i, place, Some(8.0), hour(i % 5)));
            }
            assert_eq!(index.len(), (stored + 2_000) as usize, "{stored} stored");
            let near = index.possible_pairs((52.4, -4.05), Some(8.0), hour(2));
            assert!(near.contains(&0) && near.contains(&stored), "{stored} stored: old and new places are both found");
        }
    }

    #[test]
    fn a_place_indexed_before_the_start_is_not_added_again() {
        let mut index = Index::build(one_beach(20));
        for point in one_beach(20) {
            index.insert(point);
        }
        assert_eq!(index.len(), 20);
    }
}
