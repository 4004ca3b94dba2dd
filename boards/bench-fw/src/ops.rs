//! The measured operations. Each takes and returns four 32-bit words (integers or f32 bit
//! patterns) so that one runner, one trace parser and one output format serve them all.
//!
//! The host tool knows each op by its `name` and holds its f64 reference and target.

use core::cell::RefCell;
use core::hint::black_box;
use cortex_m::interrupt::{self, Mutex};
use feedline::bridge::{BridgeSpec, Detector, ScalarChain};
use feedline::calibration::OnePortTerms;
use feedline::detector::Adc;
use feedline::dtf::{self, DtfSetup, LossCoefficients, Window};
use feedline::fixed::{CodeLimits, GammaQ31, LinearChain};
use feedline::units::{Db, Hertz, Ohms, Volts};
use feedline::vector::Impedance;
use num_complex::Complex32;

/// Configuration every op may use, built once before the measurements from inputs the
/// optimizer cannot see (a firmware builds these once at start-up too).
pub struct Ctx {
    /// 16-bit ADC, 3.3 V reference; linear detectors, 1 mV floor, 3.2 V ceiling, 40 dB
    /// directivity.
    pub chain: ScalarChain,
    /// The integer chain for the same linear detectors: floor 20 codes, full scale 65 535.
    pub fixed: LinearChain,
    /// Error terms of a one-port calibration (see [`OSL_TERMS`]).
    pub terms: OnePortTerms,
}

/// (directivity e00, source match e11, tracking e10e01) as (re, im): an invented bridge with
/// about 26 dB directivity. The host tool's f64 reference uses the same numbers.
pub const OSL_TERMS: [(f32, f32); 3] = [(0.04, 0.03), (0.1, -0.05), (0.9, 0.1)];

impl Ctx {
    /// The benchmark configuration.
    pub fn new() -> Option<Ctx> {
        Some(Ctx {
            chain: scalar_chain()?,
            fixed: fixed_chain()?,
            terms: osl_terms()?,
        })
    }
}

/// The f32 chain of [`Ctx::chain`], alone (the footprint firmware builds only what it uses).
pub fn scalar_chain() -> Option<ScalarChain> {
    let adc = Adc::new(black_box(16), Volts::new(black_box(3.3)), black_box(0)).ok()?;
    let spec = BridgeSpec::new(
        Detector::Linear,
        Volts::new(black_box(0.001)),
        Volts::new(black_box(3.2)),
        Db::new(black_box(40.0)),
    );
    ScalarChain::new(adc, spec).ok()
}

/// The integer chain of [`Ctx::fixed`], alone.
pub fn fixed_chain() -> Option<LinearChain> {
    LinearChain::new(CodeLimits::new(black_box(20), black_box(65_535))).ok()
}

/// The error terms of [`Ctx::terms`], alone.
pub fn osl_terms() -> Option<OnePortTerms> {
    let c = |(re, im): (f32, f32)| Complex32::new(black_box(re), black_box(im));
    let [e00, e11, t] = OSL_TERMS;
    OnePortTerms::new(c(e00), c(e11), c(t)).ok()
}

/// One measured operation.
pub struct Op {
    /// Short id, no spaces; the host tool's table is keyed on it.
    pub name: &'static str,
    /// The operation. `#[inline(never)]` so its stack frame is its own.
    pub run: fn(&Ctx, [u32; 4]) -> [u32; 4],
    /// Input of the timed run and the stack measurement.
    pub nominal: [u32; 4],
    /// Accuracy sweep: input number `k`, or `None` past the end.
    pub sweep: fn(u32) -> Option<[u32; 4]>,
    /// Part of the `--quick` smoke run.
    pub quick: bool,
    /// Runs before each measured call, outside the counted region and the stack measurement:
    /// fills the buffers an array operation works on (keep them in a `static`
    /// `cortex_m::interrupt::Mutex<RefCell<…>>` shared by `prepare` and `run`). [`no_prepare`]
    /// for scalar ops.
    pub prepare: fn(&Ctx, [u32; 4]),
}

