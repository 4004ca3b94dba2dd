//! f64 reference for the integer chain (`feedline::fixed`): the scalar reflection
//! quantities of one reading, for each detector law, from the textbook transmission-line
//! relations (|Γ|, VSWR = (1+|Γ|)/(1−|Γ|), RL = −20·log10|Γ|, ML = −10·log10(1−|Γ|²); any
//! microwave-engineering text), evaluated in f64 with `std`.
//!
//! Written apart from the core: nothing here calls `feedline`. The forms are chosen to stay
//! accurate near a total reflection: 1 − |Γ| and 1 − |Γ|² come from exact integer
//! differences for code readings, and from `exp_m1` for dB readings, so the reference is
//! good to about 1e-12 relative, far below the bounds it checks.

/// The scalar quantities of one reading (uncapped; infinite for a perfect match or a
/// total reflection).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Scalars {
    /// |Γ|.
    pub gamma: f64,
    /// VSWR.
    pub vswr: f64,
    /// Return loss, positive dB.
    pub return_loss_db: f64,
    /// Mismatch loss, dB.
    pub mismatch_loss_db: f64,
}

/// Linear (amplitude) detector codes: |Γ| = r/f. Needs 0 < r < f.
pub fn linear_codes(forward: u16, reflected: u16) -> Scalars {
    let f = f64::from(forward);
    let r = f64::from(reflected);
    // f² − r² and f ± r are exact in f64 for 16-bit codes.
    Scalars {
        gamma: r / f,
        vswr: (f + r) / (f - r),
        return_loss_db: 20.0 * (f / r).log10(),
        mismatch_loss_db: 10.0 * (f * f / ((f - r) * (f + r))).log10(),
    }
}

/// Square-law (power) detector codes: |Γ|² = r/f. Needs 0 < r < f.
pub fn square_law_codes(forward: u16, reflected: u16) -> Scalars {
    let f = f64::from(forward);
    let r = f64::from(reflected);
    let gamma = (r / f).sqrt();
    let one_minus_g2 = (f - r) / f;
    // 1 − |Γ| = (1 − |Γ|²)/(1 + |Γ|), without cancellation.
    let one_minus_g = one_minus_g2 / (1.0 + gamma);
    Scalars {
        gamma,
        vswr: (1.0 + gamma) / one_minus_g,
        return_loss_db: 10.0 * (f / r).log10(),
        mismatch_loss_db: -10.0 * one_minus_g2.log10(),
    }
}

/// A level difference d = forward − reflected in dB (d > 0): |Γ| = 10^(−d/20).
pub fn db_difference(d_db: f64) -> Scalars {
    let y = d_db * std::f64::consts::LN_10 / 20.0; // −ln|Γ|
    let gamma = (-y).exp();
    let one_minus_g = -(-y).exp_m1();
    let one_minus_g2 = -(-2.0 * y).exp_m1();
    Scalars {
        gamma,
        vswr: (1.0 + gamma) / one_minus_g,
        return_loss_db: d_db,
        mismatch_loss_db: -10.0 * one_minus_g2.log10(),
    }
}

/// The input power of a logarithmic detector read by an ADC: V = code · step,
/// P = V / slope + intercept (the detector's straight-line law V = slope · (P − intercept)).
pub fn log_detector_dbm(
    code: u16,
    adc_nv_per_code: u32,
    slope_uv_per_db: i32,
    intercept_dbm: f64,
) -> f64 {
    let volts = f64::from(code) * f64::from(adc_nv_per_code) * 1e-9;
    volts / (f64::from(slope_uv_per_db) * 1e-6) + intercept_dbm
}

/// |Γ| ± leak with leak = 10^(−D/20), clamped to 0..=1: the directivity bounds of a reading.
pub fn directivity_gamma_bounds(gamma: f64, directivity_db: f64) -> (f64, f64) {
    let leak = 10f64.powf(-directivity_db / 20.0);
    ((gamma - leak).max(0.0), (gamma + leak).min(1.0))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Hand-checked values of the relations: |Γ| = 0.1 → VSWR 1.2222, RL 20 dB,
    /// ML 0.043648 dB; |Γ| = 0.5 → VSWR 3, RL 6.0206 dB, ML 1.249387 dB.
    #[test]
    fn textbook_values() {
        for s in [
            linear_codes(10_000, 1_000),
            square_law_codes(10_000, 100),
            db_difference(20.0),
        ] {
            assert!((s.gamma - 0.1).abs() < 1e-12);
            assert!((s.vswr - 11.0 / 9.0).abs() < 1e-12);
            assert!((s.return_loss_db - 20.0).abs() < 1e-12);
            assert!((s.mismatch_loss_db - 0.043_648_054).abs() < 1e-8);
        }
        let s = linear_codes(2, 1);
        assert!((s.vswr - 3.0).abs() < 1e-12 && (s.mismatch_loss_db - 1.249_387_366).abs() < 1e-8);
        let (lo, hi) = directivity_gamma_bounds(0.1, 30.0);
        assert!((lo - 0.068_377_223).abs() < 1e-8 && (hi - 0.131_622_777).abs() < 1e-8);
        assert!((log_detector_dbm(1000, 805_664, -25_000, 20.0) - -12.226_56).abs() < 1e-9);
    }
}
