//! Names to checklist taxa: the one place that decides which taxon a record is of.
//!
//! Today a record's identification is the observer's free-text guess
//! (`identifications.taxon_name`), so a name matches a checklist taxon when it equals the
//! taxon's scientific name or one of its common names, ignoring case and surrounding
//! space. A name that matches nothing is kept as written and reported as unmatched; it is
//! never guessed at. Files from elsewhere carry `scientificName`, matched the same way.

use std::collections::HashMap;
use std::path::Path;

use species_key::{Checklist, Taxon, TaxonRank};

/// Why a checklist could not be loaded.
#[derive(Debug, thiserror::Error)]
pub enum ChecklistLoadError {
    #[error("reading the checklist {path}: {source}")]
    Read { path: String, source: std::io::Error },
    #[error("the checklist {path} is not valid: {source}")]
    Invalid { path: String, source: species_key::ChecklistError },
}

/// A checklist with a case-insensitive index of every scientific and common name.
#[derive(Debug, Clone)]
pub struct TaxonIndex {
    checklist: Checklist,
    by_name: HashMap<String, usize>,
}

/// The taxa a filter such as `Rajidae` or `Raja clavata` stands for.
#[derive(Debug, Clone, PartialEq)]
pub struct TaxonFilter {
    /// The name as the checklist writes it.
    pub name: String,
    /// The rank of that name.
    pub rank: TaxonRank,
}

impl TaxonIndex {
    /// A checklist file, or the built-in demo checklist when `path` is `None`.
    pub fn load(path: Option<&Path>) -> Result<Self, ChecklistLoadError> {
        let Some(path) = path else {
            let checklist = Checklist::from_json(crate::DEMO_CHECKLIST).expect("the built-in checklist is checked by its own tests");
            return Ok(Self::new(checklist));
        };
        let shown = path.display().to_string();
        let text = std::fs::read_to_string(path).map_err(|source| ChecklistLoadError::Read { path: shown.clone(), source })?;
        let checklist = Checklist::from_json(&text).map_err(|source| ChecklistLoadError::Invalid { path: shown, source })?;
        Ok(Self::new(checklist))
    }

    /// Indexes every scientific and common name of `checklist`.
    pub fn new(checklist: Checklist) -> Self {
        let mut by_name = HashMap::new();
        for (index, taxon) in checklist.taxa().iter().enumerate() {
            by_name.entry(fold(&taxon.scientific_name)).or_insert(index);
            for common in &taxon.common_names {
                // A common name shared by two entries (e.g. "common skate (complex)") keeps
                // its first entry; the scientific names stay unambiguous.
                by_name.entry(fold(common)).or_insert(index);
            }
        }
        Self { checklist, by_name }
    }

    /// The taxon a name stands for, if the checklist lists it.
    pub fn resolve(&self, name: &str) -> Option<&Taxon> {
        self.by_name.get(&fold(name)).map(|&index| &self.checklist.taxa()[index])
    }

    /// Reads a taxon filter: a species (scientific or common name) or a higher taxon
    /// (genus, family, order or superorder) named in the checklist.
    pub fn filter(&self, name: &str) -> Option<TaxonFilter> {
        if let Some(taxon) = self.resolve(name) {
            return Some(TaxonFilter { name: taxon.scientific_name.clone(), rank: taxon.taxon_rank });
        }
        let wanted = fold(name);
        for rank in [TaxonRank::Genus, TaxonRank::Family, TaxonRank::Order, TaxonRank::Superorder] {
            if let Some(taxon) = self.checklist.taxa().iter().find(|t| fold(t.name_at(rank)) == wanted) {
                return Some(TaxonFilter { name: taxon.name_at(rank).to_owned(), rank });
            }
        }
        None
    }

    /// The checklist itself.
    pub fn checklist(&self) -> &Checklist {
        &self.checklist
    }
}

impl TaxonFilter {
    /// Whether `taxon` belongs to this filter's taxon.
    pub fn contains(&self, taxon: &Taxon) -> bool {
        taxon.name_at(self.rank) == self.name
    }
}

fn fold(name: &str) -> String {
    name.trim().to_lowercase()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn common_and_scientific_names_match_whatever_their_case() {
        let index = TaxonIndex::load(None).unwrap();
        assert_eq!(index.resolve("Thornback Ray").unwrap().scientific_name, "Raja clavata");
        assert_eq!(index.resolve("  raja CLAVATA ").unwrap().scientific_name, "Raja clavata");
        assert!(index.resolve("thornback").is_none());
    }

    #[test]
    fn a_family_filter_takes_in_its_species() {
        let index = TaxonIndex::load(None).unwrap();
        let filter = index.filter("rajidae").unwrap();
        assert_eq!((filter.name.as_str(), filter.rank), ("Rajidae", TaxonRank::Family));
        assert!(filter.contains(index.resolve("blonde ray").unwrap()));
        assert!(!filter.contains(index.resolve("tope").unwrap()));
    }
}
