//! Area of occupancy: occupied cells of equal-area grids, times the cell area.
//!
//! The IUCN Guidelines prescribe 2 × 2 km cells but no grid origin, and the origin changes
//! the count. wrackline fixes the grid and also reports the smallest count over a set of
//! shifted origins, so an assessor sees how much the figure owes to where the lines fall.
//!
//! A grid: a Lambert azimuthal equal-area projection on WGS84 centred on
//! [`AooGrid::centre`] (by default 52° N, 10° E, the centre of the European LAEA reference
//! grid, EPSG:3035, here without its false easting and northing). Cell edges lie at whole
//! multiples of the cell size east and north of the centre, so the centre is a cell corner.
//! Cells keep their area everywhere; within [`ZONE_REACH_DEGREES`] (60°) of the centre
//! they stay within a third of square (scales cos 30° and 1 / cos 30°).
//!
//! Grids anywhere (a [`GridPlan`]): a record is counted on the first grid of the plan whose
//! centre lies within [`ZONE_REACH_DEGREES`] of it (its zone). A record no grid reaches gets
//! a grid of its own by the documented rule: centred on the mean direction of every record
//! still unreached, rounded to whole multiples of [`CENTRE_STEP_DEGREES`] (or on the first
//! unreached record rounded so, when the mean reaches none), repeated until every record
//! has a zone. So one far-away record never stops the count, a taxon recorded round the
//! globe is counted on a few grids, and the grid of a regional set stays where it was. Zones
//! lie at least 60° from each other's centres; two records either side of a zone's edge
//! can fall in cells that overlap on the ground, which only records within one cell of an
//! edge can do (the report gives how many do).
//!
//! The shifts: each zone's origin moves east and north by 0, ¼, ½ and ¾ of a cell (0,
//! 0.5, 1 and 1.5 km for 2 km cells), 16 origins per zone, the unshifted one the fixed
//! grid. The least count is the sum of each zone's least count.

use serde::Serialize;
use thiserror::Error;

use super::laea::Laea;
use crate::coordinates::LatLon;
use crate::sphere::{Vec3, dot, mean_direction, to_lat_lon, unit_vector};

/// How far (degrees of arc) a grid reaches: records farther from its centre are counted on
/// another zone's grid. Also how far from 52° N, 10° E every record may lie for
/// [`AooGrid::near`] to keep the default grid.
pub const ZONE_REACH_DEGREES: f64 = 60.0;
/// Centres the rule chooses are rounded to whole multiples of this (degrees), so that
/// adding a few records rarely moves a grid.
pub const CENTRE_STEP_DEGREES: f64 = 5.0;

/// The number of origin shifts along each axis; each shift is a quarter of a cell.
const SHIFTS_PER_AXIS: i32 = 4;

/// Why a grid could not be made or used.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum AooError {
    /// The cell size is not a usable length.
    #[error("cell size must be between 0.01 and 1000 km, got {0}")]
    InvalidCellSize(f64),
    /// A record lies where this one grid cannot hold it.
    #[error(
        "record at latitude {lat}, longitude {lon} is more than 90 degrees of arc from the \
         grid centre; centre the grid nearer the records"
    )]
    TooFarFromCentre {
        /// Latitude of the refused record.
        lat: f64,
        /// Longitude of the refused record.
        lon: f64,
    },
}

/// One equal-area grid: its cell size and the centre of its projection.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct AooGrid {
    cell_size_km: f64,
    centre: LatLon,
}

impl AooGrid {
    /// A grid of `cell_size_km` cells on the projection centred on `centre`.
    pub fn new(cell_size_km: f64, centre: LatLon) -> Result<Self, AooError> {
        if !(0.01..=1000.0).contains(&cell_size_km) {
            return Err(AooError::InvalidCellSize(cell_size_km));
        }
        Ok(Self { cell_size_km, centre })
    }

    /// The side of one square cell in km.
    pub fn cell_size_km(&self) -> f64 {
        self.cell_size_km
    }

    /// The centre of the projection, which is also a corner of the unshifted grid.
    pub fn centre(&self) -> LatLon {
        self.centre
    }

