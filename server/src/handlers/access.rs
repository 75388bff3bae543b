//! Who is calling, and what they may do. Every handler that needs an identity takes
//! one of these extractors, which run before the body is read, so a request without
//! the right identity is refused (401/403) whatever it carries.
//!
//! - A phone shows its device identity as `Authorization: Bearer <token>` (observers).
//! - Reviewers, admins and responders carry the `wrackline_session` cookie (HttpOnly, SameSite=Strict),
//!   and every state-changing request made with it must carry the session's CSRF token in
//!   `X-CSRF-Token`; a bearer token cannot be sent by another site, so it needs none.

use std::net::{IpAddr, Ipv4Addr, SocketAddr};

use axum::extract::{ConnectInfo, FromRequestParts};
use axum::http::request::Parts;
use axum::http::{Method, header};
use chrono::Utc;
use shared_types::Role;

use crate::error::ApiError;
use crate::people::auth::token_sha256;
use crate::protect::Audience;
use crate::state::AppState;
use crate::store::people::{self, Person};

pub const SESSION_COOKIE: &str = "wrackline_session";

/// Whoever is calling, if anyone.
#[derive(Debug, Clone)]
pub struct Caller {
    pub person: Option<Person>,
    /// The session token's hash, when the caller came with the cookie.
    pub session_sha256: Option<String>,
    /// The session's CSRF token, when the caller came with the cookie: `GET /api/session`
    /// hands it back, so a second tab or a restarted browser can act again.
    pub csrf_token: Option<String>,
}

impl Caller {
    /// Signed-in reviewers and admins see places as recorded; everyone else the public form.
    pub fn audience(&self) -> Audience {
        let staff = self.person.as_ref().is_some_and(|p| matches!(p.role, Role::Reviewer | Role::Admin));
        if staff { Audience::Full } else { Audience::Public }
    }
}

fn bearer(parts: &Parts) -> Option<String> {
    let value = parts.headers.get(header::AUTHORIZATION)?.to_str().ok()?;
    value.strip_prefix("Bearer ").map(|t| t.trim().to_owned())
}

/// The value of one cookie from the `Cookie` header.
pub fn cookie(parts: &Parts, name: &str) -> Option<String> {
    parts.headers.get_all(header::COOKIE).iter().filter_map(|v| v.to_str().ok()).flat_map(|v| v.split(';')).find_map(
        |pair| {
            let (key, value) = pair.trim().split_once('=')?;
            (key == name).then(|| value.to_owned())
        },
    )
}

impl FromRequestParts<AppState> for Caller {
    type Rejection = ApiError;

    async fn from_request_parts(parts: &mut Parts, state: &AppState) -> Result<Self, Self::Rejection> {
        if let Some(token) = bearer(parts) {
            let hash = token_sha256(&token);
            let person = state.store.look(move |conn| people::person_by_device(conn, &hash)).await?;
            let person = person.ok_or_else(|| {
                ApiError::Unauthorized("this device identity is not known here; ask for a new one".into())
            })?;
            return Ok(Caller { person: Some(person), session_sha256: None, csrf_token: None });
        }
        let Some(token) = cookie(parts, SESSION_COOKIE) else {
            return Ok(Caller { person: None, session_sha256: None, csrf_token: None });
        };
        let hash = token_sha256(&token);
        let lookup = hash.clone();
        let found = state.store.look(move |conn| people::session(conn, &lookup, Utc::now())).await?;
        let Some((person, csrf)) = found else {
            return Err(ApiError::Unauthorized("your sign-in has ended; sign in again".into()));
        };
        if person.disabled {
            return Err(ApiError::Forbidden("this sign-in has been turned off".into()));
        }
        let changes_state = !matches!(parts.method, Method::GET | Method::HEAD | Method::OPTIONS);
        let sent = parts.headers.get("x-csrf-token").and_then(|v| v.to_str().ok());
        if changes_state && sent != Some(csrf.as_str()) {
            return Err(ApiError::Forbidden("missing or wrong X-CSRF-Token for this sign-in".into()));
        }
        Ok(Caller { person: Some(person), session_sha256: Some(hash), csrf_token: Some(csrf) })
    }
}

async fn person_with(parts: &mut Parts, state: &AppState, allowed: &[Role], what: &str) -> Result<Person, ApiError> {
    let caller = Caller::from_request_parts(parts, state).await?;
    let person = caller.person.ok_or_else(|| ApiError::Unauthorized(format!("sign in first: {what}")))?;
    if allowed.contains(&person.role) { Ok(person) } else { Err(ApiError::Forbidden(format!("not allowed: {what}"))) }
}

