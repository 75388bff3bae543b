//! The admin's screen of people with a sign-in: list, add, turn off and on.

use axum::Json;
use axum::body::Bytes;
use axum::extract::{Path, State};
use chrono::Utc;
use serde::Deserialize;
use shared_types::Role;

use crate::AppState;
use crate::auth;
use crate::error::ApiError;
use crate::handlers::access::Admin;
use crate::handlers::observations::intake_error;
use crate::intake::parse_json;
use crate::store::people::{self, Person};

/// `GET /api/people`.
pub async fn list(State(state): State<AppState>, Admin(_): Admin) -> Result<Json<Vec<Person>>, ApiError> {
    Ok(Json(state.store.run(|conn| people::list_staff(conn)).await?))
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct NewPerson {
    username: String,
    role: Role,
    display_name: String,
    password: String,
}

/// Checks and adds a reviewer or admin; shared by the admin screen and the command line.
pub async fn add_staff(state: &AppState, username: String, role: Role, display_name: String, password: String) -> Result<i64, ApiError> {
    let invalid = |field: &str, message: String| ApiError::InvalidField { field: field.into(), message };
    if role == Role::Observer {
        return Err(invalid("role", "observers need no sign-in: their phone gets an identity of its own".into()));
    }
    let username = username.trim().to_lowercase();
    if username.is_empty() || !username.chars().all(|c| c.is_ascii_alphanumeric() || "-_.".contains(c)) {
        return Err(invalid("username", "use letters, digits, '-', '_' or '.'".into()));
    }
    if password.chars().count() < auth::MIN_PASSWORD_CHARS {
        return Err(invalid("password", format!("at least {} characters", auth::MIN_PASSWORD_CHARS)));
    }
    let hash = tokio::task::spawn_blocking(move || auth::hash_password(&password)).await.map_err(|err| ApiError::Internal(err.into()))??;
    let name = username.clone();
    let added = state.store.run(move |conn| people::add_staff(conn, &name, role, &display_name, &hash, Utc::now())).await?;
    added.ok_or_else(|| ApiError::Conflict(format!("the username {username} is taken")))
}

/// `POST /api/people`.
pub async fn add(State(state): State<AppState>, Admin(_): Admin, body: Bytes) -> Result<Json<serde_json::Value>, ApiError> {
    let new: NewPerson = parse_json(&body).map_err(intake_error)?;
    let id = add_staff(&state, new.username, new.role, new.display_name, new.password).await?;
    Ok(Json(serde_json::json!({"id": id})))
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Disabled {
    disabled: bool,
}

/// `PUT /api/people/{username}/disabled`.
pub async fn set_disabled(State(state): State<AppState>, Admin(admin): Admin, Path(username): Path<String>, body: Bytes) -> Result<Json<serde_json::Value>, ApiError> {
    let Disabled { disabled } = parse_json(&body).map_err(intake_error)?;
    if disabled && admin.username.as_deref() == Some(username.as_str()) {
        return Err(ApiError::Conflict("an admin cannot turn off their own sign-in".into()));
    }
    let name = username.clone();
    let changed = state.store.run(move |conn| people::set_disabled(conn, &name, disabled)).await?;
    if !changed {
        return Err(ApiError::NotFound(format!("no sign-in called {username}")));
    }
    Ok(Json(serde_json::json!({"username": username, "disabled": disabled})))
}
