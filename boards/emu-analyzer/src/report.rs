//! The readable report on the UART: one function per section, so later features (line
//! models, calibration, sweeps) add a section without touching the others.
//!
//! Layout: a title line, then sections headed `[name]`; inside, one quantity per line as a
//! label padded to 16 columns followed by its value, unit and `range LOW .. HIGH` where the
//! core gives bounds. The host tests parse these lines, so keep labels stable.

use crate::frontend::{Load, SimFrontEnd};
use crate::scenario::{ArgError, LawKind, Scenario, PRESETS, SECTIONS};
use core::fmt::{Result, Write};
use feedline::bridge::{Fault, Measurement, Quality, RawPair};
use feedline::cable::{CableError, CableLoss};
use feedline::detector::Adc;

/// The first line.
pub fn title(w: &mut impl Write) -> Result {
    writeln!(
        w,
        "feedline emulated analyzer -- QEMU mps2-an386 (Cortex-M4F)"
    )
}

fn write_load(w: &mut impl Write, load: Load) -> Result {
    match load {
        Load::Open => write!(w, "open circuit"),
        Load::Short => write!(w, "short circuit"),
        Load::Impedance { r, x } if x < 0.0 => write!(w, "{r} -j{} ohm", -x),
        Load::Impedance { r, x } => write!(w, "{r} +j{x} ohm"),
    }
}

/// The options that reproduce this run exactly.
pub fn replay_options(w: &mut impl Write, s: &Scenario) -> Result {
    write!(w, "--scenario {} --z0 {}", s.name, s.z0)?;
    match s.load {
        Load::Open => write!(w, " --load open")?,
        Load::Short => write!(w, " --load short")?,
        Load::Impedance { r, x } => write!(w, " --load-r {r} --load-x {x}")?,
    }
    write!(w, " --cable-m {}", s.cable_m)?;
    match s.cable_type {
        Some(c) => write!(w, " --cable {}", c.name)?,
        None => write!(w, " --cable-db100 {}", s.cable_db100)?,
    }
    write!(
        w,
        " --vf {} --freq-mhz {} --directivity {} --leak-phase {}",
        s.vf, s.freq_mhz, s.directivity, s.leak_phase
    )?;
    write!(w, " --law {}", s.law.name())?;
    match s.law {
        LawKind::Log => write!(
            w,
            " --drive-dbm {} --log-slope {} --log-intercept {}",
            s.drive_dbm, s.log_slope, s.log_intercept
        )?,
        _ => write!(w, " --level {}", s.level)?,
    }
    write!(
        w,
        " --adc-bits {} --vref {} --offset {} --noise {} --avg {} --seed {} --floor-lsb {}",
        s.adc_bits, s.vref, s.offset, s.noise, s.avg, s.seed, s.floor_lsb
    )?;
    write!(
        w,
        " --e00-mag {} --e00-deg {} --e11-mag {} --e11-deg {} --track-mag {} --track-deg {}",
        s.e00.0, s.e00.1, s.e11.0, s.e11.1, s.track.0, s.track.1
    )?;
    write!(
        w,
        " --sweep-start-mhz {} --sweep-stop-mhz {} --points {} --ant-f0-mhz {} --ant-q {} \
         --ant-r {} --fault-m {} --fault-rl {}",
        s.sweep_start_mhz,
        s.sweep_stop_mhz,
        s.points,
        s.ant_f0_mhz,
        s.ant_q,
        s.ant_r,
        s.fault_m,
        s.fault_rl
    )?;
    write!(w, " --sections ")?;
    let mut first = true;
    for (sec, name) in SECTIONS {
        if s.has(sec) {
            write!(w, "{}{name}", if first { "" } else { "+" })?;
            first = false;
        }
    }
    Ok(())
}

/// The scenario: what is simulated, in words and as options.
pub fn scenario(w: &mut impl Write, s: &Scenario) -> Result {
    writeln!(w, "\n[scenario]")?;
    writeln!(w, "  {:<16}{} -- {}", "name", s.name, s.title)?;
    write!(w, "  {:<16}", "load")?;
    write_load(w, s.load)?;
    writeln!(w, " in a {} ohm system", s.z0)?;
    match s.cable_type {
        Some(c) => writeln!(
            w,
            "  {:<16}{} m of {} ({}), {:.3} dB/100 m at {} MHz by its model, velocity factor {}",
            "cable",
            s.cable_m,
            c.name,
            c.title,
            s.loss_db100(),
            s.freq_mhz,
            s.vf
        )?,
        None => writeln!(
            w,
            "  {:<16}{} m, {} dB/100 m matched loss, velocity factor {}, at {} MHz",
            "cable", s.cable_m, s.cable_db100, s.vf, s.freq_mhz
        )?,
    }
    writeln!(
        w,
        "  {:<16}directivity {} dB, leakage phase {} deg",
        "bridge", s.directivity, s.leak_phase
    )?;
    match s.law {
        LawKind::Log => writeln!(
            w,
            "  {:<16}log, {} V/dB, intercept {} dBm, forward at {} dBm",
            "detector", s.log_slope, s.log_intercept, s.drive_dbm
        )?,
        law => writeln!(
            w,
            "  {:<16}{}, forward at {} of full scale",
            "detector",
            law.name(),
            s.level
        )?,
    }
    writeln!(
        w,
        "  {:<16}{} bit, {} V reference, offset {} codes, noise {} LSB rms, floor {} LSB",
        "adc", s.adc_bits, s.vref, s.offset, s.noise, s.floor_lsb
    )?;
    writeln!(
        w,
        "  {:<16}{} reads per reading, seed {}",
        "averaging", s.avg, s.seed
    )?;
    write!(w, "  {:<16}", "replay with")?;
    replay_options(w, s)?;
    writeln!(w)
}

