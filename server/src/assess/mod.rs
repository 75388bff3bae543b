//! Range and trend figures for assessors, with no HTTP in them: the command line (and
//! later the HTTP handlers) call these functions.
//!
//! - [`input`]: records from the database, a CSV file or a Darwin Core Archive.
//! - [`range`]: records, sites, EOO and AOO per taxon and period, side by side.
//! - [`trend`]: effort-corrected yearly trends over the assessment window.
//! - [`map`], [`chart`]: the range map and the trend chart as SVG.
//! - [`dates`], [`meta`]: dates and periods; reading an archive's `meta.xml`.
//! - [`nearby`]: confirmed records near a place per species, for the guided key's prior.
//! - [`effort`]: survey effort per stretch and period, for encounter rates.
//!
//! Every figure is an input to an assessment, not a listing decision; the reports carry
//! that caution with them.

pub mod chart;
pub mod dates;
pub mod effort;
pub mod input;
pub mod map;
pub mod meta;
pub mod nearby;
pub mod range;
pub mod trend;

use shared_types::ReviewState;

/// The records figures and exports use when the caller names no review state: the
/// confirmed ones, the same in the app, the API (`state=`) and the command line
/// (`--state`), so a figure and a download made without choosing agree.
pub const DEFAULT_STATE: &str = "confirmed";

/// Reads `--state` values: review-state codes or labels (`confirmed`, `awaiting review`,
/// `awaiting_review`…), or `any`. `None` means every state.
pub fn parse_states(values: &[String]) -> Result<Option<Vec<ReviewState>>, String> {
    if values.iter().any(|v| v.trim().eq_ignore_ascii_case("any")) {
        return Ok(None);
    }
    let all = [
        ReviewState::AwaitingReview,
        ReviewState::DetailsRequested,
        ReviewState::Confirmed,
        ReviewState::NotConfirmable,
        ReviewState::Merged,
    ];
    let read = |value: &str| {
        let wanted = value.trim().to_lowercase().replace(['-', '_'], " ");
        all.into_iter().find(|s| s.label() == wanted).ok_or_else(|| {
            let known: Vec<&str> = all.iter().map(|s| s.code()).collect();
            format!("unknown review state `{value}`; use one of {} or any", known.join(", "))
        })
    };
    values.iter().map(|v| read(v)).collect::<Result<Vec<_>, _>>().map(Some)
}

/// Says in words which stored records a state filter lets through.
pub fn describe_states(states: &Option<Vec<ReviewState>>) -> String {
    match states {
        None => "stored records in any review state".into(),
        Some(states) => {
            let labels: Vec<&str> = states.iter().map(|s| s.label()).collect();
            format!("stored records in review state {}", labels.join(" or "))
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn review_states_read_by_code_or_label_and_any_means_all() {
        assert_eq!(parse_states(&["confirmed".into()]), Ok(Some(vec![ReviewState::Confirmed])));
        assert_eq!(
            parse_states(&["awaiting_review".into(), "details requested".into()]),
            Ok(Some(vec![ReviewState::AwaitingReview, ReviewState::DetailsRequested]))
        );
        assert_eq!(parse_states(&["any".into()]), Ok(None));
        assert!(parse_states(&["approved".into()]).unwrap_err().contains("approved"));
    }
}
