//! The review queue, the record view for reviewers, and review actions.

use axum::Json;
use axum::body::Bytes;
use axum::extract::{Path, Query, State};
use chrono::Utc;
use serde::Deserialize;
use shared_types::codes::{code as code_of, from_code};
use shared_types::{NameReading, QueueFlag, QueueItem, RecordView, ReviewAction, ReviewDetail, ReviewState, Text};
use uuid::Uuid;

use crate::error::ApiError;
use crate::handlers::access::Reviewer;
use crate::handlers::observations::intake_error;
use crate::intake::parse_json;
use crate::protect::{Audience, Publisher};
use crate::review;
use crate::review::queue::Wanted;
use crate::state::AppState;
use crate::store::{
    duplicates as duplicates_store, fieldwork, notifications, observations, people as people_store,
    review as review_store,
};

fn record_id(text: &str) -> Result<Uuid, ApiError> {
    Uuid::parse_str(text).map_err(|_| ApiError::BadRequest(format!("`{text}` is not a record id (a UUID)")))
}

/// Queue filters and paging; all optional.
#[derive(Debug, Default, Deserialize)]
pub struct QueueFilter {
    /// A review state code, or `any`; default: awaiting review and details requested.
    state: Option<String>,
    /// A species or higher taxon, scientific or common name; records identified to it
    /// or to anything below it.
    taxon: Option<String>,
    /// A flag code (see `QueueFlag`): oversize, out_of_range, possible_duplicate,
    /// taken_long_before_record, taken_far_from_record.
    flag: Option<String>,
    /// Observed on or after / on or before, `YYYY-MM-DD` (the record's own date).
    from: Option<String>,
    to: Option<String>,
    /// A checklist area code.
    area: Option<String>,
    /// Paging over the ordered queue: skip `offset` items, give at most `limit`.
    offset: Option<usize>,
    limit: Option<usize>,
}

/// Queue items per page when the caller does not say, and at most.
pub const QUEUE_PAGE: usize = 50;
pub const QUEUE_PAGE_MAX: usize = 500;

fn states_asked(code: Option<&str>) -> Result<Vec<ReviewState>, ApiError> {
    Ok(match code {
        None | Some("") => vec![ReviewState::AwaitingReview, ReviewState::DetailsRequested],
        Some("any") => Vec::new(),
        Some(code) => vec![
            ReviewState::from_code(code)
                .ok_or_else(|| ApiError::BadRequest(format!("state: unknown review state `{code}`")))?,
        ],
    })
}

fn flag_asked(code: Option<&str>) -> Result<Option<QueueFlag>, ApiError> {
    let Some(code) = code.filter(|c| !c.is_empty()) else { return Ok(None) };
    from_code::<QueueFlag>(code).map(Some).ok_or_else(|| {
        let known: Vec<String> = QueueFlag::ALL.iter().map(code_of).collect();
        ApiError::BadRequest(format!("flag: unknown flag `{code}`; use one of {}", known.join(", ")))
    })
}

fn date_asked(field: &str, text: Option<&str>) -> Result<Option<String>, ApiError> {
    let Some(text) = text.filter(|t| !t.is_empty()) else { return Ok(None) };
    chrono::NaiveDate::parse_from_str(text, "%Y-%m-%d")
        .map_err(|_| ApiError::BadRequest(format!("{field}: `{text}` is not a date (YYYY-MM-DD)")))?;
    Ok(Some(text.to_owned()))
}

