//! Sending the outbox: one record at a time, oldest first, each with its photos; then
//! ended walks, late walk links and answers to reviewers; then fetching "My records".
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

use crate::data::api::{self, ApiError};
use crate::data::device;
use crate::data::identity;
use crate::data::my_records;
use crate::data::outbox::{self, Entry, Outbox, SyncState};
use crate::data::replies;
use crate::data::walks::{self, WalkState};
use crate::data::words::t_args;

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
    // A phone that has sent nothing yet and has nothing to send asks for no identity: a
    // visit that records nothing leaves nothing on the server (and costs no requests).
    if !identity::has_token() && outbox.holds_nothing() {
        return None;
    }
    // Without its identity the phone sends nothing, so that every record is its own.
    let token = match identity::ensure_token().await {
        Ok(token) => token,
        Err(err) => return Some(err),
    };
    // A live animal goes before anything else: responders hear of it from the server.
    let urgent_problem = send_records(outbox, &token, Which::Urgent).await;
    let profile_problem = identity::send_profile_if_changed(&token).await;
    let walk_problem = send_walks(outbox, &token).await;
    let record_problem = send_records(outbox, &token, Which::All).await;
    let link_problem = send_links(outbox, &token).await;
    let reply_problem = replies::send_waiting(&token).await;
    let fetch_problem = match my_records::fetch(&token).await {
        Ok(records) => {
            outbox.my_records.set(records);
            None
        }
        Err(err) => Some(err),
    };
    outbox.reload().await;
    urgent_problem
        .or(walk_problem)
        .or(record_problem)
        .or(link_problem)
        .or(reply_problem)
        .or(fetch_problem)
        .or(profile_problem)
}

/// What one attempt to send a record leaves it as: received with its receipt, refused
/// with the server's reason, or waiting again with the reason to show (and retry).
pub fn record_state_after(outcome: Result<Receipt, ApiError>) -> (SyncState, Option<String>) {
    match outcome {
        Ok(receipt) => (SyncState::Received { receipt }, None),
        Err(err) if err.is_temporary() => (SyncState::Waiting, Some(err.to_string())),
        Err(err) => (SyncState::Refused { reason: err.to_string(), field: err.field().map(str::to_owned) }, None),
    }
}

/// What one attempt to send a walk leaves it as (the same rules as a record's).
pub fn walk_state_after(outcome: Result<shared_types::WalkReceipt, ApiError>) -> (WalkState, Option<String>) {
    match outcome {
        Ok(receipt) => (WalkState::Received { receipt }, None),
        Err(err) if err.is_temporary() => (WalkState::Waiting, Some(err.to_string())),
        Err(err) => (WalkState::Refused { reason: err.to_string() }, None),
    }
}

/// Which records a pass sends.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Which {
    /// Live animals only, before anything else in the round.
    Urgent,
    All,
}

/// The records to send, in the order to send them: live animals first, then the
/// oldest first.
fn send_queue(stored: Vec<Entry>, which: Which) -> Vec<Entry> {
    let mut queue: Vec<Entry> = stored
        .into_iter()
        .filter(|e| e.sync.wants_sending() && (which == Which::All || e.submission.is_urgent()))
        .collect();
    queue.sort_by_key(|e| (!e.submission.is_urgent(), e.submission.observed_at));
    queue
}

async fn send_records(outbox: Outbox, token: &str, which: Which) -> Option<String> {
    let stored = match outbox::load_all().await {
        Ok(list) => list,
        Err(err) => return Some(err),
    };
    let queue = send_queue(stored, which);
    let mut problem = None;
    for entry in queue {
        let id = entry.id();
        // Only the sync state is touched here, on the entry as stored now, so a change
        // the observer makes meanwhile (a walk link) is never overwritten.
        if let Err(err) = outbox::update(&id, |e| e.sync = SyncState::Sent).await {
            problem.get_or_insert(err);
            continue;
        }
        outbox.reload().await;
        let (state, retry_because) = match photos_to_send(&entry).await {
            Ok(photos) => record_state_after(api::send_record(token, &entry.submission, &photos).await),
            Err(missing) => (SyncState::Waiting, Some(missing)),
        };
        if let Some(reason) = &retry_because {
            problem.get_or_insert(reason.clone());
        }
        if let Err(err) = outbox::update(&id, |e| e.note_attempt(state, retry_because)).await {
            problem.get_or_insert(err);
        }
        outbox.reload().await;
    }
    problem
}

