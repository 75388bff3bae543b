//! `wrackline trend`: the effort-corrected yearly trend over the assessment window.

use std::path::{Path, PathBuf};

use anyhow::Context as _;

use super::{RecordSource, print};
use crate::assess::chart::trend_chart;
use crate::assess::trend::{
    EffortUnit, YearTotal, generation_length, rate_words, read_year_counts, render_text, stored_trend_input,
    trend_report,
};

#[derive(Debug, clap::Args)]
pub struct TrendArgs {
    #[command(flatten)]
    pub source: RecordSource,
    /// Generation length in years (default: the checklist's for --taxon).
    #[arg(long)]
    pub generation_length: Option<f64>,
    /// Also draw the trend chart (SVG) to this file.
    #[arg(long, value_name = "FILE")]
    pub svg: Option<PathBuf>,
    /// On stored records: encounter rates per kilometre or per hour walked on survey walks
    /// where every find was reported.
    #[arg(long, value_enum, default_value = "km")]
    pub effort: EffortUnit,
}

pub fn run(data_dir: &Path, args: TrendArgs) -> anyhow::Result<()> {
    let names = crate::taxa::TaxonIndex::load(args.source.checklist.as_deref())?;
    let taxon = args.source.taxon.as_deref().map(|n| names.filter(n)).unwrap_or(None);
    if let (Some(name), None) = (&args.source.taxon, &taxon) {
        anyhow::bail!("`{name}` is not a species, genus, family, order or superorder on the checklist");
    }
    let generation = generation_length(args.generation_length, taxon.as_ref(), &names)?;
    let (years, counts, used, notes) = match &args.source.from_file {
        Some(path) => {
            let years = read_year_counts(path)?;
            let counts = YearTotal::of(&years);
            (years, counts, format!("yearly counts and effort in {}", path.display()), Vec::new())
        }
        None => {
            let loaded = args.source.load(data_dir)?;
            let state = crate::state::AppState::open(data_dir, None, crate::taxa::load_checklist(None)?)?;
            let walks = state.store.run_here(|conn| crate::store::walks::list_walks(conn))?;
            let (years, counts, notes) =
                stored_trend_input(&loaded.records, &walks, taxon.as_ref(), &names, args.effort);
            (years, counts, loaded.records_used, notes)
        }
    };
    let report = trend_report(years, counts, generation, used, notes)?;
    if let Some(path) = &args.svg {
        let title = taxon.as_ref().map(|t| t.name.clone()).unwrap_or_else(|| "Yearly trend".into());
        let rate = match args.source.from_file.as_ref() {
            Some(_) => "Animals per unit of the file's effort each year",
            None => rate_words(&report, args.effort),
        };
        std::fs::write(path, trend_chart(&title, rate, &report.years, &report.trend))
            .with_context(|| format!("writing {}", path.display()))?;
        eprintln!("trend chart written to {}", path.display());
    }
    print(args.source.json, &report, || render_text(&report))
}
