//! The safety cautions, in our own words, shown before the first record, behind the
//! header's Safety link, and in front of every live-animal instruction on the desk. They
//! defer to local rules and responders. Both bundles use them.

use leptos::prelude::*;

/// Who to call, with the operator's number when there is one.
fn call_words(responders: Option<String>) -> String {
    match responders {
        Some(number) => format!("Live or stranded animal? Call the local responders: {number}. Or the coastguard."),
        None => "Live or stranded animal? Call the local stranding responders or the coastguard.".to_owned(),
    }
}

/// The cautions, in our own words; they defer to local rules and responders.
#[component]
pub fn SafetyText(responders: Signal<Option<String>>) -> impl IntoView {
    view! {
        <p class="responders"><b>{move || call_words(responders.get())}</b></p>
        <ul class="safety">
            <li>"Keep back from any live animal and keep dogs away. A shark that looks dead can still bite."</li>
            <li>"Spines are venomous, even on a dead animal: the tail spine (sting) of stingrays and eagle rays, and the spines at the front of the back fins of spurdogs (spiny dogfish) and chimaeras (rabbitfish). Do not hold them there. If stung: put the wound in water as hot as you can bear (about 45 °C) for at least 30 minutes, and get medical help."</li>
            <li>"Skates and thornback rays carry sharp thorns on the back and tail: wear gloves or leave them be."</li>
            <li>"Do not drag or push a live stranded animal back to sea unless you are trained."</li>
            <li>"Watch the tide, the waves and your footing. No record is worth being cut off."</li>
            <li>"Do not eat a stranded animal or take parts of it: it may be unsafe, and for protected species it may be illegal. Wash your hands after touching anything."</li>
            <li>"Local rules and the directions of responders and authorities come first."</li>
        </ul>
    }
}
