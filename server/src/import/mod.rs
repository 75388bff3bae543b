//! Bringing in the records a network already keeps: CSV files (Darwin Core column names,
//! or any columns through a mapping file) and Darwin Core Archives.
//!
//! Every row becomes the submission a phone would have sent and takes the phone's path
//! (`crate::arrival::receive_imported`): the same checks and refusals, storage, the
//! search for duplicates against what is stored, and the review queue as awaiting review
//! — an imported record is reviewed like any other, whatever its source said of it, and
//! is generalised for the public until then (`crate::protect`). Where each record came
//! from is kept (`store::imports`) and exported.
//!
//! Re-running an import adds nothing: each row's client id is stable (`row.rs`), so a row
//! stored before is answered as a resend, and a row changed since (same occurrenceID,
//! other values) is reported, never stored twice. A dry run reads and checks every row,
//! compares it with what is stored, and writes nothing.

pub mod mapping;
pub mod row;
pub mod source;
pub mod values;

use std::collections::HashSet;
use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

use chrono::Utc;
use futures_util::StreamExt as _;
use serde::Serialize;
use uuid::Uuid;

use crate::intake::{IntakeError, Upload};
use crate::state::AppState;
use crate::store::imports::{self, Provenance};
use crate::store::observations;
use mapping::Mapping;
use row::{Built, NotBuilt};
use source::{Kind, Row};

/// The default limit on an import file's size, and on what one archive entry unpacks to:
/// a network's years of spreadsheets are megabytes (a million rows of this width are
/// about 300 MB), so a larger file is most likely not what was meant.
pub const DEFAULT_MAX_BYTES: u64 = 1 << 30;

/// How many refused rows a report lists one by one; the rest are counted.
pub const MAX_LISTED: usize = 100_000;

/// Rows read ahead of the one being stored.
const READ_AHEAD: usize = 256;

/// Rows on their way through intake at once: enough for the store's group commit to
/// share one durable commit between them (one at a time, each row waited for its own).
const IN_FLIGHT: usize = 32;

/// What to import and how.
#[derive(Debug, Clone)]
pub struct ImportOptions {
    pub path: PathBuf,
    pub mapping: Mapping,
    /// The dataset's name when rows do not give one (Darwin Core `datasetName`).
    pub dataset_name: String,
    pub dry_run: bool,
    pub max_bytes: u64,
}

/// A row that was not imported because it could not be read or checked.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RefusedRow {
    pub line: u64,
    pub column: String,
    pub reason: String,
}

/// A row whose record is stored with other values than the row now has.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ChangedRow {
    pub line: u64,
    pub source_row_id: String,
    pub observation_id: Option<i64>,
}

/// What an import did (or, in a dry run, would do).
#[derive(Debug, Clone, Default, Serialize)]
pub struct ImportReport {
    pub source: String,
    pub dataset_name: String,
    pub dry_run: bool,
    /// Data rows read.
    pub rows: u64,
    /// New records stored (a dry run: that would be).
    pub imported: u64,
    /// Rows stored by an earlier import, unchanged: nothing to do.
    pub already_imported: u64,
    /// Rows stored before with other values: not changed here; a reviewer decides.
    pub changed: Vec<ChangedRow>,
    /// Rows that say nothing was found (absences), skipped.
    pub absences: u64,
    pub refused: Vec<RefusedRow>,
    /// Refused rows beyond [`MAX_LISTED`], counted only.
    pub refused_not_listed: u64,
    /// New records the duplicate search linked to a possible duplicate already stored.
    pub with_possible_duplicates: u64,
    /// Rows that repeat an earlier row's occurrenceID in the same file (dry run only; a
    /// real run reports them as already imported or changed).
    pub repeated_in_file: u64,
}

impl ImportReport {
    fn refuse(&mut self, line: u64, column: String, reason: String) {
        if self.refused.len() < MAX_LISTED {
            self.refused.push(RefusedRow { line, column, reason });
        } else {
            self.refused_not_listed += 1;
        }
    }

