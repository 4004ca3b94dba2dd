//! Averaging of ADC codes: the sum is kept in a `u32`, which holds up to
//! [`CodeAverager::CAPACITY`] = 65 536 codes of 16 bits, with room for the rounding term, without overflow
//! (65 536 · 65 535 + 32 768 < 2^32).
//!
//! The mean is rounded to the nearest code with one 32-bit division (a library routine on
//! Armv6-M, which has no divide instruction); call it once per averaged reading, not per
//! sample. When the count is a power of two, [`CodeAverager::mean_shift`] is a shift.
//!
//! Panic policy: nothing here panics; a full averager refuses more codes.

/// A running sum of ADC codes.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct CodeAverager {
    sum: u32,
    count: u32,
}

impl CodeAverager {
    /// The largest number of codes summed without overflow.
    pub const CAPACITY: u32 = 65_536;

    /// An empty averager.
    pub const fn new() -> Self {
        Self { sum: 0, count: 0 }
    }

    /// Adds one code; `false` (and nothing added) when [`Self::CAPACITY`] codes are held.
    #[inline]
    pub fn push(&mut self, code: u16) -> bool {
        if self.count >= Self::CAPACITY {
            return false;
        }
        // count < 65 536 codes of ≤ 65 535: the sum stays < 2^32.
        self.sum = self.sum.wrapping_add(u32::from(code));
        self.count = self.count.wrapping_add(1);
        true
    }

    /// How many codes are held.
    pub const fn count(&self) -> u32 {
        self.count
    }

    /// The sum of the codes held.
    pub const fn sum(&self) -> u32 {
        self.sum
    }

    /// The mean rounded to the nearest code; `None` when empty.
    pub fn mean(&self) -> Option<u16> {
        if self.count == 0 {
            return None;
        }
        // sum + count/2 ≤ 65 536 · 65 535 + 32 768 < 2^32; the mean ≤ 65 535.
        let m = self.sum.wrapping_add(self.count >> 1) / self.count;
        Some(m.min(u32::from(u16::MAX)) as u16)
    }

    /// The mean by a shift, rounded, when exactly 2^`log2_count` codes are held
    /// (`log2_count` ≤ 16); `None` otherwise.
    pub fn mean_shift(&self, log2_count: u32) -> Option<u16> {
        if log2_count > 16 || self.count != 1 << log2_count {
            return None;
        }
        let half = (1u32 << log2_count) >> 1;
        let m = self.sum.wrapping_add(half) >> log2_count;
        Some(m.min(u32::from(u16::MAX)) as u16)
    }

    /// Empties the averager.
    pub fn reset(&mut self) {
        *self = Self::new();
    }
}

/// The rounded mean of up to [`CodeAverager::CAPACITY`] codes; `None` when `codes` is empty
/// or longer.
pub fn mean_of(codes: &[u16]) -> Option<u16> {
    let mut a = CodeAverager::new();
    for &c in codes {
        if !a.push(c) {
            return None;
        }
    }
    a.mean()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn means() {
        assert_eq!(mean_of(&[]), None);
        assert_eq!(mean_of(&[1, 2]), Some(2)); // 1.5 rounds up
        assert_eq!(mean_of(&[10, 20, 31]), Some(20)); // 20.33
        let mut a = CodeAverager::new();
        for _ in 0..CodeAverager::CAPACITY {
            assert!(a.push(u16::MAX));
        }
        assert!(!a.push(0));
        assert_eq!(a.mean(), Some(u16::MAX));
        assert_eq!(a.sum(), 65_536 * 65_535);
        a.reset();
        for c in [100u16, 101, 102, 103] {
            a.push(c);
        }
        assert_eq!(a.mean_shift(2), Some(102)); // 101.5 rounds up
        assert_eq!(a.mean_shift(3), None);
    }
}
