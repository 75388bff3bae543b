//! Review decisions and the queue, as plain functions: which state an action leads to
//! from which state and why, why a record stands where it does in the queue, which
//! records a taxon filter takes in, and the guided key replayed for the reviewer.
//!
//! Queue order (most important first): protected species, then sensitive species
//! (locations generalised in public), then records with flags (each kind of flag
//! counts: oversize, out of range, possible duplicate, photo older than the record,
//! photo far from the record), then the oldest observation first.

use shared_types::{
    KEY_RANKS, KeyAnswer, KeyReason, KeyReplay, KeySuggestion, PhotoFlag, QueueFlag, RecordView, ReviewAction,
    ReviewState, Submission, distance_words, hours_words,
};
use species_key::{Answer, Answers, Checklist, Context, Effect, Key, Measurement, Sensitivity};

use crate::assess::taxa::{TaxonFilter, TaxonIndex};
use crate::intake::photo_checks::{FAR_LIMIT_M, TAKEN_BEFORE_LIMIT_HOURS};
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

/// Every flag a record carries for the queue: arrival flags, an undecided possible
/// duplicate, and its photos' checks (each kind once).
pub fn queue_flags(record: &RecordView, possible_duplicate: bool) -> Vec<QueueFlag> {
    let mut flags: Vec<QueueFlag> = record
        .flags
        .iter()
        .map(|flag| match flag.kind {
            shared_types::FlagKind::Oversize => QueueFlag::Oversize,
            shared_types::FlagKind::OutOfRange => QueueFlag::OutOfRange,
        })
        .collect();
    if possible_duplicate {
        flags.push(QueueFlag::PossibleDuplicate);
    }
    for flag in record.photos.iter().flat_map(|photo| &photo.check.flags) {
        flags.push(match flag {
            PhotoFlag::TakenLongBeforeRecord => QueueFlag::TakenLongBeforeRecord,
            PhotoFlag::TakenFarFromRecord => QueueFlag::TakenFarFromRecord,
        });
    }
    flags.sort();
    flags.dedup();
    flags
}

/// Each photo flag in words, with the numbers behind it.
fn photo_reasons(record: &RecordView) -> Vec<String> {
    let mut reasons = Vec::new();
    for (index, photo) in record.photos.iter().enumerate() {
        let number = index + 1;
        for flag in &photo.check.flags {
            reasons.push(match flag {
                PhotoFlag::TakenLongBeforeRecord => format!(
                    "photo older than the record: photo {number} was taken {} before it (more than {TAKEN_BEFORE_LIMIT_HOURS} h): an older photo reused?",
                    photo.check.seconds_before_record.map_or("long".into(), hours_words)
                ),
                PhotoFlag::TakenFarFromRecord => format!(
                    "photo far from the record: photo {number} was taken {} from its place (more than {:.0} km beyond both uncertainties)",
                    photo.check.metres_from_record.map_or("far".into(), distance_words),
                    FAR_LIMIT_M / 1000.0
                ),
            });
        }
    }
    reasons
}

/// A record's place in the queue: a sort key (higher first) and the reasons in words.
pub fn priority(
    record: &RecordView,
    current_taxon: Option<&str>,
    checklist: &Checklist,
    possible_duplicate: bool,
) -> (u32, Vec<String>) {
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
            reasons
                .push(format!("{} is sensitive{may_be}: its public locations are generalised", taxon.scientific_name));
        }
    }
    score += 100 * queue_flags(record, possible_duplicate).len() as u32;
    reasons.extend(record.flags.iter().map(|flag| flag.reason.clone()));
    if possible_duplicate {
        reasons.push("possibly the same animal as another report: compare them".into());
    }
    reasons.extend(photo_reasons(record));
    (score, reasons)
}

/// Orders queue items: by score, then oldest observation first.
pub fn order(items: &mut [(u32, RecordView, Vec<String>, Option<String>)]) {
    items.sort_by(|a, b| b.0.cmp(&a.0).then(a.1.submission.observed_at.cmp(&b.1.submission.observed_at)));
}

/// A taxon filter as asked for: the checklist taxon it names, if any, and the words.
pub struct WantedTaxon {
    filter: Option<TaxonFilter>,
    asked: String,
}

impl WantedTaxon {
    pub fn new(taxa: &TaxonIndex, asked: &str) -> Self {
        Self { filter: taxa.filter(asked), asked: asked.trim().to_owned() }
    }

