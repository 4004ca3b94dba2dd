//! Band-edge alarms: does the VSWR stay under a limit across a required band?

use crate::reflection::Vswr;
use crate::units::Hertz;

/// A required band and the VSWR limit that must hold across it.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct VswrLimit {
    /// Lowest frequency that must be under the limit.
    pub low: Hertz,
    /// Highest frequency that must be under the limit.
    pub high: Hertz,
    /// The limit.
    pub limit: Vswr,
}

/// The verdict of a [`LimitWatch`].
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct EdgeAlarm {
    /// Points inside the required band that exceed the limit, in its lower half: the band's
    /// lower edge has moved up into the required band.
    pub low_edge: bool,
    /// Likewise in the upper half: the upper edge has moved down into the required band.
    pub high_edge: bool,
    /// No point of the sweep fell inside the required band, so nothing was checked.
    pub not_covered: bool,
    /// The worst point inside the required band (frequency, VSWR), if any was seen.
    pub worst: Option<(Hertz, Vswr)>,
    /// Points checked inside the required band.
    pub checked: usize,
}

impl EdgeAlarm {
    /// True when anything is wrong (an edge out of limits, or the band not covered).
    pub fn raised(&self) -> bool {
        self.low_edge || self.high_edge || self.not_covered
    }
}

/// Streaming check of one [`VswrLimit`]. Feed every point; read [`LimitWatch::verdict`].
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LimitWatch {
    limit: VswrLimit,
    alarm: EdgeAlarm,
}

impl LimitWatch {
    /// A watch for `limit`. A limit whose `low` is above `high` is watched with the two
    /// swapped.
    pub fn new(limit: VswrLimit) -> Self {
        let limit = if limit.low.value() > limit.high.value() {
            VswrLimit {
                low: limit.high,
                high: limit.low,
                limit: limit.limit,
            }
        } else {
            limit
        };
        Self {
            limit,
            alarm: EdgeAlarm {
                low_edge: false,
                high_edge: false,
                not_covered: true,
                worst: None,
                checked: 0,
            },
        }
    }

    /// Feed one point. Non-finite frequencies are ignored.
    pub fn push(&mut self, frequency: Hertz, vswr: Vswr) {
        let f = frequency.value();
        let (lo, hi) = (self.limit.low.value(), self.limit.high.value());
        if !f.is_finite() || f < lo || f > hi {
            return;
        }
        let a = &mut self.alarm;
        a.not_covered = false;
        a.checked = a.checked.saturating_add(1);
        if a.worst.is_none_or(|(_, w)| vswr.value() > w.value()) {
            a.worst = Some((frequency, vswr));
        }
        if vswr.value() > self.limit.limit.value() {
            if f <= 0.5 * (lo + hi) {
                a.low_edge = true;
            } else {
                a.high_edge = true;
            }
        }
    }

    /// The verdict so far.
    pub fn verdict(&self) -> EdgeAlarm {
        self.alarm
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn raises_the_right_edge() {
        let lim = VswrLimit {
            low: Hertz::new(10.0),
            high: Hertz::new(20.0),
            limit: Vswr::new(2.0).unwrap(),
        };
        let mut w = LimitWatch::new(lim);
        assert!(w.verdict().not_covered);
        for (f, s) in [
            (5.0, 5.0),
            (10.0, 1.5),
            (15.0, 1.2),
            (19.0, 2.5),
            (25.0, 9.0),
        ] {
            w.push(Hertz::new(f), Vswr::new(s).unwrap());
        }
        let v = w.verdict();
        assert!(!v.low_edge && v.high_edge && !v.not_covered && v.raised());
        assert_eq!(v.checked, 3);
        assert_eq!(v.worst.unwrap().0.value(), 19.0);
    }
}
