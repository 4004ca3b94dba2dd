//! Integer fixed point (no FPU) for the in-line monitor: matched loss from an open/short
//! return loss, SWR at the load from SWR at the input and the reverse, and total loss with
//! mismatch. The value types are the crate's fixed-point types, [`crate::fixed::DbQ16`] and
//! [`crate::fixed::VswrQ16`] (both Q16.16), so results pass straight to and from the
//! integer measurement chain.
//!
//! The same relations as [`feed_loss`](super::feed_loss), written in return loss so that only
//! log2 and exp2 are needed:
//!
//! - matched loss = RL_open/short / 2 (common practice, see [`crate::cable`]);
//! - RL = 20·log10((S + 1)/(S − 1)), S = (1 + |Γ|)/(1 − |Γ|), |Γ| = 10^(−RL/20);
//! - RL_load = RL_in − 2·ML (clamped at 0 dB and flagged), RL_in = RL_load + 2·ML;
//! - total loss = ML + 10·log10(1 − 10^(−RL_in/10)) − 10·log10(1 − 10^(−RL_load/10)), which
//!   equals the handbook's 10·log10[(A² − |ΓL|²)/(A·(1 − |ΓL|²))], A = 10^(ML/10).
//!
//! Integer helpers (private to this file): the crate's table log2/exp2 in [`crate::fixed`]
//! hold about 0.01 dB with 32-bit arithmetic, which suits one reading; these relations chain
//! several logarithms and exponentials across a line of up to 50 dB, so they use 64-bit
//! intermediates and a bit-serial method that keeps about 1e-5 dB. log2 by normalising to [1, 2) and repeated squaring, one result bit per squaring (the
//! textbook shift-and-square method, e.g. Turner, "A fast binary logarithm algorithm", IEEE
//! Signal Processing Magazine, 2010, from memory), 20 fractional bits; exp2 of the fraction as
//! the product of the constants 2^(2^−k), k = 1..20, for the set bits (Q2.30, rounded).
//! Both are exact to about 2^−20 in log2 units before the final rounding to Q16.16.
//!
//! Error bounds against the f64 reference (measured by `host-tests/tests/line_fixed.rs`, where
//! the inputs are the same Q16.16 values): [`RL_BOUND_DB`], [`TOTAL_LOSS_BOUND_DB`],
//! [`SWR_BOUND_REL`].
//!
//! Limits: return loss and total loss are capped at 100 dB ([`DB_CEILING`]), SWR at 1000
//! ([`VswrQ16::CEILING`]). Input quantization is the caller's: near SWR 1 one Q16.16 step of
//! SWR is a large step in return loss.
//!
//! Panic policy: nothing in this module panics; all arithmetic is in ranges proven in the
//! comments (u64/i64 intermediates), with wrapping or saturating operators where a bound is
//! argued rather than checked.

use super::LineError;

/// Bound on the return loss from [`swr_to_return_loss`], dB, for SWR 1.0001–100 (measured
/// worst 1.3e-5 dB).
pub const RL_BOUND_DB: f32 = 5.0e-5;
/// Bound on [`total_loss`], dB, for ML ≤ 20 dB and load SWR ≤ 100 (measured worst 1.8e-4 dB).
pub const TOTAL_LOSS_BOUND_DB: f32 = 3.0e-4;
/// Relative bound on the SWR from [`return_loss_to_swr`] (RL ≥ 0.2 dB), [`swr_at_load`] and
/// [`swr_at_input`] (SWR ≤ 20), against the f64 result for the same Q16.16 inputs (measured
/// worst 2.0e-5).
pub const SWR_BOUND_REL: f32 = 5.0e-5;

pub use crate::fixed::{DbQ16, VswrQ16};

/// 100 dB, the largest return loss or total loss reported (the crate's `DB_CEILING`).
pub const DB_CEILING: DbQ16 = DbQ16::from_bits(crate::fixed::q::DB_CEILING_Q16);

const ONE_Q16: i64 = 1 << 16;
const ONE_Q32: u64 = 1 << 32;

