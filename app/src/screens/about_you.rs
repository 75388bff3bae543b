//! "About you": asked once before the first sync, never required — a name and a
//! contact, the contact only for reviewers with a question about a record, and whether
//! the name may be published with open data (unticked unless the observer ticks it).

use leptos::prelude::*;

use crate::data::outbox::Outbox;
use crate::data::{identity, sync};

/// "About you", shown once there is something to send until it is answered or skipped.
#[component]
pub fn AboutYou(outbox: Outbox) -> impl IntoView {
    let answered = RwSignal::new(identity::profile_answered());
    let name = RwSignal::new(identity::observer_name());
    let contact = RwSignal::new(identity::contact());
    let name_public = RwSignal::new(identity::name_public());
    let something_to_send = move || outbox.entries.with(|e| !e.is_empty()) || outbox.walks.with(|w| !w.is_empty());
    let save = move |_| {
        identity::keep_profile(&name.get_untracked(), &contact.get_untracked(), name_public.get_untracked());
        answered.set(true);
        sync::request(outbox);
    };
    let skip = move |_| {
        identity::skip_profile();
        answered.set(true);
    };
    view! {
        <Show when=move || !answered.get() && something_to_send()>
            <section id="about-you" class="card">
                <h2>"About you (optional)"</h2>
                <p class="hint">"Reviewers may want to ask you about a find. Both boxes may stay empty; your records are sent either way."</p>
                <label>"Your name" <input id="about-name" autocomplete="name" prop:value=move || name.get() on:input=move |ev| name.set(event_target_value(&ev)) /></label>
                <label class="check"><input id="about-name-public" type="checkbox" prop:checked=move || name_public.get() on:change=move |ev| name_public.set(event_target_checked(&ev)) />"Publish my name with my records in open data"</label>
                <p class="hint">"Records are shared as open data for research. Unticked, they are shared without your name, under an anonymous label."</p>
                <label>"Email or phone number" <input id="about-contact" autocomplete="email" prop:value=move || contact.get() on:input=move |ev| contact.set(event_target_value(&ev)) /></label>
                <p class="hint">"Your contact is only for reviewers with a question about your records. It is never published, never exported and never shown to anyone else."</p>
                <div class="actions">
                    <button id="about-save" type="button" class="primary" on:click=save>"Save"</button>
                    <button id="about-skip" type="button" on:click=skip>"Not now"</button>
                </div>
            </section>
        </Show>
    }
}
