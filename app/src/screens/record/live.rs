//! The live-animal panel, on top of the record form as soon as the observer says the
//! animal is alive: the cautions first (keep back, do not push it back to sea untrained,
//! follow the responders), then the call button with the operator's responders' number,
//! then what to do while help comes. The record itself is sent before anything else.

use leptos::prelude::*;

use crate::data::site::dial_number;

#[component]
pub fn LivePanel(responders: Signal<Option<String>>) -> impl IntoView {
    let call = move || {
        responders.get().map(|line| match dial_number(&line) {
            Some(number) => view! {
                <a id="call-responders" class="call-button" href=format!("tel:{number}")>{format!("Call the responders: {line}")}</a>
            }
            .into_any(),
            None => view! { <p id="call-responders" class="call-words"><b>{format!("Call the responders: {line}")}</b></p> }.into_any(),
        })
    };
    view! {
        <section id="live-animal" class="live-animal" role="alert">
            <h3>"A live animal: get help first"</h3>
            <ul id="live-cautions" class="safety">
                <li>"Keep back, and keep dogs and people back. A shark can bite and a ray's spine can sting, even when it seems weak."</li>
                <li>"Do not drag or push it back to sea unless you are trained: you can hurt it and yourself."</li>
                <li>"Follow the responders' directions when you reach them."</li>
            </ul>
            {call}
            <Show when=move || responders.with(Option::is_none)>
                <p id="call-responders" class="call-words"><b>"Call the local stranding responders or the coastguard now."</b></p>
            </Show>
            <ol id="live-steps" class="live-steps">
                <li>"Say where it is, what it is if you know, and whether the tide is coming in."</li>
                <li>"Take photos from where you stand; do not go closer for them."</li>
                <li>"If it is safe, stay nearby and keep others back until help comes."</li>
                <li>"Save this record: it goes to the responders before anything else, as soon as the phone has a connection."</li>
            </ol>
        </section>
    }
}