/// SWR and return loss at the load, from a reading at the input.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LoadVswrQ16 {
    /// VSWR at the load.
    pub swr: VswrQ16,
    /// Return loss at the load.
    pub return_loss: DbQ16,
    /// True when RL_in − 2·ML < 0 (the reading is more reflective than the line's loss
    /// allows) and the load was clamped to a total reflection.
    pub clamped: bool,
}

// ---- integer helpers ----

/// 2^(2^−k) in Q2.30 for k = 1..=20 (rounded; computed with f64).
const EXP2_TABLE: [u64; 20] = [
    1_518_500_250,
    1_276_901_417,
    1_170_923_762,
    1_121_280_436,
    1_097_253_708,
    1_085_434_106,
    1_079_572_136,
    1_076_653_033,
    1_075_196_443,
    1_074_468_888,
    1_074_105_294,
    1_073_923_544,
    1_073_832_680,
    1_073_787_251,
    1_073_764_537,
    1_073_753_181,
    1_073_747_502,
    1_073_744_663,
    1_073_743_244,
    1_073_742_534,
];

/// 10·log10(2) in Q4.28.
const TEN_LOG10_2_Q28: i64 = 808_071_242;
/// 20·log10(2) in Q4.28.
const TWENTY_LOG10_2_Q28: i64 = 1_616_142_483;
/// log2(10)/10 in Q4.28.
const LOG2_10_OVER_10_Q28: i64 = 89_172_328;
/// log2(10)/20 in Q4.28.
const LOG2_10_OVER_20_Q28: i64 = 44_586_164;

/// log2(x / 2^frac_bits) in Q.20; `None` for x = 0. `frac_bits` ≤ 63.
fn log2_q20(x: u64, frac_bits: u32) -> Option<i64> {
    if x == 0 {
        return None;
    }
    let msb = 63u32.saturating_sub(x.leading_zeros()); // 0..=63 for x ≠ 0
    let int = i64::from(msb).wrapping_sub(i64::from(frac_bits.min(63)));
    // Normalise to y in [2^31, 2^32): y/2^31 in [1, 2). Shift amounts are < 64.
    let mut y: u64 = if msb >= 31 {
        x.wrapping_shr(msb.wrapping_sub(31))
    } else {
        x.wrapping_shl(31u32.wrapping_sub(msb))
    };
    let mut frac: i64 = 0;
    for _ in 0..20 {
        // y < 2^32, so y² < 2^64.
        y = y.wrapping_mul(y) >> 31;
        frac <<= 1;
        if y >= ONE_Q32 {
            y >>= 1;
            frac |= 1;
        }
    }
    // |int| ≤ 63, frac < 2^20.
    Some(int.wrapping_mul(1 << 20).wrapping_add(frac))
}

/// 2^(x/2^20) for x ≤ 0 as Q0.32 (1.0 = 2^32).
fn exp2_neg_q20_to_q32(x: i64) -> u64 {
    let x = x.min(0);
    let n = x >> 20; // floor, ≤ 0
    let f = x & ((1 << 20) - 1); // 0..2^20
    let mut acc: u64 = 1 << 30;
    let mut bit: i64 = 1 << 19; // 2^−1 in Q20, then 2^−2, …
    for c in EXP2_TABLE.iter() {
        if f & bit != 0 {
            // acc < 2^31 and c < 2^31: the product < 2^62.
            acc = acc.wrapping_mul(*c).wrapping_add(1 << 29) >> 30;
        }
        bit >>= 1;
    }
    // acc in [2^30, 2^31) is 2^f in Q2.30; ×4 → Q0.32, then ÷ 2^−n.
    let shift = n.unsigned_abs();
    if shift >= 40 {
        0
    } else {
        // shift < 40 (checked above).
        acc.wrapping_shl(2).wrapping_shr(shift as u32)
    }
}

fn clamp_db(x: i64) -> DbQ16 {
    DbQ16::from_bits(x.clamp(0, i64::from(DB_CEILING.to_bits())) as i32)
}

