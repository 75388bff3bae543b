//! The screens, as Leptos views, and the page around them: the header with the
//! connection, the safety cautions before the first record, and which screen the
//! address's `#…` part names. Screens read and change the phone's state only through
//! `crate::data`; each file below holds one screen or one part of one.

mod about_you;
mod downloads;
mod figures;
mod mine;
mod on_this_phone;
mod people;
mod record;
mod review;
mod walk;

use leptos::prelude::*;

use crate::data::outbox::Outbox;
use crate::data::{device, my_records, page, site, sync, walk_track};
use crate::screens::about_you::AboutYou;
use crate::screens::figures::FiguresScreen;
use crate::screens::mine::MyRecords;
use crate::screens::on_this_phone::OnThisPhone;
use crate::screens::people::PeopleScreen;
use crate::screens::record::form::RecordForm;
use crate::screens::review::ReviewScreen;
use crate::screens::walk::WalkBar;

/// The screens the address's `#…` part can name besides the recording screen.
const OTHER_SCREENS: [&str; 4] = ["#review", "#people", "#figures", "#safety"];

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
                <a id="safety-link" class="pill review-link" href="#safety">"Safety"</a>
                <a class="pill review-link" href="#figures">"Figures"</a>
                <a class="pill review-link" href="#review">"Review"</a>
                <Show when=move || installable.get()>
                    <button id="install" type="button" class="pill install" on:click=install>"Install"</button>
                </Show>
            </nav>
            <span id="connection" class=move || if online.get() { "pill online" } else { "pill offline" }>
                {move || if online.get() { "online" } else { "offline: records wait on this phone" }}
            </span>
        </header>
        <main>
            {move || storage_problem.get().map(|p| view! {
                <p class="problems" role="alert">{format!("Offline storage is not working: {p}. Records cannot be kept on this phone.")}</p>
            })}
            <Show when=move || screen.get() == "#review">
                <ReviewScreen />
            </Show>
            <Show when=move || screen.get() == "#people">
                <PeopleScreen />
            </Show>
            <Show when=move || screen.get() == "#figures">
                <FiguresScreen />
            </Show>
            <Show when=move || screen.get() == "#safety">
                <section id="safety" class="card safety-card">
                    <h2>"Safety on the shore"</h2>
                    <SafetyText responders=Signal::derive(responders) />
                    <a href="#">"← Back to recording"</a>
                </section>
            </Show>
            <Show when=move || !OTHER_SCREENS.contains(&screen.get().as_str())>
            <Show when=move || safety_read.get() fallback=move || view! { <SafetyCautions responders=Signal::derive(responders) on_read=move || { page::remember_safety_read(); safety_read.set(true); } /> }>
                {move || (questions() > 0).then(|| view! {
                    <a id="questions-badge" class="card questions-badge" href="#my-records">
                        <span class="badge">{questions()}</span>
                        {if questions() == 1 { " A reviewer asked you something about a record: answer it under My records." } else { " Reviewers asked you about some records: answer them under My records." }}
                    </a>
                })}
                <details id="safety-reminders" class="safety-again card">
                    <summary>"Safety reminders: spines, bites, tides"</summary>
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

/// Who to call, with the operator's number when there is one.
fn call_words(responders: Option<String>) -> String {
    match responders {
        Some(number) => format!("Live or stranded animal? Call the local responders: {number}. Or the coastguard."),
        None => "Live or stranded animal? Call the local stranding responders or the coastguard.".to_owned(),
    }
}

/// The cautions, in our own words; they defer to local rules and responders.
#[component]
fn SafetyText(responders: Signal<Option<String>>) -> impl IntoView {
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

#[component]
fn SafetyCautions(responders: Signal<Option<String>>, on_read: impl Fn() + 'static) -> impl IntoView {
    view! {
        <section class="card safety-card">
            <h2>"Before your first record"</h2>
            <SafetyText responders=responders />
            <button id="safety-ok" class="primary" on:click=move |_| on_read()>"I have read this"</button>
        </section>
    }
}
