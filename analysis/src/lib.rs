//! Range and trend figures for assessments: EOO, AOO, effort-corrected trends. Plain data in, plain data out.
//!
//! This crate exists so that the figures an assessor quotes are computed in one place, by
//! code that knows nothing of the database, the network or the browser, and that is tested
//! against published worked examples and general-purpose reference libraries. The server's
//! command line and HTTP handlers, and the app if it wants offline figures, all call it.
//!
//! - [`range`]: extent of occurrence (EOO) and area of occupancy (AOO) from point records.
//! - [`trend`]: effort-corrected encounter-rate trends (Poisson GLM, Mann–Kendall, Sen's slope).
//! - [`criteria`]: the published threshold tables for criteria A and B, as data and plain text.
//!
//! Every figure here is an input to a threatened-species assessment, never a listing
//! decision: see [`criteria::ASSESSMENT_CAUTION`].
//!
//! ```
//! use analysis::{LatLon, range, trend};
//!
//! let records = [(50.36, -4.14), (50.10, -5.55), (50.72, -1.88), (50.60, -3.40)]
//!     .map(|(lat, lon)| LatLon::new(lat, lon).unwrap());
//! let figures = range::summary(&records, &range::AooGrid::default()).unwrap();
//! assert_eq!(figures.aoo.area_km2, 16.0);
//! assert!(figures.criterion_b.text.contains("not a listing decision"));
//!
//! let years: Vec<trend::YearCount> = (2015..2025)
//!     .map(|year| trend::YearCount { year, count: (40 - 2 * (year - 2015)) as u64, effort: 25.0 })
//!     .collect();
//! let trend = trend::yearly_trend(&years, 8.0).unwrap();
//! assert_eq!(trend.window_years, 24.0);
//! assert!(trend.window_change.estimate < 0.0);
//! ```

pub mod coordinates;
pub mod criteria;
mod normal;
pub mod range;
pub mod trend;

pub use coordinates::{CoordinateError, LatLon};
