//! Passwords, tokens and the sign-in rate limit, with no HTTP in them.
//!
//! Passwords are hashed with argon2 (Argon2id, the crate's default parameters).
//! Session and device tokens are 244 random bits (two v4 UUIDs); only their SHA-256 is
//! stored, so a copy of the database signs nobody in. A sign-in with an unknown
//! username is checked against a dummy hash, so it takes as long as a wrong password
//! and the answer's timing does not tell which usernames exist.
//!
//! Failed sign-ins are counted three ways, each over [`FAILURE_WINDOW`] (kept in memory:
//! a restart forgets them):
//! - one username from one client address: [`MAX_FAILURES`] — guessing a password;
//! - one client address, any usernames: [`MAX_FAILURES_PER_ADDRESS`] — trying many names;
//! - one username from all addresses: [`MAX_FAILURES_PER_NAME`] — a spread-out attack.
//!
//! So a stranger can lock a reviewer out only from many addresses at once, not from
//! one. A sign-in is counted as a failure when it starts, before its slow password
//! check, and a right password takes that back: guesses sent in parallel get no more
//! tries than guesses sent one after another. Each count keeps at most [`MAX_TRACKED`] keys: expired ones are pruned first,
//! then the key whose last failure is oldest is forgotten.

use std::collections::{HashMap, VecDeque};
use std::hash::Hash;
use std::net::IpAddr;
use std::sync::{Arc, LazyLock, Mutex};
use std::time::{Duration, Instant};

use argon2::Argon2;
use argon2::password_hash::{PasswordHash, PasswordHasher, PasswordVerifier, SaltString};
use sha2::{Digest as _, Sha256};

/// Failures allowed for one username from one address.
pub const MAX_FAILURES: usize = 5;
/// Failures allowed from one address, whatever the usernames.
pub const MAX_FAILURES_PER_ADDRESS: usize = 20;
/// Failures allowed for one username from all addresses together.
pub const MAX_FAILURES_PER_NAME: usize = 100;
pub const FAILURE_WINDOW: Duration = Duration::from_secs(15 * 60);
/// The most keys each count keeps (a few MB at worst).
pub const MAX_TRACKED: usize = 10_000;
/// How long a sign-in lasts.
pub const SESSION_HOURS: i64 = 12;
/// The shortest password accepted (common practice for staff accounts).
pub const MIN_PASSWORD_CHARS: usize = 10;

pub fn hash_password(password: &str) -> anyhow::Result<String> {
    // A v4 UUID's 16 bytes (122 of them random, from the OS) make the salt.
    let salt = SaltString::encode_b64(uuid::Uuid::new_v4().as_bytes())
        .map_err(|err| anyhow::anyhow!("making a salt: {err}"))?;
    Argon2::default()
        .hash_password(password.as_bytes(), &salt)
        .map(|hash| hash.to_string())
        .map_err(|err| anyhow::anyhow!("hashing the password: {err}"))
}

pub fn verify_password(password: &str, stored_hash: &str) -> bool {
    PasswordHash::new(stored_hash)
        .is_ok_and(|hash| Argon2::default().verify_password(password.as_bytes(), &hash).is_ok())
}

/// A hash of a random password nobody knows, with the same parameters as real ones.
static DUMMY_HASH: LazyLock<String> = LazyLock::new(|| hash_password(&new_token()).unwrap_or_default());

/// Checks `password` against the stored hash, or against the dummy hash when there is
/// none (unknown username), so both take the same argon2 work. Blocking: run it on the
/// blocking pool.
pub fn verify_or_dummy(password: &str, stored_hash: Option<&str>) -> bool {
    match stored_hash {
        Some(hash) => verify_password(password, hash),
        None => {
            let _ = verify_password(password, &DUMMY_HASH);
            false
        }
    }
}

/// A fresh random token, hex.
pub fn new_token() -> String {
    format!("{}{}", uuid::Uuid::new_v4().simple(), uuid::Uuid::new_v4().simple())
}

pub fn token_sha256(token: &str) -> String {
    hex::encode(Sha256::digest(token.as_bytes()))
}

/// Recent failures per key, at most `limit` remembered per key.
#[derive(Debug)]
struct Tracker<K> {
    recent: HashMap<K, VecDeque<Instant>>,
    limit: usize,
}

impl<K: Eq + Hash + Clone> Tracker<K> {
    fn new(limit: usize) -> Self {
        Self { recent: HashMap::new(), limit }
    }

    /// How long `key` must wait, if it has reached its limit. Makes no entry.
    fn locked_for(&mut self, key: &K, now: Instant) -> Option<Duration> {
        let times = self.recent.get_mut(key)?;
        expire(times, now);
        if times.is_empty() {
            self.recent.remove(key);
            return None;
        }
        (times.len() >= self.limit).then(|| FAILURE_WINDOW.saturating_sub(now.duration_since(times[0])))
    }

