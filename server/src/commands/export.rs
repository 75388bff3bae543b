//! `wrackline export`: every record, or a filtered selection, as CSV, GeoJSON or a Darwin
//! Core Archive, or the register of the samples taken from them, written as it is read,
//! with a progress bar on standard error.

use std::io::Write;
use std::path::{Path, PathBuf};

use anyhow::Context as _;
use chrono::NaiveDate;
use clap::ValueEnum;

use crate::assess::{describe_states, parse_states};
use crate::export::filters::{Area, Days, parse_bbox};
use crate::export::{self, Audience, ExportRequest, Format, Licence};
use crate::settings::{LICENCE_VARIABLE, PUBLIC_URL_VARIABLE, PublicUrl};
use crate::store::Store;
use crate::taxa::TaxonIndex;

#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum ExportFormat {
    Csv,
    Dwca,
    Geojson,
    /// The sample register: one CSV row per sample taken, with its animal's record.
    Samples,
}

#[derive(Debug, clap::Args)]
pub struct ExportArgs {
    #[arg(long, value_enum)]
    pub format: ExportFormat,
    /// Write here instead of standard output.
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// The server's public address, which photo links in the export point under (the
    /// same setting as `wrackline serve --public-url`).
    #[arg(long = "public-url", env = PUBLIC_URL_VARIABLE, value_parser = PublicUrl::parse,
          default_value = "http://127.0.0.1:8080")]
    pub public_url: PublicUrl,
    /// Positions as recorded, sensitive species included: for assessors only, never to publish.
    #[arg(long)]
    pub full: bool,
    /// Only records in these review states (repeatable; `any` for all; default confirmed,
    /// as for the figures).
    #[arg(long = "state", default_value = crate::assess::DEFAULT_STATE)]
    pub states: Vec<String>,
    /// Only this species or higher taxon (a checklist name).
    #[arg(long)]
    pub taxon: Option<String>,
    /// Only records observed on or after this day (UTC, YYYY-MM-DD).
    #[arg(long)]
    pub from_date: Option<NaiveDate>,
    /// Only records observed on or before this day (UTC, YYYY-MM-DD).
    #[arg(long)]
    pub to_date: Option<NaiveDate>,
    /// Only records inside SOUTH,WEST,NORTH,EAST (decimal degrees; WEST greater than
    /// EAST is a box across the antimeridian, e.g. -20,170,-10,-170).
    #[arg(long, value_parser = parse_bbox, allow_hyphen_values = true)]
    pub bbox: Option<Area>,
    /// The licence the archive states (default CC BY 4.0).
    #[arg(long, value_enum, env = LICENCE_VARIABLE, default_value_t = Licence::CcBy)]
    pub licence: Licence,
    /// The species checklist (default: the bundled demo checklist).
    #[arg(long)]
    pub checklist: Option<PathBuf>,
    /// What the archive's metadata says of the dataset (the same settings as `serve`'s).
    #[command(flatten)]
    pub dataset: crate::settings::Dataset,
}

pub fn run(data_dir: &Path, args: ExportArgs) -> anyhow::Result<()> {
    let names = TaxonIndex::load(args.checklist.as_deref())?;
    let taxon = args
        .taxon
        .as_deref()
        .map(|n| {
            names
                .filter(n)
                .with_context(|| format!("`{n}` is not a species, genus, family, order or superorder on the checklist"))
        })
        .transpose()?;
    let audience = if args.full { Audience::Full } else { Audience::Public };
    let states = parse_states(&args.states).map_err(anyhow::Error::msg)?;
    let request = ExportRequest {
        format: match args.format {
            ExportFormat::Csv => Format::Csv,
            ExportFormat::Dwca => Format::Dwca,
            ExportFormat::Geojson => Format::Geojson,
            ExportFormat::Samples => Format::Samples,
        },
        audience,
        states: states.clone(),
        days: Days { from: args.from_date, to: args.to_date },
        bbox: args.bbox,
        taxon,
        base_url: args.public_url.origin().to_owned(),
        licence: args.licence,
        dataset: args.dataset.clone(),
    };
    let out: Box<dyn Write> = match &args.out {
        Some(path) => {
            let file = std::fs::File::create(path).with_context(|| format!("creating {}", path.display()))?;
            Box::new(std::io::BufWriter::with_capacity(1 << 16, file))
        }
        None => Box::new(std::io::BufWriter::new(std::io::stdout().lock())),
    };
    // The database alone: an export needs no photo folder and no duplicate index.
    std::fs::create_dir_all(data_dir).with_context(|| format!("creating the data directory {}", data_dir.display()))?;
    let store = Store::open(&data_dir.join("wrackline.sqlite3"))?;
    let summary = store.read_here(|conn| {
        let total = export::rows_to_read(conn, &request)?;
        let bar = indicatif::ProgressBar::with_draw_target(Some(total), indicatif::ProgressDrawTarget::stderr());
        let result = export::write_export(conn, &names, &request, out, &mut || bar.inc(1));
        bar.finish_and_clear();
        Ok(result)
    })??;
    let mut err = std::io::stderr().lock();
    let target = args.out.as_ref().map(|p| p.display().to_string()).unwrap_or_else(|| "standard output".into());
    writeln!(err, "wrote {} records ({}) to {target}", summary.records, describe_states(&states))?;
    if !args.full {
        writeln!(
            err,
            "public export: only confirmed records of taxa that are not sensitive at full precision, the rest generalised (use --full for assessors' positions as recorded)"
        )?;
    }
    for note in summary.notes() {
        writeln!(err, "{note}")?;
    }
    Ok(())
}
