//! `/healthz`: says the server is up and its database answers.

use axum::extract::State;

use crate::AppState;
use crate::error::ApiError;

pub async fn healthz(State(state): State<AppState>) -> Result<&'static str, ApiError> {
    state.store.ping().await?;
    Ok("ok")
}
