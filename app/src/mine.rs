//! "My records": the observer's own records as the server last told this phone —
//! review state, current identification and reviewers' messages — readable offline,
//! and answers to reviewers (a message and photos) kept in the outbox until sent.
//! Photos in an answer take the same path as a record's (`photos::pick`): EXIF read
//! from the original on the phone, only the upload copy kept and sent, the reading sent
//! beside it as data.

use crate::device::{self, Store};
use crate::identity;
use crate::photos::{self, PickedPhoto};
use crate::sync::{self, Outbox};
use leptos::prelude::*;
use serde::{Deserialize, Serialize};
use shared_types::{MyRecord, Reply, Role, Text};
use uuid::Uuid;

const MY_RECORDS_KEY: &str = "wrackline.my-records";

/// Where an answer is on its way to the server.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "state", rename_all = "snake_case")]
pub enum ReplyState {
    Waiting,
    Received,
    Refused { reason: String },
}

/// An answer to a reviewer, kept on the phone until the server has it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReplyEntry {
    pub record_client_id: Uuid,
    pub reply: Reply,
    pub photo_count: usize,
    pub state: ReplyState,
}

pub async fn save_reply(entry: &ReplyEntry, photos: Option<&[web_sys::Blob]>) -> Result<(), String> {
    let json = serde_json::to_string(entry).map_err(|err| err.to_string())?;
    device::save_entry(Store::Replies, &entry.reply.client_id.to_string(), &json, photos).await
}

pub async fn load_replies() -> Result<Vec<ReplyEntry>, String> {
    device::list_entries(Store::Replies)
        .await?
        .iter()
        .map(|json| serde_json::from_str(json).map_err(|err| format!("a stored answer could not be read: {err}")))
        .collect()
}

/// The records as the server last described them to this phone.
pub fn cached_records() -> Vec<MyRecord> {
    web_sys::window()
        .and_then(|w| w.local_storage().ok().flatten())
        .and_then(|s| s.get_item(MY_RECORDS_KEY).ok().flatten())
        .and_then(|text| serde_json::from_str(&text).ok())
        .unwrap_or_default()
}

/// Asks the server for this phone's records and keeps them for offline reading.
pub async fn fetch_records(token: &str) -> Result<Vec<MyRecord>, String> {
    let answer =
        device::send_json("GET", "/api/my/records", None, &[("authorization", &identity::bearer(token))]).await?;
    if answer.status != 200 {
        return Err(format!("my records: the server answered {}", answer.status));
    }
    let records: Vec<MyRecord> = serde_json::from_str(&answer.body).map_err(|err| err.to_string())?;
    if let Some(storage) = web_sys::window().and_then(|w| w.local_storage().ok().flatten()) {
        let _ = storage.set_item(MY_RECORDS_KEY, &answer.body);
    }
    Ok(records)
}

/// Sends waiting answers; returns the first problem worth a retry.
pub async fn send_replies(token: &str) -> Option<String> {
    let mut problem = None;
    for mut entry in load_replies().await.ok()?.into_iter().filter(|r| r.state == ReplyState::Waiting) {
        let id = entry.reply.client_id.to_string();
        let photos = match device::photos_of(&id).await {
            Ok(photos) if photos.len() == entry.photo_count => photos,
            _ => {
                problem.get_or_insert("an answer's photos are not all on this phone yet".to_owned());
                continue;
            }
        };
        let url = format!("/api/my/records/{}/replies", entry.record_client_id);
        let json = serde_json::to_string(&entry.reply).unwrap_or_default();
        match device::send_form(&url, "reply", &json, &photos, &[("authorization", &identity::bearer(token))]).await {
            Ok(answer) if (200..300).contains(&answer.status) => entry.state = ReplyState::Received,
            Ok(answer) if answer.status == 408 || answer.status == 429 || answer.status >= 500 => {
                problem.get_or_insert(format!("server answered {}", answer.status));
                continue;
            }
            Ok(answer) => {
                entry.state = ReplyState::Refused { reason: format!("status {}: {}", answer.status, answer.body) }
            }
            Err(err) => {
                problem.get_or_insert(format!("no connection ({err})"));
                continue;
            }
        }
        if let Err(err) = save_reply(&entry, None).await {
            problem.get_or_insert(err);
        }
    }
    problem
}

fn state_label(record: &MyRecord) -> String {
    record.record.review_state.label().to_owned()
}