/// `GET /api/review/queue`: the records to review, most important first, a page at a time.
pub async fn queue(
    State(state): State<AppState>,
    Reviewer(_): Reviewer,
    Query(filter): Query<QueueFilter>,
) -> Result<Json<Vec<QueueItem>>, ApiError> {
    let states = states_asked(filter.state.as_deref())?;
    let flag = flag_asked(filter.flag.as_deref())?;
    let (from, to) = (date_asked("from", filter.from.as_deref())?, date_asked("to", filter.to.as_deref())?);
    let (rows, responded) = state
        .store
        .run(move |conn| {
            let undecided = duplicates_store::undecided(conn)?;
            let records = observations::records_in_states(conn, &states)?;
            let rows = records
                .into_iter()
                .map(|(record, taxon)| (undecided.contains(&record.observation_id), record, taxon))
                .collect::<Vec<_>>();
            Ok((rows, fieldwork::responded(conn)?))
        })
        .await?;
    let wanted = Wanted {
        taxon: filter.taxon.clone(),
        flag,
        from,
        to,
        area: filter.area.clone(),
        offset: filter.offset.unwrap_or(0),
        limit: filter.limit.unwrap_or(QUEUE_PAGE).min(QUEUE_PAGE_MAX),
    };
    Ok(Json(review::queue::select(rows, &responded, &wanted, &state.taxa)))
}

/// What the people who go out have added to a record.
struct Fieldwork {
    notifications: Vec<shared_types::NotificationView>,
    responses: Vec<shared_types::ResponseView>,
    samples: Vec<shared_types::SampleView>,
    carcass: Option<shared_types::CarcassView>,
}

/// `GET /api/review/records/{client_id}`.
pub async fn detail(
    State(state): State<AppState>,
    Reviewer(_): Reviewer,
    Path(client_id): Path<String>,
) -> Result<Json<ReviewDetail>, ApiError> {
    let id = record_id(&client_id)?;
    let taxa = state.taxa.clone();
    let found = state
        .store
        .run(move |conn| {
            let Some(record) = observations::record_by_client_id(conn, id)? else { return Ok(None) };
            let publisher = Publisher::load(conn, &taxa, Audience::Public)?;
            let observation = record.observation_id;
            let taxon = review_store::current_taxon(conn, observation)?;
            let duplicates = review::duplicate_views(conn, &record)?;
            let possible = !duplicates.is_empty() && duplicates.iter().any(|d| d.decision.is_none());
            let name_reading = taxon.as_deref().map(|typed| read_name(&publisher, &record, typed));
            let history = (
                review_store::identifications(conn, observation)?,
                review_store::messages(conn, observation)?,
                review_store::events(conn, observation)?,
            );
            let observer = people_store::observer_of_observation(conn, observation)?;
            let fieldwork = Fieldwork {
                notifications: notifications::of_record(conn, observation)?,
                responses: fieldwork::responses(conn, observation)?,
                samples: fieldwork::samples_of_animal(conn, observation)?,
                carcass: fieldwork::carcass_of_animal(conn, observation)?,
            };
            Ok(Some((record, taxon, name_reading, history, duplicates, possible, observer, fieldwork)))
        })
        .await?;
    let (record, taxon, name_reading, (identifications, messages, events), duplicates, possible, observer, fieldwork) =
        found.ok_or_else(|| ApiError::NotFound(format!("no record with id {id}")))?;
    let urgent = record.submission.is_urgent();
    let awaiting = urgent && fieldwork.responses.is_empty();
    let (_, priority_reasons) = review::priority(&record, taxon.as_deref(), &state.taxa, possible, awaiting);
    let key = review::key_replay(state.checklist(), &record.submission);
    Ok(Json(ReviewDetail {
        record,
        identifications,
        messages,
        events,
        priority_reasons,
        duplicates,
        key,
        observer,
        name_reading,
        urgent,
        notifications: fieldwork.notifications,
        responses: fieldwork.responses,
        samples: fieldwork.samples,
        carcass: fieldwork.carcass,
    }))
}

/// How the current identification `typed` reads, and where the public sees the record because of it.
fn read_name(publisher: &Publisher, record: &RecordView, typed: &str) -> NameReading {
    let resolution = publisher.names().resolution(typed);
    let position = record.submission.position.as_ref().map(|p| (p.latitude.get(), p.longitude.get()));
    let uncertainty = record.submission.position.as_ref().and_then(|p| p.accuracy_m).map(|a| a.get());
    let walk = record.walk_client_id.map(|w| w.to_string());
    let place = publisher.place(record.review_state, Some(&resolution), walk.as_deref(), position, uncertainty);
    NameReading {
        typed: typed.to_owned(),
        reading: resolution.describe(),
        resolved: resolution.taxon().is_some(),
        public_place: place.generalizations.unwrap_or_else(|| "as recorded".to_owned()),
    }
}

