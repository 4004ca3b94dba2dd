//! Block averaging of ADC codes: the exact integer mean of `N` readings, rounded to nearest.
//!
//! The sum is kept in a `u32`, so `N` is limited to 65 536 (checked at compile time).

/// Collects `N` codes and yields their mean.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Averager<const N: usize> {
    sum: u32,
    count: u32,
}

impl<const N: usize> Default for Averager<N> {
    fn default() -> Self {
        Self::new()
    }
}

impl<const N: usize> Averager<N> {
    const VALID: () = assert!(N >= 1 && N <= 65_536, "Averager needs 1 ≤ N ≤ 65536");

    /// An empty averager.
    pub const fn new() -> Self {
        #[allow(clippy::let_unit_value)]
        let _ = Self::VALID;
        Averager { sum: 0, count: 0 }
    }

    /// Adds a code; when it is the `N`-th, returns the rounded mean and starts again.
    pub fn push(&mut self, code: u16) -> Option<u16> {
        self.sum = self.sum.saturating_add(u32::from(code));
        self.count = self.count.saturating_add(1);
        if self.count as usize >= N {
            let n = self.count.max(1);
            let mean = (self.sum + n / 2) / n;
            *self = Self::new();
            Some(mean.min(u32::from(u16::MAX)) as u16)
        } else {
            None
        }
    }

    /// Readings collected so far in this block.
    pub fn count(&self) -> usize {
        self.count as usize
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn mean_of_block() {
        let mut a = Averager::<4>::new();
        assert_eq!(a.push(10), None);
        assert_eq!(a.push(11), None);
        assert_eq!(a.push(11), None);
        assert_eq!(a.push(11), Some(11)); // 43 / 4 = 10.75 → 11
        assert_eq!(a.count(), 0);
        let mut full = Averager::<65_536>::new();
        let mut last = None;
        for _ in 0..65_536 {
            last = full.push(u16::MAX);
        }
        assert_eq!(last, Some(u16::MAX));
    }
}
