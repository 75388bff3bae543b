//! "Download records", under the figures: the public form — a Darwin Core Archive, CSV
//! or GeoJSON with sensitive species generalised — for anyone, and the full form
//! (positions as recorded) offered to a signed-in reviewer or admin, with filters for
//! taxon, dates, area and review state. The link itself is `data::downloads`.

use leptos::prelude::*;

use crate::data::downloads::ExportFilters;
use crate::data::words::t;
use crate::data::{api, checklist};

#[component]
pub fn ExportSection() -> impl IntoView {
    let filters = RwSignal::new(ExportFilters::default());
    let staff = RwSignal::new(false);
    leptos::task::spawn_local(async move { staff.set(api::session().await.is_ok_and(|s| s.staff_role().is_some())) });
    let set = move |change: fn(&mut ExportFilters, String)| {
        move |ev: leptos::ev::Event| filters.update(|f| change(f, event_target_value(&ev)))
    };
    let area_options = checklist::download_areas()
        .into_iter()
        .map(|(name, bbox)| view! { <option value=bbox>{name}</option> })
        .collect_view();
    let full_choice = move || {
        staff.get().then(|| {
            view! {
                <label class="check"><input id="export-full" type="checkbox" prop:checked=move || filters.get().full
                    on:change=move |ev| filters.update(|f| f.full = event_target_checked(&ev)) />
                    {t("downloads-full")}</label>
            }
        })
    };
    view! {
        <section class="card exports">
            <h2>{t("downloads-heading")}</h2>
            <p class="hint">{t("downloads-public-form")}</p>
            <div class="stack">
                <label>{t("downloads-format")}" "<select id="export-format" prop:value=move || filters.get().format on:change=set(|f, v| f.format = v)>
                    <option value="dwca">{t("downloads-dwca")}</option>
                    <option value="csv">{t("downloads-csv")}</option>
                    <option value="geojson">{t("downloads-geojson")}</option>
                </select></label>
                <label>{t("downloads-taxon")}" "<input id="export-taxon" prop:value=move || filters.get().taxon on:input=set(|f, v| f.taxon = v) /></label>
                <div class="row">
                    <label>{t("queue-from")}" "<input id="export-from" type="date" prop:value=move || filters.get().from on:input=set(|f, v| f.from = v) /></label>
                    <label>{t("queue-to")}" "<input id="export-to" type="date" prop:value=move || filters.get().to on:input=set(|f, v| f.to = v) /></label>
                </div>
                <label>{t("queue-area")}" "<select id="export-area" prop:value=move || filters.get().area on:change=set(|f, v| f.area = v)>
                    <option value="">{t("queue-anywhere")}</option>
                    {area_options}
                </select></label>
                <label>{t("figures-records")}" "<select id="export-state" prop:value=move || filters.get().state on:change=set(|f, v| f.state = v)>
                    <option value="confirmed">{t("figures-confirmed-only")}</option>
                    <option value="any">{t("figures-all-records")}</option>
                    <option value="awaiting_review">{t("state-awaiting-review")}</option>
                </select></label>
                <p id="export-state-words" class="hint">{move || crate::data::downloads::state_words(&filters.with(|f| f.state.clone()))}</p>
                {full_choice}
            </div>
            <a id="export-download" class="button primary" href=move || filters.with(|f| f.url()) download=move || filters.with(|f| f.file_name())>{t("downloads-download")}</a>
        </section>
    }
}