/// The `prepare` of an op that needs none.
pub fn no_prepare<C>(_ctx: &C, _input: [u32; 4]) {}

/// Every operation, in run order. The first, `empty`, measures the call overhead the host
/// subtracts from the others.
pub const OPS: &[Op] = &[
    Op {
        name: "empty",
        run: empty::<Ctx>,
        nominal: [0; 4],
        sweep: no_sweep,
        quick: true,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "naive-libm",
        run: naive_libm::<Ctx>,
        nominal: CHAIN_NOMINAL,
        sweep: chain_sweep,
        quick: true,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "naive-micromath",
        run: naive_micromath::<Ctx>,
        nominal: CHAIN_NOMINAL,
        sweep: chain_sweep,
        quick: true,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "chain-f32",
        run: chain_f32,
        nominal: CHAIN_NOMINAL,
        sweep: chain_sweep,
        quick: true,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "libm-log10f",
        run: libm_log10f::<Ctx>,
        nominal: [0x3DCC_CCCD, 0, 0, 0], // 0.1
        sweep: no_sweep,
        quick: false,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "core-gamma-from-rl",
        run: core_gamma_from_rl::<Ctx>,
        nominal: [0x41A0_0000, 0, 0, 0], // 20.0 dB
        sweep: no_sweep,
        quick: false,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "core-directivity-bounds",
        run: core_directivity_bounds::<Ctx>,
        nominal: [0x3DCC_CCCD, 0x4220_0000, 0, 0], // |Γ| 0.1, 40 dB
        sweep: no_sweep,
        quick: false,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "chain-fixed",
        run: chain_fixed,
        nominal: CHAIN_NOMINAL,
        sweep: chain_sweep,
        quick: true,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "fixed-log2",
        run: fixed_log2::<Ctx>,
        nominal: [5_000, 0, 0, 0],
        sweep: log2_sweep,
        quick: false,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "fixed-exp2",
        run: fixed_exp2::<Ctx>,
        nominal: [55_732_705, 0, 0, 0], // 3.3219 in Q8.24: 2^−3.32 ≈ 0.1
        sweep: exp2_sweep,
        quick: false,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "fixed-from-gamma",
        run: fixed_from_gamma::<Ctx>,
        nominal: [214_748_365, 0, 0, 0], // 0.1 in Q1.31
        sweep: gamma_q31_sweep,
        quick: false,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "impedance",
        run: impedance::<Ctx>,
        nominal: [0x3E4C_CCCD, 0x3DCC_CCCD, 0, 0], // Γ = 0.2 + 0.1j
        sweep: complex_sweep,
        quick: false,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "osl-correct",
        run: osl_correct,
        nominal: [0x3E4C_CCCD, 0x3DCC_CCCD, 0, 0],
        sweep: complex_sweep,
        quick: true,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "sweep-point",
        run: sweep_point::<Ctx>,
        nominal: [0; 4],
        sweep: no_sweep,
        quick: false,
        prepare: sweep_point_prepare::<Ctx>,
    },
    Op {
        name: "dtf-256",
        run: dtf_run::<Ctx>,
        nominal: [256, 0, 0, 0],
        sweep: no_sweep,
        quick: false,
        prepare: dtf_prepare::<Ctx>,
    },
    Op {
        name: "dtf-512",
        run: dtf_run::<Ctx>,
        nominal: [512, 0, 0, 0],
        sweep: no_sweep,
        quick: false,
        prepare: dtf_prepare::<Ctx>,
    },
    Op {
        name: "dtf-256-plain",
        run: dtf_run_plain::<Ctx>,
        nominal: [256, 0, 0, 0],
        sweep: no_sweep,
        quick: false,
        prepare: dtf_prepare::<Ctx>,
    },
    Op {
        name: "libm-cosf",
        run: libm_cosf::<Ctx>,
        nominal: [0x3F00_0000, 0, 0, 0], // 0.5
        sweep: no_sweep,
        quick: false,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "libm-sqrtf",
        run: libm_sqrtf::<Ctx>,
        nominal: [0x4120_0000, 0, 0, 0], // 10.0
        sweep: no_sweep,
        quick: false,
        prepare: no_prepare::<Ctx>,
    },
    Op {
        name: "dtf-fft-1024",
        run: dtf_fft::<Ctx>,
        nominal: [1024, 0, 0, 0],
        sweep: no_sweep,
        quick: false,
        prepare: dtf_prepare::<Ctx>,
    },
    Op {
        name: "core-gamma-reflection",
        run: core_gamma_reflection::<Ctx>,
        nominal: CHAIN_NOMINAL,
        sweep: chain_sweep,
        quick: false,
        prepare: no_prepare::<Ctx>,
    },
];

