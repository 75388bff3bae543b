//! Review decisions and the queue, as plain functions: which state an action leads to
//! from which state and why, why a record stands where it does in the queue, which
//! records a taxon filter takes in, and the guided key replayed for the reviewer.
//!
//! Queue order (most important first): live animals no response has been logged for,
//! then protected species, then sensitive species
//! (locations generalised in public), then records with flags (each kind of flag
//! counts: oversize, out of range, possible duplicate, photo older than the record,
//! photo far from the record), then the oldest observation first.

pub mod queue;
pub mod replay;

use shared_types::{KEY_RANKS, ReviewAction, ReviewState};

use crate::store::duplicates as duplicates_store;
use crate::store::observations;
use crate::store::review::Change;

pub use queue::{WantedTaxon, order, priority, queue_flags};
pub use replay::key_replay;

/// Why an action cannot be taken.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ActionRefused {
    #[error("a merged record is reviewed through the record it was merged into")]
    Merged,
    #[error("taxon_rank must be one of {KEY_RANKS:?}, got {0}")]
    UnknownRank(String),
    #[error("{0} must not be empty")]
    Empty(&'static str),
}

/// What an action changes, given the record's state now. The audit row's reason is
/// the reviewer's own words: the remark, the question, or the reason.
pub fn decide(current: ReviewState, action: &ReviewAction) -> Result<Change, ActionRefused> {
    if current == ReviewState::Merged {
        return Err(ActionRefused::Merged);
    }
    let change = match action {
        ReviewAction::Confirm { scientific_name, taxon_rank, remark } => {
            if !KEY_RANKS.contains(&taxon_rank.as_str()) {
                return Err(ActionRefused::UnknownRank(taxon_rank.clone()));
            }
            if scientific_name.as_str().is_empty() {
                return Err(ActionRefused::Empty("scientific_name"));
            }
            let remark = remark.as_ref().map(|r| r.as_str().to_owned()).filter(|r| !r.is_empty());
            Change {
                action: "confirm",
                to_state: ReviewState::Confirmed,
                detail: Some(format!("identified as {} ({taxon_rank})", scientific_name.as_str())),
                reason: remark.clone(),
                identification: Some((scientific_name.as_str().to_owned(), taxon_rank.clone(), remark)),
                message: None,
            }
        }
        ReviewAction::RequestDetails { message } => {
            if message.as_str().is_empty() {
                return Err(ActionRefused::Empty("message"));
            }
            Change {
                action: "request_details",
                to_state: ReviewState::DetailsRequested,
                detail: Some("asked the observer for details".into()),
                reason: Some(message.as_str().to_owned()),
                identification: None,
                message: Some(message.as_str().to_owned()),
            }
        }
        ReviewAction::NotConfirmable { reason } => {
            if reason.as_str().is_empty() {
                return Err(ActionRefused::Empty("reason"));
            }
            Change {
                action: "not_confirmable",
                to_state: ReviewState::NotConfirmable,
                detail: Some("marked not confirmable".into()),
                reason: Some(reason.as_str().to_owned()),
                identification: None,
                message: None,
            }
        }
    };
    Ok(change)
}

/// The other reports that may be the same animal as `record`, with the distance and
/// time between them and any decision taken.
pub fn duplicate_views(
    conn: &rusqlite::Connection,
    record: &shared_types::RecordView,
) -> Result<Vec<shared_types::DuplicateView>, crate::store::StoreError> {
    let mut views = Vec::new();
    for candidate in duplicates_store::candidates_of(conn, record.observation_id)? {
        let Some(other) = observations::record_by_observation_id(conn, candidate.other)? else { continue };
        let here = record.submission.position.map(|p| (p.latitude.get(), p.longitude.get()));
        let there = other.submission.position.map(|p| (p.latitude.get(), p.longitude.get()));
        let gap_hours =
            (other.submission.observed_at - record.submission.observed_at).num_seconds().abs() as f64 / 3600.0;
        views.push(shared_types::DuplicateView {
            distance_m: here.zip(there).map(|(a, b)| crate::duplicates::geodesic_m(a, b)),
            gap_hours,
            other,
            score: candidate.score,
            reasons: candidate.reasons,
            decision: candidate.decision,
            merge_id: candidate.merge_id,
        });
    }
    Ok(views)
}