/// A phone with its device identity.
pub struct Observer(pub Person);
/// Anyone with an identity: a phone, or a signed-in reviewer or admin.
pub struct Someone(pub Person);
/// A signed-in reviewer or admin.
pub struct Reviewer(pub Person);
/// A signed-in admin.
pub struct Admin(pub Person);
/// A signed-in responder, reviewer or admin: the people who go out to animals.
pub struct Responder(pub Person);

impl FromRequestParts<AppState> for Observer {
    type Rejection = ApiError;
    async fn from_request_parts(parts: &mut Parts, state: &AppState) -> Result<Self, Self::Rejection> {
        person_with(parts, state, &[Role::Observer], "this needs the phone's own identity").await.map(Observer)
    }
}

impl FromRequestParts<AppState> for Someone {
    type Rejection = ApiError;
    async fn from_request_parts(parts: &mut Parts, state: &AppState) -> Result<Self, Self::Rejection> {
        person_with(
            parts,
            state,
            &[Role::Observer, Role::Reviewer, Role::Admin],
            "this needs the phone's own identity or a reviewer's sign-in",
        )
        .await
        .map(Someone)
    }
}

impl FromRequestParts<AppState> for Reviewer {
    type Rejection = ApiError;
    async fn from_request_parts(parts: &mut Parts, state: &AppState) -> Result<Self, Self::Rejection> {
        person_with(parts, state, &[Role::Reviewer, Role::Admin], "reviewers only").await.map(Reviewer)
    }
}

impl FromRequestParts<AppState> for Responder {
    type Rejection = ApiError;
    async fn from_request_parts(parts: &mut Parts, state: &AppState) -> Result<Self, Self::Rejection> {
        person_with(parts, state, &[Role::Responder, Role::Reviewer, Role::Admin], "responders and reviewers only")
            .await
            .map(Responder)
    }
}

impl FromRequestParts<AppState> for Admin {
    type Rejection = ApiError;
    async fn from_request_parts(parts: &mut Parts, state: &AppState) -> Result<Self, Self::Rejection> {
        person_with(parts, state, &[Role::Admin], "admins only").await.map(Admin)
    }
}

/// Whether `person` may act on something a phone sent (`owner`: that phone's observer,
/// if known): the same phone, or a reviewer or admin when `staff_too`. Refused with 403
/// naming `what`, since record and walk ids are public (exports print them).
pub fn check_owner(person: &Person, owner: Option<i64>, staff_too: bool, what: &str) -> Result<(), ApiError> {
    let allowed = match person.role {
        Role::Observer => owner == Some(person.id),
        Role::Reviewer | Role::Admin => staff_too,
        Role::Responder => false,
    };
    if allowed { Ok(()) } else { Err(ApiError::Forbidden(format!("{what} was sent from another phone"))) }
}

/// Where a request came from, as far as the server can tell without believing what a
/// caller says about itself: the connection's peer address, unless that peer is a
/// reverse proxy the operator listed (`Settings::trusted_proxies`). Then the client is
/// the last address in `X-Forwarded-For` that is not itself a trusted proxy (each proxy
/// appends the address it received from), and `X-Forwarded-Proto: https` says the
/// request came over HTTPS. Anyone else's `X-Forwarded-For` is ignored, so a caller
/// cannot pose as many addresses to dodge the sign-in limits, nor as a reviewer's
/// address to lock them out. Served without connection info (some tests), every client
/// shares the unspecified address.
pub struct Client {
    pub address: IpAddr,
    /// Whether people reached the server over HTTPS: its public address is `https://`,
    /// or a trusted proxy says so.
    pub https: bool,
}

impl FromRequestParts<AppState> for Client {
    type Rejection = std::convert::Infallible;

    async fn from_request_parts(parts: &mut Parts, state: &AppState) -> Result<Self, Self::Rejection> {
        let peer = parts.extensions.get::<ConnectInfo<SocketAddr>>().map(|info| info.0.ip());
        let trusted = &state.settings.trusted_proxies;
        let via_proxy = peer.is_some_and(|p| trusted.contains(&p));
        let forwarded = || {
            parts
                .headers
                .get_all("x-forwarded-for")
                .iter()
                .filter_map(|v| v.to_str().ok())
                .flat_map(|v| v.split(','))
                .filter_map(|a| a.trim().parse::<IpAddr>().ok())
                .rev()
                .find(|a| !trusted.contains(a))
        };
        let address = match peer {
            Some(peer) if via_proxy => forwarded().unwrap_or(peer),
            Some(peer) => peer,
            None => IpAddr::V4(Ipv4Addr::UNSPECIFIED),
        };
        let proxy_says_https = via_proxy
            && parts
                .headers
                .get("x-forwarded-proto")
                .and_then(|v| v.to_str().ok())
                .is_some_and(|proto| proto.trim().eq_ignore_ascii_case("https"));
        let public_https = state.settings.public_url.as_ref().is_some_and(|u| u.is_https());
        Ok(Client { address, https: public_https || proxy_says_https })
    }
}
