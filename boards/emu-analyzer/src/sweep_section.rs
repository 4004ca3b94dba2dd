//! Sections `[sweep ...]`, `[touchstone ...]` and `[distance to fault]`.
//!
//! The firmware sweeps the scenario antenna (a series-RLC model) behind the scenario cable
//! with a connector fault, through the core's sweep runner (`feedline::sweep::run_sweep`)
//! with the simulation as the frequency source ([`SimSource`]) and the point reader
//! ([`SimReader`]: I/Q codes → raw Γ → the reloaded calibration table's correction). Each
//! point is streamed into the core's analysis accumulators (minimum VSWR, bands under
//! VSWR 2, resonances of the antenna with the cable de-embedded) and kept in a static buffer
//! for the plot, the Touchstone export and the distance-to-fault transform (done last,
//! in place).
//!
//! RAM: the buffer is [`DTF_BINS`] `Complex32` (8 KiB) in a static, the point count is at
//! most [`MAX_POINTS`](crate::scenario::MAX_POINTS) (256).

use crate::cal_section::Table;
use crate::frontend::Noise;
use crate::scenario::{Scenario, MAX_POINTS};
use crate::vector_sim;
use core::fmt::{Result, Write};
use embedded_hal::delay::DelayNs;
use feedline::analysis::{Bands, MinimumVswr, ResonanceKind, Resonances};
use feedline::calibration::CalError;
use feedline::dtf::{transform_in_place, DtfSetup, FaultSearch, LossCoefficients, Window};
use feedline::plot::{fault_table, VswrChart};
use feedline::reflection::{Gamma, Vswr};
use feedline::sweep::{
    run_sweep, Flow, FrequencySource, PointReader, Spacing, SweepPlan, SweepPoint,
};
use feedline::touchstone::{DataFormat, FrequencyUnit, TouchstoneWriter};
use feedline::units::{Db, Hertz, Meters, Ohms};
use num_complex::Complex32;

/// Transform length of the distance-to-fault response.
pub const DTF_BINS: usize = 1024;
/// The VSWR threshold of the bandwidth report.
pub const BAND_VSWR: f32 = 2.0;
/// Faults reported up to this return loss, dB.
pub const FAULT_THRESHOLD_DB: f32 = 35.0;
/// Rows of the terminal plot (about; every k-th point).
const PLOT_ROWS: usize = 41;
/// First marker line of the Touchstone block.
pub const TOUCHSTONE_BEGIN: &str = "----- begin touchstone (1-port, version 1.1) -----";
/// Last marker line of the Touchstone block.
pub const TOUCHSTONE_END: &str = "----- end touchstone -----";

/// The simulated synthesizer: remembers its frequency, reports a settling time.
pub struct SimSource {
    /// The frequency it is tuned to.
    pub tuned: Option<Hertz>,
}

impl FrequencySource for SimSource {
    type Error = core::convert::Infallible;

    fn set_frequency(&mut self, frequency: Hertz) -> core::result::Result<(), Self::Error> {
        self.tuned = Some(frequency);
        Ok(())
    }

    fn settling_time_us(&self, from: Option<Hertz>, _to: Hertz) -> u32 {
        if from.is_none() {
            500
        } else {
            50
        }
    }
}

/// A delay that only counts (the simulation settles at once).
#[derive(Default)]
pub struct CountingDelay {
    /// Nanoseconds asked for.
    pub total_ns: u64,
}

impl DelayNs for CountingDelay {
    fn delay_ns(&mut self, ns: u32) {
        self.total_ns = self.total_ns.saturating_add(u64::from(ns));
    }
}

/// Why a point could not be read.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ReadError {
    /// The line model refused the frequency.
    Model,
    /// The calibration refused the reading.
    Cal(CalError),
}

/// The simulated vector bridge and I/Q detector, corrected by the calibration table.
pub struct SimReader<'a> {
    s: &'a Scenario,
    table: &'a Table,
    noise: Noise,
}

impl PointReader for SimReader<'_> {
    type Reading = Complex32;
    type Error = ReadError;

    fn read_point(&mut self, frequency: Hertz) -> core::result::Result<Complex32, ReadError> {
        let f = frequency.value();
        let g = vector_sim::antenna_through_faulty_cable(self.s, f).ok_or(ReadError::Model)?;
        let (i, q) =
            vector_sim::iq_codes(self.s, vector_sim::distort(self.s, f, g), &mut self.noise);
        self.table
            .correct(frequency, vector_sim::gamma_of_codes(i, q))
            .map_err(ReadError::Cal)
    }
}

