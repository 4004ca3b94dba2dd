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

/// What the flash step did.
pub struct Saved {
    /// Encoded record length, bytes.
    pub bytes: usize,
    /// Where the first save went and its sequence number.
    pub first: (Slot, u32),
    /// Bytes programmed before the power cut of the second save.
    pub cut_at: usize,
    /// True when the second save reported its failure (power was cut).
    pub second_failed: bool,
    /// Slot and sequence loaded after power came back.
    pub after_cut: (Slot, u32),
    /// The table loaded after power came back.
    pub table: Table,
}

/// Saves `table` in a fresh RAM flash and loads it back, then saves it again with the power
/// cut halfway through the record and loads once more: the previous record must come back.
pub fn save_and_reload(table: &Table) -> core::result::Result<Saved, &'static str> {
    type Flash = RamFlash<FLASH_BYTES>;
    let mut store = Store::new(Flash::new(), 0, SLOT_BYTES).map_err(|_| "layout refused")?;
    let mut buf = [0u8; 1024];
    if buf.len() < Store::<Flash>::buffer_len::<Table>() {
        return Err("buffer too small");
    }
    store.save(table, &mut buf).map_err(|_| "save failed")?;
    let first = store.load::<Table>(&mut buf).map_err(|_| "load failed")?;
    if first.record != *table {
        return Err("the reloaded table differs");
    }
    let mut enc = [0u8; <Table as Record>::MAX_ENCODED_LEN];
    let bytes = table.encode(&mut enc).map_err(|_| "encode failed")?;
    // Second save, power cut after half the record's bytes.
    let mut flash = store.release();
    let cut_at = bytes / 2;
    flash.cut_after(cut_at);
    let mut store = Store::new(flash, 0, SLOT_BYTES).map_err(|_| "layout refused")?;
    let second_failed = store.save(table, &mut buf).is_err();
    let mut flash = store.release();
    flash.power_on();
    let mut store = Store::new(flash, 0, SLOT_BYTES).map_err(|_| "layout refused")?;
    let after = store
        .load::<Table>(&mut buf)
        .map_err(|_| "load after the cut failed")?;
    Ok(Saved {
        bytes,
        first: (first.slot, first.sequence),
        cut_at,
        second_failed,
        after_cut: (after.slot, after.sequence),
        table: after.record,
    })
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
        Some(Ok(saved)) => Some(saved.table),
        _ => None,
    }
}

type Stored = Option<core::result::Result<Saved, &'static str>>;

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
        Some(Ok(saved)) => {
            writeln!(
                w,
                "  {:<16}record of {} bytes saved to slot {:?} (sequence {}), reloaded: identical",
                "flash", saved.bytes, saved.first.0, saved.first.1
            )?;
            writeln!(
                w,
                "  {:<16}second save cut after {} bytes ({}); after power-on slot {:?} \
                 (sequence {}) loads: {}",
                "power cut",
                saved.cut_at,
                if saved.second_failed {
                    "save failed"
                } else {
                    "save did not notice"
                },
                saved.after_cut.0,
                saved.after_cut.1,
                if saved.after_cut == saved.first && saved.table == *table {
                    "the previous calibration"
                } else {
                    "SOMETHING ELSE"
                }
            )?;
            &saved.table
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
