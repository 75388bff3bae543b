//! The page: safety cautions before the first record, the connection and sync status,
//! the record form, and the records kept on this phone.

use leptos::prelude::*;
use wasm_bindgen::JsCast;
use wasm_bindgen::closure::Closure;

use crate::device;
use crate::form::RecordForm;
use crate::outbox::{self, Entry, SyncState};
use crate::sync::{self, Outbox, SyncStatus};
use crate::walks::{self, WalkBar, WalkEntry, WalkState};

const SAFETY_KEY: &str = "wrackline.safety-read";

fn local_flag(key: &str) -> bool {
    web_sys::window()
        .and_then(|w| w.local_storage().ok().flatten())
        .and_then(|s| s.get_item(key).ok().flatten())
        .is_some()
}

fn set_local_flag(key: &str) {
    if let Some(storage) = web_sys::window().and_then(|w| w.local_storage().ok().flatten()) {
        let _ = storage.set_item(key, "yes");
    }
}

fn online_now() -> bool {
    web_sys::window().map(|w| w.navigator().on_line()).unwrap_or(true)
}

fn current_hash() -> String {
    web_sys::window().and_then(|w| w.location().hash().ok()).unwrap_or_default()
}

/// Calls `act` whenever the address's `#…` part changes (the reviewers' screens).
fn on_hash_change(act: impl Fn() + 'static) {
    let Some(window) = web_sys::window() else { return };
    let closure = Closure::<dyn Fn()>::new(act);
    let _ = window.add_event_listener_with_callback("hashchange", closure.as_ref().unchecked_ref());
    closure.forget();
}

/// Calls `act` whenever the browser says the connection came back or went away.
fn on_connection_change(act: impl Fn(bool) + 'static) {
    let Some(window) = web_sys::window() else { return };
    let act = std::rc::Rc::new(act);
    for (event, online) in [("online", true), ("offline", false)] {
        let act = act.clone();
        let closure = Closure::<dyn Fn()>::new(move || act(online));
        let _ = window.add_event_listener_with_callback(event, closure.as_ref().unchecked_ref());
        // The listener lives as long as the page.
        closure.forget();
    }
}

#[component]
pub fn App() -> impl IntoView {
    let safety_read = RwSignal::new(local_flag(SAFETY_KEY));
    let outbox = Outbox {
        entries: RwSignal::new(Vec::<Entry>::new()),
        walks: RwSignal::new(Vec::<WalkEntry>::new()),
        replies: RwSignal::new(Vec::new()),
        my_records: RwSignal::new(crate::mine::cached_records()),
        status: RwSignal::new(SyncStatus::default()),
    };
    let online = RwSignal::new(online_now());
    let storage_problem = RwSignal::new(None::<String>);
    let walk_note = RwSignal::new(String::new());

    leptos::task::spawn_local(async move {
        device::request_persistence().await;
        let loaded = async {
            outbox.entries.set(outbox::load_all().await?);
            outbox.walks.set(walks::load_all().await?);
            outbox.replies.set(crate::mine::load_replies().await?);
            Ok::<(), String>(())
        };
        if let Err(err) = loaded.await {
            storage_problem.set(Some(err));
        }
        // A walk still going on when the page was closed goes on being followed.
        if outbox.walks.with_untracked(|w| w.iter().any(|e| e.state == WalkState::Walking)) {
            walks::follow(outbox, walk_note);
        }
        if online_now() {
            sync::request(outbox);
        }
    });
    on_connection_change(move |is_online| {
        online.set(is_online);
        if is_online {
            sync::request(outbox);
        }
    });

    let screen = RwSignal::new(current_hash());
    on_hash_change(move || screen.set(current_hash()));

    view! {
        <header class="top">
            <h1><a href="#">"wrackline"</a></h1>
            <a class="pill review-link" href="#figures">"Figures"</a>
            <a class="pill review-link" href="#review">"Review"</a>
            <span id="connection" class=move || if online.get() { "pill online" } else { "pill offline" }>
                {move || if online.get() { "online" } else { "offline: records wait on this phone" }}
            </span>
        </header>
        <main>
            {move || storage_problem.get().map(|p| view! {
                <p class="problems" role="alert">{format!("Offline storage is not working: {p}. Records cannot be kept on this phone.")}</p>
            })}
            <Show when=move || screen.get() == "#review">
                <crate::review::ReviewScreen />
            </Show>
            <Show when=move || screen.get() == "#people">
                <crate::review::PeopleScreen />
            </Show>
            <Show when=move || screen.get() == "#figures">
                <crate::figures::FiguresScreen />
            </Show>
            <Show when=move || !["#review", "#people", "#figures"].contains(&screen.get().as_str())>
            <Show when=move || safety_read.get() fallback=move || view! { <SafetyCautions on_read=move || { set_local_flag(SAFETY_KEY); safety_read.set(true); } /> }>
                <WalkBar outbox=outbox />
                <RecordForm outbox=outbox />
                <crate::identity::AboutYou outbox=outbox />
                <OnThisPhone outbox=outbox />
                <crate::mine::MyRecords outbox=outbox />
                <details class="safety-again"><summary>"Safety reminders"</summary><SafetyText /></details>
            </Show>
            </Show>
        </main>
    }
}

