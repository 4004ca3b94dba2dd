//! feedline's in-line monitor on QEMU's `microbit` (nRF51, Cortex-M0), run against a simulated
//! transmitter line. The scenario and the monitor's settings come from the semihosting command
//! line (see `scenario.rs`); reports, alarm events and protection-pin changes go out on UART0
//! as one line each; the run ends through semihosting with status 0, 2 for a bad command line,
//! 1 for refused monitor settings and 101 on a panic.
//!
//! Output lines (our own layout, `key=value` fields, integers; Q16.16 values are raw):
//! ```text
//! start scenario=NAME readings=N
//! cfg trip_q16=.. clear_q16=.. hold=.. clear_n=.. latch=0|1 gate_uw=.. avg=.. every=..
//! rep seq=.. fwd_uw=.. ref_uw=.. del_uw=.. tx=0|1 vswr_q16=.. rl_q16=.. pk_fwd_uw=.. pk_vswr_q16=..|- alarm=clear|tripped pin_err=..
//! evt seq=.. trip vswr_q16=..      evt seq=.. clear      evt seq=.. reset
//! pin seq=.. level=permit|inhibit  pinfail seq=..
//! end seq=.. trips=.. clears=..
//! ```
//! After each `rep` line the same report follows as the project's logger record (`fl.mon …
//! crc=…`, `feedline::report::line`), with a simulated clock of one reading every
//! [`READING_PERIOD_MS`].
#![no_std]
#![no_main]

mod pin;
mod scenario;

use core::fmt::Write;
use cortex_m_rt::entry;
use emu_support::semihost;
use emu_support::Console;
use feedline::monitor::{AlarmEvent, AlarmState, Monitor, PinSense, PowerChain, Report};
use feedline::report::record::{RL_CDB_MAX, VSWR_MILLI_MAX};
use feedline::report::{line, MonitorFlags, MonitorRecord, Record};

use pin::SimPin;
use scenario::Scenario;

/// Averaging buffer capacity.
const CAPACITY: usize = 32;
/// Simulated time between readings, for the logger record's clock.
const READING_PERIOD_MS: u32 = 10;

/// The monitor report as the logger's line record: powers in whole mW (truncated), VSWR in
/// thousandths and return loss in hundredths of a dB (rounded), flags Alarm, Trip (the pin is
/// at inhibit) and Under (forward below the gate).
fn record(n: u32, r: &Report, inhibited: bool) -> MonitorRecord {
    let milli = (u64::from(r.vswr.to_bits()) * 1000 + (1 << 15)) >> 16;
    let cdb = (u64::from(r.return_loss.to_bits().max(0).unsigned_abs()) * 100 + (1 << 15)) >> 16;
    let mut flags = 0;
    if r.alarm == AlarmState::Tripped {
        flags |= MonitorFlags::ALARM;
    }
    if inhibited {
        flags |= MonitorFlags::TRIP;
    }
    if !r.transmitting {
        flags |= MonitorFlags::UNDER;
    }
    MonitorRecord {
        seq: n,
        time_ms: r.sequence.wrapping_mul(READING_PERIOD_MS),
        forward_mw: r.forward_uw / 1000,
        reflected_mw: r.reflected_uw / 1000,
        delivered_mw: r.delivered_uw / 1000,
        vswr_milli: (milli as u32).clamp(1000, VSWR_MILLI_MAX),
        return_loss_cdb: (cdb as u16).min(RL_CDB_MAX),
        flags: MonitorFlags::from_bits(flags).unwrap_or_default(),
    }
}

#[entry]
fn main() -> ! {
    let mut uart = Console::new();
    let mut buf = [0u8; 512];
    let line = semihost::cmdline(&mut buf).unwrap_or("");
    let sc = match Scenario::from_args(line) {
        Ok(s) => s,
        Err(e) => {
            let _ = writeln!(uart, "error args {:?}", e);
            semihost::exit(2);
        }
    };
    let ok = run(&mut uart, &sc);
    semihost::exit(if ok { 0 } else { 1 });
}

fn run(uart: &mut Console, sc: &Scenario) -> bool {
    let c = sc.config;
    let _ = writeln!(uart, "start scenario={} readings={}", sc.name, sc.readings);
    let _ = writeln!(
        uart,
        "cfg trip_q16={} clear_q16={} hold={} clear_n={} latch={} gate_uw={} avg={} every={}",
        c.trip_vswr.to_bits(),
        c.clear_vswr.to_bits(),
        c.hold_off,
        c.clear_count,
        u8::from(c.latched),
        c.gate_uw,
        c.averaging,
        c.report_every
    );
    let pin = SimPin::new(sc.pin_fail);
    let mut mon: Monitor<_, _, CAPACITY> =
        match Monitor::new(c, PowerChain, &pin, PinSense::PermitHigh) {
            Ok(m) => m,
            Err(e) => {
                let _ = writeln!(uart, "error config {:?}", e);
                return false;
            }
        };
    let (mut trips, mut clears, mut reports) = (0u32, 0u32, 0u32);
    for seq in 1..=sc.readings {
        pin.set_sequence(seq);
        let level_before = pin.is_high();
        let reading = sc.reading(seq, !pin.is_high());
        let step = mon.update(reading);
        match step.event {
            Some(AlarmEvent::Tripped { vswr }) => {
                trips += 1;
                let _ = writeln!(uart, "evt seq={} trip vswr_q16={}", seq, vswr.to_bits());
            }
            Some(AlarmEvent::Cleared) => {
                clears += 1;
                let _ = writeln!(uart, "evt seq={} clear", seq);
            }
            None => {}
        }
        if !step.pin_ok {
            let _ = writeln!(uart, "pinfail seq={}", seq);
        }
        if let Some(r) = step.report {
            let _ = write!(
                uart,
                "rep seq={} fwd_uw={} ref_uw={} del_uw={} tx={} vswr_q16={} rl_q16={} pk_fwd_uw={} pk_vswr_q16=",
                r.sequence,
                r.forward_uw,
                r.reflected_uw,
                r.delivered_uw,
                u8::from(r.transmitting),
                r.vswr.to_bits(),
                r.return_loss.to_bits(),
                r.peak_forward_uw
            );
            let _ = match r.peak_vswr {
                Some(p) => write!(uart, "{}", p.to_bits()),
                None => write!(uart, "-"),
            };
            let _ = writeln!(
                uart,
                " alarm={} pin_err={}",
                state_name(r.alarm),
                r.pin_errors
            );
            reports += 1;
            let rec = Record::Monitor(record(reports, &r, !pin.is_high()));
            let _ = line::write_line_fmt(uart, &rec);
        }
        if sc.reset_at == Some(seq) {
            let (ev, pin_ok) = mon.reset_alarm();
            if ev.is_some() {
                clears += 1;
                let _ = writeln!(uart, "evt seq={} reset", seq);
            }
            if !pin_ok {
                let _ = writeln!(uart, "pinfail seq={}", seq);
            }
        }
        if pin.is_high() != level_before {
            let level = if pin.is_high() { "permit" } else { "inhibit" };
            let _ = writeln!(uart, "pin seq={} level={}", seq, level);
        }
    }
    let _ = writeln!(
        uart,
        "end seq={} trips={} clears={}",
        sc.readings, trips, clears
    );
    true
}

fn state_name(s: AlarmState) -> &'static str {
    match s {
        AlarmState::Clear => "clear",
        AlarmState::Tripped => "tripped",
    }
}

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    let mut uart = Console::new();
    let _ = writeln!(uart, "panic");
    semihost::exit(101);
}
