//! The page's language switch, in both bundles: each language named in its own words;
//! choosing one keeps it on this device and reloads the page in it.

use leptos::prelude::*;

use crate::data::words::{self, t};

/// A small menu of the languages the app speaks, the one in use selected.
#[component]
pub fn LanguageSwitch() -> impl IntoView {
    let current = words::language();
    view! {
        <select id="language" class="pill language" aria-label=t("language-switch")
            on:change=move |ev| words::choose_language(&event_target_value(&ev))>
            {words::LANGUAGES.iter().map(|(code, own_name, _)| view! {
                <option value=*code selected=*code == current>{*own_name}</option>
            }).collect_view()}
        </select>
    }
}