fn fault_text(f: Fault) -> &'static str {
    match f {
        Fault::NotFinite => "a reading is not a number",
        Fault::Negative => "a detector reads below zero",
        Fault::ForwardSaturated => "forward channel saturated: reduce the drive",
        Fault::ReflectedSaturated => "reflected channel saturated: reduce the drive",
        Fault::ForwardBelowFloor => "forward channel at the noise floor: no signal to measure",
        Fault::ReflectedAboveForward => {
            "reflected exceeds forward: noise, or the bridge connected backwards"
        }
        Fault::BadConfig => "the bridge configuration is unusable",
    }
}

/// The quality verdict: `good`, `caution: ...` with each flag, or `refused: ...`.
pub fn verdict(w: &mut impl Write, result: &core::result::Result<Measurement, Fault>) -> Result {
    write!(w, "  {:<16}", "verdict")?;
    let q = match result {
        Err(f) => return writeln!(w, "refused: {}", fault_text(*f)),
        Ok(m) => m.quality,
    };
    if q.is_good() {
        return writeln!(w, "good");
    }
    write!(w, "caution:")?;
    let flags = [
        (
            Quality::REFLECTED_AT_FLOOR,
            "reflected at the noise floor, return loss is a lower bound",
        ),
        (
            Quality::CLAMPED_TOTAL,
            "reflected a little above forward, taken as total reflection",
        ),
        (
            Quality::BEYOND_DIRECTIVITY,
            "within the bridge's leakage of a perfect match",
        ),
        (Quality::CAPPED, "a value at the instrument's ceiling"),
    ];
    let mut first = true;
    for (flag, text) in flags {
        if q.contains(flag) {
            write!(w, "{}{}", if first { " " } else { "; " }, text)?;
            first = false;
        }
    }
    writeln!(w)
}

/// The raw codes and their volts.
pub fn raw(w: &mut impl Write, adc: &Adc, raw: RawPair, avg: u16) -> Result {
    writeln!(
        w,
        "  {:<16}forward {}  reflected {}  (mean of {} reads)",
        "codes", raw.forward, raw.reflected, avg
    )?;
    let volts = |c: u16| adc.volts(u32::from(c)).map(|v| v.value());
    match (volts(raw.forward), volts(raw.reflected)) {
        (Ok(f), Ok(r)) => writeln!(w, "  {:<16}forward {f:.5} V  reflected {r:.5} V", "volts"),
        _ => writeln!(w, "  {:<16}at full scale", "volts"),
    }
}

/// |Γ|, VSWR, return loss, mismatch loss with their ranges.
pub fn reflection(w: &mut impl Write, m: &Measurement) -> Result {
    let r = &m.reflection;
    let b = m.bounds();
    writeln!(
        w,
        "  {:<16}{:.6}     range {:.6} .. {:.6}",
        "|Γ|",
        r.gamma.value(),
        b.gamma_low.value(),
        b.gamma_high.value()
    )?;
    writeln!(
        w,
        "  {:<16}{:.5}      range {:.5} .. {:.5}",
        "VSWR",
        r.vswr.value(),
        b.vswr_low.value(),
        b.vswr_high.value()
    )?;
    writeln!(
        w,
        "  {:<16}{:.4} dB   range {:.4} .. {:.4} dB",
        "return loss",
        r.return_loss.value(),
        b.return_loss_low.value(),
        b.return_loss_high.value()
    )?;
    writeln!(
        w,
        "  {:<16}{:.5} dB  range {:.5} .. {:.5} dB",
        "mismatch loss",
        r.mismatch_loss.value(),
        b.gamma_low.mismatch_loss().value(),
        b.gamma_high.mismatch_loss().value()
    )
}

/// One whole reading: section heading, codes, quantities, verdict.
pub fn reading(
    w: &mut impl Write,
    heading: &str,
    adc: &Adc,
    codes: RawPair,
    avg: u16,
    result: &core::result::Result<Measurement, Fault>,
) -> Result {
    writeln!(w, "\n[{heading}]")?;
    raw(w, adc, codes, avg)?;
    if let Ok(m) = result {
        reflection(w, m)?;
    }
    verdict(w, result)
}

