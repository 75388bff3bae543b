//! Names to checklist taxa: the one place that decides which taxon a record is of.
//!
//! A record's identification (`identifications.taxon_name`) is an observer's free-text
//! guess, a pick of the guided key or a reviewer's decision, at species or a higher rank.
//! [`TaxonIndex::resolution`] reads it in three steps, and says which one matched:
//!
//! 1. the whole text is one of a checklist entry's names — scientific, common, synonym
//!    or local — or a genus, family, order or superorder its species are placed in,
//!    compared after folding ([`names`]: case, spacing, hyphens, punctuation, accents,
//!    compatibility forms);
//! 2. the same after setting aside qualifiers ("cf.", "sp.", "spp.", "possibly", a
//!    question mark) and a scientific name's authorship ("(Linnaeus, 1758)");
//! 3. otherwise the name is **not resolved**: the checklist names found inside it, and the
//!    words not understood, are reported for the reviewer, and nothing is guessed.
//!
//! A higher taxon stands for its member species: it is as sensitive as the strictest of
//! them and protected if any is ([`NamedTaxon`]), so stopping the key at a genus never
//! publishes what the species would hide. A name several entries share (the demo's
//! "common skate") stands for the smallest group holding them all. What a name that is
//! not resolved may publish is decided in `protect`, which fails closed.

pub mod names;

use std::collections::{BTreeSet, HashMap};
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
pub const DEMO_CHECKLIST: &str = include_str!("../../../demo-records/checklist.json");

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

    /// The taxon at `rank` called `name` (as the checklist writes it), with its member species.
    fn higher(taxa: &[Taxon], rank: TaxonRank, name: &str) -> Option<Self> {
        let members: Vec<usize> = (0..taxa.len()).filter(|&i| taxa[i].name_at(rank) == name).collect();
        let first = &taxa[*members.first()?];
        Some(Self {
            scientific_name: first.name_at(rank).to_owned(),
            rank,
            sensitivity: members.iter().map(|&i| taxa[i].sensitivity).fold(Sensitivity::None, stricter),
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

/// Which of a taxon's names a text matched.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum NameKind {
    Scientific,
    Common,
    /// A scientific name the species was known by.
    Synonym,
    /// A local name, with its language tag.
    Local(String),
    /// The name of a genus, family, order or superorder.
    Higher,
    /// A name several entries share: it stands for their smallest common group.
    Shared,
}

impl NameKind {
    fn words(&self) -> String {
        match self {
            Self::Scientific => "its scientific name".into(),
            Self::Common => "a common name".into(),
            Self::Synonym => "a synonym".into(),
            Self::Local(language) => format!("a local name ({language})"),
            Self::Higher => "the name of a higher taxon".into(),
            Self::Shared => "a name several species share, so it stands for their group".into(),
        }
    }
}

/// One name in the index: the taxon it stands for and how.
#[derive(Debug, Clone)]
struct Entry {
    /// Into `TaxonIndex::named`.
    target: usize,
    /// The name as the checklist writes it.
    name: String,
    kind: NameKind,
}

/// What was set aside to make a name match.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct SetAside {
    /// Case, spacing, hyphens, punctuation or accents differed from the checklist's name.
    pub spelling: bool,
    /// Qualifiers left out ("cf", "sp"…).
    pub qualifiers: Vec<String>,
    /// A scientific name's authorship, as written.
    pub authority: Option<String>,
}

/// How a typed name was read.
#[derive(Debug, Clone, PartialEq)]
pub enum Resolution<'a> {
    /// The name is a checklist taxon.
    Resolved {
        taxon: &'a NamedTaxon,
        /// The checklist's name it matched, and which kind of name that is.
        matched: &'a str,
        kind: NameKind,
        set_aside: SetAside,
    },
    /// The name is not a checklist taxon. `found` are checklist taxa named inside it,
    /// `unread` the words that are not; the caller must not treat it as any of them.
    NotResolved { found: Vec<&'a NamedTaxon>, unread: Vec<String> },
}

impl<'a> Resolution<'a> {
    /// The taxon, when the name resolved.
    pub fn taxon(&self) -> Option<&'a NamedTaxon> {
        match self {
            Self::Resolved { taxon, .. } => Some(taxon),
            Self::NotResolved { .. } => None,
        }
    }

    /// The resolution in words, for reviewers: what the name was read as, and how.
    pub fn describe(&self) -> String {
        match self {
            Self::Resolved { taxon, matched, kind, set_aside } => {
                let mut how = vec![format!("matched {} \u{201c}{matched}\u{201d}", kind.words())];
                if set_aside.spelling {
                    how.push("ignoring case, spaces, hyphens, punctuation and accents".into());
                }
                if !set_aside.qualifiers.is_empty() {
                    how.push(format!("setting aside {}", set_aside.qualifiers.join(", ")));
                }
                if let Some(authority) = &set_aside.authority {
                    how.push(format!("setting aside the authorship \u{201c}{authority}\u{201d}"));
                }
                format!("{} ({}): {}", taxon.scientific_name, rank_word(taxon.rank), how.join("; "))
            }
            Self::NotResolved { found, unread } => {
                let mut text = "not resolved to a checklist taxon".to_owned();
                if !found.is_empty() {
                    let names: Vec<&str> = found.iter().map(|t| t.scientific_name.as_str()).collect();
                    text.push_str(&format!("; it names {}", names.join(", ")));
                }
                if !unread.is_empty() {
                    text.push_str(&format!("; not understood: {}", unread.join(" ")));
                }
                text
            }
        }
    }
}

