//! Loads the reference fixtures written by `tests/reference/make_reference.py`.

use analysis::LatLon;
use analysis::range::{AooGrid, GridPlan};
use serde::Deserialize;

fn load<T: for<'de> Deserialize<'de>>(name: &str) -> T {
    let path = format!("{}/tests/reference/{name}", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("reading {path}: {e}"));
    serde_json::from_str(&text).unwrap_or_else(|e| panic!("parsing {path}: {e}"))
}

pub fn lat_lons(points: &[[f64; 2]]) -> Vec<LatLon> {
    points.iter().map(|[lat, lon]| LatLon::new(*lat, *lon).unwrap()).collect()
}

#[derive(Deserialize)]
pub struct RangeFixture {
    pub sets: Vec<PointSet>,
    pub projection: Vec<ProjectedPoint>,
    pub comparisons: Vec<Comparison>,
    pub records_changes: Vec<RecordsChangeReference>,
}

#[derive(Deserialize)]
pub struct PointSet {
    pub name: String,
    pub first_grid: Option<[f64; 2]>,
    pub cell_size_km: f64,
    pub points: Vec<[f64; 2]>,
    pub expected: RangeExpected,
}

#[derive(Deserialize)]
pub struct RangeExpected {
    pub in_one_hemisphere: bool,
    pub near_centre: Option<[f64; 2]>,
    pub zones: Vec<ZoneReference>,
    pub records_near_zone_edges: usize,
    pub eoo_km2: Option<f64>,
    pub hull_corners: Option<Vec<[f64; 2]>>,
    pub influence: Vec<InfluenceReference>,
    pub places_alone_in_their_cell: usize,
    pub outliers_500_km: Vec<OutlierReference>,
    pub clusters_10_km: Vec<usize>,
    pub clusters_50_km: Vec<usize>,
    pub stability: Option<StabilityReference>,
}

#[derive(Deserialize)]
pub struct ZoneReference {
    pub centre: [f64; 2],
    pub records: usize,
    pub cells_by_shift: Vec<ShiftCount>,
}

impl ZoneReference {
    pub fn fixed_cells(&self) -> usize {
        self.cells_by_shift.iter().find(|c| c.east_quarters == 0 && c.north_quarters == 0).unwrap().cells
    }

    pub fn least_cells(&self) -> usize {
        self.cells_by_shift.iter().map(|c| c.cells).min().unwrap()
    }
}

#[derive(Deserialize)]
pub struct ShiftCount {
    pub east_quarters: u32,
    pub north_quarters: u32,
    pub cells: usize,
}

#[derive(Deserialize)]
pub struct InfluenceReference {
    pub position: [f64; 2],
    pub records: Vec<usize>,
    pub eoo_change_km2: f64,
    pub aoo_change_km2: f64,
}

#[derive(Deserialize)]
pub struct OutlierReference {
    pub position: [f64; 2],
    pub records: Vec<usize>,
    pub nearest_km: f64,
}

#[derive(Deserialize)]
pub struct StabilityReference {
    pub resamples: usize,
    pub seed: u64,
    pub eoo_km2: Option<SpreadReference>,
    pub aoo_km2: SpreadReference,
}

#[derive(Deserialize)]
pub struct SpreadReference {
    pub observed: f64,
    pub median: f64,
    pub lower: f64,
    pub upper: f64,
}

#[derive(Deserialize)]
pub struct ProjectedPoint {
    pub centre: [f64; 2],
    pub lat: f64,
    pub lon: f64,
    pub easting_m: f64,
    pub northing_m: f64,
}

#[derive(Deserialize)]
pub struct Comparison {
    pub name: String,
    pub years: Option<[f64; 2]>,
    pub seed: u64,
    pub earlier: Vec<[f64; 2]>,
    pub later: Vec<[f64; 2]>,
    pub expected: ComparisonExpected,
}

