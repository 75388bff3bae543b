//! Range figures from point records: EOO, AOO and the criterion-B comparison.
//!
//! [`summary`] is what a command or handler usually wants: both figures, the IUCN
//! adjustment that raises EOO to AOO when it is smaller (Guidelines §4.9), and the
//! threshold text. [`eoo`] and [`aoo`] give each figure alone.

mod aoo;
mod eoo;
mod laea;

use serde::Serialize;

pub use aoo::{Aoo, AooError, AooGrid, CENTRE_STEP_DEGREES, FAR_FROM_DEFAULT_DEGREES, aoo};
pub use eoo::{Eoo, LongitudeFrame, eoo, polygon_area_km2};

use crate::coordinates::LatLon;
use crate::criteria::{CriterionB, criterion_b};

/// EOO and AOO of one set of records, with the adjustment and the criterion-B comparison.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RangeSummary {
    /// The extent of occurrence as measured (`eoo.area_km2` is the raw hull area).
    pub eoo: Eoo,
    /// The area of occupancy on the fixed grid, with the minimum over shifted origins.
    pub aoo: Aoo,
    /// The EOO to report: the raw hull area, or the fixed-grid AOO when that is larger.
    pub eoo_km2: f64,
    /// Whether `eoo_km2` was raised to the AOO.
    pub eoo_raised_to_aoo: bool,
    /// The reported EOO and AOO against the criterion-B thresholds.
    pub criterion_b: CriterionB,
    /// How the figures were computed, in plain text.
    pub method: String,
}

/// Computes EOO and AOO of `points` on `grid` and compares them with criterion B.
///
/// EOO is raised to the fixed-grid AOO when it is smaller, because the extent cannot be
/// less than the area occupied (IUCN Guidelines §4.9); both values are kept.
pub fn summary(points: &[LatLon], grid: &AooGrid) -> Result<RangeSummary, AooError> {
    let eoo = eoo(points);
    let aoo = aoo(points, grid)?;
    let eoo_raised_to_aoo = eoo.area_km2 < aoo.area_km2;
    let eoo_km2 = eoo.area_km2.max(aoo.area_km2);
    let criterion_b = criterion_b(eoo_km2, aoo.area_km2);
    let method = method_text(&eoo, &aoo, eoo_raised_to_aoo);
    Ok(RangeSummary { eoo, aoo, eoo_km2, eoo_raised_to_aoo, criterion_b, method })
}

fn method_text(eoo: &Eoo, aoo: &Aoo, eoo_raised_to_aoo: bool) -> String {
    let raised = if eoo_raised_to_aoo {
        format!(" The hull area ({:.1} km²) is below the AOO, so EOO is reported as the AOO.", eoo.area_km2)
    } else {
        String::new()
    };
    format!(
        "EOO: geodesic area on WGS84 of the minimum convex polygon around {n} records.{raised} \
         AOO: {cells} occupied {size} × {size} km cells of a Lambert azimuthal equal-area grid \
         centred on {lat}°, {lon}° (a cell corner), {min} cells at the least over {origins} \
         grid origins shifted by quarter cells.",
        n = eoo.point_count,
        cells = aoo.occupied_cells,
        size = aoo.grid.cell_size_km(),
        lat = aoo.grid.centre().lat(),
        lon = aoo.grid.centre().lon(),
        min = aoo.min_occupied_cells,
        origins = aoo.origins_tried,
    )
}
