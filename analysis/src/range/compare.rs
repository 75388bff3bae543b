//! Two periods side by side, with the uncertainty of the change: a guide to a continuing
//! decline in EOO, AOO or records (criterion B's condition b).
//!
//! Records: the later period's rate of records per year against the earlier's, as a ratio
//! with its exact conditional interval (given the total, the later count is binomial; the
//! Clopper–Pearson interval of its share becomes an interval for the ratio) and the exact
//! conditional two-sided p-value of "no change" (binomial, summing every outcome no more
//! likely than the one seen). This assumes comparable effort and reporting in both periods.
//!
//! EOO and AOO grow with the number of records, so a period with fewer records looks
//! smaller even when nothing changed. They are compared at equal numbers of records: the
//! larger period's records are subsampled without replacement to the smaller period's
//! number, many times (rarefaction), and the change is the smaller period's figure against
//! each subsample's, in km² and in percent of the earlier period, with the middle 95% of
//! the subsamples. The smaller period's own figure is taken as it is.

use serde::Serialize;
use statrs::distribution::{Beta, Binomial, ContinuousCDF as _, Discrete as _};

use super::aoo::{GridPlan, aoo_of_vectors};
use super::eoo::eoo_of_vectors;
use super::stability::{CellCounter, SubsetHull, area_of, percentile};
use super::unit_vectors;
use crate::coordinates::LatLon;
use crate::random::SplitMix64;

/// The later period's records per year against the earlier period's.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RecordsChange {
    /// Records in the earlier and the later period.
    pub counts: [u64; 2],
    /// The periods' lengths in years.
    pub years: [f64; 2],
    /// Later rate ÷ earlier rate.
    pub rate_ratio: f64,
    /// The exact conditional 95% interval of the ratio.
    pub lower: f64,
    /// Upper end of that interval.
    pub upper: f64,
    /// Exact conditional two-sided p-value of an unchanged rate.
    pub p_value: f64,
}

/// Compares `counts` records over `years` (earlier, later).
pub fn records_change(counts: [u64; 2], years: [f64; 2]) -> RecordsChange {
    let [earlier, later] = counts;
    let total = earlier + later;
    // Odds of a record falling in the later period, turned into a ratio of rates.
    let ratio_of_share = |share: f64| share / (1.0 - share) * years[0] / years[1];
    let quantile = |a: f64, b: f64, p: f64| Beta::new(a, b).map_or(f64::NAN, |d| d.inverse_cdf(p));
    let lower_share = if later == 0 { 0.0 } else { quantile(later as f64, (total - later + 1) as f64, 0.025) };
    let upper_share = if later == total { 1.0 } else { quantile((later + 1) as f64, (total - later) as f64, 0.975) };
    let rate = |count: u64, span: f64| count as f64 / span;
    RecordsChange {
        counts,
        years,
        rate_ratio: rate(later, years[1]) / rate(earlier, years[0]),
        lower: ratio_of_share(lower_share),
        upper: ratio_of_share(upper_share),
        p_value: binomial_two_sided(later, total, years[1] / (years[0] + years[1])),
    }
}

/// P-value of `k` successes in `n` under probability `p`: the sum over outcomes no more
/// likely than `k` (scipy's `binomtest`, two-sided, with its relative tolerance 1e-7).
fn binomial_two_sided(k: u64, n: u64, p: f64) -> f64 {
    let Ok(binomial) = Binomial::new(p, n) else { return f64::NAN };
    let seen = binomial.pmf(k) * (1.0 + 1e-7);
    (0..=n).map(|x| binomial.pmf(x)).filter(|probability| *probability <= seen).sum::<f64>().min(1.0)
}

/// The change in one figure at equal numbers of records.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ChangeSpread {
    /// Later minus earlier, km², from all records of each period.
    pub observed_km2: f64,
    /// Later minus earlier at equal numbers of records: the median over subsamples, km².
    pub median_km2: f64,
    /// 2.5th percentile of that change, km².
    pub lower_km2: f64,
    /// 97.5th percentile, km².
    pub upper_km2: f64,
    /// The same in percent of the earlier figure.
    pub median_percent: f64,
    /// 2.5th percentile, percent.
    pub lower_percent: f64,
    /// 97.5th percentile, percent.
    pub upper_percent: f64,
}

/// Two periods compared at equal numbers of records.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PeriodComparison {
    /// Records per year, when both periods' lengths are known.
    pub records: Option<RecordsChange>,
    /// The number of records both periods were brought to.
    pub equal_records: usize,
    /// Subsamples drawn of the larger period (0 when both have as many records).
    pub resamples: usize,
    /// The change in the raw hull area; `None` when either period has no EOO.
    pub eoo: Option<ChangeSpread>,
    /// The change in the fixed-grid AOO.
    pub aoo: ChangeSpread,
    /// What the comparison says, in words.
    pub text: String,
}

