//! Directivity uncertainty bounds and matched cable loss, in integer arithmetic.
//!
//! Directivity: a bridge of directivity D leaks a fraction 10^(−D/20) of the forward wave
//! into the reflected port with unknown phase, so a measured |Γm| means a true |Γ| in
//! |Γm| ± 10^(−D/20), clamped to `0..=1` (the usual worst-case bound of the directivity
//! error term in a one-port reflectometer; textbook: any microwave-measurement text on
//! directional-coupler errors). Example: D = 30 dB and a reading of 20 dB return loss
//! (|Γm| = 0.1) give |Γ| in 0.0684..0.1316, i.e. return loss 17.6..23.3 dB.
//!
//! Matched cable loss from a far-end open or short: the wave travels the cable twice, so
//! loss = RL/2 (common practice; it assumes a lossless, perfectly reflecting far end and a
//! matched cable). Its bounds are the return-loss bounds halved.
//!
//! Panic policy: nothing here panics.

use super::chain::{FixedMeasurement, FixedQuality};
use super::exp2::exp2_neg_q31;
use super::q::{DbQ16, GammaQ31, DB_CEILING_Q16};
use super::relations::{from_gamma, FixedReflection, K_DB_TO_LOG2};
use super::wide::mul_hi;

/// The worst-case spread of a reading caused by finite bridge directivity.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DirectivityBounds {
    leak: GammaQ31,
}

/// The reflection quantities at both ends of the uncertainty range of one reading.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ReflectionBounds {
    /// At |Γ| − leak (clamped to 0): the best match the reading allows (highest return
    /// loss, lowest VSWR and mismatch loss).
    pub low: FixedReflection,
    /// At |Γ| + leak (clamped to 1): the worst match the reading allows.
    pub high: FixedReflection,
}

impl ReflectionBounds {
    /// True when the reading cannot be told from a perfect match: the leakage is as large as
    /// the reading itself (the low bound's return loss is at the ceiling).
    pub fn reaches_perfect_match(&self) -> bool {
        self.low.gamma == GammaQ31::MATCHED || self.low.return_loss.to_bits() >= DB_CEILING_Q16
    }
}

impl DirectivityBounds {
    /// Bounds for a bridge of this directivity (dB, positive; negative reads as 0 dB and
    /// anything above 100 dB as 100 dB).
    pub fn new(directivity: DbQ16) -> Self {
        let d = directivity.to_bits().clamp(0, DB_CEILING_Q16) as u32; // ≤ 100 · 2^16
        let a = mul_hi(d << 8, K_DB_TO_LOG2);
        Self {
            leak: GammaQ31::from_bits(exp2_neg_q31(a)),
        }
    }

    /// The leakage 10^(−D/20) as a |Γ|.
    pub fn leak(&self) -> GammaQ31 {
        self.leak
    }

    /// The reflection quantities at |Γ| ∓ leak.
    pub fn bounds(&self, gamma: GammaQ31) -> ReflectionBounds {
        ReflectionBounds {
            low: from_gamma(gamma.saturating_sub(self.leak)),
            high: from_gamma(gamma.saturating_add(self.leak)),
        }
    }

    /// The bounds of a measurement; sets [`FixedQuality::BEYOND_DIRECTIVITY`] on it when the
    /// reading cannot be told from a perfect match.
    pub fn qualify(&self, measurement: &mut FixedMeasurement) -> ReflectionBounds {
        let b = self.bounds(measurement.reflection.gamma);
        if b.reaches_perfect_match() {
            measurement.quality = measurement.quality.with(FixedQuality::BEYOND_DIRECTIVITY);
        }
        b
    }

    /// Matched cable loss of a cable ended in an open or a short, with its bounds.
    pub fn cable_loss(&self, far_end_open_or_short: &FixedMeasurement) -> CableLoss {
        let r = &far_end_open_or_short.reflection;
        let b = self.bounds(r.gamma);
        CableLoss {
            loss: matched_cable_loss(r.return_loss),
            low: matched_cable_loss(b.high.return_loss),
            high: matched_cable_loss(b.low.return_loss),
            lower_bound_only: far_end_open_or_short
                .quality
                .contains(FixedQuality::REFLECTED_AT_FLOOR),
        }
    }
}

