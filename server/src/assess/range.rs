//! Range figures per taxon and per period: records, distinct sites, EOO and AOO, the checks
//! beside them (resampling intervals, influential places, outliers, the location guide) and
//! the change between periods with its uncertainty, with the criterion-B text and cautions.
//!
//! The figures themselves come from the `analysis` crate; this module only decides which
//! records go into which group and period, which grids each taxon is counted on, turns
//! record numbers into the record ids a reviewer can look up, and says what was left out
//! and why.

use std::collections::{BTreeMap, BTreeSet};

use analysis::LatLon;
use analysis::criteria::{ASSESSMENT_CAUTION, RECORDING_CAUTION};
use analysis::range::{
    AooGrid, CENTRE_STEP_DEGREES, DEFAULT_SEED, FigureOptions, GridPlan, LocationGuide, PeriodComparison, RangeFigures,
    RangeSummary, Stability, ZONE_REACH_DEGREES, compare_periods, figures,
};
use serde::Serialize;

use super::dates::Period;
use super::input::PointRecord;
use crate::taxa::{TaxonFilter, TaxonIndex};

/// Positions closer than this (in degrees, on both axes) are one site (common practice:
/// about 10 m, inside the GPS uncertainty of a phone).
pub const SITE_DEGREES: f64 = 1e-4;
/// Days in a year, for the length of a period in years (the Julian year).
const DAYS_PER_YEAR: f64 = 365.25;

/// How a taxon's first AOO grid is chosen; records no grid reaches get zones of their own.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum FirstGrid {
    /// The same first grid for every taxon (asked for, or fixed for the deployment).
    Fixed(AooGrid),
    /// By the rule on each taxon's own records (records read from a file).
    PerTaxon,
}

/// What to compute.
#[derive(Debug, Clone)]
pub struct RangeOptions {
    /// One species or higher taxon; `None` gives one group per species.
    pub taxon: Option<TaxonFilter>,
    /// The periods, side by side; empty means every record, whatever its date.
    pub periods: Vec<Period>,
    /// How each taxon's first grid is chosen (see [`choose_grid`]).
    pub first_grid: FirstGrid,
    /// Why, in words.
    pub grid_choice: String,
    /// Which records were read, in words (e.g. "stored records in review state confirmed").
    pub records_used: String,
    /// The linking distance of the location guide's clusters, km.
    pub cluster_km: f64,
    /// Records farther than this from every other record are listed as outliers, km.
    pub outlier_km: f64,
    /// Resamples behind the stability intervals and the period comparisons.
    pub resamples: usize,
}

/// A place a reviewer should look at, with the records made there.
#[derive(Debug, Clone, Serialize)]
pub struct PlaceToCheck {
    pub position: LatLon,
    /// The records' ids (`urn:uuid:…` for stored records, as in the exports; the file's
    /// occurrenceID or line for a file).
    pub records: Vec<String>,
    /// For an outlier: the distance to the nearest other record, km.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub nearest_km: Option<f64>,
    /// For an influential place: the change in the hull area without it, km².
    #[serde(skip_serializing_if = "Option::is_none")]
    pub eoo_change_km2: Option<f64>,
    /// For an influential place: the change in AOO without it, km².
    #[serde(skip_serializing_if = "Option::is_none")]
    pub aoo_change_km2: Option<f64>,
}

/// Figures for one taxon in one period.
#[derive(Debug, Clone, Serialize)]
pub struct PeriodRange {
    pub period: String,
    pub records: usize,
    pub sites: usize,
    /// EOO, AOO and criterion B; `None` when the period has no record with a position.
    pub figures: Option<RangeSummary>,
    /// How the figures vary when the records are resampled.
    pub stability: Option<Stability>,
    /// The places whose removal changes EOO most: check these first.
    pub influential_places: Vec<PlaceToCheck>,
    /// Places alone in their AOO cell (each one cell of the AOO).
    pub places_alone_in_their_cell: usize,
    /// Records far from all others, for review; they are in the figures.
    pub outliers: Vec<PlaceToCheck>,
    /// EOO without the outliers, for comparison.
    pub eoo_km2_without_outliers: Option<f64>,
    /// Clusters at a stated distance, as a guide to locations.
    pub location_guide: Option<LocationGuide>,
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
    /// The change with its uncertainty: records per year, and EOO and AOO at equal numbers
    /// of records; `None` when a period has no record with a position.
    pub comparison: Option<PeriodComparison>,
}

