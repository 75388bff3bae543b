//! What happens when a record arrives, stage after stage: intake checks and stores it
//! with its photos, the search for other reports of the same animal in the same commit;
//! then a live animal's notifications to the responders are made (and delivered in the
//! background, `crate::notify`). The handlers, the demo loader and imports (`crate::import`) all come through here, so a
//! record is treated the same however it arrives. Once intake has stored the record its receipt goes back:
//! follow-up work that fails is retried in the background, never answered as an error.

use chrono::{DateTime, Utc};

use crate::duplicates::search::{search_once, search_unless_done, take_in_records_stored_elsewhere};
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
    arrive(state, upload, observer_id, now, Alert::Responders).await
}

/// Accepts one record imported from what a network kept before (`crate::import`): the
/// same checks, storage and duplicate search, but no alert, since a live animal in an old
/// spreadsheet was dealt with when it was found.
pub async fn receive_imported(state: &AppState, upload: Upload, now: DateTime<Utc>) -> Result<Accepted, IntakeError> {
    arrive(state, upload, None, now, Alert::Nobody).await
}

/// Whether a live animal's arrival tells the responders.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Alert {
    Responders,
    Nobody,
}

async fn arrive(
    state: &AppState,
    upload: Upload,
    observer_id: Option<i64>,
    now: DateTime<Utc>,
    alert: Alert,
) -> Result<Accepted, IntakeError> {
    // Records another process stored (an import) join the index first, so this one's
    // search finds them; if that fails, the search goes on with what the index has.
    if let Err(err) = take_in_records_stored_elsewhere(&state.store, &state.duplicates).await {
        tracing::warn!(error = %err, "could not read records stored by another process for the duplicate search");
    }
    let (index, names) = (state.duplicates.clone(), state.taxa.clone());
    // The search runs in the commit that stores the record, in a savepoint of its own, so
    // reviewers see its candidates as soon as the receipt is out and a burst of records
    // costs one durable commit, not two.
    let search: intake::FollowUp = Box::new(move |conn, id| search_unless_done(conn, &index, &names, id, Utc::now()));
    let accepted = intake::accept(&state.intake(), upload, observer_id, now, Some(search)).await?;
    // The record is stored: from here nothing may turn its answer into an error.
    let id = accepted.receipt.observation_id;
    // A live animal's notifications; a resend makes none twice, and makes them should
    // the first arrival have failed to.
    let urgent = accepted.urgent && alert == Alert::Responders;
    match enqueue(&state.store, &state.settings.responders, id, urgent).await {
        Ok(0) => {}
        Ok(_) => state.notify_wake.notify_one(),
        Err(err) => tracing::error!(observation = id, error = %err, "could not make the responders' notification"),
    }
    if let Some(err) = &accepted.follow_up_failed {
        tracing::warn!(observation = id, error = %err, "search for duplicates failed; trying again in the background");
        state.retries.push(id);
    } else if accepted.replayed {
        // A resend: the first arrival may have stored the record and then failed to search.
        if let Err(err) = search_once(&state.store, &state.duplicates, &state.taxa, id, Utc::now()).await {
            tracing::warn!(observation = id, error = %err, "search for duplicates failed; trying again in the background");
            state.retries.push(id);
        }
    }
    Ok(accepted)
}
