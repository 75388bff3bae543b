//! Observations: submit one (multipart: a `record` JSON part and `photo` parts), list
//! them, fetch one by the phone's id.

use axum::Json;
use axum::extract::{Multipart, Path, State};
use chrono::Utc;
use shared_types::{Receipt, RecordView};
use uuid::Uuid;

use crate::error::ApiError;
use crate::handlers::access::{Caller, Reviewer};
use crate::intake::images::ImageProblem;
use crate::intake::{IntakeError, PhotoProblem, Upload};
use crate::state::AppState;
use crate::store::observations;

/// `POST /api/observations`. Answers 200 with a receipt only once the record and its
/// photos are durably stored; a resend of the same record gets the same receipt.
/// A phone that shows its device identity has the record put under its observer.
pub async fn submit(
    State(state): State<AppState>,
    caller: Caller,
    multipart: Multipart,
) -> Result<Json<Receipt>, ApiError> {
    let (record_json, photos) = read_parts(multipart, "record").await?;
    let observer = caller.person.filter(|p| p.role == shared_types::Role::Observer).map(|p| p.id);
    let accepted = crate::arrival::receive(&state, Upload { record_json, photos }, observer, Utc::now())
        .await
        .map_err(intake_error)?;
    if accepted.replayed {
        tracing::info!(client_id = %accepted.receipt.client_id, "resend of a stored record");
    }
    Ok(Json(accepted.receipt))
}

/// Reads a multipart form of one JSON part called `json_part` and any `photo` parts.
pub async fn read_parts(mut multipart: Multipart, json_part: &str) -> Result<(Vec<u8>, Vec<Vec<u8>>), ApiError> {
    let mut json = None;
    let mut photos = Vec::new();
    while let Some(field) = multipart.next_field().await.map_err(multipart_error)? {
        let name = field.name().unwrap_or_default().to_owned();
        let bytes = field.bytes().await.map_err(multipart_error)?;
        match name.as_str() {
            "photo" => photos.push(bytes.to_vec()),
            part if part == json_part => json = Some(bytes.to_vec()),
            other => {
                return Err(ApiError::BadRequest(format!(
                    "unexpected form part `{other}`; send `{json_part}` and `photo` parts"
                )));
            }
        }
    }
    let json = json.ok_or_else(|| ApiError::BadRequest(format!("the form has no `{json_part}` part with its JSON")))?;
    Ok((json, photos))
}

fn multipart_error(err: axum::extract::multipart::MultipartError) -> ApiError {
    let status = err.status();
    if status == axum::http::StatusCode::PAYLOAD_TOO_LARGE {
        ApiError::TooLarge(format!("the upload is too large: {}", err.body_text()))
    } else {
        ApiError::BadRequest(format!("the upload could not be read: {}", err.body_text()))
    }
}

/// The HTTP form of an intake refusal.
pub fn intake_error(err: IntakeError) -> ApiError {
    match err {
        IntakeError::NotJson(_) => ApiError::BadRequest(err.to_string()),
        IntakeError::Field { field, message } => ApiError::InvalidField { field, message },
        IntakeError::Photo { ref problem, .. } => match problem {
            PhotoProblem::Empty | PhotoProblem::NotAnImage => ApiError::UnsupportedMedia(err.to_string()),
            PhotoProblem::TooManyBytes(_) | PhotoProblem::Image(ImageProblem::TooManyPixels { .. }) => {
                ApiError::TooLarge(err.to_string())
            }
            PhotoProblem::Image(_) => ApiError::Unprocessable(err.to_string()),
        },
        IntakeError::TooManyPhotos(_) => ApiError::TooLarge(err.to_string()),
        IntakeError::Conflict(_) => ApiError::Conflict(err.to_string()),
        IntakeError::Storage(inner) => ApiError::Internal(inner),
    }
}

/// `GET /api/observations`: every stored record (reviewers: exact places, names).
pub async fn list(State(state): State<AppState>, Reviewer(_): Reviewer) -> Result<Json<Vec<RecordView>>, ApiError> {
    Ok(Json(state.store.run(|conn| observations::list_records(conn)).await?))
}

/// `GET /api/observations/{client_id}`.
pub async fn get(
    State(state): State<AppState>,
    Reviewer(_): Reviewer,
    Path(client_id): Path<String>,
) -> Result<Json<RecordView>, ApiError> {
    let client_id = Uuid::parse_str(&client_id)
        .map_err(|_| ApiError::BadRequest(format!("`{client_id}` is not a record id (a UUID)")))?;
    state
        .store
        .run(move |conn| observations::record_by_client_id(conn, client_id))
        .await?
        .map(Json)
        .ok_or_else(|| ApiError::NotFound(format!("no record with id {client_id}")))
}