fn no_sweep(_k: u32) -> Option<[u32; 4]> {
    None
}

#[inline(never)]
fn empty<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    x
}

// ---- scalar chain: two 16-bit linear-detector codes (forward, reflected) → VSWR, RL, ML ----

/// Forward code 50 000, reflected 5 000: |Γ| = 0.1, a return loss of exactly 20 dB.
pub const CHAIN_NOMINAL: [u32; 4] = [50_000, 5_000, 0, 0];

/// Forward code 50 000; reflected codes 300 + 700·k: |Γ| from 0.006 to 0.888 (return loss
/// from 44 dB down to 1 dB), 64 points.
fn chain_sweep(k: u32) -> Option<[u32; 4]> {
    (k < 64).then(|| [50_000, 300 + 700 * k, 0, 0])
}

/// What a firmware author writes first: f32 and libm's `log10f`.
#[inline(never)]
pub fn naive_libm<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    let fwd = x[0] as u16 as f32;
    let refl = x[1] as u16 as f32;
    let g = refl / fwd;
    let vswr = (1.0 + g) / (1.0 - g);
    let rl = -20.0 * libm::log10f(g);
    let ml = -10.0 * libm::log10f(1.0 - g * g);
    [vswr.to_bits(), rl.to_bits(), ml.to_bits(), 0]
}

/// The same with micromath 2.1's fast approximate `log10`.
#[inline(never)]
pub fn naive_micromath<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    use micromath::F32Ext;
    let fwd = x[0] as u16 as f32;
    let refl = x[1] as u16 as f32;
    let g = refl / fwd;
    let vswr = (1.0 + g) / (1.0 - g);
    let rl = -20.0 * g.log10();
    let ml = -10.0 * (1.0 - g * g).log10();
    [vswr.to_bits(), rl.to_bits(), ml.to_bits(), 0]
}

/// The core's f32 scalar relations (src/reflection.rs): ratio of the codes → `Gamma` →
/// `Reflection` (VSWR, return loss, mismatch loss, capped flag).
#[inline(never)]
pub fn core_gamma_reflection<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    let fwd = x[0] as u16 as f32;
    let refl = x[1] as u16 as f32;
    let r = feedline::reflection::Gamma::saturating(refl / fwd).reflection();
    [
        r.vswr.value().to_bits(),
        r.return_loss.value().to_bits(),
        r.mismatch_loss.value().to_bits(),
        u32::from(r.capped),
    ]
}

/// f32 NaN: marks an output word of a refused reading.
const REFUSED: u32 = 0x7FC0_0000;

/// The core's scalar chain (src/bridge.rs): two ADC codes → volts → return loss → |Γ|, VSWR,
/// mismatch loss, directivity bounds and the quality verdict. Out: VSWR, RL, ML (f32 bits)
/// and the quality flags (low byte) or the fault (`0x100 + discriminant`).
#[inline(never)]
pub fn chain_f32(ctx: &Ctx, x: [u32; 4]) -> [u32; 4] {
    measure_f32(&ctx.chain, x)
}

/// The body of [`chain_f32`] for any chain.
#[inline(always)]
pub fn measure_f32(chain: &ScalarChain, x: [u32; 4]) -> [u32; 4] {
    match chain.measure_codes(x[0] as u16, x[1] as u16) {
        Ok(m) => [
            m.reflection.vswr.value().to_bits(),
            m.reflection.return_loss.value().to_bits(),
            m.reflection.mismatch_loss.value().to_bits(),
            u32::from(m.quality.bits()),
        ],
        Err(e) => [REFUSED, REFUSED, REFUSED, 0x100 + e as u32],
    }
}

