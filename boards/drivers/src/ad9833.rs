//! AD9833 DDS waveform generator over SPI.
//!
//! Source: Analog Devices, *AD9833 Low Power, 12.65 mW, 2.3 V to 5.5 V, Programmable Waveform
//! Generator*, data sheet (register descriptions, "Control Register" and "Frequency and Phase
//! Registers" tables). Summary used here:
//!
//! * Every write is one 16-bit word, MSB first, SPI mode 2 (clock idles high, data sampled on
//!   the falling edge); FSYNC (the SpiDevice's chip select) low for each word.
//! * Bits 15–14 select the target: `00` control, `01` FREQ0, `10` FREQ1; `110` / `111` in bits
//!   15–13 select PHASE0 / PHASE1 (12-bit phase, 2π/4096 per step).
//! * Control bits: B28 (13, both 14-bit halves of a 28-bit frequency word in two consecutive
//!   writes, LSBs first), HLB (12), FSELECT (11), PSELECT (10), RESET (8), SLEEP1 (7, MCLK
//!   off), SLEEP12 (6, DAC off), OPBITEN (5, square output), DIV2 (3), MODE (1, triangle).
//! * f_out = f_MCLK · FREQREG / 2^28; f_out ≤ f_MCLK / 2.
//!
//! Start-up: write control with RESET set, the frequency and phase registers, then clear RESET.

use embedded_hal::spi::SpiDevice;

/// Control register: both 14-bit halves of a frequency word follow.
pub const CTRL_B28: u16 = 1 << 13;
/// Control register: FREQ1 drives the phase accumulator.
pub const CTRL_FSELECT: u16 = 1 << 11;
/// Control register: PHASE1 is added to the phase accumulator.
pub const CTRL_PSELECT: u16 = 1 << 10;
/// Control register: internal registers held at zero (output at mid-scale).
pub const CTRL_RESET: u16 = 1 << 8;
/// Control register: MCLK disabled.
pub const CTRL_SLEEP1: u16 = 1 << 7;
/// Control register: DAC powered down.
pub const CTRL_SLEEP12: u16 = 1 << 6;
/// Control register: the DAC MSB (square wave) drives VOUT.
pub const CTRL_OPBITEN: u16 = 1 << 5;
/// Control register: with OPBITEN, the MSB itself (not MSB/2) drives VOUT.
pub const CTRL_DIV2: u16 = 1 << 3;
/// Control register: triangle instead of sine.
pub const CTRL_MODE: u16 = 1 << 1;

/// Address bits of FREQ0.
const FREQ0: u16 = 0b01 << 14;
/// Address bits of FREQ1.
const FREQ1: u16 = 0b10 << 14;
/// Address bits of PHASE0.
const PHASE0: u16 = 0b110 << 13;
/// Address bits of PHASE1.
const PHASE1: u16 = 0b111 << 13;

/// The largest 28-bit frequency word.
pub const FREQ_WORD_MAX: u32 = (1 << 28) - 1;

/// Errors of the AD9833 driver.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Error<E> {
    /// The SPI transfer failed.
    Spi(E),
    /// The frequency is above f_MCLK / 2, or the master clock is 0.
    Frequency,
}

/// Which of the two frequency (or phase) registers.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Register {
    /// FREQ0 / PHASE0.
    Zero,
    /// FREQ1 / PHASE1.
    One,
}

/// The waveform on VOUT.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Waveform {
    /// Sine (the analyzer's test signal).
    Sine,
    /// Triangle.
    Triangle,
    /// Square at f_out (DAC MSB).
    Square,
    /// Square at f_out / 2.
    SquareHalf,
}

/// The frequency word for `hz` with master clock `mclk_hz`, rounded to nearest:
/// ⌊(hz · 2^28 + mclk/2) / mclk⌋.
pub fn frequency_word(hz: u32, mclk_hz: u32) -> Option<u32> {
    if mclk_hz == 0 || hz > mclk_hz / 2 {
        return None;
    }
    let num = (u64::from(hz) << 28).checked_add(u64::from(mclk_hz / 2))?;
    let w = num.checked_div(u64::from(mclk_hz))?;
    u32::try_from(w).ok().map(|w| w.min(FREQ_WORD_MAX))
}

/// An AD9833 on an SPI device (mode 2, ≤ 40 MHz).
#[derive(Debug)]
pub struct Ad9833<SPI> {
    spi: SPI,
    mclk_hz: u32,
    control: u16,
}

