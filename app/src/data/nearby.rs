//! Confirmed records near the record, per species, for the guided key's prior: asked of
//! the server (`/api/checklist/nearby`) for the area around the record's position and
//! kept in localStorage per area, so the key still uses it in flight mode wherever the
//! phone has been online before.
//!
//! An area is a cell of [`AREA_DEGREES`] in latitude and longitude; the server is asked
//! about the cell's centre, so one answer serves the whole cell. The server counts within
//! 50 km, far wider than a cell, so the answer fits anywhere in it.

use leptos::prelude::*;

use crate::data::api::{self, NearbyCounts};
use crate::data::local;

/// The side of one cached area, in degrees (about 11 km north–south).
pub const AREA_DEGREES: f64 = 0.1;
const STORED_PREFIX: &str = "wrackline.nearby.";

/// Confirmed records per scientific name near one area.
pub type Counts = std::collections::BTreeMap<String, u32>;

/// The centre of the cell holding a position, as the text used in the URL and the
/// storage key (so the same area always has the same name).
pub fn area_of(latitude: f64, longitude: f64) -> Option<(String, String)> {
    let centre = |value: f64| ((value / AREA_DEGREES).floor() + 0.5) * AREA_DEGREES;
    let ok = latitude.is_finite() && longitude.is_finite() && latitude.abs() <= 90.0 && longitude.abs() <= 180.0;
    ok.then(|| {
        (
            format!("{:.2}", centre(latitude).clamp(-90.0, 90.0)),
            format!("{:.2}", centre(longitude).clamp(-180.0, 180.0)),
        )
    })
}

fn storage_key((lat, lon): &(String, String)) -> String {
    format!("{STORED_PREFIX}{lat},{lon}")
}

/// The counts kept for this area, if the phone has asked about it before.
pub fn cached(area: &(String, String)) -> Option<Counts> {
    serde_json::from_str::<NearbyCounts>(&local::get(&storage_key(area))?).ok().map(|a| a.counts)
}

/// Asks the server about `area`, keeps the answer and sets `into`; with no answer the
/// cached counts (or none) stay.
pub fn refresh(area: (String, String), into: RwSignal<Option<Counts>>) {
    leptos::task::spawn_local(async move {
        let Ok(answer) = api::nearby(&area.0, &area.1).await else { return };
        if let Ok(text) = serde_json::to_string(&answer) {
            local::set(&storage_key(&area), &text);
        }
        into.set(Some(answer.counts));
    });
}
