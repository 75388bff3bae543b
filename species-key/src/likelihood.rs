//! The probability model behind the key, in one place so its numbers can be read,
//! documented and tested together: how likely an observer's answer is given a species,
//! how a measured size bears on a species, and how where the record is weighs the prior.

use crate::checklist::Taxon;

/// A species' allowed states for one character, one bit per state in the character's order.
pub type StateSet = u64;

/// How often an observer is assumed to pick a wrong state (5%). A contradicted answer
/// therefore lowers a species — by a factor of about 0.05 / 0.95 divided among the
/// other states — but never removes it, so one mistake cannot lose the right answer.
pub const ANSWER_ERROR_RATE: f64 = 0.05;

/// Prior weight of a species not known from the record's area, against 1 for one that is.
/// Kept well above zero because strandings and vagrants turn up outside known ranges.
pub const OUT_OF_AREA_WEIGHT: f64 = 0.1;

/// Pseudo-count added to each species' nearby confirmed records, so a species never
/// recorded nearby keeps some prior weight.
pub const NEARBY_PSEUDO_COUNT: f64 = 1.0;

/// How far past its maximum a taped length may go before it counts strongly against a
/// species, as a fraction of the maximum: at 10% over the weight is e⁻¹, at 20% over e⁻⁴.
pub const SIZE_SLACK_MEASURED: f64 = 0.10;

/// The same slack for a length estimated by eye, which is often 25% out.
pub const SIZE_SLACK_ESTIMATED: f64 = 0.25;

/// The smallest weight a size can give, so a far-oversized species is pushed to the
/// bottom of the list but a mis-typed length cannot empty it.
pub const SIZE_FLOOR: f64 = 1e-6;

/// Probability that an observer answers `answer` for an animal of a species that can
/// show the states in `allowed`, out of `state_count` states.
///
/// The animal shows one of its allowed states, each equally likely; the observer reports
/// it with probability 1 − [`ANSWER_ERROR_RATE`] and otherwise picks one of the other
/// states at random. When every state is allowed the answer says nothing.
pub fn answer_likelihood(allowed: StateSet, state_count: usize, answer: usize) -> f64 {
    let allowed_count = f64::from(allowed.count_ones());
    let other_count = state_count as f64 - allowed_count;
    if other_count <= 0.0 {
        return 1.0 / state_count as f64;
    }
    if allowed & (1 << answer) != 0 {
        (1.0 - ANSWER_ERROR_RATE) / allowed_count
    } else {
        ANSWER_ERROR_RATE / other_count
    }
}

/// The smallest length, as a share of a species' maximum, at which a free-living animal
/// of it is usually met: sharks and rays are born or hatch at roughly a tenth to a third
/// of their maximum length (common practice, from memory: a small-spotted catshark
/// hatches at about 10 cm of 100, a blue shark is born at 35–50 cm of 400, a basking
/// shark at about 1.5 m of 12). A 62 cm animal is no basking shark.
pub const NEWBORN_SHARE: f64 = 0.10;

/// How far under [`NEWBORN_SHARE`] a length may go, as a share of it, before it counts
/// strongly against a species: at 20% under the weight is e⁻¹ (taped), at 35% under for
/// a length judged by eye.
pub const SMALL_SLACK_MEASURED: f64 = 0.20;
pub const SMALL_SLACK_ESTIMATED: f64 = 0.35;

/// Weight a length gives a species, from the length as a multiple of the species'
/// maximum: 1 from about newborn size ([`NEWBORN_SHARE`]) up to the maximum, falling as a
/// half-Gaussian beyond the maximum (excess over the slack) and below newborn size
/// (shortfall over its slack), never below [`SIZE_FLOOR`]. So an implausible species —
/// a giant for a small animal, a small species for a giant — does not lead.
pub fn size_likelihood(ratio_to_max: f64, estimated: bool) -> f64 {
    let gaussian = |distance: f64| (-distance * distance).exp().max(SIZE_FLOOR);
    if ratio_to_max > 1.0 {
        let slack = if estimated { SIZE_SLACK_ESTIMATED } else { SIZE_SLACK_MEASURED };
        return gaussian((ratio_to_max - 1.0) / slack);
    }
    if ratio_to_max < NEWBORN_SHARE {
        let slack = if estimated { SMALL_SLACK_ESTIMATED } else { SMALL_SLACK_MEASURED };
        return gaussian((NEWBORN_SHARE - ratio_to_max) / NEWBORN_SHARE / slack);
    }
    1.0
}

/// Prior weight from the record's area: 1 where the checklist lists the species,
/// [`OUT_OF_AREA_WEIGHT`] elsewhere.
pub fn presence_weight(taxon: &Taxon, area_code: &str) -> f64 {
    if taxon.presence.iter().any(|code| code == area_code) { 1.0 } else { OUT_OF_AREA_WEIGHT }
}

/// Prior weight from confirmed records nearby: proportional to the count plus
/// [`NEARBY_PSEUDO_COUNT`], i.e. the local share of confirmed records, smoothed.
pub fn nearby_weight(confirmed_nearby: u32) -> f64 {
    f64::from(confirmed_nearby) + NEARBY_PSEUDO_COUNT
}

/// Shannon entropy in bits of a distribution given as weights summing to 1.
pub fn entropy_bits(probabilities: impl IntoIterator<Item = f64>) -> f64 {
    probabilities.into_iter().filter(|p| *p > 0.0).map(|p| -p * p.log2()).sum()
}