    /// Projects a record to easting and northing in metres from the grid centre.
    ///
    /// Cell `(⌊easting / size⌋, ⌊northing / size⌋)` of the fixed grid holds the record.
    pub fn project(&self, point: LatLon) -> Result<[f64; 2], AooError> {
        self.projection()
            .forward(unit_vector(point))
            .map(|(x, y)| [x, y])
            .ok_or(AooError::TooFarFromCentre { lat: point.lat(), lon: point.lon() })
    }

    fn projection(&self) -> Laea {
        Laea::new(self.centre.lat(), self.centre.lon())
    }

    /// The unit vector of the centre, for [`within_reach`].
    fn centre_vector(&self) -> Vec3 {
        unit_vector(self.centre)
    }

    /// The first grid for a set of positions by the documented rule (see the module notes):
    /// `None` when the default grid reaches every one of them (or there are none), else the
    /// grid centred on their mean rounded to whole 5° steps. Positions spread so evenly
    /// round the globe that they have no mean direction keep the default.
    pub fn near(positions: &[LatLon]) -> Option<AooGrid> {
        let default = AooGrid::default();
        let vectors: Vec<Vec3> = positions.iter().map(|p| unit_vector(*p)).collect();
        let centre = default.centre_vector();
        if vectors.iter().all(|v| within_reach(centre, *v)) {
            return None;
        }
        let mean = mean_direction(vectors.iter().copied())?;
        AooGrid::new(default.cell_size_km, rounded_centre(mean)).ok()
    }

    /// A PROJ string describing the same projection, for checking against other tools.
    pub fn proj_string(&self) -> String {
        format!(
            "+proj=laea +lat_0={} +lon_0={} +x_0=0 +y_0=0 +ellps=WGS84 +units=m +no_defs",
            self.centre.lat(),
            self.centre.lon()
        )
    }
}

/// The cosine of [`ZONE_REACH_DEGREES`].
fn reach_cosine() -> f64 {
    ZONE_REACH_DEGREES.to_radians().cos()
}

/// Whether `vector` lies within [`ZONE_REACH_DEGREES`] of the centre `centre`.
fn within_reach(centre: Vec3, vector: Vec3) -> bool {
    dot(vector, centre) >= reach_cosine()
}

impl Default for AooGrid {
    /// 2 km cells on the projection centred on 52° N, 10° E.
    fn default() -> Self {
        let centre = LatLon::new(52.0, 10.0).expect("52 N, 10 E is a valid position");
        Self { cell_size_km: 2.0, centre }
    }
}

/// A direction rounded to whole [`CENTRE_STEP_DEGREES`] of latitude and longitude
/// (longitude 0 on a pole, 180° rather than −180°).
fn rounded_centre(direction: Vec3) -> LatLon {
    let position = to_lat_lon(direction);
    let step = |value: f64| (value / CENTRE_STEP_DEGREES).round() * CENTRE_STEP_DEGREES;
    let lat = step(position.lat());
    let lon = if lat.abs() == 90.0 { 0.0 } else { step(position.lon()) };
    let lon = if lon <= -180.0 { lon + 360.0 } else { lon };
    LatLon::new(lat, lon).expect("a rounded position is in range")
}

/// The grids records are counted on, zone by zone (see the module notes).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct GridPlan {
    grids: Vec<AooGrid>,
}

impl GridPlan {
    /// A plan whose first zone is `grid`.
    pub fn starting_with(grid: AooGrid) -> Self {
        Self { grids: vec![grid] }
    }

    /// The plan the rule gives for `points` alone: the default grid when it reaches them
    /// all, else zones centred on them.
    pub fn for_points(points: &[LatLon]) -> Self {
        let default = AooGrid::default();
        let centre = default.centre_vector();
        if points.iter().all(|p| within_reach(centre, unit_vector(*p))) {
            Self::starting_with(default)
        } else {
            Self { grids: Vec::new() }.covering(points)
        }
    }

    /// This plan with zones added, by the rule, for every point no grid reaches yet.
    pub fn covering(self, points: &[LatLon]) -> Self {
        let vectors: Vec<Vec3> = points.iter().map(|p| unit_vector(*p)).collect();
        self.covering_vectors(&vectors)
    }

