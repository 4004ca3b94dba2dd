//! Scalar readings through a feed line of known matched loss ML: SWR (|Γ|, return loss) at the
//! load from the reading at the analyzer and the reverse, total loss with mismatch, and the
//! power delivered to the load.
//!
//! Relations (Pozar, *Microwave Engineering*, §2.7; ARRL Antenna Book, chapter on
//! transmission lines, "additional loss due to SWR", from memory):
//!
//! - |Γin| = |ΓL|·10^(−ML/10) (the reflection travels the line twice, 2·ML in dB), so
//!   RL_in = RL_load + 2·ML;
//! - total loss = 10·log10[(A² − |ΓL|²) / (A·(1 − |ΓL|²))], A = 10^(ML/10), the ratio of the
//!   net power into the line to the power delivered to the load. It is computed as
//!   ML + 10·log10(1 − |Γin|²) − 10·log10(1 − |ΓL|²) with log1p, which is the same expression
//!   and keeps its precision for small |Γ| and small ML;
//! - power at the load = P_forward,in · 10^(−ML/10) · (1 − |ΓL|²).
//!
//! Limits: an SWR at the analyzer that the line loss cannot explain (|Γin|·10^(ML/10) > 1,
//! e.g. a reading near total reflection through a lossy line) is clamped to a total
//! reflection at the load and flagged in [`LoadReading::clamped`]. A total reflection at the
//! load gives a total loss capped at [`DB_CEILING`].
//!
//! Panic policy: nothing in this module panics; no function returns NaN or infinity.

use super::{input, non_negative, output, LineError};
use crate::reflection::{Gamma, Vswr, DB_CEILING};
use crate::units::{Db, Watts};

const LN10_OVER_10: f32 = core::f32::consts::LN_10 / 10.0;
const TEN_OVER_LN10: f32 = 10.0 / core::f32::consts::LN_10;

/// What the load looks like, from a reading at the line's input.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LoadReading {
    /// |Γ| at the load.
    pub gamma: Gamma,
    /// VSWR at the load (capped at [`Vswr::CEILING`]).
    pub vswr: Vswr,
    /// Return loss at the load (positive dB, capped at [`DB_CEILING`]).
    pub return_loss: Db,
    /// True when the reading implied |ΓL| > 1 (more reflection than the line's loss allows)
    /// and was clamped to a total reflection.
    pub clamped: bool,
}

fn matched(ml: Db) -> Result<f32, LineError> {
    input(ml.value())?;
    non_negative(ml.value())
}

/// |ΓL| from |Γin| and the line's matched loss: |Γin|·10^(ML/10), clamped at 1.
pub fn gamma_at_load(gamma_in: Gamma, matched_loss: Db) -> Result<LoadReading, LineError> {
    let ml = matched(matched_loss)?;
    let g_in = gamma_in.value();
    // ln|ΓL| = ln|Γin| + ML·ln10/10, compared with 0 in the log domain so that 10^(ML/10)
    // never overflows.
    let (g, clamped) = if g_in > 0.0 {
        let ln_g = libm::logf(g_in) + ml * LN10_OVER_10;
        if ln_g > 0.0 {
            (1.0, true)
        } else {
            (libm::expf(ln_g), false)
        }
    } else {
        (0.0, false)
    };
    let gamma = Gamma::saturating(g);
    Ok(LoadReading {
        gamma,
        vswr: gamma.vswr(),
        return_loss: gamma.return_loss(),
        clamped,
    })
}

/// SWR at the load from the SWR read at the analyzer and the line's matched loss.
pub fn swr_at_load(vswr_in: Vswr, matched_loss: Db) -> Result<LoadReading, LineError> {
    gamma_at_load(vswr_in.gamma(), matched_loss)
}

/// Return loss at the load from the return loss at the analyzer: RL_in − 2·ML, clamped at
/// 0 dB (flagged).
pub fn return_loss_at_load(rl_in: Db, matched_loss: Db) -> Result<LoadReading, LineError> {
    let ml = matched(matched_loss)?;
    let rl = non_negative(rl_in.value())?;
    let rl_load = rl - 2.0 * ml;
    let clamped = rl_load < 0.0;
    let gamma = Gamma::from_return_loss(Db::new(rl_load.max(0.0))).unwrap_or(Gamma::TOTAL);
    Ok(LoadReading {
        gamma,
        vswr: gamma.vswr(),
        return_loss: Db::new(rl_load.clamp(0.0, DB_CEILING)),
        clamped,
    })
}

