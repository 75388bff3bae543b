//! Intake of survey walks: read, check, store once by the phone's id.

use chrono::{DateTime, Utc};
use sha2::{Digest as _, Sha256};
use shared_types::{WalkProblem, WalkReceipt, WalkSubmission};

use super::{IntakeError, parse_json};
use crate::store::Store;
use crate::store::walks::{self, WalkInsertion};

fn field_of(problem: &WalkProblem) -> &'static str {
    match problem {
        WalkProblem::EndsBeforeStart | WalkProblem::TooLong => "ended_at",
        WalkProblem::TooManyPoints(_) | WalkProblem::OutOfOrder(_) => "track",
        WalkProblem::BadDistance(_) | WalkProblem::TrackAndDistance => "typed_distance_m",
    }
}

/// Reads and checks a walk.
pub fn parse_walk(json: &[u8]) -> Result<WalkSubmission, IntakeError> {
    let walk: WalkSubmission = parse_json(json)?;
    walk.check()
        .map_err(|problem| IntakeError::Field { field: field_of(&problem).into(), message: problem.to_string() })?;
    Ok(walk)
}

/// What became of a walk that was not stored.
#[derive(Debug, thiserror::Error)]
pub enum WalkRefused {
    #[error(transparent)]
    Intake(#[from] IntakeError),
    #[error("walk {0} was sent from another phone")]
    NotYours(uuid::Uuid),
}

/// Stores a walk under the phone that sent it (`observer_id`); a resend gets the first
/// receipt, a changed resend a conflict, another phone's walk a refusal.
pub async fn accept_walk(
    store: &Store,
    json: &[u8],
    observer_id: Option<i64>,
    now: DateTime<Utc>,
) -> Result<WalkReceipt, WalkRefused> {
    let walk = parse_walk(json)?;
    let content = hex::encode(Sha256::digest(serde_json::to_vec(&walk).unwrap_or_default()));
    let client_id = walk.client_id;
    let outcome = store
        .write(move |conn| walks::insert_walk(conn, &walk, &content, observer_id, now))
        .await
        .map_err(|err| IntakeError::from(anyhow::Error::from(err)))?;
    match outcome {
        WalkInsertion::Created(receipt) | WalkInsertion::Replayed(receipt) => Ok(receipt),
        WalkInsertion::Conflict => Err(IntakeError::Conflict(client_id).into()),
        WalkInsertion::NotYours => Err(WalkRefused::NotYours(client_id)),
    }
}
