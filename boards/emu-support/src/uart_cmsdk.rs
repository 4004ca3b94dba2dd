//! Transmit-only driver for the ARM CMSDK APB UART, as UART0 of QEMU's `mps2-an386`.
//!
//! Registers (offsets from the base 0x4000_4000, CMSDK APB UART layout): DATA +0x00 (write a
//! byte to send), STATE +0x04 (bit 0 = TX buffer full), CTRL +0x08 (bit 0 = TX enable),
//! BAUDDIV +0x10 (clock divider, at least 16). Sending waits while the TX buffer is full.

use core::convert::Infallible;
use core::ptr::{read_volatile, write_volatile};

/// Base address of UART0 on `mps2-an386`.
pub const UART0_BASE: usize = 0x4000_4000;
const DATA: usize = 0x00;
const STATE: usize = 0x04;
const CTRL: usize = 0x08;
const BAUDDIV: usize = 0x10;
const STATE_TX_FULL: u32 = 1 << 0;
const CTRL_TX_ENABLE: u32 = 1 << 0;

/// The CMSDK APB UART0, transmit side.
#[derive(Debug)]
pub struct CmsdkUart {
    base: usize,
}

impl CmsdkUart {
    /// Enables the transmitter of UART0 and returns the driver.
    ///
    /// More than one instance may exist; they share the one UART, so interleaved writes from
    /// two of them interleave on the wire.
    pub fn new() -> Self {
        let uart = CmsdkUart { base: UART0_BASE };
        // SAFETY: UART0_BASE + BAUDDIV and + CTRL are this machine's UART0 registers;
        // 32-bit aligned device memory with no side effect beyond the UART's own state.
        unsafe {
            write_volatile((uart.base + BAUDDIV) as *mut u32, 16);
            write_volatile((uart.base + CTRL) as *mut u32, CTRL_TX_ENABLE);
        }
        uart
    }

    /// Sends one byte, waiting while the transmit buffer is full.
    pub fn write_byte(&mut self, byte: u8) {
        // SAFETY: STATE and DATA are UART0 registers (see the module doc), 32-bit aligned.
        unsafe {
            while read_volatile((self.base + STATE) as *const u32) & STATE_TX_FULL != 0 {}
            write_volatile((self.base + DATA) as *mut u32, u32::from(byte));
        }
    }
}

impl Default for CmsdkUart {
    fn default() -> Self {
        Self::new()
    }
}

impl core::fmt::Write for CmsdkUart {
    fn write_str(&mut self, s: &str) -> core::fmt::Result {
        s.bytes().for_each(|b| self.write_byte(b));
        Ok(())
    }
}

impl embedded_io::ErrorType for CmsdkUart {
    type Error = Infallible;
}

impl embedded_io::Write for CmsdkUart {
    fn write(&mut self, buf: &[u8]) -> Result<usize, Self::Error> {
        buf.iter().for_each(|&b| self.write_byte(b));
        Ok(buf.len())
    }

    fn flush(&mut self) -> Result<(), Self::Error> {
        Ok(())
    }
}
