//! What happens when a record arrives, stage after stage: intake checks and stores it
//! with its photos; a live animal's notifications to the responders are made (and
//! delivered in the background, `crate::notify`); then the search for other reports of
//! the same animal runs. The
//! handlers and the demo loader both come through here, so a record is treated the
//! same however it arrives.

use chrono::{DateTime, Utc};

use crate::duplicates::search::search_once;
use crate::intake::{self, Accepted, IntakeError, Upload};
use crate::notify::worker::enqueue;
use crate::state::AppState;

/// Accepts one submission from the phone `observer_id` (none for the demo loader).
pub async fn receive(
    state: &AppState,
    upload: Upload,
    observer_id: Option<i64>,
    now: DateTime<Utc>,
) -> Result<Accepted, IntakeError> {
    let accepted = intake::accept(&state.intake(), upload, observer_id, now).await?;
    let id = accepted.receipt.observation_id;
    // Made before anything else can fail; a resend makes none twice. Should this fail,
    // the phone's resend or the next start makes it.
    match enqueue(&state.store, &state.settings.responders, id, accepted.urgent).await {
        Ok(0) => {}
        Ok(_) => state.notify_wake.notify_one(),
        Err(err) => tracing::error!(observation = id, error = %err, "could not make the responders' notification"),
    }
    // A resend runs the search too: the first arrival may have stored the record and
    // then failed to search.
    search_once(&state.store, &state.duplicates, &state.taxa, accepted.receipt.observation_id, Utc::now())
        .await
        .map_err(anyhow::Error::from)?;
    Ok(accepted)
}
