//! "On this phone": the records kept on the phone with their sync states and the
//! last problem, "Send now", and for each record: send or discard a draft, edit and
//! send again or discard one the server did not accept, or add it to a walk.

use leptos::prelude::*;

use crate::data::outbox::{self, Entry, Outbox, SyncState};
use crate::data::sync;
use crate::data::words::t;

#[component]
pub fn OnThisPhone(outbox: Outbox) -> impl IntoView {
    let entries = outbox.entries;
    let status = outbox.status;
    // Changes an entry as it is stored now, not as the list drew it (the sync loop may
    // have moved it on since), then saves it and syncs.
    let change_then_sync = move |id: String, change: Box<dyn FnOnce(&mut Entry)>| {
        leptos::task::spawn_local(async move {
            if let Ok(Some(_)) = outbox::update(&id, change).await {
                outbox.reload().await;
                sync::request(outbox);
            }
        });
    };
    let queue = move |id: String| change_then_sync(id, Box::new(|entry: &mut Entry| entry.sync = SyncState::Waiting));
    let discard = move |id: String| {
        leptos::task::spawn_local(async move {
            if outbox::discard(&id).await.is_ok() {
                outbox.reload().await;
            }
        });
    };
    let walk_choices = move || outbox.walks.with(|w| w.iter().map(|e| (e.client_id, e.title())).collect::<Vec<_>>());
    view! {
        <section class="card outbox">
            <div class="row spread">
                <h2>{t("phone-outbox-heading")}</h2>
                <button id="send-now" type="button" on:click=move |_| sync::request(outbox)>{t("phone-send-now")}</button>
            </div>
            <p id="sync-status" class="hint">{move || status.with(|s| s.words())}</p>
            <ul id="outbox-list">
                {move || entries.get().into_iter().map(|entry| {
                    let summary = entry.summary();
                    let state = entry.sync.clone();
                    let id = entry.id();
                    let is_draft = state == SyncState::Draft;
                    let is_refused = matches!(state, SyncState::Refused { .. });
                    let (edit_id, refused_id) = (id.clone(), id.clone());
                    let draft_id = id.clone();
                    let queue_id = id.clone();
                    let walk_id = id.clone();
                    let on_walk = entry.walk().is_some();
                    let urgent = entry.submission.is_urgent();
                    view! {
                        <li class="outbox-entry" data-client-id=id.clone()>
                            {urgent.then(|| view! { <span class="urgent-mark">{t("phone-live-sent-first")}</span> })}
                            <span class="summary">{summary}</span>
                            <span class=state.css_class()>{state.label()}</span>
                            {entry.problem_shown().map(|e| view! { <span class="hint">{e.to_owned()}</span> })}
                            {on_walk.then(|| view! { <span class="hint walk-link">{t("phone-on-walk")}</span> })}
                            <Show when=move || is_refused>
                                <button type="button" class="small edit-refused" on:click={let id = edit_id.clone(); move |_| outbox.editing.set(Some(id.clone()))}>{t("phone-edit-again")}</button>
                                <button type="button" class="small discard-refused" on:click={let id = refused_id.clone(); move |_| discard(id.clone())}>{t("phone-discard")}</button>
                            </Show>
                            <Show when=move || is_draft>
                                <button type="button" class="small" on:click={let id = queue_id.clone(); move |_| queue(id.clone())}>{t("phone-send")}</button>
                                <button type="button" class="small" on:click={let id = draft_id.clone(); move |_| discard(id.clone())}>{t("phone-discard")}</button>
                            </Show>
                            <Show when=move || !on_walk && !walk_choices().is_empty()>
                                <select class="add-to-walk" on:change={let id = walk_id.clone(); move |ev| {
                                    if let Ok(walk) = uuid::Uuid::parse_str(&event_target_value(&ev)) {
                                        change_then_sync(id.clone(), Box::new(move |entry: &mut Entry| entry.put_on_walk(walk)));
                                    }
                                }}>
                                    <option value="">{t("phone-add-to-walk")}</option>
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
