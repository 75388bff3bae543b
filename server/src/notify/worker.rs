//! The background task that delivers notifications: whatever is due, one at a time,
//! then a sleep until the next is due, a new one is made, or a minute passes.

use std::sync::Arc;
use std::time::Duration;

use chrono::Utc;
use tokio::sync::Notify;

use super::message::Alert;
use super::webhook::Webhook;
use super::{CATCH_UP, email, retry_wait};
use crate::settings::Responders;
use crate::store::notifications::{self, Due};
use crate::store::{Store, StoreError, observations};

/// How many due notifications one pass takes.
const BATCH: usize = 20;
/// The longest sleep between passes (a safety net: a wake-up is never needed).
const IDLE: Duration = Duration::from_secs(60);

/// Makes the notifications of the stored record `observation_id` when it is urgent and
/// a channel is set up; a second call for the same record makes none.
pub async fn enqueue(
    store: &Store,
    responders: &Responders,
    observation_id: i64,
    urgent: bool,
) -> Result<usize, StoreError> {
    let channels = responders.channels();
    if !urgent || channels.is_empty() {
        return Ok(0);
    }
    store.run(move |conn| notifications::enqueue(conn, observation_id, &channels, Utc::now())).await
}

/// Starts the delivery task when a channel is set up; `Err` names a setting that is
/// missing or wrong, so `serve` refuses to start rather than lose alerts.
pub fn start(store: Store, responders: Responders, wake: Arc<Notify>) -> Result<(), String> {
    if responders.channels().is_empty() {
        return Ok(());
    }
    if let Some(problem) = responders.problem() {
        return Err(problem);
    }
    let smtp = if responders.email_to.is_empty() { None } else { Some(email::transport(&responders)?) };
    let webhook = match (&responders.webhook, &responders.webhook_secret) {
        (Some(url), Some(secret)) => Some(Webhook::new(url, secret)?),
        _ => None,
    };
    let sender = Sender { webhook, smtp, responders };
    tokio::spawn(async move {
        if let Err(err) = catch_up(&store, &sender.responders).await {
            tracing::warn!(error = %err, "could not look for urgent records left without a notification");
        }
        loop {
            match pass(&store, &sender).await {
                Ok(true) => continue,
                Ok(false) => {}
                Err(err) => tracing::warn!(error = %err, "delivering notifications failed; trying again later"),
            }
            let sleep = until_next(&store).await;
            tokio::select! {
                () = tokio::time::sleep(sleep) => {}
                () = wake.notified() => {}
            }
        }
    });
    Ok(())
}

struct Sender {
    webhook: Option<Webhook>,
    smtp: Option<lettre::AsyncSmtpTransport<lettre::Tokio1Executor>>,
    responders: Responders,
}

/// Urgent records of the last [`CATCH_UP`] stored without their notification (the
/// server stopped between the two) get it now.
async fn catch_up(store: &Store, responders: &Responders) -> Result<(), StoreError> {
    let since = Utc::now() - chrono::Duration::from_std(CATCH_UP).unwrap_or_default();
    for channel in responders.channels() {
        let missed = store.run(move |conn| notifications::urgent_unnotified(conn, channel, since)).await?;
        for id in missed {
            tracing::info!(observation = id, channel, "making a notification missed when the record arrived");
            store.run(move |conn| notifications::enqueue(conn, id, &[channel], Utc::now())).await?;
        }
    }
    Ok(())
}

/// Delivers what is due; `true` when there may be more.
async fn pass(store: &Store, sender: &Sender) -> Result<bool, StoreError> {
    let due = store.run(|conn| notifications::due(conn, Utc::now(), BATCH)).await?;
    let full = due.len() == BATCH;
    for one in due {
        let outcome = deliver(store, sender, &one).await?;
        let id = one.id;
        match outcome {
            Ok(()) => {
                tracing::info!(observation = one.observation_id, channel = %one.channel, "responders notified");
                store.run(move |conn| notifications::delivered(conn, id, Utc::now())).await?;
            }
            Err(why) => {
                let wait = retry_wait(Duration::from_millis(sender.responders.first_retry_ms), one.attempts + 1);
                tracing::warn!(observation = one.observation_id, channel = %one.channel, error = %why, retry_in = ?wait, "notification not delivered");
                let next = Utc::now() + chrono::Duration::from_std(wait).unwrap_or_default();
                store.run(move |conn| notifications::failed(conn, id, &why, next)).await?;
            }
        }
    }
    Ok(full)
}

/// One try: `Ok(Err(why))` when the receiver did not acknowledge it.
async fn deliver(store: &Store, sender: &Sender, due: &Due) -> Result<Result<(), String>, StoreError> {
    let id = due.observation_id;
    let Some(record) = store.run(move |conn| observations::record_by_observation_id(conn, id)).await? else {
        return Ok(Err(format!("record {id} is not stored")));
    };
    let alert = Alert::of(&record, &due.delivery_id);
    Ok(match (due.channel.as_str(), &sender.webhook, &sender.smtp) {
        ("webhook", Some(webhook), _) => webhook.send(&alert).await,
        ("email", _, Some(smtp)) => email::send(smtp, &sender.responders, &alert).await,
        (channel, _, _) => Err(format!("the {channel} channel is not set up on this server any more")),
    })
}

/// How long to sleep before the next pass.
async fn until_next(store: &Store) -> Duration {
    match store.run(|conn| notifications::next_due(conn)).await {
        Ok(Some(at)) => (at - Utc::now()).to_std().unwrap_or(Duration::ZERO).min(IDLE),
        _ => IDLE,
    }
}
