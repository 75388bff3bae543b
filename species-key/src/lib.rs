//! The guided species key: checklist format and the multi-access key engine (pure Rust,
//! runs in the browser and on the server).
//!
//! A [`Checklist`] is read from JSON and checked; a [`Key`] built over it ranks species
//! by posterior probability given an observer's [`Answers`] and the record's
//! [`Context`] (area, nearby confirmed records, measured length), chooses the next
//! question by expected information gain, lists the species pairs its characters
//! cannot separate, and sums support per higher taxon so an observer can stop at a
//! genus or family. No I/O, clocks or threads, so it compiles for wasm32 unchanged.
//!
//! ```
//! use species_key::{Answers, Checklist, Context, Key};
//!
//! let json = r#"{
//!   "metadata": { "title": "example", "region": "example", "notice": "invented" },
//!   "areas": [ { "code": "bay", "name": "The Bay" } ],
//!   "characters": [ { "name": "gillSlits", "question": "How many gill slits?", "states": [
//!       { "name": "five", "label": "5 gill slits" }, { "name": "six", "label": "6 gill slits" } ] } ],
//!   "taxa": [
//!     { "scientificName": "Scyliorhinus canicula", "commonNames": ["small-spotted catshark"],
//!       "taxonRank": "species", "genus": "Scyliorhinus", "family": "Scyliorhinidae",
//!       "order": "Carcharhiniformes", "superorder": "Galeomorphii",
//!       "characters": { "gillSlits": ["five"] }, "characterSource": "from memory",
//!       "maxLength": { "cm": 100, "measure": "totalLength", "source": "from memory" },
//!       "presence": ["bay"], "sensitivity": "none",
//!       "generationLength": { "years": 8, "source": "from memory" }, "protected": false },
//!     { "scientificName": "Hexanchus griseus", "commonNames": ["bluntnose sixgill shark"],
//!       "taxonRank": "species", "genus": "Hexanchus", "family": "Hexanchidae",
//!       "order": "Hexanchiformes", "superorder": "Squalomorphii",
//!       "characters": { "gillSlits": ["six"] }, "characterSource": "from memory",
//!       "maxLength": { "cm": 482, "measure": "totalLength", "source": "from memory" },
//!       "presence": [], "sensitivity": "none",
//!       "generationLength": { "years": 30, "source": "from memory" }, "protected": false }
//!   ]
//! }"#;
//! let key = Key::new(&Checklist::from_json(json)?);
//! let context = Context { area_code: Some("bay".into()), ..Context::default() };
//!
//! let question = key.next_question(&Answers::new(), &context)?.expect("one question to ask");
//! assert_eq!(question.character, "gillSlits");
//!
//! let ranked = key.rank(&Answers::new().with("gillSlits", "six"), &context)?;
//! assert_eq!(ranked[0].scientific_name, "Hexanchus griseus");
//! assert!(ranked[0].reasons.iter().any(|r| r.text == "6 gill slits"));
//! # Ok::<(), Box<dyn std::error::Error>>(())
//! ```

mod answers;
mod checklist;
mod error;
mod higher_taxa;
mod key;
pub mod length;
pub mod likelihood;
pub mod reasons;
mod separation;
pub mod synthetic;
mod translations;

pub use answers::{Answer, Answers, Context};
pub use checklist::{
    Area, Character, CharacterState, Checklist, GenerationLength, LengthConversion, LocalName, MaxLength, Metadata,
    Sensitivity, Synonym, Taxon, TaxonRank,
};
pub use error::{AnswerError, ChecklistError};
pub use higher_taxa::TaxonSupport;
pub use key::{Candidate, Effect, Key, MIN_USEFUL_GAIN_BITS, QuestionChoice, Reason};
pub use length::{LengthKind, Measurement};
pub use reasons::{Converted, Said, SizeSaid};
pub use separation::UnseparablePair;
pub use translations::{CharacterWords, Translation};
