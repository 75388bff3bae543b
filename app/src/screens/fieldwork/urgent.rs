//! `#urgent`: live animals for responders, those still awaiting a response first — each
//! with its place (a map link with the coordinates), time, what the finder wrote, the
//! photos, the finder's contact (reviewers and admins only), how the responders were
//! told, the response log and the form to add to it. The usual cautions come first.

use leptos::prelude::*;
use shared_types::{Role, UrgentItem};

use crate::data::fieldwork::{map_link, notification_words, web_map_link};
use crate::data::{api, readable};
use crate::screens::fieldwork::response::{ResponseForm, ResponseLog};

mod words {
    pub const HEADING: &str = "Live animals";
    pub const CAUTIONS: [&str; 3] = [
        "Keep back, and keep dogs and people back: a shark can bite and a ray's spine can sting, even when it seems weak.",
        "Do not drag or push it back to sea unless you are trained: you can hurt it and yourself.",
        "Local rules and the directions of the responders in charge come first. Watch the tide.",
    ];
    pub const NONE: &str = "No live animals reported.";
    pub const AWAITING: &str = "awaiting a response";
    pub const ANSWERED: &str = "response logged";
    pub const NO_PLACE: &str = "no position given";
    pub const MAP: &str = "open in the map app";
    pub const WEB_MAP: &str = "OpenStreetMap";
    pub const FINDER_SAID: &str = "The finder wrote";
    pub const NOTHING_WRITTEN: &str = "The finder wrote nothing more.";
    pub const FINDER: &str = "Finder";
    pub const NO_CONTACT: &str = "no contact given";
    pub const NOT_TOLD: &str = "No notification channel is set up for the responders.";
    pub const LOG: &str = "Log a response";
    pub const CLOSE: &str = "Close the form";
    pub const RELOAD: &str = "Refresh";
}

/// What was found, how many, and how big.
fn headline(item: &UrgentItem) -> String {
    let sub = &item.record.submission;
    let what = sub.species_guess.as_ref().map(|g| g.as_str().to_owned()).unwrap_or_else(|| "unnamed".into());
    let size = sub.length.map(|l| format!(", {:.0} cm {}", l.value.centimetres(), l.kind.label())).unwrap_or_default();
    format!("{what} × {}{size} · {}", sub.count.get(), sub.setting.label())
}

#[component]
fn UrgentEntry(
    item: UrgentItem,
    open: RwSignal<Option<String>>,
    reload: impl Fn() + Copy + Send + Sync + 'static,
) -> impl IntoView {
    let sub = item.record.submission.clone();
    let id = sub.client_id.to_string();
    let awaiting = item.responses.is_empty();
    let place = match sub.position {
        Some(p) => {
            let (lat, lon) = (p.latitude.get(), p.longitude.get());
            let within = p.accuracy_m.map(|a| format!(" (within {:.0} m)", a.get())).unwrap_or_default();
            view! {
                <p class="urgent-place">{format!("{lat:.5}, {lon:.5}{within} · ")}
                    <a class="map-link" href=map_link(lat, lon)>{words::MAP}</a>" · "
                    <a class="map-link" href=web_map_link(lat, lon) rel="noopener" target="_blank">{words::WEB_MAP}</a>
                </p>
            }
            .into_any()
        }
        None => view! { <p class="urgent-place">{words::NO_PLACE}</p> }.into_any(),
    };
    let wrote = match &sub.notes {
        Some(n) => format!("{}: \u{201c}{}\u{201d}", words::FINDER_SAID, n.as_str()),
        None => words::NOTHING_WRITTEN.to_owned(),
    };
    let finder = item.finder.clone().map(|f| {
        let name = f.display_name.unwrap_or_else(|| "no name given".into());
        let reach = f.contact.unwrap_or_else(|| words::NO_CONTACT.into());
        view! { <p class="urgent-finder">{format!("{}: {name} · {reach}", words::FINDER)}</p> }
    });
    let told = if item.notifications.is_empty() {
        view! { <p class="hint">{words::NOT_TOLD}</p> }.into_any()
    } else {
        let lines = item.notifications.iter().map(|n| view! { <li>{notification_words(n)}</li> }).collect_view();
        view! { <ul class="notifications">{lines}</ul> }.into_any()
    };
    let photos = item.record.photos.iter().enumerate().map(|(i, p)| view! {
        <a href=format!("/photos/{}", p.sha256) target="_blank"><img class="urgent-photo" src=format!("/photos/{}/thumb", p.sha256) alt=format!("photo {} of the animal", i + 1) /></a>
    }).collect_view();
    let (form_id, toggle_id) = (id.clone(), id.clone());
    let is_open = move || open.with(|o| o.as_deref() == Some(toggle_id.as_str()));
    let toggle = {
        let id = id.clone();
        move |_| open.update(|o| *o = if o.as_deref() == Some(id.as_str()) { None } else { Some(id.clone()) })
    };
    let is_open_label = is_open.clone();
    view! {
        <li class=if awaiting { "urgent-item awaiting card" } else { "urgent-item card" } data-client-id=id>
            <p class="urgent-state"><span class="badge">{if awaiting { words::AWAITING } else { words::ANSWERED }}</span></p>
            <h3>{headline(&item)}</h3>
            <p class="urgent-time">{format!("seen {} · received {}", readable::time(&sub.observed_at), item.record.received_at.format("%Y-%m-%d %H:%M UTC"))}</p>
            {place}
            <p class="urgent-wrote">{wrote}</p>
            <div class="photos">{photos}</div>
            {finder}
            {told}
            <ResponseLog responses=item.responses.clone() />
            <button type="button" class="small response-toggle" on:click=toggle>{move || if is_open_label() { words::CLOSE } else { words::LOG }}</button>
            <Show when=is_open.clone()>
                <ResponseForm client_id=form_id.clone() done=move || { open.set(None); reload(); } />
            </Show>
        </li>
    }
}

/// The live-animal list; `role` only decides what the server shows (the finder's contact).
#[component]
pub fn UrgentScreen(role: Role) -> impl IntoView {
    let items = RwSignal::new(None::<Vec<UrgentItem>>);
    let problem = RwSignal::new(String::new());
    let open = RwSignal::new(None::<String>);
    let reload = move || {
        leptos::task::spawn_local(async move {
            match api::fieldwork::urgent().await {
                Ok(list) => {
                    problem.set(String::new());
                    items.set(Some(list));
                }
                Err(err) => problem.set(err.to_string()),
            }
        });
    };
    reload();
    view! {
        <section id="urgent" class="card review" data-role=role.code()>
            <h2>{words::HEADING}</h2>
            <ul id="urgent-cautions" class="safety live-animal" role="note">
                {words::CAUTIONS.iter().map(|c| view! { <li>{*c}</li> }).collect_view()}
            </ul>
            <button id="urgent-reload" type="button" class="small" on:click=move |_| reload()>{words::RELOAD}</button>
            <p class="problems" role="alert">{move || problem.get()}</p>
            {move || items.get().map(|list| if list.is_empty() {
                view! { <p id="urgent-none" class="hint">{words::NONE}</p> }.into_any()
            } else {
                view! {
                    <ol id="urgent-list" class="plain">
                        {list.into_iter().map(|item| view! { <UrgentEntry item=item open=open reload=reload /> }).collect_view()}
                    </ol>
                }.into_any()
            })}
        </section>
    }
}