/// One libm `log10f` (the unit of cost of the f32 chains). In: x (f32 bits).
#[inline(never)]
pub fn libm_log10f<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    [libm::log10f(f32::from_bits(x[0])).to_bits(), 0, 0, 0]
}

/// `Gamma::from_return_loss` (one `powf`). In: RL dB (f32 bits). Out: |Γ|.
#[inline(never)]
pub fn core_gamma_from_rl<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    let g = feedline::reflection::Gamma::from_return_loss(Db::new(f32::from_bits(x[0])));
    [g.map_or(REFUSED, |g| g.value().to_bits()), 0, 0, 0]
}

/// `uncertainty::directivity_bounds`. In: |Γ|, directivity dB (f32 bits). Out: RL low, RL
/// high, VSWR low, VSWR high.
#[inline(never)]
pub fn core_directivity_bounds<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    let g = feedline::reflection::Gamma::saturating(f32::from_bits(x[0]));
    let b = feedline::uncertainty::directivity_bounds(g, Db::new(f32::from_bits(x[1])));
    [
        b.return_loss_low.value().to_bits(),
        b.return_loss_high.value().to_bits(),
        b.vswr_low.value().to_bits(),
        b.vswr_high.value().to_bits(),
    ]
}

/// The core's integer chain (src/fixed/chain.rs, `LinearChain::measure`). Out: VSWR (Q16.16),
/// RL (Q16.16 dB), ML (Q16.16 dB) bits and the quality flags, or the fault (`0x100 + n`).
#[inline(never)]
pub fn chain_fixed(ctx: &Ctx, x: [u32; 4]) -> [u32; 4] {
    measure_fixed(&ctx.fixed, x)
}

/// The body of [`chain_fixed`] for any chain.
#[inline(always)]
pub fn measure_fixed(chain: &LinearChain, x: [u32; 4]) -> [u32; 4] {
    match chain.measure(x[0] as u16, x[1] as u16) {
        Ok(m) => [
            m.reflection.vswr.to_bits(),
            m.reflection.return_loss.to_bits() as u32,
            m.reflection.mismatch_loss.to_bits() as u32,
            u32::from(m.quality.bits()),
        ],
        Err(e) => [u32::MAX, u32::MAX, u32::MAX, 0x100 + e as u32],
    }
}

/// `fixed::log2::log2_q24`. In: x. Out: log2(x) in Q8.24 (i32 bits).
#[inline(never)]
pub fn fixed_log2<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    [feedline::fixed::log2::log2_q24(x[0]) as u32, 0, 0, 0]
}

/// x = 1 + 67 108 853·k / 64 over 64 points: 1 … 2^26, every mantissa region.
fn log2_sweep(k: u32) -> Option<[u32; 4]> {
    (k < 64).then(|| [1 + (67_108_853 / 64) * k + k * k, 0, 0, 0])
}

/// `fixed::exp2::exp2_neg_q31`. In: a ≥ 0 in Q8.24. Out: 2^−a in Q1.31.
#[inline(never)]
pub fn fixed_exp2<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    [feedline::fixed::exp2::exp2_neg_q31(x[0]), 0, 0, 0]
}

/// a from 0 to 16 in Q8.24, 64 points with odd fractions.
fn exp2_sweep(k: u32) -> Option<[u32; 4]> {
    (k < 64).then(|| [k * 4_194_304 + k * 12_345, 0, 0, 0])
}

/// `fixed::from_gamma`. In: |Γ| in Q1.31. Out: VSWR, RL, ML (Q16.16 bits), capped.
#[inline(never)]
pub fn fixed_from_gamma<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    let r = feedline::fixed::from_gamma(GammaQ31::from_bits(x[0]));
    [
        r.vswr.to_bits(),
        r.return_loss.to_bits() as u32,
        r.mismatch_loss.to_bits() as u32,
        u32::from(r.capped),
    ]
}

