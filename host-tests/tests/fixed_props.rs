//! Property tests of the integer chain (`feedline::fixed`): for any 16-bit codes, including
//! 0 and full scale, no panic (debug builds also trap every arithmetic overflow), VSWR ≥ 1,
//! return and mismatch loss ≥ 0, |Γ| ≤ 1, and every output monotonic in the reflected code.

use feedline::fixed::{
    CodeLimits, DbQ16, DbmChain, DbmLimits, DbmQ16, FixedMeasurement, FixedReflection, GammaQ31,
    LinearChain, LogDetectorChain, LogDetectorConfig, SquareLawChain, VswrQ16,
};
use proptest::prelude::*;

fn sane(r: &FixedReflection) {
    assert!(r.vswr >= VswrQ16::ONE && r.vswr <= VswrQ16::CEILING);
    assert!(r.return_loss >= DbQ16::ZERO && r.return_loss <= DbQ16::from_int(100));
    assert!(r.mismatch_loss >= DbQ16::ZERO && r.mismatch_loss <= DbQ16::from_int(100));
    assert!(r.gamma <= GammaQ31::TOTAL);
}

/// Outputs must not move the wrong way from `a` (smaller reflected reading) to `b`.
fn ordered(a: &FixedMeasurement, b: &FixedMeasurement) -> bool {
    let (a, b) = (&a.reflection, &b.reflection);
    a.gamma <= b.gamma
        && a.vswr <= b.vswr
        && a.return_loss >= b.return_loss
        && a.mismatch_loss <= b.mismatch_loss
}

fn log_chain(
    slope: i32,
    nv: u32,
    intercept: i16,
    floor: i16,
    max: i16,
) -> Option<LogDetectorChain> {
    LogDetectorChain::new(LogDetectorConfig {
        adc_nv_per_code: nv,
        slope_uv_per_db: slope,
        intercept: DbmQ16::from_int(intercept),
        limits: DbmLimits::new(DbmQ16::from_int(floor), DbmQ16::from_int(max)),
    })
    .ok()
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(2000))]

    #[test]
    fn code_chains_any_input(f in any::<u16>(), r in any::<u16>(), floor in any::<u16>(), full in any::<u16>()) {
        let limits = CodeLimits::new(floor, full);
        if let Ok(c) = LinearChain::new(limits) {
            if let Ok(m) = c.measure(f, r) { sane(&m.reflection); }
        }
        if let Ok(c) = SquareLawChain::new(limits) {
            if let Ok(m) = c.measure(f, r) { sane(&m.reflection); }
        }
    }

    #[test]
    fn code_chains_extremes(f in prop_oneof![Just(0u16), Just(1), Just(2), Just(65_534), Just(65_535), any::<u16>()],
                            r in prop_oneof![Just(0u16), Just(1), Just(65_534), Just(65_535), any::<u16>()]) {
        let limits = CodeLimits::new(1, 65_535);
        let lin = LinearChain::new(limits).unwrap();
        let sq = SquareLawChain::new(limits).unwrap();
        for m in [lin.measure(f, r), sq.measure(f, r)] {
            match m {
                Ok(m) => { sane(&m.reflection); prop_assert!(f > 1 && f < 65_535); }
                Err(_) => prop_assert!(f <= 1 || f == 65_535 || r == 65_535 || r > f),
            }
        }
    }

    #[test]
    fn code_chains_monotonic_in_reflected(f in 2u16..65_535, r1 in any::<u16>(), r2 in any::<u16>()) {
        let (lo, hi) = (r1.min(r2) % f, r1.max(r2) % f);
        let (lo, hi) = (lo.min(hi), lo.max(hi));
        let limits = CodeLimits::new(1, 65_535);
        let lin = LinearChain::new(limits).unwrap();
        let sq = SquareLawChain::new(limits).unwrap();
        let (a, b) = (lin.measure(f, lo).unwrap(), lin.measure(f, hi).unwrap());
        prop_assert!(ordered(&a, &b), "linear {f} {lo} {hi}: {a:?} {b:?}");
        let (a, b) = (sq.measure(f, lo).unwrap(), sq.measure(f, hi).unwrap());
        prop_assert!(ordered(&a, &b), "square {f} {lo} {hi}: {a:?} {b:?}");
    }

    #[test]
    fn code_chains_neighbours_monotonic(f in 2u16..65_535, r in any::<u16>()) {
        // Adjacent reflected codes: the finest step where rounding could reverse an order.
        let r = r % (f - 1);
        let limits = CodeLimits::new(1, 65_535);
        let lin = LinearChain::new(limits).unwrap();
        let sq = SquareLawChain::new(limits).unwrap();
        prop_assert!(ordered(&lin.measure(f, r).unwrap(), &lin.measure(f, r + 1).unwrap()), "linear {f} {r}");
        prop_assert!(ordered(&sq.measure(f, r).unwrap(), &sq.measure(f, r + 1).unwrap()), "square {f} {r}");
    }

    #[test]
    fn dbm_chain_any_input(pf in any::<i32>(), pr in any::<i32>(), floor in any::<i32>(), max in any::<i32>()) {
        if let Ok(c) = DbmChain::new(DbmLimits::new(DbmQ16::from_bits(floor), DbmQ16::from_bits(max))) {
            if let Ok(m) = c.measure(DbmQ16::from_bits(pf), DbmQ16::from_bits(pr)) {
                sane(&m.reflection);
            }
        }
    }

    #[test]
    fn dbm_chain_monotonic(d1 in 0i32..(120 << 16), d2 in 0i32..(120 << 16)) {
        let c = DbmChain::new(DbmLimits::new(DbmQ16::from_int(-200), DbmQ16::from_int(30))).unwrap();
        let f = DbmQ16::from_int(10);
        let (small, big) = (d1.min(d2), d1.max(d2)); // reflected lower by more = less reflection
        let a = c.measure(f, f - DbQ16::from_bits(big)).unwrap();
        let b = c.measure(f, f - DbQ16::from_bits(small)).unwrap();
        prop_assert!(ordered(&a, &b), "{small} {big}: {a:?} {b:?}");
    }

    #[test]
    fn log_chain_any_input(slope in any::<i32>(), nv in any::<u32>(), intercept in any::<i16>(),
                           floor in any::<i16>(), max in any::<i16>(), f in any::<u16>(), r in any::<u16>()) {
        if let Some(c) = log_chain(slope, nv, intercept, floor, max) {
            if let Ok(m) = c.measure(f, r) { sane(&m.reflection); }
        }
    }

    #[test]
    fn log_chain_monotonic(f in 0u16..4096, r1 in 0u16..4096, r2 in 0u16..4096) {
        let c = log_chain(-25_000, 805_664, 20, -65, 5).unwrap();
        // Falling slope: a higher reflected code is less reflected power.
        let (more, less) = (r1.min(r2), r1.max(r2));
        if let (Ok(a), Ok(b)) = (c.measure(f, less), c.measure(f, more)) {
            prop_assert!(ordered(&a, &b), "{f} {less} {more}: {a:?} {b:?}");
        }
    }
}