/// Q20 log2 × Q28 constant → Q16 dB, rounded.
fn log2_to_db(l_q20: i64, k_q28: i64) -> i64 {
    // |l| ≤ 64·2^20 = 2^26 and k < 2^31: the product < 2^57.
    l_q20.wrapping_mul(k_q28).wrapping_add(1 << 31) >> 32
}

/// 10^(−db/div) as Q0.32 for db ≥ 0 (Q16), with div's log2(10)/div constant.
fn pow10_neg(db: DbQ16, k_q28: i64) -> u64 {
    // Clamp to 0..=2^24 (256 dB): the product < 2^24 · 2^27 = 2^51.
    let d = i64::from(db.to_bits()).clamp(0, 1 << 24);
    let x = -(d.wrapping_mul(k_q28).wrapping_add(1 << 23) >> 24);
    exp2_neg_q20_to_q32(x)
}

/// |Γ| (Q0.32) → SWR.
fn gamma_q32_to_swr(g: u64) -> VswrQ16 {
    let g = g.min(ONE_Q32);
    let den = ONE_Q32.saturating_sub(g);
    // (1 + g) ≤ 2^33, << 16 ≤ 2^49.
    let num = ONE_Q32.wrapping_add(g).wrapping_shl(16);
    let Some(s) = num.wrapping_add(den / 2).checked_div(den) else {
        return VswrQ16::CEILING;
    };
    VswrQ16::from_bits(s.clamp(
        VswrQ16::ONE.to_bits() as u64,
        VswrQ16::CEILING.to_bits() as u64,
    ) as u32)
}

/// 10·log10(1 − 10^(−RL/10)) in Q16 (≤ 0); `None` when RL = 0 (total reflection).
fn delivered_db(rl: DbQ16) -> Option<i64> {
    let p = pow10_neg(rl, LOG2_10_OVER_10_Q28).min(ONE_Q32);
    let q = ONE_Q32.saturating_sub(p);
    let l = log2_q20(q, 32)?;
    Some(log2_to_db(l, TEN_LOG10_2_Q28).min(0))
}

fn non_negative(db: DbQ16) -> Result<DbQ16, LineError> {
    if db.to_bits() < 0 {
        Err(LineError::OutOfRange)
    } else {
        Ok(db)
    }
}

// ---- public relations ----

/// Matched loss from the return loss of the line with an open or short at its far end:
/// RL/2, rounded (RL capped at 100 dB first). Negative RL is refused.
pub fn matched_loss_from_open_short(rl: DbQ16) -> Result<DbQ16, LineError> {
    let r = non_negative(rl)?.to_bits().min(DB_CEILING.to_bits());
    // r ≤ 100·2^16: no overflow.
    Ok(DbQ16::from_bits(r.wrapping_add(1) >> 1))
}

/// Return loss 20·log10((S + 1)/(S − 1)), capped at 100 dB (SWR 1.0 reads 100 dB).
pub fn swr_to_return_loss(swr: VswrQ16) -> DbQ16 {
    let s = u64::from(swr.to_bits());
    let den = s.saturating_sub(ONE_Q16 as u64);
    let num = s.wrapping_add(ONE_Q16 as u64); // s < 2^32
    match (log2_q20(num, 16), log2_q20(den, 16)) {
        (Some(a), Some(b)) => clamp_db(log2_to_db(a.wrapping_sub(b), TWENTY_LOG10_2_Q28)),
        _ => DB_CEILING,
    }
}

/// SWR from a return loss (≥ 0): |Γ| = 10^(−RL/20), S = (1 + |Γ|)/(1 − |Γ|). RL = 0 gives
/// the SWR ceiling; RL at the 100 dB ceiling gives 1.0.
pub fn return_loss_to_swr(rl: DbQ16) -> Result<VswrQ16, LineError> {
    let rl = non_negative(rl)?;
    if rl >= DB_CEILING {
        return Ok(VswrQ16::ONE);
    }
    Ok(gamma_q32_to_swr(pow10_neg(rl, LOG2_10_OVER_20_Q28)))
}