    fn covering_vectors(mut self, vectors: &[Vec3]) -> Self {
        let cell_size_km = self.grids.first().map_or(AooGrid::default().cell_size_km, |g| g.cell_size_km);
        let centres = self.centre_vectors();
        let mut unreached: Vec<Vec3> =
            vectors.iter().copied().filter(|v| zone_of(&centres, *v, reach_cosine()).is_none()).collect();
        while let Some(&first) = unreached.first() {
            let by_mean = mean_direction(unreached.iter().copied()).map(rounded_centre);
            let reaches_some = |centre: Vec3| unreached.iter().any(|v| within_reach(centre, *v));
            let centre = match by_mean {
                Some(c) if reaches_some(unit_vector(c)) => c,
                _ => rounded_centre(first),
            };
            let vector = unit_vector(centre);
            unreached.retain(|v| !within_reach(vector, *v));
            self.grids.push(AooGrid { cell_size_km, centre });
        }
        self
    }

    /// The grids, zone by zone.
    pub fn grids(&self) -> &[AooGrid] {
        &self.grids
    }

    fn centre_vectors(&self) -> Vec<Vec3> {
        self.grids.iter().map(AooGrid::centre_vector).collect()
    }
}

/// The zone (index into the plan's grids, given by their centres) a record belongs to;
/// `reach` is [`reach_cosine`], computed once by the caller.
fn zone_of(centres: &[Vec3], vector: Vec3, reach: f64) -> Option<usize> {
    centres.iter().position(|c| dot(vector, *c) >= reach)
}

/// The area of occupancy of a set of records.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Aoo {
    /// The side of one cell, km.
    pub cell_size_km: f64,
    /// The area of one cell, km².
    pub cell_area_km2: f64,
    /// Occupied cells of the fixed (unshifted) grids.
    pub occupied_cells: usize,
    /// `occupied_cells × cell_area_km2`: the AOO to report.
    pub area_km2: f64,
    /// The fewest occupied cells over the shifted origins (each zone's fewest, summed).
    pub min_occupied_cells: usize,
    /// `min_occupied_cells × cell_area_km2`.
    pub min_area_km2: f64,
    /// How many origins were tried in each zone (the fixed one included).
    pub origins_tried: usize,
    /// The count zone by zone, in the plan's order; zones holding no record are left out.
    pub zones: Vec<ZoneCount>,
    /// Records within one cell diagonal of the edge of an earlier zone, where cells of two
    /// zones may overlap on the ground (see the module notes).
    pub records_near_zone_edges: usize,
}

/// One zone's share of the count.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ZoneCount {
    /// The zone's grid.
    pub grid: AooGrid,
    /// Records counted on it.
    pub records: usize,
    /// Its occupied cells on the fixed grid.
    pub occupied_cells: usize,
    /// Its fewest occupied cells over the shifted origins.
    pub min_occupied_cells: usize,
    /// The first origin shift (east, north) in km that gives the fewest cells.
    pub min_origin_shift_km: [f64; 2],
}

/// Counts the occupied cells of `points` on the plan's grids (with zones added for any
/// record the plan does not reach) and on their shifted copies.
pub fn aoo(points: &[LatLon], plan: &GridPlan) -> Aoo {
    let vectors: Vec<Vec3> = points.iter().map(|p| unit_vector(*p)).collect();
    aoo_of_vectors(&vectors, plan).0
}

/// Each record's quarter cell in its zone's grid, and the zone when there are several, for
/// counting any subset of the records.
#[derive(Debug, Clone)]
pub(crate) struct FineCells {
    cells: Vec<u64>,
    /// Each record's zone; `None` when every record is in the first.
    zones: Option<Vec<u32>>,
}

impl FineCells {
    fn zone(&self, record: usize) -> u32 {
        self.zones.as_ref().map_or(0, |z| z[record])
    }
}

