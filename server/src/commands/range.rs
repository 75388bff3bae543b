//! `wrackline range`: records, sites, EOO and AOO per taxon and period.

use std::path::{Path, PathBuf};

use anyhow::Context as _;
use chrono::NaiveDate;

use super::{RecordSource, print};
use crate::assess::dates::Period;
use crate::assess::map::taxon_map;
use crate::assess::range::{
    GridBasis, RangeOptions, choose_grid, parse_centre, parse_distance_km, range_report, render_text,
};

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
    /// Centre of the first AOO grid's equal-area projection, LAT,LON in degrees (e.g. -17,179).
    /// Default: for stored records 52,10 while it reaches every area of the checklist, else
    /// their mean rounded to 5°; for a file, the same rule on each taxon's records. Records
    /// more than 60° of arc from every grid get a grid of their own.
    #[arg(long, value_name = "LAT,LON", value_parser = parse_centre, allow_hyphen_values = true)]
    pub grid_centre: Option<analysis::LatLon>,
    /// Records linked by steps of at most this many km form one cluster (the location guide).
    #[arg(long, value_name = "KM", value_parser = parse_distance_km, default_value = "10")]
    pub cluster_km: f64,
    /// Records farther than this many km from every other record are listed for review.
    #[arg(long, value_name = "KM", value_parser = parse_distance_km, default_value = "500")]
    pub outlier_km: f64,
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
        Some(_) => GridBasis::File,
        None => GridBasis::Stored(loaded.names.checklist()),
    };
    let (first_grid, grid_choice) = choose_grid(args.grid_centre, basis).context("choosing the AOO grid")?;
    let options = RangeOptions {
        taxon: loaded.taxon,
        periods,
        first_grid,
        grid_choice,
        records_used: loaded.records_used,
        cluster_km: args.cluster_km,
        outlier_km: args.outlier_km,
        resamples: analysis::range::DEFAULT_RESAMPLES,
    };
    let report = range_report(&loaded.records, &loaded.names, &options);
    if let Some(path) = &args.svg {
        for taxon in &report.taxa {
            let file = if report.taxa.len() == 1 { path.clone() } else { suffixed(path, &taxon.taxon) };
            std::fs::write(&file, taxon_map(taxon)).with_context(|| format!("writing {}", file.display()))?;
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
