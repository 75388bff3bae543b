//! Signing in and out (reviewers and admins), and the phones' device identities.

use std::time::Instant;

use axum::Json;
use axum::body::Bytes;
use axum::extract::State;
use axum::http::{HeaderMap, HeaderValue, header};
use axum::response::{IntoResponse, Response};
use chrono::Utc;
use shared_types::{DeviceIdentity, DeviceRequest, LoginRequest, SessionInfo};

use crate::AppState;
use crate::auth::{self, SESSION_HOURS, new_token, token_sha256};
use crate::error::ApiError;
use crate::handlers::access::{Caller, SESSION_COOKIE};
use crate::handlers::observations::intake_error;
use crate::intake::parse_json;
use crate::store::people;

/// `POST /api/session`: signs in; sets the session cookie and returns the CSRF token.
pub async fn login(State(state): State<AppState>, body: Bytes) -> Result<Response, ApiError> {
    let request: LoginRequest = parse_json(&body).map_err(intake_error)?;
    let username = request.username.trim().to_owned();
    if let Some(wait) = state.logins.locked_for(&username, Instant::now()) {
        return Err(ApiError::TooManyRequests(format!("too many failed sign-ins for {username}; try again in {} minutes", wait.as_secs().div_ceil(60))));
    }
    let lookup = username.clone();
    let found = state.store.run(move |conn| people::staff_by_username(conn, &lookup)).await?;
    let password = request.password;
    let verified = tokio::task::spawn_blocking(move || found.filter(|(_, hash)| auth::verify_password(&password, hash)))
        .await
        .map_err(|err| ApiError::Internal(anyhow::anyhow!("password check failed: {err}")))?;
    let Some((person, _)) = verified.filter(|(p, _)| !p.disabled) else {
        state.logins.record_failure(&username, Instant::now());
        return Err(ApiError::Unauthorized("wrong username or password".into()));
    };
    state.logins.clear(&username);
    let (token, csrf_token) = (new_token(), new_token());
    let (hash, csrf, id, now) = (token_sha256(&token), csrf_token.clone(), person.id, Utc::now());
    state.store.run(move |conn| people::add_session(conn, &hash, id, &csrf, now, now + chrono::Duration::hours(SESSION_HOURS))).await?;
    let cookie = format!("{SESSION_COOKIE}={token}; HttpOnly; SameSite=Strict; Path=/; Max-Age={}", SESSION_HOURS * 3600);
    let info = SessionInfo { role: person.role, display_name: person.display_name.unwrap_or_default(), csrf_token };
    let mut headers = HeaderMap::new();
    headers.insert(header::SET_COOKIE, HeaderValue::from_str(&cookie).map_err(|err| ApiError::Internal(err.into()))?);
    Ok((headers, Json(info)).into_response())
}

/// `DELETE /api/session`: signs out.
pub async fn logout(State(state): State<AppState>, caller: Caller) -> Result<Response, ApiError> {
    if let Some(hash) = caller.session_sha256 {
        state.store.run(move |conn| people::end_session(conn, &hash)).await?;
    }
    let expired = format!("{SESSION_COOKIE}=; HttpOnly; SameSite=Strict; Path=/; Max-Age=0");
    Ok(([(header::SET_COOKIE, expired)], Json(serde_json::json!({"signed_out": true}))).into_response())
}

/// `GET /api/session`: who is calling, if anyone.
pub async fn who(caller: Caller) -> Json<serde_json::Value> {
    Json(match caller.person {
        Some(person) => serde_json::json!({"signed_in": true, "role": person.role, "display_name": person.display_name}),
        None => serde_json::json!({"signed_in": false}),
    })
}

/// `POST /api/devices`: a new observer identity for a phone.
pub async fn new_device(State(state): State<AppState>, body: Bytes) -> Result<Json<DeviceIdentity>, ApiError> {
    let request: DeviceRequest = if body.is_empty() { DeviceRequest::default() } else { parse_json(&body).map_err(intake_error)? };
    let token = new_token();
    let hash = token_sha256(&token);
    let name = request.display_name.map(|n| n.as_str().to_owned()).filter(|n| !n.is_empty());
    let contact = request.contact.map(|c| c.as_str().to_owned()).filter(|c| !c.is_empty());
    state.store.run(move |conn| people::add_device(conn, &hash, name.as_deref(), contact.as_deref(), Utc::now())).await?;
    Ok(Json(DeviceIdentity { token }))
}