    /// Whether a record whose current identification is `name` belongs to this taxon.
    /// Downward only: a record named to a genus is in its family and order, not in one
    /// of its species; a record named to a species is in its genus, family, order and
    /// superorder. A name the checklist does not know matches only itself.
    pub fn takes_in(&self, taxa: &TaxonIndex, name: Option<&str>) -> bool {
        let Some(name) = name else { return false };
        let Some(wanted) = &self.filter else { return name.trim().eq_ignore_ascii_case(&self.asked) };
        taxa.named(name).is_some_and(|own| wanted.contains_named(own, taxa.checklist()))
    }
}

/// How many suggestions the replayed key shows.
pub const KEY_SUGGESTIONS: usize = 5;

/// The guided key run again from the answers the record keeps, with what the record
/// says of its place and length — as the phone ran it, with no nearby-records weight.
pub fn key_replay(checklist: &Checklist, record: &Submission) -> Option<KeyReplay> {
    let choice = record.key_choice.as_ref()?;
    let mut answers = Answers::new();
    let mut shown = Vec::new();
    for (character, state) in &choice.answers {
        let question = checklist.characters().iter().find(|c| &c.name == character);
        let answer = if state == "notSure" {
            answers.set(character, Answer::NotSure);
            "not sure".to_owned()
        } else {
            answers.set(character, Answer::State(state.clone()));
            question
                .and_then(|q| q.states.iter().find(|s| &s.name == state))
                .map_or_else(|| state.clone(), |s| s.label.clone())
        };
        shown.push(KeyAnswer { question: question.map_or_else(|| character.clone(), |q| q.question.clone()), answer });
    }
    let context = Context {
        area_code: record
            .position
            .and_then(|p| checklist.area_at(p.latitude.get(), p.longitude.get()))
            .map(|a| a.code.clone()),
        nearby_confirmed: None,
        measurement: record.length.map(|l| Measurement {
            kind: l.kind.key_kind(),
            cm: l.value.centimetres(),
            estimated: l.method == shared_types::MeasureMethod::Estimated,
        }),
    };
    let (suggestions, problem) = match Key::new(checklist).rank(&answers, &context) {
        Ok(candidates) => (candidates.into_iter().take(KEY_SUGGESTIONS).map(suggestion).collect(), None),
        Err(err) => (Vec::new(), Some(format!("the answers no longer fit the checklist: {err}"))),
    };
    Some(KeyReplay { answers: shown, suggestions, problem })
}

fn suggestion(candidate: species_key::Candidate) -> KeySuggestion {
    let reasons = candidate
        .reasons
        .into_iter()
        .map(|reason| {
            let effect = match reason.effect {
                Effect::Supports => "supports",
                Effect::Against => "against",
                Effect::Neutral => "neutral",
            };
            KeyReason { effect: effect.into(), text: reason.text }
        })
        .collect();
    KeySuggestion {
        scientific_name: candidate.scientific_name,
        common_name: candidate.common_names.into_iter().next(),
        probability: candidate.probability,
        reasons,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_taxon_filter_works_downward_only() {
        let taxa = TaxonIndex::load(None).unwrap();
        let wanted = |name: &str| WantedTaxon::new(&taxa, name);
        // As demo-records/checklist.json places them: Scyliorhinus canicula in
        // Scyliorhinus, Scyliorhinidae, Carcharhiniformes.
        assert!(wanted("Scyliorhinidae").takes_in(&taxa, Some("Scyliorhinus")), "a genus is found by its family");
        assert!(wanted("Carcharhiniformes").takes_in(&taxa, Some("Scyliorhinus canicula")), "a species by its order");
        assert!(wanted("scyliorhinus").takes_in(&taxa, Some("Scyliorhinus canicula")), "a species by its genus");
        assert!(wanted("small-spotted catshark").takes_in(&taxa, Some("Scyliorhinus canicula")), "common names work");
        assert!(
            !wanted("Scyliorhinus canicula").takes_in(&taxa, Some("Scyliorhinus")),
            "a genus is not in one of its species"
        );
        assert!(!wanted("Rajidae").takes_in(&taxa, Some("Scyliorhinus")));
        assert!(wanted("a fish").takes_in(&taxa, Some("A Fish")), "unknown names match themselves");
        assert!(!wanted("Scyliorhinidae").takes_in(&taxa, None));
    }
}
