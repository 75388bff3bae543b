//! "About you": a name and a contact, asked once before the first sync and never
//! required, then kept as one line that opens to change them. The name is asked here
//! only (records carry it); the contact is only for reviewers with a question about a
//! record; the name is published with open data only if the observer ticks the box
//! (unticked by default). Saving says what was kept and who sees it.

use leptos::prelude::*;

use crate::data::outbox::Outbox;
use crate::data::words::t;
use crate::data::{identity, sync};

/// "About you": open and asking while it has not been answered and there is something
/// to send; afterwards one line that opens to change the answers.
#[component]
pub fn AboutYou(outbox: Outbox) -> impl IntoView {
    let answered = RwSignal::new(identity::profile_answered());
    let name = RwSignal::new(identity::observer_name());
    let contact = RwSignal::new(identity::contact());
    let name_public = RwSignal::new(identity::name_public());
    let note = RwSignal::new(String::new());
    let something_to_send = move || outbox.entries.with(|e| !e.is_empty()) || outbox.walks.with(|w| !w.is_empty());
    let save = move |_| {
        let (given_name, given_contact, named) =
            (name.get_untracked(), contact.get_untracked(), name_public.get_untracked());
        identity::keep_profile(&given_name, &given_contact, named);
        note.set(identity::saved_words(&given_name, &given_contact, named));
        answered.set(true);
        sync::request(outbox);
    };
    let skip = move |_| {
        identity::skip_profile();
        note.set(t("about-not-now-note"));
        answered.set(true);
    };
    let summary = move || identity::summary_words(&name.get(), &contact.get());
    view! {
        <Show when=move || answered.get() || something_to_send()>
            <details id="about-you" class="card about-you" prop:open=move || !answered.get()>
                <summary><b>{t("about-heading")}</b>" · "<span id="about-summary">{summary}</span></summary>
                <p class="hint">{t("about-both-optional")}</p>
                <label>{t("about-name")}" "<input id="about-name" autocomplete="name" prop:value=move || name.get() on:input=move |ev| name.set(event_target_value(&ev)) /></label>
                <label class="check"><input id="about-name-public" type="checkbox" prop:checked=move || name_public.get() on:change=move |ev| name_public.set(event_target_checked(&ev)) />{t("about-name-public")}</label>
                <p class="hint">{t("about-open-data")}</p>
                <label>{t("about-contact")}" "<input id="about-contact" autocomplete="email" prop:value=move || contact.get() on:input=move |ev| contact.set(event_target_value(&ev)) /></label>
                <p class="hint">{t("about-contact-use")}</p>
                <div class="actions">
                    <button id="about-save" type="button" class="primary" on:click=save>{t("about-save")}</button>
                    <Show when=move || !answered.get()>
                        <button id="about-skip" type="button" on:click=skip>{t("about-not-now")}</button>
                    </Show>
                </div>
            </details>
        </Show>
        <p id="about-note" class="hint" role="status">{move || note.get()}</p>
    }
}
