//! The range and trend figures as text: the server's reports (`/api/range`,
//! `/api/trend`) turned into the figures table's rows and the trend's lines in the
//! person's language, each number with its unit and a sensible precision, and the queries
//! that ask for them. The figures screen only lays these out. Texts the server words (the
//! criterion texts, the generation length's source) are shown as it sends them.

use serde_json::Value;

use crate::data::api::query_part;
use crate::data::words::{self, t, t_args};

fn number(value: &Value) -> Option<f64> {
    value.as_f64()
}

/// Shown where the report has no figure.
const NO_FIGURE: &str = "–";

/// `value` with `decimals` digits and its sign always written ("+4.0", "-8.0").
fn signed(value: f64, decimals: u8) -> String {
    let digits = words::number(value.abs(), decimals);
    let is_zero = digits.chars().all(|c| !c.is_ascii_digit() || c == '0');
    let sign = if value < 0.0 && !is_zero { "-" } else { "+" };
    format!("{sign}{digits}")
}

/// An area in km², to a sensible precision.
fn km2(value: Option<f64>) -> String {
    match value {
        Some(v) => t_args("figures-area", &[("area", words::number(v, if v.abs() >= 100.0 { 0 } else { 1 }).into())]),
        None => NO_FIGURE.into(),
    }
}

fn signed_km2(value: Option<f64>, percent: Option<f64>) -> String {
    match (value, percent) {
        (Some(v), Some(p)) => {
            t_args("figures-area-change-percent", &[("area", signed(v, 1).into()), ("percent", signed(p, 0).into())])
        }
        (Some(v), None) => t_args("figures-area", &[("area", signed(v, 1).into())]),
        _ => NO_FIGURE.into(),
    }
}

/// Beyond this many per cent (a short series extrapolated) a change is said in words.
const PERCENT_SHOWN_UP_TO: f64 = 10_000.0;

/// A fraction as a signed percentage; beyond ±10,000% (a short series extrapolated) in words.
fn percent(x: Option<f64>) -> String {
    let Some(x) = x else { return NO_FIGURE.into() };
    let limit = words::number(PERCENT_SHOWN_UP_TO, 0);
    match 100.0 * x {
        p if p > PERCENT_SHOWN_UP_TO => t_args("figures-percent-over", &[("limit", limit.into())]),
        p if p < -PERCENT_SHOWN_UP_TO => t_args("figures-percent-below", &[("limit", limit.into())]),
        p => t_args("figures-percent", &[("percent", signed(p, 1).into())]),
    }
}

/// One row of the figures table: a label and one cell per period, then the change.
pub struct Row {
    pub label: String,
    pub cells: Vec<String>,
    pub change: String,
}

/// The taxon the figures screen opens with (a scientific name, the same in every language).
pub const FIRST_TAXON: &str = "Scyliorhinus canicula";

/// The figures table of the first taxon in a range report.
pub fn range_rows(taxon: &Value) -> (Vec<String>, Vec<Row>) {
    let periods: Vec<&Value> = taxon["periods"].as_array().map(|p| p.iter().collect()).unwrap_or_default();
    let change = taxon["changes"].get(0);
    let headers = periods.iter().map(|p| p["period"].as_str().unwrap_or("").to_owned()).collect();
    let per = |f: &dyn Fn(&Value) -> String| periods.iter().map(|p| f(p)).collect::<Vec<_>>();
    let figure = |p: &Value, path: &[&str]| path.iter().try_fold(&p["figures"], |v, key| v.get(key)).and_then(number);
    let change_of =
        |field: &str, pct: &str| change.map_or(String::new(), |c| signed_km2(number(&c[field]), number(&c[pct])));
    let count = |p: &Value, field: &str| number(&p[field]).map_or(NO_FIGURE.into(), |n| words::number(n, 0));
    let count_change = |field: &str| change.and_then(|c| number(&c[field])).map_or(String::new(), |v| signed(v, 0));
    let rows = vec![
        Row { label: t("figures-row-records"), cells: per(&|p| count(p, "records")), change: count_change("records") },
        Row { label: t("figures-row-sites"), cells: per(&|p| count(p, "sites")), change: count_change("sites") },
        Row {
            label: t("figures-row-eoo"),
            cells: per(&|p| km2(figure(p, &["eoo_km2"]))),
            change: change_of("eoo_km2", "eoo_percent"),
        },
        Row {
            label: t("figures-row-aoo"),
            cells: per(&|p| km2(figure(p, &["aoo", "area_km2"]))),
            change: change_of("aoo_km2", "aoo_percent"),
        },
        Row {
            label: t("figures-row-least-aoo"),
            cells: per(&|p| km2(figure(p, &["aoo", "min_area_km2"]))),
            change: String::new(),
        },
    ];
    (headers, rows)
}

