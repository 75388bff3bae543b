//! The live-animal panel, on top of the record form as soon as the observer says the
//! animal is alive: the cautions first (keep back, do not push it back to sea untrained,
//! follow the responders), then the call button with the operator's responders' number,
//! then what to do while help comes. The record itself is sent before anything else.

use leptos::prelude::*;

use crate::data::site::dial_number;
use crate::data::words::{t, t_args};

#[component]
pub fn LivePanel(responders: Signal<Option<String>>) -> impl IntoView {
    let call = move || {
        responders.get().map(|line| match dial_number(&line) {
            Some(number) => view! {
                <a id="call-responders" class="call-button" href=format!("tel:{number}")>{t_args("live-call-number", &[("number", line.clone().into())])}</a>
            }
            .into_any(),
            None => view! { <p id="call-responders" class="call-words"><b>{t_args("live-call-number", &[("number", line.clone().into())])}</b></p> }.into_any(),
        })
    };
    view! {
        <section id="live-animal" class="live-animal" role="alert">
            <h3>{t("live-heading")}</h3>
            <ul id="live-cautions" class="safety">
                <li>{t("live-keep-back")}</li>
                <li>{t("live-no-pushing")}</li>
                <li>{t("live-follow")}</li>
            </ul>
            {call}
            <Show when=move || responders.with(Option::is_none)>
                <p id="call-responders" class="call-words"><b>{t("live-call")}</b></p>
            </Show>
            <ol id="live-steps" class="live-steps">
                <li>{t("live-step-say")}</li>
                <li>{t("live-step-photos")}</li>
                <li>{t("live-step-stay")}</li>
                <li>{t("live-step-save")}</li>
            </ol>
        </section>
    }
}
