//! Trend figures from yearly counts with effort: read from a file, or counted from the
//! stored records, then handed to `analysis::trend` with the assessment window.
//!
//! The window is the longer of 10 years and three generations (IUCN criterion A); the
//! generation length comes from `--generation-length` or from the checklist entry of the
//! taxon. For a higher taxon the longest generation length among its species is used, so
//! the window is never shorter than any member species needs.

use std::collections::BTreeMap;
use std::fs::File;
use std::path::Path;

use analysis::trend::{TrendSummary, YearCount, yearly_trend};
use chrono::Datelike as _;
use serde::Serialize;

use super::input::{InputError, PointRecord};
use crate::taxa::{TaxonFilter, TaxonIndex};

/// Where the generation length came from.
#[derive(Debug, Clone, Serialize)]
pub struct GenerationLength {
    pub years: f64,
    pub source: String,
}

/// The trend and everything needed to read it.
#[derive(Debug, Clone, Serialize)]
pub struct TrendReport {
    pub records_used: String,
    pub generation_length: GenerationLength,
    /// What the model was fitted to: counts with their effort (encounter rates from
    /// all-finds survey walks when there are any).
    pub years: Vec<YearCount>,
    /// Animals in the taxon's records per calendar year, whatever effort lay behind them
    /// (for `--from`, the file's counts): always reported beside the encounter rates.
    pub yearly_counts: Vec<YearTotal>,
    pub trend: TrendSummary,
    /// Notes on the data behind the figures (e.g. that effort is not known).
    pub notes: Vec<String>,
}

/// One calendar year's count of animals in records, with no effort attached.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct YearTotal {
    pub year: i32,
    pub count: u64,
}

impl YearTotal {
    /// The counts of `rows`, their effort left aside.
    pub fn of(rows: &[YearCount]) -> Vec<YearTotal> {
        rows.iter().map(|r| YearTotal { year: r.year, count: r.count }).collect()
    }
}

