//! The safety cautions, in our own words, shown before the first record, behind the
//! header's Safety link, and in front of every live-animal instruction on the desk. They
//! defer to local rules and responders. Both bundles use them.

use leptos::prelude::*;

use crate::data::words::{t, t_args};

/// Who to call, with the operator's number when there is one.
fn call_words(responders: Option<String>) -> String {
    match responders {
        Some(number) => t_args("safety-call-number", &[("number", number.into())]),
        None => t("safety-call"),
    }
}

/// The cautions, in our own words; they defer to local rules and responders.
#[component]
pub fn SafetyText(responders: Signal<Option<String>>) -> impl IntoView {
    view! {
        <p class="responders"><b>{move || call_words(responders.get())}</b></p>
        <ul class="safety">
            <li>{t("safety-keep-back")}</li>
            <li>{t("safety-spines")}</li>
            <li>{t("safety-thorns")}</li>
            <li>{t("safety-no-pushing")}</li>
            <li>{t("safety-tide")}</li>
            <li>{t("safety-no-eating")}</li>
            <li>{t("safety-local-rules")}</li>
        </ul>
    }
}
