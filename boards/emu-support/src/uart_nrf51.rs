//! Transmit-only driver for the UART0 of the nRF51 (QEMU's `microbit`).
//!
//! Registers (offsets from the base 0x4000_2000, nRF51 reference manual layout):
//! TASKS_STARTTX +0x008, EVENTS_TXDRDY +0x11C, ENABLE +0x500 (4 = enabled), TXD +0x51C.
//! Per byte: clear EVENTS_TXDRDY, write TXD, wait until EVENTS_TXDRDY is set.
//! Pin selection and baud rate are left at reset values (QEMU ignores them); a real board
//! would set PSELTXD and BAUDRATE first.

use core::convert::Infallible;
use core::ptr::{read_volatile, write_volatile};

/// Base address of UART0 on the nRF51.
pub const UART0_BASE: usize = 0x4000_2000;
const TASKS_STARTTX: usize = 0x008;
const EVENTS_TXDRDY: usize = 0x11C;
const ENABLE: usize = 0x500;
const TXD: usize = 0x51C;
const ENABLE_UART: u32 = 4;

/// The nRF51 UART0, transmit side.
#[derive(Debug)]
pub struct Nrf51Uart {
    base: usize,
}

impl Nrf51Uart {
    /// Enables UART0, starts its transmitter and returns the driver.
    pub fn new() -> Self {
        let uart = Nrf51Uart { base: UART0_BASE };
        // SAFETY: ENABLE and TASKS_STARTTX are this chip's UART0 registers, 32-bit aligned.
        unsafe {
            write_volatile((uart.base + ENABLE) as *mut u32, ENABLE_UART);
            write_volatile((uart.base + TASKS_STARTTX) as *mut u32, 1);
        }
        uart
    }

    /// Sends one byte and waits until the UART reports it sent.
    pub fn write_byte(&mut self, byte: u8) {
        // SAFETY: EVENTS_TXDRDY and TXD are UART0 registers (see the module doc), 32-bit aligned.
        unsafe {
            write_volatile((self.base + EVENTS_TXDRDY) as *mut u32, 0);
            write_volatile((self.base + TXD) as *mut u32, u32::from(byte));
            while read_volatile((self.base + EVENTS_TXDRDY) as *const u32) == 0 {}
        }
    }
}

impl Default for Nrf51Uart {
    fn default() -> Self {
        Self::new()
    }
}

impl core::fmt::Write for Nrf51Uart {
    fn write_str(&mut self, s: &str) -> core::fmt::Result {
        s.bytes().for_each(|b| self.write_byte(b));
        Ok(())
    }
}

impl embedded_io::ErrorType for Nrf51Uart {
    type Error = Infallible;
}

impl embedded_io::Write for Nrf51Uart {
    fn write(&mut self, buf: &[u8]) -> Result<usize, Self::Error> {
        buf.iter().for_each(|&b| self.write_byte(b));
        Ok(buf.len())
    }

    fn flush(&mut self) -> Result<(), Self::Error> {
        Ok(())
    }
}