/// A record's photos as kept on the phone; never fewer than the observer took.
async fn photos_to_send(entry: &Entry) -> Result<Vec<web_sys::Blob>, String> {
    let photos = device::photos_of(&entry.id())
        .await
        .map_err(|err| t_args("sync-photos-unreadable", &[("error", err.into())]))?;
    if photos.len() != entry.photo_count {
        let counts = [("found", photos.len().into()), ("taken", entry.photo_count.into())];
        return Err(t_args("sync-photos-missing", &counts));
    }
    Ok(photos)
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
        walk.state = WalkState::Sent;
        if let Err(err) = walks::save(&walk).await {
            problem.get_or_insert(err);
            continue;
        }
        let outcome = api::send_walk(token, &submission).await;
        // A walk that got no answer at all shows why beside it.
        if let Err(err @ ApiError::NoAnswer(_)) = &outcome {
            walk.last_error = Some(err.to_string());
        }
        let (state, retry_because) = walk_state_after(outcome);
        walk.state = state;
        if let Some(reason) = retry_because {
            problem.get_or_insert(reason);
        }
        if let Err(err) = walks::save(&walk).await {
            problem.get_or_insert(err);
        }
    }
    outbox.reload().await;
    problem
}

/// Links made after a record was received: `PUT /api/observations/{id}/walk`, with the
/// phone's identity (only the phone that sent a record may link it). A link the server
/// accepts is kept as the record's walk, so the record still shows it is on the walk.
async fn send_links(outbox: Outbox, token: &str) -> Option<String> {
    let stored = outbox::load_all().await.ok()?;
    let mut problem = None;
    // A link waits until its record is received: the record's own send comes first.
    let ready =
        stored.into_iter().filter(|e| e.walk_link_pending.is_some() && matches!(e.sync, SyncState::Received { .. }));
    for entry in ready {
        let Some(walk) = entry.walk_link_pending else { continue };
        let refused = match api::link_to_walk(token, &entry.id(), walk).await {
            Ok(()) => None,
            Err(err) if err.is_temporary() => {
                problem.get_or_insert(err.to_string());
                continue;
            }
            Err(err) => Some(t_args("sync-walk-not-joined", &[("error", err.to_string().into())])),
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
    outbox.reload().await;
    problem
}

#[cfg(test)]
mod tests {
    use shared_types::{DistanceSource, ErrorBody, TrackLength, WalkEffort, WalkReceipt};

    use super::*;

    fn receipt() -> Receipt {
        api::read(
            r#"{"client_id":"6f1c9a52-3b7e-4d0a-9c55-2a1e8f0b7d41","observation_id":7,"received_at":"2025-06-01T13:10:00Z","photo_count":2}"#,
        )
        .unwrap()
    }

    fn status(status: u16, body: Option<(&str, Option<&str>)>) -> ApiError {
        let body = body.map(|(error, field)| ErrorBody { error: error.into(), field: field.map(str::to_owned) });
        ApiError::Status { status, body }
    }

    fn entry(minutes: i64, condition: shared_types::Condition, sync: SyncState) -> Entry {
        use crate::data::form_fields::tests::{filled, saved_at};
        use crate::data::time::tests::LONDON;
        let mut submission = filled().to_submission(uuid::Uuid::new_v4(), &LONDON, saved_at()).unwrap();
        submission.observed_at += chrono::Duration::minutes(minutes);
        submission.condition = condition;
        Entry::new(submission, sync, 0)
    }

    #[test]
    fn a_live_animal_is_sent_before_older_records_and_alone_in_the_first_pass() {
        use shared_types::Condition::{Alive, Decomposed, FreshDead};
        let stored = vec![
            entry(0, Decomposed, SyncState::Waiting),
            entry(30, Alive, SyncState::Waiting),
            entry(10, FreshDead, SyncState::Sent),
            entry(20, Alive, SyncState::Draft),
            entry(5, FreshDead, SyncState::Received { receipt: receipt() }),
        ];
        let order = |which| -> Vec<(i64, bool)> {
            let first = stored[0].submission.observed_at;
            send_queue(stored.clone(), which)
                .iter()
                .map(|e| ((e.submission.observed_at - first).num_minutes(), e.submission.is_urgent()))
                .collect()
        };
        assert_eq!(order(Which::Urgent), [(30, true)], "drafts wait for the observer, even of a live animal");
        assert_eq!(order(Which::All), [(30, true), (0, false), (10, false)]);
    }

    #[test]
    fn the_delay_doubles_from_two_seconds_up_to_five_minutes() {
        let delays: Vec<u64> = (1..=10).map(|n| backoff_delay(n).as_secs()).collect();
        assert_eq!(delays, [2, 4, 8, 16, 32, 64, 128, 256, 300, 300]);
        // No failure counted yet (or an absurd count) neither waits nothing nor overflows.
        assert_eq!(backoff_delay(0), Duration::from_secs(2));
        assert_eq!(backoff_delay(u32::MAX), Duration::from_secs(300));
    }

    #[test]
    fn a_receipt_makes_the_record_received() {
        let (state, retry) = record_state_after(Ok(receipt()));
        assert_eq!(state, SyncState::Received { receipt: receipt() });
        assert_eq!(retry, None);
        assert_eq!(state.label(), "received by the server");
    }

    #[test]
    fn a_refusal_keeps_the_servers_message_and_is_not_retried() {
        let (state, retry) =
            record_state_after(Err(status(422, Some(("must be at most 90", Some("position.latitude"))))));
        assert_eq!(
            state,
            SyncState::Refused { reason: "must be at most 90".into(), field: Some("position.latitude".into()) }
        );
        assert_eq!(retry, None);
        assert_eq!(state.label(), "not accepted by the server: Latitude: must be at most 90");
        assert!(!state.wants_sending());
        let (state, _) = record_state_after(Err(status(413, None)));
        assert_eq!(
            state,
            SyncState::Refused { reason: "this is too large for the server (code 413)".into(), field: None }
        );
    }

    #[test]
    fn no_answer_a_timeout_a_rate_limit_or_a_server_fault_puts_it_back_to_waiting() {
        let cases = [
            (ApiError::NoAnswer("Failed to fetch".into()), "no connection to the server"),
            (status(408, None), "the server took too long to answer (code 408)"),
            (
                status(429, Some(("too many requests; try again in a minute", None))),
                "too many requests; try again in a minute",
            ),
            (
                status(500, Some(("the server could not finish this request; try again later", None))),
                "the server could not finish this request; try again later",
            ),
            (status(503, None), "the server cannot be reached just now (code 503)"),
            (
                ApiError::Unreadable("expected value at line 1 column 1".into()),
                "the server's answer could not be read (a Wi-Fi sign-in page?)",
            ),
        ];
        for (err, shown) in cases {
            let (state, retry) = record_state_after(Err(err.clone()));
            assert_eq!(state, SyncState::Waiting, "{err:?}");
            assert!(state.wants_sending(), "{err:?}");
            assert_eq!(retry.as_deref(), Some(shown), "{err:?}");
        }
    }

    #[test]
    fn a_walk_follows_the_same_rules() {
        let walk_receipt = WalkReceipt {
            client_id: receipt().client_id,
            walk_id: 3,
            received_at: receipt().received_at,
            effort: WalkEffort {
                distance_m: 1200.0,
                distance_source: DistanceSource::Typed,
                duration_s: 3600.0,
                track: TrackLength::default(),
            },
        };
        assert_eq!(walk_state_after(Ok(walk_receipt.clone())), (WalkState::Received { receipt: walk_receipt }, None));
        let (state, retry) = walk_state_after(Err(status(502, None)));
        assert_eq!(
            (state, retry.as_deref()),
            (WalkState::Waiting, Some("the server cannot be reached just now (code 502)"))
        );
        let (state, retry) = walk_state_after(Err(status(403, Some(("this walk belongs to another phone", None)))));
        assert_eq!((state, retry), (WalkState::Refused { reason: "this walk belongs to another phone".into() }, None));
    }
}
