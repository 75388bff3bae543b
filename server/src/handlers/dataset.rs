//! `GET /dataset/archive.zip` and `GET /dataset/eml.xml`: the published dataset at one
//! address a harvester can poll — the public Darwin Core Archive of confirmed records and
//! its metadata ([`crate::export::published`]). Each answer carries an `ETag` and a
//! `Last-Modified`; a request with a matching `If-None-Match`, or with no
//! `If-None-Match` and an `If-Modified-Since` not older than the version, is answered
//! 304 with no body (RFC 9110 §13.1.1–§13.1.3, §13.2.2).

use std::time::SystemTime;

use axum::extract::State;
use axum::http::{HeaderMap, HeaderValue, StatusCode, header};
use axum::response::{IntoResponse, Response};

use crate::error::ApiError;
use crate::export::published::Published;
use crate::state::AppState;

/// `GET /dataset/archive.zip`: the latest public archive.
pub async fn archive(State(state): State<AppState>, headers: HeaderMap) -> Result<Response, ApiError> {
    let published = current(&state).await?;
    Ok(answer(&headers, &published, "application/zip", Some("wrackline-dataset.zip"), |p| p.archive.clone()))
}

/// `GET /dataset/eml.xml`: the latest public archive's metadata.
pub async fn eml(State(state): State<AppState>, headers: HeaderMap) -> Result<Response, ApiError> {
    let published = current(&state).await?;
    Ok(answer(&headers, &published, "application/xml; charset=utf-8", None, |p| p.eml.clone()))
}

async fn current(state: &AppState) -> Result<std::sync::Arc<Published>, ApiError> {
    state
        .published
        .current(&state.store, &state.taxa, &state.settings)
        .await
        .map_err(|err| ApiError::Internal(anyhow::anyhow!("building the published archive: {err}")))
}

fn answer(
    headers: &HeaderMap,
    published: &Published,
    media_type: &'static str,
    file_name: Option<&str>,
    body: impl FnOnce(&Published) -> Vec<u8>,
) -> Response {
    let mut response = if unchanged(headers, published) {
        StatusCode::NOT_MODIFIED.into_response()
    } else {
        let mut ok = (StatusCode::OK, [(header::CONTENT_TYPE, media_type)], body(published)).into_response();
        if let Some(name) = file_name
            && let Ok(value) = HeaderValue::from_str(&format!("attachment; filename=\"{name}\""))
        {
            ok.headers_mut().insert(header::CONTENT_DISPOSITION, value);
        }
        ok
    };
    let out = response.headers_mut();
    if let Ok(tag) = HeaderValue::from_str(&published.etag) {
        out.insert(header::ETAG, tag);
    }
    if let Ok(date) = HeaderValue::from_str(&httpdate::fmt_http_date(published.modified)) {
        out.insert(header::LAST_MODIFIED, date);
    }
    // Caches must ask again each time; the answer is then a cheap 304.
    out.insert(header::CACHE_CONTROL, HeaderValue::from_static("no-cache"));
    response
}

/// Whether the client's copy is current: `If-None-Match` decides when sent (a weak or
/// strong match, or `*`); otherwise `If-Modified-Since` at or after the version's time.
fn unchanged(headers: &HeaderMap, published: &Published) -> bool {
    if let Some(tags) = headers.get(header::IF_NONE_MATCH) {
        let Ok(tags) = tags.to_str() else { return false };
        return tags.split(',').map(|t| t.trim().trim_start_matches("W/")).any(|t| t == "*" || t == published.etag);
    }
    headers
        .get(header::IF_MODIFIED_SINCE)
        .and_then(|since| since.to_str().ok())
        .and_then(|since| httpdate::parse_http_date(since).ok())
        .is_some_and(|since: SystemTime| published.modified <= since)
}
