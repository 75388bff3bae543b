//! Observations: submit one (multipart: a `record` JSON part and `photo` parts), list
//! them, fetch one by the phone's id.

use std::time::{Duration, Instant};

use axum::Json;
use axum::extract::{Multipart, Path, State};
use chrono::Utc;
use shared_types::limits::MAX_RECORD_JSON_BYTES;
use shared_types::{Receipt, RecordView};
use uuid::Uuid;

use crate::error::ApiError;
use crate::handlers::access::{Caller, Client, Reviewer};
use crate::intake::images::ImageProblem;
use crate::intake::photos::MAX_PHOTOS_PER_RECORD;
use crate::intake::received::{ReceiveError, ReceivedPhoto, Receiving};
use crate::intake::{IntakeError, PhotoProblem, Upload};
use crate::state::AppState;
use crate::store::observations;

/// `POST /api/observations`. Answers 200 with a receipt only once the record and its
/// photos are durably stored; a resend of the same record gets the same receipt.
/// A phone that shows its device identity has the record put under its observer.
/// Before the body is read: the pace of this phone and this address (429), a turn to
/// upload (503 when none comes in time) and the free-space guard (507).
pub async fn submit(
    State(state): State<AppState>,
    caller: Caller,
    Client { address, .. }: Client,
    multipart: Multipart,
) -> Result<Json<Receipt>, ApiError> {
    let observer = caller.person.filter(|p| p.role == shared_types::Role::Observer).map(|p| p.id);
    keep_pace(&state, observer, address)?;
    let _turn = upload_turn(&state).await?;
    crate::intake::check_room(&state.intake()).map_err(intake_error)?;
    let (record_json, photos) = receive_parts(&state, multipart, "record").await?;
    let accepted = crate::arrival::receive(&state, Upload { record_json, photos }, observer, Utc::now())
        .await
        .map_err(intake_error)?;
    if accepted.replayed {
        tracing::info!(client_id = %accepted.receipt.client_id, "resend of a stored record");
    }
    Ok(Json(accepted.receipt))
}

/// Counts one submission against this phone's pace and this address's; past either,
/// a 429 saying when to come back.
pub fn keep_pace(state: &AppState, observer: Option<i64>, address: std::net::IpAddr) -> Result<(), ApiError> {
    let now = Instant::now();
    if let Some(observer) = observer {
        state.device_pace.take(&observer, now).map_err(|wait| ApiError::RateLimited {
            message: "this phone has sent many records just now".into(),
            retry_after: wait,
        })?;
    }
    state.address_pace.take(&address, now).map_err(|wait| ApiError::RateLimited {
        message: "many records have come from this address just now".into(),
        retry_after: wait,
    })
}

/// A turn to receive an upload: at most `settings.max_uploads` at once; one that waits
/// longer than `settings.upload_wait_s` is told to come back.
pub async fn upload_turn(state: &AppState) -> Result<tokio::sync::OwnedSemaphorePermit, ApiError> {
    let wait = Duration::from_secs(state.settings.upload_wait_s);
    match tokio::time::timeout(wait, state.uploads.clone().acquire_owned()).await {
        Ok(Ok(turn)) => Ok(turn),
        _ => Err(ApiError::Unavailable {
            message: "the server is receiving many uploads just now".into(),
            retry_after: Duration::from_secs(crate::error::RETRY_BUSY_S),
        }),
    }
}

/// Reads a multipart form of one JSON part called `json_part` (at most
/// [`MAX_RECORD_JSON_BYTES`]) and any `photo` parts (at most [`MAX_PHOTOS_PER_RECORD`]),
/// each photo streamed into a scratch file as it arrives and refused as soon as it is
/// over the size limit. Scratch files of a refused form are removed. A form refused
/// half-way is read to its end (and dropped; the body limits still apply) before the
/// refusal is sent, so the phone hears why rather than seeing its upload cut off.
pub async fn receive_parts(
    state: &AppState,
    mut multipart: Multipart,
    json_part: &str,
) -> Result<(Vec<u8>, Vec<ReceivedPhoto>), ApiError> {
    let received = read_form(state, &mut multipart, json_part).await;
    if received.is_err() {
        while let Ok(Some(mut field)) = multipart.next_field().await {
            while let Ok(Some(_)) = field.chunk().await {}
        }
    }
    received
}

