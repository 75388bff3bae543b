//! Passwords, tokens and the sign-in rate limit, with no HTTP in them.
//!
//! Passwords are hashed with argon2 (Argon2id, the crate's default parameters).
//! Session and device tokens are 244 random bits (two v4 UUIDs); only their SHA-256 is
//! stored, so a copy of the database signs nobody in. Failed sign-ins are limited per
//! username: after [`MAX_FAILURES`] within [`FAILURE_WINDOW`], further attempts are refused
//! until the window has passed (kept in memory: a restart forgets them).

use std::collections::{HashMap, VecDeque};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

use argon2::password_hash::{PasswordHash, PasswordHasher, PasswordVerifier, SaltString};
use argon2::Argon2;
use sha2::{Digest as _, Sha256};

pub const MAX_FAILURES: usize = 5;
pub const FAILURE_WINDOW: Duration = Duration::from_secs(15 * 60);
/// How long a sign-in lasts.
pub const SESSION_HOURS: i64 = 12;
/// The shortest password accepted (common practice for staff accounts).
pub const MIN_PASSWORD_CHARS: usize = 10;

pub fn hash_password(password: &str) -> anyhow::Result<String> {
    // A v4 UUID's 16 bytes (122 of them random, from the OS) make the salt.
    let salt = SaltString::encode_b64(uuid::Uuid::new_v4().as_bytes()).map_err(|err| anyhow::anyhow!("making a salt: {err}"))?;
    Argon2::default()
        .hash_password(password.as_bytes(), &salt)
        .map(|hash| hash.to_string())
        .map_err(|err| anyhow::anyhow!("hashing the password: {err}"))
}

pub fn verify_password(password: &str, stored_hash: &str) -> bool {
    PasswordHash::new(stored_hash).is_ok_and(|hash| Argon2::default().verify_password(password.as_bytes(), &hash).is_ok())
}

/// A fresh random token, hex.
pub fn new_token() -> String {
    format!("{}{}", uuid::Uuid::new_v4().simple(), uuid::Uuid::new_v4().simple())
}

pub fn token_sha256(token: &str) -> String {
    hex::encode(Sha256::digest(token.as_bytes()))
}

/// Failed sign-ins per username.
#[derive(Clone, Default)]
pub struct LoginLimiter {
    failures: Arc<Mutex<HashMap<String, VecDeque<Instant>>>>,
}

impl LoginLimiter {
    /// How long until `username` may try again, if it is locked out now.
    pub fn locked_for(&self, username: &str, now: Instant) -> Option<Duration> {
        let mut failures = self.failures.lock().unwrap_or_else(|p| p.into_inner());
        let recent = failures.entry(username.to_lowercase()).or_default();
        while recent.front().is_some_and(|t| now.duration_since(*t) > FAILURE_WINDOW) {
            recent.pop_front();
        }
        (recent.len() >= MAX_FAILURES).then(|| FAILURE_WINDOW.saturating_sub(now.duration_since(recent[0])))
    }

    pub fn record_failure(&self, username: &str, now: Instant) {
        let mut failures = self.failures.lock().unwrap_or_else(|p| p.into_inner());
        failures.entry(username.to_lowercase()).or_default().push_back(now);
    }

    pub fn clear(&self, username: &str) {
        self.failures.lock().unwrap_or_else(|p| p.into_inner()).remove(&username.to_lowercase());
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_password_verifies_against_its_own_hash_only() {
        let hash = hash_password("strandline-2026").unwrap();
        assert!(hash.starts_with("$argon2id$"), "{hash}");
        assert!(verify_password("strandline-2026", &hash));
        assert!(!verify_password("strandline-2027", &hash));
        assert!(!verify_password("strandline-2026", "not a hash"));
    }

    #[test]
    fn the_limiter_locks_after_five_failures_and_forgets_after_the_window() {
        let limiter = LoginLimiter::default();
        let start = Instant::now();
        for _ in 0..MAX_FAILURES {
            assert!(limiter.locked_for("Reviewer", start).is_none());
            limiter.record_failure("reviewer", start);
        }
        assert!(limiter.locked_for("REVIEWER", start).is_some());
        assert!(limiter.locked_for("reviewer", start + FAILURE_WINDOW + Duration::from_secs(1)).is_none());
    }
}
