#![no_std]
#![no_main]

use core::fmt::Write;
use cortex_m_rt::entry;
use emu_support::{semihost, Console};

#[entry]
fn main() -> ! {
    let mut uart = Console::new();
    let mut buf = [0u8; 256];
    match semihost::cmdline(&mut buf) {
        Ok(line) => {
            let _ = writeln!(uart, "cmdline: {line}");
            for item in emu_support::args::options(line) {
                let _ = writeln!(uart, "  {item:?}");
            }
        }
        Err(e) => {
            let _ = writeln!(uart, "cmdline error: {e:?}");
        }
    }
    semihost::exit(0)
}

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    semihost::exit(101)
}
