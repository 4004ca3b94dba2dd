//! Board support for feedline's emulated boards under QEMU.
//!
//! * [`uart_cmsdk`]: the CMSDK APB UART0 of `mps2-an386` (Cortex-M4F).
//! * [`uart_nrf51`]: the UART0 of the nRF51 on `microbit` (Cortex-M0).
//! * [`semihost`]: the semihosting command line (how tests choose a scenario at run time) and
//!   exit with a status (how a run reports success to the host).
//! * [`args`]: splitting that command line into `--name value` options, without allocation.
//!
//! Both UART drivers implement [`core::fmt::Write`] and [`embedded_io::Write`]. The cargo
//! feature `mps2-an386` or `microbit` selects [`Console`] (the UART that QEMU's `-nographic`
//! sends to stdout) and puts that machine's `memory.x` on the linker search path (see
//! `build.rs`; feature `no-memory-x` turns that off for a crate that brings its own).
//!
//! Unsafe code is confined to volatile register access at fixed, documented addresses and to
//! the semihosting trap. No function here panics.
#![no_std]
#![deny(missing_docs)]

pub mod args;
pub mod semihost;
pub mod uart_cmsdk;
pub mod uart_nrf51;

/// The console UART of the board selected by the cargo feature.
#[cfg(feature = "mps2-an386")]
pub type Console = uart_cmsdk::CmsdkUart;

/// The console UART of the board selected by the cargo feature.
#[cfg(all(feature = "microbit", not(feature = "mps2-an386")))]
pub type Console = uart_nrf51::Nrf51Uart;
