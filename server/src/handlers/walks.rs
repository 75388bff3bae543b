//! Survey walks: submit one (JSON, from a phone with its device identity; the walk is
//! that phone's), list them, link a record to a walk after the fact (the phone that sent
//! the record, or a reviewer), and the effort summary. Record and walk ids are public
//! (exports print them), so knowing one gives no right to it.

use std::collections::HashSet;

use axum::Json;
use axum::body::Bytes;
use axum::extract::{Path, Query, State};
use chrono::Utc;
use serde::Deserialize;
use shared_types::{WalkLink, WalkReceipt};
use species_key::Sensitivity;
use uuid::Uuid;

use crate::assess::effort::{self, EffortRow, Period};
use crate::error::ApiError;
use crate::handlers::access::{Caller, Client, Observer, Reviewer, Someone, check_owner};
use crate::handlers::observations::{intake_error, keep_pace};
use crate::intake::walks::WalkRefused;
use crate::intake::{parse_json, walks as intake_walks};
use crate::protect::{Audience, Publisher};
use crate::state::AppState;
use crate::store::review as review_store;
use crate::store::walks::{self, LinkOutcome, StoredWalk};

/// `POST /api/walks`: answers only once the walk is stored, under the phone that sent
/// it; a resend gets the same receipt, another phone sending the same walk id a 403.
pub async fn submit(
    State(state): State<AppState>,
    Observer(me): Observer,
    Client { address, .. }: Client,
    body: Bytes,
) -> Result<Json<WalkReceipt>, ApiError> {
    keep_pace(&state, Some(me.id), address)?;
    crate::intake::check_room(&state.intake()).map_err(intake_error)?;
    match intake_walks::accept_walk(&state.store, &body, Some(me.id), Utc::now()).await {
        Ok(receipt) => Ok(Json(receipt)),
        Err(WalkRefused::Intake(err)) => Err(intake_error(err)),
        Err(refused @ WalkRefused::NotYours(_)) => Err(ApiError::Forbidden(refused.to_string())),
    }
}

/// `GET /api/walks` (reviewers: tracks are never public).
pub async fn list(State(state): State<AppState>, Reviewer(_): Reviewer) -> Result<Json<Vec<StoredWalk>>, ApiError> {
    Ok(Json(state.store.read(walks::list_walks).await?))
}

/// `PUT /api/observations/{client_id}/walk`: puts a stored record on a walk. Only the
/// phone that sent the record may, and only onto a walk of its own (or one not stored
/// yet); a reviewer may link any record. Doing it again is harmless; moving a record to
/// another walk is refused.
pub async fn link(
    State(state): State<AppState>,
    Someone(caller): Someone,
    Path(client_id): Path<String>,
    body: Bytes,
) -> Result<Json<serde_json::Value>, ApiError> {
    let record = Uuid::parse_str(&client_id)
        .map_err(|_| ApiError::BadRequest(format!("`{client_id}` is not a record id (a UUID)")))?;
    let owner = state.store.look(move |conn| review_store::observation_of(conn, record)).await?;
    let (_, _, record_owner) =
        owner.ok_or_else(|| ApiError::NotFound(format!("no record with id {record}; send the record first")))?;
    check_owner(&caller, record_owner, true, &format!("record {record}"))?;
    let link: WalkLink = parse_json(&body).map_err(intake_error)?;
    let walk = link.walk_client_id;
    if let Some(Some(walk_owner)) = state.store.look(move |conn| walks::walk_observer(conn, walk)).await? {
        check_owner(&caller, Some(walk_owner), true, &format!("walk {walk}"))?;
    }
    match state.store.run(move |conn| walks::link_record(conn, record, walk)).await? {
        LinkOutcome::Linked | LinkOutcome::AlreadyLinked => {
            Ok(Json(serde_json::json!({"client_id": record, "walk_client_id": walk})))
        }
        LinkOutcome::OnAnotherWalk => Err(ApiError::Conflict(format!("record {record} is already on another walk"))),
        LinkOutcome::NoSuchRecord => {
            Err(ApiError::NotFound(format!("no record with id {record}; send the record first")))
        }
    }
}

#[derive(Deserialize)]
pub struct EffortQuery {
    by: Option<Period>,
}

/// `GET /api/effort?by=month|year`: for anyone but reviewers, walks whose finds are
/// generalised count under a withheld stretch (see `assess::effort`).
pub async fn effort(
    State(state): State<AppState>,
    caller: Caller,
    Query(query): Query<EffortQuery>,
) -> Result<Json<Vec<EffortRow>>, ApiError> {
    let taxa = state.taxa.clone();
    let audience = caller.audience();
    let (stored, withheld) = state
        .store
        .read(move |conn| {
            let publisher = Publisher::load(conn, &taxa, audience)?;
            let stored = walks::list_walks(conn)?;
            let withheld: HashSet<String> = stored
                .iter()
                .map(|w| w.walk.client_id.to_string())
                .filter(|id| audience == Audience::Public && publisher.walk_sensitivity(id) != Sensitivity::None)
                .collect();
            Ok((stored, withheld))
        })
        .await?;
    let withhold = |walk: &StoredWalk| withheld.contains(&walk.walk.client_id.to_string());
    Ok(Json(effort::summarise(&stored, query.by.unwrap_or(Period::Year), &withhold)))
}