/// One taxon's figures.
#[derive(Debug, Clone, Serialize)]
pub struct TaxonRange {
    pub taxon: String,
    /// Whether the name is on the checklist (a name from elsewhere may not be).
    pub on_checklist: bool,
    /// The grids AOO is counted on for this taxon, zone by zone (the same in every period).
    pub grids: Vec<AooGrid>,
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
    /// The first grid every taxon starts from, when it is the same for all (stored records
    /// or a centre asked for); each taxon lists its own grids.
    pub grid: Option<AooGrid>,
    /// How grids were chosen, in words.
    pub grid_choice: String,
    pub records_read: usize,
    pub left_out: LeftOut,
    /// Names written on records that the checklist does not list, with how many records.
    pub names_not_on_checklist: BTreeMap<String, usize>,
    pub taxa: Vec<TaxonRange>,
    pub cautions: Vec<String>,
}

/// Where the positions that decide the first grid come from.
pub enum GridBasis<'a> {
    /// Stored records: the checklist's areas decide, never the records, so the first grid
    /// stays the same for a deployment and periods and later reports compare.
    Stored(&'a species_key::Checklist),
    /// Records from a file: each taxon's own positions.
    File,
}

/// How the first grid is chosen, and why: the centre asked for (`--grid-centre`,
/// `grid_centre=`); for stored records the rule of `AooGrid::near` applied to the
/// checklist's area boxes (the default grid centred on 52° N, 10° E while it reaches them
/// all, else their mean rounded to 5°); for a file, the same rule on each taxon's records.
/// Records no grid reaches get zones of their own (`analysis::range::GridPlan`).
pub fn choose_grid(given: Option<LatLon>, basis: GridBasis<'_>) -> Result<(FirstGrid, String), RangeError> {
    let default = AooGrid::default();
    let zones = format!(
        " Records more than {ZONE_REACH_DEGREES}° of arc from every grid so far are counted on a grid of their own, \
         centred on their mean position rounded to whole {CENTRE_STEP_DEGREES}°."
    );
    if let Some(centre) = given {
        let grid = AooGrid::new(default.cell_size_km(), centre)?;
        return Ok((
            FirstGrid::Fixed(grid),
            format!("AOO grid centred on {}°, {}° as asked.{zones}", centre.lat(), centre.lon()),
        ));
    }
    Ok(match basis {
        GridBasis::Stored(checklist) => match AooGrid::near(&area_positions(checklist)) {
            None => (
                FirstGrid::Fixed(default),
                format!(
                    "AOO grid: the fixed default, centred on {}° N, {}° E (the centre of the European equal-area grid, \
                     EPSG:3035), which reaches every area of the checklist.{zones}",
                    default.centre().lat(),
                    default.centre().lon()
                ),
            ),
            Some(grid) => (
                FirstGrid::Fixed(grid),
                format!(
                    "AOO grid centred on {}°, {}°: the checklist's areas lie more than {ZONE_REACH_DEGREES}° of arc from \
                     the default centre (52° N, 10° E), so the grid is centred on their mean position rounded to whole \
                     {CENTRE_STEP_DEGREES}°.{zones}",
                    grid.centre().lat(),
                    grid.centre().lon()
                ),
            ),
        },
        GridBasis::File => (
            FirstGrid::PerTaxon,
            format!(
                "AOO grids chosen per taxon: the default grid centred on 52° N, 10° E when it reaches all of a taxon's \
                 records (within {ZONE_REACH_DEGREES}° of arc), else grids centred on the records' mean position rounded \
                 to whole {CENTRE_STEP_DEGREES}°.{zones}"
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

/// Reads a distance in km for the clusters or outliers, naming what is wrong.
pub fn parse_distance_km(text: &str) -> Result<f64, String> {
    text.trim()
        .parse::<f64>()
        .ok()
        .filter(|km| (0.001..=20_000.0).contains(km))
        .ok_or_else(|| format!("`{text}` is not a distance between 0.001 and 20000 km"))
}

/// Why figures could not be computed.
#[derive(Debug, thiserror::Error)]
pub enum RangeError {
    #[error("{0}")]
    Aoo(#[from] analysis::range::AooError),
}

/// Groups `records` by taxon and period and computes each group's figures.
pub fn range_report(records: &[PointRecord], names: &TaxonIndex, options: &RangeOptions) -> RangeReport {
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
    let every_record = options.periods.is_empty();
    let periods = if every_record { vec![Period::between(None, None)] } else { options.periods.clone() };
    let mut taxa = Vec::new();
    for ((taxon, on_checklist), members) in groups {
        let all_points: Vec<LatLon> = members.iter().filter_map(|r| r.position).collect();
        let plan = match options.first_grid {
            FirstGrid::Fixed(grid) => GridPlan::starting_with(grid).covering(&all_points),
            FirstGrid::PerTaxon => GridPlan::for_points(&all_points),
        };
        let figure_options = FigureOptions {
            plan: plan.clone(),
            cluster_km: options.cluster_km,
            outlier_km: options.outlier_km,
            resamples: options.resamples,
            seed: DEFAULT_SEED,
            influence_places: 10,
        };
        let mut by_period = Vec::new();
        for period in &periods {
            let inside: Vec<&PointRecord> =
                members.iter().copied().filter(|r| in_period(r, period, every_record)).collect();
            by_period.push(period_range(period, &inside, &figure_options));
        }
        left_out.outside_every_period +=
            members.iter().filter(|r| !periods.iter().any(|p| in_period(r, p, every_record))).count();
        let changes = by_period
            .windows(2)
            .zip(periods.windows(2))
            .map(|(pair, spans)| {
                change(&pair[0], &pair[1], years_of(&spans[0]).zip(years_of(&spans[1])), &figure_options)
            })
            .collect();
        taxa.push(TaxonRange { taxon, on_checklist, grids: plan.grids().to_vec(), periods: by_period, changes });
    }
    RangeReport {
        records_used: options.records_used.clone(),
        grid: match options.first_grid {
            FirstGrid::Fixed(grid) => Some(grid),
            FirstGrid::PerTaxon => None,
        },
        grid_choice: options.grid_choice.clone(),
        records_read: records.len(),
        left_out,
        names_not_on_checklist: not_listed,
        taxa,
        cautions: vec![ASSESSMENT_CAUTION.to_owned(), RECORDING_CAUTION.to_owned()],
    }
}

/// With no periods asked for, every record counts, dated or not.
fn in_period(record: &PointRecord, period: &Period, every_record: bool) -> bool {
    every_record || record.when.is_some_and(|span| period.holds(span))
}

/// A period's length in years, when both its ends are dates.
fn years_of(period: &Period) -> Option<f64> {
    let open = period.first == chrono::NaiveDate::MIN || period.last == chrono::NaiveDate::MAX;
    (!open).then(|| ((period.last - period.first).num_days() + 1) as f64 / DAYS_PER_YEAR)
}

fn period_range(period: &Period, records: &[&PointRecord], options: &FigureOptions) -> PeriodRange {
    let points: Vec<LatLon> = records.iter().filter_map(|r| r.position).collect();
    let labels: Vec<&str> = records.iter().filter(|r| r.position.is_some()).map(|r| r.label.as_str()).collect();
    let sites: BTreeSet<(i64, i64)> = points
        .iter()
        .map(|p| ((p.lat() / SITE_DEGREES).round() as i64, (p.lon() / SITE_DEGREES).round() as i64))
        .collect();
    let empty = PeriodRange {
        period: period.label.clone(),
        records: records.len(),
        sites: sites.len(),
        figures: None,
        stability: None,
        influential_places: Vec::new(),
        places_alone_in_their_cell: 0,
        outliers: Vec::new(),
        eoo_km2_without_outliers: None,
        location_guide: None,
        points: Vec::new(),
    };
    if points.is_empty() {
        return empty;
    }
    let RangeFigures {
        summary,
        stability,
        influence,
        places_alone_in_their_cell,
        outliers,
        eoo_km2_without_outliers,
        location_guide,
    } = figures(&points, options);
    let ids = |indices: &[usize]| indices.iter().map(|&i| labels[i].to_owned()).collect();
    PeriodRange {
        figures: Some(summary),
        stability,
        influential_places: influence
            .iter()
            .map(|i| PlaceToCheck {
                position: i.position,
                records: ids(&i.records),
                nearest_km: None,
                eoo_change_km2: i.eoo_change_km2,
                aoo_change_km2: Some(i.aoo_change_km2),
            })
            .collect(),
        places_alone_in_their_cell,
        outliers: outliers
            .iter()
            .map(|o| PlaceToCheck {
                position: o.position,
                records: ids(&o.records),
                nearest_km: Some(o.nearest_km),
                eoo_change_km2: None,
                aoo_change_km2: None,
            })
            .collect(),
        eoo_km2_without_outliers,
        location_guide: Some(location_guide),
        points,
        ..empty
    }
}

fn change(
    earlier: &PeriodRange,
    later: &PeriodRange,
    years: Option<(f64, f64)>,
    options: &FigureOptions,
) -> PeriodChange {
    let pick = |p: &PeriodRange, f: fn(&RangeSummary) -> Option<f64>| p.figures.as_ref().and_then(f);
    let difference = |f: fn(&RangeSummary) -> Option<f64>| match (pick(earlier, f), pick(later, f)) {
        (Some(a), Some(b)) => (Some(b - a), (a > 0.0).then(|| 100.0 * (b - a) / a)),
        _ => (None, None),
    };
    let (eoo_km2, eoo_percent) = difference(|s| s.eoo_km2);
    let (aoo_km2, aoo_percent) = difference(|s| Some(s.aoo.area_km2));
    let comparison = (!earlier.points.is_empty() && !later.points.is_empty()).then(|| {
        compare_periods(
            &earlier.points,
            &later.points,
            years.map(|(a, b)| [a, b]),
            &options.plan,
            options.resamples,
            options.seed,
        )
    });
    PeriodChange {
        from: earlier.period.clone(),
        to: later.period.clone(),
        records: later.records as i64 - earlier.records as i64,
        sites: later.sites as i64 - earlier.sites as i64,
        eoo_km2,
        aoo_km2,
        eoo_percent,
        aoo_percent,
        comparison,
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
                f.eoo_km2
                    .map_or("not given".into(), |e| format!("{e:.1}{}", if f.eoo_raised_to_aoo { "*" } else { "" })),
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
        if let Some(comparison) = &c.comparison {
            out.push_str(&format!("  {}\n", comparison.text));
        }
    }
    if taxon.periods.iter().any(|p| p.figures.as_ref().is_some_and(|f| f.eoo_raised_to_aoo)) {
        out.push_str("* EOO raised to the AOO because the hull is smaller (IUCN Guidelines §4.9).\n");
    }
    for p in &taxon.periods {
        out.push_str(&render_checks(p));
    }
    out
}

fn render_checks(p: &PeriodRange) -> String {
    let Some(f) = &p.figures else { return String::new() };
    let mut out = format!("{}: {}\n{}: {}\n", p.period, f.method, p.period, f.criterion_b.text);
    if let Some(eoo_problem) = &f.eoo_problem {
        out.push_str(&format!("{}: {eoo_problem}\n", p.period));
    }
    if let Some(stability) = &p.stability {
        out.push_str(&format!("{}: {}\n", p.period, stability.text));
    }
    if !p.outliers.is_empty() {
        out.push_str(&format!(
            "{}: {} far from every other record (listed for review; they are in the figures{}):\n",
            p.period,
            if p.outliers.len() == 1 { "1 place lies".to_owned() } else { format!("{} places lie", p.outliers.len()) },
            p.eoo_km2_without_outliers.map(|e| format!("; EOO without them {e:.0} km²")).unwrap_or_default()
        ));
        for o in &p.outliers {
            out.push_str(&format!(
                "  {:.4}, {:.4}: {:.0} km from the nearest other record; {}\n",
                o.position.lat(),
                o.position.lon(),
                o.nearest_km.unwrap_or(f64::NAN),
                o.records.join(", ")
            ));
        }
    }
    if !p.influential_places.is_empty() {
        out.push_str(&format!(
            "{}: the places EOO rests on most (check these first; {} places are alone in their AOO cell):\n",
            p.period, p.places_alone_in_their_cell
        ));
        for i in p.influential_places.iter().take(5) {
            out.push_str(&format!(
                "  {:.4}, {:.4}: without it EOO {:+.0} km², AOO {:+.0} km²; {}\n",
                i.position.lat(),
                i.position.lon(),
                i.eoo_change_km2.unwrap_or(0.0),
                i.aoo_change_km2.unwrap_or(0.0),
                i.records.join(", ")
            ));
        }
    }
    if let Some(guide) = &p.location_guide {
        out.push_str(&format!("{}: {}\n", p.period, guide.text));
    }
    out
}
