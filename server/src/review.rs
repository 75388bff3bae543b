//! Review decisions and the queue's order, as plain functions: which state an action
//! leads to from which state, and why a record stands where it does in the queue.
//!
//! Queue order (most important first): protected species, then sensitive species
//! (locations generalised in public), then records with flags (each flag counts), then
//! the oldest observation first.

use shared_types::{KEY_RANKS, RecordView, ReviewAction, ReviewState};
use species_key::{Checklist, Sensitivity};

use crate::store::review::Change;

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

/// What an action changes, given the record's state now.
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
            Change {
                action: "confirm",
                to_state: ReviewState::Confirmed,
                detail: Some(format!("{} ({taxon_rank})", scientific_name.as_str())),
                identification: Some((scientific_name.as_str().to_owned(), taxon_rank.clone(), remark.as_ref().map(|r| r.as_str().to_owned()))),
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
                detail: None,
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
                detail: Some(reason.as_str().to_owned()),
                identification: None,
                message: None,
            }
        }
    };
    Ok(change)
}

/// A record's place in the queue: a sort key (higher first) and the reasons in words.
pub fn priority(record: &RecordView, current_taxon: Option<&str>, checklist: &Checklist, possible_duplicate: bool) -> (u32, Vec<String>) {
    let mut score = 0;
    let mut reasons = Vec::new();
    // At any rank: a genus or family counts as protected or sensitive if any of its species is.
    if let Some(taxon) = current_taxon.and_then(|name| crate::assess::taxa::NamedTaxon::find(checklist, name)) {
        let may_be = if taxon.rank == species_key::TaxonRank::Species { "" } else { " (or holds species that are)" };
        if taxon.protected {
            score += 1000;
            reasons.push(format!("{} is protected{may_be}", taxon.scientific_name));
        }
        if taxon.sensitivity != Sensitivity::None {
            score += 500;
            reasons.push(format!("{} is sensitive{may_be}: its public locations are generalised", taxon.scientific_name));
        }
    }
    for flag in &record.flags {
        score += 100;
        reasons.push(flag.reason.clone());
    }
    if possible_duplicate {
        score += 100;
        reasons.push("possibly the same animal as another report: compare them".into());
    }
    (score, reasons)
}

/// Orders queue items: by score, then oldest observation first.
pub fn order(items: &mut [(u32, RecordView, Vec<String>, Option<String>)]) {
    items.sort_by(|a, b| b.0.cmp(&a.0).then(a.1.submission.observed_at.cmp(&b.1.submission.observed_at)));
}
