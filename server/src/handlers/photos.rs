//! `GET /photos/{sha256}`: a stored photo by its content hash.

use axum::body::Body;
use axum::extract::{Path, State};
use axum::http::header;
use axum::response::{IntoResponse, Response};

use crate::AppState;
use crate::error::ApiError;
use crate::store::observations;

pub async fn get(State(state): State<AppState>, Path(sha256): Path<String>) -> Result<Response, ApiError> {
    let not_found = || ApiError::NotFound(format!("no photo {sha256}"));
    let path = state.photos.path_of(&sha256).ok_or_else(not_found)?;
    let key = sha256.clone();
    let media_type = state.store.run(move |conn| observations::photo_media_type(conn, &key)).await?.ok_or_else(not_found)?;
    let bytes = tokio::fs::read(&path).await.map_err(|err| ApiError::Internal(anyhow::anyhow!("reading {}: {err}", path.display())))?;
    // Content-addressed: the bytes behind a hash never change.
    Ok((
        [(header::CONTENT_TYPE, media_type), (header::CACHE_CONTROL, "public, max-age=31536000, immutable".to_owned())],
        Body::from(bytes),
    )
        .into_response())
}
