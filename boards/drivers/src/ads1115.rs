//! ADS1115 16-bit ΔΣ ADC over I2C, single-shot conversions.
//!
//! Source: Texas Instruments, *ADS111x Ultra-Small, Low-Power, I2C-Compatible, 860-SPS, 16-Bit
//! ADCs With Internal Reference, Oscillator, and Programmable Comparator*, data sheet SBAS444
//! ("Register Map": address pointer, conversion and config registers). Summary used here:
//!
//! * 7-bit address 0x48–0x4B (ADDR pin to GND, VDD, SDA, SCL).
//! * Pointer 0 = conversion (i16, two's complement), 1 = config. A register write is
//!   [pointer, MSB, LSB]; a read sets the pointer, then reads MSB, LSB.
//! * Config: OS (15: write 1 to start a single conversion; reads 0 while converting), MUX
//!   (14–12: 100–111 = AIN0–AIN3 against GND, 000 = AIN0 − AIN1), PGA (11–9: ±6.144, ±4.096,
//!   ±2.048, ±1.024, ±0.512, ±0.256 V), MODE (8: 1 = single shot), DR (7–5: 8 to 860 SPS),
//!   comparator bits (4–0; 0b00011 disables it).

use embedded_hal::delay::DelayNs;
use embedded_hal::i2c::I2c;

/// Address with ADDR tied to GND.
pub const ADDRESS_GND: u8 = 0x48;
const REG_CONVERSION: u8 = 0;
const REG_CONFIG: u8 = 1;
const OS: u16 = 1 << 15;
const MODE_SINGLE: u16 = 1 << 8;
const COMP_DISABLE: u16 = 0b11;

/// Errors of the ADS1115 driver.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Error<E> {
    /// The I2C transfer failed.
    I2c(E),
    /// The conversion did not finish within the polls allowed.
    Timeout,
}

/// The input multiplexer setting.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Input {
    /// AIN0 against GND.
    Ain0,
    /// AIN1 against GND.
    Ain1,
    /// AIN2 against GND.
    Ain2,
    /// AIN3 against GND.
    Ain3,
    /// AIN0 − AIN1.
    Diff01,
}

impl Input {
    const fn mux(self) -> u16 {
        (match self {
            Input::Diff01 => 0b000,
            Input::Ain0 => 0b100,
            Input::Ain1 => 0b101,
            Input::Ain2 => 0b110,
            Input::Ain3 => 0b111,
        }) << 12
    }
}

/// Full-scale range of the programmable-gain amplifier.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Range {
    /// ±6.144 V (inputs still limited to VDD).
    V6_144,
    /// ±4.096 V.
    V4_096,
    /// ±2.048 V (power-on default).
    V2_048,
    /// ±1.024 V.
    V1_024,
    /// ±0.512 V.
    V0_512,
    /// ±0.256 V.
    V0_256,
}

impl Range {
    const fn pga(self) -> u16 {
        (match self {
            Range::V6_144 => 0b000,
            Range::V4_096 => 0b001,
            Range::V2_048 => 0b010,
            Range::V1_024 => 0b011,
            Range::V0_512 => 0b100,
            Range::V0_256 => 0b101,
        }) << 9
    }

    /// Full scale in microvolts.
    pub const fn full_scale_uv(self) -> i32 {
        match self {
            Range::V6_144 => 6_144_000,
            Range::V4_096 => 4_096_000,
            Range::V2_048 => 2_048_000,
            Range::V1_024 => 1_024_000,
            Range::V0_512 => 512_000,
            Range::V0_256 => 256_000,
        }
    }
}

/// Conversions per second.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Rate {
    /// 8 SPS.
    Sps8,
    /// 16 SPS.
    Sps16,
    /// 32 SPS.
    Sps32,
    /// 64 SPS.
    Sps64,
    /// 128 SPS (power-on default).
    Sps128,
    /// 250 SPS.
    Sps250,
    /// 475 SPS.
    Sps475,
    /// 860 SPS.
    Sps860,
}

impl Rate {
    const fn dr(self) -> u16 {
        (self as u16) << 5
    }

    /// One conversion's time in microseconds, rounded up.
    pub const fn period_us(self) -> u32 {
        let sps = match self {
            Rate::Sps8 => 8,
            Rate::Sps16 => 16,
            Rate::Sps32 => 32,
            Rate::Sps64 => 64,
            Rate::Sps128 => 128,
            Rate::Sps250 => 250,
            Rate::Sps475 => 475,
            Rate::Sps860 => 860,
        };
        1_000_000_u32.div_ceil(sps)
    }
}

/// The config word that starts one single-shot conversion.
pub const fn config_word(input: Input, range: Range, rate: Rate) -> u16 {
    OS | input.mux() | range.pga() | MODE_SINGLE | rate.dr() | COMP_DISABLE
}

/// An ADS1115 on an I2C bus.
#[derive(Debug)]
pub struct Ads1115<I2C> {
    i2c: I2C,
    address: u8,
    range: Range,
    rate: Rate,
}

impl<I2C: I2c> Ads1115<I2C> {
    /// A driver at `address` with this range and rate. Writes nothing.
    pub fn new(i2c: I2C, address: u8, range: Range, rate: Rate) -> Self {
        Ads1115 {
            i2c,
            address,
            range,
            rate,
        }
    }

    /// Starts one conversion of `input`.
    pub fn start(&mut self, input: Input) -> Result<(), Error<I2C::Error>> {
        let [hi, lo] = config_word(input, self.range, self.rate).to_be_bytes();
        self.i2c
            .write(self.address, &[REG_CONFIG, hi, lo])
            .map_err(Error::I2c)
    }

    fn read_register(&mut self, reg: u8) -> Result<u16, Error<I2C::Error>> {
        let mut buf = [0u8; 2];
        self.i2c
            .write_read(self.address, &[reg], &mut buf)
            .map_err(Error::I2c)?;
        Ok(u16::from_be_bytes(buf))
    }

    /// True while a conversion is in progress (OS bit reads 0).
    pub fn is_busy(&mut self) -> Result<bool, Error<I2C::Error>> {
        Ok(self.read_register(REG_CONFIG)? & OS == 0)
    }

    /// The last conversion result.
    pub fn read_raw(&mut self) -> Result<i16, Error<I2C::Error>> {
        Ok(self.read_register(REG_CONVERSION)? as i16)
    }

    /// Starts a conversion of `input`, waits one conversion time, then polls (every 100 µs,
    /// at most `polls` times) until it is done and returns the code.
    pub fn convert<D: DelayNs>(
        &mut self,
        input: Input,
        delay: &mut D,
        polls: u16,
    ) -> Result<i16, Error<I2C::Error>> {
        self.start(input)?;
        delay.delay_us(self.rate.period_us());
        for _ in 0..=polls {
            if !self.is_busy()? {
                return self.read_raw();
            }
            delay.delay_us(100);
        }
        Err(Error::Timeout)
    }

    /// A code in microvolts for the configured range: code · FS / 32768.
    pub fn microvolts(&self, code: i16) -> i32 {
        let uv = i64::from(code) * i64::from(self.range.full_scale_uv()) / 32_768;
        i32::try_from(uv).unwrap_or(if uv < 0 { i32::MIN } else { i32::MAX })
    }

    /// Gives the bus back.
    pub fn release(self) -> I2C {
        self.i2c
    }
}
