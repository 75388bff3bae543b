//! Photos that look alike: the distance between two perceptual hashes and the cut below
//! which two photos count as near duplicates, for the judging and the reviewers' list of
//! similar photos.

use shared_types::SimilarPhoto;

use crate::store::observations::HashedPhoto;

/// Hashes at most this many bits apart are listed as near duplicates. For a 64-bit
/// pHash, 10 or fewer differing bits is the usual "same picture" cut (from memory,
/// common practice); the test in `tests/it/similar.rs` shows a half-size re-encoded copy
/// well inside it and other photos well outside.
pub const NEAR_DUPLICATE_BITS: u32 = 10;

/// Bits that differ between two 64-bit hashes written as 16 hex digits (as intake stores
/// them); `None` if either is not.
pub fn hash_distance(a: &str, b: &str) -> Option<u32> {
    let parse = |text: &str| (text.len() == 16).then(|| u64::from_str_radix(text, 16).ok()).flatten();
    Some((parse(a)? ^ parse(b)?).count_ones())
}

/// The photos among `others` within [`NEAR_DUPLICATE_BITS`] of `own`, nearest first.
/// A linear scan: fine for the tens of thousands of photos a regional network gathers.
pub fn similar_photos(own: &str, others: Vec<HashedPhoto>) -> Vec<SimilarPhoto> {
    let mut near: Vec<SimilarPhoto> = others
        .into_iter()
        .filter_map(|other| {
            let distance_bits = hash_distance(own, &other.phash).filter(|d| *d <= NEAR_DUPLICATE_BITS)?;
            Some(SimilarPhoto { sha256: other.sha256, distance_bits, observation_ids: other.observation_ids })
        })
        .collect();
    near.sort_by(|a, b| a.distance_bits.cmp(&b.distance_bits).then_with(|| a.sha256.cmp(&b.sha256)));
    near
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hash_distance_counts_differing_bits() {
        assert_eq!(hash_distance("0000000000000000", "000000000000000f"), Some(4));
        assert_eq!(hash_distance("ffffffffffffffff", "ffffffffffffffff"), Some(0));
        assert_eq!(hash_distance("short", "ffffffffffffffff"), None);
    }

    #[test]
    fn only_photos_within_the_cut_are_listed_nearest_first() {
        let photo =
            |sha: &str, phash: &str| HashedPhoto { sha256: sha.into(), phash: phash.into(), observation_ids: vec![1] };
        let found = similar_photos(
            "0000000000000000",
            vec![
                photo("far", "00000000000007ff"),
                photo("near", "0000000000000003"),
                photo("same", "0000000000000000"),
            ],
        );
        let names: Vec<_> = found.iter().map(|p| (p.sha256.as_str(), p.distance_bits)).collect();
        assert_eq!(names, [("same", 0), ("near", 2)]);
    }
}