#[derive(Deserialize)]
pub struct ComparisonExpected {
    pub equal_records: usize,
    pub resamples: usize,
    pub eoo: ChangeReference,
    pub aoo: ChangeReference,
    pub records: Option<RecordsChangeReference>,
}

#[derive(Deserialize)]
pub struct ChangeReference {
    pub observed_km2: f64,
    pub median_km2: f64,
    pub lower_km2: f64,
    pub upper_km2: f64,
    pub median_percent: f64,
    pub lower_percent: f64,
    pub upper_percent: f64,
}

#[derive(Deserialize)]
pub struct RecordsChangeReference {
    pub counts: [u64; 2],
    pub years: [f64; 2],
    pub rate_ratio: f64,
    pub lower: f64,
    pub upper: f64,
    pub p_value: f64,
}

impl PointSet {
    pub fn lat_lons(&self) -> Vec<LatLon> {
        lat_lons(&self.points)
    }

    /// The plan the fixture's rule starts from: the given first grid, or the rule's own.
    pub fn plan(&self) -> GridPlan {
        match self.first_grid {
            Some([lat, lon]) => {
                GridPlan::starting_with(AooGrid::new(self.cell_size_km, LatLon::new(lat, lon).unwrap()).unwrap())
            }
            None => GridPlan::for_points(&self.lat_lons()),
        }
    }

    pub fn fixed_cells(&self) -> usize {
        self.expected.zones.iter().map(ZoneReference::fixed_cells).sum()
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
    pub z: Vec<f64>,
    pub p_values: Vec<f64>,
    pub bse_scaled_pearson: Vec<f64>,
    pub t_scaled: Vec<f64>,
    pub p_values_scaled_t: Vec<f64>,
    /// 95% intervals per coefficient with the Poisson scale (normal quantile).
    pub conf_int_95: Vec<[f64; 2]>,
    /// 95% intervals with the Pearson scale and Student's t on the residual df (use_t=True).
    pub conf_int_95_scaled_t: Vec<[f64; 2]>,
    pub deviance: f64,
    pub pearson_chi2: f64,
    pub df_resid: usize,
    pub log_likelihood: f64,
    pub aic: f64,
}

#[derive(Deserialize)]
pub struct NegBinReference {
    pub params: Option<Vec<f64>>,
    pub bse: Option<Vec<f64>>,
    pub alpha: f64,
    pub alpha_bse: Option<f64>,
    pub log_likelihood: f64,
    pub aic: f64,
    pub method: String,
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
    pub generation_length: f64,
    pub years: Vec<i32>,
    pub counts: Vec<u64>,
    pub effort: Vec<f64>,
    pub expected: TrendExpected,
}

#[derive(Deserialize)]
pub struct TrendExpected {
    pub window_years: f64,
    pub first_year: i32,
    pub last_year: i32,
    pub years_fitted: usize,
    pub poisson: FitReference,
    pub negative_binomial: NegBinReference,
    pub chosen: String,
    pub slope: f64,
    pub slope_se: f64,
    pub quantile: f64,
    pub degrees_of_freedom: Option<usize>,
    pub slope_p: f64,
    pub annual_change: [f64; 3],
    pub window_change: Option<[f64; 3]>,
    pub a2_span: Option<[Option<String>; 2]>,
    pub a1_span: Option<[Option<String>; 2]>,
    pub mann_kendall: KendallExpected,
}

#[derive(Deserialize)]
pub struct KendallExpected {
    pub s: i64,
    pub var_s: f64,
    pub z: f64,
    pub p_value: f64,
    pub sen_slope: f64,
}

#[derive(Deserialize)]
pub struct GeneralDesign {
    pub rows: Vec<Vec<f64>>,
    pub counts: Vec<f64>,
    pub offsets: Vec<f64>,
    #[serde(flatten)]
    pub fit: FitReference,
    pub negative_binomial: NegBinReference,
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
