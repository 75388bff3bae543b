//! Downloads of the stored records from the app (`/api/export`): the public form — a
//! Darwin Core Archive, CSV or GeoJSON with sensitive species generalised — for anyone,
//! and the full form (positions as recorded) for a signed-in reviewer or admin, with the
//! same filters as `wrackline export`: taxon, dates, area and review state.
//!
//! A download is a plain link: the browser fetches it with the session cookie when there
//! is one, and the server decides what the caller may have.

use leptos::prelude::*;
use serde::Deserialize;

use crate::device;
use crate::figures::query_part;

/// The part of `GET /api/session` this needs.
#[derive(Deserialize)]
struct Session {
    signed_in: bool,
    #[serde(default)]
    role: Option<String>,
}

/// Whether the caller is a signed-in reviewer or admin (who may download the full form).
async fn signed_in_staff() -> bool {
    let Ok(text) = device::fetch_text("/api/session").await else { return false };
    serde_json::from_str::<Session>(&text)
        .is_ok_and(|s| s.signed_in && matches!(s.role.as_deref(), Some("reviewer") | Some("admin")))
}

/// The filters as the form holds them.
#[derive(Clone, Default)]
struct Filters {
    format: String,
    taxon: String,
    from: String,
    to: String,
    area: String,
    state: String,
    full: bool,
}

/// The export URL for `filters`; blank filters are left out.
fn export_url(filters: &Filters) -> String {
    let mut url = format!("/api/export?format={}", query_part(&filters.format));
    for (name, value) in [
        ("taxon", &filters.taxon),
        ("from", &filters.from),
        ("to", &filters.to),
        ("bbox", &filters.area),
        ("state", &filters.state),
    ] {
        if !value.trim().is_empty() {
            url.push_str(&format!("&{name}={}", query_part(value.trim())));
        }
    }
    if filters.full {
        url.push_str("&audience=full");
    }
    url
}

fn file_name(filters: &Filters) -> String {
    let suffix = match filters.format.as_str() {
        "dwca" => "zip",
        "geojson" => "geojson",
        _ => "csv",
    };
    let audience = if filters.full { "full" } else { "public" };
    format!("wrackline-{audience}.{suffix}")
}

/// The checklist's areas with a box, as (name, `SOUTH,WEST,NORTH,EAST`).
fn areas() -> Vec<(String, String)> {
    let key = crate::key::initial_key();
    key.checklist()
        .areas()
        .iter()
        .filter_map(|a| {
            a.bounds.map(|[west, south, east, north]| (a.name.clone(), format!("{south},{west},{north},{east}")))
        })
        .collect()
}

#[component]
pub fn ExportSection() -> impl IntoView {
    let filters = RwSignal::new(Filters { format: "dwca".into(), state: "confirmed".into(), ..Filters::default() });
    let staff = RwSignal::new(false);
    leptos::task::spawn_local(async move { staff.set(signed_in_staff().await) });
    let set = move |change: fn(&mut Filters, String)| {
        move |ev: leptos::ev::Event| filters.update(|f| change(f, event_target_value(&ev)))
    };
    let area_options =
        areas().into_iter().map(|(name, bbox)| view! { <option value=bbox>{name}</option> }).collect_view();
    let full_choice = move || {
        staff.get().then(|| view! {
            <label class="check"><input id="export-full" type="checkbox" prop:checked=move || filters.get().full
                on:change=move |ev| filters.update(|f| f.full = event_target_checked(&ev)) />
                " Full form: positions as recorded, sensitive species included (reviewers and admins only; do not pass it on)"</label>
        })
    };
    view! {
        <section class="card exports">
            <h2>"Download records"</h2>
            <p class="hint">"The public form generalises sensitive species (Chapman 2020, GBIF): their positions are rounded or withheld, and say so. Observers' contacts are never included."</p>
            <div class="stack">
                <label>"Format" <select id="export-format" prop:value=move || filters.get().format on:change=set(|f, v| f.format = v)>
                    <option value="dwca">"Darwin Core Archive (zip)"</option>
                    <option value="csv">"CSV"</option>
                    <option value="geojson">"GeoJSON"</option>
                </select></label>
                <label>"Taxon (blank: all)" <input id="export-taxon" prop:value=move || filters.get().taxon on:input=set(|f, v| f.taxon = v) /></label>
                <div class="row">
                    <label>"From" <input id="export-from" type="date" prop:value=move || filters.get().from on:input=set(|f, v| f.from = v) /></label>
                    <label>"To" <input id="export-to" type="date" prop:value=move || filters.get().to on:input=set(|f, v| f.to = v) /></label>
                </div>
                <label>"Area" <select id="export-area" prop:value=move || filters.get().area on:change=set(|f, v| f.area = v)>
                    <option value="">"anywhere"</option>
                    {area_options}
                </select></label>
                <label>"Records" <select id="export-state" prop:value=move || filters.get().state on:change=set(|f, v| f.state = v)>
                    <option value="confirmed">"confirmed only"</option>
                    <option value="any">"all, reviewed or not"</option>
                    <option value="awaiting_review">"awaiting review"</option>
                </select></label>
                {full_choice}
            </div>
            <a id="export-download" class="button primary" href=move || export_url(&filters.get()) download=move || file_name(&filters.get())>"Download"</a>
        </section>
    }
}
