//! Matched (one-way) cable loss from a return-loss reading of a line left open or shorted at
//! its far end.
//!
//! An open or a short reflects everything, so the wave that comes back has crossed the line
//! twice: the return loss read at the near end is twice the matched loss, and
//! `loss = RL / 2` (common practice for checking feed lines). Averaging an open and a short
//! reading cancels much of the bridge's directivity error, whose phase relative to the
//! reflection flips by 180° between the two (common practice).
//!
//! The bounds come from the directivity bounds of the return-loss reading, halved.
//!
//! Not supported here: loss versus frequency and line constants (the `line` models), and
//! lines so lossy that the returned wave sinks below the bridge's directivity (flagged by
//! [`CableLoss::beyond_directivity`]).
//!
//! Panic policy: nothing in this module panics.

use crate::reflection::{Gamma, DB_CEILING};
use crate::uncertainty::directivity_bounds;
use crate::units::Db;

/// Matched cable loss with its first-order bounds.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct CableLoss {
    /// The one-way matched loss.
    pub loss: Db,
    /// Smallest loss consistent with the reading.
    pub low: Db,
    /// Largest loss consistent with the reading.
    pub high: Db,
    /// True when the returned wave is no larger than the bridge's leakage, so that the
    /// upper bound is only the instrument's ceiling.
    pub beyond_directivity: bool,
}

/// Why a cable-loss reading was refused.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum CableError {
    /// A non-finite return loss or directivity.
    NotFinite,
    /// A negative return loss.
    Negative,
}

fn check(rl: Db) -> Result<f32, CableError> {
    let v = rl.value();
    if !v.is_finite() {
        Err(CableError::NotFinite)
    } else if v < 0.0 {
        Err(CableError::Negative)
    } else {
        Ok(v.min(DB_CEILING))
    }
}

/// Matched loss from the return loss of the line with its far end open or shorted, read
/// through a bridge of directivity `directivity`.
pub fn matched_loss_from_open_short(rl: Db, directivity: Db) -> Result<CableLoss, CableError> {
    let r = check(rl)?;
    if !directivity.is_finite() {
        return Err(CableError::NotFinite);
    }
    let g = Gamma::from_return_loss(Db::new(r)).map_err(|_| CableError::NotFinite)?;
    let b = directivity_bounds(g, directivity);
    Ok(CableLoss {
        loss: Db::new(r / 2.0),
        low: Db::new(b.return_loss_low.value() / 2.0),
        high: Db::new(b.return_loss_high.value() / 2.0),
        beyond_directivity: b.reaches_perfect_match(),
    })
}

/// Matched loss from both an open and a short reading of the same line (their mean), which
/// cancels much of the directivity error; the bounds are the narrower of the two readings'.
pub fn matched_loss_from_open_and_short(
    rl_open: Db,
    rl_short: Db,
    directivity: Db,
) -> Result<CableLoss, CableError> {
    let a = matched_loss_from_open_short(rl_open, directivity)?;
    let b = matched_loss_from_open_short(rl_short, directivity)?;
    let loss = Db::new((a.loss.value() + b.loss.value()) / 2.0);
    let low = Db::new(a.low.value().max(b.low.value()).min(loss.value()));
    let high = Db::new(a.high.value().min(b.high.value()).max(loss.value()));
    Ok(CableLoss {
        loss,
        low,
        high,
        beyond_directivity: a.beyond_directivity && b.beyond_directivity,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (RL of open end dB, directivity dB, expected loss, low, high): loss = RL/2 and the
    /// bounds are half the directivity bounds of the RL reading.
    const VECTORS: [(f32, f32, f32, f32, f32); 2] = [
        (6.0, 35.0, 3.0, 2.84858, 3.15689),
        (20.0, 30.0, 10.0, 8.80669, 11.65089),
    ];
    const BOUND_DB: f32 = 2e-3;

    #[test]
    fn vectors() {
        for &(rl, d, loss, lo, hi) in VECTORS.iter() {
            let c = matched_loss_from_open_short(Db::new(rl), Db::new(d)).unwrap();
            assert!((c.loss.value() - loss).abs() < BOUND_DB);
            assert!((c.low.value() - lo).abs() < BOUND_DB, "{}", c.low.value());
            assert!((c.high.value() - hi).abs() < BOUND_DB, "{}", c.high.value());
            assert!(!c.beyond_directivity);
        }
    }

    #[test]
    fn open_and_short_mean() {
        let c =
            matched_loss_from_open_and_short(Db::new(5.8), Db::new(6.2), Db::new(35.0)).unwrap();
        assert!((c.loss.value() - 3.0).abs() < 1e-5);
        assert!(c.low.value() <= c.loss.value() && c.loss.value() <= c.high.value());
    }

    #[test]
    fn refused() {
        assert_eq!(
            matched_loss_from_open_short(Db::new(-1.0), Db::new(30.0)),
            Err(CableError::Negative)
        );
        assert_eq!(
            matched_loss_from_open_short(Db::new(f32::NAN), Db::new(30.0)),
            Err(CableError::NotFinite)
        );
    }
}
