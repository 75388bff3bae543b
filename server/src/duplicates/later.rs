//! Searches for duplicates that failed after their record was stored, tried again in the
//! background until they succeed. The record's receipt has gone back already; nothing
//! here can change that answer. A search still missing at the next start runs then
//! (`search::build_index`), and a resend runs it too.

use std::collections::{BTreeMap, HashSet};
use std::sync::{Arc, Mutex};
use std::time::Duration;

use chrono::Utc;
use tokio::sync::mpsc;
use tokio::time::Instant;

use super::Index;
use super::search::search_once;
use crate::store::Store;
use crate::taxa::TaxonIndex;

/// The first wait before a failed search is tried again; each failure doubles it.
pub const FIRST_WAIT: Duration = Duration::from_millis(500);
/// The longest wait between two tries.
pub const LONGEST_WAIT: Duration = Duration::from_secs(300);

/// The queue of searches to try again; cheap to clone. Its task starts with the first
/// search handed to it (it needs the async runtime, which start-up has not begun).
#[derive(Clone)]
pub struct Retries {
    parts: Arc<Parts>,
    queue: Arc<Mutex<Option<mpsc::UnboundedSender<i64>>>>,
}

struct Parts {
    store: Store,
    index: Arc<Mutex<Index>>,
    taxa: Arc<TaxonIndex>,
}

impl Retries {
    pub fn new(store: Store, index: Arc<Mutex<Index>>, taxa: Arc<TaxonIndex>) -> Self {
        Self { parts: Arc::new(Parts { store, index, taxa }), queue: Arc::default() }
    }

    /// Tries the search for `observation_id` again later, and again until it succeeds.
    /// Must be called on the async runtime.
    pub fn push(&self, observation_id: i64) {
        let mut queue = self.queue.lock().unwrap_or_else(|p| p.into_inner());
        let sender = queue.get_or_insert_with(|| {
            let (sender, receiver) = mpsc::unbounded_channel();
            tokio::spawn(retry_until_done(self.parts.clone(), receiver));
            sender
        });
        if sender.send(observation_id).is_err() {
            tracing::error!(
                observation = observation_id,
                "the retry task has stopped; the search runs at the next start"
            );
        }
    }
}

/// Runs each queued search when its wait is over, doubling the wait after each failure.
async fn retry_until_done(parts: Arc<Parts>, mut incoming: mpsc::UnboundedReceiver<i64>) {
    let mut due: BTreeMap<(Instant, i64), Duration> = BTreeMap::new();
    let mut waiting: HashSet<i64> = HashSet::new();
    loop {
        let next = due.keys().next().copied();
        let arrived = match next {
            Some((at, _)) => tokio::select! {
                id = incoming.recv() => id.map(Some),
                () = tokio::time::sleep_until(at) => Some(None),
            },
            None => incoming.recv().await.map(Some),
        };
        match arrived {
            None => return,
            Some(Some(id)) => {
                if waiting.insert(id) {
                    due.insert((Instant::now() + FIRST_WAIT, id), FIRST_WAIT);
                }
            }
            Some(None) => {
                let Some(((_, id), wait)) = due.pop_first() else { continue };
                let tried = search_once(&parts.store, &parts.index, &parts.taxa, id, Utc::now()).await;
                match tried {
                    Ok(()) => {
                        waiting.remove(&id);
                        tracing::info!(observation = id, "search for duplicates done on a later try");
                    }
                    Err(err) => {
                        let wait = (wait * 2).min(LONGEST_WAIT);
                        tracing::warn!(observation = id, error = %err, retry_in_s = wait.as_secs_f64(), "search for duplicates failed again");
                        due.insert((Instant::now() + wait, id), wait);
                    }
                }
            }
        }
    }
}
