//! The checklist format: the species a key can suggest, the characters an observer
//! can see, and each species' states, size, range and handling rules. A checklist is
//! read once from JSON and checked in full, so the rest of the crate can trust it.
//! The format is described field by field in the crate's README.

use std::collections::{BTreeMap, BTreeSet};

use serde::{Deserialize, Serialize};

use crate::error::ChecklistError;
use crate::length::LengthKind;
use crate::translations::{self, Translation};

/// A checked checklist. The only way to get one is [`Checklist::from_json`], so every
/// character, state and area a taxon names is known to exist.
#[derive(Debug, Clone, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct Checklist {
    metadata: Metadata,
    areas: Vec<Area>,
    characters: Vec<Character>,
    taxa: Vec<Taxon>,
    /// Common names of genera, families, orders and superorders, by scientific name, the
    /// preferred first ("Scyliorhinidae": ["catsharks"]), so an observer stopping at a
    /// group reads a name they know beside the scientific one. Optional.
    #[serde(default, skip_serializing_if = "BTreeMap::is_empty")]
    group_names: BTreeMap<String, Vec<String>>,
    /// The questions and answers in other languages, by BCP 47 tag. Optional.
    #[serde(default, skip_serializing_if = "BTreeMap::is_empty")]
    translations: BTreeMap<String, Translation>,
}

/// What the checklist is, where it applies, and how far its contents can be trusted.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct Metadata {
    /// A title for people.
    pub title: String,
    /// The region the checklist covers.
    pub region: String,
    /// A plain statement of where the data came from and what is invented or illustrative.
    pub notice: String,
    /// The language the checklist's own questions and answers are written in (a BCP 47
    /// tag), when it says; other languages' words are in `translations`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub language: Option<String>,
}

/// A regional area code that taxa's presence lists and records refer to.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct Area {
    /// The code used in presence lists and in a record's context.
    pub code: String,
    /// A name for people.
    pub name: String,
    /// Optional box that places a record in this area from its position:
    /// `[west, south, east, north]` in decimal degrees (WGS84). Where boxes overlap, the
    /// first listed area wins, so list the smaller areas first.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bounds: Option<[f64; 4]>,
}

impl Area {
    /// Whether the point lies inside this area's box (edges included).
    pub fn contains(&self, latitude: f64, longitude: f64) -> bool {
        self.bounds.is_some_and(|[west, south, east, north]| {
            (south..=north).contains(&latitude) && (west..=east).contains(&longitude)
        })
    }
}

/// Something an observer can see and answer about: a question with a fixed list of states.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct Character {
    /// The name taxa and answers use.
    pub name: String,
    /// The question shown to the observer.
    pub question: String,
    /// The possible answers, besides "not sure".
    pub states: Vec<CharacterState>,
}

/// One possible answer to a character's question.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct CharacterState {
    /// The name taxa and answers use.
    pub name: String,
    /// Plain words shown to the observer and used in reasons, e.g. "6 gill slits".
    pub label: String,
}

/// Darwin Core `taxonRank` values used by the key, from most to least specific.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(rename_all = "camelCase")]
pub enum TaxonRank {
    /// A species (or a species complex kept as one entry).
    Species,
    /// A genus.
    Genus,
    /// A family.
    Family,
    /// An order.
    Order,
    /// A superorder.
    Superorder,
}

impl TaxonRank {
    /// Ranks from most to least specific, the order in which an observer can stop.
    pub const FROM_SPECIFIC: [TaxonRank; 5] =
        [TaxonRank::Species, TaxonRank::Genus, TaxonRank::Family, TaxonRank::Order, TaxonRank::Superorder];
}

/// How far a public location must be generalised for this species, following the
/// categories of Chapman 2020, *Current Best Practices for Generalizing Sensitive
/// Species Occurrence Data* (GBIF Secretariat).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase")]
pub enum Sensitivity {
    /// Publish the location as recorded.
    None,
    /// Round public coordinates to 0.1 degree (about 10 km).
    TenthDegree,
    /// Round public coordinates to 0.01 degree (about 1 km).
    HundredthDegree,
    /// Round public coordinates to 0.001 degree (about 100 m).
    ThousandthDegree,
    /// Do not publish the location at all.
    Withhold,
}

