//! The webhook: the alert as JSON, POSTed to the responders' address and signed, so
//! the receiver can tell it came from this server and was not changed or replayed.
//!
//! Headers: `X-Wrackline-Delivery` (the notification's id, the same on every retry, for
//! the receiver to ignore a repeat), `X-Wrackline-Timestamp` (Unix seconds) and
//! `X-Wrackline-Signature: sha256=<hex>`, the HMAC-SHA256 (RFC 2104) with the shared
//! secret of the timestamp, a full stop and the body's bytes. Any 2xx answer is the
//! acknowledgement; anything else, or no answer within [`TIMEOUT`], is tried again.

use std::time::Duration;

use hmac::{Hmac, Mac as _};
use sha2::Sha256;

use super::message::Alert;

/// How long one try may take.
pub const TIMEOUT: Duration = Duration::from_secs(10);

/// The signature header's value for `body` sent at `timestamp`.
pub fn signature(secret: &str, timestamp: i64, body: &[u8]) -> String {
    let mut mac = Hmac::<Sha256>::new_from_slice(secret.as_bytes()).expect("HMAC takes a key of any length");
    mac.update(timestamp.to_string().as_bytes());
    mac.update(b".");
    mac.update(body);
    format!("sha256={}", hex::encode(mac.finalize().into_bytes()))
}

/// The responders' webhook: where alerts go and the secret they are signed with.
pub struct Webhook {
    client: reqwest::Client,
    url: String,
    secret: String,
}

impl Webhook {
    pub fn new(url: &str, secret: &str) -> Result<Self, String> {
        let client = reqwest::Client::builder().build().map_err(|err| format!("starting the webhook client: {err}"))?;
        Ok(Self { client, url: url.to_owned(), secret: secret.to_owned() })
    }

    /// Sends one alert; `Err` says why it was not acknowledged.
    pub async fn send(&self, alert: &Alert) -> Result<(), String> {
        let body = serde_json::to_vec(alert).map_err(|err| format!("encoding the alert: {err}"))?;
        let timestamp = chrono::Utc::now().timestamp();
        let answer = self
            .client
            .post(&self.url)
            .timeout(TIMEOUT)
            .header("content-type", "application/json")
            .header("x-wrackline-delivery", &alert.delivery_id)
            .header("x-wrackline-timestamp", timestamp.to_string())
            .header("x-wrackline-signature", signature(&self.secret, timestamp, &body))
            .body(body)
            .send()
            .await
            .map_err(|err| format!("no answer from the webhook: {err}"))?;
        if answer.status().is_success() { Ok(()) } else { Err(format!("the webhook answered {}", answer.status())) }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_signature_is_hmac_sha256_of_timestamp_dot_body() {
        // Reference value from Python 3.11's hmac module (an implementation of RFC 2104):
        // hmac.new(b"Jefe", b"1700000000.what do ya want for nothing?", hashlib.sha256).hexdigest()
        assert_eq!(
            signature("Jefe", 1_700_000_000, b"what do ya want for nothing?"),
            "sha256=1cdd0650c8be1cb0974b1788d458b1e781206cfef59b85faafc582d2e182c57e"
        );
    }
}