/// A rank in words.
pub fn rank_word(rank: TaxonRank) -> &'static str {
    match rank {
        TaxonRank::Species => "species",
        TaxonRank::Genus => "genus",
        TaxonRank::Family => "family",
        TaxonRank::Order => "order",
        TaxonRank::Superorder => "superorder",
    }
}

/// The taxa a filter such as `Rajidae` or `Raja clavata` stands for.
#[derive(Debug, Clone, PartialEq)]
pub struct TaxonFilter {
    /// The name as the checklist writes it.
    pub name: String,
    /// The rank of that name.
    pub rank: TaxonRank,
}

/// A checklist with every name of its entries and of the higher taxa they are placed in,
/// indexed by key ([`names::key`]).
#[derive(Debug, Clone)]
pub struct TaxonIndex {
    checklist: Checklist,
    by_key: HashMap<String, Entry>,
    /// Each entry's name exactly as the checklist writes it, to its key: most stored
    /// names are written so, and are then found without folding.
    as_written: HashMap<String, String>,
    /// The longest key, in bytes: no run of words longer than it can match.
    longest_key: usize,
    /// Species first, in checklist order (so a species' position is its index), then
    /// higher taxa as they were first needed.
    named: Vec<NamedTaxon>,
    /// The strictest sensitivity of any species on the checklist.
    strictest: Sensitivity,
}

impl TaxonIndex {
    /// A checklist file, or the built-in demo checklist when `path` is `None`.
    pub fn load(path: Option<&Path>) -> Result<Self, ChecklistLoadError> {
        load_checklist(path).map(Self::new)
    }

    /// Indexes every name of `checklist`'s entries and every higher taxon.
    pub fn new(checklist: Checklist) -> Self {
        let taxa = checklist.taxa();
        let mut named: Vec<NamedTaxon> = (0..taxa.len()).map(|i| NamedTaxon::species(taxa, i)).collect();
        let mut higher_at: HashMap<(TaxonRank, String), usize> = HashMap::new();
        let mut higher = |rank: TaxonRank, name: &str, named: &mut Vec<NamedTaxon>| -> Option<usize> {
            if let Some(&index) = higher_at.get(&(rank, name.to_owned())) {
                return Some(index);
            }
            named.push(NamedTaxon::higher(taxa, rank, name)?);
            higher_at.insert((rank, name.to_owned()), named.len() - 1);
            Some(named.len() - 1)
        };
        // Every species-level name, by key, with the species that carry it.
        let mut species_names: HashMap<String, Vec<(usize, String, NameKind)>> = HashMap::new();
        for (index, taxon) in taxa.iter().enumerate() {
            let kinds = std::iter::once((taxon.scientific_name.clone(), NameKind::Scientific))
                .chain(taxon.common_names.iter().map(|n| (n.clone(), NameKind::Common)))
                .chain(taxon.synonyms.iter().map(|s| (s.name.clone(), NameKind::Synonym)))
                .chain(taxon.local_names.iter().map(|l| (l.name.clone(), NameKind::Local(l.language.clone()))));
            for (name, kind) in kinds {
                let key = names::key(&name);
                if !key.is_empty() {
                    species_names.entry(key).or_default().push((index, name, kind));
                }
            }
        }
        let mut by_key = HashMap::new();
        for (key, carriers) in species_names {
            let species: BTreeSet<usize> = carriers.iter().map(|(i, _, _)| *i).collect();
            let (_, name, kind) = carriers.into_iter().next().expect("a key has a carrier");
            let entry = if species.len() == 1 {
                Entry { target: *species.first().expect("one species"), name, kind }
            } else {
                // A shared name stands for the smallest group holding every species that carries it.
                let Some((rank, group)) = smallest_group(taxa, &species) else { continue };
                let Some(target) = higher(rank, &group, &mut named) else { continue };
                Entry { target, name, kind: NameKind::Shared }
            };
            by_key.insert(key, entry);
        }
        for rank in HIGHER_RANKS {
            for taxon in taxa {
                let name = taxon.name_at(rank);
                let key = names::key(name);
                if key.is_empty() || by_key.contains_key(&key) {
                    continue;
                }
                if let Some(target) = higher(rank, name, &mut named) {
                    by_key.insert(key, Entry { target, name: name.to_owned(), kind: NameKind::Higher });
                }
            }
        }
        let strictest = taxa.iter().map(|t| t.sensitivity).fold(Sensitivity::None, stricter);
        let as_written = by_key.iter().map(|(key, entry)| (entry.name.clone(), key.clone())).collect();
        let longest_key = by_key.keys().map(String::len).max().unwrap_or(0);
        Self { checklist, by_key, as_written, longest_key, named, strictest }
    }

