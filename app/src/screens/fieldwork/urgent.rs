//! `#urgent`: live animals for responders, those still awaiting a response first — each
//! with its place (a map link with the coordinates), time, what the finder wrote, the
//! photos, the finder's contact (reviewers and admins only), how the responders were
//! told, the response log and the form to add to it. The usual cautions come first.

use leptos::prelude::*;
use shared_types::{Role, UrgentItem};

use crate::data::fieldwork::{map_link, notification_words, web_map_link};
use crate::data::words::{self, t, t_args};
use crate::data::{api, labels, photos, readable};
use crate::screens::fieldwork::response::{ResponseForm, ResponseLog};

/// What was found, how many, and how big.
fn headline(item: &UrgentItem) -> String {
    let sub = &item.record.submission;
    let what = sub.species_guess.as_ref().map(|g| g.as_str().to_owned()).unwrap_or_else(|| t("urgent-unnamed"));
    let size = sub
        .length
        .map(|l| {
            let cm = words::number(l.value.centimetres(), 0);
            t_args("record-summary-length", &[("cm", cm.into()), ("kind", labels::length_kind(l.kind).into())])
        })
        .unwrap_or_default();
    format!("{what} × {}{size} · {}", sub.count.get(), labels::setting(sub.setting))
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
            let within = p
                .accuracy_m
                .map(|a| t_args("urgent-within", &[("metres", words::number(a.get(), 0).into())]))
                .unwrap_or_default();
            view! {
                <p class="urgent-place">{format!("{lat:.5}, {lon:.5}{within} · ")}
                    <a class="map-link" href=map_link(lat, lon)>{t("urgent-map")}</a>" · "
                    <a class="map-link" href=web_map_link(lat, lon) rel="noopener" target="_blank">{t("urgent-web-map")}</a>
                </p>
            }
            .into_any()
        }
        None => view! { <p class="urgent-place">{t("urgent-no-place")}</p> }.into_any(),
    };
    let wrote = match &sub.notes {
        Some(n) => t_args("urgent-finder-wrote", &[("notes", n.as_str().into())]),
        None => t("urgent-nothing-written"),
    };
    let finder = item.finder.clone().map(|f| {
        let name = f.display_name.unwrap_or_else(|| t("urgent-no-name"));
        let reach = f.contact.unwrap_or_else(|| t("urgent-no-contact"));
        view! { <p class="urgent-finder">{t_args("urgent-finder", &[("name", name.into()), ("contact", reach.into())])}</p> }
    });
    let told = if item.notifications.is_empty() {
        view! { <p class="hint">{t("urgent-not-told")}</p> }.into_any()
    } else {
        let lines = item.notifications.iter().map(|n| view! { <li>{notification_words(n)}</li> }).collect_view();
        view! { <ul class="notifications">{lines}</ul> }.into_any()
    };
    let photos = item.record.photos.iter().enumerate().map(|(i, p)| view! {
        <a href=photos::served(&p.sha256) target="_blank"><img class="urgent-photo" src=photos::served_thumb(&p.sha256) alt=t_args("urgent-photo", &[("number", (i + 1).into())]) /></a>
    }).collect_view();
    let (form_id, toggle_id) = (id.clone(), id.clone());
    let is_open = move || open.with(|o| o.as_deref() == Some(toggle_id.as_str()));
    let toggle = {
        let id = id.clone();
        move |_| open.update(|o| *o = if o.as_deref() == Some(id.as_str()) { None } else { Some(id.clone()) })
    };
    let is_open_label = is_open.clone();
    view! {
        <li class="urgent-item card" class:awaiting=awaiting data-client-id=id>
            <p class="urgent-state"><span class="badge">{if awaiting { t("urgent-awaiting") } else { t("urgent-answered") }}</span></p>
            <h3>{headline(&item)}</h3>
            <p class="urgent-time">{t_args("urgent-time", &[("seen", readable::time(&sub.observed_at).into()), ("received", readable::utc_minute(&item.record.received_at).into())])}</p>
            {place}
            <p class="urgent-wrote">{wrote}</p>
            <div class="photos">{photos}</div>
            {finder}
            {told}
            <ResponseLog responses=item.responses.clone() />
            <button type="button" class="small response-toggle" on:click=toggle>{move || if is_open_label() { t("urgent-close-form") } else { t("urgent-log") }}</button>
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
            <h2>{t("urgent-heading")}</h2>
            <ul id="urgent-cautions" class="safety live-animal" role="note">
                <li>{t("urgent-keep-back")}</li>
                <li>{t("live-no-pushing")}</li>
                <li>{t("urgent-local-rules")}</li>
            </ul>
            <button id="urgent-reload" type="button" class="small" on:click=move |_| reload()>{t("urgent-reload")}</button>
            <p class="problems" role="alert">{move || problem.get()}</p>
            {move || items.get().map(|list| if list.is_empty() {
                view! { <p id="urgent-none" class="hint">{t("urgent-none")}</p> }.into_any()
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
