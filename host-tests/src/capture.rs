//! Captured sweeps as text, and the invented demo scenario behind the README picture.
//!
//! The capture format is feedline's own: `#` header lines `# key: value` (title, z0, vf,
//! loss_k1, loss_k2), then one point per line, `<frequency Hz> <Re Γ> <Im Γ>`.

use crate::reference::line_faults::{Discontinuity, FaultyLine};
use crate::reference::series_rlc::SeriesRlc;
use num_complex::Complex64;
use std::fmt::Write;

/// A captured sweep of complex Γ with what is known of the cable.
#[derive(Clone, Debug, PartialEq)]
pub struct Capture {
    /// What was measured.
    pub title: String,
    /// Reference impedance, Ω.
    pub z0: f64,
    /// Velocity factor of the cable.
    pub vf: f64,
    /// Cable loss fit k1 (dB/m at 1 MHz) and k2 (dB/m per MHz).
    pub loss: (f64, f64),
    /// (frequency Hz, Γ), increasing frequency, linearly spaced.
    pub points: Vec<(f64, Complex64)>,
}

impl Capture {
    /// The capture as text.
    pub fn to_text(&self) -> String {
        let mut s = String::new();
        let _ = writeln!(s, "# title: {}", self.title);
        let _ = writeln!(s, "# z0: {}", self.z0);
        let _ = writeln!(s, "# vf: {}", self.vf);
        let _ = writeln!(s, "# loss_k1: {}", self.loss.0);
        let _ = writeln!(s, "# loss_k2: {}", self.loss.1);
        for (f, g) in &self.points {
            let _ = writeln!(s, "{f} {:.7} {:.7}", g.re, g.im);
        }
        s
    }

    /// Read a capture written by [`Capture::to_text`].
    pub fn parse(text: &str) -> Result<Self, String> {
        let mut c = Capture {
            title: String::new(),
            z0: 50.0,
            vf: 1.0,
            loss: (0.0, 0.0),
            points: Vec::new(),
        };
        for (i, line) in text.lines().enumerate() {
            let line = line.trim();
            if line.is_empty() {
                continue;
            }
            if let Some(h) = line.strip_prefix('#') {
                let (k, v) = h.split_once(':').ok_or(format!("line {}: header", i + 1))?;
                let v = v.trim();
                let num = || v.parse::<f64>().map_err(|_| format!("line {}: {v}", i + 1));
                match k.trim() {
                    "title" => c.title = v.to_string(),
                    "z0" => c.z0 = num()?,
                    "vf" => c.vf = num()?,
                    "loss_k1" => c.loss.0 = num()?,
                    "loss_k2" => c.loss.1 = num()?,
                    _ => {}
                }
                continue;
            }
            let v: Vec<f64> = line
                .split_whitespace()
                .map(|t| t.parse::<f64>().map_err(|_| format!("line {}: {t}", i + 1)))
                .collect::<Result<_, _>>()?;
            if v.len() != 3 {
                return Err(format!("line {}: 3 numbers expected", i + 1));
            }
            c.points.push((v[0], Complex64::new(v[1], v[2])));
        }
        Ok(c)
    }
}

/// The invented demo: a 2 m band ground-plane antenna (series RLC, f0 145 MHz, Q 7, R 42 Ω) at
/// the end of 12 m of feeder (VF 0.66, k1 0.014, k2 0.0002) with a wet connector of 22 dB
/// return loss at 4.5 m, swept 50–250 MHz in 256 points.
pub fn demo_capture() -> Capture {
    let line = FaultyLine {
        vf: 0.66,
        k1: 0.014,
        k2: 0.0002,
        faults: vec![Discontinuity::with_return_loss(4.5, 22.0)],
        length: 12.0,
        end_gamma: Complex64::new(0.0, 0.0),
    };
    let antenna = SeriesRlc::from_f0_q(145.0e6, 7.0, 42.0);
    let (start, stop, n) = (50.0e6, 250.0e6, 256usize);
    let points = (0..n)
        .map(|k| {
            let f = start + (stop - start) * k as f64 / (n - 1) as f64;
            (f, line.gamma_with_end(f, antenna.gamma(f, 50.0)))
        })
        .collect();
    Capture {
        title: "demo: 2 m ground plane behind 12 m feeder, wet connector at 4.5 m".into(),
        z0: 50.0,
        vf: line.vf,
        loss: (line.k1, line.k2),
        points,
    }
}