/// `POST /api/review/records/{client_id}/duplicates/{other_client_id}`: the same animal
/// (merge) or different animals (never suggested again).
pub async fn decide_pair(
    State(state): State<AppState>,
    Reviewer(reviewer): Reviewer,
    Path((client_id, other_id)): Path<(String, String)>,
    body: Bytes,
) -> Result<Json<serde_json::Value>, ApiError> {
    let (a, b) = (record_id(&client_id)?, record_id(&other_id)?);
    let decision: shared_types::PairDecision = parse_json(&body).map_err(intake_error)?;
    let person = reviewer.id;
    let outcome = state
        .store
        .run(move |conn| {
            let ids = (review_store::observation_of(conn, a)?, review_store::observation_of(conn, b)?);
            let (Some((x, _, _)), Some((y, _, _))) = ids else { return Ok(None) };
            duplicates_store::decide(conn, x, y, decision.same_animal, person, Utc::now()).map(Some)
        })
        .await?;
    match outcome {
        None => Err(ApiError::NotFound("no such record".into())),
        Some(duplicates_store::Decided::Refused) => {
            Err(ApiError::Conflict("one of these records is merged already, or they are the same record".into()))
        }
        Some(duplicates_store::Decided::KeptApart) => Ok(Json(serde_json::json!({"decision": "different animals"}))),
        Some(duplicates_store::Decided::Merged { merge_id }) => {
            Ok(Json(serde_json::json!({"decision": "same animal", "merge_id": merge_id})))
        }
    }
}

/// `POST /api/review/merges/{merge_id}/undo`: puts both records back exactly as they were.
pub async fn undo_merge(
    State(state): State<AppState>,
    Reviewer(reviewer): Reviewer,
    Path(merge_id): Path<i64>,
) -> Result<Json<serde_json::Value>, ApiError> {
    let person = reviewer.id;
    match state.store.run(move |conn| duplicates_store::undo_merge(conn, merge_id, person, Utc::now())).await? {
        duplicates_store::Undo::Undone => Ok(Json(serde_json::json!({"merge_id": merge_id, "undone": true}))),
        duplicates_store::Undo::NotFound => Err(ApiError::NotFound(format!("no standing merge {merge_id}"))),
        duplicates_store::Undo::Blocked { by } => {
            Err(ApiError::Conflict(format!("merge {by} moved some of the same reports later; undo merge {by} first")))
        }
    }
}

/// `POST /api/review/records/{client_id}/actions`: confirm, ask for details, or mark
/// not confirmable. Answers with the new state.
pub async fn act(
    State(state): State<AppState>,
    Reviewer(reviewer): Reviewer,
    Path(client_id): Path<String>,
    body: Bytes,
) -> Result<Json<serde_json::Value>, ApiError> {
    let id = record_id(&client_id)?;
    let action = read_action(&body)?;
    let person = reviewer.id;
    let outcome = state
        .store
        .run(move |conn| review_store::apply(conn, id, person, Utc::now(), |current| review::decide(current, &action)))
        .await?;
    match outcome {
        None => Err(ApiError::NotFound(format!("no record with id {id}"))),
        Some(Err(refused)) => Err(ApiError::Conflict(refused.to_string())),
        Some(Ok(new_state)) => Ok(Json(serde_json::json!({"client_id": id, "review_state": new_state}))),
    }
}