/// Return loss at the load: RL_in − 2·ML, clamped at 0 dB (flagged).
pub fn return_loss_at_load(rl_in: DbQ16, matched_loss: DbQ16) -> Result<LoadVswrQ16, LineError> {
    let rl = i64::from(non_negative(rl_in)?.to_bits());
    let ml = i64::from(non_negative(matched_loss)?.to_bits());
    let rl_load = rl.saturating_sub(ml.saturating_mul(2));
    let clamped = rl_load < 0;
    let r = clamp_db(rl_load);
    Ok(LoadVswrQ16 {
        swr: return_loss_to_swr(r)?,
        return_loss: r,
        clamped,
    })
}

/// SWR at the load from the SWR read at the input and the matched loss, through return loss.
/// A perfect match at the input (SWR 1.0) stays a perfect match.
pub fn swr_at_load(swr_in: VswrQ16, matched_loss: DbQ16) -> Result<LoadVswrQ16, LineError> {
    non_negative(matched_loss)?;
    if swr_in == VswrQ16::ONE {
        return Ok(LoadVswrQ16 {
            swr: VswrQ16::ONE,
            return_loss: DB_CEILING,
            clamped: false,
        });
    }
    return_loss_at_load(swr_to_return_loss(swr_in), matched_loss)
}

/// SWR at the input from the SWR at the load: RL_in = RL_load + 2·ML.
pub fn swr_at_input(swr_load: VswrQ16, matched_loss: DbQ16) -> Result<VswrQ16, LineError> {
    let ml = i64::from(non_negative(matched_loss)?.to_bits());
    if swr_load == VswrQ16::ONE {
        return Ok(VswrQ16::ONE);
    }
    let rl = i64::from(swr_to_return_loss(swr_load).to_bits()).saturating_add(ml.saturating_mul(2));
    return_loss_to_swr(clamp_db(rl))
}

/// Total loss with mismatch from the matched loss and the return loss at the load, capped at
/// 100 dB (a total reflection at the load, RL = 0, gives the cap).
pub fn total_loss_from_return_loss(
    matched_loss: DbQ16,
    rl_load: DbQ16,
) -> Result<DbQ16, LineError> {
    let ml = i64::from(non_negative(matched_loss)?.to_bits());
    let rl = non_negative(rl_load)?;
    let rl_in = DbQ16::from_bits(
        i64::from(rl.to_bits())
            .saturating_add(ml.saturating_mul(2))
            .min(1 << 24) as i32,
    );
    let Some(load) = delivered_db(rl) else {
        return Ok(DB_CEILING);
    };
    let input = delivered_db(rl_in).unwrap_or(load);
    let t = ml.saturating_add(input).saturating_sub(load).max(ml);
    Ok(clamp_db(t))
}

