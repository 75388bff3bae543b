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
            format!(
                "{} over {window:.0} years{}",
                change(&t["window_change"]),
                if t["window_exceeds_data"].as_bool() == Some(true) {
                    ", extrapolated beyond the years covered"
                } else {
                    ""
                }
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