/// Why a trend could not be computed.
#[derive(Debug, thiserror::Error)]
pub enum TrendInputError {
    #[error(transparent)]
    Input(#[from] InputError),
    #[error("{0}")]
    Trend(#[from] analysis::trend::TrendError),
    #[error("{0}")]
    Generation(String),
    #[error("a trend needs counts from at least {MIN_TREND_YEARS} years; these records cover {0}")]
    TooFewYears(usize),
}

/// The fewest years a trend is fitted over (two points always fit a line exactly).
pub const MIN_TREND_YEARS: usize = 3;

/// The generation length to use: the one given, or the checklist's for `taxon`.
pub fn generation_length(
    given: Option<f64>,
    taxon: Option<&TaxonFilter>,
    names: &TaxonIndex,
) -> Result<GenerationLength, TrendInputError> {
    if let Some(years) = given {
        return Ok(GenerationLength { years, source: "given on the command line".into() });
    }
    let Some(filter) = taxon else {
        return Err(TrendInputError::Generation(
            "the assessment window needs a generation length: give --generation-length YEARS or --taxon NAME of a checklist taxon".into(),
        ));
    };
    names
        .checklist()
        .taxa()
        .iter()
        .filter(|t| filter.contains(t))
        .max_by(|a, b| a.generation_length.years.total_cmp(&b.generation_length.years))
        .map(|t| GenerationLength {
            years: t.generation_length.years,
            source: format!("checklist entry for {}: {}", t.scientific_name, t.generation_length.source),
        })
        .ok_or_else(|| TrendInputError::Generation(format!("the checklist has no species in {}", filter.name)))
}

/// Reads a CSV with `year`, `count` and `effort` columns.
pub fn read_year_counts(path: &Path) -> Result<Vec<YearCount>, InputError> {
    let shown = path.display().to_string();
    let file = File::open(path).map_err(|source| InputError::Open { file: shown.clone(), source })?;
    let mut reader = csv::ReaderBuilder::new().from_reader(file);
    let header: Vec<String> = reader
        .headers()
        .map_err(|err| InputError::File { file: shown.clone(), message: err.to_string() })?
        .iter()
        .map(|h| h.trim().trim_start_matches('\u{feff}').to_owned())
        .collect();
    let column = |name: &str| {
        header.iter().position(|h| h == name).ok_or_else(|| InputError::File {
            file: shown.clone(),
            message: format!("line 1 (the header) has no `{name}` column; the columns are: {}", header.join(", ")),
        })
    };
    let (year, count, effort) = (column("year")?, column("count")?, column("effort")?);
    let mut rows = Vec::new();
    for result in reader.records() {
        let row = result.map_err(|err| InputError::File { file: shown.clone(), message: err.to_string() })?;
        let line = row.position().map(|p| p.line()).unwrap_or(0);
        let cell = |index: usize, what: &str| -> Result<&str, InputError> {
            let text = row.get(index).unwrap_or_default().trim();
            if text.is_empty() {
                return Err(InputError::Cell {
                    file: shown.clone(),
                    line,
                    column: index + 1,
                    header: header[index].clone(),
                    message: format!("the {what} is empty"),
                });
            }
            Ok(text)
        };
        let bad = |index: usize, message: String| InputError::Cell {
            file: shown.clone(),
            line,
            column: index + 1,
            header: header[index].clone(),
            message,
        };
        let y = cell(year, "year")?;
        let c = cell(count, "count")?;
        let e = cell(effort, "effort")?;
        rows.push(YearCount {
            year: y.parse().map_err(|_| bad(year, format!("`{y}` is not a year")))?,
            count: c.parse().map_err(|_| bad(count, format!("`{c}` is not a whole number of animals (0 or more)")))?,
            effort: e
                .parse::<f64>()
                .ok()
                .filter(|v| *v > 0.0 && v.is_finite())
                .ok_or_else(|| bad(effort, format!("`{e}` is not a positive effort")))?,
        });
    }
    Ok(rows)
}

/// Said with a trend on stored records when there are no all-finds survey walks.
pub const NO_EFFORT_NOTE: &str = "no survey walk on which every find was reported is stored, so every year has effort 1: \
these are raw yearly counts of records, not encounter rates, and a change in how many people look shows up as a trend";

/// Yearly counts of the stored records of `taxon`, every year from the first to the last
/// record (a year with no record is a count of 0), each with effort 1.
///
/// Used when there are no all-finds survey walks to divide by: these are raw yearly
/// counts, and the report says so.
pub fn stored_year_counts(records: &[PointRecord], taxon: Option<&TaxonFilter>, names: &TaxonIndex) -> Vec<YearCount> {
    let mut by_year: BTreeMap<i32, u64> = BTreeMap::new();
    for record in records {
        let wanted = match (taxon, record.name.as_deref().and_then(|n| names.resolve(n))) {
            (None, _) => true,
            (Some(filter), Some(t)) => filter.contains(t),
            (Some(_), None) => false,
        };
        if let (true, Some(when)) = (wanted, record.when) {
            *by_year.entry(when.year()).or_insert(0) += record.count;
        }
    }
    let (Some(&first), Some(&last)) = (by_year.keys().next(), by_year.keys().last()) else { return Vec::new() };
    (first..=last)
        .map(|year| YearCount { year, count: by_year.get(&year).copied().unwrap_or(0), effort: 1.0 })
        .collect()
}

/// What the chart's rates are, in words: animals per km or per hour walked on all-finds
/// walks, or animals recorded per year when no such walk is stored (effort 1 a year).
pub fn rate_words(report: &TrendReport, unit: EffortUnit) -> &'static str {
    if report.notes.iter().any(|note| note == NO_EFFORT_NOTE) {
        return "Animals recorded each year";
    }
    match unit {
        EffortUnit::Km => "Animals per km walked each year",
        EffortUnit::Hours => "Animals per hour walked each year",
    }
}

/// How walking effort is measured for encounter rates.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum EffortUnit {
    /// Records per kilometre walked.
    #[default]
    Km,
    /// Records per hour walked.
    Hours,
}

/// Yearly encounter rates from survey walks on which every find was reported: the
/// count is the taxon's records made on those walks, the effort the kilometres (or
/// hours) walked on them, every year in which such walks were made — a year of walks
/// with no find is a count of 0, which is what makes the rate mean something. `None`
/// when there is no such walk. Returns the rows and a note saying what they are.
pub fn walk_year_counts(
    records: &[PointRecord],
    walks: &[crate::store::walks::StoredWalk],
    taxon: Option<&TaxonFilter>,
    names: &TaxonIndex,
    unit: EffortUnit,
) -> Option<(Vec<YearCount>, String)> {
    let surveyed: BTreeMap<String, i32> = walks
        .iter()
        .filter(|w| w.walk.all_finds_reported)
        .map(|w| (w.walk.client_id.to_string(), w.walk.started_at.year()))
        .collect();
    if surveyed.is_empty() {
        return None;
    }
    let mut effort: BTreeMap<i32, f64> = BTreeMap::new();
    for walk in walks.iter().filter(|w| w.walk.all_finds_reported) {
        let figures = walk.walk.effort();
        let amount = match unit {
            EffortUnit::Km => figures.distance_m / 1000.0,
            EffortUnit::Hours => figures.duration_s / 3600.0,
        };
        *effort.entry(walk.walk.started_at.year()).or_insert(0.0) += amount;
    }
    let mut counts: BTreeMap<i32, u64> = BTreeMap::new();
    for record in records {
        let Some(year) = record.walk_client_id.as_ref().and_then(|w| surveyed.get(w)) else { continue };
        let wanted = match (taxon, record.name.as_deref().and_then(|n| names.resolve(n))) {
            (None, _) => true,
            (Some(filter), Some(t)) => filter.contains(t),
            (Some(_), None) => false,
        };
        if wanted {
            *counts.entry(*year).or_insert(0) += record.count;
        }
    }
    let rows: Vec<YearCount> = effort
        .into_iter()
        .filter(|(_, amount)| *amount > 0.0)
        .map(|(year, amount)| YearCount { year, count: counts.get(&year).copied().unwrap_or(0), effort: amount })
        .collect();
    let per = match unit {
        EffortUnit::Km => "kilometre",
        EffortUnit::Hours => "hour",
    };
    let note = format!(
        "encounter rates per {per} walked, from {} survey walks on which every find was reported; records made outside such walks are not counted",
        surveyed.len()
    );
    Some((rows, note))
}

