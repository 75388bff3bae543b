//! Survey walks: submit one (JSON), list them, link a record to a walk after the
//! fact, and the effort summary.

use axum::Json;
use axum::body::Bytes;
use axum::extract::{Path, Query, State};
use chrono::Utc;
use serde::Deserialize;
use shared_types::{WalkLink, WalkReceipt};
use uuid::Uuid;

use crate::AppState;
use crate::effort::{self, EffortRow, Period};
use crate::error::ApiError;
use crate::handlers::access::Reviewer;
use crate::handlers::observations::intake_error;
use crate::intake::{parse_json, walks as intake_walks};
use crate::store::walks::{self, LinkOutcome, StoredWalk};

/// `POST /api/walks`: answers only once the walk is stored; a resend gets the same receipt.
pub async fn submit(State(state): State<AppState>, body: Bytes) -> Result<Json<WalkReceipt>, ApiError> {
    intake_walks::accept_walk(&state, &body, Utc::now()).await.map(Json).map_err(intake_error)
}

/// `GET /api/walks` (reviewers: tracks are never public).
pub async fn list(State(state): State<AppState>, Reviewer(_): Reviewer) -> Result<Json<Vec<StoredWalk>>, ApiError> {
    Ok(Json(state.store.run(|conn| walks::list_walks(conn)).await?))
}

/// `PUT /api/observations/{client_id}/walk`: puts a stored record on a walk. Doing it
/// again is harmless; moving a record to another walk is refused.
pub async fn link(State(state): State<AppState>, Path(client_id): Path<String>, body: Bytes) -> Result<Json<serde_json::Value>, ApiError> {
    let record = Uuid::parse_str(&client_id).map_err(|_| ApiError::BadRequest(format!("`{client_id}` is not a record id (a UUID)")))?;
    let link: WalkLink = parse_json(&body).map_err(intake_error)?;
    let walk = link.walk_client_id;
    match state.store.run(move |conn| walks::link_record(conn, record, walk)).await? {
        LinkOutcome::Linked | LinkOutcome::AlreadyLinked => Ok(Json(serde_json::json!({"client_id": record, "walk_client_id": walk}))),
        LinkOutcome::OnAnotherWalk => Err(ApiError::Conflict(format!("record {record} is already on another walk"))),
        LinkOutcome::NoSuchRecord => Err(ApiError::NotFound(format!("no record with id {record}; send the record first"))),
    }
}

#[derive(Deserialize)]
pub struct EffortQuery {
    by: Option<Period>,
}

/// `GET /api/effort?by=month|year`.
pub async fn effort(State(state): State<AppState>, Query(query): Query<EffortQuery>) -> Result<Json<Vec<EffortRow>>, ApiError> {
    let stored = state.store.run(|conn| walks::list_walks(conn)).await?;
    Ok(Json(effort::summarise(&stored, query.by.unwrap_or(Period::Year))))
}
