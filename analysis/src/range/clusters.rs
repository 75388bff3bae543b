//! Records that belong together and records that stand alone, by great-circle distance:
//! clusters at a stated distance as a guide to the number of locations (criterion B), and
//! outliers listed for review.
//!
//! Distances are great-circle distances on a sphere of the Earth's mean radius; within a
//! few hundred km they differ from geodesics on WGS84 by under half a percent. Both checks
//! work on distinct places (records at identical coordinates count once) in 3-D boxes of
//! unit vectors small enough that any two places in one box are within the distance, so
//! only neighbouring boxes are compared place by place, wherever on the globe they are.
//!
//! Clusters are single-linkage groups: two places are in one cluster when a chain of places
//! joins them with no step longer than the distance. A location in the IUCN sense is an
//! area one threatening event can affect at once (Guidelines §4.11): clusters are only a
//! guide to it, and the text says so.

use std::collections::HashMap;

use serde::Serialize;

use crate::coordinates::LatLon;
use crate::criteria::{Category, LOCATIONS, RECORDING_CAUTION};
use crate::sphere::{MEAN_EARTH_RADIUS_KM, Vec3, arc_between, chord_of_km, unit_vector};

/// Distinct places of a set of records (identical coordinates), with the records at each.
pub(crate) struct Places {
    pub(crate) positions: Vec<LatLon>,
    pub(crate) vectors: Vec<Vec3>,
    pub(crate) records: Vec<Vec<usize>>,
}

impl Places {
    pub(crate) fn of(points: &[LatLon]) -> Self {
        let mut order: Vec<usize> = (0..points.len()).collect();
        let bits = |i: usize| (points[i].lat().to_bits(), points[i].lon().to_bits());
        order.sort_unstable_by_key(|&i| (bits(i), i));
        let mut places = Places { positions: Vec::new(), vectors: Vec::new(), records: Vec::new() };
        for (k, &i) in order.iter().enumerate() {
            if k > 0 && bits(order[k - 1]) == bits(i) {
                places.records.last_mut().expect("a place was started").push(i);
            } else {
                places.positions.push(points[i]);
                places.vectors.push(unit_vector(points[i]));
                places.records.push(vec![i]);
            }
        }
        places
    }
}

/// Places sorted into boxes of unit-vector space whose diagonal is the chord of the distance.
struct Boxes {
    members: HashMap<[i64; 3], Vec<usize>>,
}

impl Boxes {
    fn of(vectors: &[Vec3], chord: f64) -> Self {
        let side = chord / 3f64.sqrt();
        let mut members: HashMap<[i64; 3], Vec<usize>> = HashMap::new();
        for (i, v) in vectors.iter().enumerate() {
            members.entry(v.map(|c| (c / side).floor() as i64)).or_default().push(i);
        }
        Self { members }
    }

    /// Boxes that can hold a place within the distance of a place in `key`: two boxes apart
    /// at most, since places three boxes apart are more than two sides (> one diagonal) apart.
    fn neighbours(key: [i64; 3]) -> impl Iterator<Item = [i64; 3]> {
        (-2..=2).flat_map(move |dx| {
            (-2..=2).flat_map(move |dy| (-2..=2).map(move |dz| [key[0] + dx, key[1] + dy, key[2] + dz]))
        })
    }
}

