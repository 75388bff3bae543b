//! A trend chart as SVG: each year's encounter rate (count ÷ effort) as a point, the
//! fitted Poisson trend as a line, and its 95% interval as a band.
//!
//! The band is the normal interval on the linear predictor η = a + b (year − mean year),
//! whose variance comes from the fit's information matrix Σ μᵢ xᵢ xᵢᵀ (the inverse is the
//! Poisson covariance of a and b; scaled by the dispersion when the errors are), then
//! taken through exp. The slope's variance from it equals the standard error the fit reports.

use std::fmt::Write as _;

use analysis::trend::{ErrorModel, TrendSummary, YearCount};

use super::map::escape;

const WIDTH: f64 = 720.0;
const HEIGHT: f64 = 420.0;
const LEFT: f64 = 64.0;
const RIGHT: f64 = 24.0;
const TOP: f64 = 56.0;
const BOTTOM: f64 = 96.0;
/// Where the captions under the chart start: near the left edge, so a long interval
/// still fits the drawing's width.
const CAPTION_X: f64 = 12.0;

/// The fitted line and its band: (year, rate, lower, upper) at many points along the years.
pub fn fitted_band(years: &[YearCount], trend: &TrendSummary) -> Vec<(f64, f64, f64, f64)> {
    let mean_year = years.iter().map(|y| f64::from(y.year)).sum::<f64>() / years.len() as f64;
    let [v00, v01, v11] = covariance(years, trend, mean_year);
    let (a, b) = (trend.fit.coefficients[0].estimate, trend.fit.coefficients[1].estimate);
    let (first, last) = (f64::from(trend.first_year), f64::from(trend.last_year));
    let steps = 60;
    // The same quantile as the trend's intervals: normal, or t when the dispersion is estimated.
    let q = trend.interval.quantile;
    (0..=steps)
        .map(|i| {
            let year = first + (last - first) * f64::from(i) / f64::from(steps);
            let x = year - mean_year;
            let eta = a + b * x;
            let se = (v00 + 2.0 * x * v01 + x * x * v11).max(0.0).sqrt();
            (year, eta.exp(), (eta - q * se).exp(), (eta + q * se).exp())
        })
        .collect()
}

/// Covariance of (intercept, slope): the inverse of Σ μᵢ [1, xᵢ; xᵢ, xᵢ²], scaled by the
/// dispersion under quasi-Poisson errors. Returned as [var a, cov ab, var b].
pub fn covariance(years: &[YearCount], trend: &TrendSummary, mean_year: f64) -> [f64; 3] {
    let mut sorted = years.to_vec();
    sorted.sort_by_key(|y| y.year);
    let (mut s0, mut s1, mut s2) = (0.0, 0.0, 0.0);
    for (y, mu) in sorted.iter().zip(&trend.fit.fitted) {
        let x = f64::from(y.year) - mean_year;
        s0 += mu;
        s1 += mu * x;
        s2 += mu * x * x;
    }
    let det = s0 * s2 - s1 * s1;
    let scale = match trend.error_model {
        ErrorModel::QuasiPoisson => trend.fit.dispersion.unwrap_or(1.0),
        ErrorModel::Poisson => 1.0,
    };
    [scale * s2 / det, -scale * s1 / det, scale * s0 / det]
}

