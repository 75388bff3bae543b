//! The phone's page (the bundle served at `/` and kept for flight mode): the header with
//! the connection, the safety cautions before the first record, and the recording
//! screens; which screen shows is the address's `#…` part. The desk's screens live in
//! the other bundle (`/desk/`), reached by plain links.

use leptos::prelude::*;

use crate::data::outbox::Outbox;
use crate::data::words::{t, t_args};
use crate::data::{device, my_records, page, site, sync, walk_track};
use crate::screens::about_you::AboutYou;
use crate::screens::language::LanguageSwitch;
use crate::screens::mine::MyRecords;
use crate::screens::on_this_phone::OnThisPhone;
use crate::screens::record::form::RecordForm;
use crate::screens::safety::SafetyText;
use crate::screens::walk::WalkBar;

/// The screens the address's `#…` part can name besides the recording screen.
const OTHER_SCREENS: [&str; 1] = ["#safety"];

#[component]
pub fn App() -> impl IntoView {
    let safety_read = RwSignal::new(page::safety_read());
    let outbox = Outbox::new();
    let online = RwSignal::new(page::online_now());
    let storage_problem = RwSignal::new(None::<String>);
    let walk_note = RwSignal::new(String::new());
    let site_info = RwSignal::new(site::cached());
    let installable = RwSignal::new(device::can_install());
    site::refresh(site_info);
    page::on_installable(move || installable.set(true));

    leptos::task::spawn_local(async move {
        device::request_persistence().await;
        if let Err(err) = outbox.load().await {
            storage_problem.set(Some(err));
        }
        // A walk still going on when the page was closed goes on being followed.
        if outbox.walk_going_on().is_some() {
            walk_track::follow(outbox, walk_note);
        }
        if page::online_now() {
            sync::request(outbox);
        }
    });
    page::on_connection_change(move |is_online| {
        online.set(is_online);
        if is_online {
            sync::request(outbox);
        }
    });

    let screen = RwSignal::new(page::current_hash());
    page::on_hash_change(move || screen.set(page::current_hash()));
    let questions = move || outbox.my_records.with(|r| outbox.replies.with(|q| my_records::questions_waiting(r, q)));
    let responders = move || site_info.with(|s| s.responders_phone.clone());
    let install = move |_| {
        leptos::task::spawn_local(async move {
            device::install().await;
            installable.set(device::can_install());
        });
    };

    view! {
        <header class="top">
            <h1><a href="#">"wrackline"</a></h1>
            <nav class="top-links">
                <a id="safety-link" class="pill review-link" href="#safety">{t("phone-safety-link")}</a>
                <a class="pill review-link" href="/desk/#figures">{t("phone-figures-link")}</a>
                <a class="pill review-link" href="/desk/#review">{t("phone-review-link")}</a>
                <LanguageSwitch />
                <Show when=move || installable.get()>
                    <button id="install" type="button" class="pill install" on:click=install>{t("phone-install")}</button>
                </Show>
            </nav>
            <span id="connection" class=move || if online.get() { "pill online" } else { "pill offline" }>
                {move || if online.get() { t("phone-online") } else { t("phone-offline") }}
            </span>
        </header>
        <main>
            {move || storage_problem.get().map(|p| view! {
                <p class="problems" role="alert">{t_args("phone-storage-broken", &[("problem", p.into())])}</p>
            })}
            <Show when=move || screen.get() == "#safety">
                <section id="safety" class="card safety-card">
                    <h2>{t("phone-safety-heading")}</h2>
                    <SafetyText responders=Signal::derive(responders) />
                    <a href="#">{t("phone-back")}</a>
                </section>
            </Show>
            <Show when=move || !OTHER_SCREENS.contains(&screen.get().as_str())>
            <Show when=move || safety_read.get() fallback=move || view! { <SafetyCautions responders=Signal::derive(responders) on_read=move || { page::remember_safety_read(); safety_read.set(true); } /> }>
                {move || (questions() > 0).then(|| view! {
                    <a id="questions-badge" class="card questions-badge" href="#my-records">
                        <span class="badge">{questions()}</span>
                        " "{if questions() == 1 { t("phone-question-one") } else { t("phone-question-many") }}
                    </a>
                })}
                <details id="safety-reminders" class="safety-again card">
                    <summary>{t("phone-safety-reminders")}</summary>
                    <SafetyText responders=Signal::derive(responders) />
                </details>
                <WalkBar outbox=outbox />
                <RecordForm outbox=outbox responders=Signal::derive(responders) />
                <AboutYou outbox=outbox />
                <OnThisPhone outbox=outbox />
                <MyRecords outbox=outbox />
            </Show>
            </Show>
        </main>
    }
}

/// The cautions before the first record, read once on this phone.
#[component]
fn SafetyCautions(responders: Signal<Option<String>>, on_read: impl Fn() + 'static) -> impl IntoView {
    view! {
        <section class="card safety-card">
            <h2>{t("phone-first-record")}</h2>
            <SafetyText responders=responders />
            <button id="safety-ok" class="primary" on:click=move |_| on_read()>{t("phone-safety-read")}</button>
        </section>
    }
}
