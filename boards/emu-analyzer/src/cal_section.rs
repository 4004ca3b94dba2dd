//! Section `[calibration ...]`: vector open/short/load calibration of the simulated bridge.
//!
//! The firmware reads the simulated open, short and load standards (modelled ones: fringing
//! capacitance, series inductance, offset delays, a load of its own small Γ — [`KIT`]) at
//! [`CAL_GRID`] frequencies across the sweep (and at the scenario frequency), solves the
//! three error terms at each with the core (`CalTable::calibrate_point`), saves the table
//! through the core's two-slot record store (`feedline::store`) into the board's RAM-backed
//! NOR flash ([`RamFlash`]), loads it back and corrects the device reading with the reloaded
//! table. The device is the scenario load behind the cable; its corrected Γ at the port is
//! then de-embedded with the core's line model of the cable, giving the load itself.

use crate::frontend::{Load, Noise};
use crate::ram_flash::RamFlash;
use crate::scenario::Scenario;
use crate::vector_sim::{self, KIT};
use core::fmt::{Result, Write};
use feedline::calibration::{CalError, CalTable};
use feedline::store::{Record, Slot, Store};
use feedline::units::{Hertz, Meters, Ohms};
use feedline::vector::{Impedance, Reactive};
use num_complex::Complex32;

/// Calibration frequencies spread over the sweep.
pub const CAL_GRID: usize = 25;
/// Table capacity: the grid and the scenario frequency.
pub const CAL_CAP: usize = CAL_GRID + 1;
/// The calibration table this firmware keeps.
pub type Table = CalTable<CAL_CAP>;

const FLASH_BYTES: usize = 4096;
const SLOT_BYTES: u32 = 2048;

/// The calibrated range: the sweep and the scenario frequency, Hz.
pub fn cal_range(s: &Scenario) -> (f32, f32) {
    let f = s.freq_mhz * 1.0e6;
    let a = s.sweep_start_mhz * 1.0e6;
    let b = s.sweep_stop_mhz * 1.0e6;
    (a.min(b).min(f), a.max(b).max(f))
}

/// Reads one standard or device of actual Γ `g` at `f`: averaged I/Q codes.
fn read(s: &Scenario, f: f32, g: Complex32, noise: &mut Noise) -> (i32, i32) {
    vector_sim::iq_codes(s, vector_sim::distort(s, f, g), noise)
}

/// Reads the standards at every calibration frequency and solves the terms.
pub fn calibrate(s: &Scenario) -> core::result::Result<Table, CalError> {
    let (lo, hi) = cal_range(s);
    let model = KIT.model(s.z0);
    let mut noise = Noise::new(s.seed.wrapping_add(100));
    let mut table = Table::new();
    let f_s = s.freq_mhz * 1.0e6;
    let mut freqs = [0.0f32; CAL_CAP];
    for (k, slot) in freqs.iter_mut().take(CAL_GRID).enumerate() {
        *slot = lo + (hi - lo) * k as f32 / (CAL_GRID - 1) as f32;
    }
    if let Some(last) = freqs.last_mut() {
        *last = f_s;
    }
    for f in freqs {
        let mo = read(s, f, vector_sim::open_gamma(f, s.z0), &mut noise);
        let ms = read(s, f, vector_sim::short_gamma(f, s.z0), &mut noise);
        let ml = read(s, f, vector_sim::load_gamma(), &mut noise);
        let g = |c: (i32, i32)| vector_sim::gamma_of_codes(c.0, c.1);
        table.calibrate_point(Hertz::new(f), g(mo), g(ms), g(ml), &model)?;
    }
    Ok(table)
}

/// Saves `table` in a fresh RAM flash and loads it back: (bytes, slot, sequence, reloaded).
pub fn save_and_reload(
    table: &Table,
) -> core::result::Result<(usize, Slot, u32, Table), &'static str> {
    let mut store =
        Store::new(RamFlash::<FLASH_BYTES>::new(), 0, SLOT_BYTES).map_err(|_| "layout refused")?;
    let mut buf = [0u8; 1024];
    if buf.len() < Store::<RamFlash<FLASH_BYTES>>::buffer_len::<Table>() {
        return Err("buffer too small");
    }
    store.save(table, &mut buf).map_err(|_| "save failed")?;
    let loaded = store.load::<Table>(&mut buf).map_err(|_| "load failed")?;
    let mut enc = [0u8; <Table as Record>::MAX_ENCODED_LEN];
    let n = table.encode(&mut enc).map_err(|_| "encode failed")?;
    Ok((n, loaded.slot, loaded.sequence, loaded.record))
}

fn polar(w: &mut impl Write, z: Complex32) -> Result {
    write!(
        w,
        "{:.5} at {:.3} deg",
        z.norm(),
        libm::atan2f(z.im, z.re).to_degrees()
    )
}

