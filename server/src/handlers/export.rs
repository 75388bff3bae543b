//! `GET /api/export?format=csv`: the same export the command line writes.

use axum::extract::{Query, State};
use axum::http::{HeaderMap, header};
use axum::response::{IntoResponse, Response};
use serde::Deserialize;

use crate::AppState;
use crate::error::ApiError;
use crate::export;
use crate::store::observations;

#[derive(Deserialize)]
pub struct ExportQuery {
    format: String,
}

pub async fn export(State(state): State<AppState>, headers: HeaderMap, Query(query): Query<ExportQuery>) -> Result<Response, ApiError> {
    if query.format != "csv" {
        return Err(ApiError::BadRequest(format!("unknown export format `{}`; available: csv", query.format)));
    }
    let host = headers.get(header::HOST).and_then(|h| h.to_str().ok()).unwrap_or("127.0.0.1:8080");
    let base_url = format!("http://{host}");
    let records = state.store.run(|conn| observations::list_records(conn)).await?;
    let mut body = Vec::new();
    export::csv::write(&records, &base_url, &mut body).map_err(ApiError::Internal)?;
    Ok((
        [
            (header::CONTENT_TYPE, "text/csv; charset=utf-8"),
            (header::CONTENT_DISPOSITION, "attachment; filename=\"wrackline-records.csv\""),
        ],
        body,
    )
        .into_response())
}
