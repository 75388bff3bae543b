//! The range and trend figures as text: the server's reports (`/api/range`,
//! `/api/trend`) turned into the figures table's rows and the trend's lines, each
//! number with its unit and a sensible precision, and the queries that ask for them.
//! The figures screen only lays these out.

use serde_json::Value;

use crate::data::api::query_part;

fn number(value: &Value) -> Option<f64> {
    value.as_f64()
}

/// An area in km², to a sensible precision.
fn km2(value: Option<f64>) -> String {
    match value {
        Some(v) if v.abs() >= 100.0 => format!("{v:.0} km²"),
        Some(v) => format!("{v:.1} km²"),
        None => "–".into(),
    }
}

fn signed_km2(value: Option<f64>, percent: Option<f64>) -> String {
    match (value, percent) {
        (Some(v), Some(p)) => format!("{v:+.1} km² ({p:+.0}%)"),
        (Some(v), None) => format!("{v:+.1} km²"),
        _ => "–".into(),
    }
}

/// A fraction as a signed percentage; beyond ±10,000% (a short series extrapolated) in words.
fn percent(x: Option<f64>) -> String {
    match x {
        Some(x) if (100.0 * x).abs() > 10_000.0 => format!("{}10,000%", if x > 0.0 { "over +" } else { "below −" }),
        Some(x) => format!("{:+.1}%", 100.0 * x),
        None => "–".into(),
    }
}

/// One row of the figures table: a label and one cell per period, then the change.
pub struct Row {
    pub label: &'static str,
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
    let count_change = |field: &str| change.and_then(|c| c[field].as_i64()).map_or(String::new(), |v| format!("{v:+}"));
    let rows = vec![
        Row { label: "Records", cells: per(&|p| p["records"].to_string()), change: count_change("records") },
        Row { label: "Distinct sites", cells: per(&|p| p["sites"].to_string()), change: count_change("sites") },
        Row {
            label: "EOO",
            cells: per(&|p| km2(figure(p, &["eoo_km2"]))),
            change: change_of("eoo_km2", "eoo_percent"),
        },
        Row {
            label: "AOO",
            cells: per(&|p| km2(figure(p, &["aoo", "area_km2"]))),
            change: change_of("aoo_km2", "aoo_percent"),
        },
        Row {
            label: "Least AOO (shifted grids)",
            cells: per(&|p| km2(figure(p, &["aoo", "min_area_km2"]))),
            change: String::new(),
        },
    ];
    (headers, rows)
}

/// The trend's figures as (label, text) pairs.
pub fn trend_lines(report: &Value) -> Vec<(&'static str, String)> {
    let t = &report["trend"];
    let change = |c: &Value| {
        format!(
            "{} (95% interval {} to {})",
            percent(number(&c["estimate"])),
            percent(number(&c["lower"])),
            percent(number(&c["upper"]))
        )
    };
    let generation = &report["generation_length"];
    let window = number(&t["window_years"]).unwrap_or(f64::NAN);
    let model = match (t["error_model"].as_str(), t["interval"]["degrees_of_freedom"].as_u64()) {
        (Some("QuasiPoisson"), Some(df)) => format!(
            "quasi-Poisson: errors scaled by the dispersion, intervals from Student's t with {df} degrees of freedom"
        ),
        (Some("QuasiPoisson"), None) => "quasi-Poisson: errors scaled by the dispersion".into(),
        (Some("NegativeBinomial"), _) => {
            "negative binomial (its AIC is lower than the Poisson's), intervals from the normal distribution".into()
        }
        _ => "Poisson errors, intervals from the normal distribution".into(),
    };
    let mk = &t["mann_kendall"];
    let sen = number(&mk["sen_slope"]).map_or("–".into(), |s| format!("{s:.4}"));
    let counts: Vec<String> = report["yearly_counts"]
        .as_array()
        .map(|a| a.iter().map(|y| format!("{} {}", y["year"], y["count"])).collect())
        .unwrap_or_default();
    vec![
        ("Rate of change per year", change(&t["annual_change"])),
        (
            "Change over the assessment window",
            if t["window_change"].is_null() {
                // The server gives no change when the years fitted are too few for the window.
                format!("not given over {window:.0} years: {}", t["extrapolation"].as_str().unwrap_or(""))
            } else {
                format!(
                    "{} over {window:.0} years{}",
                    change(&t["window_change"]),
                    if t["window_exceeds_data"].as_bool() == Some(true) {
                        ", extrapolated beyond the years covered"
                    } else {
                        ""
                    }
                )
            },
        ),
        (
            "Years fitted",
            format!(
                "{}–{} (the most recent assessment window; earlier years are not fitted)",
                t["first_year"], t["last_year"]
            ),
        ),
        (
            "How the window was chosen",
            format!(
                "{window:.0} years = the longer of 10 years and 3 × generation length ({} years; {}), IUCN criterion A",
                number(&generation["years"]).map_or("?".into(), |y| y.to_string()),
                generation["source"].as_str().unwrap_or("")
            ),
        ),
        (
            "Dispersion and model",
            format!("Pearson dispersion {:.2}; {model}", number(&t["fit"]["dispersion"]).unwrap_or(f64::NAN)),
        ),
        (
            "Mann–Kendall (tie-corrected)",
            format!(
                "tau = {:.3}, p = {:.4}; Sen's slope {sen} per year",
                number(&mk["tau"]).unwrap_or(f64::NAN),
                number(&mk["p_value"]).unwrap_or(f64::NAN)
            ),
        ),
        ("Animals recorded per year", if counts.is_empty() { "none".into() } else { counts.join(", ") }),
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
        assert_eq!(percent(Some(150.0)), "over +10,000%");
        assert_eq!(percent(Some(-150.0)), "below −10,000%");
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
        let table: Vec<(&str, Vec<String>, String)> = rows.into_iter().map(|r| (r.label, r.cells, r.change)).collect();
        assert_eq!(
            table,
            [
                ("Records", vec!["12".to_owned(), "20".to_owned()], "+8".to_owned()),
                ("Distinct sites", vec!["9".to_owned(), "14".to_owned()], "+5".to_owned()),
                ("EOO", vec!["2450 km²".to_owned(), "3121 km²".to_owned()], "+670.7 km² (+27%)".to_owned()),
                ("AOO", vec!["36.0 km²".to_owned(), "48.0 km²".to_owned()], "+12.0 km² (+33%)".to_owned()),
                ("Least AOO (shifted grids)", vec!["32.0 km²".to_owned(), "44.0 km²".to_owned()], String::new()),
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
        let lines: std::collections::BTreeMap<&str, String> = trend_lines(&report).into_iter().collect();
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
        let lines: std::collections::BTreeMap<&str, String> = trend_lines(&report).into_iter().collect();
        assert_eq!(
            lines["Change over the assessment window"],
            "not given over 24 years: the fitted years 2022–2024 cover 2 years, and the 24-year window is more than 3 times that"
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
