//! The phone's identity: a random token the server hands out on first sync
//! (`POST /api/devices`), kept in localStorage and sent as `Authorization: Bearer`
//! with everything the phone sends, so the observer sees the review of their own
//! records and nobody else's, and nobody else can put records on their walks. No
//! password is needed to start recording.
//!
//! Before the first sync the observer is asked, once and optionally, for a name and a
//! contact ("About you"). The contact is only for reviewers with a question about a
//! record: the server never publishes or exports it. Given later, or changed, it is
//! sent with the next sync (`PUT /api/my/profile`).

use leptos::prelude::*;
use shared_types::{DeviceIdentity, DeviceRequest, Text};

use crate::device;
use crate::sync::{self, Outbox};

const TOKEN_KEY: &str = "wrackline.device-token";
pub const OBSERVER_NAME_KEY: &str = "wrackline.observer-name";
const CONTACT_KEY: &str = "wrackline.observer-contact";
/// `unsent` (answered, not yet on the server), `sent`, or `skipped`; absent: not asked yet.
const PROFILE_KEY: &str = "wrackline.about-you";

fn storage() -> Option<web_sys::Storage> {
    web_sys::window()?.local_storage().ok().flatten()
}

fn stored(key: &str) -> Option<String> {
    storage().and_then(|s| s.get_item(key).ok().flatten())
}

fn store(key: &str, value: &str) {
    if let Some(storage) = storage() {
        let _ = storage.set_item(key, value);
    }
}

pub fn observer_name() -> String {
    stored(OBSERVER_NAME_KEY).unwrap_or_default()
}

pub fn remember_observer_name(name: &str) {
    store(OBSERVER_NAME_KEY, name);
}

/// The identity, if this phone has one yet.
pub fn token() -> Option<String> {
    stored(TOKEN_KEY)
}

/// What the observer chose to give, as the server takes it.
fn profile() -> DeviceRequest {
    let text = |value: String| Text::parse(value.trim()).ok().filter(|t| !t.as_str().is_empty());
    DeviceRequest { display_name: text(observer_name()), contact: text(stored(CONTACT_KEY).unwrap_or_default()) }
}

/// The identity, asking the server for one if this phone has none yet (with the name
/// and contact the observer gave, if any).
pub async fn ensure_token() -> Result<String, String> {
    if let Some(token) = token() {
        return Ok(token);
    }
    let body = serde_json::to_string(&profile()).map_err(|err| err.to_string())?;
    let answer = device::send_json("POST", "/api/devices", Some(&body), &[]).await?;
    if answer.status != 200 {
        return Err(format!("the server gave no identity ({})", answer.status));
    }
    let identity: DeviceIdentity = serde_json::from_str(&answer.body).map_err(|err| err.to_string())?;
    let storage = storage().ok_or("this browser keeps nothing (no localStorage)")?;
    storage.set_item(TOKEN_KEY, &identity.token).map_err(|_| "could not keep the identity on this phone".to_owned())?;
    if stored(PROFILE_KEY).as_deref() == Some("unsent") {
        store(PROFILE_KEY, "sent");
    }
    Ok(identity.token)
}

/// Sends a name and contact given (or changed) since the identity was made; the
/// problem, if it should be tried again.
pub async fn send_profile_if_changed(token: &str) -> Option<String> {
    if stored(PROFILE_KEY).as_deref() != Some("unsent") {
        return None;
    }
    let body = serde_json::to_string(&profile()).ok()?;
    match device::send_json("PUT", "/api/my/profile", Some(&body), &[("authorization", &bearer(token))]).await {
        Ok(answer) if (200..300).contains(&answer.status) => {
            store(PROFILE_KEY, "sent");
            None
        }
        Ok(answer) if answer.status == 408 || answer.status == 429 || answer.status >= 500 => {
            Some(format!("server answered {}", answer.status))
        }
        // Refused (a name too long?): keep it on the phone and stop asking the server.
        Ok(_) => {
            store(PROFILE_KEY, "sent");
            None
        }
        Err(err) => Some(format!("no connection ({err})")),
    }
}

/// `Authorization: Bearer <token>`.
pub fn bearer(token: &str) -> String {
    format!("Bearer {token}")
}

/// "About you", asked once before the first sync, never required.
#[component]
pub fn AboutYou(outbox: Outbox) -> impl IntoView {
    let answered = RwSignal::new(stored(PROFILE_KEY).is_some());
    let name = RwSignal::new(observer_name());
    let contact = RwSignal::new(stored(CONTACT_KEY).unwrap_or_default());
    let something_to_send = move || outbox.entries.with(|e| !e.is_empty()) || outbox.walks.with(|w| !w.is_empty());
    let save = move |_| {
        remember_observer_name(name.get_untracked().trim());
        store(CONTACT_KEY, contact.get_untracked().trim());
        store(PROFILE_KEY, "unsent");
        answered.set(true);
        sync::request(outbox);
    };
    let skip = move |_| {
        store(PROFILE_KEY, "skipped");
        answered.set(true);
    };
    view! {
        <Show when=move || !answered.get() && something_to_send()>
            <section id="about-you" class="card">
                <h2>"About you (optional)"</h2>
                <p class="hint">"Reviewers may want to ask you about a find. Both boxes may stay empty; your records are sent either way."</p>
                <label>"Your name" <input id="about-name" autocomplete="name" prop:value=move || name.get() on:input=move |ev| name.set(event_target_value(&ev)) /></label>
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
