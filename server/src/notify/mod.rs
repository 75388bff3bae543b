//! Telling the stranding responders of a live animal the moment its record is stored.
//!
//! When an urgent record arrives (`Submission::is_urgent`: the animal is alive),
//! `crate::arrival` makes one notification per channel set up (`settings::Responders`:
//! a signed webhook, an email). The rows are made once per record and channel, so a
//! resend of the record notifies no one twice. A background task ([`worker`]) delivers
//! each one and retries it with doubling waits (from `--notify-first-retry-ms` up to
//! [`MAX_RETRY_WAIT`]) until the receiver acknowledges it: a 2xx answer for the webhook,
//! the SMTP server's acceptance for the email. At start-up, urgent records of the last
//! [`CATCH_UP`] that have no notification yet (their arrival was cut short) get one;
//! older ones do not, so setting up a channel never sends stale alerts.

pub mod email;
pub mod message;
pub mod webhook;
pub mod worker;

use std::time::Duration;

/// The longest wait between two tries of one notification.
pub const MAX_RETRY_WAIT: Duration = Duration::from_secs(15 * 60);

/// How far back the start-up catch-up looks for urgent records without a notification.
pub const CATCH_UP: Duration = Duration::from_secs(60 * 60);

/// The wait before the next try after `attempts` failed tries: `first`, doubling each
/// time, at most [`MAX_RETRY_WAIT`].
pub fn retry_wait(first: Duration, attempts: u32) -> Duration {
    let factor = 2u32.saturating_pow(attempts.saturating_sub(1).min(20));
    first.saturating_mul(factor).min(MAX_RETRY_WAIT)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn waits_double_from_the_first_up_to_the_cap() {
        let first = Duration::from_secs(15);
        let waits: Vec<u64> = (1..=9).map(|n| retry_wait(first, n).as_secs()).collect();
        assert_eq!(waits, [15, 30, 60, 120, 240, 480, 900, 900, 900]);
        assert_eq!(retry_wait(first, u32::MAX), MAX_RETRY_WAIT);
    }
}