/// |Γin| = |ΓL|·10^(−ML/10): what the analyzer reads through the line.
pub fn gamma_at_input(gamma_load: Gamma, matched_loss: Db) -> Result<Gamma, LineError> {
    let ml = matched(matched_loss)?;
    Ok(Gamma::saturating(
        gamma_load.value() * libm::expf(-ml * LN10_OVER_10),
    ))
}

/// SWR at the analyzer from the SWR at the load and the line's matched loss.
pub fn swr_at_input(vswr_load: Vswr, matched_loss: Db) -> Result<Vswr, LineError> {
    Ok(gamma_at_input(vswr_load.gamma(), matched_loss)?.vswr())
}

/// 10·log10(1 − |Γ|²) as a negative dB value; `None` for |Γ| = 1.
fn log_delivered(g: f32) -> Option<f32> {
    let g2 = g * g;
    if g2 >= 1.0 {
        None
    } else {
        Some(TEN_OVER_LN10 * libm::log1pf(-g2))
    }
}

/// Total loss of the line with a mismatched load: net power into the line over power
/// delivered to the load, in dB (≥ ML). A total reflection at the load (|ΓL| = 1) gives
/// [`DB_CEILING`].
pub fn total_loss(matched_loss: Db, gamma_load: Gamma) -> Result<Db, LineError> {
    let ml = matched(matched_loss)?;
    let g = gamma_load.value();
    let g_in = g * libm::expf(-ml * LN10_OVER_10);
    let Some(load) = log_delivered(g) else {
        return Ok(Db::new(DB_CEILING));
    };
    // |Γin| < |ΓL| < 1 for ML > 0; for ML = 0 they are equal and the terms cancel.
    let inp = log_delivered(g_in).unwrap_or(load);
    let t = ml + inp - load;
    // max/min rather than clamp: clamp's own min ≤ max check would be a panic path.
    Ok(Db::new(output(t)?.max(ml.min(DB_CEILING)).min(DB_CEILING)))
}

/// The extra loss the mismatch causes: total loss − matched loss (≥ 0 dB).
pub fn additional_loss(matched_loss: Db, gamma_load: Gamma) -> Result<Db, LineError> {
    let t = total_loss(matched_loss, gamma_load)?;
    Ok(Db::new((t.value() - matched_loss.value()).max(0.0)))
}

/// Power delivered to the load for a forward power at the line's input:
/// P_fwd · 10^(−ML/10) · (1 − |ΓL|²). Forward power must be finite and ≥ 0.
pub fn power_at_load(
    forward_at_input: Watts,
    matched_loss: Db,
    gamma_load: Gamma,
) -> Result<Watts, LineError> {
    let p = non_negative(forward_at_input.value())?;
    let ml = matched(matched_loss)?;
    let g = gamma_load.value();
    let delivered = (1.0 - g * g).max(0.0);
    Ok(Watts::new(output(
        p * libm::expf(-ml * LN10_OVER_10) * delivered,
    )?))
}

/// Everything a user wants to know about the feed line from one SWR reading at the analyzer.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FeedReport {
    /// The line's matched (one-way) loss.
    pub matched_loss: Db,
    /// The SWR read at the analyzer.
    pub at_analyzer: Vswr,
    /// The load (antenna) seen through the line.
    pub at_load: LoadReading,
    /// Total loss with the mismatch at the load ([`total_loss`]).
    pub total_loss: Db,
}

/// The [`FeedReport`] for a line of known matched loss and an SWR read at the analyzer.
pub fn feed_report(matched_loss: Db, vswr_at_analyzer: Vswr) -> Result<FeedReport, LineError> {
    let at_load = swr_at_load(vswr_at_analyzer, matched_loss)?;
    Ok(FeedReport {
        matched_loss,
        at_analyzer: vswr_at_analyzer,
        at_load,
        total_loss: total_loss(matched_loss, at_load.gamma)?,
    })
}

impl super::propagation::Line {
    /// The [`FeedReport`] for `length` of this line and an SWR read at the analyzer.
    pub fn feed_report<U: crate::units::Length>(
        &self,
        length: U,
        vswr_at_analyzer: Vswr,
    ) -> Result<FeedReport, LineError> {
        feed_report(self.matched_loss(length)?, vswr_at_analyzer)
    }
}

