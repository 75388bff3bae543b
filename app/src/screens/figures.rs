//! `#figures`: range and trend figures for one taxon, worked out by the server from the
//! stored records (`/api/range`, `/api/trend`) and laid out for a phone — the figures
//! table (records, distinct sites, EOO, AOO and its least value over shifted grids, each
//! with its unit) for up to two periods side by side with the change, the criterion B
//! and A texts, the trend's rate of change with its interval, the change over the
//! assessment window and how the window was chosen, the dispersion and model, the
//! Mann–Kendall test and Sen's slope — with the server's map and chart, the caution that
//! goes with them said once at the top, and the downloads below. Figures and downloads
//! count confirmed records unless the reader chooses otherwise. Needs a connection.

use leptos::prelude::*;
use serde_json::Value;

use crate::data::api;
use crate::data::figures::{FIRST_TAXON, range_query, range_rows, trend_lines, trend_query, without_caveat};
use crate::data::words::{t, t_args};
use crate::screens::downloads::ExportSection;

fn range_view(report: &Value) -> AnyView {
    let Some(taxon) = report["taxa"].get(0) else {
        let used = report["records_used"].as_str().unwrap_or("").to_owned();
        return view! { <p id="range-empty" class="hint">{t_args("figures-range-empty", &[("used", used.into())])}</p> }.into_any();
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
    let criterion_b = taxon["periods"]
        .as_array()
        .cloned()
        .unwrap_or_default()
        .into_iter()
        .filter_map(|p| {
            let text = without_caveat(p["figures"]["criterion_b"]["text"].as_str()?);
            let raised = p["figures"]["eoo_raised_to_aoo"].as_bool() == Some(true);
            let period = p["period"].as_str().unwrap_or("").to_owned();
            Some(view! { <li><b>{period}</b>": "{text}{raised.then(|| t("figures-eoo-raised"))}</li> })
        })
        .collect_view();
    let name = taxon["taxon"].as_str().unwrap_or("").to_owned();
    let grid = report["grid_choice"].as_str().unwrap_or("").to_owned();
    let used = report["records_used"].as_str().unwrap_or("").to_owned();
    view! {
        <h3>{t_args("figures-range-of", &[("name", name.into())])}</h3>
        <p class="hint">{t_args("figures-records-used", &[("used", used.into())])}</p>
        <div class="table-scroll">
            <table id="range-table">
                <thead><tr><th scope="col">{t("figures-figure")}</th>{head}{has_change.then(|| view! { <th scope="col">{t("figures-change")}</th> })}</tr></thead>
                <tbody>{body}</tbody>
            </table>
        </div>
        <p class="hint">{t("figures-range-method")}</p>
        <p id="grid-choice" class="hint">{grid}</p>
        <h4>{t("figures-criterion-b")}</h4>
        <ul id="criterion-b" class="plain">{criterion_b}</ul>
    }
    .into_any()
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
    let criterion_a = without_caveat(report["trend"]["criterion_a"]["text"].as_str().unwrap_or(""));
    view! {
        <h3>{t_args("figures-trend-years", &[("first", first.into()), ("last", last.into())])}</h3>
        <dl id="trend-figures">{lines}</dl>
        <ul class="plain hint">{notes}</ul>
        <h4>{t("figures-criterion-a")}</h4>
        <p id="criterion-a">{criterion_a}</p>
    }
    .into_any()
}

type Shown = Result<Value, String>;

#[component]
pub fn FiguresScreen() -> impl IntoView {
    let taxon = RwSignal::new(FIRST_TAXON.to_owned());
    let state = RwSignal::new(crate::data::downloads::DEFAULT_STATE.to_owned());
    let first_period = RwSignal::new(String::new());
    let second_period = RwSignal::new(String::new());
    let generation = RwSignal::new(String::new());
    let range = RwSignal::new(Err::<Value, String>(t("figures-choose")));
    let trend = RwSignal::new(Err::<Value, String>(String::new()));
    let cautions = RwSignal::new(Vec::<String>::new());
    let map = RwSignal::new(Err::<String, String>(String::new()));
    let chart = RwSignal::new(Err::<String, String>(String::new()));
    let show = move |_| {
        let (name, states) = (taxon.get_untracked(), state.get_untracked());
        let query = range_query(&name, &states, &[first_period.get_untracked(), second_period.get_untracked()]);
        let trend_query = trend_query(&name, &states, &generation.get_untracked());
        leptos::task::spawn_local(async move {
            let found: Shown = api::range(&query).await.map_err(|err| err.to_string());
            cautions.set(
                found
                    .as_ref()
                    .ok()
                    .and_then(|r| r["cautions"].as_array().cloned())
                    .unwrap_or_default()
                    .into_iter()
                    .filter_map(|c| c.as_str().map(without_caveat))
                    .filter(|c| !c.is_empty())
                    .collect(),
            );
            range.set(found);
            trend.set(api::trend(&trend_query).await.map_err(|err| err.to_string()));
            map.set(api::range_map(&query).await.map_err(|err| err.to_string()));
            chart.set(api::trend_chart(&trend_query).await.map_err(|err| err.to_string()));
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
            <h2>{t("figures-heading")}</h2>
            <p id="figures-caveat" class="caution">{t("figures-caveat")}</p>
            <div class="stack">
                <label>{t("figures-taxon")}" "<input id="figures-taxon" prop:value=move || taxon.get() on:input=move |ev| taxon.set(event_target_value(&ev)) /></label>
                <label>{t("figures-records")}" "<select id="figures-state" prop:value=move || state.get() on:change=move |ev| state.set(event_target_value(&ev))>
                    <option value="confirmed">{t("figures-confirmed-only")}</option>
                    <option value="any">{t("figures-all-records")}</option>
                </select></label>
                <p id="figures-state-words" class="hint">{move || crate::data::downloads::state_words(&state.get())}</p>
                <div class="row">
                    <label>{t("figures-first-period")}" "<input id="figures-period-1" placeholder=t("figures-first-period-example") inputmode="numeric" prop:value=move || first_period.get() on:input=move |ev| first_period.set(event_target_value(&ev)) /></label>
                    <label>{t("figures-second-period")}" "<input id="figures-period-2" placeholder=t("figures-second-period-example") inputmode="numeric" prop:value=move || second_period.get() on:input=move |ev| second_period.set(event_target_value(&ev)) /></label>
                </div>
                <label>{t("figures-generation")}" "<input id="figures-generation" inputmode="decimal" prop:value=move || generation.get() on:input=move |ev| generation.set(event_target_value(&ev)) /></label>
            </div>
            <button id="figures-show" type="button" class="primary" on:click=show>{t("figures-show")}</button>
            {shown(range, range_view, "range-figures")}
            <h3>{t("figures-map-heading")}</h3>
            {figure(map, "range-map")}
            {shown(trend, trend_view, "trend-section")}
            <h3>{t("figures-chart-heading")}</h3>
            <p class="hint">{t("figures-chart-hint")}</p>
            {figure(chart, "trend-chart")}
            <ul id="figure-cautions" class="cautions">{caution_list}</ul>
            <p class="hint">{t("figures-recording-caution")}</p>
        </section>
        <ExportSection />
    }
}