fn vswr_of(g: Complex32) -> Vswr {
    Gamma::saturating(g.norm().min(1.0)).vswr()
}

/// Runs the sweep and prints the three sections.
pub fn run(w: &mut impl Write, s: &Scenario, table: Option<&Table>) -> Result {
    writeln!(
        w,
        "\n[sweep: antenna behind the cable with a connector fault]"
    )?;
    writeln!(
        w,
        "  {:<16}series RLC resonant at {} MHz, Q {}, R {} ohm (invented)",
        "antenna", s.ant_f0_mhz, s.ant_q, s.ant_r
    )?;
    if vector_sim::has_fault(s) {
        writeln!(
            w,
            "  {:<16}connector of {} dB return loss at {} m (cable {} m)",
            "fault", s.fault_rl, s.fault_m, s.cable_m
        )?;
    } else {
        writeln!(
            w,
            "  {:<16}none (not inside the {} m cable)",
            "fault", s.cable_m
        )?;
    }
    let Some(table) = table else {
        return writeln!(w, "  {:<16}not available: no calibration", "plan");
    };
    let plan = match SweepPlan::<{ MAX_POINTS as usize }>::from_start_stop(
        Hertz::new(s.sweep_start_mhz * 1.0e6),
        Hertz::new(s.sweep_stop_mhz * 1.0e6),
        usize::from(s.points),
        Spacing::Linear,
    ) {
        Ok(p) => p,
        Err(e) => return writeln!(w, "  {:<16}refused: {e:?}", "plan"),
    };
    let step = plan.linear_step().map_or(0.0, |h| h.value());
    writeln!(
        w,
        "  {:<16}{} points, {} MHz to {} MHz, step {:.3} kHz, linear",
        "plan",
        plan.points(),
        s.sweep_start_mhz,
        s.sweep_stop_mhz,
        step * 1.0e-3
    )?;
    let Some(buf) =
        cortex_m::singleton!(: [Complex32; DTF_BINS] = [Complex32::new(0.0, 0.0); DTF_BINS])
    else {
        return writeln!(w, "  {:<16}buffer already in use", "plan");
    };
    let mut minimum = MinimumVswr::new();
    let mut bands = Bands::<1, 4>::new();
    if let Ok(v) = Vswr::new(BAND_VSWR) {
        let _ = bands.add_threshold(v);
    }
    let mut resonances = Resonances::<4>::new();
    let mut source = SimSource { tuned: None };
    let mut reader = SimReader {
        s,
        table,
        noise: Noise::new(s.seed.wrapping_add(300)),
    };
    let mut delay = CountingDelay::default();
    let z0 = Ohms::new(s.z0);
    let mut sink = |p: &SweepPoint<Complex32>| {
        if let Some(slot) = buf.get_mut(p.index) {
            *slot = p.reading;
        }
        let f = p.frequency;
        minimum.push(f, Gamma::saturating(p.reading.norm().min(1.0)));
        bands.push(f, vswr_of(p.reading));
        if let Some(g) = vector_sim::cable_line(s, f.value())
            .and_then(|l| l.deembed(p.reading, Meters::new(s.cable_m), z0).ok())
        {
            resonances.push_gamma(f, g, z0);
        }
        Flow::Continue
    };
    let outcome = run_sweep(
        &plan,
        &mut source,
        &mut reader,
        &mut delay,
        &mut sink,
        &mut |_done: usize, _total: usize| Flow::Continue,
    );
    bands.finish();
    let done = match outcome {
        Ok(o) => o.points_done,
        Err(e) => return writeln!(w, "  {:<16}failed: {e:?}", "points"),
    };
    writeln!(
        w,
        "  {:<16}{done} read, {:.2} ms of settling in total, corrected by the stored calibration",
        "points",
        delay.total_ns as f32 * 1.0e-6
    )?;
    let low = minimum.result();
    match low {
        Some(m) => writeln!(
            w,
            "  {:<16}{:.4} at {:.4} MHz{}",
            "lowest VSWR",
            m.vswr.value(),
            m.frequency.value() * 1.0e-6,
            if m.interpolated {
                " (interpolated)"
            } else {
                ""
            }
        )?,
        None => writeln!(w, "  {:<16}none", "lowest VSWR")?,
    }
    let mut any = false;
    for t in bands.thresholds() {
        for b in t.bands() {
            any = true;
            writeln!(
                w,
                "  {:<16}{:.4} .. {:.4} MHz, width {:.4} MHz{}",
                "band VSWR<2",
                b.lower.value() * 1.0e-6,
                b.upper.value() * 1.0e-6,
                b.width().value() * 1.0e-6,
                if b.is_closed() {
                    ""
                } else {
                    " (runs off the sweep)"
                }
            )?;
        }
    }
    if !any {
        writeln!(w, "  {:<16}none", "band VSWR<2")?;
    }
    for r in resonances.found() {
        writeln!(
            w,
            "  {:<16}{:.4} MHz, R {:.2} ohm, {} (at the antenna: cable de-embedded)",
            "resonance",
            r.frequency.value() * 1.0e-6,
            r.resistance.value(),
            match r.kind {
                ResonanceKind::Series => "series",
                ResonanceKind::Parallel => "parallel",
            }
        )?;
    }
    if resonances.found().is_empty() {
        writeln!(w, "  {:<16}none", "resonance")?;
    }
    let points = done.min(buf.len());
    // The plot: every k-th point, the lowest marked.
    writeln!(w, "\n[sweep plot: VSWR at the analyzer]")?;
    let chart = VswrChart::new(
        56,
        Gamma::saturating(2.0 / 3.0).vswr(),
        Vswr::new(BAND_VSWR).ok(),
    );
    chart.header(w)?;
    let every = points.div_ceil(PLOT_ROWS).max(1);
    let low_index = low.map(|m| {
        let f = m.point_frequency.value();
        plan.iter()
            .min_by(|a, b| libm::fabsf(a.1.value() - f).total_cmp(&libm::fabsf(b.1.value() - f)))
            .map_or(0, |(i, _)| i)
    });
    for (i, f) in plan.iter().take(points) {
        let is_low = low_index == Some(i);
        if i % every != 0 && !is_low {
            continue;
        }
        let g = buf.get(i).copied().unwrap_or_default();
        chart.row(w, f, vswr_of(g), if is_low { Some("lowest") } else { None })?;
    }
    // Touchstone, before the in-place transform.
    writeln!(w, "\n[touchstone: the corrected sweep as S11]")?;
    writeln!(w, "{TOUCHSTONE_BEGIN}")?;
    if let Ok(mut t) =
        TouchstoneWriter::new(&mut *w, FrequencyUnit::MHz, DataFormat::RealImaginary, z0)
    {
        let _ = t.comment("feedline emulated analyzer: corrected S11 at the analyzer port");
        let _ = t.comment("antenna behind the scenario cable with a connector fault (invented)");
        for (i, f) in plan.iter().take(points) {
            if let Some(g) = buf.get(i) {
                let _ = t.point(f, *g);
            }
        }
        let _ = t.finish();
    }
    writeln!(w, "{TOUCHSTONE_END}")?;
    // Distance to fault.
    writeln!(w, "\n[distance to fault]")?;
    let Some(model) = s.loss_model() else {
        return writeln!(w, "  {:<16}no cable model", "window");
    };
    let Some(loss) = LossCoefficients::new(model.k1::<Meters>(), model.k2::<Meters>()) else {
        return writeln!(w, "  {:<16}no cable model", "window");
    };
    let setup = DtfSetup {
        start: plan.start(),
        stop: plan.stop(),
        window: Window::Hann,
        velocity_factor: s.vf,
        loss,
    };
    let resp = match transform_in_place(&mut buf[..], points, &setup) {
        Ok(r) => r,
        Err(e) => return writeln!(w, "  {:<16}refused: {e:?}", "window"),
    };
    writeln!(
        w,
        "  {:<16}Hann, {points} points into {} bins, velocity factor {}, cable loss compensated",
        "window",
        resp.bins(),
        s.vf
    )?;
    let res = resp.resolution().value();
    writeln!(w, "  {:<16}{:.4} m", "resolution", res)?;
    writeln!(w, "  {:<16}{:.2} m", "max range", resp.max_range().value())?;
    writeln!(
        w,
        "  {:<16}{:.4} m",
        "bin spacing",
        resp.bin_spacing().value()
    )?;
    let search = FaultSearch {
        threshold: Db::new(FAULT_THRESHOLD_DB),
        min_separation: Meters::new(2.0 * res),
        max_distance: Meters::new(s.cable_m + 4.0 * res),
    };
    writeln!(
        w,
        "  {:<16}return loss up to {} dB, at least {:.2} m apart, out to {:.2} m",
        "search",
        FAULT_THRESHOLD_DB,
        2.0 * res,
        s.cable_m + 4.0 * res
    )?;
    let faults = resp.faults::<8>(&search);
    fault_table(w, &faults)
}
