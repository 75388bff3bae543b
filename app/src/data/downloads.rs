//! Download links for the stored records (`/api/export`), with the same filters as
//! `wrackline export`: format, taxon, dates, area and review state, and the full form
//! (positions as recorded) for a signed-in reviewer or admin. A download is a plain
//! link: the browser fetches it with the session cookie when there is one, and the
//! server decides what the caller may have.

use crate::data::api::query_part;
use crate::data::words::{t, t_args};

/// The records figures and downloads use unless the reader chooses: the confirmed ones,
/// as the server's API and command line default (`server::assess::DEFAULT_STATE`).
pub const DEFAULT_STATE: &str = "confirmed";

/// What a review-state choice means, said under it.
pub fn state_words(state: &str) -> String {
    match state {
        "confirmed" => t("downloads-state-confirmed"),
        "any" => t("downloads-state-any"),
        other => t_args("downloads-state-other", &[("state", other.replace('_', " ").into())]),
    }
}

/// The download form's choices.
#[derive(Debug, Clone, PartialEq)]
pub struct ExportFilters {
    /// `dwca`, `csv` or `geojson`.
    pub format: String,
    pub taxon: String,
    pub from: String,
    pub to: String,
    /// A checklist area's box, `SOUTH,WEST,NORTH,EAST`.
    pub area: String,
    pub state: String,
    pub full: bool,
}

impl Default for ExportFilters {
    /// A Darwin Core Archive of the confirmed records, public form.
    fn default() -> Self {
        Self {
            format: "dwca".into(),
            taxon: String::new(),
            from: String::new(),
            to: String::new(),
            area: String::new(),
            state: DEFAULT_STATE.into(),
            full: false,
        }
    }
}

impl ExportFilters {
    /// The export URL; blank filters are left out.
    pub fn url(&self) -> String {
        let mut url = format!("/api/export?format={}", query_part(&self.format));
        for (name, value) in [
            ("taxon", &self.taxon),
            ("from", &self.from),
            ("to", &self.to),
            ("bbox", &self.area),
            ("state", &self.state),
        ] {
            if !value.trim().is_empty() {
                url.push_str(&format!("&{name}={}", query_part(value.trim())));
            }
        }
        if self.full {
            url.push_str("&audience=full");
        }
        url
    }

    /// The name the browser saves the download under: `wrackline-public.zip` and the like.
    pub fn file_name(&self) -> String {
        let suffix = match self.format.as_str() {
            "dwca" => "zip",
            "geojson" => "geojson",
            _ => "csv",
        };
        let audience = if self.full { "full" } else { "public" };
        format!("wrackline-{audience}.{suffix}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_default_download_is_the_public_archive_of_confirmed_records() {
        let filters = ExportFilters::default();
        assert_eq!(filters.url(), "/api/export?format=dwca&state=confirmed");
        assert_eq!(filters.file_name(), "wrackline-public.zip");
    }

    #[test]
    fn the_state_chosen_is_said_in_words() {
        assert!(state_words(DEFAULT_STATE).starts_with("Counting confirmed records only"));
        assert!(state_words("any").contains("reviewed or not"));
        assert_eq!(state_words("awaiting_review"), "Counting records in the state “awaiting review” only.");
    }

    #[test]
    fn filters_given_are_encoded_and_blank_ones_left_out() {
        let filters = ExportFilters {
            format: "csv".into(),
            taxon: " Raja clavata ".into(),
            from: "2025-01-01".into(),
            area: "51.95,-5,52.85,-3.9".into(),
            state: String::new(),
            full: true,
            ..ExportFilters::default()
        };
        assert_eq!(
            filters.url(),
            "/api/export?format=csv&taxon=Raja%20clavata&from=2025-01-01&bbox=51.95%2C-5%2C52.85%2C-3.9&audience=full"
        );
        assert_eq!(filters.file_name(), "wrackline-full.csv");
        assert_eq!(
            ExportFilters { format: "geojson".into(), ..ExportFilters::default() }.file_name(),
            "wrackline-public.geojson"
        );
    }
}
