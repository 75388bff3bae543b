//! Judging one pair of records: the windows, weights and tolerances, and the verdict
//! with its reasons in words. Plain data in, plain data out.

use std::sync::Arc;

use chrono::{DateTime, Utc};
use geo::{Distance, Geodesic, Point};
use serde::Serialize;
use shared_types::{Condition, LengthKind, Setting};
use species_key::Taxon;
use species_key::length::ConversionMethod;

use super::photos::{NEAR_DUPLICATE_BITS, hash_distance};

/// How far tides and scavengers may move a carcass between two reports (beach
/// strandings and animals floating at sea), metres (common practice).
pub const DRIFT_CARCASS_M: f64 = 2_000.0;
/// How far apart two reports of one landed fish may be, metres: a quay or a beach
/// mark (common practice).
pub const DRIFT_LANDED_M: f64 = 200.0;
/// How long a carcass lies where people may find it again, hours (common practice).
pub const WINDOW_CARCASS_H: f64 = 7.0 * 24.0;
/// How long a landed fish stays where people may see it again, hours (common practice).
pub const WINDOW_LANDED_H: f64 = 12.0;
/// A pair scoring this much or more is offered to reviewers as a candidate.
pub const CANDIDATE_SCORE: f64 = 0.5;
/// Added when two of the pair's photos look alike (never against a contradiction).
pub const PHOTOS_ALIKE_BONUS: f64 = 0.2;
/// The score's weight on place (1 − distance / allowed).
pub const WEIGHT_PLACE: f64 = 0.35;
/// The score's weight on time (1 − gap / window).
pub const WEIGHT_TIME: f64 = 0.35;
/// The score's weight on species ([`SPECIES_SAME`], [`SPECIES_CONTAINS`] or [`NO_EVIDENCE`]).
pub const WEIGHT_SPECIES: f64 = 0.15;
/// The score's weight on length (1 − difference / tolerance, or [`NO_EVIDENCE`]).
pub const WEIGHT_LENGTH: f64 = 0.15;
/// Species score when both name the same taxon.
pub const SPECIES_SAME: f64 = 1.0;
/// Species score when one taxon contains the other (a genus and one of its species).
pub const SPECIES_CONTAINS: f64 = 0.7;
/// Species or length score when the pair says nothing either way (a name not on the
/// checklist, no length, lengths that cannot be converted to one measure).
pub const NO_EVIDENCE: f64 = 0.5;
/// Uncertainty assumed for a position given without one (common practice for phone fixes).
pub const UNKNOWN_UNCERTAINTY_M: f64 = 100.0;
/// A position known only to worse than this says which town, not which beach: such fixes
/// come from cell towers or network addresses, not satellites (common practice). It is
/// not used to match by place (nor indexed); the record still matches by photo.
pub const MAX_USEFUL_UNCERTAINTY_M: f64 = 10_000.0;
/// Extra length tolerance when two lengths of different kinds were converted to one
/// measure: the conversion's own error (common practice).
pub const CONVERSION_ALLOWANCE: f64 = 0.05;

/// Length tolerance per kind, as a fraction of the larger length: (taped, estimated).
/// The ends of a fork length and a precaudal length are fixed points of the body, so two
/// tapes agree closely; a carcass's tail tip is often broken or bent, so total lengths
/// differ more; a ray's disc curls as it dries, so disc widths differ most. By eye people
/// are off by a quarter to a third (all common practice, no single source).
pub const LENGTH_TOLERANCES: [(LengthKind, f64, f64); 5] = [
    (LengthKind::Total, 0.15, 0.30),
    (LengthKind::Fork, 0.10, 0.30),
    (LengthKind::Precaudal, 0.10, 0.30),
    (LengthKind::DiscWidth, 0.20, 0.35),
    (LengthKind::DiscLength, 0.15, 0.30),
];

pub(super) const EARTH_RADIUS_M: f64 = 6_371_008.8;
/// Geodesic (WGS84) and great-circle distances differ by under 0.6% (common practice);
/// search boxes are this much wider so the sphere never misses an ellipsoid pair.
pub(super) const SPHERE_MARGIN: f64 = 0.01;