/// |Γ| from 0.006 to 0.89 in Q1.31, 64 points.
fn gamma_q31_sweep(k: u32) -> Option<[u32; 4]> {
    (k < 64).then(|| [12_884_902 + 29_614_000 * k, 0, 0, 0])
}

/// `vector::Impedance::from_gamma` with Z0 = 50 Ω. In: Γ (re, im f32 bits). Out: R, X (f32
/// bits), capped.
#[inline(never)]
pub fn impedance<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    let g = Complex32::new(f32::from_bits(x[0]), f32::from_bits(x[1]));
    match Impedance::from_gamma(g, Ohms::new(50.0)) {
        Ok(z) => [
            z.resistance().value().to_bits(),
            z.reactance().value().to_bits(),
            u32::from(z.is_capped()),
            0,
        ],
        Err(_) => [REFUSED, REFUSED, 0, 1],
    }
}

/// Γ on an 8 × 8 grid over −0.7 … 0.7 in both parts (|Γ| ≤ 0.99).
fn complex_sweep(k: u32) -> Option<[u32; 4]> {
    (k < 64).then(|| {
        let re = -0.7 + 0.2 * (k % 8) as f32;
        let im = -0.7 + 0.2 * (k / 8) as f32;
        [re.to_bits(), im.to_bits(), 0, 0]
    })
}

/// `calibration::OnePortTerms::correct` (OSL correction of one point). In: raw Γ (re, im).
/// Out: corrected Γ (re, im).
#[inline(never)]
pub fn osl_correct(ctx: &Ctx, x: [u32; 4]) -> [u32; 4] {
    correct_osl(&ctx.terms, x)
}

/// The body of [`osl_correct`] for any terms.
#[inline(always)]
pub fn correct_osl(terms: &OnePortTerms, x: [u32; 4]) -> [u32; 4] {
    let m = Complex32::new(f32::from_bits(x[0]), f32::from_bits(x[1]));
    match terms.correct(m) {
        Ok(g) => [g.re.to_bits(), g.im.to_bits(), 0, 0],
        Err(_) => [REFUSED, REFUSED, 0, 1],
    }
}

type Analysis = (
    feedline::analysis::MinimumVswr,
    feedline::analysis::BandTracker<4>,
);

static ANALYSIS: Mutex<RefCell<Option<Analysis>>> = Mutex::new(RefCell::new(None));

/// Fresh minimum-VSWR and 2:1-band trackers that have seen two points.
pub fn sweep_point_prepare<C>(_ctx: &C, _x: [u32; 4]) {
    use feedline::reflection::{Gamma, Vswr};
    let mut min = feedline::analysis::MinimumVswr::new();
    let Ok(limit) = Vswr::new(2.0) else { return };
    let mut bands = feedline::analysis::BandTracker::<4>::new(limit);
    for (f, g) in [(100.0e6, 0.4), (101.0e6, 0.3)] {
        let g = Gamma::saturating(g);
        min.push(Hertz::new(f), g);
        bands.push(Hertz::new(f), g.vswr());
    }
    interrupt::free(|cs| *ANALYSIS.borrow(cs).borrow_mut() = Some((min, bands)));
}

/// Sweep analysis of one point: |Γ| → VSWR, then the minimum-VSWR and band trackers.
#[inline(never)]
pub fn sweep_point<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    let g = feedline::reflection::Gamma::saturating(black_box(0.2) + f32::from_bits(x[0]));
    interrupt::free(|cs| {
        if let Some((min, bands)) = ANALYSIS.borrow(cs).borrow_mut().as_mut() {
            min.push(Hertz::new(102.0e6), g);
            bands.push(Hertz::new(102.0e6), g.vswr());
            return [min.skipped() as u32, bands.bands().len() as u32, 0, 0];
        }
        [0; 4]
    })
}

/// Transform length M of the distance-to-fault ops: 1024 bins (8 KiB of `Complex32`).
pub const DTF_BINS: usize = 1024;

static DTF_BUF: Mutex<RefCell<[Complex32; DTF_BINS]>> =
    Mutex::new(RefCell::new([Complex32::new(0.0, 0.0); DTF_BINS]));

