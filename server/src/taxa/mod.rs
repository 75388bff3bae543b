//! Names to checklist taxa: the one place that decides which taxon a record is of.
//!
//! A record's identification (`identifications.taxon_name`) is an observer's free-text
//! guess, a pick of the guided key or a reviewer's decision, at species or a higher rank.
//! A name matches a checklist species when it equals its scientific name or one of its
//! common names, ignoring case and surrounding space, and a higher taxon when it equals a
//! genus, family, order or superorder the checklist's species are placed in. A higher
//! taxon stands for its member species: it is as sensitive as the strictest of them and
//! protected if any is ([`NamedTaxon`]), so stopping the key at a genus never publishes
//! what the species would hide. A name that matches nothing is kept as written and
//! reported as unmatched; it is never guessed at. Files from elsewhere carry
//! `scientificName`, matched the same way.

use std::collections::HashMap;
use std::path::Path;

use species_key::{Checklist, Sensitivity, Taxon, TaxonRank};

/// Why a checklist could not be loaded.
#[derive(Debug, thiserror::Error)]
pub enum ChecklistLoadError {
    #[error("reading the checklist {path}: {source}")]
    Read { path: String, source: std::io::Error },
    #[error("the checklist {path} is not valid: {source}")]
    Invalid { path: String, source: species_key::ChecklistError },
}

/// The demo checklist, built in; `--checklist FILE` replaces it.
pub const DEMO_CHECKLIST: &str = include_str!("../../demo-records/checklist.json");

/// Reads and checks a checklist file, or the built-in demo checklist when `path` is `None`.
pub fn load_checklist(path: Option<&Path>) -> Result<Checklist, ChecklistLoadError> {
    let Some(path) = path else {
        return Checklist::from_json(DEMO_CHECKLIST)
            .map_err(|source| ChecklistLoadError::Invalid { path: "the built-in demo checklist".into(), source });
    };
    let shown = path.display().to_string();
    let text =
        std::fs::read_to_string(path).map_err(|source| ChecklistLoadError::Read { path: shown.clone(), source })?;
    Checklist::from_json(&text).map_err(|source| ChecklistLoadError::Invalid { path: shown, source })
}

/// A checklist with a case-insensitive index of every scientific and common name, and of
/// every higher taxon its species are placed in.
#[derive(Debug, Clone)]
pub struct TaxonIndex {
    checklist: Checklist,
    /// Species entries by every name.
    by_name: HashMap<String, usize>,
    /// Every species and higher taxon by every name, into `named`.
    by_any_name: HashMap<String, usize>,
    named: Vec<NamedTaxon>,
}

/// A checklist taxon at any rank, with what its member species share.
#[derive(Debug, Clone, PartialEq)]
pub struct NamedTaxon {
    /// The name as the checklist writes it.
    pub scientific_name: String,
    pub rank: TaxonRank,
    /// The strictest generalisation any member species asks for.
    pub sensitivity: Sensitivity,
    /// Whether any member species is protected.
    pub protected: bool,
    /// Positions in `Checklist::taxa` of the species under it (itself, for a species).
    members: Vec<usize>,
}

impl NamedTaxon {
    /// The taxon `name` stands for in `checklist`: a species by a scientific or common
    /// name, else a genus, family, order or superorder of its species. Works on the bare
    /// checklist (the review queue uses it); [`TaxonIndex::named`] is the indexed form.
    pub fn find(checklist: &Checklist, name: &str) -> Option<Self> {
        let wanted = fold(name);
        let taxa = checklist.taxa();
        if let Some(index) = taxa
            .iter()
            .position(|t| fold(&t.scientific_name) == wanted)
            .or_else(|| taxa.iter().position(|t| t.common_names.iter().any(|c| fold(c) == wanted)))
        {
            return Some(Self::species(taxa, index));
        }
        HIGHER_RANKS.into_iter().find_map(|rank| Self::higher(taxa, rank, &wanted))
    }

    fn species(taxa: &[Taxon], index: usize) -> Self {
        let taxon = &taxa[index];
        Self {
            scientific_name: taxon.scientific_name.clone(),
            rank: taxon.taxon_rank,
            sensitivity: taxon.sensitivity,
            protected: taxon.protected,
            members: vec![index],
        }
    }

    /// The taxon at `rank` whose folded name is `wanted`, with its member species.
    fn higher(taxa: &[Taxon], rank: TaxonRank, wanted: &str) -> Option<Self> {
        let members: Vec<usize> = (0..taxa.len()).filter(|&i| fold(taxa[i].name_at(rank)) == wanted).collect();
        let first = &taxa[*members.first()?];
        Some(Self {
            scientific_name: first.name_at(rank).to_owned(),
            rank,
            sensitivity: members
                .iter()
                .map(|&i| taxa[i].sensitivity)
                .max_by_key(|s| strictness(*s))
                .unwrap_or(Sensitivity::None),
            protected: members.iter().any(|&i| taxa[i].protected),
            members,
        })
    }

    /// The checklist species under this taxon (the taxon itself, for a species).
    pub fn members<'a>(&'a self, checklist: &'a Checklist) -> impl Iterator<Item = &'a Taxon> + 'a {
        self.members.iter().filter_map(|&i| checklist.taxa().get(i))
    }
}

