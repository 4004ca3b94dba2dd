//! ADS1115 driver against a simulated device on a mock I2C bus. Register values are from the
//! TI ADS111x data sheet (SBAS444): the config register's reset value 0x8583 is AIN0 − AIN1,
//! ±2.048 V, single shot, 128 SPS, comparator off.

use embedded_hal::delay::DelayNs;
use embedded_hal::i2c::{ErrorKind, ErrorType, I2c, Operation};
use feedline_drivers::ads1115::{config_word, Ads1115, Error, Input, Range, Rate, ADDRESS_GND};

/// A simulated ADS1115: pointer, config and conversion registers; a conversion completes after
/// `busy_reads` reads of the config register.
struct Sim {
    pointer: u8,
    config: u16,
    conversion: i16,
    busy_reads: u32,
    writes: Vec<Vec<u8>>,
}

impl ErrorType for Sim {
    type Error = ErrorKind;
}

impl I2c for Sim {
    fn transaction(&mut self, address: u8, ops: &mut [Operation<'_>]) -> Result<(), ErrorKind> {
        if address != ADDRESS_GND {
            return Err(ErrorKind::NoAcknowledge(
                embedded_hal::i2c::NoAcknowledgeSource::Address,
            ));
        }
        for op in ops.iter_mut() {
            match op {
                Operation::Write(b) => {
                    self.writes.push(b.to_vec());
                    self.pointer = b[0];
                    if b.len() == 3 && b[0] == 1 {
                        self.config = u16::from_be_bytes([b[1], b[2]]);
                    }
                }
                Operation::Read(buf) => {
                    let v = match self.pointer {
                        0 => self.conversion as u16,
                        1 => {
                            if self.busy_reads > 0 {
                                self.busy_reads -= 1;
                                self.config & 0x7FFF
                            } else {
                                self.config | 0x8000
                            }
                        }
                        _ => 0,
                    };
                    buf.copy_from_slice(&v.to_be_bytes());
                }
            }
        }
        Ok(())
    }
}

struct NoDelay(u32);
impl DelayNs for NoDelay {
    fn delay_ns(&mut self, ns: u32) {
        self.0 += ns / 1000;
    }
}

fn sim(conversion: i16, busy_reads: u32) -> Sim {
    Sim {
        pointer: 0,
        config: 0x8583,
        conversion,
        busy_reads,
        writes: vec![],
    }
}

#[test]
fn config_words_from_the_register_map() {
    assert_eq!(
        config_word(Input::Diff01, Range::V2_048, Rate::Sps128),
        0x8583,
        "reset value"
    );
    // OS 1, MUX 100, PGA 001, MODE 1, DR 100, COMP 00011
    assert_eq!(
        config_word(Input::Ain0, Range::V4_096, Rate::Sps128),
        0xC383
    );
    // MUX 101, PGA 101, DR 111
    assert_eq!(
        config_word(Input::Ain1, Range::V0_256, Rate::Sps860),
        0xDBE3
    );
    assert_eq!(config_word(Input::Ain3, Range::V6_144, Rate::Sps8), 0xF103);
}

#[test]
fn single_shot_conversion() {
    let mut adc = Ads1115::new(sim(12_345, 3), ADDRESS_GND, Range::V4_096, Rate::Sps860);
    let mut d = NoDelay(0);
    let code = adc.convert(Input::Ain1, &mut d, 10).unwrap();
    assert_eq!(code, 12_345);
    // 12 345 · 4.096 V / 32768 = 1.543125 V
    assert_eq!(adc.microvolts(code), 1_543_125);
    assert_eq!(adc.microvolts(-32_768), -4_096_000);
    assert!(
        d.0 >= 1163 + 300,
        "waited a conversion time (1/860 s) and three polls"
    );
    let s = adc.release();
    assert_eq!(s.writes[0], vec![1, 0xD3, 0xE3]);
}

#[test]
fn timeout_and_bus_errors() {
    let mut adc = Ads1115::new(sim(0, 100), ADDRESS_GND, Range::V2_048, Rate::Sps128);
    assert_eq!(
        adc.convert(Input::Ain0, &mut NoDelay(0), 5),
        Err(Error::Timeout)
    );
    let mut wrong = Ads1115::new(sim(0, 0), 0x49, Range::V2_048, Rate::Sps128);
    assert!(matches!(
        wrong.start(Input::Ain0),
        Err(Error::I2c(ErrorKind::NoAcknowledge(_)))
    ));
}

#[test]
fn conversion_periods() {
    assert_eq!(Rate::Sps8.period_us(), 125_000);
    assert_eq!(Rate::Sps860.period_us(), 1163);
    assert_eq!(Rate::Sps475.period_us(), 2106);
}
