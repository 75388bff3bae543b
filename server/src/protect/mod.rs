//! What leaves the server for whom: the published form of a record's place, decided in
//! one function, [`published_place`], which every output that reaches people who are not
//! reviewers calls — exports, range and trend figures, maps, charts and the guided key's
//! nearby counts — and whose answer every filter and figure then works on.
//!
//! The public gets a record's place as recorded only when **both** hold:
//! - a reviewer has confirmed the record, and
//! - its current identification resolves ([`crate::taxa`]) to a checklist taxon that is
//!   not sensitive (a genus, family or higher taxon is as sensitive as its strictest species).
//!
//! Everything else fails closed. A confirmed record of a sensitive taxon is generalised
//! as its checklist category says (Chapman 2020: rounded to 0.1°, 0.01° or 0.001°, or
//! withheld). A name that does not resolve, or no name, may be any species on the
//! checklist, and so may a name nobody has confirmed: such a record is generalised as
//! the strictest species on the checklist would be, and never finer than
//! [`UNCERTAIN_FLOOR`]. A generalised record carries no photos and no free text
//! ([`generalise::PublicPlace::hide_media_and_remarks`]). Reviewers and admins
//! ([`Audience::Full`]) see places as recorded.
//!
//! Records found on one survey walk are published together: every find on a walk is
//! generalised at least as far as the walk's most sensitive find, so that exact
//! positions of its other finds cannot narrow down where the sensitive one was along
//! the walk ([`Publisher`]).

pub mod generalise;

use std::collections::HashMap;

use shared_types::ReviewState;
use species_key::Sensitivity;

use crate::store::StoreError;
use crate::store::occurrences::{WalkFind, for_each_find_on_walks};
use crate::taxa::{Resolution, TaxonIndex, stricter};
use generalise::{PublicPlace, as_recorded, public_place};

/// Who an output is for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Audience {
    /// Anyone: places as [`published_place`] decides.
    Public,
    /// Signed-in reviewers and admins, and the operator's `--full` exports: as recorded.
    Full,
}

/// The least generalisation a public record gets when it may be of any species (its name
/// does not resolve) or is not yet confirmed: the coarsest of Chapman 2020's grids, 0.1°.
pub const UNCERTAIN_FLOOR: Sensitivity = Sensitivity::TenthDegree;

/// Why a record is generalised, in words for `dataGeneralizations`.
const SENSITIVE: &str = "a sensitive species";
const NOT_RESOLVED: &str = "a name not resolved to a checklist taxon";
const NOT_CONFIRMED: &str = "a record not yet confirmed by a reviewer";
const ON_A_WALK: &str = "a record made on a survey walk with a sensitive, unresolved or unconfirmed find";

/// How far a record must be generalised for the public, with the reasons in words: a
/// confirmed record of a resolved taxon as that taxon's category says; anything else as
/// the strictest species on the checklist would be, and never finer than
/// [`UNCERTAIN_FLOOR`]. Walks are generalised as far as their most sensitive find.
pub fn public_sensitivity(
    state: ReviewState,
    resolution: Option<&Resolution>,
    names: &TaxonIndex,
) -> (Sensitivity, Vec<&'static str>) {
    let uncertain = stricter(UNCERTAIN_FLOOR, names.strictest_sensitivity());
    let resolved = resolution.and_then(Resolution::taxon);
    let mut reasons = Vec::new();
    match resolved {
        None => reasons.push(NOT_RESOLVED),
        Some(taxon) if taxon.sensitivity != Sensitivity::None => reasons.push(SENSITIVE),
        Some(_) => {}
    }
    if state != ReviewState::Confirmed {
        reasons.push(NOT_CONFIRMED);
    }
    let sensitivity = match resolved {
        Some(taxon) if state == ReviewState::Confirmed => taxon.sensitivity,
        _ => uncertain,
    };
    (sensitivity, reasons)
}

