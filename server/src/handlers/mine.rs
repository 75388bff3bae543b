//! The observer's own records, as their phone sees them, and their replies to
//! reviewers (with photos). Only the phone's own device identity opens these.

use axum::Json;
use axum::extract::{Multipart, Path, State};
use chrono::Utc;
use shared_types::{MyRecord, Reply};
use uuid::Uuid;

use crate::AppState;
use crate::error::ApiError;
use crate::handlers::access::Observer;
use crate::handlers::observations::{intake_error, read_parts};
use crate::intake::{self, parse_json};
use crate::store::review::{self as review_store, ReplyOutcome};
use crate::store::observations;

/// `GET /api/my/records`.
pub async fn records(State(state): State<AppState>, Observer(me): Observer) -> Result<Json<Vec<MyRecord>>, ApiError> {
    let mine = state
        .store
        .run(move |conn| {
            review_store::records_of_observer(conn, me.id)?
                .into_iter()
                .filter_map(|id| observations::record_by_client_id(conn, id).transpose())
                .map(|record| {
                    let record = record?;
                    Ok(MyRecord {
                        current_taxon: review_store::current_taxon(conn, record.observation_id)?,
                        messages: review_store::messages(conn, record.observation_id)?,
                        record,
                    })
                })
                .collect::<Result<Vec<_>, crate::store::StoreError>>()
        })
        .await?;
    Ok(Json(mine))
}

/// `POST /api/my/records/{client_id}/replies`: multipart with a `reply` JSON part and
/// `photo` parts. A resend of the same reply changes nothing.
pub async fn reply(State(state): State<AppState>, Observer(me): Observer, Path(client_id): Path<String>, multipart: Multipart) -> Result<Json<serde_json::Value>, ApiError> {
    let record = Uuid::parse_str(&client_id).map_err(|_| ApiError::BadRequest(format!("`{client_id}` is not a record id (a UUID)")))?;
    let (json, photos) = read_parts(multipart, "reply").await?;
    let reply: Reply = parse_json(&json).map_err(intake_error)?;
    if reply.message.as_str().is_empty() && photos.is_empty() {
        return Err(ApiError::InvalidField { field: "message".into(), message: "write a message or add a photo".into() });
    }
    let stored = intake::store_photos(&state, photos, chrono::FixedOffset::east_opt(0).expect("zero offset")).await.map_err(intake_error)?;
    let observer = me.id;
    let outcome = state
        .store
        .run(move |conn| review_store::add_reply(conn, record, observer, reply.client_id, reply.message.as_str(), &stored, Utc::now()))
        .await?;
    match outcome {
        ReplyOutcome::Added | ReplyOutcome::AlreadyThere => Ok(Json(serde_json::json!({"client_id": record, "received": true}))),
        ReplyOutcome::NotTheirs => Err(ApiError::NotFound(format!("no record {record} of yours"))),
    }
}
