//! The admin's screen of people with a sign-in: list, add, change a role, reset a
//! password, turn off and on, and the audit trail of those changes (who did what to
//! whose sign-in, and when).

use axum::Json;
use axum::body::Bytes;
use axum::extract::{Path, State};
use chrono::Utc;
use serde::Deserialize;
use shared_types::{PersonEvent, Role};

use crate::error::ApiError;
use crate::handlers::access::Admin;
use crate::handlers::observations::intake_error;
use crate::intake::parse_json;
use crate::people::{PeopleError, hashed, staff_role};
use crate::state::AppState;
use crate::store::people::{self, Person, RoleChange};

/// `GET /api/people`.
pub async fn list(State(state): State<AppState>, Admin(_): Admin) -> Result<Json<Vec<Person>>, ApiError> {
    Ok(Json(state.store.read(people::list_staff).await?))
}

/// `GET /api/people/events`: every change to a sign-in, newest first.
pub async fn events(State(state): State<AppState>, Admin(_): Admin) -> Result<Json<Vec<PersonEvent>>, ApiError> {
    Ok(Json(state.store.read(people::events).await?))
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct NewPerson {
    username: String,
    role: Role,
    display_name: String,
    password: String,
}

/// The admin's words for what was refused.
pub fn people_error(err: PeopleError) -> ApiError {
    match err {
        PeopleError::Invalid { field, message } => ApiError::InvalidField { field: field.into(), message },
        PeopleError::Taken(_) => ApiError::Conflict(err.to_string()),
        PeopleError::Internal(err) => ApiError::Internal(err),
    }
}

/// `POST /api/people`.
pub async fn add(
    State(state): State<AppState>,
    Admin(admin): Admin,
    body: Bytes,
) -> Result<Json<serde_json::Value>, ApiError> {
    let new: NewPerson = parse_json(&body).map_err(intake_error)?;
    let id =
        crate::people::add_staff(&state.store, Some(admin.id), &new.username, new.role, new.display_name, new.password)
            .await
            .map_err(people_error)?;
    Ok(Json(serde_json::json!({"id": id})))
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Disabled {
    disabled: bool,
}

fn is_self(admin: &Person, username: &str) -> bool {
    admin.username.as_deref() == Some(username)
}

/// `PUT /api/people/{username}/disabled`.
pub async fn set_disabled(
    State(state): State<AppState>,
    Admin(admin): Admin,
    Path(username): Path<String>,
    body: Bytes,
) -> Result<Json<serde_json::Value>, ApiError> {
    let Disabled { disabled } = parse_json(&body).map_err(intake_error)?;
    if disabled && is_self(&admin, &username) {
        return Err(ApiError::Conflict("an admin cannot turn off their own sign-in".into()));
    }
    let name = username.clone();
    let changed =
        state.store.run(move |conn| people::set_disabled(conn, &name, disabled, Some(admin.id), Utc::now())).await?;
    if !changed {
        return Err(ApiError::NotFound(format!("no sign-in called {username}")));
    }
    Ok(Json(serde_json::json!({"username": username, "disabled": disabled})))
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct NewRole {
    role: Role,
}

/// `PUT /api/people/{username}/role`: reviewer ↔ admin. An admin cannot change their
/// own role, so the admin making the change is always left.
pub async fn set_role(
    State(state): State<AppState>,
    Admin(admin): Admin,
    Path(username): Path<String>,
    body: Bytes,
) -> Result<Json<serde_json::Value>, ApiError> {
    let NewRole { role } = parse_json(&body).map_err(intake_error)?;
    let role = staff_role(role).map_err(people_error)?;
    if is_self(&admin, &username) {
        return Err(ApiError::Conflict("an admin cannot change their own role; ask another admin".into()));
    }
    let name = username.clone();
    match state.store.run(move |conn| people::set_role(conn, &name, role, Some(admin.id), Utc::now())).await? {
        RoleChange::NoSuchPerson => Err(ApiError::NotFound(format!("no sign-in called {username}"))),
        RoleChange::Unchanged => Ok(Json(serde_json::json!({"username": username, "role": role, "changed": false}))),
        RoleChange::Changed { from } => {
            Ok(Json(serde_json::json!({"username": username, "role": role, "was": from, "changed": true})))
        }
    }
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct NewPassword {
    password: String,
}

/// `PUT /api/people/{username}/password`: a new password chosen by the admin, to hand
/// over in person; the person's sessions end.
pub async fn reset_password(
    State(state): State<AppState>,
    Admin(admin): Admin,
    Path(username): Path<String>,
    body: Bytes,
) -> Result<Json<serde_json::Value>, ApiError> {
    let NewPassword { password } = parse_json(&body).map_err(intake_error)?;
    let hash = hashed(password).await.map_err(people_error)?;
    let name = username.clone();
    let changed =
        state.store.run(move |conn| people::set_password(conn, &name, &hash, Some(admin.id), Utc::now())).await?;
    if !changed {
        return Err(ApiError::NotFound(format!("no sign-in called {username}")));
    }
    Ok(Json(serde_json::json!({"username": username, "password_reset": true})))
}
