//! What happens when a record arrives, stage after stage: intake checks and stores it
//! with its photos, then the search for other reports of the same animal runs. The
//! handlers and the demo loader both come through here, so a record is treated the
//! same however it arrives. Once intake has stored the record its receipt goes back:
//! follow-up work that fails is retried in the background, never answered as an error.

use chrono::{DateTime, Utc};

use crate::duplicates::search::search_once;
use crate::intake::{self, Accepted, IntakeError, Upload};
use crate::state::AppState;

/// Accepts one submission from the phone `observer_id` (none for the demo loader).
pub async fn receive(
    state: &AppState,
    upload: Upload,
    observer_id: Option<i64>,
    now: DateTime<Utc>,
) -> Result<Accepted, IntakeError> {
    let accepted = intake::accept(&state.intake(), upload, observer_id, now).await?;
    // The record is stored: from here nothing may turn its answer into an error.
    follow_up(state, accepted.receipt.observation_id).await;
    Ok(accepted)
}

/// The search for other reports of the same animal, waited for so that reviewers see its
/// candidates as soon as the receipt is out; when it fails, it is logged and tried again
/// in the background. A resend runs it too: the first arrival may have stored the
/// record and then failed to search.
async fn follow_up(state: &AppState, observation_id: i64) {
    if let Err(err) = search_once(&state.store, &state.duplicates, &state.taxa, observation_id, Utc::now()).await {
        tracing::warn!(observation = observation_id, error = %err, "search for duplicates failed; trying again in the background");
        state.retries.push(observation_id);
    }
}
