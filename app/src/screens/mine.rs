//! "My records": the observer's records as the server last described them (readable
//! offline), each review state in the observer's words (with a reviewer's reason), the
//! current name with its common name, the reviewers' messages, and a way to answer with
//! text and photos that goes through the outbox like a record. A record with a question
//! waiting is marked, and opens its answer box.

use leptos::prelude::*;
use shared_types::{MyRecord, Role};

use crate::data::outbox::Outbox;
use crate::data::photos::{self, PickedPhoto};
use crate::data::replies::{self, ReplyEntry, ReplyState};
use crate::data::words::{self, t, t_args};
use crate::data::{checklist, my_records, sync};

/// The observer's records with the reviewers' messages, and a way to answer.
#[component]
pub fn MyRecords(outbox: Outbox) -> impl IntoView {
    view! {
        <section class="card my-records">
            <h2 id="my-records-heading">{t("mine-heading")}</h2>
            <p class="hint">{t("mine-intro")}</p>
            <ul id="my-records">
                {move || outbox.my_records.get().into_iter().map(|record| view! { <MyRecordItem record=record outbox=outbox /> }).collect_view()}
            </ul>
        </section>
    }
}

#[component]
fn MyRecordItem(record: MyRecord, outbox: Outbox) -> impl IntoView {
    let client_id = record.record.submission.client_id;
    let what = my_records::name_shown(&record, checklist::common_name);
    let (state_label, state_meaning) = my_records::state_words(&record);
    let waits = outbox.replies.with_untracked(|r| my_records::question_waits(&record, r));
    let when = words::date(record.record.submission.observed_at.timestamp_millis() as f64);
    let answer = RwSignal::new(String::new());
    let picked = RwSignal::new_local(Vec::<PickedPhoto>::new());
    let note = RwSignal::new(String::new());
    let pending = move || {
        outbox
            .replies
            .with(|r| r.iter().filter(|e| e.record_client_id == client_id && e.state == ReplyState::Waiting).count())
    };
    let add_photos = move |ev: leptos::ev::Event| {
        let input: web_sys::HtmlInputElement = event_target(&ev);
        let Some(list) = input.files() else { return };
        let files: Vec<web_sys::File> = (0..list.length()).filter_map(|i| list.item(i)).collect();
        input.set_value("");
        leptos::task::spawn_local(async move {
            let mut refused = Vec::new();
            for file in files {
                note.set(t_args("photo-preparing", &[("name", file.name().into())]));
                match photos::pick(file).await {
                    Ok(photo) => picked.update(|p| p.push(photo)),
                    Err(reason) => refused.push(reason),
                }
            }
            note.set(refused.join(" "));
        });
    };
    let send = move |_| {
        let chosen = picked.get_untracked();
        let entry = match ReplyEntry::new(client_id, &answer.get_untracked(), &chosen) {
            Ok(entry) => entry,
            Err(problem) => {
                note.set(problem);
                return;
            }
        };
        leptos::task::spawn_local(async move {
            let blobs: Vec<web_sys::Blob> = chosen.iter().map(|p| p.upload.clone()).collect();
            match replies::save(&entry, Some(&blobs)).await {
                Ok(()) => {
                    answer.set(String::new());
                    picked.set(Vec::new());
                    note.set(t("mine-answer-kept"));
                    outbox.reload().await;
                    sync::request(outbox);
                }
                Err(err) => note.set(t_args("mine-answer-not-kept", &[("problem", err.into())])),
            }
        });
    };
    // An answer when a reviewer has asked something; otherwise more detail, unasked.
    let asked = record.messages.iter().any(|m| m.author_role != Role::Observer);
    let add_label = if asked { t("mine-answer-reviewer") } else { t("mine-add-note") };
    let item_class = if waits { "my-record asked" } else { "my-record" };
    let messages = record
        .messages
        .iter()
        .map(|m| {
            let who = match m.author_role {
                Role::Observer => t("mine-you"),
                _ => m.author.clone().unwrap_or_else(|| t("mine-a-reviewer")),
            };
            view! { <li class="message"><b>{who}</b>": "{m.body.clone()}</li> }
        })
        .collect_view();
    view! {
        <li class=item_class data-client-id=client_id.to_string()>
            <div><b class="record-name">{what}</b>" · "{when}" · "<span class="review-state">{state_label}</span></div>
            <p class="hint state-meaning">{state_meaning}</p>
            {waits.then(|| view! { <p class="asked-flag"><span class="badge">"?"</span>" "{t("mine-asked-flag")}</p> })}
            <ul class="messages">{messages}</ul>
            <details class="answer" prop:open=waits>
                <summary>{add_label}</summary>
                <textarea class="answer-text" rows="2" prop:value=move || answer.get() on:input=move |ev| answer.set(event_target_value(&ev))></textarea>
                <label class="button small">{t("mine-add-photo")}
                    <input class="answer-photo" type="file" accept="image/*" capture="environment" multiple on:change=add_photos /></label>
                <ul class="answer-photos">
                    {move || picked.get().into_iter().map(|photo| view! {
                        <li><img class="answer-thumb" src=photo.preview_url.clone() alt=t_args("photo-alt", &[("name", photo.name.clone().into())]) />
                            <span class="hint photo-says">{photos::photo_says(&photo.exif)}</span></li>
                    }).collect_view()}
                </ul>
                <span class="hint">{move || t_args("photo-count", &[("count", picked.with(|p| p.len()).into())])}</span>
                <button type="button" class="small send-answer" on:click=send>{t("mine-send-answer")}</button>
            </details>
            <p class="hint">{move || note.get()}</p>
            {move || (pending() > 0).then(|| view! { <p class="hint answer-waiting">{t_args("mine-answers-waiting", &[("count", pending().into())])}</p> })}
        </li>
    }
}
