//! The observer's own records, as their phone sees them, their replies to reviewers
//! (with photos), and the name and contact they chose to give. Only the phone's own
//! device identity opens these; another phone is refused (403) even when it knows a
//! record's id, since exports print record ids.

use axum::Json;
use axum::body::Bytes;
use axum::extract::{Multipart, Path, State};
use chrono::Utc;
use shared_types::{DeviceRequest, MyRecord, Reply};
use uuid::Uuid;

use crate::error::ApiError;
use crate::handlers::access::{Client, Observer, check_owner};
use crate::handlers::observations::{intake_error, keep_pace, receive_parts, upload_turn};
use crate::intake::{self, parse_json};
use crate::state::AppState;
use crate::store::review::{self as review_store, ReplyOutcome};
use crate::store::{observations, people};

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
                    let events = review_store::events(conn, record.observation_id)?;
                    // The reason given by the decision that put the record in its state.
                    let state_reason =
                        events.into_iter().rev().find(|e| e.to_state == record.review_state).and_then(|e| e.reason);
                    Ok(MyRecord {
                        current_taxon: review_store::current_taxon(conn, record.observation_id)?,
                        messages: review_store::messages(conn, record.observation_id)?,
                        state_reason,
                        record,
                    })
                })
                .collect::<Result<Vec<_>, crate::store::StoreError>>()
        })
        .await?;
    Ok(Json(mine))
}

/// `POST /api/my/records/{client_id}/replies`: multipart with a `reply` JSON part and
/// `photo` parts (upload copies, as for records, with the phone's EXIF readings in
/// `reply.photo_exif`). The photos go through the same intake and the same checks
/// against the record's time and place as the record's own photos. A resend of the
/// same reply changes nothing.
pub async fn reply(
    State(state): State<AppState>,
    Observer(me): Observer,
    Client { address, .. }: Client,
    Path(client_id): Path<String>,
    multipart: Multipart,
) -> Result<Json<serde_json::Value>, ApiError> {
    let record = Uuid::parse_str(&client_id)
        .map_err(|_| ApiError::BadRequest(format!("`{client_id}` is not a record id (a UUID)")))?;
    // Whose record it is, before the body is read.
    let found = state.store.look(move |conn| observations::record_by_client_id(conn, record)).await?;
    let view = found.ok_or_else(|| ApiError::NotFound(format!("no record with id {record}")))?;
    let owner =
        state.store.look(move |conn| review_store::observation_of(conn, record)).await?.and_then(|(_, _, owner)| owner);
    check_owner(&me, owner, false, &format!("record {record}"))?;
    keep_pace(&state, Some(me.id), address)?;
    let _turn = upload_turn(&state).await?;
    intake::check_room(&state.intake()).map_err(intake_error)?;

    let (json, photos) = receive_parts(&state, multipart, "reply").await?;
    let reply: Reply = parse_json(&json).map_err(intake_error)?;
    if reply.message.as_str().is_empty() && photos.is_empty() {
        return Err(ApiError::InvalidField {
            field: "message".into(),
            message: "write a message or add a photo".into(),
        });
    }
    if reply.photo_exif.len() > photos.len() {
        let message =
            format!("lists EXIF for {} photos but {} came with the reply", reply.photo_exif.len(), photos.len());
        return Err(ApiError::InvalidField { field: "photo_exif".into(), message });
    }
    let placed = intake::store_photos(&state.intake(), photos, *view.submission.observed_at.offset())
        .await
        .map_err(intake_error)?;
    let mut stored = placed.photos.clone();
    intake::compare_photos(&view.submission, &mut stored, &reply.photo_exif);
    let observer = me.id;
    let outcome = state
        .store
        .run(move |conn| {
            review_store::add_reply(
                conn,
                record,
                observer,
                reply.client_id,
                reply.message.as_str(),
                &stored,
                Utc::now(),
            )
        })
        .await;
    let outcome = match outcome {
        Ok(outcome) => outcome,
        Err(err) => {
            placed.discard(&state.intake()).await;
            return Err(intake_error(anyhow::Error::from(err).into()));
        }
    };
    match outcome {
        ReplyOutcome::Added | ReplyOutcome::AlreadyThere => {
            Ok(Json(serde_json::json!({"client_id": record, "received": true})))
        }
        ReplyOutcome::NotTheirs => {
            placed.discard(&state.intake()).await;
            Err(ApiError::Forbidden(format!("record {record} was sent from another phone")))
        }
    }
}

/// `PUT /api/my/profile`: the name and contact this phone's observer chose to give
/// (either may be empty), and whether the name may be published with open data. The
/// contact is for reviewers only, on that observer's records; it is never exported.
pub async fn set_profile(
    State(state): State<AppState>,
    Observer(me): Observer,
    body: Bytes,
) -> Result<Json<serde_json::Value>, ApiError> {
    let profile = observer_profile(parse_json(&body).map_err(intake_error)?);
    let answer = serde_json::json!({
        "saved": true,
        "contact_given": profile.contact.is_some(),
        "name_public": profile.name_public,
    });
    state.store.run(move |conn| people::set_observer_profile(conn, me.id, &profile)).await?;
    Ok(Json(answer))
}

/// A profile as the store keeps it: blank answers left out.
pub fn observer_profile(request: DeviceRequest) -> people::ObserverProfile {
    let given = |text: Option<shared_types::Text>| text.map(|t| t.as_str().trim().to_owned()).filter(|t| !t.is_empty());
    people::ObserverProfile {
        display_name: given(request.display_name),
        contact: given(request.contact),
        name_public: request.name_public,
    }
}
