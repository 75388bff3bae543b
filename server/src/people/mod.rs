//! People with a sign-in (reviewers and admins): the checks on a new username, role and
//! password, with no HTTP in them, so the admin's screen, `wrackline user add` and the
//! demo add people the same way. [`auth`] holds passwords, tokens and sign-in limits.

pub mod auth;

use chrono::Utc;
use shared_types::Role;

use crate::store::{Store, people};

/// Why a sign-in was not added or changed, in words for the admin.
#[derive(Debug, thiserror::Error)]
pub enum PeopleError {
    /// One field was refused; `field` names it (`username`, `role`, `password`).
    #[error("{field}: {message}")]
    Invalid { field: &'static str, message: String },
    #[error("the username {0} is taken")]
    Taken(String),
    #[error(transparent)]
    Internal(#[from] anyhow::Error),
}

fn invalid(field: &'static str, message: impl Into<String>) -> PeopleError {
    PeopleError::Invalid { field, message: message.into() }
}

/// A role a sign-in may have: observers need none.
pub fn staff_role(role: Role) -> Result<Role, PeopleError> {
    if role == Role::Observer {
        return Err(invalid("role", "observers need no sign-in: their phone gets an identity of its own"));
    }
    Ok(role)
}

/// Checks a password's length and hashes it (argon2, on the blocking pool).
pub async fn hashed(password: String) -> Result<String, PeopleError> {
    if password.chars().count() < auth::MIN_PASSWORD_CHARS {
        return Err(invalid("password", format!("at least {} characters", auth::MIN_PASSWORD_CHARS)));
    }
    let hash = tokio::task::spawn_blocking(move || auth::hash_password(&password))
        .await
        .map_err(|err| anyhow::anyhow!("hashing a password: {err}"))?;
    Ok(hash?)
}

/// Usernames are kept lower-case, of letters, digits, '-', '_' and '.'.
pub fn checked_username(username: &str) -> Result<String, PeopleError> {
    let username = username.trim().to_lowercase();
    if username.is_empty() || !username.chars().all(|c| c.is_ascii_alphanumeric() || "-_.".contains(c)) {
        return Err(invalid("username", "use letters, digits, '-', '_' or '.'"));
    }
    Ok(username)
}

/// Checks and adds a reviewer or admin; `by` is the admin adding them (none for the
/// server's own command line and the demo). Returns the new person's id.
pub async fn add_staff(
    store: &Store,
    by: Option<i64>,
    username: &str,
    role: Role,
    display_name: String,
    password: String,
) -> Result<i64, PeopleError> {
    let role = staff_role(role)?;
    let username = checked_username(username)?;
    let hash = hashed(password).await?;
    let name = username.clone();
    let added = store
        .run(move |conn| people::add_staff(conn, &name, role, &display_name, &hash, by, Utc::now()))
        .await
        .map_err(anyhow::Error::from)?;
    added.ok_or(PeopleError::Taken(username))
}