fn within(a: Vec3, b: Vec3, chord: f64) -> bool {
    let d = [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
    d[0] * d[0] + d[1] * d[1] + d[2] * d[2] <= chord * chord
}

/// Union–find over places.
struct Groups {
    parent: Vec<usize>,
}

impl Groups {
    fn find(&mut self, mut i: usize) -> usize {
        while self.parent[i] != i {
            self.parent[i] = self.parent[self.parent[i]];
            i = self.parent[i];
        }
        i
    }

    fn join(&mut self, a: usize, b: usize) {
        let (ra, rb) = (self.find(a), self.find(b));
        if ra != rb {
            self.parent[ra.max(rb)] = ra.min(rb);
        }
    }
}

/// Single-linkage clusters of `points` at `distance_km`: each record's cluster number,
/// numbered 0, 1, 2… in the order of each cluster's first record.
pub fn single_linkage(points: &[LatLon], distance_km: f64) -> Vec<usize> {
    let places = Places::of(points);
    let chord = chord_of_km(distance_km);
    let boxes = Boxes::of(&places.vectors, chord);
    let mut groups = Groups { parent: (0..places.positions.len()).collect() };
    for (key, members) in &boxes.members {
        for &other in &members[1..] {
            groups.join(members[0], other);
        }
        for neighbour in Boxes::neighbours(*key).filter(|n| n > key) {
            let Some(others) = boxes.members.get(&neighbour) else { continue };
            if groups.find(members[0]) == groups.find(others[0]) {
                continue;
            }
            let linked =
                members.iter().any(|&a| others.iter().any(|&b| within(places.vectors[a], places.vectors[b], chord)));
            if linked {
                groups.join(members[0], others[0]);
            }
        }
    }
    let mut number_of_root: HashMap<usize, usize> = HashMap::new();
    let mut cluster = vec![0; points.len()];
    let mut first_record: Vec<(usize, usize)> =
        places.records.iter().enumerate().map(|(place, records)| (records[0], place)).collect();
    first_record.sort_unstable();
    for (_, place) in first_record {
        let root = groups.find(place);
        let next = number_of_root.len();
        let number = *number_of_root.entry(root).or_insert(next);
        for &record in &places.records[place] {
            cluster[record] = number;
        }
    }
    cluster
}

/// Clusters at a stated distance as a guide to the number of locations.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LocationGuide {
    /// The linking distance, km.
    pub distance_km: f64,
    /// Distinct places (records at identical coordinates count once).
    pub places: usize,
    /// Single-linkage clusters at `distance_km`.
    pub clusters: usize,
    /// The criterion-B location band the cluster count would fall in, were clusters locations.
    pub band_if_locations: Option<Category>,
    /// What the guide says and does not say.
    pub text: String,
}

/// Counts the clusters of `points` at `distance_km` and says what they can guide.
pub fn location_guide(points: &[LatLon], distance_km: f64) -> LocationGuide {
    let clusters = single_linkage(points, distance_km).into_iter().max().map_or(0, |m| m + 1);
    let places = Places::of(points).positions.len();
    let band_if_locations = LOCATIONS.iter().find(|t| clusters > 0 && clusters as f64 <= t.limit).map(|t| t.category);
    let band = match band_if_locations {
        Some(c) => {
            format!("were each cluster one location, {clusters} would be within the {} ({}) limit", c.name(), c.code())
        }
        None if clusters == 0 => "with no records there is nothing to guide".to_owned(),
        None => format!("were each cluster one location, {clusters} would be above every limit"),
    };
    let text = format!(
        "{places} distinct places form {clusters} clusters when records up to {distance_km} km apart are linked \
         (single linkage on great-circle distance). This is a guide only: a location is the area one threatening \
         event can affect at once (IUCN Guidelines §4.11), which the assessor judges from the threats; {band} \
         (CR 1, EN ≤ 5, VU ≤ 10). {RECORDING_CAUTION}"
    );
    LocationGuide { distance_km, places, clusters, band_if_locations, text }
}

/// A place far from every other record, with the records made there.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Outlier {
    /// Where.
    pub position: LatLon,
    /// The records at that place (indices into the records given).
    pub records: Vec<usize>,
    /// Great-circle distance to the nearest other place, km.
    pub nearest_km: f64,
}

/// Places farther than `gap_km` from every other place, the most isolated first.
///
/// With fewer than three places nothing is listed: two places cannot say which is the odd one.
pub fn outliers(points: &[LatLon], gap_km: f64) -> Vec<Outlier> {
    let places = Places::of(points);
    if places.positions.len() < 3 {
        return Vec::new();
    }
    let chord = chord_of_km(gap_km);
    let boxes = Boxes::of(&places.vectors, chord);
    let mut found: Vec<Outlier> = boxes
        .members
        .iter()
        .filter(|(_, members)| members.len() == 1)
        .filter_map(|(key, members)| {
            let place = members[0];
            let v = places.vectors[place];
            let close = Boxes::neighbours(*key).filter_map(|n| boxes.members.get(&n)).flatten();
            let alone = close.filter(|&&other| other != place).all(|&other| !within(v, places.vectors[other], chord));
            alone.then(|| {
                let nearest = (0..places.positions.len())
                    .filter(|&other| other != place)
                    .map(|other| arc_between(v, places.vectors[other]))
                    .fold(f64::INFINITY, f64::min);
                Outlier {
                    position: places.positions[place],
                    records: places.records[place].clone(),
                    nearest_km: nearest * MEAN_EARTH_RADIUS_KM,
                }
            })
        })
        .collect();
    found.sort_by(|a, b| b.nearest_km.total_cmp(&a.nearest_km).then(a.records[0].cmp(&b.records[0])));
    found
}
