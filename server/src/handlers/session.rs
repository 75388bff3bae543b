//! Signing in and out (reviewers and admins), and the phones' device identities.
//!
//! The session cookie is `HttpOnly; SameSite=Strict`, and `Secure` when people reach
//! the server over HTTPS: its public address is `https://`, or a trusted reverse proxy
//! says so (`X-Forwarded-Proto: https`). It is not `Secure` on plain HTTP — the demo on
//! http://127.0.0.1 — because a browser may refuse to keep a `Secure` cookie set over
//! plain HTTP, and on plain HTTP the flag would protect nothing.
//!
//! Sign-in takes JSON only (`Content-Type: application/json`): a page on another site
//! can send a form or `text/plain` without asking, but not JSON, so it cannot sign a
//! visitor in under its own account (login CSRF). The origin check
//! (`handlers::guard`) refuses such a request before it gets here too.

use std::time::Instant;

use axum::Json;
use axum::body::Bytes;
use axum::extract::State;
use axum::http::{HeaderMap, HeaderValue, header};
use axum::response::{IntoResponse, Response};
use chrono::Utc;
use shared_types::{DeviceIdentity, DeviceRequest, LoginRequest, SessionInfo};

use crate::error::ApiError;
use crate::handlers::access::{Caller, Client, SESSION_COOKIE};
use crate::handlers::mine::observer_profile;
use crate::handlers::observations::intake_error;
use crate::intake::parse_json;
use crate::people::auth::{self, SESSION_HOURS, new_token, token_sha256};
use crate::state::AppState;
use crate::store::people;

/// `POST /api/session`: signs in; sets the session cookie and returns the CSRF token.
pub async fn login(
    State(state): State<AppState>,
    client: Client,
    headers: HeaderMap,
    body: Bytes,
) -> Result<Response, ApiError> {
    let json = headers
        .get(header::CONTENT_TYPE)
        .and_then(|v| v.to_str().ok())
        .is_some_and(|v| v.split(';').next().is_some_and(|t| t.trim().eq_ignore_ascii_case("application/json")));
    if !json {
        return Err(ApiError::UnsupportedMedia("sign-in takes JSON: send Content-Type: application/json".into()));
    }
    let request: LoginRequest = parse_json(&body).map_err(intake_error)?;
    let username = request.username.trim().to_owned();
    // Counted as a failure from here on, so parallel guesses cannot all pass this check.
    let address = client.address;
    let began = Instant::now();
    if let Err((wait, lock)) = state.logins.begin_attempt(&username, address, began) {
        let minutes = wait.as_secs().div_ceil(60);
        let whose = match lock {
            auth::Lock::NameFromAddress => format!("for {username} from this address"),
            auth::Lock::Address => "from this address".to_owned(),
            auth::Lock::Name => format!("for {username}"),
        };
        return Err(ApiError::TooManyRequests {
            message: format!("too many failed sign-ins {whose}; try again in {minutes} minutes"),
            retry_after_s: wait.as_secs().max(1),
        });
    }
    let lookup = username.clone();
    let found = state.store.look(move |conn| people::staff_by_username(conn, &lookup)).await?;
    let password = request.password;
    // Unknown names are checked against a dummy hash: the same work, the same time.
    let verified = tokio::task::spawn_blocking(move || {
        let matches = auth::verify_or_dummy(&password, found.as_ref().map(|(_, hash)| hash.as_str()));
        found.filter(|_| matches)
    })
    .await
    .map_err(|err| ApiError::Internal(anyhow::anyhow!("password check failed: {err}")))?;
    let Some((person, _)) = verified.filter(|(p, _)| !p.disabled) else {
        return Err(ApiError::Unauthorized("wrong username or password".into()));
    };
    state.logins.succeeded(&username, address, began);
    let (token, csrf_token) = (new_token(), new_token());
    let (hash, csrf, id, now) = (token_sha256(&token), csrf_token.clone(), person.id, Utc::now());
    state
        .store
        .run(move |conn| people::add_session(conn, &hash, id, &csrf, now, now + chrono::Duration::hours(SESSION_HOURS)))
        .await?;
    let cookie = session_cookie(&token, SESSION_HOURS * 3600, client.https);
    let info = SessionInfo { role: person.role, display_name: person.display_name.unwrap_or_default(), csrf_token };
    let mut response_headers = HeaderMap::new();
    response_headers
        .insert(header::SET_COOKIE, HeaderValue::from_str(&cookie).map_err(|err| ApiError::Internal(err.into()))?);
    Ok((response_headers, Json(info)).into_response())
}

/// The `Set-Cookie` value for a session token (empty and `Max-Age=0` to end one).
fn session_cookie(token: &str, max_age_s: i64, secure: bool) -> String {
    let secure = if secure { "; Secure" } else { "" };
    format!("{SESSION_COOKIE}={token}; HttpOnly; SameSite=Strict; Path=/; Max-Age={max_age_s}{secure}")
}

/// `DELETE /api/session`: signs out.
pub async fn logout(State(state): State<AppState>, client: Client, caller: Caller) -> Result<Response, ApiError> {
    if let Some(hash) = caller.session_sha256 {
        state.store.run(move |conn| people::end_session(conn, &hash)).await?;
    }
    let expired = session_cookie("", 0, client.https);
    Ok(([(header::SET_COOKIE, expired)], Json(serde_json::json!({"signed_out": true}))).into_response())
}

/// `GET /api/session`: who is calling, if anyone, and for a signed-in session its CSRF
/// token, so a second tab or a restarted browser (whose own copy of the token is gone)
/// can act and sign out again. Only this site's pages can read the answer: the cookie is
/// `SameSite=Strict` and no other origin is allowed to read responses (no CORS). Never
/// cached (`no-store`): the token must not outlive the session in a cache.
pub async fn who(caller: Caller) -> Response {
    let body = match caller.person {
        Some(person) => serde_json::json!({
            "signed_in": true,
            "role": person.role,
            "display_name": person.display_name,
            "csrf_token": caller.csrf_token,
        }),
        None => serde_json::json!({"signed_in": false}),
    };
    ([(header::CACHE_CONTROL, "no-store")], Json(body)).into_response()
}

/// `POST /api/devices`: a new observer identity for a phone.
pub async fn new_device(
    State(state): State<AppState>,
    Client { address, .. }: Client,
    body: Bytes,
) -> Result<Json<DeviceIdentity>, ApiError> {
    // Identities count against the address's pace, so new ones cannot dodge a phone's.
    crate::handlers::observations::keep_pace(&state, None, address)?;
    let request: DeviceRequest =
        if body.is_empty() { DeviceRequest::default() } else { parse_json(&body).map_err(intake_error)? };
    let token = new_token();
    let hash = token_sha256(&token);
    let profile = observer_profile(request);
    state.store.run(move |conn| people::add_device(conn, &hash, &profile, Utc::now())).await?;
    Ok(Json(DeviceIdentity { token }))
}