/// Total loss with mismatch from the matched loss and the SWR at the load.
pub fn total_loss(matched_loss: DbQ16, swr_load: VswrQ16) -> Result<DbQ16, LineError> {
    non_negative(matched_loss)?;
    if swr_load == VswrQ16::ONE {
        return Ok(clamp_db(i64::from(matched_loss.to_bits())));
    }
    total_loss_from_return_loss(matched_loss, swr_to_return_loss(swr_load))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn db(x: f64) -> DbQ16 {
        DbQ16::from_bits((x * 65536.0).round() as i32)
    }

    fn swr(x: f64) -> VswrQ16 {
        VswrQ16::from_bits((x * 65536.0).round() as u32)
    }

    #[test]
    fn helpers_against_libm_f64() {
        // log2 over 24 orders of magnitude, exp2 over −30..0 (libm f64 as the reference).
        let mut x: u64 = 3;
        while x < (1u64 << 62) {
            let got = log2_q20(x, 16).unwrap() as f64 / 1048576.0;
            let want = libm::log2(x as f64 / 65536.0);
            assert!((got - want).abs() < 2.0e-6, "log2 {x}: {got} {want}");
            x = x * 7 + 1;
        }
        let mut q: i64 = 0;
        while q > -30 * (1 << 20) {
            let got = exp2_neg_q20_to_q32(q) as f64 / 4294967296.0;
            let want = libm::exp2(q as f64 / 1048576.0);
            assert!(
                (got - want).abs() <= want * 2.0e-6 + 1.0e-9,
                "exp2 {q}: {got} {want}"
            );
            q -= 123_457;
        }
        assert_eq!(exp2_neg_q20_to_q32(0), ONE_Q32);
        assert_eq!(log2_q20(0, 16), None);
    }

    #[test]
    fn worked_values() {
        // SWR 2 → RL 20·log10 3 = 9.5424 dB; SWR 1.5 → 13.979 dB (relations of crate::reflection).
        assert!((swr_to_return_loss(swr(2.0)).to_f32() - 9.5424).abs() < RL_BOUND_DB);
        assert!((swr_to_return_loss(swr(1.5)).to_f32() - 13.9794).abs() < RL_BOUND_DB);
        assert_eq!(swr_to_return_loss(VswrQ16::ONE), DB_CEILING);
        let s = return_loss_to_swr(db(9.542_425)).unwrap().to_f32();
        assert!((s - 2.0).abs() < 2.0 * SWR_BOUND_REL, "{s}");
        assert_eq!(return_loss_to_swr(DbQ16::ZERO).unwrap(), VswrQ16::CEILING);
        // Open/short RL 7.3 dB → 3.65 dB matched loss.
        // (Half of an odd raw value rounds up: within one Q16.16 step.)
        let ml = matched_loss_from_open_short(db(7.3)).unwrap();
        assert!((ml.to_bits() - db(3.65).to_bits()).abs() <= 1);
        assert!(matched_loss_from_open_short(db(-1.0)).is_err());
        // ML 1 dB, SWR 3 at the load: 1.504 dB total (handbook formula, by hand; see
        // feed_loss tests).
        let t = total_loss(db(1.0), swr(3.0)).unwrap().to_f32();
        assert!((t - 1.504).abs() < 1.0e-3, "{t}");
        assert!(total_loss(db(2.0), VswrQ16::CEILING).unwrap().to_f32() < 100.0);
        assert_eq!(
            total_loss_from_return_loss(db(2.0), DbQ16::ZERO).unwrap(),
            DB_CEILING
        );
        // SWR 2 at the analyzer through 1 dB: RL_load = 9.542 − 2 = 7.542 dB → SWR 2.44.
        let l = swr_at_load(swr(2.0), db(1.0)).unwrap();
        assert!((l.return_loss.to_f32() - 7.5424).abs() < RL_BOUND_DB && !l.clamped);
        let back = swr_at_input(l.swr, db(1.0)).unwrap().to_f32();
        assert!((back - 2.0).abs() < 2.0 * 3.0 * SWR_BOUND_REL, "{back}");
        assert!(swr_at_load(swr(5.0), db(6.0)).unwrap().clamped);
        assert_eq!(
            swr_at_load(VswrQ16::ONE, db(3.0)).unwrap().swr,
            VswrQ16::ONE
        );
    }

    #[test]
    fn extremes_do_not_panic() {
        for raw in [0i32, 1, 65535, i32::MAX, i32::MIN, -1] {
            let d = DbQ16::from_bits(raw);
            let _ = matched_loss_from_open_short(d);
            let _ = return_loss_to_swr(d);
            let _ = total_loss_from_return_loss(d, d);
            let _ = total_loss(d, VswrQ16::CEILING);
            let _ = swr_at_load(VswrQ16::CEILING, d);
            let _ = swr_at_input(VswrQ16::ONE, d);
            let _ = return_loss_at_load(d, d);
        }
        for raw in [65536u32, 65537, u32::MAX] {
            let s = VswrQ16::from_bits(raw);
            let _ = swr_to_return_loss(s);
            let _ = total_loss(DbQ16::from_bits(i32::MAX), s);
        }
    }
}
