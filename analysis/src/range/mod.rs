//! Range figures from point records: EOO, AOO and the criterion-B comparison, and what
//! tells a reviewer how far to trust them.
//!
//! [`summary`] is what a command or handler usually wants: both figures, the IUCN
//! adjustment that raises EOO to AOO when it is smaller (Guidelines §4.9), and the
//! threshold text. [`eoo`] and [`aoo`] give each figure alone. [`figures`] adds the
//! checks an assessor needs beside them: resampling intervals ([`Stability`]), the places
//! whose removal changes the figures most ([`Influence`]), records far from all others
//! ([`Outlier`]), and clusters at a stated distance as a guide to locations
//! ([`LocationGuide`]). [`compare_periods`] sets two periods side by side with the
//! uncertainty of the change.

mod aoo;
mod clusters;
mod compare;
mod eoo;
mod hull;
mod influence;
mod laea;
mod stability;

use serde::Serialize;

pub use aoo::{Aoo, AooError, AooGrid, CENTRE_STEP_DEGREES, GridPlan, ZONE_REACH_DEGREES, ZoneCount, aoo};
pub use clusters::{LocationGuide, Outlier, location_guide, outliers, single_linkage};
pub use compare::{ChangeSpread, PeriodComparison, RecordsChange, compare_periods, records_change};
pub use eoo::{Eoo, EooError, eoo, hull_outline, polygon_area_km2};
pub use influence::Influence;
pub use stability::{Spread, Stability};

use crate::coordinates::LatLon;
use crate::criteria::{CriterionB, criterion_b};
use crate::sphere::{Vec3, unit_vector};
use eoo::{GnomonicPlane, eoo_of_vectors};

/// EOO and AOO of one set of records, with the adjustment and the criterion-B comparison.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RangeSummary {
    /// The extent of occurrence as measured (`eoo.area_km2` is the raw hull area);
    /// `None` when the records do not lie within one hemisphere (see `eoo_problem`).
    pub eoo: Option<Eoo>,
    /// Why there is no EOO, in words.
    pub eoo_problem: Option<String>,
    /// The area of occupancy on the fixed grids, with the minimum over shifted origins.
    pub aoo: Aoo,
    /// The EOO to report: the raw hull area, or the fixed-grid AOO when that is larger;
    /// `None` with no EOO.
    pub eoo_km2: Option<f64>,
    /// Whether `eoo_km2` was raised to the AOO.
    pub eoo_raised_to_aoo: bool,
    /// The reported EOO and AOO against the criterion-B thresholds.
    pub criterion_b: CriterionB,
    /// How the figures were computed, in plain text.
    pub method: String,
}

/// Computes EOO and AOO of `points` (AOO on the plan's grids, zones added as needed) and
/// compares them with criterion B.
///
/// EOO is raised to the fixed-grid AOO when it is smaller, because the extent cannot be
/// less than the area occupied (IUCN Guidelines §4.9); both values are kept.
pub fn summary(points: &[LatLon], plan: &GridPlan) -> RangeSummary {
    summary_of_vectors(points, &unit_vectors(points), plan).0
}

/// What [`summary`] works out on the way that the other checks reuse.
struct Workings {
    plane: Option<GnomonicPlane>,
    fine_cells: aoo::FineCells,
}

/// Each record's unit vector: computed once, shared by the hull, the zones and the grids
/// (sines and cosines are most of the cost of a figure on a million records).
pub(crate) fn unit_vectors(points: &[LatLon]) -> Vec<Vec3> {
    points.iter().map(|p| unit_vector(*p)).collect()
}

fn summary_of_vectors(points: &[LatLon], vectors: &[Vec3], plan: &GridPlan) -> (RangeSummary, Workings) {
    let (aoo, fine_cells) = aoo::aoo_of_vectors(vectors, plan);
    let (eoo, plane, eoo_problem) = match eoo_of_vectors(points, vectors) {
        Ok((eoo, plane)) => (Some(eoo), plane, None),
        Err(problem) => (None, None, Some(problem.to_string())),
    };
    let raw = eoo.as_ref().map(|e| e.area_km2);
    let eoo_raised_to_aoo = raw.is_some_and(|area| area < aoo.area_km2);
    let eoo_km2 = raw.map(|area| area.max(aoo.area_km2));
    let criterion_b = criterion_b(eoo_km2, aoo.area_km2);
    let method = method_text(eoo.as_ref(), eoo_problem.as_deref(), &aoo, eoo_raised_to_aoo);
    let summary = RangeSummary { eoo, eoo_problem, aoo, eoo_km2, eoo_raised_to_aoo, criterion_b, method };
    (summary, Workings { plane, fine_cells })
}

