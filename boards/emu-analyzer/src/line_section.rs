//! Section `[line model ...]`: the scenario cable described by the core's line models
//! (`feedline::line`): the datasheet fit α(f) = k1·√f + k2·f, the line at the scenario
//! frequency, and what the feed line does to the reading — matched loss, SWR at the antenna
//! beside SWR at the analyzer, and total loss with the mismatch ([`LossModel::feed_report`]).
//!
//! The SWR at the analyzer is the `[reading]` section's measurement (its value and its
//! directivity range); each is carried to the antenna end by the core.

use crate::scenario::Scenario;
use core::fmt::{Result, Write};
use feedline::bridge::{Fault, Measurement};
use feedline::line::{FeedReport, LossModel};
use feedline::reflection::Vswr;
use feedline::units::{Hertz, Meters};

fn report_for(m: &LossModel, s: &Scenario, v: Vswr) -> Option<FeedReport> {
    m.feed_report(Hertz::new(s.freq_mhz * 1.0e6), Meters::new(s.cable_m), v)
        .ok()
}

/// Prints the section for the reading `result` taken at the analyzer.
pub fn print(
    w: &mut impl Write,
    s: &Scenario,
    result: &core::result::Result<Measurement, Fault>,
) -> Result {
    writeln!(w, "\n[line model: the feed line from its datasheet]")?;
    let f = Hertz::new(s.freq_mhz * 1.0e6);
    match s.cable_type {
        Some(c) => {
            writeln!(
                w,
                "  {:<16}{} ({}), velocity factor {}",
                "cable", c.name, c.title, c.vf
            )?;
            write!(w, "  {:<16}", "datasheet")?;
            for (i, (mhz, db)) in c.points.iter().enumerate() {
                write!(w, "{}{mhz} MHz {db}", if i == 0 { "" } else { ", " })?;
            }
            writeln!(w, " dB/100 m")?;
        }
        None => writeln!(
            w,
            "  {:<16}flat {} dB/100 m at {} MHz, taken as conductor loss (k2 = 0), \
             velocity factor {}",
            "cable", s.cable_db100, s.freq_mhz, s.vf
        )?,
    }
    let Some(model) = s.loss_model() else {
        return writeln!(w, "  {:<16}refused by the core's line model", "fit");
    };
    write!(
        w,
        "  {:<16}k1 {:.6e} dB/m/sqrt(MHz)  k2 {:.6e} dB/m/MHz",
        "fit",
        model.k1::<Meters>(),
        model.k2::<Meters>()
    )?;
    match s
        .cable_type
        .and_then(|c| model.worst_relative_error(&c.loss_points()).ok())
    {
        Some(e) => writeln!(w, "  worst {:.2} % off the datasheet", e * 100.0)?,
        None => writeln!(w)?,
    }
    if let Some(line) = crate::vector_sim::cable_line(s, f.value()) {
        writeln!(
            w,
            "  {:<16}{:.4} dB/100 m, {:.5} rad/m, wavelength on the line {:.4} m",
            "at frequency",
            line.attenuation::<Meters>().value() * 100.0,
            line.phase_constant::<Meters>().value(),
            line.wavelength::<Meters>().value()
        )?;
    }
    let m = match result {
        Ok(m) => m,
        Err(_) => {
            return writeln!(
                w,
                "  {:<16}not available: the reading was refused",
                "SWR analyzer"
            )
        }
    };
    let (Some(mid), Some(lo), Some(hi)) = (
        report_for(&model, s, m.reflection.vswr),
        report_for(&model, s, m.bounds().vswr_low),
        report_for(&model, s, m.bounds().vswr_high),
    ) else {
        return writeln!(
            w,
            "  {:<16}refused by the core's line model",
            "matched loss"
        );
    };
    writeln!(
        w,
        "  {:<16}{:.4} dB over {} m",
        "matched loss",
        mid.matched_loss.value(),
        s.cable_m
    )?;
    writeln!(
        w,
        "  {:<16}{:.5}      range {:.5} .. {:.5}",
        "SWR analyzer",
        mid.at_analyzer.value(),
        lo.at_analyzer.value(),
        hi.at_analyzer.value()
    )?;
    writeln!(
        w,
        "  {:<16}{:.5}      range {:.5} .. {:.5}{}",
        "SWR antenna",
        mid.at_load.vswr.value(),
        lo.at_load.vswr.value(),
        hi.at_load.vswr.value(),
        if mid.at_load.clamped || hi.at_load.clamped {
            "  (clamped: more reflection than the line's loss allows)"
        } else {
            ""
        }
    )?;
    writeln!(
        w,
        "  {:<16}{:.4} dB   range {:.4} .. {:.4} dB  (the mismatch adds {:.4} dB)",
        "total loss",
        mid.total_loss.value(),
        lo.total_loss.value(),
        hi.total_loss.value(),
        mid.total_loss.value() - mid.matched_loss.value()
    )
}