/// The tolerance for a length of `kind`, taped or estimated.
pub fn length_tolerance(kind: LengthKind, estimated: bool) -> f64 {
    let (_, taped, by_eye) =
        LENGTH_TOLERANCES.iter().find(|(k, _, _)| *k == kind).copied().unwrap_or(LENGTH_TOLERANCES[0]);
    if estimated { by_eye } else { taped }
}

/// When and where a record puts the animal: its own time and place, or a photo's.
#[derive(Debug, Clone, PartialEq)]
pub struct Sighting {
    pub at: DateTime<Utc>,
    /// Latitude, longitude.
    pub position: Option<(f64, f64)>,
    pub uncertainty_m: Option<f64>,
    /// `None` for the record's own; otherwise which photo reading was used, and why.
    pub from_photo: Option<String>,
}

impl Sighting {
    /// The record's own time and place.
    pub fn own(at: DateTime<Utc>, position: Option<(f64, f64)>, uncertainty_m: Option<f64>) -> Self {
        Self { at, position, uncertainty_m, from_photo: None }
    }

    /// The place and its uncertainty, when they are good enough to compare.
    fn place(&self) -> Option<((f64, f64), f64)> {
        let u = effective_uncertainty(self.uncertainty_m);
        self.position.filter(|_| u <= MAX_USEFUL_UNCERTAINTY_M).map(|p| (p, u))
    }
}

/// What a record says the animal is.
#[derive(Debug, Clone, PartialEq)]
pub enum Species {
    Unnamed,
    /// A name the checklist does not know (free text such as "big ray"): treated as
    /// unnamed, and the reasons say so.
    NotOnChecklist(String),
    /// A checklist taxon with its higher taxa (most specific first), and the checklist
    /// entry when the name is a species (for its length conversions).
    Named {
        lineage: Vec<String>,
        taxon: Option<Arc<Taxon>>,
    },
}

impl Species {
    /// A named taxon with no checklist entry (tests and benchmarks).
    pub fn lineage(names: &[&str]) -> Self {
        Species::Named { lineage: names.iter().map(|n| (*n).to_owned()).collect(), taxon: None }
    }
}

/// What the scoring needs of one record.
#[derive(Debug, Clone, PartialEq)]
pub struct DupRecord {
    pub observation_id: i64,
    /// The record's own time and place first, then a photo's when it is used.
    pub sightings: Vec<Sighting>,
    pub setting: Setting,
    pub condition: Condition,
    pub species: Species,
    /// Kind, centimetres, estimated.
    pub length: Option<(LengthKind, f64, bool)>,
    /// SHA-256 of the photo files received.
    pub photo_hashes: Vec<String>,
    /// SHA-256 of the original files on the phone, as the phone sent them.
    pub original_hashes: Vec<String>,
    /// Perceptual hashes of its photos.
    pub photo_phashes: Vec<String>,
}

/// A likely pair, with why.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Candidate {
    pub score: f64,
    pub reasons: Vec<String>,
    pub distance_m: Option<f64>,
    pub gap_hours: f64,
}

/// What the judging of a pair found.
#[derive(Debug, Clone, PartialEq)]
pub enum Verdict {
    /// Likely the same animal: kept for reviewers.
    Candidate(Candidate),
    /// Possible, but the score is under [`CANDIDATE_SCORE`].
    BelowLine(Candidate),
    /// Cannot be the same animal, and why.
    RuledOut(String),
}

fn carcass(setting: Setting) -> bool {
    matches!(setting, Setting::BeachStranding | Setting::FloatingAtSea)
}

fn freshness(condition: Condition) -> u8 {
    match condition {
        Condition::Alive => 0,
        Condition::FreshDead => 1,
        Condition::Decomposed => 2,
        Condition::RemainsOnly => 3,
    }
}

pub(super) fn effective_uncertainty(u: Option<f64>) -> f64 {
    u.filter(|u| u.is_finite() && *u >= 0.0).unwrap_or(UNKNOWN_UNCERTAINTY_M)
}

