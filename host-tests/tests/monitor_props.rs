//! Property test: the core monitor (`feedline::monitor::Monitor` with `PowerChain`), fed the
//! readings of random line scenarios, agrees with the independent f64 model
//! (`reference::monitor::simulate`) on every alarm event, every protection-pin change, every
//! failed pin write and every report, within the fixed chain's stated bounds
//! (`feedline::fixed::VSWR_BOUND_REL`, `RL_BOUND_DB`). Feedback scenarios need the firmware's
//! loop and are covered by `qemu_monitor.rs`.

use core::cell::Cell;
use embedded_hal::digital::{ErrorKind, ErrorType, OutputPin};
use feedline::fixed::{VswrQ16, RL_BOUND_DB};
use feedline::monitor::{
    AlarmEvent, AlarmState, Monitor, MonitorConfig, PinSense, PowerChain, PowerReading,
};
use feedline_host_tests::reference::monitor::{figures, simulate, Event, Scenario};
use proptest::prelude::*;

/// Threshold margin below which a scenario is decided by rounding, not by the scenario.
const MIN_MARGIN: f64 = 5e-3;

/// The chain's VSWR error is within bounds: the fixed chain's relative bound up to VSWR 20,
/// and, above, the |Γ| that the VSWR implies within `feedline::monitor::GAMMA_BOUND`.
fn vswr_within_bound(got: f64, want: f64) -> bool {
    if want <= 20.0 {
        ((got - want) / want).abs() <= f64::from(feedline::fixed::VSWR_BOUND_REL)
    } else {
        let g = |v: f64| (v - 1.0) / (v + 1.0);
        (g(got) - g(want)).abs() <= f64::from(feedline::monitor::GAMMA_BOUND)
    }
}

struct Pin<'a> {
    high: &'a Cell<bool>,
    fail: &'a Cell<bool>,
}
impl ErrorType for Pin<'_> {
    type Error = ErrorKind;
}
impl OutputPin for Pin<'_> {
    fn set_low(&mut self) -> Result<(), ErrorKind> {
        self.set(false)
    }
    fn set_high(&mut self) -> Result<(), ErrorKind> {
        self.set(true)
    }
}
impl Pin<'_> {
    fn set(&self, h: bool) -> Result<(), ErrorKind> {
        if self.fail.get() {
            return Err(ErrorKind::Other);
        }
        self.high.set(h);
        Ok(())
    }
}

fn q16(x: f64) -> VswrQ16 {
    VswrQ16::from_bits((x * 65536.0) as u32) // truncation, as the firmware's parser
}

fn steps(max_at: u32, max_v: u32) -> impl Strategy<Value = Vec<(u32, u32)>> {
    prop::collection::vec((1..max_at, 0..max_v), 1..5)
}

