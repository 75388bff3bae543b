//! Which species the characters alone cannot tell apart. Two species are separable
//! when at least one character has no state in common between them; otherwise some
//! animal could answer every question the same way for both, and the app should say
//! so rather than pretend to a species-level answer.

use serde::Serialize;

use crate::likelihood::StateSet;

/// Two species that no set of answers can separate (size and area may still help).
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct UnseparablePair {
    /// The one listed first in the checklist.
    pub first: String,
    /// The one listed later.
    pub second: String,
}

/// Index pairs `(i, j)`, `i < j`, of species whose allowed states overlap on every
/// character. `allowed[species][character]` holds the allowed state sets.
pub(crate) fn overlapping_pairs(allowed: &[Vec<StateSet>]) -> Vec<(usize, usize)> {
    let mut pairs = Vec::new();
    for (i, first) in allowed.iter().enumerate() {
        for (j, second) in allowed.iter().enumerate().skip(i + 1) {
            if overlap_everywhere(first, second) {
                pairs.push((i, j));
            }
        }
    }
    pairs
}

fn overlap_everywhere(first: &[StateSet], second: &[StateSet]) -> bool {
    first.iter().zip(second).all(|(a, b)| a & b != 0)
}
