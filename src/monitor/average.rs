//! Boxcar average of the last `window` readings, over a fixed buffer of `N`.
//!
//! The mean is the exact integer floor of the sum over the readings held (fewer than `window`
//! until the buffer fills). Sums are u64, so `N` readings of `u32::MAX` µW cannot overflow for
//! any `N` below 2³².

use super::math::PowerReading;

/// A running boxcar average of forward and reflected power.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Averager<const N: usize> {
    buf: [PowerReading; N],
    window: usize,
    next: usize,
    filled: usize,
    sum_forward: u64,
    sum_reflected: u64,
}

impl<const N: usize> Averager<N> {
    /// An empty average over `window` readings, clamped into `1..=N` (for `N` ≥ 1).
    pub fn new(window: usize) -> Self {
        Averager {
            buf: [PowerReading::default(); N],
            window: window.clamp(1, N.max(1)),
            next: 0,
            filled: 0,
            sum_forward: 0,
            sum_reflected: 0,
        }
    }

    /// Readings held now (at most the window).
    pub fn len(&self) -> usize {
        self.filled
    }

    /// True before the first reading.
    pub fn is_empty(&self) -> bool {
        self.filled == 0
    }

    /// Adds a reading, dropping the oldest once the window is full.
    pub fn push(&mut self, r: PowerReading) {
        let Some(slot) = self.buf.get_mut(self.next) else {
            return; // N == 0: nothing can be held
        };
        if self.filled >= self.window {
            self.sum_forward = self.sum_forward.saturating_sub(u64::from(slot.forward_uw));
            self.sum_reflected = self
                .sum_reflected
                .saturating_sub(u64::from(slot.reflected_uw));
        } else {
            self.filled = self.filled.saturating_add(1);
        }
        *slot = r;
        self.sum_forward = self.sum_forward.saturating_add(u64::from(r.forward_uw));
        self.sum_reflected = self.sum_reflected.saturating_add(u64::from(r.reflected_uw));
        self.next = self.next.saturating_add(1);
        if self.next >= self.window {
            self.next = 0;
        }
    }

    /// The mean reading (floor), or all zeros when empty.
    pub fn mean(&self) -> PowerReading {
        let n = self.filled as u64;
        let f = self.sum_forward.checked_div(n).unwrap_or(0);
        let r = self.sum_reflected.checked_div(n).unwrap_or(0);
        PowerReading {
            forward_uw: u32::try_from(f).unwrap_or(u32::MAX),
            reflected_uw: u32::try_from(r).unwrap_or(u32::MAX),
        }
    }

    /// Forgets every reading.
    pub fn clear(&mut self) {
        *self = Self::new(self.window);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn mean_of_a_sliding_window() {
        let mut a: Averager<4> = Averager::new(3);
        assert!(a.is_empty());
        assert_eq!(a.mean(), PowerReading::new(0, 0));
        a.push(PowerReading::new(10, 1));
        assert_eq!(a.mean(), PowerReading::new(10, 1));
        a.push(PowerReading::new(20, 2));
        a.push(PowerReading::new(31, 3));
        assert_eq!(a.mean(), PowerReading::new(20, 2)); // 61/3 = 20.33 → 20
        a.push(PowerReading::new(40, 4)); // drops 10
        assert_eq!(a.len(), 3);
        assert_eq!(a.mean(), PowerReading::new(30, 3)); // 91/3
        a.clear();
        assert!(a.is_empty());
    }

    #[test]
    fn window_clamped_and_no_overflow() {
        let mut a: Averager<2> = Averager::new(9);
        for _ in 0..5 {
            a.push(PowerReading::new(u32::MAX, u32::MAX));
        }
        assert_eq!(a.len(), 2);
        assert_eq!(a.mean(), PowerReading::new(u32::MAX, u32::MAX));
        let mut z: Averager<0> = Averager::new(1);
        z.push(PowerReading::new(5, 5));
        assert_eq!(z.mean(), PowerReading::new(0, 0));
    }
}