impl Sensitivity {
    /// The grid, in degrees, to round public coordinates to; `None` both for "publish
    /// as recorded" and "withhold" (see [`Sensitivity::withholds_location`]).
    pub fn grid_degrees(self) -> Option<f64> {
        match self {
            Sensitivity::TenthDegree => Some(0.1),
            Sensitivity::HundredthDegree => Some(0.01),
            Sensitivity::ThousandthDegree => Some(0.001),
            Sensitivity::None | Sensitivity::Withhold => None,
        }
    }

    /// Whether the public location is left out entirely.
    pub fn withholds_location(self) -> bool {
        self == Sensitivity::Withhold
    }
}

/// The largest known size of a species, with what was measured and who says so.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct MaxLength {
    /// The size in centimetres.
    pub cm: f64,
    /// `totalLength` for sharks, skates and chimaeras; `discWidth` for rays measured across the disc.
    pub measure: LengthKind,
    /// Where the figure comes from.
    pub source: String,
}

/// Generation length, which sets the window for trend figures.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct GenerationLength {
    /// Years.
    pub years: f64,
    /// Where the figure comes from.
    pub source: String,
}

/// A straight-line relation between another length and total length for one species,
/// written as `measure = slope × TL + intercept` (both in centimetres), with its source.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct LengthConversion {
    /// The length the equation gives: `forkLength`, `precaudalLength` or `discWidth`.
    pub measure: LengthKind,
    /// Slope on total length.
    pub slope: f64,
    /// Intercept in centimetres.
    pub intercept_cm: f64,
    /// The paper the equation comes from and how it was obtained, or "common practice".
    pub source: String,
}

/// One species (or species complex) of the checklist.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct Taxon {
    /// Darwin Core `scientificName`, without authorship.
    pub scientific_name: String,
    /// Vernacular names, the preferred one first.
    pub common_names: Vec<String>,
    /// Darwin Core `taxonRank` of this entry.
    pub taxon_rank: TaxonRank,
    /// Genus.
    pub genus: String,
    /// Family.
    pub family: String,
    /// Order.
    pub order: String,
    /// Superorder.
    pub superorder: String,
    /// For each character, the states this species can show. A character left out
    /// means "unknown": every state is allowed and the answer says nothing.
    pub characters: BTreeMap<String, Vec<String>>,
    /// The field guide or paper the characters come from, or "from memory".
    pub character_source: String,
    /// Largest known size.
    pub max_length: MaxLength,
    /// Area codes where the species is known to occur.
    pub presence: Vec<String>,
    /// How far public locations are generalised.
    pub sensitivity: Sensitivity,
    /// Generation length with its source.
    pub generation_length: GenerationLength,
    /// Whether the species is protected or may not be retained where the checklist applies.
    pub protected: bool,
    /// Length–length equations for this species, if any.
    #[serde(default)]
    pub length_conversions: Vec<LengthConversion>,
    /// Scientific names this species has been known by, each with its source.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub synonyms: Vec<Synonym>,
    /// Names people use for it locally or in other languages, each with its source.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub local_names: Vec<LocalName>,
}

/// A scientific name a species has been known by (an older combination, a name sunk
/// into this one), so that records written with it find the species.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct Synonym {
    /// The name, without authorship.
    pub name: String,
    /// Where the synonymy comes from, or "from memory".
    pub source: String,
}

/// A name people use for a species in one place or language.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
pub struct LocalName {
    /// The name as people write it.
    pub name: String,
    /// The language, as a BCP 47 tag (`cy`, `fr`, `en`…).
    pub language: String,
    /// Where the name comes from, "from memory", or "invented for the demo".
    pub source: String,
}

impl Taxon {
    /// The name of the higher taxon at `rank` this species belongs to.
    pub fn name_at(&self, rank: TaxonRank) -> &str {
        match rank {
            TaxonRank::Species => &self.scientific_name,
            TaxonRank::Genus => &self.genus,
            TaxonRank::Family => &self.family,
            TaxonRank::Order => &self.order,
            TaxonRank::Superorder => &self.superorder,
        }
    }

