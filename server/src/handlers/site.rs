//! `GET /api/site`: what the operator set for every phone to show, such as the local
//! responders' number beside the safety cautions. Phones keep the answer for flight mode.

use axum::Json;
use axum::extract::State;
use serde::Serialize;

use crate::state::AppState;

/// What a phone shows from the operator's settings.
#[derive(Debug, Serialize)]
pub struct SiteInfo {
    /// Who to call about a live or stranded animal, as the operator wrote it.
    pub responders_phone: Option<String>,
}

pub async fn get(State(state): State<AppState>) -> Json<SiteInfo> {
    Json(SiteInfo { responders_phone: state.settings.responders_phone.clone() })
}