/// The chart as a complete SVG document.
/// `rate` says what the points are ("Animals per km walked each year").
pub fn trend_chart(title: &str, rate: &str, years: &[YearCount], trend: &TrendSummary) -> String {
    let band = fitted_band(years, trend);
    let rates: Vec<(f64, f64)> = years.iter().map(|y| (f64::from(y.year), y.count as f64 / y.effort)).collect();
    let top = rates.iter().map(|r| r.1).chain(band.iter().map(|b| b.3)).fold(0.0_f64, f64::max).max(1e-9) * 1.1;
    let (first, last) = (f64::from(trend.first_year) - 0.5, f64::from(trend.last_year) + 0.5);
    let plot_w = WIDTH - LEFT - RIGHT;
    let plot_h = HEIGHT - TOP - BOTTOM;
    let px = |year: f64| LEFT + (year - first) / (last - first) * plot_w;
    let py = |rate: f64| TOP + plot_h - rate / top * plot_h;
    let mut svg = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{WIDTH}\" height=\"{HEIGHT}\" viewBox=\"0 0 {WIDTH} {HEIGHT}\" font-family=\"system-ui, sans-serif\" font-size=\"12\">\n\
         <rect width=\"100%\" height=\"100%\" fill=\"#fbfaf6\"/>\n\
         <text x=\"{LEFT}\" y=\"24\" font-size=\"17\" font-weight=\"600\" fill=\"#1f2a36\">{}</text>\n\
         <text x=\"{LEFT}\" y=\"42\" fill=\"#4a5561\">{}, fitted Poisson trend and its 95% interval</text>\n",
        escape(title),
        escape(rate)
    );
    let tick_step = nice_step(top / 4.0);
    let ticks = (top / tick_step).floor() as i32;
    for i in 0..=ticks {
        let rate = tick_step * f64::from(i);
        let y = py(rate);
        let _ = writeln!(
            svg,
            "<line x1=\"{LEFT}\" x2=\"{:.1}\" y1=\"{y:.1}\" y2=\"{y:.1}\" stroke=\"#e2ded2\"/><text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"end\" fill=\"#4a5561\">{}</text>",
            LEFT + plot_w,
            LEFT - 6.0,
            y + 4.0,
            tick(rate)
        );
    }
    let step = ((last - first) / 10.0).ceil().max(1.0) as i32;
    for year in (trend.first_year..=trend.last_year).step_by(step as usize) {
        let _ = writeln!(
            svg,
            "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\" fill=\"#4a5561\">{year}</text>",
            px(f64::from(year)),
            TOP + plot_h + 18.0
        );
    }
    let upper: Vec<String> = band.iter().map(|b| format!("{:.1},{:.1}", px(b.0), py(b.3))).collect();
    let lower: Vec<String> = band.iter().rev().map(|b| format!("{:.1},{:.1}", px(b.0), py(b.2))).collect();
    let _ = writeln!(
        svg,
        "<polygon points=\"{} {}\" fill=\"#3d7a6b\" fill-opacity=\"0.18\" stroke=\"none\"/>",
        upper.join(" "),
        lower.join(" ")
    );
    let line: Vec<String> = band.iter().map(|b| format!("{:.1},{:.1}", px(b.0), py(b.1))).collect();
    let _ = writeln!(
        svg,
        "<polyline points=\"{}\" fill=\"none\" stroke=\"#2c5e52\" stroke-width=\"2.2\"/>",
        line.join(" ")
    );
    for (year, rate) in &rates {
        let _ = writeln!(
            svg,
            "<circle cx=\"{:.1}\" cy=\"{:.1}\" r=\"4\" fill=\"#c8553d\" stroke=\"#fff\" stroke-width=\"1.2\"/>",
            px(*year),
            py(*rate)
        );
    }
    // A short series extrapolated over a long window can give absurd percentages: past
    // ±10,000% they are said in words, so the caption stays readable and on the drawing.
    let percent = |x: f64| match 100.0 * x {
        p if p > 10_000.0 => "over +10,000%".to_owned(),
        p if p < -10_000.0 => "below −10,000%".to_owned(),
        p => format!("{p:+.1}%"),
    };
    let summary = format!(
        "Change {} a year (95% interval {} to {}), Pearson dispersion {:.2}.",
        percent(trend.annual_change.estimate),
        percent(trend.annual_change.lower),
        percent(trend.annual_change.upper),
        trend.fit.dispersion.unwrap_or(f64::NAN)
    );
    let window = format!(
        "Over the {:.0}-year assessment window: {} (95% interval {} to {}){}.",
        trend.window_years,
        percent(trend.window_change.estimate),
        percent(trend.window_change.lower),
        percent(trend.window_change.upper),
        if trend.window_exceeds_data { ", extrapolated" } else { "" }
    );
    let _ = write!(
        svg,
        "<text x=\"{CAPTION_X}\" y=\"{:.0}\" font-size=\"11\" fill=\"#1f2a36\">{}</text>\n\
         <text x=\"{CAPTION_X}\" y=\"{:.0}\" font-size=\"11\" fill=\"#1f2a36\">{}</text>\n\
         <text class=\"caveat\" x=\"{CAPTION_X}\" y=\"{:.0}\" font-size=\"11\" fill=\"#8a4b2d\">Inputs to an assessment, not a listing decision; a change in records can be a change in effort or reporting.</text>\n</svg>\n",
        HEIGHT - 56.0,
        escape(&summary),
        HEIGHT - 38.0,
        escape(&window),
        HEIGHT - 18.0
    );
    svg
}

/// 1, 2, 2.5 or 5 times a power of ten, at least `rough`.
fn nice_step(rough: f64) -> f64 {
    let power = 10f64.powf(rough.log10().floor());
    [1.0, 2.0, 2.5, 5.0, 10.0].into_iter().map(|m| m * power).find(|s| *s >= rough).unwrap_or(10.0 * power)
}

fn tick(value: f64) -> String {
    if value >= 10.0 {
        format!("{value:.0}")
    } else if value >= 1.0 {
        format!("{value:.1}")
    } else {
        format!("{value:.2}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use analysis::trend::yearly_trend;

    fn years(counts: &[u64]) -> Vec<YearCount> {
        counts
            .iter()
            .enumerate()
            .map(|(i, &count)| YearCount { year: 2010 + i as i32, count, effort: 3.0 + i as f64 })
            .collect()
    }

    #[test]
    fn the_band_covariance_gives_the_slope_error_the_fit_reports() {
        // Two ways to one number: the fit's reported standard error of the slope, and the
        // inverse information matrix built here from its fitted means.
        for counts in [&[30, 28, 25, 27, 20, 22, 18, 15, 16, 12][..], &[3, 19, 2, 25, 1, 30, 4, 28, 2, 24][..]] {
            let data = years(counts);
            let trend = yearly_trend(&data, 5.0).unwrap();
            let mean = data.iter().map(|y| f64::from(y.year)).sum::<f64>() / data.len() as f64;
            let [_, _, var_slope] = covariance(&data, &trend, mean);
            assert!(
                (var_slope.sqrt() - trend.slope_std_error).abs() < 1e-9 * trend.slope_std_error.max(1.0),
                "{counts:?}"
            );
        }
    }

    #[test]
    fn the_band_holds_the_fitted_line() {
        let data = years(&[30, 28, 25, 27, 20, 22, 18, 15, 16, 12]);
        let trend = yearly_trend(&data, 5.0).unwrap();
        for (_, rate, lower, upper) in fitted_band(&data, &trend) {
            assert!(lower < rate && rate < upper);
        }
    }
}
