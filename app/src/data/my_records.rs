//! "My records": the observer's own records as the server last described them to this
//! phone — review state, current identification and reviewers' messages — fetched with
//! each sync and kept in localStorage, so they can be read offline.

use shared_types::MyRecord;

use crate::data::api;
use crate::data::local;

const MY_RECORDS_KEY: &str = "wrackline.my-records";

/// The records as the server last described them to this phone.
pub fn cached() -> Vec<MyRecord> {
    local::get(MY_RECORDS_KEY).and_then(|text| serde_json::from_str(&text).ok()).unwrap_or_default()
}

/// Asks the server for this phone's records and keeps them for offline reading.
pub async fn fetch(token: &str) -> Result<Vec<MyRecord>, String> {
    let records = api::my_records(token).await.map_err(|err| format!("my records: {err}"))?;
    if let Ok(text) = serde_json::to_string(&records) {
        local::set(MY_RECORDS_KEY, &text);
    }
    Ok(records)
}
