//! The one error type handlers return, and the policy behind it.
//!
//! Bad input becomes a 4xx with a JSON body `{"error": "...", "field": "..."}` whose
//! message names what is wrong, in words the observer's phone can show. Internal
//! failures become a bare 500: the details go to the log, never to the client. A 429
//! says in `Retry-After` how many seconds to wait.

use axum::Json;
use axum::http::StatusCode;
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
    /// Too many attempts; try again after `retry_after_s` seconds (sent as `Retry-After`).
    #[error("{message}")]
    TooManyRequests { message: String, retry_after_s: u64 },
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
            Self::TooManyRequests { .. } => StatusCode::TOO_MANY_REQUESTS,
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

impl ApiError {
    /// The body the client receives: the message and field for bad input, only
    /// [`INTERNAL_MESSAGE`] for an internal failure (its details go to the log).
    fn body(&self) -> ErrorBody {
        match self {
            Self::Internal(_) => ErrorBody { error: INTERNAL_MESSAGE.to_owned(), field: None },
            Self::InvalidField { field, message } => ErrorBody { error: message.clone(), field: Some(field.clone()) },
            other => ErrorBody { error: other.to_string(), field: None },
        }
    }
}

impl IntoResponse for ApiError {
    fn into_response(self) -> Response {
        if let Self::Internal(err) = &self {
            tracing::error!(error = ?err, "internal error");
        }
        let mut response = (self.status(), Json(self.body())).into_response();
        if let Self::TooManyRequests { retry_after_s, .. } = &self {
            response.headers_mut().insert(axum::http::header::RETRY_AFTER, (*retry_after_s).into());
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
    fn an_internal_failure_does_not_claim_nothing_was_stored() {
        // It may come after a commit (a failure in follow-up work), so it must not say so.
        assert!(!INTERNAL_MESSAGE.contains("nothing was stored"));
    }
}
