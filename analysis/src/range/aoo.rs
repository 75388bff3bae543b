//! Area of occupancy: occupied cells of an equal-area grid, times the cell area.
//!
//! The IUCN Guidelines prescribe 2 × 2 km cells but no grid origin, and the origin changes
//! the count. wrackline fixes the grid and also reports the smallest count over a set of
//! shifted origins, so an assessor sees how much the figure owes to where the lines fall.
//!
//! The grid: a Lambert azimuthal equal-area projection on WGS84 centred on
//! [`AooGrid::centre`] (by default 52° N, 10° E, the centre of the European LAEA reference
//! grid, EPSG:3035, here without its false easting and northing). Cell edges lie at whole
//! multiples of the cell size east and north of the centre, so the centre is a cell corner.
//!
//! The shifts: the origin moves east and north by 0, ¼, ½ and ¾ of a cell (0, 0.5, 1 and
//! 1.5 km for 2 km cells), 16 origins in all, of which the unshifted one is the fixed grid.
//!
//! Records far from Europe need a grid centred elsewhere (the projection refuses points
//! more than 90° of arc from its centre and stretches cells well before that).
//! [`AooGrid::near`] is the documented rule: the default grid while every position lies
//! within [`FAR_FROM_DEFAULT_DEGREES`] of 52° N, 10° E; otherwise a grid centred on the
//! positions' mean (the mean of their unit vectors) rounded to whole multiples of
//! [`CENTRE_STEP_DEGREES`], so that adding a few records rarely moves it.

use serde::Serialize;
use thiserror::Error;

use super::laea::Laea;
use crate::coordinates::LatLon;

/// Positions further than this (degrees of arc) from the default centre make
/// [`AooGrid::near`] centre the grid on them instead.
pub const FAR_FROM_DEFAULT_DEGREES: f64 = 60.0;
/// [`AooGrid::near`] rounds the centre it chooses to whole multiples of this (degrees).
pub const CENTRE_STEP_DEGREES: f64 = 5.0;
/// Farthest latitude [`AooGrid::near`] puts a centre at (inside the ±80° the grid allows).
const RULE_MAX_LATITUDE: f64 = 75.0;

/// The number of origin shifts along each axis; each shift is a quarter of a cell.
const SHIFTS_PER_AXIS: i32 = 4;

/// Why an AOO could not be computed.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum AooError {
    /// The cell size is not a usable length.
    #[error("cell size must be between 0.01 and 1000 km, got {0}")]
    InvalidCellSize(f64),
    /// The projection centre is too close to a pole for the oblique formulas.
    #[error("grid centre latitude must be between -80 and 80 degrees, got {0}")]
    CentreTooCloseToPole(f64),
    /// A record lies where the grid cannot hold it.
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

/// The grid AOO is counted on: its cell size and the centre of its projection.
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
        if centre.lat().abs() > 80.0 {
            return Err(AooError::CentreTooCloseToPole(centre.lat()));
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
        Laea::new(self.centre.lat(), self.centre.lon())
            .forward(point.lat(), point.lon())
            .map(|(x, y)| [x, y])
            .ok_or(AooError::TooFarFromCentre { lat: point.lat(), lon: point.lon() })
    }

    /// The default grid's cell size centred by the documented rule for `positions`
    /// (see the module notes): `None` when the default grid already fits them (or there
    /// are none), else the grid centred on their mean rounded to whole 5° steps. Positions
    /// spread so evenly round the globe that they have no mean direction keep the default,
    /// and counting them will say which record lies too far.
    pub fn near(positions: &[LatLon]) -> Option<AooGrid> {
        let default = AooGrid::default();
        if positions.iter().all(|p| arc_degrees(*p, default.centre) <= FAR_FROM_DEFAULT_DEGREES) {
            return None;
        }
        let mean = mean_direction(positions)?;
        let step = |value: f64| (value / CENTRE_STEP_DEGREES).round() * CENTRE_STEP_DEGREES;
        let lat = step(mean.lat()).clamp(-RULE_MAX_LATITUDE, RULE_MAX_LATITUDE);
        let lon = step(mean.lon());
        let lon = if lon > 180.0 {
            lon - 360.0
        } else if lon <= -180.0 {
            lon + 360.0
        } else {
            lon
        };
        let centre = LatLon::new(lat, lon).ok()?;
        AooGrid::new(default.cell_size_km, centre).ok()
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

impl Default for AooGrid {
    /// 2 km cells on the projection centred on 52° N, 10° E.
    fn default() -> Self {
        let centre = LatLon::new(52.0, 10.0).expect("52 N, 10 E is a valid position");
        Self { cell_size_km: 2.0, centre }
    }
}

fn unit_vector(p: LatLon) -> [f64; 3] {
    let (lat, lon) = (p.lat().to_radians(), p.lon().to_radians());
    [lat.cos() * lon.cos(), lat.cos() * lon.sin(), lat.sin()]
}

/// Great-circle angle between two positions on the sphere, in degrees (geodetic
/// latitudes used as they are: ample for choosing a grid centre).
fn arc_degrees(a: LatLon, b: LatLon) -> f64 {
    let (u, v) = (unit_vector(a), unit_vector(b));
    let dot: f64 = u.iter().zip(&v).map(|(x, y)| x * y).sum();
    dot.clamp(-1.0, 1.0).acos().to_degrees()
}

/// The direction of the sum of the positions' unit vectors; `None` when they cancel out.
fn mean_direction(positions: &[LatLon]) -> Option<LatLon> {
    let sum = positions.iter().map(|p| unit_vector(*p)).fold([0.0; 3], |s, u| [s[0] + u[0], s[1] + u[1], s[2] + u[2]]);
    let norm = (sum[0] * sum[0] + sum[1] * sum[1] + sum[2] * sum[2]).sqrt();
    if norm < 1e-9 {
        return None;
    }
    let lat = (sum[2] / norm).clamp(-1.0, 1.0).asin().to_degrees();
    let lon = sum[1].atan2(sum[0]).to_degrees();
    LatLon::new(lat, lon).ok()
}

/// The area of occupancy of a set of records.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Aoo {
    /// The grid the cells were counted on.
    pub grid: AooGrid,
    /// The area of one cell, km².
    pub cell_area_km2: f64,
    /// Occupied cells of the fixed (unshifted) grid.
    pub occupied_cells: usize,
    /// `occupied_cells × cell_area_km2`: the AOO to report.
    pub area_km2: f64,
    /// The fewest occupied cells over all shifted origins.
    pub min_occupied_cells: usize,
    /// `min_occupied_cells × cell_area_km2`.
    pub min_area_km2: f64,
    /// The first origin shift (east, north) in km that gives the fewest cells.
    pub min_origin_shift_km: [f64; 2],
    /// How many origins were tried (the fixed one included).
    pub origins_tried: usize,
}