/// A change with its 95% interval.
fn change_words(change: &Value) -> String {
    t_args(
        "figures-change-interval",
        &[
            ("change", percent(number(&change["estimate"])).into()),
            ("lower", percent(number(&change["lower"])).into()),
            ("upper", percent(number(&change["upper"])).into()),
        ],
    )
}

/// The error model and where the intervals come from.
fn model_words(trend: &Value) -> String {
    match (trend["error_model"].as_str(), trend["interval"]["degrees_of_freedom"].as_u64()) {
        (Some("QuasiPoisson"), Some(df)) => t_args("figures-model-quasi-poisson-t", &[("df", df.to_string().into())]),
        (Some("QuasiPoisson"), None) => t("figures-model-quasi-poisson"),
        (Some("NegativeBinomial"), _) => t("figures-model-negative-binomial"),
        _ => t("figures-model-poisson"),
    }
}

/// The change over the assessment window, or why none is given: the window is too far
/// beyond the years fitted (the server then gives the change per year only).
fn window_words(trend: &Value, window: &str) -> String {
    if trend["window_change"].is_null() {
        let (first, last) = (trend["first_year"].as_i64(), trend["last_year"].as_i64());
        let span = first.zip(last).map_or(NO_FIGURE.into(), |(f, l)| words::number((l - f) as f64, 0));
        return t_args(
            "figures-window-not-given",
            &[
                ("window", window.into()),
                ("span", span.into()),
                ("first", year(&trend["first_year"]).into()),
                ("last", year(&trend["last_year"]).into()),
            ],
        );
    }
    let change = change_words(&trend["window_change"]);
    if trend["window_exceeds_data"].as_bool() == Some(true) {
        t_args("figures-window-change-extrapolated", &[("change", change.into()), ("window", window.into())])
    } else {
        t_args("figures-window-change", &[("change", change.into()), ("window", window.into())])
    }
}

/// A year as it is written (no thousands separator).
fn year(value: &Value) -> String {
    value.as_i64().map_or(NO_FIGURE.into(), |y| y.to_string())
}

/// A number of years: whole ones without decimals, else to a tenth.
fn years(value: Option<f64>) -> String {
    figure_or_dash(value, if value.is_some_and(|v| v.fract() == 0.0) { 0 } else { 1 })
}

/// `value` to `decimals` digits, or the no-figure mark.
fn figure_or_dash(value: Option<f64>, decimals: u8) -> String {
    value.map_or(NO_FIGURE.into(), |v| words::number(v, decimals))
}

/// The trend's figures as (label, text) pairs.
pub fn trend_lines(report: &Value) -> Vec<(String, String)> {
    let trend = &report["trend"];
    let window = figure_or_dash(number(&trend["window_years"]), 0);
    let mk = &trend["mann_kendall"];
    let counts: Vec<String> = report["yearly_counts"]
        .as_array()
        .map(|a| a.iter().map(|y| format!("{} {}", year(&y["year"]), figure_or_dash(number(&y["count"]), 0))).collect())
        .unwrap_or_default();
    let generation = &report["generation_length"];
    vec![
        (t("figures-rate-label"), change_words(&trend["annual_change"])),
        (t("figures-window-label"), window_words(trend, &window)),
        (
            t("figures-years-fitted-label"),
            t_args(
                "figures-years-fitted",
                &[("first", year(&trend["first_year"]).into()), ("last", year(&trend["last_year"]).into())],
            ),
        ),
        (
            t("figures-window-chosen-label"),
            t_args(
                "figures-window-chosen",
                &[
                    ("window", window.into()),
                    ("generation", years(number(&generation["years"])).into()),
                    ("source", generation["source"].as_str().unwrap_or("").into()),
                ],
            ),
        ),
        (
            t("figures-model-label"),
            t_args(
                "figures-model",
                &[
                    ("dispersion", figure_or_dash(number(&trend["fit"]["dispersion"]), 2).into()),
                    ("model", model_words(trend).into()),
                ],
            ),
        ),
        (
            t("figures-mann-kendall-label"),
            t_args(
                "figures-mann-kendall",
                &[
                    ("tau", figure_or_dash(number(&mk["tau"]), 3).into()),
                    ("p", figure_or_dash(number(&mk["p_value"]), 4).into()),
                    ("slope", figure_or_dash(number(&mk["sen_slope"]), 4).into()),
                ],
            ),
        ),
        (t("figures-counts-label"), if counts.is_empty() { t("figures-no-counts") } else { counts.join(", ") }),
    ]
}

