//! "About you": a name and a contact, asked once before the first sync and never
//! required, then kept as one line that opens to change them. The name is asked here
//! only (records carry it); the contact is only for reviewers with a question about a
//! record. Saving says what was kept and who sees it.

use leptos::prelude::*;

use crate::data::outbox::Outbox;
use crate::data::{identity, sync};

/// "About you": open and asking while it has not been answered and there is something
/// to send; afterwards one line that opens to change the answers.
#[component]
pub fn AboutYou(outbox: Outbox) -> impl IntoView {
    let answered = RwSignal::new(identity::profile_answered());
    let name = RwSignal::new(identity::observer_name());
    let contact = RwSignal::new(identity::contact());
    let note = RwSignal::new(String::new());
    let something_to_send = move || outbox.entries.with(|e| !e.is_empty()) || outbox.walks.with(|w| !w.is_empty());
    let save = move |_| {
        let (given_name, given_contact) = (name.get_untracked(), contact.get_untracked());
        identity::keep_profile(&given_name, &given_contact);
        note.set(identity::saved_words(&given_name, &given_contact));
        answered.set(true);
        sync::request(outbox);
    };
    let skip = move |_| {
        identity::skip_profile();
        note.set("Not now: your records are sent without a name. You can add one here at any time.".into());
        answered.set(true);
    };
    let summary = move || identity::summary_words(&name.get(), &contact.get());
    view! {
        <Show when=move || answered.get() || something_to_send()>
            <details id="about-you" class="card about-you" prop:open=move || !answered.get()>
                <summary><b>"About you"</b>" · "<span id="about-summary">{summary}</span></summary>
                <p class="hint">"Both boxes may stay empty; your records are sent either way."</p>
                <label>"Your name (shown with your records)" <input id="about-name" autocomplete="name" prop:value=move || name.get() on:input=move |ev| name.set(event_target_value(&ev)) /></label>
                <label>"Email or phone number" <input id="about-contact" autocomplete="email" prop:value=move || contact.get() on:input=move |ev| contact.set(event_target_value(&ev)) /></label>
                <p class="hint">"Your contact is only for reviewers with a question about your records. It is never published, never exported and never shown to anyone else."</p>
                <div class="actions">
                    <button id="about-save" type="button" class="primary" on:click=save>"Save"</button>
                    <Show when=move || !answered.get()>
                        <button id="about-skip" type="button" on:click=skip>"Not now"</button>
                    </Show>
                </div>
            </details>
        </Show>
        <p id="about-note" class="hint" role="status">{move || note.get()}</p>
    }
}
