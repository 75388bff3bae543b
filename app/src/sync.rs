//! Sending the outbox: one record at a time, oldest first, each with its photos.
//!
//! A record is marked `sent` before its request goes out and `received` only when the
//! server's receipt arrives; a record stuck in `sent` (the browser closed mid-send) is
//! simply sent again, because the server treats a resend with the same id as the same
//! record. Failures without an answer are retried with exponential backoff; a
//! connection coming back (`online`) or the observer's "Send now" retries at once.

use std::cell::Cell;
use std::time::Duration;

use leptos::prelude::*;
use shared_types::Receipt;

use crate::device;
use crate::identity;
use crate::mine::{self, ReplyEntry};
use crate::outbox::{self, Entry, SyncState};
use crate::walks::{self, WalkEntry, WalkState};

pub const SUBMIT_URL: &str = "/api/observations";
pub const WALKS_URL: &str = "/api/walks";

/// What the phone keeps and what the screen shows of it, handed around together.
#[derive(Clone, Copy)]
pub struct Outbox {
    pub entries: RwSignal<Vec<Entry>>,
    pub walks: RwSignal<Vec<WalkEntry>>,
    pub replies: RwSignal<Vec<ReplyEntry>>,
    /// The observer's records as the server last described them.
    pub my_records: RwSignal<Vec<shared_types::MyRecord>>,
    pub status: RwSignal<SyncStatus>,
}

/// First retry delay; doubled after each failed round up to [`MAX_DELAY`].
const FIRST_DELAY: Duration = Duration::from_secs(2);
const MAX_DELAY: Duration = Duration::from_secs(300);

/// The delay before the next round after `failures` failed rounds in a row.
pub fn backoff_delay(failures: u32) -> Duration {
    let factor = 2u32.saturating_pow(failures.saturating_sub(1));
    FIRST_DELAY.saturating_mul(factor).min(MAX_DELAY)
}

thread_local! {
    static RUNNING: Cell<bool> = const { Cell::new(false) };
    static AGAIN: Cell<bool> = const { Cell::new(false) };
    static FAILURES: Cell<u32> = const { Cell::new(0) };
    static TIMER_GENERATION: Cell<u64> = const { Cell::new(0) };
}

/// What the sync loop tells the screen.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct SyncStatus {
    pub running: bool,
    pub next_retry: Option<Duration>,
    pub last_problem: Option<String>,
}

/// Starts a sync round now unless one is running (then one more follows it).
pub fn request(outbox: Outbox) {
    if RUNNING.get() {
        AGAIN.set(true);
        return;
    }
    RUNNING.set(true);
    outbox.status.update(|s| s.running = true);
    leptos::task::spawn_local(async move {
        loop {
            AGAIN.set(false);
            let problem = round(outbox).await;
            finish_round(problem, outbox);
            if !AGAIN.get() {
                break;
            }
        }
        RUNNING.set(false);
        outbox.status.update(|s| s.running = false);
    });
}

fn finish_round(problem: Option<String>, outbox: Outbox) {
    let status = outbox.status;
    let generation = TIMER_GENERATION.get() + 1;
    TIMER_GENERATION.set(generation);
    match problem {
        None => {
            FAILURES.set(0);
            status.update(|s| {
                s.next_retry = None;
                s.last_problem = None;
            });
        }
        Some(problem) => {
            let failures = FAILURES.get() + 1;
            FAILURES.set(failures);
            let delay = backoff_delay(failures);
            status.update(|s| {
                s.next_retry = Some(delay);
                s.last_problem = Some(problem);
            });
            set_timeout(
                move || {
                    if TIMER_GENERATION.get() == generation {
                        request(outbox);
                    }
                },
                delay,
            );
        }
    }
}