fn method_text(eoo: Option<&Eoo>, problem: Option<&str>, aoo: &Aoo, eoo_raised_to_aoo: bool) -> String {
    let eoo_text = match (eoo, problem) {
        (Some(eoo), _) => {
            let raised = if eoo_raised_to_aoo {
                format!(" The hull area ({:.1} km²) is below the AOO, so EOO is reported as the AOO.", eoo.area_km2)
            } else {
                String::new()
            };
            format!(
                "EOO: the minimum convex polygon on the globe around {n} records (edges along great circles, \
                 drawn in a gnomonic projection centred among them), its area measured with geodesic edges on \
                 WGS84.{raised}",
                n = eoo.point_count
            )
        }
        (None, problem) => format!("EOO: not given: {}.", problem.unwrap_or("no records")),
    };
    let grids: Vec<String> = aoo
        .zones
        .iter()
        .map(|z| {
            format!(
                "{} on the grid centred on {}°, {}° ({} cells, {} at the least)",
                plural(z.records, "record"),
                z.grid.centre().lat(),
                z.grid.centre().lon(),
                z.occupied_cells,
                z.min_occupied_cells
            )
        })
        .collect();
    format!(
        "{eoo_text} AOO: {cells} occupied {size} × {size} km cells of Lambert azimuthal equal-area grids \
         ({grids}; each centre a cell corner), {min} cells at the least over {origins} grid origins shifted by \
         quarter cells.",
        cells = aoo.occupied_cells,
        size = aoo.cell_size_km,
        grids = grids.join("; "),
        min = aoo.min_occupied_cells,
        origins = aoo.origins_tried,
    )
}

fn plural(n: usize, word: &str) -> String {
    if n == 1 { format!("1 {word}") } else { format!("{n} {word}s") }
}

/// What [`figures`] computes beside the summary, and how.
#[derive(Debug, Clone, PartialEq)]
pub struct FigureOptions {
    /// The grids AOO is counted on (zones are added for records the plan does not reach).
    pub plan: GridPlan,
    /// Records linked by steps of at most this many km form one cluster (the location guide).
    pub cluster_km: f64,
    /// Records farther than this many km from every other record are listed as outliers.
    pub outlier_km: f64,
    /// Resamples for the stability intervals (0 skips them).
    pub resamples: usize,
    /// Seed of the resampling, so a report can be reproduced exactly.
    pub seed: u64,
    /// How many of the most influential places to list.
    pub influence_places: usize,
}

/// 10 km clusters as the location guide (common practice for a first look; the
/// assessor decides what a location is).
pub const DEFAULT_CLUSTER_KM: f64 = 10.0;
/// Records more than 500 km from every other record are listed for review (our choice: far
/// beyond a stranding network's stretch of coast, near enough to catch swapped signs and
/// mistyped degrees).
pub const DEFAULT_OUTLIER_KM: f64 = 500.0;
/// Resamples for the stability intervals (common practice: 200 give the 2.5% and 97.5%
/// points of a bootstrap to about a tenth of their spread; Efron & Tibshirani 1993, from memory).
pub const DEFAULT_RESAMPLES: usize = 200;
/// The seed wrackline's reports use, so two runs on the same records agree exactly.
pub const DEFAULT_SEED: u64 = 20_240_611;

impl Default for FigureOptions {
    fn default() -> Self {
        Self {
            plan: GridPlan::starting_with(AooGrid::default()),
            cluster_km: DEFAULT_CLUSTER_KM,
            outlier_km: DEFAULT_OUTLIER_KM,
            resamples: DEFAULT_RESAMPLES,
            seed: DEFAULT_SEED,
            influence_places: 10,
        }
    }
}

/// The summary and the checks that go beside it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RangeFigures {
    /// EOO, AOO and criterion B.
    #[serde(flatten)]
    pub summary: RangeSummary,
    /// How the figures vary when the records are resampled.
    pub stability: Option<Stability>,
    /// The places whose removal changes EOO or AOO most, most influential first.
    pub influence: Vec<Influence>,
    /// Places alone in their AOO cell: removing any one lowers AOO by one cell.
    pub places_alone_in_their_cell: usize,
    /// Records far from all others, for review.
    pub outliers: Vec<Outlier>,
    /// The records without the outliers: EOO, for comparison (`None` when there are no
    /// outliers or no EOO without them).
    pub eoo_km2_without_outliers: Option<f64>,
    /// Clusters at a stated distance, as a guide to locations.
    pub location_guide: LocationGuide,
}

/// Computes the summary and every check beside it.
pub fn figures(points: &[LatLon], options: &FigureOptions) -> RangeFigures {
    let (summary, workings) = summary_of_vectors(points, &unit_vectors(points), &options.plan);
    let cells = workings.fine_cells.whole_cells();
    let stability = (options.resamples > 0 && !points.is_empty()).then(|| {
        stability::resampled(points, workings.plane.as_ref(), &cells, &summary, options.resamples, options.seed)
    });
    let (influence, places_alone_in_their_cell) = influence::leave_one_place_out(
        points,
        workings.plane.as_ref(),
        summary.eoo.as_ref(),
        &cells,
        summary.aoo.cell_area_km2,
        options.influence_places,
    );
    let outliers = outliers(points, options.outlier_km);
    let eoo_km2_without_outliers = (!outliers.is_empty())
        .then(|| {
            let mut flagged = vec![false; points.len()];
            outliers.iter().flat_map(|o| &o.records).for_each(|&i| flagged[i] = true);
            let kept: Vec<LatLon> = points.iter().zip(&flagged).filter(|(_, f)| !**f).map(|(p, _)| *p).collect();
            eoo(&kept).ok().map(|e| e.area_km2)
        })
        .flatten();
    let location_guide = location_guide(points, options.cluster_km);
    RangeFigures {
        summary,
        stability,
        influence,
        places_alone_in_their_cell,
        outliers,
        eoo_km2_without_outliers,
        location_guide,
    }
}
