//! The review queue, the record view for reviewers, and review actions.

use axum::Json;
use axum::body::Bytes;
use axum::extract::{Path, Query, State};
use chrono::Utc;
use serde::Deserialize;
use shared_types::{FlagKind, QueueItem, ReviewAction, ReviewDetail, ReviewState};
use uuid::Uuid;

use crate::AppState;
use crate::error::ApiError;
use crate::handlers::access::Reviewer;
use crate::handlers::observations::intake_error;
use crate::intake::parse_json;
use crate::review;
use crate::store::{duplicates as duplicates_store, observations, review as review_store};

fn record_id(text: &str) -> Result<Uuid, ApiError> {
    Uuid::parse_str(text).map_err(|_| ApiError::BadRequest(format!("`{text}` is not a record id (a UUID)")))
}

/// Queue filters; all optional.
#[derive(Debug, Default, Deserialize)]
pub struct QueueFilter {
    /// A review state code; default: awaiting review and details requested.
    state: Option<String>,
    /// A taxon name at any rank (matched against the checklist's higher taxa too).
    taxon: Option<String>,
    /// A flag kind code (oversize, out_of_range).
    flag: Option<String>,
    /// Observed on or after / before, `YYYY-MM-DD`.
    from: Option<String>,
    to: Option<String>,
    /// A checklist area code.
    area: Option<String>,
}

/// `GET /api/review/queue`.
pub async fn queue(State(state): State<AppState>, Reviewer(_): Reviewer, Query(filter): Query<QueueFilter>) -> Result<Json<Vec<QueueItem>>, ApiError> {
    let states = match filter.state.as_deref() {
        None => vec![ReviewState::AwaitingReview, ReviewState::DetailsRequested],
        Some("any") => Vec::new(),
        Some(code) => vec![ReviewState::from_code(code).ok_or_else(|| ApiError::BadRequest(format!("unknown review state `{code}`")))?],
    };
    let flag = filter
        .flag
        .as_deref()
        .map(|code| serde_json::from_value::<FlagKind>(serde_json::Value::String(code.to_owned())).map_err(|_| ApiError::BadRequest(format!("unknown flag `{code}`; use oversize or out_of_range"))))
        .transpose()?;
    let rows = state
        .store
        .run(move |conn| {
            let undecided = duplicates_store::undecided(conn)?;
            review_store::records_in_states(conn, &states)?
                .into_iter()
                .filter_map(|id| observations::record_by_client_id(conn, id).transpose())
                .map(|record| {
                    let record = record?;
                    let taxon = review_store::current_taxon(conn, record.observation_id)?;
                    let possible = undecided.contains(&record.observation_id);
                    Ok((record, taxon, possible))
                })
                .collect::<Result<Vec<_>, crate::store::StoreError>>()
        })
        .await?;
    let taxa = state.taxa.clone();
    let checklist = taxa.checklist();
    let mut items: Vec<_> = rows
        .into_iter()
        .filter(|(record, taxon, _)| matches_filter(record, taxon.as_deref(), &filter, flag, checklist))
        .map(|(record, taxon, possible)| {
            let (score, reasons) = review::priority(&record, taxon.as_deref(), checklist, possible);
            (score, record, reasons, taxon)
        })
        .collect();
    review::order(&mut items);
    Ok(Json(items.into_iter().map(|(_, record, priority_reasons, current_taxon)| QueueItem { record, current_taxon, priority_reasons }).collect()))
}

fn matches_filter(record: &shared_types::RecordView, taxon: Option<&str>, filter: &QueueFilter, flag: Option<FlagKind>, checklist: &species_key::Checklist) -> bool {
    let day = record.submission.observed_at.format("%Y-%m-%d").to_string();
    let taxon_ok = filter.taxon.as_deref().is_none_or(|wanted| {
        taxon.is_some_and(|name| {
            name.eq_ignore_ascii_case(wanted)
                || checklist.taxon(name).is_some_and(|t| [&t.genus, &t.family, &t.order, &t.superorder].iter().any(|h| h.eq_ignore_ascii_case(wanted)))
        })
    });
    let area_ok = filter.area.as_deref().is_none_or(|code| {
        record.submission.position.is_some_and(|p| checklist.area_at(p.latitude.get(), p.longitude.get()).is_some_and(|a| a.code == code))
    });
    taxon_ok
        && area_ok
        && flag.is_none_or(|kind| record.flags.iter().any(|f| f.kind == kind))
        && filter.from.as_deref().is_none_or(|from| day.as_str() >= from)
        && filter.to.as_deref().is_none_or(|to| day.as_str() <= to)
}

/// `GET /api/review/records/{client_id}`.
pub async fn detail(State(state): State<AppState>, Reviewer(_): Reviewer, Path(client_id): Path<String>) -> Result<Json<ReviewDetail>, ApiError> {
    let id = record_id(&client_id)?;
    let found = state
        .store
        .run(move |conn| {
            let Some(record) = observations::record_by_client_id(conn, id)? else { return Ok(None) };
            let observation = record.observation_id;
            let taxon = review_store::current_taxon(conn, observation)?;
            let duplicates = duplicate_views(conn, &record)?;
            let possible = !duplicates.is_empty() && duplicates.iter().any(|d| d.decision.is_none());
            Ok(Some((record, taxon, review_store::identifications(conn, observation)?, review_store::messages(conn, observation)?, review_store::events(conn, observation)?, duplicates, possible)))
        })
        .await?;
    let (record, taxon, identifications, messages, events, duplicates, possible) = found.ok_or_else(|| ApiError::NotFound(format!("no record with id {id}")))?;
    let (_, priority_reasons) = review::priority(&record, taxon.as_deref(), state.checklist(), possible);
    Ok(Json(ReviewDetail { record, identifications, messages, events, priority_reasons, duplicates }))
}

