//! `#figures`: range and trend figures for one taxon, worked out by the server from the
//! stored records (`/api/range`, `/api/trend`) and laid out for a phone — the figures
//! table (records, distinct sites, EOO, AOO and its least value over shifted grids, each
//! with its unit) for up to two periods side by side with the change, the criterion B
//! and A texts, the trend's rate of change with its interval, the change over the
//! assessment window and how the window was chosen, the dispersion and model, the
//! Mann–Kendall test and Sen's slope — with the server's map and chart, the cautions that
//! go with them, and the downloads ([`crate::exports`]). Needs a connection.

use leptos::prelude::*;
use serde_json::Value;

use crate::device;

/// The body the server sent, or its message saying why it could not.
async fn fetch(url: &str) -> Result<String, String> {
    let answer = device::send_json("GET", url, None, &[]).await?;
    if answer.status == 200 {
        return Ok(answer.body);
    }
    Err(serde_json::from_str::<Value>(&answer.body)
        .ok()
        .and_then(|v| v.get("error").and_then(|e| e.as_str()).map(str::to_owned))
        .unwrap_or_else(|| format!("the server answered {}", answer.status)))
}

async fn fetch_json(url: &str) -> Result<Value, String> {
    let body = fetch(url).await?;
    serde_json::from_str(&body).map_err(|err| format!("the server's answer could not be read: {err}"))
}

pub fn query_part(text: &str) -> String {
    js_sys::encode_uri_component(text).as_string().unwrap_or_default()
}

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
struct Row {
    label: &'static str,
    cells: Vec<String>,
    change: String,
}

