//! A trend chart as SVG: each year's encounter rate (count ÷ effort) as a point, the
//! fitted trend as a line over the years fitted, and its 95% interval as a band.
//!
//! The band is the interval on the linear predictor η = a + b (year − mean year), whose
//! variance comes from the covariance of (a, b) under the chosen model (Poisson,
//! quasi-Poisson or negative binomial), taken through exp, with the same quantile as the
//! trend's intervals. Years before the assessment window are drawn but not fitted.

use std::fmt::Write as _;

use analysis::trend::{ErrorModel, TrendSummary, YearCount};
use analysis::words::signed_change;

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

/// The fitted line and its band: (year, rate, lower, upper) at many points over the years fitted.
pub fn fitted_band(trend: &TrendSummary) -> Vec<(f64, f64, f64, f64)> {
    let (first, last) = (f64::from(trend.first_year), f64::from(trend.last_year));
    let steps = 60;
    (0..=steps).map(|i| band_at(trend, first + (last - first) * f64::from(i) / f64::from(steps))).collect()
}

/// (year, rate, lower, upper) of the fitted line at `year`.
fn band_at(trend: &TrendSummary, year: f64) -> (f64, f64, f64, f64) {
    let line = &trend.line;
    let [v00, v01, v11] = line.covariance;
    let x = year - line.mean_year;
    let eta = line.intercept + line.slope * x;
    let se = (v00 + 2.0 * x * v01 + x * x * v11).max(0.0).sqrt();
    (year, eta.exp(), (eta - line.quantile * se).exp(), (eta + line.quantile * se).exp())
}

/// The chart as a complete SVG document.
/// `rate` says what the points are ("Animals per km walked each year").
pub fn trend_chart(title: &str, rate: &str, years: &[YearCount], trend: &TrendSummary) -> String {
    let band = fitted_band(trend);
    let rates: Vec<(f64, f64)> = years.iter().map(|y| (f64::from(y.year), y.count as f64 / y.effort)).collect();
    let top = rates.iter().map(|r| r.1).chain(band.iter().map(|b| b.3)).fold(0.0_f64, f64::max).max(1e-9) * 1.1;
    let data_first = years.iter().map(|y| y.year).min().unwrap_or(trend.first_year);
    let (first, last) = (f64::from(data_first) - 0.5, f64::from(trend.last_year) + 0.5);
    let plot_w = WIDTH - LEFT - RIGHT;
    let plot_h = HEIGHT - TOP - BOTTOM;
    let px = |year: f64| LEFT + (year - first) / (last - first) * plot_w;
    let py = |rate: f64| TOP + plot_h - rate / top * plot_h;
    let mut svg = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{WIDTH}\" height=\"{HEIGHT}\" viewBox=\"0 0 {WIDTH} {HEIGHT}\" font-family=\"system-ui, sans-serif\" font-size=\"12\">\n\
         <rect width=\"100%\" height=\"100%\" fill=\"#fbfaf6\"/>\n\
         <text x=\"{LEFT}\" y=\"24\" font-size=\"17\" font-weight=\"600\" fill=\"#1f2a36\">{}</text>\n\
         <text x=\"{LEFT}\" y=\"42\" fill=\"#4a5561\">{}, {} trend fitted on {}–{}, 95% interval</text>\n",
        escape(title),
        escape(rate),
        model_name(trend.error_model),
        trend.first_year,
        trend.last_year
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
    for year in (data_first..=trend.last_year).step_by(step as usize) {
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
    let summary = format!(
        "Change {} a year (95% interval {} to {}), {}.",
        signed_change(trend.annual_change.estimate),
        signed_change(trend.annual_change.lower),
        signed_change(trend.annual_change.upper),
        model_name(trend.error_model)
    );
    let window = match &trend.window_change {
        Some(c) => format!(
            "Over the {:.0}-year assessment window: {} (95% interval {} to {}){}.",
            trend.window_years,
            signed_change(c.estimate),
            signed_change(c.lower),
            signed_change(c.upper),
            if trend.window_exceeds_data { ", carried beyond the years fitted" } else { "" }
        ),
        None => format!(
            "No change over the {:.0}-year window: the years fitted are too few to carry the trend that far.",
            trend.window_years
        ),
    };
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

fn model_name(model: ErrorModel) -> &'static str {
    match model {
        ErrorModel::Poisson => "Poisson",
        ErrorModel::QuasiPoisson => "quasi-Poisson",
        ErrorModel::NegativeBinomial => "negative binomial",
    }
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
    fn the_band_at_the_mean_year_is_the_intercepts_interval_under_the_chosen_model() {
        // Two ways to one number: the band's half-width (on the log scale) at the mean year,
        // and the chosen model's own standard error of the intercept times the quantile.
        let mut models = Vec::new();
        for counts in [&[30, 28, 25, 27, 20, 22, 18, 15, 16, 12][..], &[3, 19, 2, 25, 1, 30, 4, 28, 2, 24][..]] {
            let trend = yearly_trend(&years(counts), 3.0).unwrap();
            let (_, rate, _, upper) = band_at(&trend, trend.line.mean_year);
            let intercept_se = match trend.error_model {
                ErrorModel::Poisson => trend.fit.coefficients[0].std_error,
                ErrorModel::QuasiPoisson => trend.fit.coefficients[0].quasi.unwrap().std_error,
                ErrorModel::NegativeBinomial => trend.negative_binomial.as_ref().unwrap().coefficients[0].std_error,
            };
            let half_width = (upper / rate).ln();
            assert!((half_width - trend.interval.quantile * intercept_se).abs() < 1e-9, "{counts:?}");
            models.push(trend.error_model);
        }
        assert_ne!(models[0], models[1], "one series is overdispersed, the other not");
    }

    #[test]
    fn the_band_holds_the_fitted_line() {
        let trend = yearly_trend(&years(&[30, 28, 25, 27, 20, 22, 18, 15, 16, 12]), 3.0).unwrap();
        for (_, rate, lower, upper) in fitted_band(&trend) {
            assert!(lower < rate && rate < upper);
        }
    }
}