/// Sends every walk, record and late walk link that wants sending (walks first, so a
/// record's walk is usually there before it); returns the first problem that calls for
/// a retry, if any.
async fn round(outbox: Outbox) -> Option<String> {
    // Without its identity the phone sends nothing, so that every record is its own.
    let token = match identity::ensure_token().await {
        Ok(token) => token,
        Err(err) => return Some(format!("no connection ({err})")),
    };
    let profile_problem = identity::send_profile_if_changed(&token).await;
    let walk_problem = send_walks(outbox, &token).await;
    let record_problem = send_records(outbox, &token).await;
    let link_problem = send_links(outbox, &token).await;
    let reply_problem = mine::send_replies(&token).await;
    let fetch_problem = match mine::fetch_records(&token).await {
        Ok(records) => {
            outbox.my_records.set(records);
            None
        }
        Err(err) => Some(err),
    };
    refresh(outbox).await;
    walk_problem.or(record_problem).or(link_problem).or(reply_problem).or(fetch_problem).or(profile_problem)
}

async fn send_records(outbox: Outbox, token: &str) -> Option<String> {
    let stored = match outbox::load_all().await {
        Ok(list) => list,
        Err(err) => return Some(err),
    };
    let mut queue: Vec<Entry> = stored.into_iter().filter(|e| e.sync.wants_sending()).collect();
    queue.sort_by_key(|e| e.submission.observed_at);
    let mut problem = None;
    for entry in queue {
        let id = entry.id();
        // Only the sync state is touched here, on the entry as stored now, so a change
        // the observer makes meanwhile (a walk link) is never overwritten.
        if let Err(err) = outbox::update(&id, |e| e.sync = SyncState::Sent).await {
            problem.get_or_insert(err);
            continue;
        }
        refresh(outbox).await;
        let outcome = send(&entry, token).await;
        let saved = outbox::update(&id, |e| match outcome {
            RecordOutcome::Received(receipt) => {
                e.sync = SyncState::Received { receipt };
                e.last_error = None;
            }
            RecordOutcome::Refused(reason) => e.sync = SyncState::Refused { reason },
            RecordOutcome::TryLater(reason) => {
                e.sync = SyncState::Waiting;
                problem.get_or_insert(reason.clone());
                e.last_error = Some(reason);
            }
        })
        .await;
        if let Err(err) = saved {
            problem.get_or_insert(err);
        }
        refresh(outbox).await;
    }
    problem
}

/// Sends ended walks with the phone's identity: the server keeps each walk as this
/// phone's, so nobody else can put records on it.
async fn send_walks(outbox: Outbox, token: &str) -> Option<String> {
    let stored = match walks::load_all().await {
        Ok(list) => list,
        Err(err) => return Some(err),
    };
    let mut problem = None;
    for mut walk in stored.into_iter().filter(|w| w.state.wants_sending()) {
        let Some(submission) = walk.submission() else { continue };
        let json = serde_json::to_string(&submission).unwrap_or_default();
        walk.state = WalkState::Sent;
        if let Err(err) = walks::save(&walk).await {
            problem.get_or_insert(err);
            continue;
        }
        match device::send_json("POST", WALKS_URL, Some(&json), &[("authorization", &identity::bearer(token))]).await {
            Err(err) => {
                walk.state = WalkState::Waiting;
                walk.last_error = Some(format!("no connection ({err})"));
                problem.get_or_insert(format!("no connection ({err})"));
            }
            Ok(answer) => match classify(answer) {
                Sent::Received(body) => match serde_json::from_str(&body) {
                    Ok(receipt) => walk.state = WalkState::Received { receipt },
                    Err(err) => walk.state = WalkState::Refused { reason: format!("unreadable receipt: {err}") },
                },
                Sent::Refused(reason) => walk.state = WalkState::Refused { reason },
                Sent::TryLater(reason) => {
                    walk.state = WalkState::Waiting;
                    problem.get_or_insert(reason);
                }
            },
        }
        if let Err(err) = walks::save(&walk).await {
            problem.get_or_insert(err);
        }
    }
    refresh(outbox).await;
    problem
}