/// One end of the cable check: the end's codes, return loss and the loss it implies.
pub fn cable_end(
    w: &mut impl Write,
    label: &str,
    codes: RawPair,
    result: &core::result::Result<Measurement, Fault>,
    loss: Option<core::result::Result<CableLoss, CableError>>,
) -> Result {
    write!(
        w,
        "  {:<16}codes {} / {}",
        label, codes.forward, codes.reflected
    )?;
    match (result, loss) {
        (Err(f), _) => writeln!(w, "  refused: {}", fault_text(*f)),
        (Ok(m), Some(Ok(c))) => writeln!(
            w,
            "  return loss {:.4} dB  loss {:.4} dB  range {:.4} .. {:.4} dB{}",
            m.reflection.return_loss.value(),
            c.loss.value(),
            c.low.value(),
            c.high.value(),
            if c.beyond_directivity {
                "  (beyond directivity)"
            } else {
                ""
            }
        ),
        (Ok(m), _) => writeln!(
            w,
            "  return loss {:.4} dB  loss not computed",
            m.reflection.return_loss.value()
        ),
    }
}

/// The combined matched-loss line of the cable check.
pub fn cable_total(
    w: &mut impl Write,
    loss: Option<core::result::Result<CableLoss, CableError>>,
) -> Result {
    write!(w, "  {:<16}", "matched loss")?;
    match loss {
        Some(Ok(c)) => writeln!(
            w,
            "{:.4} dB  range {:.4} .. {:.4} dB  (mean of both ends){}",
            c.loss.value(),
            c.low.value(),
            c.high.value(),
            if c.beyond_directivity {
                "  (beyond directivity)"
            } else {
                ""
            }
        ),
        Some(Err(e)) => writeln!(w, "refused: {e:?}"),
        None => writeln!(w, "not available: an end reading was refused"),
    }
}

/// What the simulation holds true, for comparison by eye (the tests compute their own).
pub fn simulation(w: &mut impl Write, s: &Scenario) -> Result {
    let cfg = s.front_end();
    let at_load = cfg.load.gamma(cfg.z0).norm();
    let at_port = SimFrontEnd::gamma_at_port(&cfg).norm();
    writeln!(w, "\n[simulated truth]")?;
    writeln!(
        w,
        "  {:<16}{:.6} at the load, {:.6} at the analyzer",
        "|Γ|", at_load, at_port
    )?;
    writeln!(
        w,
        "  {:<16}{:.4} dB",
        "cable loss",
        cfg.cable.matched_loss_db()
    )
}

/// The last line (tests wait for it).
pub fn end(w: &mut impl Write) -> Result {
    writeln!(w, "\nend of report")
}

/// A refused command line, with the accepted options.
pub fn usage(w: &mut impl Write, e: ArgError<'_>) -> Result {
    match e {
        ArgError::UnknownScenario(n) => writeln!(w, "error: no scenario called `{n}`")?,
        ArgError::UnknownOption(n) => writeln!(w, "error: unknown option `--{n}`")?,
        ArgError::MissingValue(n) => writeln!(w, "error: `--{n}` needs a value")?,
        ArgError::BadValue(n, v) => writeln!(w, "error: `{v}` is not a valid value for `--{n}`")?,
        ArgError::Stray(v) => writeln!(w, "error: unexpected `{v}` (options are `--name value`)")?,
    }
    writeln!(w, "options: --scenario NAME, then any of")?;
    writeln!(
        w,
        "  --z0 --load open|short|match --load-r --load-x --cable-m --cable-db100 --vf"
    )?;
    writeln!(
        w,
        "  --freq-mhz --directivity --leak-phase --law linear|square|log --level"
    )?;
    writeln!(
        w,
        "  --drive-dbm --log-slope --log-intercept --adc-bits --vref --offset --noise"
    )?;
    writeln!(
        w,
        "  --avg 1|4|16|64 --seed --floor-lsb --cable NAME --e00-mag --e00-deg --e11-mag"
    )?;
    writeln!(
        w,
        "  --e11-deg --track-mag --track-deg --sweep-start-mhz --sweep-stop-mhz --points"
    )?;
    writeln!(w, "  --ant-f0-mhz --ant-q --ant-r --fault-m --fault-rl")?;
    writeln!(
        w,
        "  --sections reading+cable+line+cal+sweep   (see the emu-analyzer README)"
    )?;
    presets(w)
}

/// The preset names and titles.
pub fn presets(w: &mut impl Write) -> Result {
    writeln!(w, "scenarios:")?;
    for p in PRESETS.iter() {
        writeln!(w, "  {:<20}{}", p.name, p.title)?;
    }
    Ok(())
}
