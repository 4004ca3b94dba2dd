//! f64 reference for the scalar per-reading chain: detector law → |Γ| → VSWR, return loss,
//! mismatch loss, directivity bounds, matched cable loss.
//!
//! Sources: the reflection relations are those of any transmission-line text
//! (VSWR = (1+|Γ|)/(1−|Γ|), RL = −20·log10|Γ| in the IEEE Std 100 positive sense,
//! ML = −10·log10(1−|Γ|²)); the bounds are the first-order directivity argument
//! |Γ| ± 10^(−D/20); the cable loss is RL/2 for an open or shorted far end (common practice).

/// |Γ| → VSWR.
pub fn vswr(gamma: f64) -> f64 {
    (1.0 + gamma) / (1.0 - gamma)
}

/// |Γ| → return loss in positive dB.
pub fn return_loss(gamma: f64) -> f64 {
    -20.0 * gamma.log10()
}

/// |Γ| → mismatch loss in dB.
pub fn mismatch_loss(gamma: f64) -> f64 {
    -10.0 * (1.0 - gamma * gamma).log10()
}

/// Return loss → |Γ|.
pub fn gamma_from_return_loss(rl_db: f64) -> f64 {
    10f64.powf(-rl_db / 20.0)
}

/// VSWR → |Γ|.
pub fn gamma_from_vswr(s: f64) -> f64 {
    (s - 1.0) / (s + 1.0)
}

/// Mismatch loss → |Γ|.
pub fn gamma_from_mismatch_loss(ml_db: f64) -> f64 {
    (1.0 - 10f64.powf(-ml_db / 10.0)).sqrt()
}

/// Detector laws of the reference.
#[derive(Clone, Copy, Debug)]
pub enum Law {
    /// Output ∝ amplitude.
    Linear,
    /// Output ∝ power.
    SquareLaw,
    /// Output ∝ dB, with this slope in V/dB.
    Log(f64),
}

/// Return loss from two detector outputs.
pub fn return_loss_from_outputs(law: Law, forward: f64, reflected: f64) -> f64 {
    match law {
        Law::Linear => 20.0 * (forward / reflected).log10(),
        Law::SquareLaw => 10.0 * (forward / reflected).log10(),
        Law::Log(slope) => (forward - reflected) / slope,
    }
}

/// (|Γ| low, |Γ| high) for a reading through a bridge of directivity `d_db`.
pub fn directivity_gamma_bounds(gamma: f64, d_db: f64) -> (f64, f64) {
    let e = 10f64.powf(-d_db / 20.0);
    ((gamma - e).max(0.0), (gamma + e).min(1.0))
}

/// Matched cable loss from the return loss of an open- or short-ended line.
pub fn matched_loss_open_short(rl_db: f64) -> f64 {
    rl_db / 2.0
}

/// Nepers → decibels: 20·log10(e).
pub fn np_to_db(np: f64) -> f64 {
    np * 20.0 * std::f64::consts::E.log10()
}