/// Compares two periods' records (`years`: each period's length, when known), counting
/// AOO on `plan`'s grids and subsampling with `resamples` draws from `seed`.
pub fn compare_periods(
    earlier: &[LatLon],
    later: &[LatLon],
    years: Option<[f64; 2]>,
    plan: &GridPlan,
    resamples: usize,
    seed: u64,
) -> PeriodComparison {
    let records = years.map(|years| records_change([earlier.len() as u64, later.len() as u64], years));
    let (smaller_is_later, smaller, larger) =
        if later.len() <= earlier.len() { (true, later, earlier) } else { (false, earlier, later) };
    let equal_records = smaller.len();
    let draws = if larger.len() > smaller.len() { resamples } else { 0 };
    let small = Figures::of(smaller, plan);
    let large = Figures::of(larger, plan);
    let (eoo_draws, aoo_draws) = large.rarefied(larger, equal_records, draws, seed);
    // Later − earlier, draw by draw: the larger period's subsamples against the smaller's own figure.
    let change = |small_value: f64, large_draws: &[f64], large_value: f64| {
        let large_values = if large_draws.is_empty() { vec![large_value] } else { large_draws.to_vec() };
        let small_values = vec![small_value; large_values.len()];
        let observed = if smaller_is_later { small_value - large_value } else { large_value - small_value };
        if smaller_is_later {
            spread(observed, &large_values, &small_values)
        } else {
            spread(observed, &small_values, &large_values)
        }
    };
    let aoo = change(small.aoo_km2, &aoo_draws, large.aoo_km2);
    let eoo = match (small.eoo_km2, large.eoo_km2) {
        (Some(s), Some(l)) => Some(change(s, &eoo_draws, l)),
        _ => None,
    };
    let text = comparison_text(records.as_ref(), equal_records, draws, eoo.as_ref(), &aoo);
    PeriodComparison { records, equal_records, resamples: draws, eoo, aoo, text }
}

/// One period's figures and what subsampling it needs.
struct Figures {
    eoo_km2: Option<f64>,
    aoo_km2: f64,
    plane: Option<Vec<[f64; 2]>>,
    cells: super::aoo::CellsOfRecords,
    cell_area_km2: f64,
}

impl Figures {
    fn of(points: &[LatLon], plan: &GridPlan) -> Self {
        let vectors = unit_vectors(points);
        let (aoo, fine) = aoo_of_vectors(&vectors, plan);
        let (eoo_km2, plane) = match eoo_of_vectors(points, &vectors) {
            Ok((eoo, plane)) => (Some(eoo.area_km2), plane.map(|p| p.points)),
            Err(_) => (None, None),
        };
        Self { eoo_km2, aoo_km2: aoo.area_km2, plane, cells: fine.whole_cells(), cell_area_km2: aoo.cell_area_km2 }
    }

    /// EOO and AOO of `draws` subsamples of `size` records, drawn without replacement by
    /// a partial Fisher–Yates shuffle.
    fn rarefied(&self, points: &[LatLon], size: usize, draws: usize, seed: u64) -> (Vec<f64>, Vec<f64>) {
        let mut rng = SplitMix64::new(seed);
        let hulls = self.plane.as_deref().map(SubsetHull::new);
        let mut counter = CellCounter::new(&self.cells);
        let mut order: Vec<usize> = (0..points.len()).collect();
        let mut chosen = vec![u32::MAX; points.len()];
        let (mut eoo, mut aoo) = (Vec::new(), Vec::new());
        for draw in 0..draws as u32 {
            counter.start();
            for i in 0..size {
                let j = i + rng.below(points.len() - i);
                order.swap(i, j);
                chosen[order[i]] = draw;
                counter.add(order[i]);
            }
            aoo.push(counter.count() as f64 * self.cell_area_km2);
            if let Some(hulls) = &hulls {
                eoo.push(area_of(points, &hulls.hull_of(|k| chosen[k] == draw)));
            }
        }
        (eoo, aoo)
    }
}

/// The spread of later − earlier, in km² and in percent of earlier, value by value.
fn spread(observed_km2: f64, earlier: &[f64], later: &[f64]) -> ChangeSpread {
    let mut km2: Vec<f64> = earlier.iter().zip(later).map(|(e, l)| l - e).collect();
    let mut percent: Vec<f64> =
        earlier.iter().zip(later).map(|(e, l)| if *e > 0.0 { 100.0 * (l - e) / e } else { f64::NAN }).collect();
    km2.sort_by(f64::total_cmp);
    percent.sort_by(f64::total_cmp);
    ChangeSpread {
        observed_km2,
        median_km2: percentile(&km2, 0.5),
        lower_km2: percentile(&km2, 0.025),
        upper_km2: percentile(&km2, 0.975),
        median_percent: percentile(&percent, 0.5),
        lower_percent: percentile(&percent, 0.025),
        upper_percent: percentile(&percent, 0.975),
    }
}

fn comparison_text(
    records: Option<&RecordsChange>,
    equal: usize,
    draws: usize,
    eoo: Option<&ChangeSpread>,
    aoo: &ChangeSpread,
) -> String {
    let direction = |lower: f64, upper: f64| {
        if upper < 0.0 {
            "a decline"
        } else if lower > 0.0 {
            "an increase"
        } else {
            "no clear change"
        }
    };
    let mut parts = Vec::new();
    if let Some(r) = records {
        parts.push(format!(
            "Records per year: the later period has {:.2} times the earlier rate (95% interval {:.2} to {:.2}, \
             exact conditional p = {:.3}): {}, if effort and reporting were alike",
            r.rate_ratio,
            r.lower,
            r.upper,
            r.p_value,
            direction(r.lower.ln(), r.upper.ln())
        ));
    }
    let how = if draws > 0 {
        format!("at {equal} records each ({draws} subsamples of the larger period, 95% of them)")
    } else {
        format!("at {equal} records each (both periods have as many)")
    };
    let figure = |name: &str, c: &ChangeSpread| {
        format!(
            "{name} changes by {:+.0}% {how}: {:+.0}% to {:+.0}%, {}",
            c.median_percent,
            c.lower_percent,
            c.upper_percent,
            direction(c.lower_km2, c.upper_km2)
        )
    };
    if let Some(e) = eoo {
        parts.push(figure("EOO (hull area)", e));
    }
    parts.push(figure("AOO", aoo));
    format!(
        "{}. A change in records can be a change in effort or reporting; a continuing decline for criterion B \
         is the assessor's inference.",
        parts.join(". ")
    )
}