    /// Every name this species may be written as: scientific, common, synonyms, local.
    pub fn all_names(&self) -> impl Iterator<Item = &str> + '_ {
        std::iter::once(self.scientific_name.as_str())
            .chain(self.common_names.iter().map(String::as_str))
            .chain(self.synonyms.iter().map(|s| s.name.as_str()))
            .chain(self.local_names.iter().map(|l| l.name.as_str()))
    }

    /// The equation converting `measure` to total length, if the checklist gives one.
    pub fn conversion_for(&self, measure: LengthKind) -> Option<&LengthConversion> {
        self.length_conversions.iter().find(|c| c.measure == measure)
    }
}

/// The file as written, before taxa are read one by one (so errors can name the taxon).
#[derive(Deserialize)]
#[serde(rename_all = "camelCase", deny_unknown_fields)]
struct ChecklistFile {
    metadata: Metadata,
    areas: Vec<Area>,
    characters: Vec<Character>,
    taxa: Vec<serde_json::Value>,
    #[serde(default)]
    group_names: BTreeMap<String, Vec<String>>,
    #[serde(default)]
    translations: BTreeMap<String, Translation>,
}

impl Checklist {
    /// Reads and checks a checklist.
    ///
    /// # Errors
    /// A [`ChecklistError`] naming the taxon (or character) and field at fault when the
    /// text is not JSON, does not fit the format, or refers to something it does not define.
    pub fn from_json(json: &str) -> Result<Checklist, ChecklistError> {
        let file: ChecklistFile = serde_json::from_str(json).map_err(ChecklistError::Format)?;
        let taxa = file
            .taxa
            .into_iter()
            .enumerate()
            .map(|(index, value)| read_taxon(index + 1, value))
            .collect::<Result<Vec<_>, _>>()?;
        let checklist = Checklist {
            metadata: file.metadata,
            areas: file.areas,
            characters: file.characters,
            taxa,
            group_names: file.group_names,
            translations: file.translations,
        };
        checklist.check()?;
        Ok(checklist)
    }

    /// What the checklist is and how far it can be trusted.
    pub fn metadata(&self) -> &Metadata {
        &self.metadata
    }

    /// The area codes taxa and records refer to.
    pub fn areas(&self) -> &[Area] {
        &self.areas
    }

    /// The first area whose box holds the point, if any.
    pub fn area_at(&self, latitude: f64, longitude: f64) -> Option<&Area> {
        self.areas.iter().find(|area| area.contains(latitude, longitude))
    }

    /// The characters, in the order the file gives them.
    pub fn characters(&self) -> &[Character] {
        &self.characters
    }

    /// The taxa, in the order the file gives them.
    pub fn taxa(&self) -> &[Taxon] {
        &self.taxa
    }

    /// The preferred common name of a genus, family, order or superorder, if the
    /// checklist gives one.
    pub fn group_common_name(&self, scientific_name: &str) -> Option<&str> {
        self.group_names.get(scientific_name).and_then(|names| names.first()).map(String::as_str)
    }

    /// The checklist asking in `language` (a BCP 47 tag, matched by its primary subtag):
    /// each question and answer label in that language where the checklist has it, else
    /// in the checklist's own words. Species' names stay as they are.
    pub fn in_language(&self, language: &str) -> Checklist {
        let Some(translation) = self.translation(language) else { return self.clone() };
        Checklist { characters: translations::translate(&self.characters, translation), ..self.clone() }
    }

    /// The questions and answers with no words in `language`, as `character.question` and
    /// `character.state` paths: none in the checklist's own language, every one in a
    /// language it has no words for.
    pub fn words_missing_in(&self, language: &str) -> Vec<String> {
        let own = self.metadata.language.as_deref().is_some_and(|own| primary(own) == primary(language));
        if own {
            return Vec::new();
        }
        translations::missing(&self.characters, self.translation(language))
    }

    fn translation(&self, language: &str) -> Option<&Translation> {
        self.translations.get(language).or_else(|| {
            self.translations.iter().find(|(tag, _)| primary(tag) == primary(language)).map(|(_, words)| words)
        })
    }

