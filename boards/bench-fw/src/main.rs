//! Benchmark firmware: runs every operation of [`OPS`] between the instruction-count markers
//! (`time` mode) or over its accuracy sweep with a stack-depth measurement (`sweep` mode), and
//! prints the results over the UART for the host tool `cargo bench-fw`.
//!
//! Output lines (all numbers hex words unless said):
//! - `time` mode: `T <op> <out0> <out1> <out2> <out3>`, one per op, in the order of the traced
//!   marker pairs;
//! - `sweep` mode: `K <op> <stack bytes, decimal>`, then `S <op> <in0..in3> <out0..out3>` per
//!   sweep point;
//! - both: `N <op>` for an op the `quick` smoke skips; finally `DONE`.
//!
//! Adding an operation: write an `#[inline(never)] fn(&Ctx, [u32; 4]) -> [u32; 4]` in `ops`
//! (configuration it needs goes into `Ctx`, built once; array inputs are filled by the op's
//! `prepare`), add an `Op` row to `OPS`, and give it a row (label, error metric, target) in
//! `ROWS` of the host tool `host-tests/src/bin/bench-fw.rs`.
#![cfg_attr(target_os = "none", no_std, no_main)]

#[cfg(not(target_os = "none"))]
fn main() {}

#[cfg(target_os = "none")]
mod ops;

#[cfg(target_os = "none")]
mod fw {
    use crate::ops::{Ctx, Op, OPS};
    use bench_fw::*;
    use core::hint::black_box;

    fn has_word(line: &[u8], word: &[u8]) -> bool {
        line.split(|&b| b == b' ').any(|w| w == word)
    }

    fn time(ctx: &Ctx, op: &Op) {
        let f = black_box(op.run);
        let input = black_box(op.nominal);
        (op.prepare)(ctx, input);
        bench_start();
        let out = black_box(f(ctx, black_box(input)));
        bench_stop();
        write_str("T ");
        write_str(op.name);
        for w in out {
            write_str(" ");
            write_hex(w);
        }
        write_str("\n");
    }

    fn sweep(ctx: &Ctx, op: &Op) {
        let f = black_box(op.run);
        let input = black_box(op.nominal);
        (op.prepare)(ctx, input);
        let top = paint_stack();
        let out = black_box(f(ctx, black_box(input)));
        let low = stack_low_water();
        black_box(out);
        write_str("K ");
        write_str(op.name);
        write_str(" ");
        write_dec(top.saturating_sub(low) as u32);
        write_str("\n");
        let mut k = 0;
        while let Some(input) = (op.sweep)(k) {
            (op.prepare)(ctx, input);
            let out = f(ctx, black_box(input));
            write_str("S ");
            write_str(op.name);
            for w in input.iter().chain(out.iter()) {
                write_str(" ");
                write_hex(*w);
            }
            write_str("\n");
            k += 1;
        }
    }

    #[cortex_m_rt::entry]
    fn main() -> ! {
        uart_init();
        let mut buf = [0u8; 96];
        let cmd = cmdline(&mut buf);
        let quick = has_word(cmd, b"quick");
        let mode_sweep = has_word(cmd, b"sweep");
        let Some(ctx) = Ctx::new() else {
            write_str("bad benchmark configuration\n");
            exit(false)
        };
        let ctx = black_box(&ctx);
        for op in OPS.iter() {
            if quick && !op.quick {
                write_str("N ");
                write_str(op.name);
                write_str("\n");
                continue;
            }
            if mode_sweep {
                sweep(ctx, op);
            } else {
                time(ctx, op);
            }
        }
        write_str("DONE\n");
        exit(true)
    }
}