/// The observer's records with the reviewers' messages, and a way to answer.
#[component]
pub fn MyRecords(outbox: Outbox) -> impl IntoView {
    view! {
        <section class="card my-records">
            <h2>"My records"</h2>
            <p class="hint">"As the reviewers last saw them; updated each time this phone syncs."</p>
            <ul id="my-records">
                {move || outbox.my_records.get().into_iter().map(|record| view! { <MyRecordItem record=record outbox=outbox /> }).collect_view()}
            </ul>
        </section>
    }
}

#[component]
fn MyRecordItem(record: MyRecord, outbox: Outbox) -> impl IntoView {
    let client_id = record.record.submission.client_id;
    let what = record
        .current_taxon
        .clone()
        .or_else(|| record.record.submission.species_guess.as_ref().map(|g| g.as_str().to_owned()))
        .unwrap_or_else(|| "unnamed animal".into());
    let when = record.record.submission.observed_at.format("%Y-%m-%d").to_string();
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
                note.set(format!("preparing “{}”…", file.name()));
                match photos::pick(file).await {
                    Ok(photo) => picked.update(|p| p.push(photo)),
                    Err(reason) => refused.push(reason),
                }
            }
            note.set(refused.join(" "));
        });
    };
    let send = move |_| {
        let text = answer.get_untracked();
        let chosen = picked.get_untracked();
        let Ok(message) = Text::parse(&text) else {
            note.set("That answer is too long.".into());
            return;
        };
        if message.as_str().is_empty() && chosen.is_empty() {
            note.set("Write an answer or add a photo.".into());
            return;
        }
        leptos::task::spawn_local(async move {
            let blobs: Vec<web_sys::Blob> = chosen.iter().map(|p| p.upload.clone()).collect();
            let photo_exif = chosen.iter().map(|p| p.exif.clone()).collect();
            let reply = Reply { client_id: Uuid::new_v4(), message, photo_exif };
            let entry =
                ReplyEntry { record_client_id: client_id, reply, photo_count: blobs.len(), state: ReplyState::Waiting };
            match save_reply(&entry, Some(&blobs)).await {
                Ok(()) => {
                    answer.set(String::new());
                    picked.set(Vec::new());
                    note.set("Answer kept on this phone; it goes with the next sync.".into());
                    sync::refresh(outbox).await;
                    sync::request(outbox);
                }
                Err(err) => note.set(format!("Could not keep the answer on this phone: {err}")),
            }
        });
    };
    // An answer when a reviewer has asked something; otherwise more detail, unasked.
    let asked = record.messages.iter().any(|m| m.author_role != Role::Observer);
    let add_label = if asked { "Answer the reviewer" } else { "Add a note or photo for the reviewers" };
    let messages = record
        .messages
        .iter()
        .map(|m| {
            let who = match m.author_role {
                Role::Observer => "you".to_owned(),
                _ => m.author.clone().unwrap_or_else(|| "a reviewer".into()),
            };
            view! { <li class="message"><b>{who}": "</b>{m.body.clone()}</li> }
        })
        .collect_view();
    view! {
        <li class="my-record" data-client-id=client_id.to_string()>
            <div><b>{what}</b>" · "{when}" · "<span class="review-state">{state_label(&record)}</span></div>
            <ul class="messages">{messages}</ul>
            <details class="answer">
                <summary>{add_label}</summary>
                <textarea class="answer-text" rows="2" prop:value=move || answer.get() on:input=move |ev| answer.set(event_target_value(&ev))></textarea>
                <label class="button small">"Add photo"
                    <input class="answer-photo" type="file" accept="image/*" capture="environment" multiple on:change=add_photos /></label>
                <ul class="answer-photos">
                    {move || picked.get().into_iter().map(|photo| view! {
                        <li><img class="answer-thumb" src=photo.preview_url.clone() alt=format!("photo: {}", photo.name) />
                            <span class="hint photo-says">{photos::photo_says(&photo.exif)}</span></li>
                    }).collect_view()}
                </ul>
                <span class="hint">{move || format!("{} photo(s)", picked.with(|p| p.len()))}</span>
                <button type="button" class="small send-answer" on:click=send>"Send answer"</button>
            </details>
            <p class="hint">{move || note.get()}</p>
            {move || (pending() > 0).then(|| view! { <p class="hint answer-waiting">{format!("{} answer(s) waiting to send", pending())}</p> })}
        </li>
    }
}