fn duplicate_views(conn: &rusqlite::Connection, record: &shared_types::RecordView) -> Result<Vec<shared_types::DuplicateView>, crate::store::StoreError> {
    let mut views = Vec::new();
    for candidate in duplicates_store::candidates_of(conn, record.observation_id)? {
        let Some(other) = observations::record_by_observation_id(conn, candidate.other)? else { continue };
        let here = record.submission.position.map(|p| (p.latitude.get(), p.longitude.get()));
        let there = other.submission.position.map(|p| (p.latitude.get(), p.longitude.get()));
        let gap_hours = (other.submission.observed_at - record.submission.observed_at).num_seconds().abs() as f64 / 3600.0;
        views.push(shared_types::DuplicateView {
            distance_m: here.zip(there).map(|(a, b)| crate::duplicates::geodesic_m(a, b)),
            gap_hours,
            other,
            score: candidate.score,
            reasons: candidate.reasons,
            decision: candidate.decision,
            merge_id: candidate.merge_id,
        });
    }
    Ok(views)
}

/// `POST /api/review/records/{client_id}/duplicates/{other_client_id}`: the same animal
/// (merge) or different animals (never suggested again).
pub async fn decide_pair(State(state): State<AppState>, Reviewer(reviewer): Reviewer, Path((client_id, other_id)): Path<(String, String)>, body: Bytes) -> Result<Json<serde_json::Value>, ApiError> {
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
        Some(duplicates_store::Decided::Refused) => Err(ApiError::Conflict("one of these records is merged already, or they are the same record".into())),
        Some(duplicates_store::Decided::KeptApart) => Ok(Json(serde_json::json!({"decision": "different animals"}))),
        Some(duplicates_store::Decided::Merged { merge_id }) => Ok(Json(serde_json::json!({"decision": "same animal", "merge_id": merge_id}))),
    }
}

/// `POST /api/review/merges/{merge_id}/undo`: puts both records back exactly as they were.
pub async fn undo_merge(State(state): State<AppState>, Reviewer(reviewer): Reviewer, Path(merge_id): Path<i64>) -> Result<Json<serde_json::Value>, ApiError> {
    let person = reviewer.id;
    match state.store.run(move |conn| duplicates_store::undo_merge(conn, merge_id, person, Utc::now())).await? {
        duplicates_store::Undo::Undone => Ok(Json(serde_json::json!({"merge_id": merge_id, "undone": true}))),
        duplicates_store::Undo::NotFound => Err(ApiError::NotFound(format!("no standing merge {merge_id}"))),
        duplicates_store::Undo::Blocked { by } => Err(ApiError::Conflict(format!("merge {by} moved some of the same reports later; undo merge {by} first"))),
    }
}

/// `POST /api/review/records/{client_id}/actions`: confirm, ask for details, or mark
/// not confirmable. Answers with the new state.
pub async fn act(State(state): State<AppState>, Reviewer(reviewer): Reviewer, Path(client_id): Path<String>, body: Bytes) -> Result<Json<serde_json::Value>, ApiError> {
    let id = record_id(&client_id)?;
    let action: ReviewAction = parse_json(&body).map_err(intake_error)?;
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

/// `GET /api/review/records/{client_id}/map.svg`: a small map of the record — where the
/// phone put it (with its uncertainty), where its photos were taken, and the other reports
/// that may be the same animal.
pub async fn place_map(State(state): State<AppState>, Reviewer(_): Reviewer, Path(client_id): Path<String>) -> Result<axum::response::Response, ApiError> {
    use axum::response::IntoResponse as _;
    use crate::assess::map::{MapPoint, place_map};
    let id = record_id(&client_id)?;
    let found = state
        .store
        .run(move |conn| {
            let Some(record) = observations::record_by_client_id(conn, id)? else { return Ok(None) };
            let duplicates = duplicate_views(conn, &record)?;
            Ok(Some((record, duplicates)))
        })
        .await?;
    let (record, duplicates) = found.ok_or_else(|| ApiError::NotFound(format!("no record with id {id}")))?;
    let at = |lat: f64, lon: f64| analysis::LatLon::new(lat, lon).ok();
    let mut points = Vec::new();
    if let Some(p) = record.submission.position
        && let Some(position) = at(p.latitude.get(), p.longitude.get())
    {
        points.push(MapPoint { label: "this record (phone)".into(), position, uncertainty_m: p.accuracy_m.map(|a| a.get()), colour: "#1c3b57" });
    }
    for (i, photo) in record.photos.iter().enumerate() {
        if let Some(position) = photo.exif.latitude.zip(photo.exif.longitude).and_then(|(lat, lon)| at(lat, lon)) {
            points.push(MapPoint { label: format!("photo {} (its own GPS)", i + 1), position, uncertainty_m: photo.exif.horizontal_error_m, colour: "#e07a1f" });
        }
    }
    for dup in &duplicates {
        if let Some(p) = dup.other.submission.position.and_then(|p| at(p.latitude.get(), p.longitude.get())) {
            points.push(MapPoint { label: format!("possibly the same animal ({})", dup.other.submission.observed_at.format("%Y-%m-%d")), position: p, uncertainty_m: None, colour: "#7a3e9d" });
        }
    }
    let svg = place_map("where this record was made", &points, &analysis::range::AooGrid::default());
    Ok(([(axum::http::header::CONTENT_TYPE, "image/svg+xml")], svg).into_response())
}