/// Counts the occupied cells of `grid` and of its shifted copies.
pub fn aoo(points: &[LatLon], grid: &AooGrid) -> Result<Aoo, AooError> {
    let step_m = grid.cell_size_km * 1000.0 / f64::from(SHIFTS_PER_AXIS);
    let fine_cells = occupied_fine_cells(points, grid, step_m)?;
    let counts: Vec<([i32; 2], usize)> =
        origin_shifts().map(|shift| (shift, cells_with_origin_shift(&fine_cells, shift))).collect();
    let occupied_cells = counts[0].1;
    // `min_by_key` keeps the first of equal minima, so ties go to the smallest shift.
    let (min_shift, min_occupied_cells) = *counts.iter().min_by_key(|(_, cells)| *cells).expect("16 origins");
    let cell_area_km2 = grid.cell_size_km * grid.cell_size_km;
    Ok(Aoo {
        grid: *grid,
        cell_area_km2,
        occupied_cells,
        area_km2: occupied_cells as f64 * cell_area_km2,
        min_occupied_cells,
        min_area_km2: min_occupied_cells as f64 * cell_area_km2,
        min_origin_shift_km: min_shift.map(|quarters| f64::from(quarters) * step_m / 1000.0),
        origins_tried: counts.len(),
    })
}

/// The origin shifts in quarter cells (east, north), the unshifted grid first.
fn origin_shifts() -> impl Iterator<Item = [i32; 2]> {
    (0..SHIFTS_PER_AXIS).flat_map(|east| (0..SHIFTS_PER_AXIS).map(move |north| [east, north]))
}

/// Distinct occupied cells of the quarter-cell grid, as packed (east, north) indices.
///
/// Every shifted grid's cells are unions of 4 × 4 of these, so the points are projected
/// and deduplicated once and each shifted count works on the (usually far fewer) cells.
fn occupied_fine_cells(points: &[LatLon], grid: &AooGrid, step_m: f64) -> Result<Vec<u64>, AooError> {
    let projection = Laea::new(grid.centre.lat(), grid.centre.lon());
    let mut cells = points
        .iter()
        .map(|p| {
            let (x, y) = projection
                .forward(p.lat(), p.lon())
                .ok_or(AooError::TooFarFromCentre { lat: p.lat(), lon: p.lon() })?;
            Ok(pack((x / step_m).floor() as i32, (y / step_m).floor() as i32))
        })
        .collect::<Result<Vec<_>, _>>()?;
    cells.sort_unstable();
    cells.dedup();
    Ok(cells)
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
    let mut cells: Vec<u64> = fine_cells
        .iter()
        .map(|&cell| {
            let (i, j) = unpack(cell);
            pack(whole_cell(i, shift_east), whole_cell(j, shift_north))
        })
        .collect();
    cells.sort_unstable();
    cells.dedup();
    cells.len()
}
