//! `#figures`: range and trend figures for one taxon, drawn by the server — the map of
//! records with the hull and occupied AOO cells over the coastline, and the trend chart
//! with its fitted line and 95% band — with the cautions that go with them. Needs a
//! connection: the figures are worked out on the server from the stored records.

use leptos::prelude::*;

use crate::device;

/// The SVG the server drew, or its message saying why it could not.
async fn fetch_svg(url: &str) -> Result<String, String> {
    let answer = device::send_json("GET", url, None, &[]).await?;
    if answer.status == 200 {
        return Ok(answer.body);
    }
    Err(serde_json::from_str::<serde_json::Value>(&answer.body)
        .ok()
        .and_then(|v| v.get("error").and_then(|e| e.as_str()).map(str::to_owned))
        .unwrap_or_else(|| format!("the server answered {}", answer.status)))
}

fn query_part(text: &str) -> String {
    js_sys::encode_uri_component(text).as_string().unwrap_or_default()
}

#[component]
pub fn FiguresScreen() -> impl IntoView {
    let taxon = RwSignal::new("Scyliorhinus canicula".to_owned());
    let state = RwSignal::new("any".to_owned());
    let generation = RwSignal::new(String::new());
    let map = RwSignal::new(Err::<String, String>("choose a taxon and press Show".into()));
    let chart = RwSignal::new(Err::<String, String>(String::new()));
    let show = move |_| {
        let query = format!("taxon={}&state={}", query_part(&taxon.get_untracked()), query_part(&state.get_untracked()));
        let years = generation.get_untracked();
        let trend_query = if years.trim().is_empty() { query.clone() } else { format!("{query}&generation_length={}", query_part(years.trim())) };
        leptos::task::spawn_local(async move {
            map.set(fetch_svg(&format!("/api/range/map.svg?{query}")).await);
            chart.set(fetch_svg(&format!("/api/trend/chart.svg?{trend_query}")).await);
        });
    };
    let figure = |result: RwSignal<Result<String, String>>, id: &'static str| {
        move || match result.get() {
            Ok(svg) => view! { <div id=id class="figure" inner_html=svg></div> }.into_any(),
            Err(message) => view! { <p class="hint">{message}</p> }.into_any(),
        }
    };
    view! {
        <section class="card figures">
            <h2>"Range and trend"</h2>
            <div class="row">
                <label>"Taxon (species, genus, family…)" <input id="figures-taxon" prop:value=move || taxon.get() on:input=move |ev| taxon.set(event_target_value(&ev)) /></label>
                <label>"Records" <select id="figures-state" prop:value=move || state.get() on:change=move |ev| state.set(event_target_value(&ev))>
                    <option value="confirmed">"confirmed only"</option>
                    <option value="any">"all, reviewed or not"</option>
                </select></label>
                <label>"Generation length, years (if the checklist has none)" <input id="figures-generation" inputmode="decimal" prop:value=move || generation.get() on:input=move |ev| generation.set(event_target_value(&ev)) /></label>
            </div>
            <button id="figures-show" type="button" class="primary" on:click=show>"Show"</button>
            <h3>"Where: records, hull (EOO) and occupied 2 × 2 km cells (AOO)"</h3>
            {figure(map, "range-map")}
            <h3>"Encounter rate by year, with the fitted trend and its 95% band"</h3>
            {figure(chart, "trend-chart")}
            <p class="caution">"These figures are inputs to a threatened-species assessment, not a listing decision: the official assessment process weighs them with all other evidence. Stranding and landing records show where people walk, fish and report, and where currents carry carcasses; a gap in the records is not a gap in the range."</p>
        </section>
    }
}