/// The figures table of the first taxon in a range report.
fn range_rows(taxon: &Value) -> (Vec<String>, Vec<Row>) {
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

fn range_view(report: &Value) -> AnyView {
    let Some(taxon) = report["taxa"].get(0) else {
        let used = report["records_used"].as_str().unwrap_or("").to_owned();
        return view! { <p id="range-empty" class="hint">{format!("No records with a position to work from ({used}). Records count once reviewers confirm them; choose \"all, reviewed or not\" to see every stored record.")}</p> }.into_any();
    };
    let (headers, rows) = range_rows(taxon);
    let has_change = taxon["changes"].get(0).is_some();
    let head = headers.iter().map(|h| view! { <th scope="col">{h.clone()}</th> }).collect_view();
    let body = rows
        .into_iter()
        .map(|row| {
            let cells = row.cells.into_iter().map(|c| view! { <td>{c}</td> }).collect_view();
            let change = has_change.then(|| view! { <td class="change">{row.change}</td> });
            view! { <tr><th scope="row">{row.label}</th>{cells}{change}</tr> }
        })
        .collect_view();
    let criterion_b = taxon["periods"].as_array().cloned().unwrap_or_default().into_iter().filter_map(|p| {
        let text = p["figures"]["criterion_b"]["text"].as_str()?.to_owned();
        let raised = p["figures"]["eoo_raised_to_aoo"].as_bool() == Some(true);
        let period = p["period"].as_str().unwrap_or("").to_owned();
        Some(view! { <li><b>{period}</b>": "{text}{raised.then_some(" EOO was raised to the AOO because the hull is smaller (IUCN Guidelines §4.9).")}</li> })
    }).collect_view();
    let name = taxon["taxon"].as_str().unwrap_or("").to_owned();
    let grid = report["grid_choice"].as_str().unwrap_or("").to_owned();
    let used = report["records_used"].as_str().unwrap_or("").to_owned();
    view! {
        <h3>{format!("Range of {name}")}</h3>
        <p class="hint">{format!("Records used: {used}.")}</p>
        <div class="table-scroll">
            <table id="range-table">
                <thead><tr><th scope="col">"Figure"</th>{head}{has_change.then(|| view! { <th scope="col">"Change"</th> })}</tr></thead>
                <tbody>{body}</tbody>
            </table>
        </div>
        <p class="hint">"EOO: area of the minimum convex polygon round the records, geodesic on WGS84 (raised to the AOO when smaller). AOO: occupied 2 × 2 km cells × 4 km². Least AOO: the fewest occupied cells over 16 grid origins shifted by quarter cells. Sites: positions at least about 10 m apart."</p>
        <p id="grid-choice" class="hint">{grid}</p>
        <h4>"Criterion B"</h4>
        <ul id="criterion-b" class="plain">{criterion_b}</ul>
    }
    .into_any()
}

/// The trend's figures as (label, text) pairs.
fn trend_lines(report: &Value) -> Vec<(&'static str, String)> {
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

fn trend_view(report: &Value) -> AnyView {
    let lines = trend_lines(report)
        .into_iter()
        .map(|(label, text)| view! { <div class="figure-line"><dt>{label}</dt><dd>{text}</dd></div> })
        .collect_view();
    let notes = report["notes"]
        .as_array()
        .cloned()
        .unwrap_or_default()
        .into_iter()
        .filter_map(|n| n.as_str().map(str::to_owned))
        .map(|n| view! { <li>{n}</li> })
        .collect_view();
    let first = report["trend"]["first_year"].to_string();
    let last = report["trend"]["last_year"].to_string();
    let criterion_a = report["trend"]["criterion_a"]["text"].as_str().unwrap_or("").to_owned();
    view! {
        <h3>{format!("Trend {first}–{last}")}</h3>
        <dl id="trend-figures">{lines}</dl>
        <ul class="plain hint">{notes}</ul>
        <h4>"Criterion A"</h4>
        <p id="criterion-a">{criterion_a}</p>
    }
    .into_any()
}

/// The query for range figures: taxon, state and the periods given.
fn range_query(taxon: &str, state: &str, periods: &[String]) -> String {
    let mut query = format!("taxon={}&state={}", query_part(taxon), query_part(state));
    let given: Vec<&str> = periods.iter().map(|p| p.trim()).filter(|p| !p.is_empty()).collect();
    if !given.is_empty() {
        query.push_str(&format!("&period={}", query_part(&given.join(","))));
    }
    query
}

type Shown = Result<Value, String>;

#[component]
pub fn FiguresScreen() -> impl IntoView {
    let taxon = RwSignal::new("Scyliorhinus canicula".to_owned());
    let state = RwSignal::new("any".to_owned());
    let first_period = RwSignal::new(String::new());
    let second_period = RwSignal::new(String::new());
    let generation = RwSignal::new(String::new());
    let range = RwSignal::new(Err::<Value, String>("choose a taxon and press Show".into()));
    let trend = RwSignal::new(Err::<Value, String>(String::new()));
    let cautions = RwSignal::new(Vec::<String>::new());
    let map = RwSignal::new(Err::<String, String>(String::new()));
    let chart = RwSignal::new(Err::<String, String>(String::new()));
    let show = move |_| {
        let (name, states) = (taxon.get_untracked(), state.get_untracked());
        let query = range_query(&name, &states, &[first_period.get_untracked(), second_period.get_untracked()]);
        let years = generation.get_untracked();
        let base = format!("taxon={}&state={}", query_part(&name), query_part(&states));
        let trend_query = if years.trim().is_empty() {
            base
        } else {
            format!("{base}&generation_length={}", query_part(years.trim()))
        };
        leptos::task::spawn_local(async move {
            let found: Shown = fetch_json(&format!("/api/range?{query}")).await;
            cautions.set(
                found
                    .as_ref()
                    .ok()
                    .and_then(|r| r["cautions"].as_array().cloned())
                    .unwrap_or_default()
                    .into_iter()
                    .filter_map(|c| c.as_str().map(str::to_owned))
                    .collect(),
            );
            range.set(found);
            trend.set(fetch_json(&format!("/api/trend?{trend_query}")).await);
            map.set(fetch(&format!("/api/range/map.svg?{query}")).await);
            chart.set(fetch(&format!("/api/trend/chart.svg?{trend_query}")).await);
        });
    };
    let figure = |result: RwSignal<Result<String, String>>, id: &'static str| {
        move || match result.get() {
            Ok(svg) => view! { <div id=id class="figure" inner_html=svg></div> }.into_any(),
            Err(message) => view! { <p class="hint">{message}</p> }.into_any(),
        }
    };
    let shown = |result: RwSignal<Shown>, draw: fn(&Value) -> AnyView, id: &'static str| {
        move || match result.get() {
            Ok(report) => view! { <div id=id>{draw(&report)}</div> }.into_any(),
            Err(message) => view! { <p class="hint">{message}</p> }.into_any(),
        }
    };
    let caution_list = move || cautions.get().into_iter().map(|c| view! { <li>{c}</li> }).collect_view();
    view! {
        <section class="card figures">
            <h2>"Range and trend"</h2>
            <div class="stack">
                <label>"Taxon (species, genus, family…)" <input id="figures-taxon" prop:value=move || taxon.get() on:input=move |ev| taxon.set(event_target_value(&ev)) /></label>
                <label>"Records" <select id="figures-state" prop:value=move || state.get() on:change=move |ev| state.set(event_target_value(&ev))>
                    <option value="confirmed">"confirmed only"</option>
                    <option value="any">"all, reviewed or not"</option>
                </select></label>
                <div class="row">
                    <label>"First period" <input id="figures-period-1" placeholder="e.g. 2015-2019" inputmode="numeric" prop:value=move || first_period.get() on:input=move |ev| first_period.set(event_target_value(&ev)) /></label>
                    <label>"Second period" <input id="figures-period-2" placeholder="e.g. 2020-2024" inputmode="numeric" prop:value=move || second_period.get() on:input=move |ev| second_period.set(event_target_value(&ev)) /></label>
                </div>
                <label>"Generation length, years (if the checklist has none)" <input id="figures-generation" inputmode="decimal" prop:value=move || generation.get() on:input=move |ev| generation.set(event_target_value(&ev)) /></label>
            </div>
            <button id="figures-show" type="button" class="primary" on:click=show>"Show"</button>
            {shown(range, range_view, "range-figures")}
            <h3>"Where: records, hull (EOO) and occupied 2 × 2 km cells (AOO)"</h3>
            {figure(map, "range-map")}
            {shown(trend, trend_view, "trend-section")}
            <h3>"Encounter rate by year, with the fitted trend and its 95% band"</h3>
            {figure(chart, "trend-chart")}
            <ul id="figure-cautions" class="cautions">{caution_list}</ul>
            <p class="caution">"These figures are inputs to a threatened-species assessment, not a listing decision: the official assessment process weighs them with all other evidence. Stranding and landing records show where people walk, fish and report, and where currents carry carcasses; a gap in the records is not a gap in the range."</p>
        </section>
        <crate::exports::ExportSection />
    }
}
