//! The review queue's order and filters: why a record stands where it does (protected,
//! then sensitive species, then each kind of flag, then age) and which records a taxon
//! filter takes in (downward only).

use shared_types::{PhotoFlag, PriorityReason, PrioritySaid, QueueFlag, QueueItem, RecordView};
use species_key::{Checklist, Sensitivity};

use crate::intake::photo_checks::{FAR_LIMIT_M, TAKEN_BEFORE_LIMIT_HOURS};
use crate::taxa::{TaxonFilter, TaxonIndex};

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
        match flag {
            PhotoFlag::TakenLongBeforeRecord => flags.push(QueueFlag::TakenLongBeforeRecord),
            PhotoFlag::TakenFarFromRecord => flags.push(QueueFlag::TakenFarFromRecord),
            // Said in the reasons; not a filter of its own.
            PhotoFlag::CutShort => {}
        }
    }
    flags.sort();
    flags.dedup();
    flags
}

/// Each photo flag in words, with the numbers behind it.
fn photo_reasons(record: &RecordView) -> Vec<PriorityReason> {
    let mut reasons = Vec::new();
    for (index, photo) in record.photos.iter().enumerate() {
        let photo_number = index + 1;
        for flag in &photo.check.flags {
            let said = match flag {
                PhotoFlag::TakenLongBeforeRecord => PrioritySaid::PhotoOlder {
                    photo: photo_number,
                    seconds: photo.check.seconds_before_record,
                    limit_hours: TAKEN_BEFORE_LIMIT_HOURS,
                },
                PhotoFlag::TakenFarFromRecord => PrioritySaid::PhotoFar {
                    photo: photo_number,
                    metres: photo.check.metres_from_record,
                    limit_km: FAR_LIMIT_M / 1000.0,
                },
                PhotoFlag::CutShort => PrioritySaid::PhotoCutShort { photo: photo_number },
            };
            reasons.push(PriorityReason::from_said(said));
        }
    }
    reasons
}

/// A live animal no response has been logged for outranks everything else.
pub const URGENT_WEIGHT: u32 = 100_000;
/// A protected species (or a higher taxon holding one).
pub const PROTECTED_WEIGHT: u32 = 1000;
/// A sensitive species (or a higher taxon holding one).
pub const SENSITIVE_WEIGHT: u32 = 500;
/// Each kind of flag the record carries.
pub const FLAG_WEIGHT: u32 = 100;

/// A record's place in the queue: a sort key (higher first) and the reasons in words.
/// `awaiting_response`: the animal is alive and no responder has logged what was done.
pub fn priority(
    record: &RecordView,
    current_taxon: Option<&str>,
    taxa: &TaxonIndex,
    possible_duplicate: bool,
    awaiting_response: bool,
) -> (u32, Vec<PriorityReason>) {
    let mut score = 0;
    let mut reasons = Vec::new();
    if awaiting_response {
        score += URGENT_WEIGHT;
        reasons.push(PriorityReason::from_said(PrioritySaid::LiveAnimalNoResponse));
    }
    // At any rank: a genus or family counts as protected or sensitive if any of its species is.
    if let Some(taxon) = current_taxon.and_then(|name| taxa.named(name)) {
        let holds_species = taxon.rank != species_key::TaxonRank::Species;
        let name = || taxon.scientific_name.clone();
        if taxon.protected {
            score += PROTECTED_WEIGHT;
            reasons.push(PriorityReason::from_said(PrioritySaid::Protected { taxon: name(), holds_species }));
        }
        if taxon.sensitivity != Sensitivity::None {
            score += SENSITIVE_WEIGHT;
            reasons.push(PriorityReason::from_said(PrioritySaid::Sensitive { taxon: name(), holds_species }));
        }
    }
    score += FLAG_WEIGHT * queue_flags(record, possible_duplicate).len() as u32;
    reasons.extend(record.flags.iter().map(|flag| PriorityReason::arrival(flag.kind, flag.reason.clone())));
    if possible_duplicate {
        reasons.push(PriorityReason::from_said(PrioritySaid::PossibleDuplicate));
    }
    reasons.extend(photo_reasons(record));
    (score, reasons)
}

/// Orders queue items: by score, then oldest observation first.
pub fn order(items: &mut [(u32, RecordView, Vec<PriorityReason>, Option<String>)]) {
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

/// What a reviewer asked of the queue, already read: each filter optional.
#[derive(Debug, Clone, Default)]
pub struct Wanted {
    /// A species or higher taxon, scientific or common name: records identified to it
    /// or to anything below it.
    pub taxon: Option<String>,
    pub flag: Option<QueueFlag>,
    /// Observed on or after / on or before, `YYYY-MM-DD` (the record's own date).
    pub from: Option<String>,
    pub to: Option<String>,
    /// A checklist area code.
    pub area: Option<String>,
    /// Paging over the ordered queue: skip `offset` items, give at most `limit`.
    pub offset: usize,
    pub limit: usize,
}

/// The page of the queue `wanted` asks for, most important first, from every record in
/// the asked states: (whether a possible duplicate is undecided, the record, its taxon);
/// `responded` holds the records whose animal has a logged response.
pub fn select(
    rows: Vec<(bool, RecordView, Option<String>)>,
    responded: &std::collections::HashSet<i64>,
    wanted: &Wanted,
    taxa: &TaxonIndex,
) -> Vec<QueueItem> {
    let checklist = taxa.checklist();
    let taxon = wanted.taxon.as_deref().filter(|t| !t.trim().is_empty()).map(|t| WantedTaxon::new(taxa, t));
    let mut items: Vec<_> = rows
        .into_iter()
        .filter(|(possible, record, current)| {
            let day = record.submission.observed_at.format("%Y-%m-%d").to_string();
            taxon.as_ref().is_none_or(|w| w.takes_in(taxa, current.as_deref()))
                && in_area(record, wanted.area.as_deref(), checklist)
                && wanted.flag.is_none_or(|f| queue_flags(record, *possible).contains(&f))
                && wanted.from.as_deref().is_none_or(|from| day.as_str() >= from)
                && wanted.to.as_deref().is_none_or(|to| day.as_str() <= to)
        })
        .map(|(possible, record, current)| {
            let awaiting = record.submission.is_urgent() && !responded.contains(&record.observation_id);
            let (score, reasons) = priority(&record, current.as_deref(), taxa, possible, awaiting);
            (score, record, reasons, current)
        })
        .collect();
    order(&mut items);
    items
        .into_iter()
        .skip(wanted.offset)
        .take(wanted.limit)
        .map(|(_, record, priority_reasons, current_taxon)| QueueItem { record, current_taxon, priority_reasons })
        .collect()
}

fn in_area(record: &RecordView, area: Option<&str>, checklist: &Checklist) -> bool {
    area.filter(|a| !a.is_empty()).is_none_or(|code| {
        record
            .submission
            .position
            .is_some_and(|p| checklist.area_at(p.latitude.get(), p.longitude.get()).is_some_and(|a| a.code == code))
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::taxa::TaxonIndex;

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
