//! The phone's identity: a random token the server hands out on first sync
//! (`POST /api/devices`), kept in localStorage and sent as `Authorization: Bearer`
//! with everything the phone sends, so the observer sees the review of their own
//! records and nobody else's. No password is needed to start recording.

use shared_types::{DeviceIdentity, DeviceRequest, Text};

use crate::device;

const TOKEN_KEY: &str = "wrackline.device-token";
pub const OBSERVER_NAME_KEY: &str = "wrackline.observer-name";

fn storage() -> Option<web_sys::Storage> {
    web_sys::window()?.local_storage().ok().flatten()
}

pub fn observer_name() -> String {
    storage().and_then(|s| s.get_item(OBSERVER_NAME_KEY).ok().flatten()).unwrap_or_default()
}

pub fn remember_observer_name(name: &str) {
    if let Some(storage) = storage() {
        let _ = storage.set_item(OBSERVER_NAME_KEY, name);
    }
}

/// The identity, if this phone has one yet.
pub fn token() -> Option<String> {
    storage().and_then(|s| s.get_item(TOKEN_KEY).ok().flatten())
}

/// The identity, asking the server for one if this phone has none yet.
pub async fn ensure_token() -> Result<String, String> {
    if let Some(token) = token() {
        return Ok(token);
    }
    let request = DeviceRequest { display_name: Text::parse(&observer_name()).ok().filter(|n| !n.as_str().is_empty()), contact: None };
    let body = serde_json::to_string(&request).map_err(|err| err.to_string())?;
    let answer = device::send_json("POST", "/api/devices", Some(&body), &[]).await?;
    if answer.status != 200 {
        return Err(format!("the server gave no identity ({})", answer.status));
    }
    let identity: DeviceIdentity = serde_json::from_str(&answer.body).map_err(|err| err.to_string())?;
    if let Some(storage) = storage() {
        storage.set_item(TOKEN_KEY, &identity.token).map_err(|_| "could not keep the identity on this phone".to_owned())?;
    }
    Ok(identity.token)
}

/// `Authorization: Bearer <token>`.
pub fn bearer(token: &str) -> String {
    format!("Bearer {token}")
}