async fn read_form(
    state: &AppState,
    multipart: &mut Multipart,
    json_part: &str,
) -> Result<(Vec<u8>, Vec<ReceivedPhoto>), ApiError> {
    let mut json = None;
    let mut photos = Vec::new();
    while let Some(mut field) = multipart.next_field().await.map_err(multipart_error)? {
        let name = field.name().unwrap_or_default().to_owned();
        match name.as_str() {
            "photo" => {
                if photos.len() == MAX_PHOTOS_PER_RECORD {
                    return Err(intake_error(IntakeError::TooManyPhotos(photos.len() + 1)));
                }
                let number = photos.len() + 1;
                let mut receiving =
                    Receiving::start(&state.photos).map_err(|err| intake_error(anyhow::Error::from(err).into()))?;
                // After a refusal the rest of the photo is still read (and dropped).
                let mut refused = None;
                while let Some(chunk) = field.chunk().await.map_err(multipart_error)? {
                    if refused.is_none() {
                        refused = receiving.write(&chunk).await.err();
                    }
                }
                if let Some(err) = refused {
                    return Err(receive_error(number, err));
                }
                photos.push(receiving.finish().await.map_err(|err| intake_error(anyhow::Error::from(err).into()))?);
            }
            part if part == json_part => {
                let mut bytes = Vec::new();
                while let Some(chunk) = field.chunk().await.map_err(multipart_error)? {
                    if bytes.len() + chunk.len() > MAX_RECORD_JSON_BYTES {
                        return Err(ApiError::OverLimit {
                            field: json_part.to_owned(),
                            message: format!(
                                "the {json_part} JSON is over the limit of {} KiB",
                                MAX_RECORD_JSON_BYTES >> 10
                            ),
                        });
                    }
                    bytes.extend_from_slice(&chunk);
                }
                json = Some(bytes);
            }
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

fn receive_error(number: usize, err: ReceiveError) -> ApiError {
    match err {
        ReceiveError::TooManyBytes => intake_error(IntakeError::Photo { number, problem: PhotoProblem::TooManyBytes }),
        ReceiveError::Disk(io) => intake_error(anyhow::Error::from(io).into()),
    }
}

fn multipart_error(err: axum::extract::multipart::MultipartError) -> ApiError {
    if crate::error::timed_out(&err) {
        return ApiError::Timeout("the upload stopped arriving; send it again".into());
    }
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
            PhotoProblem::TooManyBytes | PhotoProblem::Image(ImageProblem::TooManyPixels { .. }) => {
                ApiError::TooLarge(err.to_string())
            }
            PhotoProblem::Image(_) => ApiError::Unprocessable(err.to_string()),
        },
        IntakeError::TooManyPhotos(_) => ApiError::TooLarge(err.to_string()),
        IntakeError::Conflict(_) => ApiError::Conflict(err.to_string()),
        IntakeError::NoRoom => ApiError::NoRoom(err.to_string()),
        IntakeError::Unwritable => ApiError::Unavailable {
            message: err.to_string(),
            retry_after: Duration::from_secs(crate::error::RETRY_NO_ROOM_S),
        },
        IntakeError::Storage(inner) => ApiError::Internal(inner),
    }
}

/// `GET /api/observations`: every stored record (reviewers: exact places, names).
pub async fn list(State(state): State<AppState>, Reviewer(_): Reviewer) -> Result<Json<Vec<RecordView>>, ApiError> {
    Ok(Json(state.store.read(observations::list_records).await?))
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