    /// The report in words, one line a fact, then every refused and changed row.
    pub fn text(&self) -> String {
        let verb = if self.dry_run { "would import" } else { "imported" };
        let mut out = format!(
            "{}{} ({}): {} rows read; {verb} {} new records; {} already imported, unchanged; {} changed since they were imported (not updated); {} refused; {} absences skipped\n",
            if self.dry_run { "dry run, nothing written: " } else { "" },
            self.source,
            self.dataset_name,
            self.rows,
            self.imported,
            self.already_imported,
            self.changed.len(),
            self.refused.len() as u64 + self.refused_not_listed,
            self.absences,
        );
        if self.imported == 0 && self.already_imported > 0 && !self.dry_run {
            out.push_str("nothing new: every readable row was imported before\n");
        }
        if self.with_possible_duplicates > 0 {
            out.push_str(&format!(
                "{} new records look like records already stored; reviewers see them as possible duplicates\n",
                self.with_possible_duplicates
            ));
        }
        if self.repeated_in_file > 0 {
            out.push_str(&format!(
                "{} rows repeat an earlier row's occurrenceID in this file\n",
                self.repeated_in_file
            ));
        }
        for changed in &self.changed {
            let stored = changed.observation_id.map(|id| format!(" (record {id})")).unwrap_or_default();
            out.push_str(&format!(
                "line {}: {} was imported before with other values{stored}; not updated\n",
                changed.line, changed.source_row_id
            ));
        }
        for refused in &self.refused {
            out.push_str(&format!("line {}, column {}: {}\n", refused.line, refused.column, refused.reason));
        }
        if self.refused_not_listed > 0 {
            out.push_str(&format!("… and {} more refused rows\n", self.refused_not_listed));
        }
        out
    }
}

/// How far an import has come, for a progress line.
#[derive(Debug, Clone, Copy)]
pub struct Progress {
    pub done: u64,
    pub total: u64,
    pub elapsed: Duration,
}

impl Progress {
    pub fn rows_per_second(&self) -> f64 {
        self.done as f64 / self.elapsed.as_secs_f64().max(1e-3)
    }
}

/// Why an import stopped before its end (what was stored before stays stored, and a
/// re-run carries on: rows already imported are skipped).
#[derive(Debug, thiserror::Error)]
pub enum ImportError {
    #[error(transparent)]
    Source(#[from] source::SourceError),
    #[error(
        "stopped at line {line}: {error}; {imported} new records were stored before it, and running the import again carries on"
    )]
    Stopped { line: u64, imported: u64, error: String },
}

/// Imports (or, with `dry_run`, checks) every row of `options.path`, calling `progress`
/// after each row.
pub async fn import(
    state: &AppState,
    options: &ImportOptions,
    mut progress: impl FnMut(Progress),
) -> Result<ImportReport, ImportError> {
    let started = Instant::now();
    let kind = source::sniff(&options.path, options.max_bytes)?;
    let total = {
        let (path, mapping) = (options.path.clone(), options.mapping.clone());
        tokio::task::spawn_blocking(move || source::count_rows(&path, kind, &mapping))
            .await
            .map_err(|err| stopped(0, 0, err))??
    };
    let (sender, rows) = tokio::sync::mpsc::channel::<Row>(READ_AHEAD);
    let reader = {
        let (path, mapping, max_bytes) = (options.path.clone(), options.mapping.clone(), options.max_bytes);
        tokio::task::spawn_blocking(move || {
            let send = |row| sender.blocking_send(row).is_ok();
            match kind {
                Kind::Csv => source::read_csv(&path, &mapping, send),
                Kind::Archive => source::read_archive(&path, max_bytes, send),
            }
        })
    };
    let mut report = ImportReport {
        source: shown_name(&options.path),
        dataset_name: options.dataset_name.clone(),
        dry_run: options.dry_run,
        ..ImportReport::default()
    };
    let run = Run { state, options, source: report.source.clone() };
    // Several rows are on their way through intake at once, so the store's group commit
    // makes one durable commit of them; outcomes are taken in the file's order.
    let incoming = futures_util::stream::unfold(rows, |mut rows| async move { rows.recv().await.map(|r| (r, rows)) });
    let mut outcomes = std::pin::pin!(incoming.map(|row| run.settle(row)).buffered(IN_FLIGHT));
    let mut seen: HashSet<Uuid> = HashSet::new();
    while let Some(outcome) = outcomes.next().await {
        report.rows += 1;
        report.add(outcome.map_err(|err| err.with_imported(report.imported))?, &mut seen);
        progress(Progress { done: report.rows, total, elapsed: started.elapsed() });
    }
    reader.await.map_err(|err| stopped(report.rows, report.imported, err))??;
    Ok(report)
}

fn stopped(line: u64, imported: u64, error: impl ToString) -> ImportError {
    ImportError::Stopped { line, imported, error: error.to_string() }
}

impl ImportError {
    /// The error with the count of records stored before it.
    fn with_imported(self, count: u64) -> Self {
        match self {
            Self::Stopped { line, error, .. } => Self::Stopped { line, imported: count, error },
            other => other,
        }
    }
}

/// The file's name as provenance keeps it (no folders: they say where the operator
/// kept it, not where the data came from).
fn shown_name(path: &Path) -> String {
    path.file_name().map_or_else(|| path.display().to_string(), |n| n.to_string_lossy().into_owned())
}

