//! TEMPORARY: an f32 (soft-float) LineMath until `feedline::fixed` lands; then deleted.

use feedline::monitor::{LineFigures, LineMath, PowerReading, Q16_ONE};

/// f32 chain.
pub struct Chain;

impl LineMath for Chain {
    fn figures(&self, r: PowerReading) -> LineFigures {
        if r.reflected_uw >= r.forward_uw {
            return LineFigures {
                vswr_q16: 1000 * Q16_ONE,
                return_loss_q16: 0,
            };
        }
        if r.reflected_uw == 0 {
            return LineFigures {
                vswr_q16: Q16_ONE,
                return_loss_q16: 100 * Q16_ONE,
            };
        }
        let ratio = r.reflected_uw as f32 / r.forward_uw as f32;
        let g = libm::sqrtf(ratio);
        let v = ((1.0 + g) / (1.0 - g)).min(1000.0);
        let rl = (-10.0 * libm::log10f(ratio)).min(100.0);
        LineFigures {
            vswr_q16: (v * 65536.0) as u32,
            return_loss_q16: (rl * 65536.0) as u32,
        }
    }
}