pub fn geodesic_m(a: (f64, f64), b: (f64, f64)) -> f64 {
    Geodesic.distance(Point::new(a.1, a.0), Point::new(b.1, b.0))
}

fn hours_between(a: DateTime<Utc>, b: DateTime<Utc>) -> f64 {
    (b - a).num_seconds().abs() as f64 / 3600.0
}

/// A candidate when the pair is likely enough; `None` otherwise.
pub fn score(a: &DupRecord, b: &DupRecord) -> Option<Candidate> {
    match judge(a, b) {
        Verdict::Candidate(candidate) => Some(candidate),
        _ => None,
    }
}

/// Judges a pair: a shared photo decides alone; otherwise every pair of their sightings
/// is judged and the best verdict kept.
pub fn judge(a: &DupRecord, b: &DupRecord) -> Verdict {
    if let Some(reason) = shared_photo(a, b) {
        let (own_a, own_b) = (&a.sightings[0], &b.sightings[0]);
        let distance_m = own_a.position.zip(own_b.position).map(|(p, q)| geodesic_m(p, q));
        return Verdict::Candidate(Candidate {
            score: 1.0,
            reasons: vec![reason],
            distance_m,
            gap_hours: hours_between(own_a.at, own_b.at),
        });
    }
    let mut best: Option<Verdict> = None;
    for sa in &a.sightings {
        for sb in &b.sightings {
            let verdict = judge_sightings(a, sa, b, sb);
            best = Some(match best {
                None => verdict,
                Some(current) => better(current, verdict),
            });
        }
    }
    best.unwrap_or_else(|| Verdict::RuledOut("no time or place to compare".into()))
}

/// A candidate beats a pair under the line, which beats a ruled-out pair; among equals
/// the higher score (or the first reason) stays.
fn better(current: Verdict, other: Verdict) -> Verdict {
    let rank = |v: &Verdict| match v {
        Verdict::Candidate(c) => (2, c.score),
        Verdict::BelowLine(c) => (1, c.score),
        Verdict::RuledOut(_) => (0, 0.0),
    };
    let (r1, s1) = rank(&current);
    let (r2, s2) = rank(&other);
    if r2 > r1 || (r2 == r1 && s2 > s1) { other } else { current }
}

fn shared_photo(a: &DupRecord, b: &DupRecord) -> Option<String> {
    let short = |hash: &str| hash[..12.min(hash.len())].to_owned();
    if let Some(hash) = a.photo_hashes.iter().find(|h| b.photo_hashes.contains(h)) {
        return Some(format!("the same photo file (SHA-256 {}…)", short(hash)));
    }
    a.original_hashes.iter().find(|h| b.original_hashes.contains(h)).map(|hash| {
        format!("the same original photo, picked on both phones (SHA-256 of the original {}…)", short(hash))
    })
}

