//! Stopping at a higher rank: when the answers cannot settle the species, the observer
//! can still record the genus, family, order or superorder the candidates agree on.
//! Probabilities of species are summed per higher taxon, and the most specific taxon
//! that is well enough supported is offered.

use std::collections::BTreeMap;

use serde::Serialize;

use crate::checklist::TaxonRank;
use crate::key::{Candidate, Key};

/// The summed probability of one taxon at one rank.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct TaxonSupport {
    /// The taxon's scientific name.
    pub scientific_name: String,
    /// Darwin Core `taxonRank`.
    pub taxon_rank: TaxonRank,
    /// Sum of its species' probabilities.
    pub probability: f64,
}

impl Key {
    /// Summed probability of every taxon at `rank`, most probable first (ties by name).
    /// Candidates not in this key's checklist are left out.
    pub fn support_at(&self, rank: TaxonRank, candidates: &[Candidate]) -> Vec<TaxonSupport> {
        let mut sums: BTreeMap<&str, f64> = BTreeMap::new();
        for candidate in candidates {
            if let Some(taxon) = self.checklist().taxon(&candidate.scientific_name) {
                *sums.entry(taxon.name_at(rank)).or_insert(0.0) += candidate.probability;
            }
        }
        let mut support: Vec<TaxonSupport> = sums
            .into_iter()
            .map(|(name, probability)| TaxonSupport { scientific_name: name.to_owned(), taxon_rank: rank, probability })
            .collect();
        support.sort_by(|a, b| b.probability.total_cmp(&a.probability));
        support
    }

    /// The most specific taxon (species, then genus, family, order, superorder) whose
    /// summed probability reaches `min_probability`, or `None` if none does.
    pub fn best_supported_taxon(&self, candidates: &[Candidate], min_probability: f64) -> Option<TaxonSupport> {
        TaxonRank::FROM_SPECIFIC.into_iter().find_map(|rank| {
            self.support_at(rank, candidates).into_iter().next().filter(|best| best.probability >= min_probability)
        })
    }
}