/// What became of one row.
#[derive(Debug)]
enum Outcome {
    Refused(RefusedRow),
    Absence,
    Stored {
        possible_duplicate: bool,
    },
    AlreadyStored,
    Changed(ChangedRow),
    /// A dry run's verdicts, with the row's client id (to count repeats in the file).
    WouldStore(Uuid),
    WouldBeAlreadyStored(Uuid),
    WouldChange(Uuid, ChangedRow),
}

impl ImportReport {
    fn add(&mut self, outcome: Outcome, seen: &mut HashSet<Uuid>) {
        let mut repeated = |id: Uuid| !seen.insert(id);
        match outcome {
            Outcome::Refused(row) => self.refuse(row.line, row.column, row.reason),
            Outcome::Absence => self.absences += 1,
            Outcome::Stored { possible_duplicate } => {
                self.imported += 1;
                self.with_possible_duplicates += u64::from(possible_duplicate);
            }
            Outcome::AlreadyStored => self.already_imported += 1,
            Outcome::Changed(row) => self.changed.push(row),
            Outcome::WouldStore(id) | Outcome::WouldBeAlreadyStored(id) | Outcome::WouldChange(id, _)
                if repeated(id) =>
            {
                self.repeated_in_file += 1
            }
            Outcome::WouldStore(_) => self.imported += 1,
            Outcome::WouldBeAlreadyStored(_) => self.already_imported += 1,
            Outcome::WouldChange(_, row) => self.changed.push(row),
        }
    }
}

/// One import under way: what each row needs.
struct Run<'a> {
    state: &'a AppState,
    options: &'a ImportOptions,
    /// The file's name, as provenance keeps it.
    source: String,
}

impl Run<'_> {
    async fn settle(&self, row: Row) -> Result<Outcome, ImportError> {
        let (line, cells) = match row {
            Row::Unreadable { line, reason } => {
                return Ok(Outcome::Refused(RefusedRow { line, column: String::new(), reason }));
            }
            Row::Read { line, cells } => (line, cells),
        };
        match row::build(&cells, &self.options.mapping, &self.options.dataset_name, Utc::now()) {
            Err(NotBuilt::Absence) => Ok(Outcome::Absence),
            Err(NotBuilt::Refused { column, reason }) => Ok(Outcome::Refused(RefusedRow { line, column, reason })),
            Ok(built) if self.options.dry_run => self.check(line, built).await,
            Ok(built) => self.store(line, built).await,
        }
    }

    /// A dry run: what storing the row would do, from what is stored now.
    async fn check(&self, line: u64, built: Built) -> Result<Outcome, ImportError> {
        let client_id = built.submission.client_id;
        let id = client_id.to_string();
        let earlier = self
            .state
            .store
            .look(move |conn| observations::existing_receipt(conn, &id))
            .await
            .map_err(|err| stopped(line, 0, err))?;
        Ok(match earlier {
            None => Outcome::WouldStore(client_id),
            Some((hash, _)) if hash == crate::intake::content_hash(&built.submission, &[]) => {
                Outcome::WouldBeAlreadyStored(client_id)
            }
            Some((_, receipt)) => Outcome::WouldChange(
                client_id,
                ChangedRow { line, source_row_id: built.source_row_id, observation_id: Some(receipt.observation_id) },
            ),
        })
    }

    async fn store(&self, line: u64, built: Built) -> Result<Outcome, ImportError> {
        let upload = Upload { record_json: built.json, photos: Vec::new() };
        let accepted = match crate::arrival::receive_imported(self.state, upload, Utc::now()).await {
            Ok(accepted) => accepted,
            Err(IntakeError::Conflict(client_id)) => {
                let id = client_id.to_string();
                let stored = self.state.store.look(move |conn| observations::existing_receipt(conn, &id)).await;
                let observation_id = stored.ok().flatten().map(|(_, receipt)| receipt.observation_id);
                return Ok(Outcome::Changed(ChangedRow { line, source_row_id: built.source_row_id, observation_id }));
            }
            Err(IntakeError::Field { field, message }) => {
                return Ok(Outcome::Refused(RefusedRow { line, column: field, reason: message }));
            }
            Err(err) => return Err(stopped(line, 0, err)),
        };
        let observation_id = accepted.receipt.observation_id;
        let origin = Provenance {
            dataset_name: built.dataset_name,
            source_file: self.source.clone(),
            source_row_id: built.source_row_id,
            source_line: line,
        };
        let now = Utc::now().to_rfc3339();
        // Written after the record's own commit; a re-run writes it when a stop came between.
        let candidates = self
            .state
            .store
            .write(move |conn| {
                imports::record_provenance(conn, observation_id, &origin, &now)?;
                imports::candidate_count(conn, observation_id)
            })
            .await
            .map_err(|err| stopped(line, 0, err))?;
        Ok(if accepted.replayed {
            Outcome::AlreadyStored
        } else {
            Outcome::Stored { possible_duplicate: candidates > 0 }
        })
    }
}