/// One impedance line: R, X, |Z| and the series element at `f`.
pub fn impedance(w: &mut impl Write, label: &str, g: Complex32, z0: f32, f: f32) -> Result {
    write!(w, "  {label:<16}")?;
    let Ok(z) = Impedance::from_gamma(g, Ohms::new(z0)) else {
        return writeln!(w, "not available (Γ {:.5} {:+.5}j)", g.re, g.im);
    };
    write!(
        w,
        "R {:.4} ohm  X {:.4} ohm  |Z| {:.4} ohm",
        z.resistance().value(),
        z.reactance().value(),
        z.magnitude().value()
    )?;
    match z.series_element(Hertz::new(f)) {
        Ok(Reactive::Inductance(l)) => write!(w, "  L {:.5} nH", l.value() * 1.0e9)?,
        Ok(Reactive::Capacitance(c)) => write!(w, "  C {:.5} pF", c.value() * 1.0e12)?,
        Ok(Reactive::Resistive) => write!(w, "  resistive")?,
        Err(_) => {}
    }
    if z.is_capped() {
        write!(w, "  (capped: near an open)")?;
    }
    writeln!(w)
}

/// Calibrates, stores, reloads; prints the section when `print`; returns the reloaded table.
pub fn run(w: &mut impl Write, s: &Scenario, print: bool) -> Option<Table> {
    let table = calibrate(s);
    let stored = table.as_ref().ok().map(save_and_reload);
    if print {
        let _ = print_section(w, s, &table, &stored);
    }
    match stored {
        Some(Ok((_, _, _, t))) => Some(t),
        _ => None,
    }
}

type Stored = Option<core::result::Result<(usize, Slot, u32, Table), &'static str>>;

fn print_section(
    w: &mut impl Write,
    s: &Scenario,
    table: &core::result::Result<Table, CalError>,
    stored: &Stored,
) -> Result {
    writeln!(w, "\n[calibration: open, short, load at the analyzer port]")?;
    writeln!(
        w,
        "  {:<16}open {} fF (C1 {}, C2 {}, C3 {}) behind {} ps, short {} pH (L1 {}) behind {} \
         ps, load Γ {} +j{} (invented kit)",
        "kit",
        KIT.open_c[0],
        KIT.open_c[1],
        KIT.open_c[2],
        KIT.open_c[3],
        KIT.open_delay * 1.0e12,
        KIT.short_l[0],
        KIT.short_l[1],
        KIT.short_delay * 1.0e12,
        KIT.load.0,
        KIT.load.1
    )?;
    let table = match table {
        Ok(t) => t,
        Err(e) => return writeln!(w, "  {:<16}refused: {e:?}", "cal points"),
    };
    let (lo, hi) = cal_range(s);
    writeln!(
        w,
        "  {:<16}{} from {} MHz to {} MHz (a grid of {} and {} MHz), each from open, short, load",
        "cal points",
        table.len(),
        lo * 1.0e-6,
        hi * 1.0e-6,
        CAL_GRID,
        s.freq_mhz
    )?;
    let reloaded = match stored {
        Some(Ok((n, slot, seq, t))) => {
            writeln!(
                w,
                "  {:<16}record of {n} bytes saved to slot {slot:?} (sequence {seq}), reloaded: {}",
                "flash",
                if t == table { "identical" } else { "DIFFERENT" }
            )?;
            t
        }
        Some(Err(e)) => return writeln!(w, "  {:<16}{e}", "flash"),
        None => return Ok(()),
    };
    let f = s.freq_mhz * 1.0e6;
    let sim = vector_sim::terms_at(s, f);
    if let Ok(t) = reloaded.terms_at(Hertz::new(f)) {
        for (label, got, truth) in [
            ("directivity", t.directivity(), sim[0]),
            ("source match", t.source_match(), sim[1]),
            ("tracking", t.tracking(), sim[2]),
        ] {
            write!(w, "  {label:<16}")?;
            polar(w, got)?;
            write!(w, "   simulated ")?;
            polar(w, truth)?;
            writeln!(w)?;
        }
    }
    let Some(g_port) = vector_sim::load_through_cable(s, s.load, f) else {
        return writeln!(w, "  {:<16}the cable model was refused", "dut");
    };
    let mut noise = Noise::new(s.seed.wrapping_add(200));
    let (i, q) = read(s, f, g_port, &mut noise);
    writeln!(
        w,
        "  {:<16}I {i}  Q {q}  (mean of {} reads, {} codes per unit of Γ)",
        "dut codes",
        s.avg,
        vector_sim::IQ_SCALE
    )?;
    let raw = vector_sim::gamma_of_codes(i, q);
    impedance(w, "uncorrected", raw, s.z0, f)?;
    let corrected = match reloaded.correct(Hertz::new(f), raw) {
        Ok(c) => c,
        Err(e) => return writeln!(w, "  {:<16}refused: {e:?}", "corrected"),
    };
    impedance(w, "corrected", corrected, s.z0, f)?;
    match vector_sim::cable_line(s, f).and_then(|l| {
        l.deembed(corrected, Meters::new(s.cable_m), Ohms::new(s.z0))
            .ok()
    }) {
        Some(g) => impedance(w, "at the load", g, s.z0, f)?,
        None => writeln!(
            w,
            "  {:<16}not available: the line model refused",
            "at the load"
        )?,
    }
    match s.load {
        Load::Impedance { r, x } => writeln!(
            w,
            "  {:<16}R {r} ohm  X {x} ohm (the scenario)",
            "true load"
        ),
        Load::Open => writeln!(w, "  {:<16}open (the scenario)", "true load"),
        Load::Short => writeln!(w, "  {:<16}short (the scenario)", "true load"),
    }
}
