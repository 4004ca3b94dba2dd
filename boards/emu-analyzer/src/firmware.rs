//! The firmware proper (target builds only): scenario → simulated front end → core → report.

use crate::frontend::{Load, SimFrontEnd};
use crate::report;
use crate::scenario::{LawKind, Scenario, Section};
use cortex_m_rt::entry;
use emu_support::{args, semihost, Console};
use feedline::bridge::{BridgeAdc, BridgeSpec, Detector, Fault, Measurement, RawPair, ScalarChain};
use feedline::cable::{matched_loss_from_open_and_short, matched_loss_from_open_short};
use feedline::detector::{Adc, Averager, LogDetector};
use feedline::units::{Db, Dbm, Volts};

/// The core's chain for this scenario: the analyzer knows its own ADC, detector law and
/// bridge directivity (as a real one would from its design and calibration).
fn build_chain(s: &Scenario) -> Option<ScalarChain> {
    let adc = Adc::new(s.adc_bits, Volts::new(s.vref), s.offset).ok()?;
    let detector = match s.law {
        LawKind::Linear => Detector::Linear,
        LawKind::Square => Detector::SquareLaw,
        LawKind::Log => Detector::Log(
            LogDetector::new(Volts::new(s.log_slope), Dbm::new(s.log_intercept)).ok()?,
        ),
    };
    let floor = Volts::new(s.floor_lsb * adc.lsb().value());
    let spec = BridgeSpec::new(detector, floor, Volts::new(s.vref), Db::new(s.directivity));
    ScalarChain::new(adc, spec).ok()
}

/// One reading: `N` pairs from the front end, each channel averaged by the core's averager.
fn read_mean<A: BridgeAdc, const N: usize>(adc: &mut A) -> Result<RawPair, A::Error> {
    let mut fwd = Averager::<N>::new();
    let mut refl = Averager::<N>::new();
    loop {
        let p = adc.read_pair()?;
        if let (Some(forward), Some(reflected)) = (fwd.push(p.forward), refl.push(p.reflected)) {
            return Ok(RawPair { forward, reflected });
        }
    }
}

/// An averaged reading of `count` pairs (1, 4, 16 or 64; anything else reads once).
fn read_averaged<A: BridgeAdc>(adc: &mut A, count: u16) -> Result<RawPair, A::Error> {
    match count {
        4 => read_mean::<A, 4>(adc),
        16 => read_mean::<A, 16>(adc),
        64 => read_mean::<A, 64>(adc),
        _ => read_mean::<A, 1>(adc),
    }
}

/// Simulates `load` behind the scenario's cable and measures it.
fn measure(
    s: &Scenario,
    chain: &ScalarChain,
    load: Load,
    seed_offset: u32,
) -> (RawPair, Result<Measurement, Fault>) {
    let mut cfg = s.front_end_with(load);
    cfg.seed = cfg.seed.wrapping_add(seed_offset);
    let mut fe = SimFrontEnd::new(cfg);
    let Ok(codes) = read_averaged(&mut fe, s.avg);
    (codes, chain.measure_codes(codes.forward, codes.reflected))
}

/// Section: the load as the scenario has it.
fn section_reading(w: &mut Console, s: &Scenario, chain: &ScalarChain) {
    let (codes, result) = measure(s, chain, s.load, 0);
    let _ = report::reading(w, "reading", chain.adc(), codes, s.avg, &result);
}

/// Section: the same cable with its far end open, then shorted → matched loss.
fn section_cable_check(w: &mut Console, s: &Scenario, chain: &ScalarChain) {
    let _ = core::fmt::Write::write_str(w, "\n[cable check: far end open, then shorted]\n");
    let d = Db::new(s.directivity);
    let (open_codes, open) = measure(s, chain, Load::Open, 1);
    let (short_codes, short) = measure(s, chain, Load::Short, 2);
    let loss_of = |m: &Result<Measurement, Fault>| {
        m.as_ref()
            .ok()
            .map(|m| matched_loss_from_open_short(m.reflection.return_loss, d))
    };
    let _ = report::cable_end(w, "open end", open_codes, &open, loss_of(&open));
    let _ = report::cable_end(w, "shorted end", short_codes, &short, loss_of(&short));
    let both = match (&open, &short) {
        (Ok(o), Ok(sh)) => Some(matched_loss_from_open_and_short(
            o.reflection.return_loss,
            sh.reflection.return_loss,
            d,
        )),
        _ => None,
    };
    let _ = report::cable_total(w, both);
}

#[entry]
fn main() -> ! {
    let mut uart = Console::new();
    let mut buf = [0u8; 1024];
    let line = match semihost::cmdline(&mut buf) {
        Ok(line) => line,
        Err(e) => {
            let _ = core::fmt::Write::write_fmt(
                &mut uart,
                format_args!("error: cannot read the command line ({e:?})\n"),
            );
            semihost::exit(2)
        }
    };
    if args::words(line).any(|w| w == "--list") {
        let _ = report::presets(&mut uart);
        semihost::exit(0)
    }
    let s = match Scenario::from_cmdline(line) {
        Ok(s) => s,
        Err(e) => {
            let _ = report::usage(&mut uart, e);
            semihost::exit(2)
        }
    };
    let Some(chain) = build_chain(&s) else {
        let _ =
            core::fmt::Write::write_str(&mut uart, "error: ADC or detector parameters refused\n");
        semihost::exit(2)
    };
    let _ = report::title(&mut uart);
    let _ = report::scenario(&mut uart, &s);
    if s.has(Section::Reading) {
        section_reading(&mut uart, &s, &chain);
    }
    if s.has(Section::Cable) {
        section_cable_check(&mut uart, &s, &chain);
    }
    if s.has(Section::Line) {
        let (_, result) = measure(&s, &chain, s.load, 0);
        let _ = crate::line_section::print(&mut uart, &s, &result);
    }
    let table = if s.has(Section::Cal) || s.has(Section::Sweep) {
        crate::cal_section::run(&mut uart, &s, s.has(Section::Cal))
    } else {
        None
    };
    if s.has(Section::Sweep) {
        let _ = crate::sweep_section::run(&mut uart, &s, table.as_ref());
    }
    let _ = report::simulation(&mut uart, &s);
    let _ = report::end(&mut uart);
    semihost::exit(0)
}

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    let mut uart = Console::new();
    let _ = core::fmt::Write::write_str(&mut uart, "\nfirmware panic\n");
    semihost::exit(101)
}
