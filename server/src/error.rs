//! The one error type handlers return, and the policy behind it.
//!
//! Bad input becomes a 4xx with a JSON body `{"error": "...", "field": "..."}` whose
//! message names what is wrong, in words the observer's phone can show. Internal
//! failures become a bare 500: the details go to the log, never to the client.
//!
//! Refusals that say "not now" rather than "not this" carry `Retry-After` (seconds):
//! 429 after too many failed sign-ins or past a sender's pace, 503 when the server is
//! busy or cannot write, 507 when its disk is full. An internal failure whose cause is a
//! full or read-only disk is answered as 507 or 503 too, with a sentence that claims
//! nothing about what was stored.

use std::time::Duration;

use axum::Json;
use axum::http::{HeaderValue, StatusCode, header};
use axum::response::{IntoResponse, Response};
use shared_types::ErrorBody;

#[derive(Debug, thiserror::Error)]
pub enum ApiError {
    /// The request could not be read at all (not multipart, a part missing...).
    #[error("{0}")]
    BadRequest(String),
    /// One field was refused; `field` is its path in the submission, e.g. `position.latitude`.
    #[error("{field}: {message}")]
    InvalidField { field: String, message: String },
    /// The same client id was sent before with different content.
    #[error("{0}")]
    Conflict(String),
    #[error("{0}")]
    NotFound(String),
    #[error("{0}")]
    TooLarge(String),
    #[error("{0}")]
    UnsupportedMedia(String),
    /// No identity, or one that is not signed in.
    #[error("{0}")]
    Unauthorized(String),
    /// Signed in, but not allowed to do this.
    #[error("{0}")]
    Forbidden(String),
    /// Too many failed sign-ins; try again after `retry_after_s` seconds.
    #[error("{message}")]
    TooManyRequests { message: String, retry_after_s: u64 },
    /// Past a sender's pace: try again after `retry_after`.
    #[error("{message}; try again in {} s", retry_after_s(*.retry_after))]
    RateLimited { message: String, retry_after: Duration },
    /// Busy or unable to write just now: try again after `retry_after`.
    #[error("{message}; try again in {} s", retry_after_s(*.retry_after))]
    Unavailable { message: String, retry_after: Duration },
    /// The data disk is full.
    #[error("{0}")]
    NoRoom(String),
    /// One part of the request is over its size limit; `field` names it.
    #[error("{field}: {message}")]
    OverLimit { field: String, message: String },
    /// The request stopped arriving.
    #[error("{0}")]
    Timeout(String),
    /// Well-formed request, content that cannot be used (a photo whose pixels do not decode).
    #[error("{0}")]
    Unprocessable(String),
    #[error(transparent)]
    Internal(#[from] anyhow::Error),
}

impl ApiError {
    fn status(&self) -> StatusCode {
        match self {
            Self::BadRequest(_) => StatusCode::BAD_REQUEST,
            Self::InvalidField { .. } => StatusCode::UNPROCESSABLE_ENTITY,
            Self::Conflict(_) => StatusCode::CONFLICT,
            Self::NotFound(_) => StatusCode::NOT_FOUND,
            Self::TooLarge(_) => StatusCode::PAYLOAD_TOO_LARGE,
            Self::UnsupportedMedia(_) => StatusCode::UNSUPPORTED_MEDIA_TYPE,
            Self::Unauthorized(_) => StatusCode::UNAUTHORIZED,
            Self::Forbidden(_) => StatusCode::FORBIDDEN,
            Self::TooManyRequests { .. } | Self::RateLimited { .. } => StatusCode::TOO_MANY_REQUESTS,
            Self::Unavailable { .. } => StatusCode::SERVICE_UNAVAILABLE,
            Self::NoRoom(_) => StatusCode::INSUFFICIENT_STORAGE,
            Self::OverLimit { .. } => StatusCode::PAYLOAD_TOO_LARGE,
            Self::Timeout(_) => StatusCode::REQUEST_TIMEOUT,
            Self::Unprocessable(_) => StatusCode::UNPROCESSABLE_ENTITY,
            Self::Internal(_) => StatusCode::INTERNAL_SERVER_ERROR,
        }
    }
}

impl From<crate::store::StoreError> for ApiError {
    fn from(err: crate::store::StoreError) -> Self {
        Self::Internal(err.into())
    }
}

/// The only sentence a client gets for an internal failure. It claims nothing about what
/// was or was not stored, since the failure may come after a commit.
pub const INTERNAL_MESSAGE: &str = "the server could not finish this request; try again later";
/// The sentence for an internal failure caused by a full disk; it too claims nothing
/// about what was stored.
pub const NO_ROOM_MESSAGE: &str = "the server's disk is full; try again later";
/// The sentence for an internal failure caused by a read-only data folder.
pub const UNWRITABLE_MESSAGE: &str = "the server cannot write to its data folder just now; try again later";
/// Seconds to wait after a full or read-only disk (an operator has to act).
pub const RETRY_NO_ROOM_S: u64 = 300;
/// Seconds to wait when the server is busy receiving other uploads.
pub const RETRY_BUSY_S: u64 = 5;

/// Whole seconds to wait, at least one.
fn retry_after_s(wait: Duration) -> u64 {
    wait.as_secs_f64().ceil().max(1.0) as u64
}

/// Whether a request body stopped arriving in time: tower-http's body timeout error,
/// anywhere behind `err`.
pub fn timed_out(err: &(dyn std::error::Error + 'static)) -> bool {
    let mut cause = Some(err);
    while let Some(err) = cause {
        if err.is::<tower_http::timeout::TimeoutError>() {
            return true;
        }
        cause = err.source();
    }
    false
}

impl ApiError {
    /// The body the client receives: the message and field for bad input, only
    /// [`INTERNAL_MESSAGE`] for an internal failure (its details go to the log).
    fn body(&self) -> ErrorBody {
        match self {
            Self::Internal(_) => ErrorBody { error: INTERNAL_MESSAGE.to_owned(), field: None },
            Self::InvalidField { field, message } | Self::OverLimit { field, message } => {
                ErrorBody { error: message.clone(), field: Some(field.clone()) }
            }
            other => ErrorBody { error: other.to_string(), field: None },
        }
    }
}

impl ApiError {
    /// An internal failure whose cause is the disk becomes the refusal that says so.
    fn told_apart(self) -> Self {
        let Self::Internal(err) = &self else { return self };
        match crate::intake::storage_trouble(err) {
            Some(crate::intake::StorageTrouble::Full) => {
                tracing::error!(error = ?err, "the data disk is full");
                Self::NoRoom(NO_ROOM_MESSAGE.into())
            }
            Some(crate::intake::StorageTrouble::ReadOnly) => {
                tracing::error!(error = ?err, "the data folder cannot be written");
                Self::Unavailable {
                    message: UNWRITABLE_MESSAGE.trim_end_matches("; try again later").into(),
                    retry_after: Duration::from_secs(RETRY_NO_ROOM_S),
                }
            }
            None => self,
        }
    }

    /// How long the client should wait before trying again, when that is the point.
    fn retry_after(&self) -> Option<u64> {
        match self {
            Self::RateLimited { retry_after, .. } | Self::Unavailable { retry_after, .. } => {
                Some(retry_after_s(*retry_after))
            }
            Self::TooManyRequests { retry_after_s, .. } => Some(*retry_after_s),
            Self::NoRoom(_) => Some(RETRY_NO_ROOM_S),
            _ => None,
        }
    }
}

impl IntoResponse for ApiError {
    fn into_response(self) -> Response {
        let this = self.told_apart();
        if let Self::Internal(err) = &this {
            tracing::error!(error = ?err, "internal error");
        }
        let mut response = (this.status(), Json(this.body())).into_response();
        if let Some(seconds) = this.retry_after() {
            response.headers_mut().insert(header::RETRY_AFTER, HeaderValue::from(seconds));
        }
        response
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn answer(err: ApiError) -> (StatusCode, ErrorBody) {
        (err.status(), err.body())
    }

    #[test]
    fn each_kind_of_refusal_has_its_status() {
        let cases = [
            (ApiError::BadRequest("x".into()), 400),
            (ApiError::InvalidField { field: "f".into(), message: "m".into() }, 422),
            (ApiError::Conflict("x".into()), 409),
            (ApiError::NotFound("x".into()), 404),
            (ApiError::TooLarge("x".into()), 413),
            (ApiError::UnsupportedMedia("x".into()), 415),
            (ApiError::Unauthorized("x".into()), 401),
            (ApiError::Forbidden("x".into()), 403),
            (ApiError::TooManyRequests { message: "x".into(), retry_after_s: 60 }, 429),
            (ApiError::RateLimited { message: "x".into(), retry_after: Duration::from_secs(1) }, 429),
            (ApiError::Unavailable { message: "x".into(), retry_after: Duration::from_secs(1) }, 503),
            (ApiError::NoRoom("x".into()), 507),
            (ApiError::OverLimit { field: "f".into(), message: "m".into() }, 413),
            (ApiError::Timeout("x".into()), 408),
            (ApiError::Unprocessable("x".into()), 422),
            (ApiError::Internal(anyhow::anyhow!("x")), 500),
        ];
        for (err, status) in cases {
            let shown = format!("{err:?}");
            assert_eq!(err.status().as_u16(), status, "{shown}");
        }
    }

    #[test]
    fn too_many_requests_says_when_to_try_again() {
        // RFC 9110 §10.2.3: Retry-After as a number of seconds.
        let response = ApiError::TooManyRequests { message: "wait".into(), retry_after_s: 840 }.into_response();
        assert_eq!(response.status(), StatusCode::TOO_MANY_REQUESTS);
        assert_eq!(response.headers()[axum::http::header::RETRY_AFTER], "840");
    }

    #[test]
    fn a_refused_field_is_named_apart_from_its_message() {
        let (status, body) =
            answer(ApiError::InvalidField { field: "position.latitude".into(), message: "must be at most 90".into() });
        assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
        assert_eq!(body.error, "must be at most 90");
        assert_eq!(body.field.as_deref(), Some("position.latitude"));
    }

    #[test]
    fn an_internal_failure_leaks_nothing_of_its_cause() {
        let secret = "/var/lib/wrackline/wrackline.sqlite3: disk I/O error at page 4711";
        let err = ApiError::Internal(anyhow::anyhow!(secret).context("inserting observation 12"));
        let (status, body) = answer(err);
        assert_eq!(status, StatusCode::INTERNAL_SERVER_ERROR);
        assert_eq!(body, ErrorBody { error: INTERNAL_MESSAGE.to_owned(), field: None });
        let json = serde_json::to_string(&body).unwrap();
        for fragment in ["sqlite", "4711", "/var/lib", "observation 12", "disk"] {
            assert!(!json.contains(fragment), "{json} leaks {fragment}");
        }
    }

    #[test]
    fn a_full_disk_behind_an_internal_failure_is_a_507_that_claims_nothing_and_says_when_to_retry() {
        let full = std::io::Error::from(std::io::ErrorKind::StorageFull);
        let response = ApiError::Internal(anyhow::Error::from(full).context("writing photo 1")).into_response();
        assert_eq!(response.status(), StatusCode::INSUFFICIENT_STORAGE);
        assert_eq!(response.headers()[header::RETRY_AFTER], RETRY_NO_ROOM_S.to_string());
        let sqlite_full = rusqlite::Error::SqliteFailure(rusqlite::ffi::Error::new(rusqlite::ffi::SQLITE_FULL), None);
        let response = ApiError::from(crate::store::StoreError::Sqlite(sqlite_full)).into_response();
        assert_eq!(response.status(), StatusCode::INSUFFICIENT_STORAGE);
        let read_only = std::io::Error::from(std::io::ErrorKind::ReadOnlyFilesystem);
        let response = ApiError::Internal(read_only.into()).into_response();
        assert_eq!(response.status(), StatusCode::SERVICE_UNAVAILABLE);
        assert!(!NO_ROOM_MESSAGE.contains("stored") && !UNWRITABLE_MESSAGE.contains("stored"));
    }

    #[test]
    fn a_pace_refusal_rounds_its_wait_up_to_whole_seconds() {
        let refusal = ApiError::RateLimited { message: "slow down".into(), retry_after: Duration::from_millis(1200) };
        assert_eq!(refusal.to_string(), "slow down; try again in 2 s");
        let response = refusal.into_response();
        assert_eq!(response.headers()[header::RETRY_AFTER], "2");
    }

    #[test]
    fn an_internal_failure_does_not_claim_nothing_was_stored() {
        // It may come after a commit (a failure in follow-up work), so it must not say so.
        assert!(!INTERNAL_MESSAGE.contains("nothing was stored"));
    }
}
