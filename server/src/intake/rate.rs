//! How often one phone, or one address, may submit: a token bucket per key. Each key
//! may send a burst at once (a phone coming back into signal with a weekend's records),
//! then at a steady rate; past that a submission is refused with the time until the
//! next one will be taken, which the HTTP edge sends as `Retry-After`.
//!
//! Buckets live in memory only (a restart forgets them, which errs towards letting
//! observers through). Full buckets are forgotten when the map grows, and when even
//! then there are more keys than [`MAX_KEYS`], new keys are refused until some fill up:
//! many addresses cannot make the server's memory grow without bound.

use std::collections::HashMap;
use std::hash::Hash;
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

/// The most keys a limiter tracks at once.
pub const MAX_KEYS: usize = 100_000;

/// A limit: `burst` at once, refilled at `per_minute`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Pace {
    pub burst: u32,
    pub per_minute: u32,
}

/// Token buckets by key, shared by every request of one server.
#[derive(Debug, Clone)]
pub struct RateLimiter<K> {
    pace: Pace,
    buckets: Arc<Mutex<HashMap<K, Bucket>>>,
}

#[derive(Debug, Clone, Copy)]
struct Bucket {
    tokens: f64,
    at: Instant,
}

impl<K: Eq + Hash + Clone> RateLimiter<K> {
    pub fn new(pace: Pace) -> Self {
        Self { pace, buckets: Arc::default() }
    }

    /// Takes one submission for `key` at `now`, or says how long until one is allowed.
    pub fn take(&self, key: &K, now: Instant) -> Result<(), Duration> {
        let Pace { burst, per_minute } = self.pace;
        let (burst, per_second) = (f64::from(burst.max(1)), f64::from(per_minute) / 60.0);
        let mut buckets = self.buckets.lock().unwrap_or_else(|p| p.into_inner());
        if !buckets.contains_key(key) && buckets.len() >= MAX_KEYS {
            buckets.retain(|_, b| refilled(*b, now, burst, per_second) < burst);
            if buckets.len() >= MAX_KEYS {
                return Err(Duration::from_secs(60));
            }
        }
        let bucket = buckets.entry(key.clone()).or_insert(Bucket { tokens: burst, at: now });
        let tokens = refilled(*bucket, now, burst, per_second);
        if tokens >= 1.0 {
            *bucket = Bucket { tokens: tokens - 1.0, at: now };
            return Ok(());
        }
        *bucket = Bucket { tokens, at: now };
        let wait = if per_second > 0.0 { (1.0 - tokens) / per_second } else { 3600.0 };
        Err(Duration::from_secs_f64(wait.max(0.001)))
    }
}

fn refilled(bucket: Bucket, now: Instant, burst: f64, per_second: f64) -> f64 {
    let elapsed = now.saturating_duration_since(bucket.at).as_secs_f64();
    (bucket.tokens + elapsed * per_second).min(burst)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_burst_passes_then_one_per_interval() {
        let limiter = RateLimiter::new(Pace { burst: 3, per_minute: 60 });
        let start = Instant::now();
        for _ in 0..3 {
            assert!(limiter.take(&"phone", start).is_ok());
        }
        let wait = limiter.take(&"phone", start).unwrap_err();
        assert!((wait.as_secs_f64() - 1.0).abs() < 1e-6, "one a second: wait a second, got {wait:?}");
        assert!(limiter.take(&"another phone", start).is_ok(), "each key has its own bucket");
        assert!(limiter.take(&"phone", start + Duration::from_millis(999)).is_err());
        assert!(limiter.take(&"phone", start + Duration::from_millis(1001)).is_ok());
    }

    #[test]
    fn a_bucket_refills_to_its_burst_and_no_further() {
        let limiter = RateLimiter::new(Pace { burst: 2, per_minute: 600 });
        let start = Instant::now();
        let later = start + Duration::from_secs(3600);
        let taken = (0..5).filter(|_| limiter.take(&1, later).is_ok()).count();
        assert_eq!(taken, 2);
    }
}
