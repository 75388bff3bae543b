//! The survey-walk bar above the record form: start a walk (on a named stretch,
//! saying whether every find will be reported), see its time, distance and fixes while
//! it goes on, end it — or enter a past walk by hand — and the last walks' states.

use leptos::prelude::*;

use crate::data::outbox::Outbox;
use crate::data::time::{self, BrowserZone};
use crate::data::walks::{self, WalkEntry, WalkState};
use crate::data::words::{self, t, t_args};
use crate::data::{sync, walk_track};

/// Start, follow and end a walk, or enter a past one.
#[component]
pub fn WalkBar(outbox: Outbox) -> impl IntoView {
    let stretch = RwSignal::new(String::new());
    let all_finds = RwSignal::new(false);
    let note = RwSignal::new(String::new());
    let typed = RwSignal::new((String::new(), String::new(), String::new()));
    let active = Memo::new(move |_| outbox.walks.with(|w| w.iter().find(|e| e.state == WalkState::Walking).cloned()));
    let tick = RwSignal::new(0u32);
    // Keep the elapsed time fresh while a walk goes on.
    let _ =
        set_interval_with_handle(move || tick.update(|t| *t = t.wrapping_add(1)), std::time::Duration::from_secs(15));

    let store_and_sync = move |entry: WalkEntry| {
        leptos::task::spawn_local(async move {
            match walks::save(&entry).await {
                Ok(()) => {
                    outbox.reload().await;
                    sync::request(outbox);
                }
                Err(err) => note.set(t_args("walk-not-saved", &[("problem", err.into())])),
            }
        });
    };
    let start = move |_| {
        let entry = WalkEntry::start(&stretch.get_untracked(), all_finds.get_untracked(), time::now());
        // Follow only once the walk is stored, so the first fix has a walk to join.
        leptos::task::spawn_local(async move {
            match walks::save(&entry).await {
                Ok(()) => {
                    outbox.reload().await;
                    walk_track::follow(outbox, note);
                }
                Err(err) => note.set(t_args("walk-not-saved", &[("problem", err.into())])),
            }
        });
    };
    let end = move |_| {
        let Some(mut entry) = active.get_untracked() else { return };
        walk_track::stop_following();
        entry.end(time::now());
        store_and_sync(entry);
    };
    let save_typed = move |_| {
        let (from, to, km) = typed.get_untracked();
        match WalkEntry::typed(&BrowserZone, &stretch.get_untracked(), all_finds.get_untracked(), (&from, &to, &km)) {
            Ok(entry) => {
                note.set(t("walk-saved"));
                store_and_sync(entry);
            }
            Err(problem) => note.set(problem),
        }
    };

    view! {
        <section class="card walk-bar">
            {move || match active.get() {
                Some(walk) => {
                    tick.track();
                    let minutes = (time::now() - walk.started_at).num_minutes();
                    view! {
                        <div id="walk-active">
                            <p><b>{t_args("walk-active", &[("title", walk.title().into())])}</b></p>
                            <p id="walk-progress">{t_args("walk-progress", &[("minutes", words::number(minutes as f64, 0).into()), ("km", words::number(walk.kilometres(), 2).into()), ("points", walk.track.len().into())])}</p>
                            <p class="hint">{if walk.all_finds_reported { t("walk-all-finds-on") } else { t("walk-not-all-finds") }}</p>
                            <p class="hint">{t("walk-linked")}</p>
                            <button id="end-walk" type="button" class="primary" on:click=end>{t("walk-end")}</button>
                        </div>
                    }.into_any()
                }
                None => view! {
                    <details id="walk-start">
                        <summary>{t("walk-heading")}</summary>
                        <p class="hint">{t("walk-why")}</p>
                        <label>{t("walk-stretch")}" "<input id="walk-stretch" prop:value=move || stretch.get() on:input=move |ev| stretch.set(event_target_value(&ev)) /></label>
                        <label class="check"><input id="walk-all-finds" type="checkbox" prop:checked=move || all_finds.get() on:change=move |ev| all_finds.set(event_target_checked(&ev)) />
                            {t("walk-all-finds")}</label>
                        <button id="start-walk" type="button" class="primary" on:click=start>{t("walk-start")}</button>
                        <details>
                            <summary>{t("walk-past")}</summary>
                            <div class="row">
                                <label>{t("walk-started")}" "<input id="walk-from" type="datetime-local" on:input=move |ev| typed.update(|t| t.0 = event_target_value(&ev)) /></label>
                                <label>{t("walk-ended")}" "<input id="walk-to" type="datetime-local" on:input=move |ev| typed.update(|t| t.1 = event_target_value(&ev)) /></label>
                                <label>{t("walk-distance")}" "<input id="walk-km" inputmode="decimal" on:input=move |ev| typed.update(|t| t.2 = event_target_value(&ev)) /></label>
                            </div>
                            <button id="save-past-walk" type="button" on:click=save_typed>{t("walk-save")}</button>
                        </details>
                    </details>
                }.into_any(),
            }}
            <p id="walk-note" class="hint">{move || note.get()}</p>
            <ul id="walk-list">
                {move || outbox.walks.get().into_iter().filter(|w| w.state != WalkState::Walking).take(5).map(|w| view! {
                    <li class="walk-entry" data-client-id=w.client_id.to_string()>
                        {t_args("walk-list-item", &[("title", w.title().into()), ("km", words::number(w.kilometres(), 2).into())])}" · "
                        <span class="state">{w.state.label()}</span>
                    </li>
                }).collect_view()}
            </ul>
        </section>
    }
}