/// Reads a review action variant by variant, so that a refused field is named: serde
/// cannot follow the path into an internally tagged enum (`{"action": "confirm", …}`),
/// which would leave every refusal naming no field.
fn read_action(body: &[u8]) -> Result<ReviewAction, ApiError> {
    #[derive(Deserialize)]
    #[serde(deny_unknown_fields)]
    struct Confirm {
        scientific_name: Text,
        #[serde(deserialize_with = "shared_types::limits::string::<_, { shared_types::limits::MAX_NAME_CHARS }>")]
        taxon_rank: String,
        remark: Option<Text>,
    }
    #[derive(Deserialize)]
    #[serde(deny_unknown_fields)]
    struct RequestDetails {
        message: Text,
    }
    #[derive(Deserialize)]
    #[serde(deny_unknown_fields)]
    struct NotConfirmable {
        reason: Text,
    }
    let mut fields: serde_json::Map<String, serde_json::Value> = parse_json(body).map_err(intake_error)?;
    let action = fields.remove("action");
    let rest = serde_json::to_vec(&fields).map_err(|err| ApiError::Internal(err.into()))?;
    match action.as_ref().and_then(|a| a.as_str()) {
        Some("confirm") => {
            let Confirm { scientific_name, taxon_rank, remark } = parse_json(&rest).map_err(intake_error)?;
            Ok(ReviewAction::Confirm { scientific_name, taxon_rank, remark })
        }
        Some("request_details") => {
            let RequestDetails { message } = parse_json(&rest).map_err(intake_error)?;
            Ok(ReviewAction::RequestDetails { message })
        }
        Some("not_confirmable") => {
            let NotConfirmable { reason } = parse_json(&rest).map_err(intake_error)?;
            Ok(ReviewAction::NotConfirmable { reason })
        }
        _ => Err(ApiError::InvalidField {
            field: "action".into(),
            message: "must be one of confirm, request_details, not_confirmable".into(),
        }),
    }
}

/// `GET /api/review/records/{client_id}/map.svg`: a small map of the record — where the
/// phone put it (with its uncertainty), where its photos were taken, and the other reports
/// that may be the same animal.
pub async fn place_map(
    State(state): State<AppState>,
    Reviewer(_): Reviewer,
    Path(client_id): Path<String>,
) -> Result<axum::response::Response, ApiError> {
    use crate::assess::map::{MapPoint, place_map};
    use axum::response::IntoResponse as _;
    let id = record_id(&client_id)?;
    let found = state
        .store
        .run(move |conn| {
            let Some(record) = observations::record_by_client_id(conn, id)? else { return Ok(None) };
            let duplicates = review::duplicate_views(conn, &record)?;
            Ok(Some((record, duplicates)))
        })
        .await?;
    let (record, duplicates) = found.ok_or_else(|| ApiError::NotFound(format!("no record with id {id}")))?;
    let at = |lat: f64, lon: f64| analysis::LatLon::new(lat, lon).ok();
    let mut points = Vec::new();
    if let Some(p) = record.submission.position
        && let Some(position) = at(p.latitude.get(), p.longitude.get())
    {
        points.push(MapPoint {
            label: "this record (phone)".into(),
            position,
            uncertainty_m: p.accuracy_m.map(|a| a.get()),
            colour: "#1c3b57",
        });
    }
    for (i, photo) in record.photos.iter().enumerate() {
        // The server's reading of the file, else the phone's of the original (upload
        // copies carry no EXIF).
        let readings = [
            (&photo.exif, "its own GPS"),
            (photo.phone_exif.as_ref().unwrap_or(&photo.exif), "its own GPS, as the phone read it"),
        ];
        let found = readings.into_iter().find_map(|(exif, words)| {
            exif.latitude.zip(exif.longitude).and_then(|(lat, lon)| at(lat, lon)).map(|p| (p, exif, words))
        });
        if let Some((position, exif, words)) = found {
            points.push(MapPoint {
                label: format!("photo {} ({words})", i + 1),
                position,
                uncertainty_m: exif.horizontal_error_m,
                colour: "#e07a1f",
            });
        }
    }
    for dup in &duplicates {
        if let Some(p) = dup.other.submission.position.and_then(|p| at(p.latitude.get(), p.longitude.get())) {
            points.push(MapPoint {
                label: format!("possibly the same animal ({})", dup.other.submission.observed_at.format("%Y-%m-%d")),
                position: p,
                uncertainty_m: None,
                colour: "#7a3e9d",
            });
        }
    }
    let svg = place_map("where this record was made", &points, &analysis::range::AooGrid::default());
    Ok(([(axum::http::header::CONTENT_TYPE, "image/svg+xml")], svg).into_response())
}