/// `text` without the sentences that repeat the assessment caveat ("…not a listing
/// decision…") or the recording caution, which the figures screen says once at the top.
pub fn without_caveat(text: &str) -> String {
    let repeats = |sentence: &str| {
        sentence.contains("not a listing decision")
            || sentence.trim_start().starts_with("Stranding and landing records show")
    };
    text.split_inclusive(". ").filter(|sentence| !repeats(sentence)).collect::<String>().trim().to_owned()
}

/// The query for range figures: taxon, state and the periods given.
pub fn range_query(taxon: &str, state: &str, periods: &[String]) -> String {
    let mut query = format!("taxon={}&state={}", query_part(taxon), query_part(state));
    let given: Vec<&str> = periods.iter().map(|p| p.trim()).filter(|p| !p.is_empty()).collect();
    if !given.is_empty() {
        query.push_str(&format!("&period={}", query_part(&given.join(","))));
    }
    query
}

/// The query for the trend and its chart: taxon, state and a generation length when given.
pub fn trend_query(taxon: &str, state: &str, generation_years: &str) -> String {
    let base = format!("taxon={}&state={}", query_part(taxon), query_part(state));
    match generation_years.trim() {
        "" => base,
        years => format!("{base}&generation_length={}", query_part(years)),
    }
}

#[cfg(test)]
mod tests {
    use serde_json::json;

    use super::*;

    #[test]
    fn areas_and_changes_have_their_unit_and_a_sensible_precision() {
        assert_eq!(km2(Some(1234.4)), "1234 km²");
        assert_eq!(km2(Some(12.34)), "12.3 km²");
        assert_eq!(km2(None), "–");
        assert_eq!(signed_km2(Some(-8.0), Some(-25.0)), "-8.0 km² (-25%)");
        assert_eq!(signed_km2(Some(4.0), None), "+4.0 km²");
        assert_eq!(percent(Some(0.1234)), "+12.3%");
        assert_eq!(percent(Some(-0.5)), "-50.0%");
        assert_eq!(percent(Some(150.0)), "over +10000%", "natively numbers have no separators");
        assert_eq!(percent(Some(-150.0)), "below −10000%");
        assert_eq!(percent(Some(-0.0001)), "+0.0%", "no minus on a change that rounds to nothing");
        assert_eq!(percent(None), "–");
    }

    #[test]
    fn the_range_table_has_a_column_per_period_and_the_change() {
        let taxon = json!({
            "taxon": "Raja clavata",
            "periods": [
                {"period": "2015-2019", "records": 12, "sites": 9, "figures": {"eoo_km2": 2450.2, "aoo": {"area_km2": 36.0, "min_area_km2": 32.0}}},
                {"period": "2020-2024", "records": 20, "sites": 14, "figures": {"eoo_km2": 3120.9, "aoo": {"area_km2": 48.0, "min_area_km2": 44.0}}}
            ],
            "changes": [{"records": 8, "sites": 5, "eoo_km2": 670.7, "eoo_percent": 27.4, "aoo_km2": 12.0, "aoo_percent": 33.3}]
        });
        let (headers, rows) = range_rows(&taxon);
        assert_eq!(headers, ["2015-2019", "2020-2024"]);
        let table: Vec<(String, Vec<String>, String)> =
            rows.into_iter().map(|r| (r.label, r.cells, r.change)).collect();
        assert_eq!(
            table,
            [
                ("Records".to_owned(), vec!["12".to_owned(), "20".to_owned()], "+8".to_owned()),
                ("Distinct sites".to_owned(), vec!["9".to_owned(), "14".to_owned()], "+5".to_owned()),
                ("EOO".to_owned(), vec!["2450 km²".to_owned(), "3121 km²".to_owned()], "+670.7 km² (+27%)".to_owned()),
                ("AOO".to_owned(), vec!["36.0 km²".to_owned(), "48.0 km²".to_owned()], "+12.0 km² (+33%)".to_owned()),
                (
                    "Least AOO (shifted grids)".to_owned(),
                    vec!["32.0 km²".to_owned(), "44.0 km²".to_owned()],
                    String::new()
                ),
            ]
        );
    }

