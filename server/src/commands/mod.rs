//! The subcommands of `wrackline` beyond serving: the assessors' `range`, `trend` and
//! `export`, the researchers' `sample`, and the operator's `import`, `backup`, `restore`
//! and `check`. Each has its clap arguments and a function that opens what it needs and
//! calls the library.

pub mod backup;
pub mod config;
pub mod export;
pub mod import;
pub mod range;
pub mod sample;
pub mod trend;

use std::path::{Path, PathBuf};

use anyhow::Context as _;

use crate::assess::input::{self, PointRecord};
use crate::assess::{describe_states, parse_states};
use crate::protect::{Audience, Publisher};
use crate::state::AppState;
use crate::taxa::{TaxonFilter, TaxonIndex};

/// Where records come from and which of them to take; shared by `range` and `trend`.
#[derive(Debug, clap::Args)]
pub struct RecordSource {
    /// Read records from this CSV (decimalLatitude, decimalLongitude, scientificName,
    /// eventDate columns) or Darwin Core Archive instead of the database.
    #[arg(long = "from", value_name = "FILE")]
    pub from_file: Option<PathBuf>,
    /// Stored records count only in these review states (repeatable; `any` for all).
    #[arg(long = "state", default_value = crate::assess::DEFAULT_STATE)]
    pub states: Vec<String>,
    /// One species or higher taxon (scientific or common name from the checklist).
    #[arg(long)]
    pub taxon: Option<String>,
    /// The species checklist (default: the bundled demo checklist).
    #[arg(long)]
    pub checklist: Option<PathBuf>,
    /// Print JSON for scripts instead of text.
    #[arg(long)]
    pub json: bool,
}

/// The records, the words saying which they are, the checklist and the taxon filter.
pub struct Loaded {
    pub records: Vec<PointRecord>,
    pub records_used: String,
    pub names: TaxonIndex,
    pub taxon: Option<TaxonFilter>,
}

impl RecordSource {
    pub fn load(&self, data_dir: &Path) -> anyhow::Result<Loaded> {
        let names = TaxonIndex::load(self.checklist.as_deref())?;
        let taxon = self
            .taxon
            .as_deref()
            .map(|name| {
                names.filter(name).with_context(|| {
                    format!("`{name}` is not a species, genus, family, order or superorder on the checklist")
                })
            })
            .transpose()?;
        let (records, records_used) = match &self.from_file {
            Some(path) => (input::read_file(path)?, format!("every record in {}", path.display())),
            None => {
                let states = parse_states(&self.states).map_err(anyhow::Error::msg)?;
                let state = AppState::open(data_dir, None, crate::taxa::load_checklist(None)?)?;
                let used = describe_states(&states);
                // The operator's own command: places as recorded.
                let read = |conn: &rusqlite::Connection| {
                    let publisher = Publisher::load(conn, &names, Audience::Full)?;
                    input::read_store(conn, states, &publisher)
                };
                (state.store.read_here(read)?, used)
            }
        };
        Ok(Loaded { records, records_used, names, taxon })
    }
}

/// Prints `value` as pretty JSON or `text`.
pub fn print(json: bool, value: &impl serde::Serialize, text: impl FnOnce() -> String) -> anyhow::Result<()> {
    if json {
        println!("{}", serde_json::to_string_pretty(value)?);
    } else {
        print!("{}", text());
    }
    Ok(())
}
