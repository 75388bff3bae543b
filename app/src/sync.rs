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
use crate::outbox::{self, Entry, SyncState};

pub const SUBMIT_URL: &str = "/api/observations";

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
pub fn request(entries: RwSignal<Vec<Entry>>, status: RwSignal<SyncStatus>) {
    if RUNNING.get() {
        AGAIN.set(true);
        return;
    }
    RUNNING.set(true);
    status.update(|s| s.running = true);
    leptos::task::spawn_local(async move {
        loop {
            AGAIN.set(false);
            let problem = round(entries).await;
            finish_round(problem, entries, status);
            if !AGAIN.get() {
                break;
            }
        }
        RUNNING.set(false);
        status.update(|s| s.running = false);
    });
}

fn finish_round(problem: Option<String>, entries: RwSignal<Vec<Entry>>, status: RwSignal<SyncStatus>) {
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
                        request(entries, status);
                    }
                },
                delay,
            );
        }
    }
}

/// Sends every record that wants sending; returns the first problem that calls for a
/// retry, if any.
async fn round(entries: RwSignal<Vec<Entry>>) -> Option<String> {
    let stored = match outbox::load_all().await {
        Ok(list) => list,
        Err(err) => return Some(err),
    };
    let mut queue: Vec<Entry> = stored.into_iter().filter(|e| e.sync.wants_sending()).collect();
    queue.sort_by_key(|e| e.submission.observed_at);
    let mut problem = None;
    for mut entry in queue {
        entry.sync = SyncState::Sent;
        if let Err(err) = outbox::save(&entry, None).await {
            problem.get_or_insert(err);
            continue;
        }
        refresh(entries).await;
        match send(&entry).await {
            Sent::Received(receipt) => {
                entry.sync = SyncState::Received { receipt };
                entry.last_error = None;
            }
            Sent::Refused(reason) => entry.sync = SyncState::Refused { reason },
            Sent::TryLater(reason) => {
                entry.sync = SyncState::Waiting;
                entry.last_error = Some(reason.clone());
                problem.get_or_insert(reason);
            }
        }
        if let Err(err) = outbox::save(&entry, None).await {
            problem.get_or_insert(err);
        }
        refresh(entries).await;
    }
    problem
}

/// Re-reads the outbox into the screen's list.
pub async fn refresh(entries: RwSignal<Vec<Entry>>) {
    if let Ok(list) = outbox::load_all().await {
        entries.set(list);
    }
}

enum Sent {
    Received(Receipt),
    Refused(String),
    TryLater(String),
}

async fn send(entry: &Entry) -> Sent {
    let photos = match device::photos_of(&entry.id()).await {
        Ok(photos) => photos,
        Err(err) => return Sent::TryLater(format!("photos could not be read: {err}")),
    };
    if photos.len() != entry.photo_count {
        // Never send a record short of a photo the observer took.
        return Sent::TryLater(format!("{} of {} photos found on this phone", photos.len(), entry.photo_count));
    }
    let json = match serde_json::to_string(&entry.submission) {
        Ok(json) => json,
        Err(err) => return Sent::Refused(err.to_string()),
    };
    match device::send_record(SUBMIT_URL, &json, &photos).await {
        Err(err) => Sent::TryLater(format!("no connection ({err})")),
        Ok(answer) => classify(answer),
    }
}

fn classify(answer: device::Answer) -> Sent {
    match answer.status {
        200..=299 => match serde_json::from_str::<Receipt>(&answer.body) {
            Ok(receipt) => Sent::Received(receipt),
            Err(err) => Sent::TryLater(format!("unreadable receipt: {err}")),
        },
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