fn judge_sightings(a: &DupRecord, sa: &Sighting, b: &DupRecord, sb: &Sighting) -> Verdict {
    let is_carcass = carcass(a.setting) || carcass(b.setting);
    let gap_hours = hours_between(sa.at, sb.at);
    // Time first: it is the cheapest way to rule a pair out.
    let (window, what) = if is_carcass { (WINDOW_CARCASS_H, "a carcass") } else { (WINDOW_LANDED_H, "a landed fish") };
    if gap_hours > window {
        return Verdict::RuledOut(format!("{gap_hours:.1} h apart, beyond the {window:.0} h window for {what}"));
    }
    let (Some((p, up)), Some((q, uq))) = (sa.place(), sb.place()) else {
        return Verdict::RuledOut(
            "no position good enough to compare (missing, or uncertain by more than 10 km)".into(),
        );
    };
    let distance = geodesic_m(p, q);
    let drift = if is_carcass { DRIFT_CARCASS_M } else { DRIFT_LANDED_M };
    let allowed = up.hypot(uq) + drift;
    if distance > allowed {
        return Verdict::RuledOut(format!(
            "{distance:.0} m apart, beyond the {allowed:.0} m allowed (±{up:.0} m and ±{uq:.0} m in quadrature plus {drift:.0} m drift)"
        ));
    }
    let mut reasons =
        vec![format!("{distance:.0} m apart, within the {allowed:.0} m the uncertainties and drift allow")];
    let ((earlier, _), (later, _)) = if sa.at <= sb.at { ((a, sa), (b, sb)) } else { ((b, sb), (a, sa)) };
    if freshness(later.condition) < freshness(earlier.condition) {
        return Verdict::RuledOut(format!(
            "condition {} then {}: it does not get fresher",
            earlier.condition.label(),
            later.condition.label()
        ));
    }
    reasons.push(format!(
        "{gap_hours:.1} h apart, within {window:.0} h; condition {} then {}",
        earlier.condition.label(),
        later.condition.label()
    ));
    let (species, species_reasons, taxon) = match compare_species(&a.species, &b.species) {
        Ok(found) => found,
        Err(why) => return Verdict::RuledOut(why),
    };
    reasons.extend(species_reasons);
    let length = match compare_lengths(a.length, b.length, taxon) {
        Ok((score, reason)) => {
            reasons.extend(reason);
            score
        }
        Err(why) => return Verdict::RuledOut(why),
    };
    reasons.extend([sa, sb].iter().filter_map(|s| s.from_photo.clone()));
    let mut total = WEIGHT_PLACE * (1.0 - distance / allowed)
        + WEIGHT_TIME * (1.0 - gap_hours / window)
        + WEIGHT_SPECIES * species
        + WEIGHT_LENGTH * length;
    if let Some(bits) = nearest_photos(a, b).filter(|bits| *bits <= NEAR_DUPLICATE_BITS) {
        total += PHOTOS_ALIKE_BONUS;
        reasons.push(format!("two of their photos look alike (perceptual hashes {bits} bits apart)"));
    }
    let score = (total * 1000.0).round() / 1000.0;
    let candidate = Candidate { score, reasons, distance_m: Some(distance), gap_hours };
    if total >= CANDIDATE_SCORE {
        Verdict::Candidate(candidate)
    } else {
        let mut candidate = candidate;
        candidate.reasons.push(format!("score {score:.3} is under the {CANDIDATE_SCORE} line"));
        Verdict::BelowLine(candidate)
    }
}

fn nearest_photos(a: &DupRecord, b: &DupRecord) -> Option<u32> {
    a.photo_phashes.iter().flat_map(|x| b.photo_phashes.iter().filter_map(move |y| hash_distance(x, y))).min()
}

fn unnamed_reason(species: &Species) -> Option<String> {
    match species {
        Species::Unnamed => Some("one of them is not named".into()),
        Species::NotOnChecklist(name) => {
            Some(format!("“{name}” is not a checklist name, so it neither supports nor rules out the same species"))
        }
        Species::Named { .. } => None,
    }
}

type SpeciesMatch<'a> = (f64, Vec<String>, Option<&'a Taxon>);

/// The species score, its reasons, and the checklist species whose length equations
/// apply (the more specific of the two); `Err` with why when they contradict.
fn compare_species<'a>(a: &'a Species, b: &'a Species) -> Result<SpeciesMatch<'a>, String> {
    match (a, b) {
        (Species::Named { lineage: x, taxon: tx }, Species::Named { lineage: y, taxon: ty }) => {
            if x[0] == y[0] {
                Ok((SPECIES_SAME, vec![format!("the same taxon, {}", x[0])], tx.as_deref().or(ty.as_deref())))
            } else if x.contains(&y[0]) {
                Ok((SPECIES_CONTAINS, vec![format!("{} and {}: one contains the other", y[0], x[0])], ty.as_deref()))
            } else if y.contains(&x[0]) {
                Ok((SPECIES_CONTAINS, vec![format!("{} and {}: one contains the other", x[0], y[0])], tx.as_deref()))
            } else {
                Err(format!("{} and {} are different taxa", x[0], y[0]))
            }
        }
        (Species::Named { taxon, .. }, other) | (other, Species::Named { taxon, .. }) => {
            Ok((NO_EVIDENCE, unnamed_reason(other).into_iter().collect(), taxon.as_deref()))
        }
        (x, y) => {
            let mut reasons: Vec<String> = [x, y].iter().filter_map(|s| unnamed_reason(s)).collect();
            if matches!((x, y), (Species::Unnamed, Species::Unnamed)) {
                reasons = vec!["neither of them is named".into()];
            }
            reasons.dedup();
            Ok((NO_EVIDENCE, reasons, None))
        }
    }
}

