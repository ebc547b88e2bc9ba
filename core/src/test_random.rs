//! A small deterministic generator for tests that draw many inputs: the same
//! numbers on every run, so a failing case can be reproduced by its text.
//!
//! xorshift64* (Vigna, "An experimental exploration of Marsaglia's xorshift
//! generators, scrambled", ACM TOMS 42 (2016)): shifts 12, 25, 27 and the
//! multiplier 0x2545F4914F6CDD1D. Not for anything but test inputs.

/// An xorshift64* generator from a non-zero seed.
pub(crate) struct TestRandom(u64);

impl TestRandom {
    /// A generator from `seed`, which must not be zero (zero stays zero).
    pub(crate) fn new(seed: u64) -> Self {
        debug_assert_ne!(seed, 0, "an xorshift generator needs a non-zero seed");
        TestRandom(seed)
    }

    /// The next 64 random bits.
    pub(crate) fn next_u64(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_f491_4f6c_dd1d)
    }

    /// A number from 0 to `n - 1` (`n` must not be zero).
    pub(crate) fn below(&mut self, n: u64) -> u64 {
        self.next_u64() % n
    }
}
