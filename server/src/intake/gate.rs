//! At most a few photo decodes at once, whatever the number of uploads.
//!
//! Decoding a photo may allocate up to the decoder limit in `images.rs` (320 MiB for a
//! 64 MP photo), and the blocking pool would run up to 512 of them side by side: a few
//! parallel uploads of large photos could take all the memory. Every decode (at intake,
//! and when a missing derivative is made again) goes through one [`DecodeGate`], which
//! lets as many run as the machine has cores and keeps the rest waiting their turn —
//! a request waits, it is never refused for being busy.

use std::sync::Arc;
use std::sync::atomic::{AtomicUsize, Ordering};

use tokio::sync::Semaphore;

/// Turns for decoding photos, shared by every request of one server.
#[derive(Debug, Clone)]
pub struct DecodeGate {
    turns: Arc<Semaphore>,
    size: usize,
    counts: Arc<Counts>,
}

#[derive(Debug, Default)]
struct Counts {
    now: AtomicUsize,
    most: AtomicUsize,
}

/// Why gated work did not finish.
#[derive(Debug, thiserror::Error)]
#[error("photo decoding stopped: {0}")]
pub struct GateError(String);

impl DecodeGate {
    /// A gate letting `size` decodes (at least one) run at once.
    pub fn new(size: usize) -> Self {
        let size = size.max(1);
        Self { turns: Arc::new(Semaphore::new(size)), size, counts: Arc::default() }
    }

    /// One turn per core: decoding is CPU-bound, so more at once would not finish sooner.
    pub fn sized_to_cores() -> Self {
        Self::new(std::thread::available_parallelism().map_or(2, |n| n.get()))
    }

    /// How many decodes may run at once.
    pub fn size(&self) -> usize {
        self.size
    }

    /// The most decodes that have run at once since the server started.
    pub fn most_at_once(&self) -> usize {
        self.counts.most.load(Ordering::SeqCst)
    }

    /// Waits for a turn, then runs `work` on the blocking pool and gives the turn back.
    pub async fn run<T: Send + 'static>(&self, work: impl FnOnce() -> T + Send + 'static) -> Result<T, GateError> {
        let turn = self.turns.clone().acquire_owned().await.map_err(|err| GateError(err.to_string()))?;
        let counts = self.counts.clone();
        tokio::task::spawn_blocking(move || {
            let _turn = turn;
            let _running = Running::start(&counts);
            work()
        })
        .await
        .map_err(|err| GateError(err.to_string()))
    }
}

/// Counts one running decode for as long as it lives.
struct Running<'a>(&'a Counts);

impl<'a> Running<'a> {
    fn start(counts: &'a Counts) -> Self {
        let now = counts.now.fetch_add(1, Ordering::SeqCst) + 1;
        counts.most.fetch_max(now, Ordering::SeqCst);
        Self(counts)
    }
}

impl Drop for Running<'_> {
    fn drop(&mut self) {
        self.0.now.fetch_sub(1, Ordering::SeqCst);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[tokio::test(flavor = "multi_thread", worker_threads = 2)]
    async fn no_more_than_its_size_run_at_once() {
        let gate = DecodeGate::new(2);
        let works = (0..8).map(|_| {
            let gate = gate.clone();
            tokio::spawn(async move { gate.run(|| std::thread::sleep(std::time::Duration::from_millis(30))).await })
        });
        for work in works.collect::<Vec<_>>() {
            work.await.unwrap().unwrap();
        }
        assert_eq!(gate.most_at_once(), 2, "two turns, eight waiting works: two at once, never more");
    }
}
