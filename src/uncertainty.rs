//! Uncertainty of a scalar reflection reading from the bridge's finite directivity.
//!
//! A bridge of directivity D leaks a fraction e = 10^(−D/20) of the forward wave into the
//! reflected port with unknown phase. To first order the measured |Γ| is the true one plus a
//! vector of length e, so the true |Γ| lies in `[|Γm| − e, |Γm| + e]`, clamped to `[0, 1]`
//! (the standard first-order mismatch-uncertainty argument of directional-coupler theory; see
//! any microwave-measurement handbook's treatment of directivity error).
//!
//! Worked example (held by a test below and in host-tests): D = 30 dB gives e = 0.0316; a
//! reading of 20 dB return loss (|Γ| = 0.1) has a true value between 17.6 dB and 23.3 dB.
//!
//! Not modelled: source match and tracking errors (the vector calibration removes those), and
//! detector noise (the quality verdict flags readings near the floor).
//!
//! Panic policy: nothing in this module panics.

use crate::reflection::{Gamma, Vswr, DB_CEILING};
use crate::units::Db;

/// The range of true values consistent with one reading.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Bounds {
    /// Smallest |Γ| consistent with the reading.
    pub gamma_low: Gamma,
    /// Largest |Γ| consistent with the reading.
    pub gamma_high: Gamma,
    /// Smallest return loss (from `gamma_high`).
    pub return_loss_low: Db,
    /// Largest return loss (from `gamma_low`; [`DB_CEILING`] when the match could be perfect).
    pub return_loss_high: Db,
    /// Smallest VSWR (from `gamma_low`).
    pub vswr_low: Vswr,
    /// Largest VSWR (from `gamma_high`).
    pub vswr_high: Vswr,
}

impl Bounds {
    /// True when the reading cannot be told from a perfect match: the leakage is as large as
    /// the reading itself.
    pub fn reaches_perfect_match(&self) -> bool {
        self.gamma_low.value() <= 0.0 || self.return_loss_high.value() >= DB_CEILING
    }
}

/// The leakage amplitude e = 10^(−D/20) of a bridge with directivity `directivity`, as the
/// |Γ| it adds to a reading at worst; a non-finite or negative directivity is treated as 0 dB
/// (no directivity: e = 1).
pub fn leakage(directivity: Db) -> Gamma {
    let d = directivity.value();
    if d.is_finite() && d > 0.0 {
        Gamma::saturating(libm::powf(10.0, -d / 20.0))
    } else {
        Gamma::TOTAL
    }
}

/// First-order bounds of a reading `measured` from a bridge of directivity `directivity`.
pub fn directivity_bounds(measured: Gamma, directivity: Db) -> Bounds {
    bounds_for_leakage(measured, leakage(directivity))
}

/// First-order bounds of a reading `measured` from a bridge of known [`leakage`] (compute the
/// leakage once per bridge; this saves its `powf` on every reading).
pub fn bounds_for_leakage(measured: Gamma, leakage: Gamma) -> Bounds {
    let e = leakage.value();
    let low = Gamma::saturating(measured.value() - e);
    let high = Gamma::saturating(measured.value() + e);
    Bounds {
        gamma_low: low,
        gamma_high: high,
        return_loss_low: high.return_loss(),
        return_loss_high: low.return_loss(),
        vswr_low: low.vswr(),
        vswr_high: high.vswr(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (directivity dB, measured RL dB, expected RL low, expected RL high); worked in f64
    /// from RL = −20·log10(10^(−RL/20) ± 10^(−D/20)).
    const VECTORS: [(f32, f32, f32, f32); 3] = [
        (30.0, 20.0, 17.6134, 23.3018),
        (40.0, 20.0, 19.1721, 20.9151),
        (20.0, 20.0, 13.9794, DB_CEILING),
    ];
    const BOUND_DB: f32 = 2e-3;

    #[test]
    fn vectors() {
        for &(d, rl, lo, hi) in VECTORS.iter() {
            let g = Gamma::from_return_loss(Db::new(rl)).unwrap();
            let b = directivity_bounds(g, Db::new(d));
            assert!(
                (b.return_loss_low.value() - lo).abs() < BOUND_DB,
                "{d} {rl}"
            );
            assert!(
                (b.return_loss_high.value() - hi).abs() < BOUND_DB,
                "{d} {rl}"
            );
        }
    }

    #[test]
    fn no_directivity_means_no_knowledge() {
        let b = directivity_bounds(Gamma::new(0.5).unwrap(), Db::new(f32::NAN));
        assert_eq!(b.gamma_low, Gamma::MATCHED);
        assert_eq!(b.gamma_high, Gamma::TOTAL);
        assert!(b.reaches_perfect_match());
    }
}