    /// The taxon with this scientific name, if listed.
    pub fn taxon(&self, scientific_name: &str) -> Option<&Taxon> {
        self.taxa.iter().find(|t| t.scientific_name == scientific_name)
    }

    fn check(&self) -> Result<(), ChecklistError> {
        if self.taxa.is_empty() {
            return Err(ChecklistError::NoTaxa);
        }
        check_characters(&self.characters)?;
        if let Some(language) = self.metadata.language.as_ref().filter(|l| !translations::is_language_tag(l)) {
            return Err(ChecklistError::BadLanguageTag(language.clone()));
        }
        translations::check(&self.translations, &self.characters)?;
        let groups: BTreeSet<&str> = self
            .taxa
            .iter()
            .flat_map(|t| [t.genus.as_str(), t.family.as_str(), t.order.as_str(), t.superorder.as_str()])
            .collect();
        if let Some(unknown) = self.group_names.keys().find(|name| !groups.contains(name.as_str())) {
            return Err(ChecklistError::UnknownGroup(unknown.clone()));
        }
        let area_codes = unique_area_codes(&self.areas)?;
        let names_in_use: BTreeSet<&str> = self.taxa.iter().map(|t| t.scientific_name.as_str()).collect();
        let mut names = BTreeSet::new();
        for taxon in &self.taxa {
            if !names.insert(taxon.scientific_name.as_str()) {
                return Err(ChecklistError::DuplicateTaxon(taxon.scientific_name.clone()));
            }
            check_taxon_characters(taxon, &self.characters)?;
            check_taxon_numbers(taxon)?;
            check_taxon_sources(taxon)?;
            check_presence(taxon, &area_codes)?;
            check_names(taxon, &names_in_use)?;
        }
        Ok(())
    }
}

/// A language tag's primary subtag, in lower case (`cy` of `cy-GB`).
fn primary(tag: &str) -> String {
    tag.split(['-', '_']).next().unwrap_or_default().to_ascii_lowercase()
}

fn read_taxon(position: usize, value: serde_json::Value) -> Result<Taxon, ChecklistError> {
    let scientific_name =
        value.get("scientificName").and_then(|name| name.as_str()).unwrap_or("no scientificName").to_owned();
    serde_json::from_value(value).map_err(|source| ChecklistError::TaxonFormat { position, scientific_name, source })
}

fn check_characters(characters: &[Character]) -> Result<(), ChecklistError> {
    let mut names = BTreeSet::new();
    for character in characters {
        if !names.insert(character.name.as_str()) {
            return Err(ChecklistError::DuplicateCharacter(character.name.clone()));
        }
        if character.states.len() < 2 {
            return Err(ChecklistError::TooFewStates(character.name.clone()));
        }
        if character.states.len() > 64 {
            return Err(ChecklistError::TooManyStates(character.name.clone()));
        }
        let mut states = BTreeSet::new();
        for state in &character.states {
            if !states.insert(state.name.as_str()) {
                return Err(ChecklistError::DuplicateState {
                    character: character.name.clone(),
                    state: state.name.clone(),
                });
            }
        }
    }
    Ok(())
}

fn unique_area_codes(areas: &[Area]) -> Result<BTreeSet<&str>, ChecklistError> {
    let mut codes = BTreeSet::new();
    for area in areas {
        if !codes.insert(area.code.as_str()) {
            return Err(ChecklistError::DuplicateArea(area.code.clone()));
        }
        if let Some([west, south, east, north]) = area.bounds {
            let on_globe = (-180.0..=180.0).contains(&west)
                && (-180.0..=180.0).contains(&east)
                && (-90.0..=90.0).contains(&south)
                && (-90.0..=90.0).contains(&north);
            if !(on_globe && west < east && south < north) {
                return Err(ChecklistError::BadAreaBounds(area.code.clone()));
            }
        }
    }
    Ok(codes)
}