    /// Takes back one failure recorded for `key` at `at` (an attempt that succeeded).
    fn take_back(&mut self, key: &K, at: Instant) {
        if let Some(times) = self.recent.get_mut(key) {
            if let Some(position) = times.iter().rposition(|t| *t == at) {
                times.remove(position);
            }
            if times.is_empty() {
                self.recent.remove(key);
            }
        }
    }

    fn record(&mut self, key: K, now: Instant) {
        if !self.recent.contains_key(&key) && self.recent.len() >= MAX_TRACKED {
            self.make_room(now);
        }
        let times = self.recent.entry(key).or_default();
        expire(times, now);
        if times.len() >= self.limit {
            times.pop_front();
        }
        times.push_back(now);
    }

    /// Drops expired keys; if none expired, the key whose last failure is oldest.
    fn make_room(&mut self, now: Instant) {
        self.recent.retain(|_, times| {
            expire(times, now);
            !times.is_empty()
        });
        if self.recent.len() >= MAX_TRACKED {
            let stalest = self.recent.iter().min_by_key(|(_, times)| times.back().copied()).map(|(key, _)| key.clone());
            if let Some(key) = stalest {
                self.recent.remove(&key);
            }
        }
    }
}

fn expire(times: &mut VecDeque<Instant>, now: Instant) {
    while times.front().is_some_and(|t| now.duration_since(*t) > FAILURE_WINDOW) {
        times.pop_front();
    }
}

/// Which count refused a sign-in.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Lock {
    /// This username from this address.
    NameFromAddress,
    /// This address, whatever the username.
    Address,
    /// This username, from everywhere.
    Name,
}

#[derive(Debug)]
struct Failures {
    name_and_address: Tracker<(String, IpAddr)>,
    address: Tracker<IpAddr>,
    name: Tracker<String>,
}

impl Failures {
    fn locked_for(&mut self, name: &str, address: IpAddr, now: Instant) -> Option<(Duration, Lock)> {
        let pair = self
            .name_and_address
            .locked_for(&(name.to_owned(), address), now)
            .map(|wait| (wait, Lock::NameFromAddress));
        let from_address = self.address.locked_for(&address, now).map(|wait| (wait, Lock::Address));
        let for_name = self.name.locked_for(&name.to_owned(), now).map(|wait| (wait, Lock::Name));
        pair.into_iter().chain(from_address).chain(for_name).max_by_key(|(wait, _)| *wait)
    }

    fn record(&mut self, name: &str, address: IpAddr, now: Instant) {
        self.name_and_address.record((name.to_owned(), address), now);
        self.address.record(address, now);
        self.name.record(name.to_owned(), now);
    }
}

/// Failed sign-ins by username and client address.
#[derive(Clone)]
pub struct LoginLimiter {
    failures: Arc<Mutex<Failures>>,
}

impl Default for LoginLimiter {
    fn default() -> Self {
        // Made now, so the first unknown username costs no more than any other.
        LazyLock::force(&DUMMY_HASH);
        let failures = Failures {
            name_and_address: Tracker::new(MAX_FAILURES),
            address: Tracker::new(MAX_FAILURES_PER_ADDRESS),
            name: Tracker::new(MAX_FAILURES_PER_NAME),
        };
        Self { failures: Arc::new(Mutex::new(failures)) }
    }
}