impl super::loss_fit::LossModel {
    /// The [`FeedReport`] for `length` of cable of this model at `f` and an SWR read at the
    /// analyzer.
    pub fn feed_report<U: crate::units::Length>(
        &self,
        f: crate::units::Hertz,
        length: U,
        vswr_at_analyzer: Vswr,
    ) -> Result<FeedReport, LineError> {
        feed_report(self.loss(f, length)?, vswr_at_analyzer)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Absolute bound on the worked dB values (they are given to 3 decimals).
    const DB_BOUND: f32 = 2e-3;

    /// Handbook formula 10·log10[(A² − g²)/(A·(1 − g²))] evaluated directly.
    fn handbook(ml: f32, g: f32) -> f32 {
        let a = libm::powf(10.0, ml / 10.0);
        10.0 * libm::log10f((a * a - g * g) / (a * (1.0 - g * g)))
    }

    #[test]
    fn total_loss_vectors() {
        // (ML dB, SWR at load, total loss dB): by hand from the handbook formula.
        // ML 1 dB, SWR 3 (|Γ| = 0.5): A = 1.2589, (1.5849 − 0.25)/(1.2589·0.75) = 1.4139 →
        // 1.504 dB.
        let v = [(1.0f32, 3.0f32, 1.504f32), (3.0, 1.0, 3.0), (0.0, 5.0, 0.0)];
        for (ml, s, want) in v {
            let g = Gamma::from_vswr(s).unwrap();
            let t = total_loss(Db::new(ml), g).unwrap().value();
            assert!((t - want).abs() < DB_BOUND, "{ml} {s}: {t}");
            assert!((t - handbook(ml, g.value())).abs() < 1e-4, "{ml} {s}");
        }
        assert_eq!(
            total_loss(Db::new(1.0), Gamma::TOTAL).unwrap().value(),
            DB_CEILING
        );
        assert_eq!(
            total_loss(Db::new(0.0), Gamma::TOTAL).unwrap().value(),
            DB_CEILING
        );
        assert!(total_loss(Db::new(-1.0), Gamma::MATCHED).is_err());
        assert!(total_loss(Db::new(f32::NAN), Gamma::MATCHED).is_err());
    }

    #[test]
    fn swr_through_the_line() {
        // 3 dB of matched loss: a short at the far end reads RL 6 dB, |Γ| = 0.501, SWR 3.01.
        let s_in = swr_at_input(Vswr::new(Vswr::CEILING).unwrap(), Db::new(3.0)).unwrap();
        assert!((s_in.value() - 3.01).abs() < 0.01, "{}", s_in.value());
        // And back.
        let back = swr_at_load(Vswr::new(2.0).unwrap(), Db::new(1.0)).unwrap();
        let there = swr_at_input(back.vswr, Db::new(1.0)).unwrap();
        assert!((there.value() - 2.0).abs() < 1e-4);
        assert!(!back.clamped);
        // SWR 5 at the analyzer through 6 dB: impossible, clamped.
        let c = swr_at_load(Vswr::new(5.0).unwrap(), Db::new(6.0)).unwrap();
        assert!(c.clamped && c.gamma == Gamma::TOTAL);
        let r = return_loss_at_load(Db::new(14.0), Db::new(2.5)).unwrap();
        assert!((r.return_loss.value() - 9.0).abs() < 1e-6 && !r.clamped);
        assert!(
            return_loss_at_load(Db::new(4.0), Db::new(2.5))
                .unwrap()
                .clamped
        );
    }

    #[test]
    fn report() {
        // SWR 1.5 at the analyzer through 2 dB: |Γin| = 0.2, |ΓL| = 0.2·10^0.2 = 0.317,
        // SWR 1.928 at the load.
        let r = feed_report(Db::new(2.0), Vswr::new(1.5).unwrap()).unwrap();
        assert!((r.at_load.vswr.value() - 1.928).abs() < 1e-3, "{r:?}");
        assert!(r.total_loss.value() > 2.0 && r.total_loss.value() < 2.5);
        assert!(feed_report(Db::new(f32::NAN), Vswr::new(1.5).unwrap()).is_err());
    }

    #[test]
    fn power_delivered() {
        // 100 W forward, 3.0103 dB (half power), |ΓL| = 0.5: 50 W · 0.75 = 37.5 W.
        let p =
            power_at_load(Watts::new(100.0), Db::new(3.0103), Gamma::new(0.5).unwrap()).unwrap();
        assert!((p.value() - 37.5).abs() < 1e-3);
        assert!(power_at_load(Watts::new(-1.0), Db::new(1.0), Gamma::MATCHED).is_err());
    }
}