/// The cautions, in our own words; they defer to local rules and responders.
#[component]
fn SafetyText() -> impl IntoView {
    view! {
        <ul class="safety">
            <li>"Keep back from any live animal and keep dogs away. A shark that looks dead can still bite."</li>
            <li>"Stingray tail spines are venomous, even on a dead animal. If stung: put the wound in water as hot as you can bear (about 45 °C) for at least 30 minutes, and get medical help."</li>
            <li>"Do not drag or push a live stranded animal back to sea unless you are trained. Call the local stranding responders or the coastguard."</li>
            <li>"Watch the tide, the waves and your footing. No record is worth being cut off."</li>
            <li>"Do not eat a stranded animal or take parts of it: it may be unsafe, and for protected species it may be illegal. Wash your hands after touching anything."</li>
            <li>"Local rules and the directions of responders and authorities come first."</li>
        </ul>
    }
}

#[component]
fn SafetyCautions(on_read: impl Fn() + 'static) -> impl IntoView {
    view! {
        <section class="card safety-card">
            <h2>"Before your first record"</h2>
            <SafetyText />
            <button id="safety-ok" class="primary" on:click=move |_| on_read()>"I have read this"</button>
        </section>
    }
}

fn entry_summary(entry: &Entry) -> String {
    let sub = &entry.submission;
    let what = sub
        .species_guess
        .as_ref()
        .map(|g| g.as_str().to_owned())
        .filter(|g| !g.is_empty())
        .unwrap_or_else(|| "unnamed animal".into());
    let length =
        sub.length.map(|l| format!(", {:.0} cm {}", l.value.centimetres(), l.kind.label())).unwrap_or_default();
    format!("{what}{length} · {} · {} photo(s)", sub.observed_at.format("%Y-%m-%d %H:%M"), entry.photo_count)
}

/// Puts a record on a walk: inside the submission while it has not been sent, or as a
/// link sent on its own once it may have reached the server (changing a sent record's
/// content would make its resend a conflict).
fn add_to_walk(mut entry: Entry, walk: uuid::Uuid) -> Entry {
    if matches!(entry.sync, SyncState::Received { .. } | SyncState::Sent) {
        entry.walk_link_pending = Some(walk);
    } else {
        entry.submission.walk_client_id = Some(walk);
    }
    entry
}

#[component]
fn OnThisPhone(outbox: Outbox) -> impl IntoView {
    let entries = outbox.entries;
    let status = outbox.status;
    // Changes an entry as it is stored now, not as the list drew it (the sync loop may
    // have moved it on since), then saves it and syncs.
    let change_then_sync = move |id: String, change: Box<dyn FnOnce(Entry) -> Entry>| {
        leptos::task::spawn_local(async move {
            let Some(current) = outbox::load_all().await.ok().and_then(|all| all.into_iter().find(|e| e.id() == id))
            else {
                return;
            };
            if outbox::save(&change(current), None).await.is_ok() {
                sync::refresh(outbox).await;
                sync::request(outbox);
            }
        });
    };
    let queue = move |id: String| {
        change_then_sync(
            id,
            Box::new(|mut entry: Entry| {
                entry.sync = SyncState::Waiting;
                entry
            }),
        );
    };
    let discard = move |id: String| {
        leptos::task::spawn_local(async move {
            if device::delete_entry(&id).await.is_ok() {
                sync::refresh(outbox).await;
            }
        });
    };
    let walk_choices = move || outbox.walks.with(|w| w.iter().map(|e| (e.client_id, e.title())).collect::<Vec<_>>());
    view! {
        <section class="card outbox">
            <div class="row spread">
                <h2>"On this phone"</h2>
                <button id="send-now" type="button" on:click=move |_| sync::request(outbox)>"Send now"</button>
            </div>
            <p id="sync-status" class="hint">{move || status.with(|s| match (&s.running, &s.next_retry, &s.last_problem) {
                (true, _, _) => "sending…".to_owned(),
                (false, Some(delay), Some(problem)) => format!("{problem}; trying again in {} s", delay.as_secs()),
                _ => String::new(),
            })}</p>
            <ul id="outbox-list">
                {move || entries.get().into_iter().map(|entry| {
                    let summary = entry_summary(&entry);
                    let state = entry.sync.clone();
                    let id = entry.id();
                    let is_draft = state == SyncState::Draft;
                    let draft_id = id.clone();
                    let queue_id = id.clone();
                    let walk_id = id.clone();
                    let on_walk = entry.walk().is_some();
                    view! {
                        <li class="outbox-entry" data-client-id=id.clone()>
                            <span class="summary">{summary}</span>
                            <span class=state.css_class()>{state.label()}</span>
                            {entry.last_error.clone().filter(|_| state.wants_sending() || matches!(state, SyncState::Received { .. })).map(|e| view! { <span class="hint">{e}</span> })}
                            {on_walk.then(|| view! { <span class="hint walk-link">"on a survey walk"</span> })}
                            <Show when=move || is_draft>
                                <button type="button" class="small" on:click={let id = queue_id.clone(); move |_| queue(id.clone())}>"Send"</button>
                                <button type="button" class="small" on:click={let id = draft_id.clone(); move |_| discard(id.clone())}>"Discard"</button>
                            </Show>
                            <Show when=move || !on_walk && !walk_choices().is_empty()>
                                <select class="add-to-walk" on:change={let id = walk_id.clone(); move |ev| {
                                    if let Ok(walk) = uuid::Uuid::parse_str(&event_target_value(&ev)) {
                                        change_then_sync(id.clone(), Box::new(move |entry| add_to_walk(entry, walk)));
                                    }
                                }}>
                                    <option value="">"Add to a walk…"</option>
                                    {walk_choices().into_iter().map(|(walk, title)| view! { <option value=walk.to_string()>{title}</option> }).collect_view()}
                                </select>
                            </Show>
                        </li>
                    }
                }).collect_view()}
            </ul>
        </section>
    }
}