    #[test]
    fn the_trend_lines_say_the_model_the_window_and_the_counts() {
        let report = json!({
            "trend": {
                "annual_change": {"estimate": -0.08, "lower": -0.15, "upper": -0.01},
                "window_change": {"estimate": -0.87, "lower": -0.98, "upper": -0.2},
                "window_years": 24.0,
                "window_exceeds_data": true,
                "error_model": "QuasiPoisson",
                "interval": {"degrees_of_freedom": 9},
                "fit": {"dispersion": 1.8},
                "mann_kendall": {"tau": -0.45, "p_value": 0.031, "sen_slope": -0.5}
            },
            "generation_length": {"years": 8, "source": "checklist"},
            "yearly_counts": [{"year": 2015, "count": 4}, {"year": 2016, "count": 3}]
        });
        let lines: std::collections::BTreeMap<String, String> = trend_lines(&report).into_iter().collect();
        assert_eq!(lines["Rate of change per year"], "-8.0% (95% interval -15.0% to -1.0%)");
        assert_eq!(
            lines["Change over the assessment window"],
            "-87.0% (95% interval -98.0% to -20.0%) over 24 years, extrapolated beyond the years covered"
        );
        assert!(
            lines["How the window was chosen"]
                .starts_with("24 years = the longer of 10 years and 3 × generation length (8 years; checklist)")
        );
        assert!(lines["Dispersion and model"].ends_with("Student's t with 9 degrees of freedom"));
        assert_eq!(lines["Mann–Kendall (tie-corrected)"], "tau = -0.450, p = 0.0310; Sen's slope -0.5000 per year");
        assert_eq!(lines["Animals recorded per year"], "2015 4, 2016 3");
    }

    #[test]
    fn the_caveat_is_taken_out_of_texts_the_screen_says_it_for() {
        // As the analysis crate words its criterion texts (analysis/src/criteria.rs).
        let text = "EOO 2450 km² is under the 5,000 km² threshold of B1 for Endangered. Stranding and landing records \
                    show where people walk, fish and report. These figures are inputs to a threatened-species \
                    assessment, not a listing decision: the official assessment process weighs them with all other \
                    evidence and decides.";
        assert_eq!(without_caveat(text), "EOO 2450 km² is under the 5,000 km² threshold of B1 for Endangered.");
        assert_eq!(without_caveat("No caveat here."), "No caveat here.");
        assert_eq!(
            without_caveat("These figures are inputs to a threatened-species assessment, not a listing decision."),
            ""
        );
    }

    #[test]
    fn a_window_too_long_for_the_data_says_why_instead_of_a_number() {
        let report = json!({
            "trend": {
                "annual_change": {"estimate": 4.39, "lower": 1.3, "upper": 11.6},
                "window_change": null,
                "extrapolation": "the fitted years 2022–2024 cover 2 years, and the 24-year window is more than 3 times that",
                "window_years": 24.0,
                "first_year": 2022,
                "last_year": 2024,
                "error_model": "NegativeBinomial",
                "interval": {"degrees_of_freedom": null},
                "fit": {"dispersion": 0.3},
                "mann_kendall": {"tau": 1.0, "p_value": 0.3, "sen_slope": 9.5}
            },
            "generation_length": {"years": 8, "source": "checklist"},
            "yearly_counts": []
        });
        let lines: std::collections::BTreeMap<String, String> = trend_lines(&report).into_iter().collect();
        assert_eq!(
            lines["Change over the assessment window"],
            "not given: the 24-year window reaches too far beyond the 2 years fitted (2022–2024) to carry the trend \
             over it. The change per year is given; more years of data are needed for the window."
        );
        assert!(lines["Dispersion and model"].contains("negative binomial"), "{}", lines["Dispersion and model"]);
        assert!(lines["Years fitted"].starts_with("2022–2024"), "{}", lines["Years fitted"]);
    }

    #[test]
    fn the_queries_carry_the_taxon_state_periods_and_generation_length() {
        let periods = ["2015-2019".to_owned(), " ".to_owned()];
        assert_eq!(range_query("Raja clavata", "any", &periods), "taxon=Raja%20clavata&state=any&period=2015-2019");
        let both = ["2015-2019".to_owned(), "2020-2024".to_owned()];
        assert_eq!(
            range_query("Rajidae", "confirmed", &both),
            "taxon=Rajidae&state=confirmed&period=2015-2019%2C2020-2024"
        );
        assert_eq!(trend_query("Rajidae", "any", " "), "taxon=Rajidae&state=any");
        assert_eq!(trend_query("Rajidae", "any", " 7.5 "), "taxon=Rajidae&state=any&generation_length=7.5");
    }
}
