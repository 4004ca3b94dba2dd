//! The measured operations. Each takes and returns four 32-bit words (integers or f32 bit
//! patterns) so that one runner, one trace parser and one output format serve them all.
//!
//! The host tool knows each op by its `name` and holds its f64 reference and target.

use core::hint::black_box;
use feedline::bridge::{BridgeSpec, Detector, ScalarChain};
use feedline::detector::Adc;
use feedline::units::{Db, Volts};

/// Configuration every op may use, built once before the measurements from inputs the
/// optimizer cannot see (a firmware builds these once at start-up too).
pub struct Ctx {
    /// 16-bit ADC, 3.3 V reference; linear detectors, 1 mV floor, 3.2 V ceiling, 40 dB
    /// directivity.
    pub chain: ScalarChain,
}

impl Ctx {
    /// The benchmark configuration.
    pub fn new() -> Option<Ctx> {
        let adc = Adc::new(black_box(16), Volts::new(black_box(3.3)), black_box(0)).ok()?;
        let spec = BridgeSpec::new(
            Detector::Linear,
            Volts::new(black_box(0.001)),
            Volts::new(black_box(3.2)),
            Db::new(black_box(40.0)),
        );
        Some(Ctx {
            chain: ScalarChain::new(adc, spec),
        })
    }
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
pub fn no_prepare(_ctx: &Ctx, _input: [u32; 4]) {}

/// Every operation, in run order. The first, `empty`, measures the call overhead the host
/// subtracts from the others.
pub const OPS: &[Op] = &[
    Op {
        name: "empty",
        run: empty::<Ctx>,
        nominal: [0; 4],
        sweep: no_sweep,
        quick: true,
        prepare: no_prepare,
    },
    Op {
        name: "naive-libm",
        run: naive_libm::<Ctx>,
        nominal: CHAIN_NOMINAL,
        sweep: chain_sweep,
        quick: true,
        prepare: no_prepare,
    },
    Op {
        name: "naive-micromath",
        run: naive_micromath::<Ctx>,
        nominal: CHAIN_NOMINAL,
        sweep: chain_sweep,
        quick: true,
        prepare: no_prepare,
    },
    Op {
        name: "chain-f32",
        run: chain_f32,
        nominal: CHAIN_NOMINAL,
        sweep: chain_sweep,
        quick: true,
        prepare: no_prepare,
    },
    Op {
        name: "libm-log10f",
        run: libm_log10f::<Ctx>,
        nominal: [0x3DCC_CCCD, 0, 0, 0], // 0.1
        sweep: no_sweep,
        quick: false,
        prepare: no_prepare,
    },
    Op {
        name: "core-gamma-from-rl",
        run: core_gamma_from_rl::<Ctx>,
        nominal: [0x41A0_0000, 0, 0, 0], // 20.0 dB
        sweep: no_sweep,
        quick: false,
        prepare: no_prepare,
    },
    Op {
        name: "core-directivity-bounds",
        run: core_directivity_bounds::<Ctx>,
        nominal: [0x3DCC_CCCD, 0x4220_0000, 0, 0], // |Γ| 0.1, 40 dB
        sweep: no_sweep,
        quick: false,
        prepare: no_prepare,
    },
    Op {
        name: "core-gamma-reflection",
        run: core_gamma_reflection::<Ctx>,
        nominal: CHAIN_NOMINAL,
        sweep: chain_sweep,
        quick: false,
        prepare: no_prepare,
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
    match ctx.chain.measure_codes(x[0] as u16, x[1] as u16) {
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
