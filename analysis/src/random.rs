//! A small seeded random generator, so that resampled figures can be reproduced exactly:
//! by wrackline on another day, and by the reference scripts that check them.
//!
//! SplitMix64 (Steele, Lea & Flood 2014, "Fast splittable pseudorandom number generators",
//! OOPSLA): a 64-bit counter stepped by the golden-ratio increment and mixed. A number
//! below `n` is the high 64 bits of the 128-bit product of a draw and `n` (Lemire 2019,
//! without the rejection step: its bias, under n / 2⁶⁴, is far below resampling noise).

/// The generator's state.
#[derive(Debug, Clone)]
pub struct SplitMix64(u64);

impl SplitMix64 {
    /// A generator started from `seed`.
    pub fn new(seed: u64) -> Self {
        Self(seed)
    }

    /// The next 64 random bits.
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9e37_79b9_7f4a_7c15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
        z ^ (z >> 31)
    }

    /// A whole number in `0..n` (`n` > 0).
    pub fn below(&mut self, n: usize) -> usize {
        ((u128::from(self.next_u64()) * n as u128) >> 64) as usize
    }

    /// A number in [0, 1) with 53 random bits.
    pub fn uniform(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_first_outputs_match_the_published_reference() {
        // SplitMix64 from seed 1234567 (Vigna's reference C code, splitmix64.c; values from
        // memory, checked with the Python re-implementation in make_reference.py).
        let mut g = SplitMix64::new(1_234_567);
        assert_eq!(g.next_u64(), 6_457_827_717_110_365_317);
        assert_eq!(g.next_u64(), 3_203_168_211_198_807_973);
        assert!((0..1000).all(|_| g.below(7) < 7));
    }
}
