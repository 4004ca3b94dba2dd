//! Thin `no_std` drivers over embedded-hal 1.0 traits for feedline's board examples.
//!
//! * [`ad9833`]: Analog Devices AD9833 programmable waveform generator (DDS), over
//!   [`SpiDevice`](embedded_hal::spi::SpiDevice) — a common test-signal source for an analyzer.
//! * [`ads1115`]: Texas Instruments ADS1115 16-bit ΔΣ ADC, over
//!   [`I2c`](embedded_hal::i2c::I2c) — reads the bridge's two detector outputs.
//!
//! Register layouts are from the manufacturers' public data sheets (named in each module).
//! The drivers only move bits: every computation on the readings lives in the tested core
//! crate `feedline`. Nothing here panics: no indexing, no unchecked arithmetic.
#![no_std]
#![forbid(unsafe_code)]
#![deny(missing_docs)]

pub mod ad9833;
pub mod ads1115;
