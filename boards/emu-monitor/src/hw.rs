//! Minimal board support for QEMU's `microbit` machine: the nRF51 UART0 for output and
//! semihosting for the command line and the exit status.
//!
//! Temporary: to be replaced by the shared `emu-support` crate once it exists.

use core::fmt;
use core::ptr::{read_volatile, write_volatile};

const UART0: usize = 0x4000_2000;
const TASKS_STARTTX: usize = UART0 + 0x008;
const EVENTS_TXDRDY: usize = UART0 + 0x11C;
const ENABLE: usize = UART0 + 0x500;
const TXD: usize = UART0 + 0x51C;

/// The nRF51 UART0, transmit only.
pub struct Uart(());

impl Uart {
    /// Enables UART0 and starts its transmitter.
    pub fn take() -> Self {
        // SAFETY: fixed, documented nRF51 UART0 register addresses; single-threaded firmware.
        unsafe {
            write_volatile(ENABLE as *mut u32, 4);
            write_volatile(TASKS_STARTTX as *mut u32, 1);
        }
        Uart(())
    }

    fn byte(&mut self, b: u8) {
        // SAFETY: as above.
        unsafe {
            write_volatile(EVENTS_TXDRDY as *mut u32, 0);
            write_volatile(TXD as *mut u32, u32::from(b));
            while read_volatile(EVENTS_TXDRDY as *const u32) == 0 {}
        }
    }
}

impl fmt::Write for Uart {
    fn write_str(&mut self, s: &str) -> fmt::Result {
        for b in s.bytes() {
            if b == b'\n' {
                self.byte(b'\r');
            }
            self.byte(b);
        }
        Ok(())
    }
}

/// Reads the semihosting command line into `buf`; returns it, or "" if unavailable.
pub fn cmdline(buf: &mut [u8]) -> &str {
    let block = [buf.as_mut_ptr() as usize, buf.len()];
    // SAFETY: SYS_GET_CMDLINE takes a pointer to a two-word block [buffer, length] and writes
    // at most `length` bytes into the buffer and the used length back into the block.
    let rc = unsafe {
        cortex_m_semihosting::syscall1(
            cortex_m_semihosting::nr::GET_CMDLINE,
            block.as_ptr() as usize,
        )
    };
    // SAFETY: reading back our own block, which the host may have changed behind the compiler.
    let len = unsafe { read_volatile(block.as_ptr().add(1)) };
    if rc != 0 {
        return "";
    }
    let bytes = buf.get(..len.min(buf.len())).unwrap_or(&[]);
    core::str::from_utf8(bytes).unwrap_or("")
}

/// Ends the QEMU run with success or failure.
pub fn exit(success: bool) -> ! {
    use cortex_m_semihosting::debug;
    debug::exit(if success {
        debug::EXIT_SUCCESS
    } else {
        debug::EXIT_FAILURE
    });
    loop {
        cortex_m::asm::wfi();
    }
}
