//! For the people who go out: responders' list of live animals and their response log;
//! researchers' samples, carcass reports, and finding an animal from a sample's id.

use axum::Json;
use axum::body::Bytes;
use axum::extract::{Path, State};
use chrono::Utc;
use serde_json::{Value, json};
use shared_types::{
    CarcassReport, FieldProblem, ResponseReport, Role, SampleInput, SampleLookup, SampleView, UrgentItem,
};
use uuid::Uuid;

use crate::error::ApiError;
use crate::handlers::access::{Responder, Reviewer};
use crate::handlers::observations::intake_error;
use crate::intake::parse_json;
use crate::state::AppState;
use crate::store::fieldwork::{self, SampleWrite};
use crate::store::{StoreError, notifications, observations, people as people_store, review as review_store};

fn record_id(text: &str) -> Result<Uuid, ApiError> {
    Uuid::parse_str(text).map_err(|_| ApiError::BadRequest(format!("`{text}` is not a record id (a UUID)")))
}

fn refused(problem: FieldProblem) -> ApiError {
    ApiError::InvalidField { field: problem.field.into(), message: problem.message }
}

/// The server's number for the record `client_id`, or a 404.
async fn observation(state: &AppState, client_id: Uuid) -> Result<i64, ApiError> {
    state
        .store
        .look(move |conn| review_store::observation_of(conn, client_id))
        .await?
        .map(|(id, _, _)| id)
        .ok_or_else(|| ApiError::NotFound(format!("no record with id {client_id}")))
}

/// `GET /api/urgent`: live-animal records, those still waiting for a response first,
/// then the newest, each with its response log. Exact places: responders must find the
/// animal. Each with how the responders were told, and the finder's contact for
/// reviewers and admins.
pub async fn urgent(
    State(state): State<AppState>,
    Responder(person): Responder,
) -> Result<Json<Vec<UrgentItem>>, ApiError> {
    // The finder's contact is for reviewers and admins (as on the record's review screen).
    let sees_finder = matches!(person.role, Role::Reviewer | Role::Admin);
    let items = state
        .store
        .read(move |conn| {
            let mut items = Vec::new();
            for record in observations::list_records(conn)?.into_iter().filter(|r| r.submission.is_urgent()) {
                let observation = record.observation_id;
                let responses = fieldwork::responses(conn, observation)?;
                let notifications = notifications::of_record(conn, observation)?;
                let finder = if sees_finder { people_store::observer_of_observation(conn, observation)? } else { None };
                items.push(UrgentItem { record, responses, notifications, finder });
            }
            Ok::<_, StoreError>(items)
        })
        .await?;
    let mut items = items;
    items.sort_by(|a, b| {
        (!a.responses.is_empty()).cmp(&!b.responses.is_empty()).then(b.record.received_at.cmp(&a.record.received_at))
    });
    Ok(Json(items))
}

/// `POST /api/review/records/{client_id}/responses`: who went, when, and the outcome.
pub async fn log_response(
    State(state): State<AppState>,
    Responder(person): Responder,
    Path(client_id): Path<String>,
    body: Bytes,
) -> Result<Json<Value>, ApiError> {
    let id = record_id(&client_id)?;
    let report: ResponseReport = parse_json(&body).map_err(intake_error)?;
    report.check(Utc::now()).map_err(refused)?;
    let observation = observation(&state, id).await?;
    let logged =
        state.store.run(move |conn| fieldwork::add_response(conn, observation, &report, person.id, Utc::now())).await?;
    Ok(Json(json!({"client_id": id, "response_id": logged})))
}

/// `POST /api/review/records/{client_id}/samples`: a sample taken from the animal.
pub async fn add_sample(
    State(state): State<AppState>,
    Reviewer(person): Reviewer,
    Path(client_id): Path<String>,
    body: Bytes,
) -> Result<Json<Value>, ApiError> {
    let id = record_id(&client_id)?;
    let input: SampleInput = parse_json(&body).map_err(intake_error)?;
    input.check().map_err(refused)?;
    let observation = observation(&state, id).await?;
    let code = input.code.clone();
    match state.store.run(move |conn| fieldwork::add_sample(conn, observation, &input, person.id, Utc::now())).await? {
        SampleWrite::Written => Ok(Json(json!({"client_id": id, "code": code}))),
        SampleWrite::CodeTaken => Err(taken(&code)),
        SampleWrite::NoSuchSample => Err(ApiError::NotFound(format!("no sample {code}"))),
    }
}

fn taken(code: &str) -> ApiError {
    ApiError::Conflict(format!("another sample already has the id {code}; each sample needs its own"))
}

/// `PUT /api/samples/{code}`: corrects a sample (where it is kept, who holds it…).
pub async fn change_sample(
    State(state): State<AppState>,
    Reviewer(person): Reviewer,
    Path(code): Path<String>,
    body: Bytes,
) -> Result<Json<Value>, ApiError> {
    let input: SampleInput = parse_json(&body).map_err(intake_error)?;
    input.check().map_err(refused)?;
    let (current, new_code) = (code.clone(), input.code.clone());
    match state.store.run(move |conn| fieldwork::change_sample(conn, &current, &input, person.id, Utc::now())).await? {
        SampleWrite::Written => Ok(Json(json!({"code": new_code}))),
        SampleWrite::CodeTaken => Err(taken(&new_code)),
        SampleWrite::NoSuchSample => Err(ApiError::NotFound(format!("no sample {code}"))),
    }
}

/// `GET /api/samples`: every sample, oldest first (the register).
pub async fn register(State(state): State<AppState>, Reviewer(_): Reviewer) -> Result<Json<Vec<SampleView>>, ApiError> {
    Ok(Json(state.store.read(fieldwork::all_samples).await?))
}

/// `GET /api/samples/{code}`: the sample's animal, its photos and place, the animal's
/// other samples and where each is kept, and the trail.
pub async fn lookup(
    State(state): State<AppState>,
    Reviewer(_): Reviewer,
    Path(code): Path<String>,
) -> Result<Json<SampleLookup>, ApiError> {
    let key = code.clone();
    let found = state.store.look(move |conn| fieldwork::lookup(conn, &key)).await?;
    found.map(Json).ok_or_else(|| ApiError::NotFound(format!("no sample with the id {code}")))
}

/// `PUT /api/review/records/{client_id}/carcass`: the carcass's fate and what an
/// examination found (a correction replaces it; the trail keeps both).
pub async fn set_carcass(
    State(state): State<AppState>,
    Reviewer(person): Reviewer,
    Path(client_id): Path<String>,
    body: Bytes,
) -> Result<Json<Value>, ApiError> {
    let id = record_id(&client_id)?;
    let report: CarcassReport = parse_json(&body).map_err(intake_error)?;
    report.check(Utc::now()).map_err(refused)?;
    let observation = observation(&state, id).await?;
    let fate = report.fate;
    state.store.run(move |conn| fieldwork::set_carcass(conn, observation, &report, person.id, Utc::now())).await?;
    Ok(Json(json!({"client_id": id, "fate": fate})))
}