/// The one decision: where a record may be shown to `audience`, given its review state,
/// how its current identification resolved (`None`: it has none), and the least its
/// survey walk asks for (`walk`: [`Sensitivity::None`] off a walk).
pub fn published_place(
    audience: Audience,
    record: (ReviewState, Option<&Resolution>),
    walk: Sensitivity,
    names: &TaxonIndex,
    position: Option<(f64, f64)>,
    uncertainty_m: Option<f64>,
) -> PublicPlace {
    if audience == Audience::Full {
        return as_recorded(position, uncertainty_m);
    }
    let (own, mut reasons) = public_sensitivity(record.0, record.1, names);
    let sensitivity = stricter(own, walk);
    if sensitivity != own {
        reasons.push(ON_A_WALK);
    }
    public_place(position, uncertainty_m, sensitivity, &reasons.join(" and "))
}

/// Places for one audience, with what each survey walk asks of its finds: the
/// [`published_place`] every output calls, loaded once per export or figure.
#[derive(Debug, Clone)]
pub struct Publisher<'a> {
    audience: Audience,
    names: &'a TaxonIndex,
    /// By walk client id: the public sensitivity of the walk's most sensitive find.
    walks: HashMap<String, Sensitivity>,
}

impl<'a> Publisher<'a> {
    /// Reads what was found on every walk (for the public only; reviewers see places as recorded).
    pub fn load(conn: &rusqlite::Connection, names: &'a TaxonIndex, audience: Audience) -> Result<Self, StoreError> {
        if audience == Audience::Full {
            return Ok(Self { audience, names, walks: HashMap::new() });
        }
        Self::load_noting(conn, names, audience, &mut |_| {})
    }

    /// As [`Publisher::load`], reading every find on a walk whatever the audience and
    /// handing each to `note` too (an archive's absences need them): one pass for both.
    pub fn load_noting(
        conn: &rusqlite::Connection,
        names: &'a TaxonIndex,
        audience: Audience,
        note: &mut dyn FnMut(&WalkFind),
    ) -> Result<Self, StoreError> {
        let mut walks: HashMap<String, Sensitivity> = HashMap::new();
        for_each_find_on_walks(conn, |find: &WalkFind| {
            note(find);
            if audience == Audience::Public {
                let resolution = find.taxon_name.as_deref().map(|n| names.resolution(n));
                let (sensitivity, _) = public_sensitivity(find.state, resolution.as_ref(), names);
                let walk = walks.entry(find.walk_client_id.clone()).or_insert(Sensitivity::None);
                *walk = stricter(*walk, sensitivity);
            }
        })?;
        Ok(Self { audience, names, walks })
    }

    pub fn audience(&self) -> Audience {
        self.audience
    }

