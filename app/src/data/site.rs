//! What the operator set for every phone to show (`GET /api/site`) — the local
//! responders' number beside the safety cautions — kept in localStorage, so it is there
//! on the beach with no signal.

use leptos::prelude::*;

use crate::data::api::{self, SiteInfo};
use crate::data::local;

const SITE_KEY: &str = "wrackline.site";

/// What the server last said, or nothing yet.
pub fn cached() -> SiteInfo {
    local::get(SITE_KEY).and_then(|text| serde_json::from_str(&text).ok()).unwrap_or_default()
}

/// Asks the server again and keeps the answer; with no answer the kept one stays.
pub fn refresh(into: RwSignal<SiteInfo>) {
    leptos::task::spawn_local(async move {
        let Ok(info) = api::site().await else { return };
        if let Ok(text) = serde_json::to_string(&info) {
            local::set(SITE_KEY, &text);
        }
        into.set(info);
    });
}
