//! Stored records as the judging sees them: names matched to the checklist, and each
//! record's sightings (its own time and place, and a photo's where that is the better
//! witness).

use std::sync::Arc;

use chrono::{DateTime, Utc};
use shared_types::PhotoExif;
use shared_types::codes::from_code;
use species_key::{Taxon, TaxonRank};

use super::judge::*;

/// A stored record as scoring sees it; `None` when its stored codes do not read.
pub fn from_raw(raw: &crate::store::duplicates::RawDup, names: &crate::taxa::TaxonIndex) -> Option<DupRecord> {
    let at = DateTime::parse_from_rfc3339(&raw.at_utc).ok()?.with_timezone(&Utc);
    let length = match &raw.length {
        Some((kind, cm, method)) => Some((from_code(kind)?, *cm, method == "estimated")),
        None => None,
    };
    Some(DupRecord {
        observation_id: raw.observation_id,
        sightings: sightings(raw, at),
        setting: from_code(&raw.setting)?,
        condition: from_code(&raw.condition)?,
        species: raw.taxon_name.as_deref().map_or(Species::Unnamed, |name| species_named(name, names)),
        length,
        photo_hashes: raw.photos.iter().map(|p| p.sha256.clone()).collect(),
        original_hashes: raw.photos.iter().filter_map(|p| p.original_sha256.clone()).collect(),
        photo_phashes: raw.photos.iter().filter_map(|p| p.phash.clone()).collect(),
    })
}

const RANKS: [TaxonRank; 5] =
    [TaxonRank::Species, TaxonRank::Genus, TaxonRank::Family, TaxonRank::Order, TaxonRank::Superorder];

/// A checklist species (by scientific or common name), a higher taxon the checklist
/// names (genus to superorder), or a name it does not know.
pub fn species_named(name: &str, names: &crate::taxa::TaxonIndex) -> Species {
    let lineage_from = |taxon: &Taxon, rank: TaxonRank| {
        let mut unique: Vec<String> = Vec::new();
        for name in RANKS.iter().skip_while(|r| **r != rank).map(|r| taxon.name_at(*r).to_owned()) {
            if !unique.contains(&name) {
                unique.push(name);
            }
        }
        unique
    };
    if let Some(taxon) = names.resolve(name) {
        return Species::Named {
            lineage: lineage_from(taxon, TaxonRank::Species),
            taxon: Some(Arc::new(taxon.clone())),
        };
    }
    let higher = names
        .filter(name)
        .and_then(|f| names.checklist().taxa().iter().find(|t| t.name_at(f.rank) == f.name).map(|t| (t, f.rank)));
    match higher {
        Some((taxon, rank)) => Species::Named { lineage: lineage_from(taxon, rank), taxon: None },
        None => Species::NotOnChecklist(name.trim().to_owned()),
    }
}

/// A photo's EXIF time and place as the chosen reading gives them.
struct PhotoSays {
    at: Option<DateTime<Utc>>,
    position: Option<(f64, f64)>,
    error_m: Option<f64>,
    reading: &'static str,
}

fn valid_position(lat: Option<f64>, lon: Option<f64>) -> Option<(f64, f64)> {
    lat.zip(lon).filter(|(lat, lon)| {
        lat.is_finite() && lon.is_finite() && (-90.0..=90.0).contains(lat) && (-180.0..=180.0).contains(lon)
    })
}

/// What the photo's EXIF says, field by field from the reading intake compared with the
/// record (`time_reading`, `place_reading`): the server's of the file it received, or
/// the phone's of the original.
fn photo_says(photo: &crate::store::duplicates::RawPhoto) -> Option<PhotoSays> {
    let phone: Option<PhotoExif> = photo.phone_exif_json.as_deref().and_then(|json| serde_json::from_str(json).ok());
    let time_from = photo.time_reading.as_deref();
    let place_from = photo.place_reading.as_deref();
    let at = match time_from {
        Some("phone") => phone.as_ref().and_then(|exif| exif.taken_at).map(|t| t.with_timezone(&Utc)),
        Some("received_file") => photo
            .file_taken_at
            .as_deref()
            .and_then(|t| DateTime::parse_from_rfc3339(t).ok())
            .map(|t| t.with_timezone(&Utc)),
        _ => None,
    };
    let (position, error_m) = match place_from {
        Some("phone") => phone
            .as_ref()
            .map_or((None, None), |exif| (valid_position(exif.latitude, exif.longitude), exif.horizontal_error_m)),
        Some("received_file") => {
            (valid_position(photo.file_position.map(|p| p.0), photo.file_position.map(|p| p.1)), photo.file_error_m)
        }
        _ => (None, None),
    };
    let reading =
        match (at.is_some().then_some(time_from).flatten(), position.is_some().then_some(place_from).flatten()) {
            (Some("phone"), Some("received_file")) => {
                "the phone's reading of the original for the time, the EXIF of the file received for the place"
            }
            (Some("received_file"), Some("phone")) => {
                "the EXIF of the file received for the time, the phone's reading of the original for the place"
            }
            (Some("phone"), _) | (None, Some("phone")) => "the phone's reading of the original",
            (Some(_), _) | (None, Some(_)) => "the EXIF of the file received",
            (None, None) => return None,
        };
    Some(PhotoSays { at, position, error_m: error_m.filter(|e| e.is_finite() && *e >= 0.0), reading })
}

/// The record's own time and place, and a photo's when the record has no position or
/// the photo is flagged as taken long before or far from it (the first such photo with
/// a reading). The photo's time and place are used where it has them, the record's
/// otherwise.
pub fn sightings(raw: &crate::store::duplicates::RawDup, at: DateTime<Utc>) -> Vec<Sighting> {
    let own = Sighting::own(at, raw.position, raw.accuracy_m);
    let from_photo = raw.photos.iter().find_map(|photo| {
        let long_before = photo.flags.iter().any(|f| f == "taken_long_before_record");
        let far = photo.flags.iter().any(|f| f == "taken_far_from_record");
        let no_place = raw.position.is_none();
        if !(no_place || long_before || far) {
            return None;
        }
        let says = photo_says(photo)?;
        let position = says.position.or(raw.position)?;
        let what = match (says.at.is_some(), says.position.is_some()) {
            (true, true) => "time and place",
            (false, true) => "place",
            (true, false) => "time",
            (false, false) => return None,
        };
        let why = match (no_place, long_before, far) {
            (true, false, _) => "the record has no position".to_owned(),
            (_, true, true) => {
                format!("photo {} was flagged as taken long before and far from the record", photo.number)
            }
            (_, true, false) => format!("photo {} was flagged as taken long before the record", photo.number),
            (false, false, _) => format!("photo {} was flagged as taken far from the record's place", photo.number),
        };
        let error =
            says.error_m.filter(|_| says.position.is_some()).map(|e| format!(", ±{e:.0} m")).unwrap_or_default();
        Some(Sighting {
            at: says.at.unwrap_or(at),
            position: Some(position),
            uncertainty_m: if says.position.is_some() { says.error_m } else { raw.accuracy_m },
            from_photo: Some(format!(
                "for one report the {what} of photo {}'s EXIF ({}{error}) was used, because {why}",
                photo.number, says.reading
            )),
        })
    });
    std::iter::once(own).chain(from_photo).collect()
}
