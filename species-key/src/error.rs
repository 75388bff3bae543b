//! Errors of the species key, kept in one place so the app and server can show a
//! checklist author or an observer exactly which species, field or answer is at fault.

use thiserror::Error;

/// Why a checklist could not be read. Every variant names the species (or the
/// character) and the field at fault, so the message alone is enough to fix the file.
#[derive(Debug, Error)]
pub enum ChecklistError {
    /// The text is not JSON, or the top level (metadata, areas, characters) does not fit the format.
    #[error("checklist is not valid: {0}")]
    Format(#[source] serde_json::Error),
    /// One taxon entry does not fit the format (a missing or misspelt field, a wrong type).
    #[error("taxon {position} ({scientific_name}): {source}")]
    TaxonFormat {
        /// Position of the entry in the `taxa` list, counting from 1.
        position: usize,
        /// The entry's `scientificName`, or "no scientificName" when even that is missing.
        scientific_name: String,
        /// What serde found wrong.
        #[source]
        source: serde_json::Error,
    },
    /// The checklist has no taxa at all.
    #[error("checklist has no taxa")]
    NoTaxa,
    /// Two taxa share one scientific name.
    #[error("{0}: listed more than once")]
    DuplicateTaxon(String),
    /// A character is defined twice.
    #[error("character {0}: defined more than once")]
    DuplicateCharacter(String),
    /// A character lists one state twice.
    #[error("character {character}: state {state} listed more than once")]
    DuplicateState {
        /// The character's name.
        character: String,
        /// The repeated state.
        state: String,
    },
    /// A character needs at least two states to be a question worth asking.
    #[error("character {0}: needs at least two states")]
    TooFewStates(String),
    /// The engine keeps a species' states for one character in a 64-bit set.
    #[error("character {0}: more than 64 states")]
    TooManyStates(String),
    /// `groupNames` names something that is no group of a listed taxon.
    #[error("groupNames: {0} is no genus, family, order or superorder of a listed taxon")]
    UnknownGroup(String),
    /// An area code is defined twice.
    #[error("area {0}: defined more than once")]
    DuplicateArea(String),
    /// An area's box is not `[west, south, east, north]` within the globe.
    #[error("area {0}: bounds must be [west, south, east, north] in degrees with west < east and south < north")]
    BadAreaBounds(String),
    /// A taxon uses a character the checklist does not define.
    #[error("{species}: characters.{character} is not a character of this checklist")]
    UnknownCharacter {
        /// The taxon's scientific name.
        species: String,
        /// The undefined character.
        character: String,
    },
    /// A taxon gives a state that is not in the character's list of states.
    #[error("{species}: characters.{character} has state {state}, which is not one of that character's states")]
    UnknownState {
        /// The taxon's scientific name.
        species: String,
        /// The character.
        character: String,
        /// The state not in the character's list.
        state: String,
    },
    /// A taxon lists a character with no states; leave the character out to mean "unknown".
    #[error("{species}: characters.{character} lists no states (leave it out if unknown)")]
    NoStates {
        /// The taxon's scientific name.
        species: String,
        /// The character.
        character: String,
    },
    /// A taxon's presence list names an area code the checklist does not define.
    #[error("{species}: presence has area code {area}, which is not in the checklist's areas")]
    UnknownArea {
        /// The taxon's scientific name.
        species: String,
        /// The undefined code.
        area: String,
    },
    /// A number that must be above zero is not (a maximum length, a generation length, a slope).
    #[error("{species}: {field} must be a number above zero, found {value}")]
    NotPositive {
        /// The taxon's scientific name.
        species: String,
        /// The field at fault, as written in the file.
        field: &'static str,
        /// The value found.
        value: f64,
    },
    /// A source field is blank; name the guide or paper, or write "from memory".
    #[error("{species}: {field} is blank (name the field guide or paper, or write \"from memory\")")]
    BlankSource {
        /// The taxon's scientific name.
        species: String,
        /// The field at fault.
        field: &'static str,
    },
    /// A synonym or local name (or its language) is blank.
    #[error("{species}: {field} is blank")]
    BlankName {
        /// The taxon's scientific name.
        species: String,
        /// The field at fault.
        field: &'static str,
    },
    /// A synonym is the current scientific name of an entry of the checklist.
    #[error("{species}: synonym {synonym} is the scientific name of an entry of this checklist")]
    SynonymInUse {
        /// The taxon's scientific name.
        species: String,
        /// The synonym at fault.
        synonym: String,
    },
    /// A maximum length must be a total length or a disc width.
    #[error("{species}: maxLength.measure must be totalLength or discWidth, found {measure}")]
    MaxLengthMeasure {
        /// The taxon's scientific name.
        species: String,
        /// The measure found.
        measure: String,
    },
    /// A `translations` key or `metadata.language` is not a BCP 47 language tag.
    #[error("{0:?} is not a language tag (such as cy or en-GB)")]
    BadLanguageTag(String),
    /// A language's words name a character the checklist does not define.
    #[error("translations.{language}: {character} is not a character of this checklist")]
    UnknownTranslatedCharacter {
        /// The language's tag.
        language: String,
        /// The undefined character.
        character: String,
    },
    /// A language's words name a state the character does not have.
    #[error("translations.{language}: {character}.states has {state}, which is not one of that character's states")]
    UnknownTranslatedState {
        /// The language's tag.
        language: String,
        /// The character.
        character: String,
        /// The state not in the character's list.
        state: String,
    },
    /// A translated question or label is blank (leave it out to fall back to the checklist's own words).
    #[error("translations.{language}: {at} is blank (leave it out to use the checklist's own words)")]
    BlankTranslation {
        /// The language's tag.
        language: String,
        /// The question or label at fault (`bodyForm.question`, `bodyForm.states.sharkLike`).
        at: String,
    },
    /// A length conversion must turn fork length, precaudal length or disc width into total length.
    #[error(
        "{species}: lengthConversions has measure {measure}; only forkLength, precaudalLength and discWidth are converted to total length"
    )]
    ConversionMeasure {
        /// The taxon's scientific name.
        species: String,
        /// The measure found.
        measure: String,
    },
}

/// Why a set of answers could not be used with a key: it names a character or state
/// that the key's checklist does not have (for example a draft saved under an older checklist).
#[derive(Debug, Error, PartialEq, Eq)]
pub enum AnswerError {
    /// The answer is to a character the checklist does not define.
    #[error("no character named {0} in this checklist")]
    UnknownCharacter(String),
    /// The answer gives a state the character does not have.
    #[error("character {character} has no state named {state}")]
    UnknownState {
        /// The character answered.
        character: String,
        /// The state given.
        state: String,
    },
}
