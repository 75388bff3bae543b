//! `wrackline import`: records a network already keeps, from a CSV file or a Darwin Core
//! Archive, through the phone's checks into the review queue (`crate::import`), with a
//! progress line on standard error and the report on standard output.

use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

use anyhow::Context as _;

use crate::import::mapping::{Field, Mapping};
use crate::import::{self, DEFAULT_MAX_BYTES, ImportOptions, Progress};
use crate::state::AppState;

#[derive(Debug, clap::Args)]
pub struct ImportArgs {
    /// The CSV file or Darwin Core Archive (zip) to import.
    pub file: PathBuf,
    /// A mapping file (TOML, or CSV with columns column,field,value) saying which column
    /// holds which field; without one, columns are read by their Darwin Core names.
    #[arg(long)]
    pub mapping: Option<PathBuf>,
    /// The dataset's name, kept with every record (Darwin Core datasetName); default: the
    /// mapping's dataset_name, else the file's name without its extension. Rows' stable
    /// ids include it, so give the same name when importing the same data again.
    #[arg(long)]
    pub dataset: Option<String>,
    /// A value for a field the rows do not give, e.g. `setting=beach_stranding`
    /// (repeatable; over the mapping's defaults).
    #[arg(long = "default", value_name = "FIELD=VALUE")]
    pub defaults: Vec<String>,
    /// The CSV delimiter (`,` `;` `|` or `tab`); default: sniffed from the header line.
    #[arg(long)]
    pub delimiter: Option<String>,
    /// Read and check every row, compare it with what is stored, and write nothing.
    #[arg(long)]
    pub dry_run: bool,
    /// Refuse files (and archive entries) larger than this many bytes.
    #[arg(long, default_value_t = DEFAULT_MAX_BYTES)]
    pub max_bytes: u64,
    /// Print the report as JSON.
    #[arg(long)]
    pub json: bool,
    /// The species checklist (default: the bundled demo checklist).
    #[arg(long)]
    pub checklist: Option<PathBuf>,
}

/// How often the progress line is redrawn.
const PROGRESS_EVERY: Duration = Duration::from_secs(1);

pub fn run(data_dir: &Path, args: ImportArgs) -> anyhow::Result<()> {
    let options = options(&args)?;
    let state = AppState::open(data_dir, None, crate::taxa::load_checklist(args.checklist.as_deref())?)?;
    let runtime = tokio::runtime::Runtime::new().context("starting the async runtime")?;
    let mut shown = Instant::now();
    let report = runtime.block_on(import::import(&state, &options, |progress| {
        if shown.elapsed() >= PROGRESS_EVERY || progress.done == progress.total {
            shown = Instant::now();
            eprintln!("{}", progress_line(&progress));
        }
    }))?;
    if args.json {
        println!("{}", serde_json::to_string_pretty(&report)?);
    } else {
        print!("{}", report.text());
    }
    Ok(())
}

/// `rows 1200/4800 (25%), 310 rows/s`.
pub fn progress_line(progress: &Progress) -> String {
    let share = (progress.done * 100).checked_div(progress.total).unwrap_or(100);
    format!("rows {}/{} ({share}%), {:.0} rows/s", progress.done, progress.total, progress.rows_per_second())
}

fn options(args: &ImportArgs) -> anyhow::Result<ImportOptions> {
    let mut mapping = match &args.mapping {
        Some(path) => Mapping::load(path).map_err(anyhow::Error::msg)?,
        None => Mapping::by_column_names(),
    };
    for pair in &args.defaults {
        let (field, value) = pair
            .split_once('=')
            .with_context(|| format!("--default {pair}: write FIELD=VALUE, e.g. setting=beach_stranding"))?;
        let field = Field::named(field)
            .with_context(|| format!("--default {pair}: `{field}` is not a field wrackline imports"))?;
        mapping.defaults.insert(field, value.trim().to_owned());
    }
    if let Some(delimiter) = &args.delimiter {
        mapping.delimiter = Some(import::mapping::delimiter(delimiter).map_err(anyhow::Error::msg)?);
    }
    let stem = args.file.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default();
    let dataset_name = args.dataset.clone().or_else(|| mapping.dataset_name.clone()).unwrap_or(stem);
    Ok(ImportOptions {
        path: args.file.clone(),
        mapping,
        dataset_name,
        dry_run: args.dry_run,
        max_bytes: args.max_bytes,
    })
}
