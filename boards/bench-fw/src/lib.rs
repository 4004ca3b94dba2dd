//! Board support for the benchmark firmware: a byte UART per emulated board, semihosting exit
//! and command line, the instruction-count marker functions and stack painting.
//!
//! Two QEMU machines are supported (see the host tool `cargo bench-fw`):
//! - `microbit` (nRF51, Cortex-M0, thumbv6m-none-eabi): nRF51 UART0 at 0x4000_2000;
//! - `mps2-an386` (Cortex-M4F, thumbv7em-none-eabihf): CMSDK APB UART0 at 0x4000_4000.
//!
//! Instruction counts: the host runs QEMU with a one-instruction-per-block execution trace and
//! counts the executed instructions between the addresses of [`bench_start`] and
//! [`bench_stop`], read from the ELF symbol table.
//!
//! Stack depth: [`paint_stack`] fills the free RAM between the end of `.bss` (`__sheap`) and
//! the current stack pointer with [`PAINT`]; after the measured call, [`stack_low_water`]
//! finds the lowest word that no longer holds it. Both are written in inline assembly so that
//! they use no stack themselves.
//!
//! On the host (no `target_os = "none"`) this crate is empty, so that workspace-wide host builds
//! keep working.
#![no_std]

#[cfg(target_os = "none")]
mod board;

#[cfg(target_os = "none")]
pub use board::*;

/// Defines `main` of a footprint firmware: the bare board (UART, exit) plus one computation
/// `$f: fn(&Ctx, [u32; 4]) -> [u32; 4]` with its context `$ctx: Ctx` on an input the
/// optimizer cannot see, its result printed. Its flash and RAM minus those of `size-base` are
/// the computation's footprint.
#[macro_export]
macro_rules! size_firmware {
    ($ctx:expr, $f:expr) => {
        #[cfg(not(target_os = "none"))]
        fn main() {}

        #[cfg(target_os = "none")]
        #[cortex_m_rt::entry]
        fn main() -> ! {
            $crate::uart_init();
            let input: [u32; 4] = core::hint::black_box([50_000, 5_000, 0, 0]);
            let ctx = $ctx;
            for w in ($f)(&ctx, input) {
                $crate::write_hex(w);
            }
            $crate::exit(true)
        }
    };
}
