//! Range figures per taxon and per period: records, distinct sites, EOO and AOO, and the
//! change between periods, with the criterion-B text and its cautions.
//!
//! The figures themselves come from the `analysis` crate; this module only decides which
//! records go into which group and period, and says what was left out and why.

use std::collections::{BTreeMap, BTreeSet};

use analysis::LatLon;
use analysis::criteria::{ASSESSMENT_CAUTION, RECORDING_CAUTION};
use analysis::range::{AooGrid, CENTRE_STEP_DEGREES, FAR_FROM_DEFAULT_DEGREES, RangeSummary, summary};
use serde::Serialize;

use super::dates::Period;
use super::input::PointRecord;
use crate::taxa::{TaxonFilter, TaxonIndex};

/// Positions closer than this (in degrees, on both axes) are one site (common practice:
/// about 10 m, inside the GPS uncertainty of a phone).
pub const SITE_DEGREES: f64 = 1e-4;

/// What to compute.
#[derive(Debug, Clone)]
pub struct RangeOptions {
    /// One species or higher taxon; `None` gives one group per species.
    pub taxon: Option<TaxonFilter>,
    /// The periods, side by side; empty means every record, whatever its date.
    pub periods: Vec<Period>,
    /// The grid AOO is counted on (see [`choose_grid`]).
    pub grid: AooGrid,
    /// Why that grid, in words.
    pub grid_choice: String,
    /// Which records were read, in words (e.g. "stored records in review state confirmed").
    pub records_used: String,
}

/// Figures for one taxon in one period.
#[derive(Debug, Clone, Serialize)]
pub struct PeriodRange {
    pub period: String,
    pub records: usize,
    pub sites: usize,
    /// `None` when the period has no record with a position.
    pub figures: Option<RangeSummary>,
    /// The positions that went in (for maps; not part of the JSON).
    #[serde(skip)]
    pub points: Vec<LatLon>,
}

/// From one period to the next.
#[derive(Debug, Clone, Serialize)]
pub struct PeriodChange {
    pub from: String,
    pub to: String,
    pub records: i64,
    pub sites: i64,
    /// Reported EOO (after §4.9), km², later minus earlier.
    pub eoo_km2: Option<f64>,
    pub aoo_km2: Option<f64>,
    /// The same as a percentage of the earlier figure.
    pub eoo_percent: Option<f64>,
    pub aoo_percent: Option<f64>,
}

/// One taxon's figures.
#[derive(Debug, Clone, Serialize)]
pub struct TaxonRange {
    pub taxon: String,
    /// Whether the name is on the checklist (a name from elsewhere may not be).
    pub on_checklist: bool,
    pub periods: Vec<PeriodRange>,
    pub changes: Vec<PeriodChange>,
}

/// Records not used, by reason.
#[derive(Debug, Clone, Default, Serialize)]
pub struct LeftOut {
    pub without_position: usize,
    pub without_name: usize,
    pub outside_every_period: usize,
    pub other_taxa: usize,
}

/// The whole answer.
#[derive(Debug, Clone, Serialize)]
pub struct RangeReport {
    pub records_used: String,
    /// The grid AOO was counted on (cell size and projection centre), for every taxon and period.
    pub grid: AooGrid,
    /// Why that grid, in words.
    pub grid_choice: String,
    pub records_read: usize,
    pub left_out: LeftOut,
    /// Names written on records that the checklist does not list, with how many records.
    pub names_not_on_checklist: BTreeMap<String, usize>,
    pub taxa: Vec<TaxonRange>,
    pub cautions: Vec<String>,
}

