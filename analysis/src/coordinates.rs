//! A checked WGS84 position, so that every range function can trust its input.
//!
//! Records reach the analysis from many places (the app, imports, the database); a
//! [`LatLon`] can only be made from a latitude and longitude that are finite and in range,
//! which keeps the geometry code free of defensive checks.

use serde::{Deserialize, Serialize};
use thiserror::Error;

/// A position on the WGS84 ellipsoid in decimal degrees.
///
/// Latitude is in [−90, 90] and longitude in [−180, 180]; both are finite.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(try_from = "UncheckedLatLon")]
pub struct LatLon {
    lat: f64,
    lon: f64,
}

/// Why a latitude/longitude pair was refused.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum CoordinateError {
    /// The latitude is not a number between −90 and 90.
    #[error("latitude must be between -90 and 90 degrees, got {0}")]
    LatitudeOutOfRange(f64),
    /// The longitude is not a number between −180 and 180.
    #[error("longitude must be between -180 and 180 degrees, got {0}")]
    LongitudeOutOfRange(f64),
}

impl LatLon {
    /// Checks and wraps a latitude and longitude in decimal degrees.
    pub fn new(lat: f64, lon: f64) -> Result<Self, CoordinateError> {
        if !(-90.0..=90.0).contains(&lat) {
            return Err(CoordinateError::LatitudeOutOfRange(lat));
        }
        if !(-180.0..=180.0).contains(&lon) {
            return Err(CoordinateError::LongitudeOutOfRange(lon));
        }
        Ok(Self { lat, lon })
    }

    /// Latitude in decimal degrees, north positive.
    pub fn lat(self) -> f64 {
        self.lat
    }

    /// Longitude in decimal degrees, east positive.
    pub fn lon(self) -> f64 {
        self.lon
    }
}

/// The wire shape of a [`LatLon`] before its ranges are checked.
#[derive(Deserialize)]
struct UncheckedLatLon {
    lat: f64,
    lon: f64,
}

impl TryFrom<UncheckedLatLon> for LatLon {
    type Error = CoordinateError;

    fn try_from(raw: UncheckedLatLon) -> Result<Self, Self::Error> {
        LatLon::new(raw.lat, raw.lon)
    }
}
