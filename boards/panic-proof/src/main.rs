//! Panic-freedom proof for feedline: this firmware calls every public entry point of the core
//! with inputs the optimizer cannot see (`core::hint::black_box`) and keeps every result alive
//! the same way. Its `#[panic_handler]` calls `feedline_panic_path_reachable`, a function
//! defined nowhere: if any panic path is still reachable from those calls after release
//! optimization (opt-level "s", LTO), the link fails with `undefined symbol:
//! feedline_panic_path_reachable`; if none is, it links.
//!
//! Build (both must succeed):
//! `cargo build --release -p panic-proof --target thumbv6m-none-eabi --target-dir target/proof`
//! and the same with `--target thumbv7em-none-eabihf`; `host-tests/tests/panic_proof.rs` and
//! `cargo bench-fw panic-proof` run exactly these.
//!
//! Extending: when a module gains a public function, call it in that module's `prove_*`
//! function below (a new module gets a new `prove_*` called from `main`). Generic items are
//! instantiated with the parameters firmware would use.
//!
//! This firmware is only linked, never run.
#![cfg_attr(target_os = "none", no_std, no_main)]

#[cfg(not(target_os = "none"))]
fn main() {}

#[cfg(target_os = "none")]
mod proto;

#[cfg(target_os = "none")]
mod proof {
    use core::hint::black_box as input;
    use feedline::bridge::{self, BridgeAdc, BridgeSpec, Detector, Quality, RawPair, ScalarChain};
    use feedline::cable;
    use feedline::detector::{Adc, Averager, DiodeTable, LogDetector};
    use feedline::reflection::{Gamma, Vswr};
    use feedline::uncertainty;
    use feedline::units::{
        Db, Dbm, Hertz, Meters, Np, Ohms, PowerRatio, VoltageRatio, Volts, Watts,
    };

    /// Keeps a result alive: the optimizer must assume it is read.
    fn keep<T>(x: T) {
        core::hint::black_box(x);
    }

    fn prove_units() {
        let db = Db::new(input(3.0));
        keep(db.value());
        keep(db.is_finite());
        keep(db.to_np());
        keep(db.to_power_ratio());
        keep(db.to_voltage_ratio());
        keep(db + Db::new(input(1.0)));
        keep(db - Db::new(input(1.0)));
        keep(db * input(2.0));
        keep(-db);
        keep(Np::new(input(0.5)).to_db());
        keep(PowerRatio::new(input(0.5)).to_db());
        keep(PowerRatio::new(input(0.5)).to_voltage_ratio());
        keep(VoltageRatio::new(input(0.5)).to_db());
        keep(VoltageRatio::new(input(0.5)).to_power_ratio());
        keep(Watts::new(input(1.0)).to_dbm());
        keep(Hertz::new(input(1.0e6)).omega());
        keep(Ohms::new(input(50.0)).value());
        keep(Meters::new(input(1.0)).is_finite());
        keep(Volts::new(input(1.0)).value());
        let dbm = Dbm::new(input(10.0));
        keep(dbm.value());
        keep(dbm.is_finite());
        keep(dbm.to_watts());
        keep(Dbm::from_watts(Watts::new(input(0.01))));
        keep(dbm - Dbm::new(input(3.0)));
        keep(dbm + Db::new(input(3.0)));
        keep(dbm - Db::new(input(3.0)));
    }

    fn prove_reflection() {
        let g = Gamma::new(input(0.3));
        keep(g);
        let g = Gamma::saturating(input(0.3));
        keep(g.value());
        keep(Gamma::from_vswr(input(2.0)));
        keep(Gamma::from_return_loss(Db::new(input(20.0))));
        keep(Gamma::from_mismatch_loss(Db::new(input(0.5))));
        keep(Gamma::from_reflected_fraction(PowerRatio::new(input(0.1))));
        keep(g.vswr());
        keep(g.return_loss());
        keep(g.mismatch_loss());
        keep(g.reflected_fraction());
        keep(g.delivered_fraction());
        keep(g.reflection());
        let s = Vswr::new(input(1.5));
        keep(s);
        if let Ok(s) = s {
            keep(s.value());
            keep(s.gamma());
        }
    }

    fn prove_uncertainty() {
        let g = Gamma::saturating(input(0.1));
        keep(uncertainty::leakage(Db::new(input(30.0))));
        let b = uncertainty::directivity_bounds(g, Db::new(input(30.0)));
        keep(b.reaches_perfect_match());
        keep(b);
    }