    fn entry(&self, key: &str) -> Option<(&NamedTaxon, &Entry)> {
        self.by_key.get(key).map(|entry| (&self.named[entry.target], entry))
    }

    /// How `text` reads against the checklist (see the module's doc for the steps).
    pub fn resolution(&self, text: &str) -> Resolution<'_> {
        if let Some(found) = self.as_written.get(text).and_then(|key| self.entry(key)) {
            return resolved(found, SetAside::default());
        }
        let words = names::words(text);
        if let Some(found) = self.entry(&names::key_of(&words)) {
            let spelling = !found.1.name.to_lowercase().eq(&text.trim().to_lowercase());
            return resolved(found, SetAside { spelling, ..SetAside::default() });
        }
        let (kept, qualifiers) = names::without_qualifiers(&words);
        let mut qualifiers: Vec<String> = qualifiers.into_iter().map(|q| format!("\u{201c}{q}\u{201d}")).collect();
        if text.contains('?') {
            qualifiers.push("a question mark".into());
        }
        if let Some(found) = self.entry(&names::key_of(&kept)) {
            return resolved(found, SetAside { spelling: true, qualifiers, authority: None });
        }
        if let Some((name, authority)) = names::split_authority(text) {
            let (kept, _) = names::without_qualifiers(&names::words(name));
            if let Some(found) = self.entry(&names::key_of(&kept)) {
                let set_aside = SetAside { spelling: true, qualifiers, authority: Some(authority.to_owned()) };
                return resolved(found, set_aside);
            }
        }
        self.not_resolved(&kept)
    }

    /// The checklist taxa named inside `words` (longest first, left to right) and the
    /// words that name none.
    fn not_resolved(&self, words: &[String]) -> Resolution<'_> {
        let mut found: Vec<&NamedTaxon> = Vec::new();
        let mut unread = Vec::new();
        let mut start = 0;
        while start < words.len() {
            // Runs of words from `start` no longer than the longest key, longest first.
            let mut length = 0;
            let last = words[start..].iter().take_while(|w| {
                length += w.len();
                length <= self.longest_key
            });
            let last = start + last.count();
            let longest = (start + 1..=last)
                .rev()
                .find_map(|end| self.entry(&names::key_of(&words[start..end])).map(|(taxon, _)| (end, taxon)));
            match longest {
                Some((end, taxon)) => {
                    if !found.contains(&taxon) {
                        found.push(taxon);
                    }
                    start = end;
                }
                None => {
                    unread.push(words[start].clone());
                    start += 1;
                }
            }
        }
        Resolution::NotResolved { found, unread }
    }

    /// The taxon at any rank a name stands for, when it resolves.
    pub fn named(&self, name: &str) -> Option<&NamedTaxon> {
        self.resolution(name).taxon()
    }

    /// The checklist entry a name stands for, when it resolves to one species.
    pub fn resolve(&self, name: &str) -> Option<&Taxon> {
        let taxon = self.named(name)?;
        match taxon.members.as_slice() {
            [one] if taxon.rank == TaxonRank::Species => self.checklist.taxa().get(*one),
            _ => None,
        }
    }

    /// Reads a taxon filter: any name that resolves, at any rank.
    pub fn filter(&self, name: &str) -> Option<TaxonFilter> {
        self.named(name).map(|t| TaxonFilter { name: t.scientific_name.clone(), rank: t.rank })
    }

    /// The strictest sensitivity any species on the checklist has.
    pub fn strictest_sensitivity(&self) -> Sensitivity {
        self.strictest
    }

    /// The checklist itself.
    pub fn checklist(&self) -> &Checklist {
        &self.checklist
    }
}

/// A name that matched `entry` of `taxon`, with what was set aside.
fn resolved<'a>((taxon, entry): (&'a NamedTaxon, &'a Entry), set_aside: SetAside) -> Resolution<'a> {
    Resolution::Resolved { taxon, matched: entry.name.as_str(), kind: entry.kind.clone(), set_aside }
}

/// The most specific rank at which every species in `members` shares one taxon, and its name.
fn smallest_group(taxa: &[Taxon], members: &BTreeSet<usize>) -> Option<(TaxonRank, String)> {
    HIGHER_RANKS.into_iter().find_map(|rank| {
        let mut names = members.iter().map(|&i| taxa[i].name_at(rank));
        let first = names.next()?;
        names.all(|n| n == first).then(|| (rank, first.to_owned()))
    })
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

#[cfg(test)]
mod tests;