/// [`aoo`] on the records' unit vectors, with the fine cell of each record.
pub(crate) fn aoo_of_vectors(vectors: &[Vec3], plan: &GridPlan) -> (Aoo, FineCells) {
    let plan = plan.clone().covering_vectors_if_needed(vectors);
    let centres = plan.centre_vectors();
    let reach = reach_cosine();
    let projections: Vec<Laea> = plan.grids.iter().map(AooGrid::projection).collect();
    let steps: Vec<f64> = plan.grids.iter().map(|g| g.cell_size_km * 1000.0 / f64::from(SHIFTS_PER_AXIS)).collect();
    let fine_cell = |zone: usize, vector: Vec3| {
        let (x, y) = projections[zone].forward(vector).expect("a zone reaches 60°, within the projection's 90°");
        pack(floor_to_i32(x / steps[zone]), floor_to_i32(y / steps[zone]))
    };
    let fine = if plan.grids.len() == 1 {
        FineCells { cells: vectors.iter().map(|&v| fine_cell(0, v)).collect(), zones: None }
    } else {
        let zones: Vec<u32> = vectors
            .iter()
            .map(|&v| zone_of(&centres, v, reach).expect("the plan covers every record") as u32)
            .collect();
        let cells = vectors.iter().zip(&zones).map(|(&v, &z)| fine_cell(z as usize, v)).collect();
        FineCells { cells, zones: Some(zones) }
    };
    let cell_size_km = plan.grids[0].cell_size_km;
    let mut zones = Vec::new();
    for (zone, grid) in plan.grids.iter().enumerate() {
        let selected: Vec<u64>;
        let in_zone: &[u64] = match &fine.zones {
            None => &fine.cells,
            Some(z) => {
                selected = fine.cells.iter().zip(z).filter(|(_, z)| **z as usize == zone).map(|(c, _)| *c).collect();
                &selected
            }
        };
        let records = in_zone.len();
        if records == 0 {
            continue;
        }
        let cells = distinct_cells(in_zone);
        let counts: Vec<([i32; 2], usize)> =
            origin_shifts().map(|shift| (shift, cells_with_origin_shift(&cells, shift))).collect();
        // `min_by_key` keeps the first of equal minima, so ties go to the smallest shift.
        let (min_shift, min_cells) = *counts.iter().min_by_key(|(_, n)| *n).expect("16 origins");
        zones.push(ZoneCount {
            grid: *grid,
            records,
            occupied_cells: counts[0].1,
            min_occupied_cells: min_cells,
            min_origin_shift_km: min_shift.map(|quarters| f64::from(quarters) * steps[zone] / 1000.0),
        });
    }
    let occupied_cells = zones.iter().map(|z| z.occupied_cells).sum();
    let min_occupied_cells = zones.iter().map(|z| z.min_occupied_cells).sum();
    let cell_area_km2 = cell_size_km * cell_size_km;
    let aoo = Aoo {
        cell_size_km,
        cell_area_km2,
        occupied_cells,
        area_km2: occupied_cells as f64 * cell_area_km2,
        min_occupied_cells,
        min_area_km2: min_occupied_cells as f64 * cell_area_km2,
        origins_tried: (SHIFTS_PER_AXIS * SHIFTS_PER_AXIS) as usize,
        zones,
        records_near_zone_edges: near_zone_edges(vectors, &fine, &centres, cell_size_km),
    };
    (aoo, fine)
}

/// ⌊x⌋ as a whole number, without a call to the C library's floor (x86-64's baseline has
/// no rounding instruction); cell indices fit an i32 for any grid on Earth.
fn floor_to_i32(x: f64) -> i32 {
    let truncated = x as i32;
    if f64::from(truncated) > x { truncated - 1 } else { truncated }
}

impl GridPlan {
    /// [`GridPlan::covering`] for records already located; no work when the plan already
    /// reaches every record (the usual case).
    fn covering_vectors_if_needed(self, vectors: &[Vec3]) -> Self {
        let (centres, reach) = (self.centre_vectors(), reach_cosine());
        if vectors.iter().all(|v| zone_of(&centres, *v, reach).is_some()) {
            return self;
        }
        self.covering_vectors(vectors)
    }
}

/// Records of a later zone lying within one cell diagonal outside an earlier zone's reach.
fn near_zone_edges(vectors: &[Vec3], fine: &FineCells, centres: &[Vec3], cell_size_km: f64) -> usize {
    if centres.len() < 2 {
        return 0;
    }
    let margin = (cell_size_km * std::f64::consts::SQRT_2 / crate::sphere::MEAN_EARTH_RADIUS_KM).to_degrees();
    let inner_cos = (ZONE_REACH_DEGREES + margin).to_radians().cos();
    (0..vectors.len())
        .filter(|&record| centres[..fine.zone(record) as usize].iter().any(|c| dot(vectors[record], *c) >= inner_cos))
        .count()
}

