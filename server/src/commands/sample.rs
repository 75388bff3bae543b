//! `wrackline sample show ID`: finding an animal from a sample's id or barcode — the
//! record, its place and photos, the animal's other samples and where each is kept,
//! the carcass's fate and the trail of changes.

use std::path::Path;

use anyhow::Context as _;
use clap::Subcommand;
use shared_types::SampleLookup;

use crate::store::{Store, fieldwork};

#[derive(Debug, Subcommand)]
pub enum SampleCommand {
    /// Everything known about the animal a sample came from.
    Show {
        /// The sample's own id or barcode.
        code: String,
        /// Print JSON for scripts instead of text.
        #[arg(long)]
        json: bool,
    },
}

pub fn run(data_dir: &Path, command: SampleCommand) -> anyhow::Result<()> {
    let SampleCommand::Show { code, json } = command;
    let database = data_dir.join("wrackline.sqlite3");
    anyhow::ensure!(database.exists(), "no wrackline database in {} (set --data-dir)", data_dir.display());
    let store = Store::open(&database).with_context(|| format!("opening the database in {}", data_dir.display()))?;
    let found = store.read_here(|conn| fieldwork::lookup(conn, &code))?;
    let lookup = found.with_context(|| format!("no sample with the id {code} in {}", data_dir.display()))?;
    super::print(json, &lookup, || describe(&lookup))
}

/// The lookup in words, as a person reads it.
pub fn describe(lookup: &SampleLookup) -> String {
    let sample = &lookup.sample;
    let record = &lookup.record;
    let s = &record.submission;
    let mut lines = vec![
        format!(
            "Sample {}: {}, {}, stored at {}, held by {}",
            sample.code,
            sample.kind.label(),
            sample.preservation.label(),
            sample.stored_at,
            sample.held_by
        ),
        format!("Added by {} on {}", sample.added_by, sample.added_at.format("%Y-%m-%d %H:%M UTC")),
        String::new(),
        format!("Animal: record {} ({})", s.client_id, record.review_state.label()),
        format!("  seen {}", s.observed_at.format("%Y-%m-%d %H:%M %:z")),
        match s.position {
            Some(p) => format!(
                "  at {:.5}, {:.5}{}",
                p.latitude.get(),
                p.longitude.get(),
                p.accuracy_m.map(|a| format!(" ± {:.0} m", a.get())).unwrap_or_default()
            ),
            None => "  no position given".to_owned(),
        },
        format!("  named by the observer: {}", s.species_guess.as_ref().map_or("nothing", |t| t.as_str())),
        format!("  {}, {}", s.condition.label(), s.setting.label()),
    ];
    for photo in &record.photos {
        lines.push(format!("  photo /photos/{}", photo.sha256));
    }
    lines.push(String::new());
    lines.push(format!("Samples of this animal ({}):", lookup.samples_of_the_animal.len()));
    for other in &lookup.samples_of_the_animal {
        let here = if other.code == sample.code { " (this one)" } else { "" };
        lines.push(format!(
            "  {}{here}: {}, {}, stored at {}, held by {}",
            other.code,
            other.kind.label(),
            other.preservation.label(),
            other.stored_at,
            other.held_by
        ));
    }
    if let Some(carcass) = &lookup.carcass {
        lines.push(format!("Carcass: {} (recorded by {})", carcass.report.fate.label(), carcass.recorded_by));
    }
    if !lookup.events.is_empty() {
        lines.push(String::new());
        lines.push("Trail:".to_owned());
        for event in &lookup.events {
            lines.push(format!("  {} {}: {}", event.at.format("%Y-%m-%d %H:%M UTC"), event.by, event.detail));
        }
    }
    lines.join("\n")
}