impl<SPI: SpiDevice> Ad9833<SPI> {
    /// A driver for a chip clocked at `mclk_hz` (25 MHz on the usual modules). Writes nothing.
    pub fn new(spi: SPI, mclk_hz: u32) -> Self {
        Ad9833 {
            spi,
            mclk_hz,
            control: CTRL_B28,
        }
    }

    fn write_word(&mut self, word: u16) -> Result<(), Error<SPI::Error>> {
        self.spi.write(&word.to_be_bytes()).map_err(Error::Spi)
    }

    fn write_control(&mut self) -> Result<(), Error<SPI::Error>> {
        self.write_word(self.control)
    }

    /// Resets the chip, zeroes both frequency and phase registers, selects FREQ0/PHASE0 and
    /// leaves the output held (reset) until [`enable`](Self::enable).
    pub fn init(&mut self) -> Result<(), Error<SPI::Error>> {
        self.control = CTRL_B28 | CTRL_RESET;
        self.write_control()?;
        for addr in [FREQ0, FREQ1] {
            self.write_word(addr)?;
            self.write_word(addr)?;
        }
        self.write_word(PHASE0)?;
        self.write_word(PHASE1)
    }

    /// Releases reset: the selected register's frequency appears on VOUT.
    pub fn enable(&mut self) -> Result<(), Error<SPI::Error>> {
        self.control &= !CTRL_RESET;
        self.write_control()
    }

    /// Holds the output at mid-scale (reset set).
    pub fn hold(&mut self) -> Result<(), Error<SPI::Error>> {
        self.control |= CTRL_RESET;
        self.write_control()
    }

    /// Writes a frequency in Hz to a frequency register; returns the frequency actually set
    /// (in Hz, rounded down), the DDS's resolution being f_MCLK / 2^28.
    pub fn set_frequency(&mut self, reg: Register, hz: u32) -> Result<u32, Error<SPI::Error>> {
        let word = frequency_word(hz, self.mclk_hz).ok_or(Error::Frequency)?;
        let addr = match reg {
            Register::Zero => FREQ0,
            Register::One => FREQ1,
        };
        // B28 must be set so the two writes form one 28-bit word (LSB half first).
        self.control |= CTRL_B28;
        self.write_control()?;
        self.write_word(addr | (word & 0x3FFF) as u16)?;
        self.write_word(addr | ((word >> 14) & 0x3FFF) as u16)?;
        let actual = (u64::from(word) * u64::from(self.mclk_hz)) >> 28;
        Ok(u32::try_from(actual).unwrap_or(u32::MAX))
    }

    /// Writes a phase (0..4096, 2π/4096 per step; higher bits ignored) to a phase register.
    pub fn set_phase(&mut self, reg: Register, phase: u16) -> Result<(), Error<SPI::Error>> {
        let addr = match reg {
            Register::Zero => PHASE0,
            Register::One => PHASE1,
        };
        self.write_word(addr | (phase & 0x0FFF))
    }

    /// Selects which frequency register drives the output.
    pub fn select(&mut self, reg: Register) -> Result<(), Error<SPI::Error>> {
        match reg {
            Register::Zero => self.control &= !CTRL_FSELECT,
            Register::One => self.control |= CTRL_FSELECT,
        }
        self.write_control()
    }

    /// Sets the output waveform.
    pub fn set_waveform(&mut self, w: Waveform) -> Result<(), Error<SPI::Error>> {
        self.control &= !(CTRL_OPBITEN | CTRL_DIV2 | CTRL_MODE);
        self.control |= match w {
            Waveform::Sine => 0,
            Waveform::Triangle => CTRL_MODE,
            Waveform::Square => CTRL_OPBITEN | CTRL_DIV2,
            Waveform::SquareHalf => CTRL_OPBITEN,
        };
        self.write_control()
    }

    /// Powers down the clock and the DAC (`true`) or wakes them (`false`).
    pub fn sleep(&mut self, asleep: bool) -> Result<(), Error<SPI::Error>> {
        if asleep {
            self.control |= CTRL_SLEEP1 | CTRL_SLEEP12;
        } else {
            self.control &= !(CTRL_SLEEP1 | CTRL_SLEEP12);
        }
        self.write_control()
    }

    /// The control word last written (for logs and tests).
    pub fn control(&self) -> u16 {
        self.control
    }

    /// Gives the SPI device back.
    pub fn release(self) -> SPI {
        self.spi
    }
}