prop_compose! {
    fn scenario()(
        readings in 20u32..300,
        power in steps(200, 500_000),
        refl in steps(200, 1_000_001),
        spike in prop::option::of((1u32..50, 2u32..40, 1u32..6, 0u32..1_000_000)),
        key in prop::option::of((1u32..20, 0u32..12)),
        pin_fail in prop::option::of((1u32..250, 0u32..30)),
        reset_at in prop::option::of(1u32..300),
        clear in 1.05f64..2.5,
        band in 0.05f64..3.0,
        hold_off in 1u32..8,
        clear_count in 1u32..12,
        latched: bool,
        gate_mw in 0u32..3000,
        averaging in 1u32..=16,
        report_every in 0u32..40,
    ) -> Scenario {
        let mut s = Scenario::new(readings);
        s.power = power;
        s.refl = refl;
        s.spike = spike;
        s.key = key;
        s.pin_fail = pin_fail.map(|(a, n)| (a, a + n));
        s.reset_at = reset_at;
        s.clear = (clear * 1e4).round() / 1e4;
        s.trip = ((clear + band) * 1e4).round() / 1e4;
        s.hold_off = hold_off;
        s.clear_count = clear_count;
        s.latched = latched;
        s.gate_mw = gate_mw;
        s.averaging = averaging;
        s.report_every = report_every;
        s
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(400))]

    #[test]
    fn core_monitor_matches_model(s in scenario()) {
        let model = simulate(&s);
        prop_assume!(model.margin > MIN_MARGIN);
        let config = MonitorConfig {
            trip_vswr: q16(s.trip),
            clear_vswr: q16(s.clear),
            hold_off: s.hold_off as u16,
            clear_count: s.clear_count as u16,
            latched: s.latched,
            gate_uw: s.gate_mw * 1000,
            averaging: s.averaging as u16,
            report_every: s.report_every as u16,
        };
        let high = Cell::new(false);
        let fail = Cell::new(false);
        let mut m: Monitor<_, _, 16> =
            Monitor::new(config, PowerChain, Pin { high: &high, fail: &fail }, PinSense::PermitHigh).unwrap();
        let (mut events, mut pins, mut failures, mut reports) = (vec![], vec![], vec![], vec![]);
        for (i, &(f, r)) in model.readings.iter().enumerate() {
            let seq = i as u32 + 1;
            fail.set(s.pin_fail.is_some_and(|(a, b)| (a..=b).contains(&seq)));
            let before = high.get();
            let step = m.update(PowerReading::new(f as u32, r as u32));
            prop_assert_eq!(step.sequence, seq);
            match step.event {
                Some(AlarmEvent::Tripped { vswr }) => events.push((seq, Some(vswr))),
                Some(AlarmEvent::Cleared) => events.push((seq, None)),
                None => {}
            }
            if !step.pin_ok {
                failures.push(seq);
            }
            if let Some(rep) = step.report {
                reports.push(rep);
            }
            if s.reset_at == Some(seq) {
                let (ev, ok) = m.reset_alarm();
                if ev.is_some() {
                    events.push((seq, None));
                }
                if !ok {
                    failures.push(seq);
                }
            }
            if high.get() != before {
                pins.push((seq, high.get()));
            }
        }
        prop_assert_eq!(events.len(), model.events.len(), "events {:?} vs {:?}", events, model.events);
        for ((gs, gv), (ws, we)) in events.iter().zip(&model.events) {
            prop_assert_eq!(gs, ws);
            match (gv, we) {
                (Some(v), Event::Trip(w)) => {
                    let g = f64::from(v.to_bits()) / 65536.0;
                    prop_assert!(vswr_within_bound(g, *w), "trip VSWR {} vs {}", g, w);
                }
                (None, Event::Clear | Event::Reset) => {}
                _ => prop_assert!(false, "event kind differs at {}", gs),
            }
        }
        prop_assert_eq!(pins, model.pins.clone());
        prop_assert_eq!(failures, model.pin_failures.clone());
        prop_assert_eq!(reports.len(), model.reports.len());
        for (g, w) in reports.iter().zip(&model.reports) {
            prop_assert_eq!(g.sequence, w.seq);
            let (gf, gr) = (f64::from(g.forward_uw), f64::from(g.reflected_uw));
            prop_assert!(gf <= w.forward_uw + 1e-6 && w.forward_uw - gf < 1.0);
            prop_assert!(gr <= w.reflected_uw + 1e-6 && w.reflected_uw - gr < 1.0);
            prop_assert_eq!(g.transmitting, w.transmitting);
            let (vf, rlf) = figures(gf, gr);
            let v = f64::from(g.vswr.to_bits()) / 65536.0;
            let rl = f64::from(g.return_loss.to_bits()) / 65536.0;
            let v_ok = vswr_within_bound(v, w.vswr) || vswr_within_bound(v, vf);
            let erl = (rl - w.return_loss_db).abs().min((rl - rlf).abs());
            prop_assert!(v_ok, "VSWR {} vs {}", v, w.vswr);
            prop_assert!(erl <= f64::from(RL_BOUND_DB), "RL {} vs {}", rl, w.return_loss_db);
            prop_assert_eq!(f64::from(g.peak_forward_uw), w.peak_forward_uw);
            prop_assert_eq!(g.peak_vswr.is_some(), w.peak_vswr.is_some());
            if let (Some(p), Some(q)) = (g.peak_vswr, w.peak_vswr) {
                let p = f64::from(p.to_bits()) / 65536.0;
                prop_assert!(vswr_within_bound(p, q), "peak VSWR {} vs {}", p, q);
            }
            prop_assert_eq!(g.alarm == AlarmState::Tripped, w.tripped);
            prop_assert_eq!(g.pin_errors, w.pin_errors);
        }
    }
}
