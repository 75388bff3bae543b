//! Exports of stored records, with no HTTP in them: the command line and the HTTP
//! handlers call [`write_export`].
//!
//! Every format is streamed: organisms are read one at a time from SQLite
//! ([`crate::store::occurrences::for_each`]), turned into an [`Occurrence`] and written at
//! once, so memory stays flat however many records there are.
//!
//! Public exports publish each record where [`crate::protect`] says, and every filter
//! (area, days, taxon) works on that published form; full exports are for assessors.
//! Observers are named only with their consent ([`credit`]); their contacts are never
//! read, so they cannot leave the server. Every value is made safe for spreadsheets
//! ([`cells`]).

pub mod cells;
pub mod credit;
pub mod csv;
pub mod dwca;
pub mod events;
pub mod filters;
pub mod geojson;
pub mod occurrence;
pub mod published;
pub mod samples;
pub mod terms;

use std::io::Write;

use rusqlite::Connection;

pub use crate::protect::Audience;
pub use crate::settings::Licence;
pub use occurrence::{ExportSummary, Occurrence};

use shared_types::ReviewState;

use crate::protect::Publisher;
use crate::store::StoreError;
use crate::store::occurrences::{self, RowFilter};
use crate::taxa::{TaxonFilter, TaxonIndex};
use filters::{Area, Days};
use occurrence::Builder;

/// The formats an export can take.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Format {
    Csv,
    Dwca,
    Geojson,
    /// The sample register: one CSV row per sample ([`samples::write_register`]).
    Samples,
}

impl Format {
    /// Reads `csv`, `dwca`, `geojson` or `samples`.
    pub fn parse(text: &str) -> Option<Self> {
        match text.to_ascii_lowercase().as_str() {
            "csv" => Some(Self::Csv),
            "dwca" => Some(Self::Dwca),
            "geojson" => Some(Self::Geojson),
            "samples" => Some(Self::Samples),
            _ => None,
        }
    }

    /// The media type and file name to serve it under.
    pub fn media_type_and_file(self) -> (&'static str, &'static str) {
        match self {
            Self::Csv => ("text/csv; charset=utf-8", "wrackline-records.csv"),
            Self::Dwca => ("application/zip", "wrackline-dwca.zip"),
            Self::Geojson => ("application/geo+json", "wrackline-records.geojson"),
            Self::Samples => ("text/csv; charset=utf-8", "wrackline-samples.csv"),
        }
    }
}

/// What to export and for whom.
#[derive(Debug, Clone)]
pub struct ExportRequest {
    pub format: Format,
    pub audience: Audience,
    /// Review states to take (`None`: any; callers default to [`crate::assess::DEFAULT_STATE`]).
    pub states: Option<Vec<ReviewState>>,
    /// Days, tested on each record's published date.
    pub days: Days,
    /// An area, tested on each record's published position.
    pub bbox: Option<Area>,
    pub taxon: Option<TaxonFilter>,
    /// Photo links in the export point under this address.
    pub base_url: String,
    /// The licence the archive's metadata states.
    pub licence: Licence,
    /// What the archive's metadata says of the dataset: title, publisher, contact, area.
    pub dataset: crate::settings::Dataset,
}

/// Why an export stopped.
#[derive(Debug, thiserror::Error)]
pub enum ExportError {
    #[error(transparent)]
    Store(#[from] StoreError),
    #[error("writing the export: {0}")]
    Io(#[from] std::io::Error),
    #[error("writing the archive: {0}")]
    Zip(#[from] zip::result::ZipError),
    #[error("writing CSV: {0}")]
    Csv(#[from] ::csv::Error),
    #[error("writing JSON: {0}")]
    Json(#[from] serde_json::Error),
}

impl ExportRequest {
    /// What the store can filter on its own: states, and days one wider each side.
    fn row_filter(&self) -> RowFilter {
        let (from_utc, until_utc) = self.days.store_bounds();
        RowFilter { states: self.states.clone(), from_utc, until_utc }
    }
}

/// How many organisms `request` will read (for a progress bar; the filters on published
/// places, days and taxa may leave some of them out).
pub fn rows_to_read(conn: &Connection, request: &ExportRequest) -> Result<u64, StoreError> {
    occurrences::count(conn, &request.row_filter())
}

/// Writes the export to `out`; `progress` is called once for every row read.
pub fn write_export<W: Write>(
    conn: &Connection,
    names: &TaxonIndex,
    request: &ExportRequest,
    out: W,
    progress: &mut dyn FnMut(),
) -> Result<ExportSummary, ExportError> {
    match request.format {
        Format::Csv => csv::write(conn, names, request, out, progress),
        Format::Geojson => geojson::write(conn, names, request, out, progress),
        Format::Dwca => dwca::write(conn, names, request, out, progress),
        Format::Samples => samples::write_register(conn, names, request, out, progress),
    }
}

/// Walks the organisms of `request` once, placing each as `publisher` says and handing
/// each kept occurrence to `each`.
fn each_occurrence(
    conn: &Connection,
    publisher: &Publisher,
    request: &ExportRequest,
    progress: &mut dyn FnMut(),
    mut each: impl FnMut(&Occurrence) -> Result<(), ExportError>,
) -> Result<ExportSummary, ExportError> {
    let mut builder = Builder { publisher, request, summary: ExportSummary::default() };
    // Only archives carry the identification history.
    let with_history = request.format == Format::Dwca;
    occurrences::for_each(conn, &request.row_filter(), with_history, |row| -> Result<(), ExportError> {
        progress();
        match builder.build(&row) {
            Some(occurrence) => each(&occurrence),
            None => Ok(()),
        }
    })?;
    Ok(builder.summary)
}