/// 1 … 301 MHz, Hann window, velocity factor 0.66, loss of a thin coax (invented figures).
fn dtf_setup() -> Option<DtfSetup<LossCoefficients>> {
    Some(DtfSetup {
        start: Hertz::new(1.0e6),
        stop: Hertz::new(301.0e6),
        window: Window::Hann,
        velocity_factor: 0.66,
        loss: LossCoefficients::new(0.04, 0.0005)?,
    })
}

/// Fills the buffer with the sweep of one reflection (|ρ| = 0.3, 12 m out) behind a small
/// mismatch: Γ_k = 0.05 + 0.3·w^k, w = e^(−j·2π·Δf·2d/v), by phasor rotation.
pub fn dtf_prepare<C>(_ctx: &C, x: [u32; 4]) {
    let points = x[0] as usize;
    let df = 300.0e6 / (points as f32 - 1.0);
    let phase = -2.0 * core::f32::consts::PI * df * 2.0 * 12.0 / (0.66 * dtf::SPEED_OF_LIGHT);
    let w = Complex32::new(libm::cosf(phase), libm::sinf(phase));
    let mut z = Complex32::new(0.3, 0.0);
    interrupt::free(|cs| {
        for (k, b) in DTF_BUF.borrow(cs).borrow_mut().iter_mut().enumerate() {
            *b = if k < points {
                Complex32::new(0.05, 0.0) + z
            } else {
                Complex32::new(0.0, 0.0)
            };
            z *= w;
        }
    });
}

/// `dtf::transform_in_place`: points → 1024 bins. In: points. Out: bins, bin spacing (f32
/// bits), |response| at 12 m (f32 bits).
#[inline(never)]
pub fn dtf_run<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    let Some(setup) = dtf_setup() else {
        return [0; 4];
    };
    interrupt::free(|cs| {
        let mut buf = DTF_BUF.borrow(cs).borrow_mut();
        match dtf::transform_in_place(&mut buf[..], x[0] as usize, &setup) {
            Ok(r) => {
                let n = (12.0 / r.bin_spacing().value()) as usize;
                [
                    r.bins() as u32,
                    r.bin_spacing().value().to_bits(),
                    r.magnitude(n).unwrap_or(f32::NAN).to_bits(),
                    0,
                ]
            }
            Err(_) => [0, 0, 0, 1],
        }
    })
}

/// The FFT alone (`dtf::forward_in_place`, microfft radix-2) on the 1024-point buffer.
#[inline(never)]
pub fn dtf_fft<C>(_ctx: &C, _x: [u32; 4]) -> [u32; 4] {
    interrupt::free(|cs| {
        let mut buf = DTF_BUF.borrow(cs).borrow_mut();
        let ok = dtf::forward_in_place(&mut buf[..]);
        [u32::from(ok), buf[3].re.to_bits(), 0, 0]
    })
}

/// As [`dtf_run`] with a rectangular window and no loss model: the transform's own cost
/// without the per-point window and loss evaluations.
#[inline(never)]
pub fn dtf_run_plain<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    let setup = DtfSetup {
        start: Hertz::new(1.0e6),
        stop: Hertz::new(301.0e6),
        window: Window::Rectangular,
        velocity_factor: 0.66,
        loss: dtf::NoLoss,
    };
    interrupt::free(|cs| {
        let mut buf = DTF_BUF.borrow(cs).borrow_mut();
        match dtf::transform_in_place(&mut buf[..], x[0] as usize, &setup) {
            Ok(r) => [r.bins() as u32, r.bin_spacing().value().to_bits(), 0, 0],
            Err(_) => [0, 0, 0, 1],
        }
    })
}

/// One libm `cosf` (the Hann window's cost per point).
#[inline(never)]
pub fn libm_cosf<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    [libm::cosf(f32::from_bits(x[0])).to_bits(), 0, 0, 0]
}

/// One libm `sqrtf` (the loss model's cost per point).
#[inline(never)]
pub fn libm_sqrtf<C>(_ctx: &C, x: [u32; 4]) -> [u32; 4] {
    [libm::sqrtf(f32::from_bits(x[0])).to_bits(), 0, 0, 0]
}