fn check_taxon_characters(taxon: &Taxon, characters: &[Character]) -> Result<(), ChecklistError> {
    for (name, states) in &taxon.characters {
        let character = characters.iter().find(|c| &c.name == name).ok_or_else(|| {
            ChecklistError::UnknownCharacter { species: taxon.scientific_name.clone(), character: name.clone() }
        })?;
        if states.is_empty() {
            return Err(ChecklistError::NoStates { species: taxon.scientific_name.clone(), character: name.clone() });
        }
        if let Some(state) = states.iter().find(|s| !character.states.iter().any(|k| &k.name == *s)) {
            return Err(ChecklistError::UnknownState {
                species: taxon.scientific_name.clone(),
                character: name.clone(),
                state: state.clone(),
            });
        }
    }
    Ok(())
}

fn check_taxon_numbers(taxon: &Taxon) -> Result<(), ChecklistError> {
    let species = &taxon.scientific_name;
    require_positive(species, "maxLength.cm", taxon.max_length.cm)?;
    require_positive(species, "generationLength.years", taxon.generation_length.years)?;
    if !matches!(taxon.max_length.measure, LengthKind::TotalLength | LengthKind::DiscWidth) {
        return Err(ChecklistError::MaxLengthMeasure {
            species: species.clone(),
            measure: taxon.max_length.measure.code().to_owned(),
        });
    }
    for conversion in &taxon.length_conversions {
        if !matches!(conversion.measure, LengthKind::ForkLength | LengthKind::PrecaudalLength | LengthKind::DiscWidth) {
            return Err(ChecklistError::ConversionMeasure {
                species: species.clone(),
                measure: conversion.measure.code().to_owned(),
            });
        }
        require_positive(species, "lengthConversions.slope", conversion.slope)?;
    }
    Ok(())
}

fn require_positive(species: &str, field: &'static str, value: f64) -> Result<(), ChecklistError> {
    if value.is_finite() && value > 0.0 {
        Ok(())
    } else {
        Err(ChecklistError::NotPositive { species: species.to_owned(), field, value })
    }
}

fn check_taxon_sources(taxon: &Taxon) -> Result<(), ChecklistError> {
    let sources = [
        ("characterSource", taxon.character_source.as_str()),
        ("maxLength.source", taxon.max_length.source.as_str()),
        ("generationLength.source", taxon.generation_length.source.as_str()),
    ]
    .into_iter()
    .chain(taxon.length_conversions.iter().map(|c| ("lengthConversions.source", c.source.as_str())))
    .chain(taxon.synonyms.iter().map(|s| ("synonyms.source", s.source.as_str())))
    .chain(taxon.local_names.iter().map(|l| ("localNames.source", l.source.as_str())));
    for (field, source) in sources {
        if source.trim().is_empty() {
            return Err(ChecklistError::BlankSource { species: taxon.scientific_name.clone(), field });
        }
    }
    Ok(())
}

/// Synonyms and local names must not be blank, and a synonym must not be the current
/// name of another entry (a record written with it would mean two species at once).
fn check_names(taxon: &Taxon, current_names: &BTreeSet<&str>) -> Result<(), ChecklistError> {
    let species = &taxon.scientific_name;
    let blank = |field: &'static str| ChecklistError::BlankName { species: species.clone(), field };
    if taxon.synonyms.iter().any(|s| s.name.trim().is_empty()) {
        return Err(blank("synonyms.name"));
    }
    if taxon.local_names.iter().any(|l| l.name.trim().is_empty()) {
        return Err(blank("localNames.name"));
    }
    if taxon.local_names.iter().any(|l| l.language.trim().is_empty()) {
        return Err(blank("localNames.language"));
    }
    match taxon.synonyms.iter().find(|s| current_names.contains(s.name.trim())) {
        Some(synonym) => {
            Err(ChecklistError::SynonymInUse { species: species.clone(), synonym: synonym.name.trim().to_owned() })
        }
        None => Ok(()),
    }
}

fn check_presence(taxon: &Taxon, area_codes: &BTreeSet<&str>) -> Result<(), ChecklistError> {
    match taxon.presence.iter().find(|code| !area_codes.contains(code.as_str())) {
        Some(code) => Err(ChecklistError::UnknownArea { species: taxon.scientific_name.clone(), area: code.clone() }),
        None => Ok(()),
    }
}
