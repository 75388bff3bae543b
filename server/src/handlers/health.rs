//! `/healthz`: says the server is up and its database answers.

use axum::extract::State;

use crate::error::ApiError;
use crate::state::AppState;

pub async fn healthz(State(state): State<AppState>) -> Result<&'static str, ApiError> {
    state.store.ping().await?;
    Ok("ok")
}