    fn prove_cable() {
        keep(cable::matched_loss_from_open_short(
            Db::new(input(6.0)),
            Db::new(input(35.0)),
        ));
        keep(cable::matched_loss_from_open_and_short(
            Db::new(input(6.0)),
            Db::new(input(6.2)),
            Db::new(input(35.0)),
        ));
    }

    fn prove_detector() {
        let adc = Adc::new(input(12), Volts::new(input(3.3)), input(4));
        keep(adc);
        if let Ok(adc) = adc {
            keep(adc.full_scale());
            keep(adc.lsb());
            keep(adc.net_code(input(2000)));
            keep(adc.volts(input(2000)));
        }
        let mut avg: Averager<16> = input(Averager::new());
        keep(avg.push(input(1000)));
        keep(avg.count());
        let mut avg1: Averager<1> = input(Averager::default());
        keep(avg1.push(input(1000)));
        let mut avg_max: Averager<65_536> = input(Averager::new());
        keep(avg_max.push(input(1000)));

        let points: [(Volts, Dbm); 4] = input([
            (Volts::new(0.01), Dbm::new(-30.0)),
            (Volts::new(0.1), Dbm::new(-10.0)),
            (Volts::new(0.5), Dbm::new(0.0)),
            (Volts::new(1.5), Dbm::new(10.0)),
        ]);
        let n = input(4usize).min(points.len());
        let table = DiodeTable::<8>::new(points.get(..n).unwrap_or(&points));
        keep(&table);
        if let Ok(table) = table {
            keep(table.len());
            keep(table.is_empty());
            keep(table.level(Volts::new(input(0.3))));
        }
        let log = LogDetector::new(Volts::new(input(0.025)), Dbm::new(input(-90.0)));
        keep(log);
        if let Ok(log) = log {
            keep(log.slope());
            keep(log.intercept());
            keep(log.level(Volts::new(input(1.2))));
        }
    }

    struct OpaqueAdc;

    impl BridgeAdc for OpaqueAdc {
        type Error = ();
        fn read_pair(&mut self) -> Result<RawPair, ()> {
            input(Ok(RawPair {
                forward: input(50_000),
                reflected: input(5_000),
            }))
        }
    }

    fn prove_bridge() {
        for detector in [
            Detector::Linear,
            Detector::SquareLaw,
            Detector::Log(
                match LogDetector::new(Volts::new(input(0.025)), Dbm::new(input(-90.0))) {
                    Ok(d) => d,
                    Err(_) => return,
                },
            ),
        ] {
            let spec = BridgeSpec::new(
                input(detector),
                Volts::new(input(0.001)),
                Volts::new(input(3.2)),
                Db::new(input(40.0)),
            );
            let spec = input(spec);
            keep(bridge::measure_volts(
                &spec,
                Volts::new(input(2.0)),
                Volts::new(input(0.2)),
            ));
            if let Ok(adc) = Adc::new(input(16), Volts::new(input(3.3)), input(0)) {
                let chain = input(ScalarChain::new(adc, spec));
                keep(chain.measure_codes(input(50_000), input(5_000)));
                keep(chain.read(&mut OpaqueAdc));
            }
        }
        keep(bridge::measure_levels(
            Dbm::new(input(10.0)),
            Dbm::new(input(-10.0)),
            Dbm::new(input(-40.0)),
            Db::new(input(35.0)),
        ));
        keep(bridge::delivered_power(
            Watts::new(input(10.0)),
            Watts::new(input(0.5)),
        ));
        keep(bridge::delivered_power_dbm(
            Dbm::new(input(40.0)),
            Dbm::new(input(27.0)),
        ));
        let q = input(Quality::GOOD).with(input(Quality::CAPPED));
        keep(q.is_good());
        keep(q.contains(input(Quality::REFLECTED_AT_FLOOR)));
        keep(q.bits());
    }

    #[cortex_m_rt::entry]
    fn main() -> ! {
        prove_units();
        prove_reflection();
        prove_uncertainty();
        prove_cable();
        prove_detector();
        prove_bridge();
        crate::proto::prove_report();
        crate::proto::prove_command();
        #[cfg(feature = "canary")]
        {
            let table = input([1u8; 4]);
            keep(table[input(5usize)]);
        }
        #[allow(clippy::empty_loop)]
        loop {}
    }

    #[panic_handler]
    fn panic(_info: &core::panic::PanicInfo) -> ! {
        extern "C" {
            /// Defined nowhere: referencing it makes the link fail.
            fn feedline_panic_path_reachable() -> !;
        }
        // SAFETY: never runs; the link fails first if this is reachable at all.
        unsafe { feedline_panic_path_reachable() }
    }
}