type Length = (LengthKind, f64, bool);

/// The length score and its reason; `Err` with why when they are too far apart.
fn compare_lengths(
    a: Option<Length>,
    b: Option<Length>,
    taxon: Option<&Taxon>,
) -> Result<(f64, Option<String>), String> {
    let (Some((ka, la, ea)), Some((kb, lb, eb))) = (a, b) else { return Ok((NO_EVIDENCE, None)) };
    let estimated = ea || eb;
    let how = if estimated { "estimated" } else { "taped" };
    if ka == kb {
        let tolerance = length_tolerance(ka, estimated);
        let difference = (la - lb).abs() / la.max(lb);
        let said = format!("{la:.0} and {lb:.0} cm {}, {:.0}% apart", ka.label(), difference * 100.0);
        if difference > tolerance {
            return Err(format!("{said}, beyond the {:.0}% allowed for {how} {}s", tolerance * 100.0, ka.label()));
        }
        return Ok((
            1.0 - difference / tolerance,
            Some(format!("{said} (within the {:.0}% allowed for {how} {}s)", tolerance * 100.0, ka.label())),
        ));
    }
    let Some(taxon) = taxon else {
        return Ok((
            NO_EVIDENCE,
            Some(format!("a {} and a {} are not comparable without a known species", ka.label(), kb.label())),
        ));
    };
    let convert = |kind: LengthKind, cm: f64, estimated: bool| {
        species_key::length::comparable_length(
            &species_key::Measurement { kind: kind.key_kind(), cm, estimated },
            taxon,
        )
    };
    let (Some(ca), Some(cb)) = (convert(ka, la, ea), convert(kb, lb, eb)) else {
        return Ok((
            NO_EVIDENCE,
            Some(format!(
                "a {} and a {} cannot be converted to one measure for {}",
                ka.label(),
                kb.label(),
                taxon.scientific_name
            )),
        ));
    };
    let tolerance = length_tolerance(ka, estimated).max(length_tolerance(kb, estimated)) + CONVERSION_ALLOWANCE;
    let difference = (ca.cm - cb.cm).abs() / ca.cm.max(cb.cm);
    let methods: Vec<String> = [&ca.method, &cb.method].into_iter().filter_map(method_words).collect();
    let said = format!(
        "{la:.0} cm {} and {lb:.0} cm {} are {:.0} and {:.0} cm {} for {} ({}), {:.0}% apart",
        ka.label(),
        kb.label(),
        ca.cm,
        cb.cm,
        taxon.max_length.measure.words(),
        taxon.scientific_name,
        methods.join("; "),
        difference * 100.0
    );
    if difference > tolerance {
        return Err(format!("{said}, beyond the {:.0}% allowed for {how} lengths of two kinds", tolerance * 100.0));
    }
    Ok((
        1.0 - difference / tolerance,
        Some(format!("{said} (within the {:.0}% allowed for {how} lengths of two kinds)", tolerance * 100.0)),
    ))
}

fn method_words(method: &ConversionMethod) -> Option<String> {
    match method {
        ConversionMethod::AsMeasured => None,
        ConversionMethod::SpeciesEquation { equation, .. } => Some(format!("the checklist's {equation}")),
        ConversionMethod::CommonPractice { equation } => Some(format!("the generic {equation}, common practice")),
    }
}

/// Candidates for `new` among `others` (already narrowed by the index), best first.
pub fn candidates<'a>(new: &DupRecord, others: impl IntoIterator<Item = &'a DupRecord>) -> Vec<(i64, Candidate)> {
    let mut found: Vec<(i64, Candidate)> = others
        .into_iter()
        .filter(|o| o.observation_id != new.observation_id)
        .filter_map(|o| score(new, o).map(|c| (o.observation_id, c)))
        .collect();
    found.sort_by(|a, b| b.1.score.total_cmp(&a.1.score));
    found
}
