//! `GET /api/checklist`: the species checklist the server uses, so phones key out
//! records against the same list (they keep a copy for offline use).
//! `GET /api/checklist/nearby?lat=..&lon=..`: how many confirmed records of each species
//! lie within `assess::nearby::NEARBY_RADIUS_KM` (50 km) of a place — counts only, never positions (see
//! `assess::nearby`), counted from the records' published positions as anyone may see
//! them — for the key's prior; phones keep the answer per area.

use axum::Json;
use axum::extract::{Query, State};
use serde::Deserialize;
use shared_types::ReviewState;

use crate::assess::input::read_store;
use crate::assess::nearby::{NearbyCounts, nearby_counts};
use crate::error::ApiError;
use crate::protect::{Audience, Publisher};
use crate::state::AppState;

pub async fn get(State(state): State<AppState>) -> Json<species_key::Checklist> {
    Json(species_key::Checklist::clone(state.checklist()))
}

#[derive(Deserialize)]
pub struct NearbyQuery {
    lat: Option<String>,
    lon: Option<String>,
}

/// Reads one coordinate, naming the parameter when it is missing or out of range.
fn coordinate(value: Option<&str>, field: &str, limit: f64) -> Result<f64, ApiError> {
    let bad = |message: String| ApiError::InvalidField { field: field.to_owned(), message };
    let text = value.map(str::trim).filter(|v| !v.is_empty()).ok_or_else(|| bad("is missing".into()))?;
    text.parse::<f64>()
        .ok()
        .filter(|v| v.is_finite() && v.abs() <= limit)
        .ok_or_else(|| bad(format!("`{text}` is not a number of degrees between -{limit} and {limit}")))
}

/// `GET /api/checklist/nearby`: confirmed records per species near `lat`, `lon`.
pub async fn nearby(
    State(state): State<AppState>,
    Query(query): Query<NearbyQuery>,
) -> Result<Json<NearbyCounts>, ApiError> {
    let lat = coordinate(query.lat.as_deref(), "lat", 90.0)?;
    let lon = coordinate(query.lon.as_deref(), "lon", 180.0)?;
    let centre = analysis::LatLon::new(lat, lon).map_err(|err| ApiError::BadRequest(err.to_string()))?;
    let taxa = state.taxa.clone();
    let confirmed = state
        .store
        .read(move |conn| {
            let publisher = Publisher::load(conn, &taxa, Audience::Public)?;
            read_store(conn, Some(vec![ReviewState::Confirmed]), &publisher)
        })
        .await?;
    Ok(Json(nearby_counts(&confirmed, &state.taxa, centre)))
}