impl FineCells {
    /// Numbers the distinct whole cells of the fixed grids 0, 1, 2… and gives each record
    /// its cell's number.
    pub(crate) fn whole_cells(&self) -> CellsOfRecords {
        let whole = |record: usize| {
            let (i, j) = unpack(self.cells[record]);
            (self.zone(record), pack(i.div_euclid(SHIFTS_PER_AXIS), j.div_euclid(SHIFTS_PER_AXIS)))
        };
        let mut order: Vec<((u32, u64), u32)> =
            (0..self.cells.len()).map(|record| (whole(record), record as u32)).collect();
        order.sort_unstable();
        let mut record_cell = vec![0u32; self.cells.len()];
        let mut next = 0u32;
        for (k, &(cell, record)) in order.iter().enumerate() {
            if k > 0 && order[k - 1].0 != cell {
                next += 1;
            }
            record_cell[record as usize] = next;
        }
        let cells = if order.is_empty() { 0 } else { next as usize + 1 };
        CellsOfRecords { record_cell, cells }
    }
}

/// Which fixed-grid cell holds each record, as dense numbers 0..cells.
#[derive(Debug, Clone)]
pub(crate) struct CellsOfRecords {
    pub(crate) record_cell: Vec<u32>,
    pub(crate) cells: usize,
}

/// Bounding boxes of at most this many fine cells are marked in a bitmap (8 MB at most).
const BITMAP_CELLS: u64 = 1 << 26;

/// The distinct packed cells, in no particular order: marked in a bitmap over their
/// bounding box when it is small enough (the usual case: a million records on 500 km of
/// coast mark a few hundred thousand bits), sorted and deduplicated otherwise.
fn distinct_cells(cells: &[u64]) -> Vec<u64> {
    let (mut west, mut east, mut south, mut north) = (i32::MAX, i32::MIN, i32::MAX, i32::MIN);
    for &cell in cells {
        let (i, j) = unpack(cell);
        (west, east, south, north) = (west.min(i), east.max(i), south.min(j), north.max(j));
    }
    let width = (i64::from(east) - i64::from(west) + 1) as u64;
    let height = (i64::from(north) - i64::from(south) + 1) as u64;
    if cells.is_empty() || width.saturating_mul(height) > BITMAP_CELLS {
        let mut sorted = cells.to_vec();
        sorted.sort_unstable();
        sorted.dedup();
        return sorted;
    }
    let mut bits = vec![0u64; (width * height).div_ceil(64) as usize];
    for &cell in cells {
        let (i, j) = unpack(cell);
        let k = (i - west) as u64 * height + (j - south) as u64;
        bits[(k / 64) as usize] |= 1 << (k % 64);
    }
    let mut distinct = Vec::new();
    for (word_index, &word) in bits.iter().enumerate() {
        let mut word = word;
        while word != 0 {
            let k = word_index as u64 * 64 + u64::from(word.trailing_zeros());
            distinct.push(pack(west + (k / height) as i32, south + (k % height) as i32));
            word &= word - 1;
        }
    }
    distinct
}

/// The origin shifts in quarter cells (east, north), the unshifted grid first.
fn origin_shifts() -> impl Iterator<Item = [i32; 2]> {
    (0..SHIFTS_PER_AXIS).flat_map(|east| (0..SHIFTS_PER_AXIS).map(move |north| [east, north]))
}

/// Packs a cell's (east, north) indices into one integer, which sorts faster than a pair.
fn pack(east: i32, north: i32) -> u64 {
    (u64::from(east as u32) << 32) | u64::from(north as u32)
}

fn unpack(cell: u64) -> (i32, i32) {
    ((cell >> 32) as u32 as i32, cell as u32 as i32)
}

/// Counts cells of the grid whose origin lies `shift_east` quarter cells east and
/// `shift_north` quarter cells north of the centre.
///
/// A point in quarter cell `i` lies in whole cell `⌊(i − shift) / 4⌋` of the shifted grid
/// (Euclidean division is that floor for negative indices too).
fn cells_with_origin_shift(fine_cells: &[u64], [shift_east, shift_north]: [i32; 2]) -> usize {
    let whole_cell = |quarter: i32, shift: i32| (quarter - shift).div_euclid(SHIFTS_PER_AXIS);
    let cells: Vec<u64> = fine_cells
        .iter()
        .map(|&cell| {
            let (i, j) = unpack(cell);
            pack(whole_cell(i, shift_east), whole_cell(j, shift_north))
        })
        .collect();
    distinct_cells(&cells).len()
}
