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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_position_is_named_by_the_centre_of_its_cell() {
        // The browser test keeps the answer for a record at 52.4153, -4.0829 under
        // `wrackline.nearby.52.45,-4.05` (tests/browser/species_key.test.mjs).
        let area = area_of(52.4153, -4.0829).unwrap();
        assert_eq!(area, ("52.45".to_owned(), "-4.05".to_owned()));
        assert_eq!(storage_key(&area), "wrackline.nearby.52.45,-4.05");
        // Every position in the same cell shares its name.
        assert_eq!(area_of(52.4001, -4.0999), Some(area.clone()));
        assert_ne!(area_of(52.3999, -4.0829), Some(area));
        assert_eq!(area_of(-33.91, 18.42), Some(("-33.95".to_owned(), "18.45".to_owned())));
    }

    #[test]
    fn a_position_off_the_globe_has_no_area() {
        for (lat, lon) in [(91.0, 0.0), (0.0, 180.5), (f64::NAN, 0.0), (0.0, f64::INFINITY)] {
            assert_eq!(area_of(lat, lon), None, "{lat}, {lon}");
        }
        assert_eq!(area_of(90.0, 180.0), Some(("90.00".to_owned(), "180.00".to_owned())), "clamped to the globe");
    }
}