/// Fits the trend and wraps it with what went in.
pub fn trend_report(
    years: Vec<YearCount>,
    yearly_counts: Vec<YearTotal>,
    generation: GenerationLength,
    records_used: String,
    notes: Vec<String>,
) -> Result<TrendReport, TrendInputError> {
    if years.len() < MIN_TREND_YEARS {
        return Err(TrendInputError::TooFewYears(years.len()));
    }
    let trend = yearly_trend(&years, generation.years)?;
    Ok(TrendReport { records_used, generation_length: generation, years, yearly_counts, trend, notes })
}

/// What the trend is fitted to on stored records — encounter rates from all-finds walks
/// when there are any, else the raw yearly counts — and the raw yearly counts, which are
/// reported either way. Returns (fitted rows, yearly counts, notes).
pub fn stored_trend_input(
    records: &[PointRecord],
    walks: &[crate::store::walks::StoredWalk],
    taxon: Option<&TaxonFilter>,
    names: &TaxonIndex,
    unit: EffortUnit,
) -> (Vec<YearCount>, Vec<YearTotal>, Vec<String>) {
    let raw = stored_year_counts(records, taxon, names);
    let counts = YearTotal::of(&raw);
    match walk_year_counts(records, walks, taxon, names, unit) {
        Some((rates, note)) => (rates, counts, vec![note]),
        None => (raw, counts, vec![NO_EFFORT_NOTE.to_owned()]),
    }
}

/// The report as plain text for a terminal.
pub fn render_text(report: &TrendReport) -> String {
    let t = &report.trend;
    let mut out = format!("Records used: {}.\n", report.records_used);
    for note in &report.notes {
        out.push_str(&format!("Note: {note}\n"));
    }
    out.push_str(&format!("{:>6} {:>8} {:>12} {:>12}\n", "year", "count", "effort", "rate"));
    for y in &report.years {
        out.push_str(&format!("{:>6} {:>8} {:>12.2} {:>12.4}\n", y.year, y.count, y.effort, y.count as f64 / y.effort));
    }
    let counts: Vec<String> = report.yearly_counts.iter().map(|y| format!("{} {}", y.year, y.count)).collect();
    out.push_str(&format!(
        "Animals recorded per year, whatever the effort: {}.\n",
        if counts.is_empty() { "none".into() } else { counts.join(", ") }
    ));
    // Beyond ±10,000% a percentage says nothing a person can use (it comes from
    // extrapolating a short series); say so instead of printing a 20-digit number.
    let percent = |x: f64| {
        if (100.0 * x).abs() > 10_000.0 {
            format!("{}10,000%", if x > 0.0 { "over +" } else { "below −" })
        } else {
            format!("{:+.1}%", 100.0 * x)
        }
    };
    out.push_str(&format!(
        "\nPoisson log-linear model with log(effort) offset: Pearson dispersion {:.2} ({:?} errors).\n",
        t.fit.dispersion.unwrap_or(f64::NAN),
        t.error_model
    ));
    out.push_str(&format!(
        "Change per year: {} (95% interval {} to {}).\n",
        percent(t.annual_change.estimate),
        percent(t.annual_change.lower),
        percent(t.annual_change.upper)
    ));
    out.push_str(&format!(
        "Assessment window: {:.0} years = max(10, 3 × generation length {} years; {}).\n",
        t.window_years, report.generation_length.years, report.generation_length.source
    ));
    out.push_str(&format!(
        "Change over the window: {} (95% interval {} to {}){}.\n",
        percent(t.window_change.estimate),
        percent(t.window_change.lower),
        percent(t.window_change.upper),
        if t.window_exceeds_data { ", extrapolated beyond the years covered" } else { "" }
    ));
    let mk = &t.mann_kendall;
    out.push_str(&format!(
        "Mann–Kendall (tie-corrected) on yearly rates: S = {}, Var(S) = {:.1}, Z = {:.3}, p = {:.4}; Sen's slope {} per year.\n",
        mk.s,
        mk.var_s,
        mk.z,
        mk.p_value,
        mk.sen_slope.map(|s| format!("{s:.4}")).unwrap_or_else(|| "-".into())
    ));
    out.push_str(&format!("\n{}\n", t.criterion_a.text));
    out
}