/// Where the positions that decide a grid's centre come from.
pub enum GridBasis<'a> {
    /// Stored records: the checklist's areas decide, never the records, so the grid stays
    /// the same for a deployment and periods and later reports compare.
    Stored(&'a species_key::Checklist),
    /// Records from a file: their own positions.
    File(&'a [PointRecord]),
}

/// The grid AOO is counted on, and why: the centre asked for (`--grid-centre`,
/// `grid_centre=`); else the rule of `AooGrid::near` (the default grid centred on
/// 52° N, 10° E while every position lies within 60° of arc of it; else centred on the
/// positions' mean rounded to 5°) applied to the checklist's area boxes for stored
/// records and to the records themselves for a file.
pub fn choose_grid(given: Option<LatLon>, basis: GridBasis<'_>) -> Result<(AooGrid, String), RangeError> {
    let default = AooGrid::default();
    if let Some(centre) = given {
        let grid = AooGrid::new(default.cell_size_km(), centre)?;
        return Ok((grid, format!("AOO grid centred on {}°, {}° as asked.", centre.lat(), centre.lon())));
    }
    let (positions, whose): (Vec<LatLon>, &str) = match basis {
        GridBasis::Stored(checklist) => (area_positions(checklist), "the checklist's areas lie"),
        GridBasis::File(records) => (records.iter().filter_map(|r| r.position).collect(), "these records lie"),
    };
    Ok(match AooGrid::near(&positions) {
        None => (
            default,
            format!(
                "AOO grid: the fixed default, centred on {}° N, {}° E (the centre of the European equal-area grid, \
                 EPSG:3035), used while every position lies within {FAR_FROM_DEFAULT_DEGREES}° of arc of it.",
                default.centre().lat(),
                default.centre().lon()
            ),
        ),
        Some(grid) => (
            grid,
            format!(
                "AOO grid centred on {}°, {}°: {whose} more than {FAR_FROM_DEFAULT_DEGREES}° of arc from the default centre \
                 (52° N, 10° E), so the grid is centred on their mean position rounded to whole {CENTRE_STEP_DEGREES}°.",
                grid.centre().lat(),
                grid.centre().lon()
            ),
        ),
    })
}

/// Corners and centres of the checklist's area boxes.
fn area_positions(checklist: &species_key::Checklist) -> Vec<LatLon> {
    checklist
        .areas()
        .iter()
        .filter_map(|a| a.bounds)
        .flat_map(|[west, south, east, north]| {
            [(south, west), (south, east), (north, west), (north, east), ((south + north) / 2.0, (west + east) / 2.0)]
        })
        .filter_map(|(lat, lon)| LatLon::new(lat, lon).ok())
        .collect()
}

/// Reads `LAT,LON` in decimal degrees (a grid centre), naming what is wrong.
pub fn parse_centre(text: &str) -> Result<LatLon, String> {
    let bad = || format!("`{text}` is not LAT,LON in decimal degrees (e.g. -17,179)");
    let (lat, lon) = text.split_once(',').ok_or_else(bad)?;
    let (lat, lon) = (lat.trim().parse::<f64>().map_err(|_| bad())?, lon.trim().parse::<f64>().map_err(|_| bad())?);
    LatLon::new(lat, lon).map_err(|err| format!("`{text}`: {err}"))
}

/// Why figures could not be computed.
#[derive(Debug, thiserror::Error)]
pub enum RangeError {
    #[error("{0}")]
    Aoo(#[from] analysis::range::AooError),
}

/// Groups `records` by taxon and period and computes each group's figures.
pub fn range_report(
    records: &[PointRecord],
    names: &TaxonIndex,
    options: &RangeOptions,
) -> Result<RangeReport, RangeError> {
    let mut left_out = LeftOut::default();
    let mut not_listed = BTreeMap::new();
    let mut groups: BTreeMap<(String, bool), Vec<&PointRecord>> = BTreeMap::new();
    for record in records {
        let Some(name) = record.name.as_deref().map(str::trim).filter(|n| !n.is_empty()) else {
            left_out.without_name += 1;
            continue;
        };
        let taxon = names.resolve(name);
        if taxon.is_none() {
            *not_listed.entry(name.to_owned()).or_insert(0) += 1;
        }
        let group = match (&options.taxon, taxon) {
            (Some(filter), Some(taxon)) if filter.contains(taxon) => (filter.name.clone(), true),
            (Some(filter), None) if filter.name.eq_ignore_ascii_case(name) => (filter.name.clone(), true),
            (Some(_), _) => {
                left_out.other_taxa += 1;
                continue;
            }
            (None, Some(taxon)) => (taxon.scientific_name.clone(), true),
            (None, None) => (name.to_owned(), false),
        };
        if record.position.is_none() {
            left_out.without_position += 1;
            continue;
        }
        groups.entry(group).or_default().push(record);
    }
    let periods = if options.periods.is_empty() { vec![Period::between(None, None)] } else { options.periods.clone() };
    let mut taxa = Vec::new();
    for ((taxon, on_checklist), members) in groups {
        let mut figures = Vec::new();
        for period in &periods {
            let inside: Vec<&PointRecord> =
                members.iter().copied().filter(|r| in_period(r, period, options.periods.is_empty())).collect();
            figures.push(period_range(period, &inside, &options.grid)?);
        }
        left_out.outside_every_period +=
            members.iter().filter(|r| !periods.iter().any(|p| in_period(r, p, options.periods.is_empty()))).count();
        let changes = figures.windows(2).map(|pair| change(&pair[0], &pair[1])).collect();
        taxa.push(TaxonRange { taxon, on_checklist, periods: figures, changes });
    }
    Ok(RangeReport {
        records_used: options.records_used.clone(),
        grid: options.grid,
        grid_choice: options.grid_choice.clone(),
        records_read: records.len(),
        left_out,
        names_not_on_checklist: not_listed,
        taxa,
        cautions: vec![ASSESSMENT_CAUTION.to_owned(), RECORDING_CAUTION.to_owned()],
    })
}

/// With no periods asked for, every record counts, dated or not.
fn in_period(record: &PointRecord, period: &Period, every_record: bool) -> bool {
    every_record || record.when.is_some_and(|span| period.holds(span))
}

fn period_range(period: &Period, records: &[&PointRecord], grid: &AooGrid) -> Result<PeriodRange, RangeError> {
    let points: Vec<LatLon> = records.iter().filter_map(|r| r.position).collect();
    let sites: BTreeSet<(i64, i64)> = points
        .iter()
        .map(|p| ((p.lat() / SITE_DEGREES).round() as i64, (p.lon() / SITE_DEGREES).round() as i64))
        .collect();
    let figures = if points.is_empty() { None } else { Some(summary(&points, grid)?) };
    Ok(PeriodRange { period: period.label.clone(), records: records.len(), sites: sites.len(), figures, points })
}

fn change(earlier: &PeriodRange, later: &PeriodRange) -> PeriodChange {
    let pick = |p: &PeriodRange, f: fn(&RangeSummary) -> f64| p.figures.as_ref().map(f);
    let difference = |f: fn(&RangeSummary) -> f64| match (pick(earlier, f), pick(later, f)) {
        (Some(a), Some(b)) => (Some(b - a), (a > 0.0).then(|| 100.0 * (b - a) / a)),
        _ => (None, None),
    };
    let (eoo_km2, eoo_percent) = difference(|s| s.eoo_km2);
    let (aoo_km2, aoo_percent) = difference(|s| s.aoo.area_km2);
    PeriodChange {
        from: earlier.period.clone(),
        to: later.period.clone(),
        records: later.records as i64 - earlier.records as i64,
        sites: later.sites as i64 - earlier.sites as i64,
        eoo_km2,
        aoo_km2,
        eoo_percent,
        aoo_percent,
    }
}

/// The report as plain text for a terminal.
pub fn render_text(report: &RangeReport) -> String {
    let mut out = String::new();
    out.push_str(&format!("Records used: {} ({} read).\n", report.records_used, report.records_read));
    out.push_str(&format!("{}\n", report.grid_choice));
    let l = &report.left_out;
    out.push_str(&format!(
        "Left out: {} without a position, {} without a name, {} of other taxa, {} outside every period.\n",
        l.without_position, l.without_name, l.other_taxa, l.outside_every_period
    ));
    if !report.names_not_on_checklist.is_empty() {
        let names: Vec<String> = report.names_not_on_checklist.iter().map(|(n, c)| format!("{n} ({c})")).collect();
        out.push_str(&format!("Names not on the checklist (kept as written): {}.\n", names.join(", ")));
    }
    if report.taxa.is_empty() {
        out.push_str("\nNo records to compute figures from.");
        if report.records_read == 0 && report.records_used.starts_with("stored") {
            out.push_str(
                " Records stay `awaiting review` until reviewers confirm them; `--state any` uses every stored record.",
            );
        }
        out.push('\n');
    }
    for taxon in &report.taxa {
        out.push_str(&render_taxon(taxon));
    }
    out.push('\n');
    for caution in &report.cautions {
        out.push_str(&format!("Caution: {caution}\n"));
    }
    out
}

fn render_taxon(taxon: &TaxonRange) -> String {
    let mut out =
        format!("\n== {}{} ==\n", taxon.taxon, if taxon.on_checklist { "" } else { " (not on the checklist)" });
    out.push_str(&format!(
        "{:<28} {:>8} {:>6} {:>14} {:>10} {:>14}\n",
        "period", "records", "sites", "EOO km²", "AOO km²", "AOO min km²"
    ));
    for p in &taxon.periods {
        let (eoo, aoo, min) = match &p.figures {
            Some(f) => (
                format!("{:.1}{}", f.eoo_km2, if f.eoo_raised_to_aoo { "*" } else { "" }),
                format!("{:.0}", f.aoo.area_km2),
                format!("{:.0}", f.aoo.min_area_km2),
            ),
            None => ("-".into(), "-".into(), "-".into()),
        };
        out.push_str(&format!(
            "{:<28} {:>8} {:>6} {:>14} {:>10} {:>14}\n",
            p.period, p.records, p.sites, eoo, aoo, min
        ));
    }
    for c in &taxon.changes {
        let signed = |v: Option<f64>, pct: Option<f64>| match (v, pct) {
            (Some(v), Some(p)) => format!("{v:+.1} km² ({p:+.0}%)"),
            (Some(v), None) => format!("{v:+.1} km²"),
            _ => "-".into(),
        };
        out.push_str(&format!(
            "change {} → {}: records {:+}, sites {:+}, EOO {}, AOO {}\n",
            c.from,
            c.to,
            c.records,
            c.sites,
            signed(c.eoo_km2, c.eoo_percent),
            signed(c.aoo_km2, c.aoo_percent)
        ));
    }
    if taxon.periods.iter().any(|p| p.figures.as_ref().is_some_and(|f| f.eoo_raised_to_aoo)) {
        out.push_str("* EOO raised to the AOO because the hull is smaller (IUCN Guidelines §4.9).\n");
    }
    for p in &taxon.periods {
        if let Some(f) = &p.figures {
            out.push_str(&format!("{}: {}\n{}: {}\n", p.period, f.method, p.period, f.criterion_b.text));
        }
    }
    out
}