    pub fn names(&self) -> &'a TaxonIndex {
        self.names
    }

    /// How far the finds of a walk are generalised for the public: as its most sensitive find.
    pub fn walk_sensitivity(&self, walk_client_id: &str) -> Sensitivity {
        self.walks.get(walk_client_id).copied().unwrap_or(Sensitivity::None)
    }

    /// Where a record may be shown: [`published_place`] with its walk's demand.
    pub fn place(
        &self,
        state: ReviewState,
        resolution: Option<&Resolution>,
        walk_client_id: Option<&str>,
        position: Option<(f64, f64)>,
        uncertainty_m: Option<f64>,
    ) -> PublicPlace {
        let walk = walk_client_id.map_or(Sensitivity::None, |w| self.walk_sensitivity(w));
        published_place(self.audience, (state, resolution), walk, self.names, position, uncertainty_m)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const RECORDED: Option<(f64, f64)> = Some((52.123456, -4.654321));

    fn place(state: ReviewState, name: Option<&str>, names: &TaxonIndex) -> PublicPlace {
        let resolution = name.map(|n| names.resolution(n));
        published_place(Audience::Public, (state, resolution.as_ref()), Sensitivity::None, names, RECORDED, Some(8.0))
    }

    #[test]
    fn only_a_confirmed_record_of_a_taxon_that_is_not_sensitive_keeps_its_place() {
        let names = TaxonIndex::load(None).unwrap();
        use ReviewState::{AwaitingReview, Confirmed, DetailsRequested, NotConfirmable};
        assert_eq!(place(Confirmed, Some("Raja clavata"), &names), as_recorded(RECORDED, Some(8.0)));
        assert_eq!(place(Confirmed, Some("thornback-ray"), &names), as_recorded(RECORDED, Some(8.0)));
        // Chapman 2020 (GBIF): 0.1° rounding for everything else in the demo checklist.
        let cases = [
            (Confirmed, Some("Squatina squatina"), "a sensitive species"),
            (Confirmed, Some("angel shark?"), "a sensitive species"),
            (Confirmed, Some("Rajidae"), "a sensitive species"),
            (Confirmed, Some("some kind of skate"), "a name not resolved to a checklist taxon"),
            (Confirmed, None, "a name not resolved"),
            (AwaitingReview, Some("Raja clavata"), "a record not yet confirmed by a reviewer"),
            (DetailsRequested, Some("Raja clavata"), "not yet confirmed"),
            (NotConfirmable, Some("Raja clavata"), "not yet confirmed"),
            (AwaitingReview, Some("Squatina squatina"), "a sensitive species and a record not yet confirmed"),
        ];
        for (state, name, why) in cases {
            let public = place(state, name, &names);
            assert_eq!(public.position, Some((52.1, -4.7)), "{state:?} {name:?}");
            assert!(public.hide_media_and_remarks, "{state:?} {name:?}: no free text");
            let said = public.generalizations.unwrap();
            assert!(said.contains(why) && said.contains("0.1 degree"), "{state:?} {name:?}: {said}");
        }
    }

    #[test]
    fn a_name_that_does_not_resolve_is_as_strict_as_the_strictest_species_on_the_checklist() {
        let mut checklist: serde_json::Value = serde_json::from_str(crate::taxa::DEMO_CHECKLIST).unwrap();
        let taxa = checklist["taxa"].as_array_mut().unwrap();
        let white_skate = taxa.iter_mut().find(|t| t["scientificName"] == "Rostroraja alba").unwrap();
        white_skate["sensitivity"] = serde_json::json!("withhold");
        let names = TaxonIndex::new(species_key::Checklist::from_json(&checklist.to_string()).unwrap());
        for name in [Some("a pale skate"), None, Some("Rostroraja alba"), Some("Rajidae")] {
            let public = place(ReviewState::Confirmed, name, &names);
            assert_eq!((public.position, public.uncertainty_m), (None, None), "{name:?}: withheld");
        }
        let unconfirmed = place(ReviewState::AwaitingReview, Some("Raja clavata"), &names);
        assert_eq!(unconfirmed.position, None, "an unconfirmed name may be the withheld species");
        assert_eq!(place(ReviewState::Confirmed, Some("Raja clavata"), &names), as_recorded(RECORDED, Some(8.0)));
    }

    #[test]
    fn a_find_on_a_walk_is_generalised_as_far_as_the_walks_most_sensitive_find() {
        let names = TaxonIndex::load(None).unwrap();
        let resolution = names.resolution("Raja clavata");
        let on_walk = published_place(
            Audience::Public,
            (ReviewState::Confirmed, Some(&resolution)),
            Sensitivity::TenthDegree,
            &names,
            RECORDED,
            Some(8.0),
        );
        assert_eq!(on_walk.position, Some((52.1, -4.7)));
        assert!(on_walk.generalizations.unwrap().contains("survey walk"));
    }

    #[test]
    fn reviewers_see_every_place_as_recorded() {
        let names = TaxonIndex::load(None).unwrap();
        let resolution = names.resolution("angelshark");
        let full = published_place(
            Audience::Full,
            (ReviewState::AwaitingReview, Some(&resolution)),
            Sensitivity::Withhold,
            &names,
            RECORDED,
            None,
        );
        assert_eq!(full, as_recorded(RECORDED, None));
    }
}