/// Links made after a record was received: `PUT /api/observations/{id}/walk`, with the
/// phone's identity (only the phone that sent a record may link it). A link the server
/// accepts is kept as the record's walk, so the record still shows it is on the walk.
async fn send_links(outbox: Outbox, token: &str) -> Option<String> {
    let stored = outbox::load_all().await.ok()?;
    let mut problem = None;
    let auth = identity::bearer(token);
    // A link waits until its record is received: the record's own send comes first.
    let ready =
        stored.into_iter().filter(|e| e.walk_link_pending.is_some() && matches!(e.sync, SyncState::Received { .. }));
    for entry in ready {
        let Some(walk) = entry.walk_link_pending else { continue };
        let url = format!("{SUBMIT_URL}/{}/walk", entry.id());
        let body = serde_json::json!({ "walk_client_id": walk }).to_string();
        let refused = match device::send_json("PUT", &url, Some(&body), &[("authorization", &auth)]).await.map(classify)
        {
            Ok(Sent::Received(_)) => None,
            Ok(Sent::Refused(reason)) => Some(format!("could not add to the walk: {reason}")),
            Ok(Sent::TryLater(reason)) | Err(reason) => {
                problem.get_or_insert(reason);
                continue;
            }
        };
        let saved = outbox::update(&entry.id(), |e| {
            e.walk_link_pending = None;
            match refused {
                None => e.walk_linked = Some(walk),
                Some(reason) => e.last_error = Some(reason),
            }
        })
        .await;
        if let Err(err) = saved {
            problem.get_or_insert(err);
        }
    }
    refresh(outbox).await;
    problem
}

/// Re-reads the outbox and walks into the screen's lists.
pub async fn refresh(outbox: Outbox) {
    if let Ok(list) = outbox::load_all().await {
        outbox.entries.set(list);
    }
    if let Ok(list) = walks::load_all().await {
        outbox.walks.set(list);
    }
    if let Ok(list) = mine::load_replies().await {
        outbox.replies.set(list);
    }
}

/// What an answer means for the thing sent.
enum Sent {
    /// 2xx, with the body.
    Received(String),
    Refused(String),
    TryLater(String),
}

/// What became of one record's upload.
enum RecordOutcome {
    Received(Receipt),
    Refused(String),
    TryLater(String),
}

async fn send(entry: &Entry, token: &str) -> RecordOutcome {
    let photos = match device::photos_of(&entry.id()).await {
        Ok(photos) => photos,
        Err(err) => return RecordOutcome::TryLater(format!("photos could not be read: {err}")),
    };
    if photos.len() != entry.photo_count {
        // Never send a record short of a photo the observer took.
        return RecordOutcome::TryLater(format!(
            "{} of {} photos found on this phone",
            photos.len(),
            entry.photo_count
        ));
    }
    let json = match serde_json::to_string(&entry.submission) {
        Ok(json) => json,
        Err(err) => return RecordOutcome::Refused(err.to_string()),
    };
    let auth = identity::bearer(token);
    match device::send_form(SUBMIT_URL, "record", &json, &photos, &[("authorization", &auth)]).await.map(classify) {
        Err(err) => RecordOutcome::TryLater(format!("no connection ({err})")),
        Ok(Sent::Received(body)) => match serde_json::from_str::<Receipt>(&body) {
            Ok(receipt) => RecordOutcome::Received(receipt),
            Err(err) => RecordOutcome::TryLater(format!("unreadable receipt: {err}")),
        },
        Ok(Sent::Refused(reason)) => RecordOutcome::Refused(reason),
        Ok(Sent::TryLater(reason)) => RecordOutcome::TryLater(reason),
    }
}

fn classify(answer: device::Answer) -> Sent {
    match answer.status {
        200..=299 => Sent::Received(answer.body),
        // Timeouts and rate limits are worth another try; so is any server fault.
        408 | 429 | 500..=599 => Sent::TryLater(format!("server answered {}", answer.status)),
        _ => Sent::Refused(server_message(&answer.body).unwrap_or_else(|| format!("status {}", answer.status))),
    }
}

fn server_message(body: &str) -> Option<String> {
    let value: serde_json::Value = serde_json::from_str(body).ok()?;
    let error = value.get("error")?.as_str()?;
    Some(match value.get("field").and_then(|f| f.as_str()) {
        Some(field) => format!("{field}: {error}"),
        None => error.to_owned(),
    })
}
