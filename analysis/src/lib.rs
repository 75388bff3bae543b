//! Range and trend figures for assessments: EOO, AOO, effort-corrected trends, and the
//! checks that say how far to trust them. Plain data in, plain data out.
//!
//! This crate exists so that the figures an assessor quotes are computed in one place, by
//! code that knows nothing of the database, the network or the browser, and that is tested
//! against published worked examples and general-purpose reference libraries. The server's
//! command line and HTTP handlers, and the app if it wants offline figures, all call it.
//!
//! - [`range`]: extent of occurrence (EOO, the minimum convex polygon on the globe, its area
//!   on WGS84) and area of occupancy (AOO, equal-area grids anywhere) from point records,
//!   with resampling intervals, leave-one-out influence, outliers, a location guide and
//!   comparisons between periods.
//! - [`trend`]: effort-corrected encounter-rate trends over the most recent assessment
//!   window (Poisson, quasi-Poisson and negative binomial fits, Mann–Kendall, Sen's slope).
//! - [`criteria`]: the published threshold tables for criteria A and B, as data and plain text.
//! - [`sphere`], [`random`], [`words`]: great-circle distances, the seeded generator behind
//!   every resample, and changes written as a person reads them.
//!
//! Every figure here is an input to a threatened-species assessment, never a listing
//! decision: see [`criteria::ASSESSMENT_CAUTION`].
//!
//! ```
//! use analysis::{LatLon, range, trend};
//!
//! let records = [(50.36, -4.14), (50.10, -5.55), (50.72, -1.88), (50.60, -3.40)]
//!     .map(|(lat, lon)| LatLon::new(lat, lon).unwrap());
//! let figures = range::summary(&records, &range::GridPlan::for_points(&records));
//! assert_eq!(figures.aoo.area_km2, 16.0);
//! assert!(figures.criterion_b.text.contains("not a listing decision"));
//!
//! let years: Vec<trend::YearCount> = (2011..2025)
//!     .map(|year| trend::YearCount { year, count: (60 - 3 * (year - 2011)) as u64, effort: 25.0 })
//!     .collect();
//! let trend = trend::yearly_trend(&years, 3.0).unwrap();
//! assert_eq!((trend.window_years, trend.first_year), (10.0, 2014));
//! assert!(trend.window_change.unwrap().estimate < 0.0);
//! ```

pub mod coordinates;
pub mod criteria;
mod distributions;
pub mod random;
pub mod range;
pub mod sphere;
pub mod trend;
pub mod words;

pub use coordinates::{CoordinateError, LatLon};
