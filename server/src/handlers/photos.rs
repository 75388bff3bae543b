//! Photos by their content hash:
//!
//! - `GET /photos/{sha256}` — the display copy (long edge ≤ 1280 px, upright, JPEG, no EXIF);
//! - `GET /photos/{sha256}/thumb` — the thumbnail (long edge ≤ 320 px, the same);
//! - `GET /photos/{sha256}/original` — the file exactly as received, EXIF and GPS included;
//! - `GET /api/photos/{sha256}/similar` — other stored photos whose perceptual hash is near.
//!
//! The original and the similar-photo search are for signed-in reviewers only (the
//! `Reviewer` extractor): the original carries the observer's exact position and camera
//! details. The derivatives are what the app, exports and anyone else are given.
//!
//! Derivatives are made at intake. A photo stored before they existed (or whose
//! derivative file went missing) gets them made again from the original on first request.

use axum::Json;
use axum::body::Body;
use axum::extract::{Path, State};
use axum::http::header;
use axum::response::{IntoResponse, Response};

use crate::error::ApiError;
use crate::handlers::access::Reviewer;
use crate::intake::images;
use crate::intake::photos::{PhotoFormat, Rendition};
use crate::state::AppState;
use crate::store::observations;
use shared_types::SimilarPhoto;

/// `GET /photos/{sha256}`: the display copy.
pub async fn display(state: State<AppState>, sha256: Path<String>) -> Result<Response, ApiError> {
    serve(state, sha256, Rendition::Display).await
}

/// `GET /photos/{sha256}/thumb`: the thumbnail.
pub async fn thumb(state: State<AppState>, sha256: Path<String>) -> Result<Response, ApiError> {
    serve(state, sha256, Rendition::Thumb).await
}

/// `GET /photos/{sha256}/original`: the original, for reviewers only (see the module note).
pub async fn original(state: State<AppState>, _reviewer: Reviewer, sha256: Path<String>) -> Result<Response, ApiError> {
    serve(state, sha256, Rendition::Original).await
}

/// `GET /api/photos/{sha256}/similar`: near duplicates by perceptual hash, nearest first.
pub async fn similar(
    State(state): State<AppState>,
    _reviewer: Reviewer,
    Path(sha256): Path<String>,
) -> Result<Json<Vec<SimilarPhoto>>, ApiError> {
    let key = sha256.clone();
    let (own, others) = state
        .store
        .run(move |conn| observations::photo_hashes(conn, &key))
        .await?
        .ok_or_else(|| ApiError::NotFound(format!("no photo {sha256} with a perceptual hash")))?;
    Ok(Json(crate::duplicates::photos::similar_photos(&own, others)))
}

async fn serve(
    State(state): State<AppState>,
    Path(sha256): Path<String>,
    rendition: Rendition,
) -> Result<Response, ApiError> {
    let not_found = || ApiError::NotFound(format!("no photo {sha256}"));
    let path = state.photos.path_of(&sha256, rendition).ok_or_else(not_found)?;
    let key = sha256.clone();
    let (media_type, orientation) =
        state.store.look(move |conn| observations::photo_file_facts(conn, &key)).await?.ok_or_else(not_found)?;
    if rendition != Rendition::Original && !path.exists() {
        remake_derivatives(&state, &sha256, orientation).await?;
    }
    let bytes = tokio::fs::read(&path)
        .await
        .map_err(|err| ApiError::Internal(anyhow::anyhow!("reading {}: {err}", path.display())))?;
    let media_type = if rendition == Rendition::Original { media_type } else { "image/jpeg".to_owned() };
    // Content-addressed: the bytes behind a hash never change. `nosniff` keeps a
    // browser from reading a polyglot original as anything but an image.
    Ok((
        [
            (header::CONTENT_TYPE, media_type),
            (header::CACHE_CONTROL, "public, max-age=31536000, immutable".to_owned()),
            (header::X_CONTENT_TYPE_OPTIONS, "nosniff".to_owned()),
        ],
        Body::from(bytes),
    )
        .into_response())
}

/// Makes the derivatives of an already stored original and records its size and hash.
async fn remake_derivatives(state: &AppState, sha256: &str, orientation: Option<u16>) -> Result<(), ApiError> {
    let files = state.photos.clone();
    let key = sha256.to_owned();
    // Remaking decodes the original: it waits for a turn like any upload.
    let derived = state
        .decode_gate
        .run(move || -> anyhow::Result<images::Derivatives> {
            let original =
                files.path_of(&key, Rendition::Original).ok_or_else(|| anyhow::anyhow!("bad photo hash {key}"))?;
            let bytes =
                std::fs::read(&original).map_err(|err| anyhow::anyhow!("reading {}: {err}", original.display()))?;
            let format =
                PhotoFormat::sniff(&bytes).ok_or_else(|| anyhow::anyhow!("stored photo {key} is not an image"))?;
            let derived = images::derive(&bytes, format, orientation)
                .map_err(|err| anyhow::anyhow!("stored photo {key}: {err}"))?;
            files.put(&key, Rendition::Display, &derived.display_jpeg)?;
            files.put(&key, Rendition::Thumb, &derived.thumb_jpeg)?;
            Ok(derived)
        })
        .await
        .map_err(anyhow::Error::from)??;
    let key = sha256.to_owned();
    state
        .store
        .run(move |conn| observations::set_photo_pixels(conn, &key, derived.width, derived.height, &derived.phash))
        .await?;
    Ok(())
}