/// Matched loss of a cable from the return loss measured with its far end open or shorted:
/// RL/2 (common practice).
pub fn matched_cable_loss(return_loss: DbQ16) -> DbQ16 {
    return_loss.half()
}

/// Matched cable loss with its directivity bounds.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct CableLoss {
    /// The loss read, RL/2.
    pub loss: DbQ16,
    /// The smallest loss the directivity allows.
    pub low: DbQ16,
    /// The largest loss the directivity allows (100 dB/2 when the bound is open).
    pub high: DbQ16,
    /// The reflected reading was below the noise floor: the loss is at least `loss`.
    pub lower_bound_only: bool,
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::fixed::chain::{CodeLimits, LinearChain};

    fn db(x: DbQ16) -> f64 {
        f64::from(x.to_bits()) / 65_536.0
    }

    /// (directivity dB, true RL dB, expected RL low, expected RL high): |Γ| ± 10^(−D/20)
    /// evaluated in f64 by hand.
    const VECTORS: [(i16, f64, f64, f64); 2] = [
        (30, 20.0, 17.613_4, 23.301_8),
        (40, 20.0, 19.172_1, 20.915_1),
    ];
    const TOL_DB: f64 = 0.005;

    #[test]
    fn directivity_vectors() {
        for &(d, rl, lo, hi) in VECTORS.iter() {
            let b = DirectivityBounds::new(DbQ16::from_int(d));
            let g = GammaQ31::from_bits(
                libm::round(libm::pow(10.0, -rl / 20.0) * 2_147_483_648.0) as u32
            );
            let r = b.bounds(g);
            assert!(
                (db(r.high.return_loss) - lo).abs() < TOL_DB,
                "{}",
                db(r.high.return_loss)
            );
            assert!(
                (db(r.low.return_loss) - hi).abs() < TOL_DB,
                "{}",
                db(r.low.return_loss)
            );
            assert!(r.low.vswr <= r.high.vswr);
        }
        // Leak above the reading: the best case is a perfect match (open bound).
        let b = DirectivityBounds::new(DbQ16::from_int(20));
        let r = b.bounds(GammaQ31::from_bits(1 << 20));
        assert_eq!(r.low, FixedReflection::MATCHED);
        assert!(r.reaches_perfect_match());
        let chain = LinearChain::new(CodeLimits::new(4, 65_535)).unwrap();
        let mut m = chain.measure(60_000, 3_000).unwrap(); // 26 dB, |Γ| = 0.05 < 0.1
        b.qualify(&mut m);
        assert!(m.quality.contains(FixedQuality::BEYOND_DIRECTIVITY));
    }

    #[test]
    fn cable_loss_from_open() {
        // A cable of 3 dB matched loss, far end open: RL 6 dB, |Γ| = 0.501; linear codes.
        let chain = LinearChain::new(CodeLimits::new(4, 65_535)).unwrap();
        let m = chain.measure(40_000, 20_047).unwrap(); // 20·log10(40000/20047) = 6.0002 dB
        let b = DirectivityBounds::new(DbQ16::from_int(35));
        let c = b.cable_loss(&m);
        assert!((db(c.loss) - 3.000_1).abs() < 0.005, "{}", db(c.loss));
        assert!(c.low < c.loss && c.loss < c.high);
        // |Γ| = 0.50118 ± 0.017783 → RL 5.697 .. 6.314 dB → loss 2.8487 .. 3.1570 dB (f64 by hand).
        assert!((db(c.low) - 2.848_7).abs() < 0.005, "{}", db(c.low));
        assert!((db(c.high) - 3.157_0).abs() < 0.005, "{}", db(c.high));
        assert!(!c.lower_bound_only);
    }
}
