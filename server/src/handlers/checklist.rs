//! `GET /api/checklist`: the species checklist the server uses, so phones key out
//! records against the same list (they keep a copy for offline use).

use axum::Json;
use axum::extract::State;

use crate::AppState;

pub async fn get(State(state): State<AppState>) -> Json<species_key::Checklist> {
    Json(species_key::Checklist::clone(state.checklist()))
}