/// Ranks above species, most specific first.
const HIGHER_RANKS: [TaxonRank; 4] = [TaxonRank::Genus, TaxonRank::Family, TaxonRank::Order, TaxonRank::Superorder];

/// How much a sensitivity hides: a withheld location most, then coarser grids.
fn strictness(sensitivity: Sensitivity) -> u8 {
    match sensitivity {
        Sensitivity::None => 0,
        Sensitivity::ThousandthDegree => 1,
        Sensitivity::HundredthDegree => 2,
        Sensitivity::TenthDegree => 3,
        Sensitivity::Withhold => 4,
    }
}

/// The stricter of two sensitivities.
pub fn stricter(a: Sensitivity, b: Sensitivity) -> Sensitivity {
    if strictness(b) > strictness(a) { b } else { a }
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
        load_checklist(path).map(Self::new)
    }

    /// Indexes every scientific and common name of `checklist`, and every higher taxon.
    pub fn new(checklist: Checklist) -> Self {
        let mut by_name = HashMap::new();
        let mut by_any_name = HashMap::new();
        let mut named = Vec::new();
        let taxa = checklist.taxa();
        for (index, taxon) in taxa.iter().enumerate() {
            named.push(NamedTaxon::species(taxa, index));
            by_name.entry(fold(&taxon.scientific_name)).or_insert(index);
            by_any_name.entry(fold(&taxon.scientific_name)).or_insert(named.len() - 1);
            for common in &taxon.common_names {
                // A common name shared by two entries (e.g. "common skate (complex)") keeps
                // its first entry; the scientific names stay unambiguous.
                by_name.entry(fold(common)).or_insert(index);
                by_any_name.entry(fold(common)).or_insert(named.len() - 1);
            }
        }
        for rank in HIGHER_RANKS {
            for taxon in taxa {
                let key = fold(taxon.name_at(rank));
                if !by_any_name.contains_key(&key)
                    && let Some(higher) = NamedTaxon::higher(taxa, rank, &key)
                {
                    named.push(higher);
                    by_any_name.insert(key, named.len() - 1);
                }
            }
        }
        Self { checklist, by_name, by_any_name, named }
    }

    /// The species a name stands for, if the checklist lists it.
    pub fn resolve(&self, name: &str) -> Option<&Taxon> {
        self.by_name.get(&fold(name)).map(|&index| &self.checklist.taxa()[index])
    }

    /// The taxon at any rank a name stands for: a species (scientific or common name) or a
    /// genus, family, order or superorder of the checklist's species.
    pub fn named(&self, name: &str) -> Option<&NamedTaxon> {
        self.by_any_name.get(&fold(name)).map(|&index| &self.named[index])
    }

    /// Reads a taxon filter: a species (scientific or common name) or a higher taxon
    /// (genus, family, order or superorder) named in the checklist.
    pub fn filter(&self, name: &str) -> Option<TaxonFilter> {
        self.named(name).map(|t| TaxonFilter { name: t.scientific_name.clone(), rank: t.rank })
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

    /// Whether a record identified as `named` (at any rank) lies inside this filter's
    /// taxon: a genus inside its family, but not a family inside one of its genera.
    pub fn contains_named(&self, named: &NamedTaxon, checklist: &Checklist) -> bool {
        named.rank <= self.rank && named.members(checklist).all(|t| self.contains(t))
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
    fn a_higher_taxon_is_as_sensitive_as_its_strictest_species() {
        let index = TaxonIndex::load(None).unwrap();
        // Demo checklist: both Dipturus species are tenthDegree and protected; Rajidae
        // mixes them with Raja species that are neither; Scyliorhinus has neither.
        let dipturus = index.named("dipturus").unwrap();
        assert_eq!((dipturus.scientific_name.as_str(), dipturus.rank), ("Dipturus", TaxonRank::Genus));
        assert_eq!((dipturus.sensitivity, dipturus.protected), (Sensitivity::TenthDegree, true));
        let rajidae = index.named("Rajidae").unwrap();
        assert_eq!(
            (rajidae.rank, rajidae.sensitivity, rajidae.protected),
            (TaxonRank::Family, Sensitivity::TenthDegree, true)
        );
        assert!(rajidae.members(index.checklist()).all(|t| t.superorder == "Batoidea"));
        let catsharks = index.named("Scyliorhinus").unwrap();
        assert_eq!((catsharks.sensitivity, catsharks.protected), (Sensitivity::None, false));
        assert_eq!(index.named("tope").unwrap().rank, TaxonRank::Species);
        assert_eq!(NamedTaxon::find(index.checklist(), "rajidae").as_ref(), Some(rajidae), "the bare checklist agrees");
        assert!(index.named("Felidae").is_none());
    }

    #[test]
    fn a_filter_takes_in_identifications_at_or_below_its_rank() {
        let index = TaxonIndex::load(None).unwrap();
        let rajidae = index.filter("Rajidae").unwrap();
        assert!(rajidae.contains_named(index.named("Dipturus").unwrap(), index.checklist()));
        assert!(rajidae.contains_named(index.named("Rajidae").unwrap(), index.checklist()));
        let thornback = index.filter("Raja clavata").unwrap();
        assert!(
            !thornback.contains_named(index.named("Raja").unwrap(), index.checklist()),
            "a genus may be another species"
        );
        assert!(!rajidae.contains_named(index.named("Rajiformes").unwrap(), index.checklist()));
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
