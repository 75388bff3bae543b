//! Finding the same animal reported twice: plain data in, plain data out.
//!
//! A pair of records is judged on four things, each with a documented window, and
//! ruled out on a hard contradiction:
//!
//! - **place**: geodesic distance against the allowed gap, the two positions'
//!   uncertainties added in quadrature plus a drift allowance — [`DRIFT_CARCASS_M`] for
//!   beach strandings and animals floating at sea (tides move a carcass), [`DRIFT_LANDED_M`]
//!   for landed fish. A position known only to worse than [`MAX_USEFUL_UNCERTAINTY_M`] is
//!   not used for place at all;
//! - **time**: the gap against [`WINDOW_CARCASS_H`] (a carcass lies for days) or
//!   [`WINDOW_LANDED_H`] (a landed fish for hours); and condition never gets fresher: the
//!   later report may not be in a better condition than the earlier (alive < fresh dead <
//!   decomposed < remains only);
//! - **species**: the same taxon, or one a higher rank of the other (by the checklist);
//!   two different taxa contradict. An unnamed record, or one whose name is not on the
//!   checklist (free text such as "big ray"), neither supports nor contradicts;
//! - **length**: within the tolerance of its kind ([`length_tolerance`]; taped or
//!   estimated). Lengths of different kinds are converted to the species' own measure
//!   with the checklist's equation (or the key's generic ratio) when the species is
//!   known, with [`CONVERSION_ALLOWANCE`] more slack; otherwise they are not comparable.
//!
//! When a record has no position, or one of its photos is flagged as taken long before
//! or far from the record, the photo's own EXIF time and place (the chosen reading: the
//! server's of the received file, else the phone's of the original; GPSHPositioningError
//! as its uncertainty) are tried as well, and the better of the two is kept with a
//! reason saying which was used.
//!
//! The same photo file (SHA-256), or the same original photo on the phone (the SHA-256
//! the phone sends of the file it picked), in both is decisive on its own: a candidate
//! whatever else, with score 1. Otherwise
//!
//! score = [`WEIGHT_PLACE`] × place + [`WEIGHT_TIME`] × time + [`WEIGHT_SPECIES`] × species
//!         + [`WEIGHT_LENGTH`] × length (+ [`PHOTOS_ALIKE_BONUS`])
//!
//! where place = 1 − distance / allowed, time = 1 − gap / window, species is
//! [`SPECIES_SAME`], [`SPECIES_CONTAINS`] or [`NO_EVIDENCE`] (unnamed or not on the
//! checklist), length is 1 − difference / tolerance or [`NO_EVIDENCE`] when it cannot be
//! compared, and the bonus is added when two of their photos look alike (perceptual
//! hashes within [`photos::NEAR_DUPLICATE_BITS`]). A pair is a candidate at [`CANDIDATE_SCORE`]
//! or more. Photos that look alike never override a contradiction: the hash sees
//! layout, not species. Every verdict keeps its reasons in words. Thresholds are
//! wrackline's own (common practice for plausibility windows), checked by the pair
//! table in the tests.
//!
//! Candidates are found through an R-tree ([`Index`], in `index.rs`) over place and time: unit-sphere
//! points (so distances follow the globe, with no seam at the antimeridian) plus the day.
//! Each stored place is a box as wide as its own reach (its uncertainty plus half the
//! carcass drift), so a record with a large uncertainty widens only its own box, never
//! every search.

mod index;
mod judge;
pub mod later;
pub mod photos;
mod records;
pub mod search;

pub use index::{Index, IndexedPoint, index_points, raw_index_points};
pub use judge::*;
pub use records::{from_raw, sightings, species_named};

#[cfg(test)]
mod tests;
