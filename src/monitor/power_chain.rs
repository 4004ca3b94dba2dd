//! [`PowerChain`]: VSWR and return loss from forward and reflected power in µW, built on the
//! integer log2/exp2 of [`crate::fixed`].
//!
//! Method: with l = log2(P_fwd) − log2(P_ref) (Q8.24, two table logarithms of exact
//! integers), return loss = 10·log10(2)·l dB and |Γ| = 2^(−l/2) (one table exponential);
//! VSWR and the rest then follow from |Γ| by [`crate::fixed::from_gamma`], which takes the
//! logarithms of 1 ± |Γ| exactly. Textbook relations as in [`crate::reflection`].
//!
//! Error: return loss within 2 · [`LOG2_MAX_ERROR_Q24`](crate::fixed::log2::LOG2_MAX_ERROR_Q24)
//! · 10·log10 2 ≈ 3e-4 dB of the exact value plus the output rounding; |Γ| within
//! [`GAMMA_BOUND`] (half the two logarithms' error, ln 2 · 5e-5 = 3.5e-5 relative, plus the
//! exponential's 16 ppm, plus rounding); hence VSWR within the fixed chain's 0.1 % up to VSWR
//! 20; above, the VSWR error grows as 2/(1 − |Γ|²) times the |Γ| error. Held by
//! `host-tests/tests/monitor_chain_sweep.rs`, `monitor_props.rs`, `qemu_monitor.rs` and the unit
//! tests below.
//!
//! Panic policy: nothing here panics; no division, no 64-bit multiply.

use super::math::{LineFigures, LineMath, PowerReading};
use crate::fixed::exp2::exp2_neg_q31;
use crate::fixed::log2::log2_q24;
use crate::fixed::relations::db10_from_log2;
use crate::fixed::{from_gamma, DbQ16, GammaQ31, VswrQ16};

/// Stated bound on the absolute |Γ| error of [`PowerChain`] (|Γ| = √(P_ref/P_fwd)).
pub const GAMMA_BOUND: f32 = 6.0e-5;

/// The monitor's fixed-point chain for powers in µW. Stateless.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PowerChain;

impl LineMath for PowerChain {
    fn figures(&self, r: PowerReading) -> LineFigures {
        if r.reflected_uw >= r.forward_uw {
            return LineFigures {
                vswr: VswrQ16::CEILING,
                return_loss: DbQ16::ZERO,
            };
        }
        if r.reflected_uw == 0 {
            return LineFigures {
                vswr: VswrQ16::ONE,
                return_loss: DbQ16::from_int(100),
            };
        }
        // 0 < reflected < forward: both logarithms lie in [0, 32) · 2^24, so l is in (0, 2^29).
        let l = log2_q24(r.forward_uw).wrapping_sub(log2_q24(r.reflected_uw));
        let (return_loss, _) = db10_from_log2(l);
        let gamma = GammaQ31::from_bits(exp2_neg_q31(l.max(0).unsigned_abs() >> 1));
        LineFigures {
            vswr: from_gamma(gamma).vswr,
            return_loss,
        }
    }
}

#[cfg(test)]
mod tests {
    extern crate std;
    use super::*;

    /// (forward µW, reflected µW, VSWR, return loss dB), hand-computed from the textbook
    /// relations: |Γ|² = P_ref/P_fwd, VSWR = (1+|Γ|)/(1−|Γ|), RL = 10·log10(P_fwd/P_ref).
    const VECTORS: [(u32, u32, f64, f64); 6] = [
        (100_000_000, 25_000_000, 3.0, 6.020_599_913), // |Γ| = 0.5
        (100_000_000, 1_000_000, 1.222_222_222, 20.0), // |Γ| = 0.1
        (9_000_000, 1_000_000, 2.0, 9.542_425_094),    // |Γ| = 1/3
        (4_000_000_000, 4_000, 1.002_002_002, 60.0),   // |Γ| = 0.001
        (1_000_000, 810_000, 19.0, 0.915_149_811),     // |Γ| = 0.9
        (50_000_000, 200_000, 1.134_883_72, 23.979_400_087), // |Γ|² = 0.004
    ];
    /// Bounds for the vectors: 0.1 % of VSWR (the fixed chain's stated bound) and 0.002 dB.
    const VSWR_REL_TOL: f64 = 1e-3;
    const RL_TOL_DB: f64 = 2e-3;

    #[test]
    fn vectors() {
        for (f, r, v, rl) in VECTORS {
            let got = PowerChain.figures(PowerReading::new(f, r));
            let gv = f64::from(got.vswr.to_bits()) / 65_536.0;
            let grl = f64::from(got.return_loss.to_bits()) / 65_536.0;
            assert!(
                ((gv - v) / v).abs() < VSWR_REL_TOL,
                "VSWR {f}/{r}: {gv} vs {v}"
            );
            assert!((grl - rl).abs() < RL_TOL_DB, "RL {f}/{r}: {grl} vs {rl}");
        }
    }

    #[test]
    fn limits() {
        let c = PowerChain;
        for (f, r) in [(0, 0), (5, 5), (5, 9), (u32::MAX, u32::MAX)] {
            let got = c.figures(PowerReading::new(f, r));
            assert_eq!(got.vswr, VswrQ16::CEILING);
            assert_eq!(got.return_loss, DbQ16::ZERO);
        }
        let m = c.figures(PowerReading::new(1, 0));
        assert_eq!(
            (m.vswr, m.return_loss),
            (VswrQ16::ONE, DbQ16::from_int(100))
        );
        // One part in 4e9: RL 96.3 dB, VSWR ≈ 1.00003.
        let t = c.figures(PowerReading::new(u32::MAX, 1));
        assert!(t.return_loss.to_bits() > 96 << 16);
        assert!(t.vswr.to_bits() < (1 << 16) + 10);
        // One unit below forward: VSWR very large but within the ceiling.
        let h = c.figures(PowerReading::new(1_000_000, 999_999));
        assert!(h.vswr.to_bits() > 500 << 16);
    }

    /// Monotonic in the reflected power (the alarm relies on it): sweep at one forward power.
    #[test]
    fn monotonic_in_reflected() {
        let f = 10_000_000u32;
        let mut last = VswrQ16::ONE;
        let mut r = 1u32;
        while r < f {
            let v = PowerChain.figures(PowerReading::new(f, r)).vswr;
            assert!(v >= last, "VSWR fell at reflected {r}");
            last = v;
            r = r + r / 64 + 1;
        }
    }
}
