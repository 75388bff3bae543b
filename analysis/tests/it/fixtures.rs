//! Loads the reference fixtures written by `tests/reference/make_reference.py`.

use analysis::LatLon;
use serde::Deserialize;

fn load<T: for<'de> Deserialize<'de>>(name: &str) -> T {
    let path = format!("{}/tests/reference/{name}", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("reading {path}: {e}"));
    serde_json::from_str(&text).unwrap_or_else(|e| panic!("parsing {path}: {e}"))
}

#[derive(Deserialize)]
pub struct RangeFixture {
    pub sets: Vec<PointSet>,
    pub projection: Vec<ProjectedPoint>,
}

#[derive(Deserialize)]
pub struct PointSet {
    pub name: String,
    pub grid_centre: [f64; 2],
    pub cell_size_km: f64,
    pub points: Vec<[f64; 2]>,
    pub longitude_frame: String,
    pub eoo_km2: f64,
    pub hull_corners: usize,
    pub aoo_cells_by_shift: Vec<ShiftCount>,
    /// The centre the documented default-grid rule gives for these points.
    pub rule_centre: [f64; 2],
    /// Cell counts on the grid centred there.
    pub aoo_cells_by_shift_rule_grid: Vec<ShiftCount>,
}

#[derive(Deserialize)]
pub struct ShiftCount {
    pub east_quarters: u32,
    pub north_quarters: u32,
    pub cells: usize,
}

#[derive(Deserialize)]
pub struct ProjectedPoint {
    pub centre: [f64; 2],
    pub lat: f64,
    pub lon: f64,
    pub easting_m: f64,
    pub northing_m: f64,
}

impl PointSet {
    pub fn lat_lons(&self) -> Vec<LatLon> {
        self.points.iter().map(|[lat, lon]| LatLon::new(*lat, *lon).unwrap()).collect()
    }

    pub fn grid(&self) -> analysis::range::AooGrid {
        let centre = LatLon::new(self.grid_centre[0], self.grid_centre[1]).unwrap();
        analysis::range::AooGrid::new(self.cell_size_km, centre).unwrap()
    }

    pub fn fixed_grid_cells(&self) -> usize {
        self.aoo_cells_by_shift.iter().find(|c| c.east_quarters == 0 && c.north_quarters == 0).unwrap().cells
    }

    pub fn min_cells(&self) -> usize {
        self.aoo_cells_by_shift.iter().map(|c| c.cells).min().unwrap()
    }
}

pub fn range() -> RangeFixture {
    load("range.json")
}

pub fn point_set(name: &str) -> PointSet {
    range().sets.into_iter().find(|s| s.name == name).unwrap_or_else(|| panic!("no point set {name}"))
}

#[derive(Deserialize)]
pub struct TrendFixture {
    pub dobson: Dobson,
    pub yearly: Vec<YearlySeries>,
    pub general_design: GeneralDesign,
    pub mann_kendall: Vec<KendallSeries>,
}

#[derive(Deserialize)]
pub struct FitReference {
    pub params: Vec<f64>,
    pub bse: Vec<f64>,
    pub bse_scaled_pearson: Vec<f64>,
    /// 95% intervals per coefficient with the Poisson scale (normal quantile).
    pub conf_int_95: Vec<[f64; 2]>,
    /// 95% intervals with the Pearson scale and Student's t on the residual df (use_t=True).
    pub conf_int_95_scaled_t: Vec<[f64; 2]>,
    pub deviance: f64,
    pub pearson_chi2: f64,
    pub df_resid: usize,
}

#[derive(Deserialize)]
pub struct Dobson {
    pub rows: Vec<Vec<f64>>,
    pub deaths: Vec<f64>,
    pub person_years: Vec<f64>,
    #[serde(flatten)]
    pub fit: FitReference,
}

#[derive(Deserialize)]
pub struct YearlySeries {
    pub name: String,
    pub years: Vec<i32>,
    pub counts: Vec<u64>,
    pub effort: Vec<f64>,
    #[serde(flatten)]
    pub fit: FitReference,
}

#[derive(Deserialize)]
pub struct GeneralDesign {
    pub rows: Vec<Vec<f64>>,
    pub counts: Vec<f64>,
    pub offsets: Vec<f64>,
    #[serde(flatten)]
    pub fit: FitReference,
}

#[derive(Deserialize)]
pub struct KendallSeries {
    pub name: String,
    pub times: Vec<f64>,
    pub values: Vec<f64>,
    pub s: i64,
    pub var_s: f64,
    pub z: f64,
    pub p_value: f64,
    pub sen_slope: f64,
}

pub fn trend() -> TrendFixture {
    load("trend.json")
}
