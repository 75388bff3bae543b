//! `wrackline range`: records, sites, EOO and AOO per taxon and period.

use std::path::{Path, PathBuf};

use anyhow::Context as _;
use chrono::NaiveDate;

use super::{RecordSource, print};
use crate::assess::dates::Period;
use crate::assess::map::taxon_map;
use crate::assess::range::{GridBasis, RangeOptions, choose_grid, parse_centre, range_report, render_text};

#[derive(Debug, clap::Args)]
pub struct RangeArgs {
    #[command(flatten)]
    pub source: RecordSource,
    /// A period of whole years, e.g. 2015-2019; repeat to compare periods side by side.
    #[arg(long = "period", conflicts_with_all = ["from_date", "to_date"])]
    pub periods: Vec<String>,
    /// Only records on or after this day (YYYY-MM-DD).
    #[arg(long)]
    pub from_date: Option<NaiveDate>,
    /// Only records on or before this day (YYYY-MM-DD).
    #[arg(long)]
    pub to_date: Option<NaiveDate>,
    /// Centre of the AOO grid's equal-area projection, LAT,LON in degrees (e.g. -17,179).
    /// Default: 52,10 while every position lies within 60° of arc of it; else the records'
    /// mean rounded to 5° (for stored records, the checklist's areas' mean, so it stays fixed).
    #[arg(long, value_name = "LAT,LON", value_parser = parse_centre, allow_hyphen_values = true)]
    pub grid_centre: Option<analysis::LatLon>,
    /// Also draw a map (SVG) of each taxon: FILE, or `FILE-<taxon>.svg` when there are several.
    #[arg(long, value_name = "FILE")]
    pub svg: Option<PathBuf>,
}

pub fn run(data_dir: &Path, args: RangeArgs) -> anyhow::Result<()> {
    let loaded = args.source.load(data_dir)?;
    let mut periods = args
        .periods
        .iter()
        .map(|p| Period::parse_years(p).map_err(anyhow::Error::msg))
        .collect::<anyhow::Result<Vec<_>>>()?;
    if args.from_date.is_some() || args.to_date.is_some() {
        periods.push(Period::between(args.from_date, args.to_date));
    }
    let basis = match args.source.from_file {
        Some(_) => GridBasis::File(&loaded.records),
        None => GridBasis::Stored(loaded.names.checklist()),
    };
    let (grid, grid_choice) = choose_grid(args.grid_centre, basis).context("choosing the AOO grid")?;
    let options = RangeOptions { taxon: loaded.taxon, periods, grid, grid_choice, records_used: loaded.records_used };
    let report = range_report(&loaded.records, &loaded.names, &options).context("computing range figures")?;
    if let Some(path) = &args.svg {
        for taxon in &report.taxa {
            let file = if report.taxa.len() == 1 { path.clone() } else { suffixed(path, &taxon.taxon) };
            std::fs::write(&file, taxon_map(taxon, &options.grid))
                .with_context(|| format!("writing {}", file.display()))?;
            eprintln!("map of {} written to {}", taxon.taxon, file.display());
        }
    }
    print(args.source.json, &report, || render_text(&report))
}

/// `maps.svg` + `Raja clavata` → `maps-raja-clavata.svg`.
fn suffixed(path: &Path, taxon: &str) -> PathBuf {
    let stem = path.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_else(|| "map".into());
    let slug: String = taxon.to_lowercase().chars().map(|c| if c.is_alphanumeric() { c } else { '-' }).collect();
    path.with_file_name(format!("{stem}-{slug}.svg"))
}
