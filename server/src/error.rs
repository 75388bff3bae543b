//! The one error type handlers return, and the policy behind it.
//!
//! Bad input becomes a 4xx with a JSON body `{"error": "...", "field": "..."}` whose
//! message names what is wrong, in words the observer's phone can show. Internal
//! failures become a bare 500: the details go to the log, never to the client.

use axum::Json;
use axum::http::StatusCode;
use axum::response::{IntoResponse, Response};
use serde::Serialize;

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
    /// Too many failed sign-ins; try again later.
    #[error("{0}")]
    TooManyRequests(String),
    /// Well-formed request, content that cannot be used (a photo whose pixels do not decode).
    #[error("{0}")]
    Unprocessable(String),
    #[error(transparent)]
    Internal(#[from] anyhow::Error),
}

#[derive(Serialize)]
struct ErrorBody<'a> {
    error: &'a str,
    #[serde(skip_serializing_if = "Option::is_none")]
    field: Option<&'a str>,
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
            Self::TooManyRequests(_) => StatusCode::TOO_MANY_REQUESTS,
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

impl IntoResponse for ApiError {
    fn into_response(self) -> Response {
        let status = self.status();
        let message = match &self {
            Self::Internal(err) => {
                tracing::error!(error = ?err, "internal error");
                "the server could not finish this request; nothing was stored".to_owned()
            }
            other => other.to_string(),
        };
        let field = match &self {
            Self::InvalidField { field, .. } => Some(field.as_str()),
            _ => None,
        };
        let message = match &self {
            Self::InvalidField { message, .. } => message.clone(),
            _ => message,
        };
        (status, Json(ErrorBody { error: &message, field })).into_response()
    }
}