impl LoginLimiter {
    fn lock(&self) -> std::sync::MutexGuard<'_, Failures> {
        self.failures.lock().unwrap_or_else(|p| p.into_inner())
    }

    /// How long until `username` may try again from `address`, and which count says so.
    pub fn locked_for(&self, username: &str, address: IpAddr, now: Instant) -> Option<(Duration, Lock)> {
        self.lock().locked_for(&username.to_lowercase(), address, now)
    }

    pub fn record_failure(&self, username: &str, address: IpAddr, now: Instant) {
        self.lock().record(&username.to_lowercase(), address, now);
    }

    /// Starts a sign-in at `now`: refused while a count is locked, else counted as a
    /// failure at once, in the same step, so that guesses sent in parallel are each
    /// counted before any password is checked. A right password takes the count back
    /// ([`LoginLimiter::succeeded`] with the same `now`).
    pub fn begin_attempt(&self, username: &str, address: IpAddr, now: Instant) -> Result<(), (Duration, Lock)> {
        let name = username.to_lowercase();
        let mut failures = self.lock();
        if let Some(lock) = failures.locked_for(&name, address, now) {
            return Err(lock);
        }
        failures.record(&name, address, now);
        Ok(())
    }

    /// The attempt begun at `began` had the right password: that username's failures
    /// from that address are forgotten, and the attempt is taken back from the address's
    /// and the name's totals (their earlier failures stand until they expire).
    pub fn succeeded(&self, username: &str, address: IpAddr, began: Instant) {
        let name = username.to_lowercase();
        let mut failures = self.lock();
        failures.name_and_address.recent.remove(&(name.clone(), address));
        failures.address.take_back(&address, began);
        failures.name.take_back(&name, began);
    }

    /// How many keys the three counts hold together.
    pub fn tracked(&self) -> usize {
        let failures = self.lock();
        failures.name_and_address.recent.len() + failures.address.recent.len() + failures.name.recent.len()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const HOME: IpAddr = IpAddr::V4(std::net::Ipv4Addr::new(192, 0, 2, 1));
    const AWAY: IpAddr = IpAddr::V4(std::net::Ipv4Addr::new(198, 51, 100, 7));

    #[test]
    fn a_password_verifies_against_its_own_hash_only() {
        let hash = hash_password("strandline-2026").unwrap();
        assert!(hash.starts_with("$argon2id$"), "{hash}");
        assert!(verify_password("strandline-2026", &hash));
        assert!(!verify_password("strandline-2027", &hash));
        assert!(!verify_password("strandline-2026", "not a hash"));
        assert!(!verify_or_dummy("strandline-2026", None));
        assert!(DUMMY_HASH.starts_with("$argon2id$"), "the dummy has the real parameters");
    }

    #[test]
    fn one_name_locks_from_one_address_only_and_forgets_after_the_window() {
        let limiter = LoginLimiter::default();
        let start = Instant::now();
        for _ in 0..MAX_FAILURES {
            assert!(limiter.locked_for("Reviewer", HOME, start).is_none());
            limiter.record_failure("reviewer", HOME, start);
        }
        assert_eq!(limiter.locked_for("REVIEWER", HOME, start).map(|l| l.1), Some(Lock::NameFromAddress));
        assert!(limiter.locked_for("reviewer", AWAY, start).is_none(), "the reviewer can still sign in from elsewhere");
        assert!(limiter.locked_for("admin", HOME, start).is_none());
        assert!(limiter.locked_for("reviewer", HOME, start + FAILURE_WINDOW + Duration::from_secs(1)).is_none());
    }

    #[test]
    fn an_attempt_counts_when_it_begins_and_a_right_password_takes_it_back() {
        let limiter = LoginLimiter::default();
        let start = Instant::now();
        for n in 0..MAX_FAILURES {
            let at = start + Duration::from_millis(n as u64);
            assert_eq!(
                limiter.begin_attempt("reviewer", HOME, at),
                Ok(()),
                "attempt {n}, its password not yet checked"
            );
        }
        let refused = limiter.begin_attempt("reviewer", HOME, start + Duration::from_secs(1));
        assert_eq!(refused.map_err(|l| l.1), Err(Lock::NameFromAddress), "every attempt begun counts");
        // Signing in many times over from one address locks nothing.
        let fresh = LoginLimiter::default();
        for n in 0..(2 * MAX_FAILURES_PER_ADDRESS) {
            let at = start + Duration::from_millis(n as u64);
            assert_eq!(fresh.begin_attempt("reviewer", HOME, at), Ok(()), "sign-in {n}");
            fresh.succeeded("Reviewer", HOME, at);
        }
        assert_eq!(fresh.tracked(), 0, "each right password took its attempt back");
    }

    #[test]
    fn one_address_trying_many_names_is_stopped() {
        let limiter = LoginLimiter::default();
        let start = Instant::now();
        for n in 0..MAX_FAILURES_PER_ADDRESS {
            limiter.record_failure(&format!("name-{n}"), HOME, start);
        }
        assert_eq!(limiter.locked_for("someone-new", HOME, start).map(|l| l.1), Some(Lock::Address));
        assert!(limiter.locked_for("someone-new", AWAY, start).is_none());
    }

    #[test]
    fn one_name_tried_from_many_addresses_is_stopped() {
        let limiter = LoginLimiter::default();
        let start = Instant::now();
        for n in 0..MAX_FAILURES_PER_NAME {
            limiter.record_failure("reviewer", IpAddr::V4(std::net::Ipv4Addr::from(0x0a00_0000 + n as u32)), start);
        }
        assert_eq!(limiter.locked_for("reviewer", AWAY, start).map(|l| l.1), Some(Lock::Name));
    }

    #[test]
    fn checking_makes_no_entry_and_the_counts_stay_bounded() {
        let limiter = LoginLimiter::default();
        let start = Instant::now();
        for n in 0..1000 {
            assert!(limiter.locked_for(&format!("nobody-{n}"), HOME, start).is_none());
        }
        assert_eq!(limiter.tracked(), 0, "asking leaves nothing behind");
        for n in 0..(MAX_TRACKED + 50) {
            let address = IpAddr::V4(std::net::Ipv4Addr::from(0x0a00_0000 + n as u32));
            limiter.record_failure(&format!("name-{n}"), address, start + Duration::from_millis(n as u64));
        }
        assert_eq!(limiter.tracked(), 3 * MAX_TRACKED, "each count holds at most MAX_TRACKED keys");
        // Once the window has passed, making room prunes everything expired.
        limiter.record_failure("late", HOME, start + FAILURE_WINDOW + Duration::from_secs(60));
        assert_eq!(limiter.tracked(), 3);
    }
}
