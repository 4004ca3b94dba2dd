//! AD9833 driver against a recording SPI device. Expected words are worked from the register
//! tables of the Analog Devices AD9833 data sheet; the 400 Hz sequence is the worked example of
//! Analog Devices application note AN-1070 (from memory: 0x2100, 0x50C7, 0x4000, 0xC000,
//! 0x2000 for 400 Hz from a 25 MHz clock).

use embedded_hal::spi::{ErrorKind, ErrorType, Operation, SpiDevice};
use feedline_drivers::ad9833::{frequency_word, Ad9833, Error, Register, Waveform};

/// Records every transaction's written bytes as 16-bit words.
#[derive(Default)]
struct Recorder {
    words: Vec<u16>,
    fail: bool,
}

impl ErrorType for Recorder {
    type Error = ErrorKind;
}

impl SpiDevice for Recorder {
    fn transaction(&mut self, ops: &mut [Operation<'_, u8>]) -> Result<(), ErrorKind> {
        if self.fail {
            return Err(ErrorKind::Other);
        }
        for op in ops.iter() {
            match op {
                Operation::Write(b) => {
                    assert_eq!(b.len(), 2, "one 16-bit word per transaction");
                    self.words.push(u16::from_be_bytes([b[0], b[1]]));
                }
                _ => panic!("the AD9833 is write-only"),
            }
        }
        Ok(())
    }
}

const MCLK: u32 = 25_000_000;

#[test]
fn application_note_400_hz_sequence() {
    let mut d = Ad9833::new(Recorder::default(), MCLK);
    d.init().unwrap();
    let mut spi = d.release();
    spi.words.clear();
    let mut d = Ad9833::new(spi, MCLK);
    // reset + B28, FREQ0 LSB, MSB, PHASE0, release reset
    d.hold().unwrap();
    let set = d.set_frequency(Register::Zero, 400).unwrap();
    d.set_phase(Register::Zero, 0).unwrap();
    d.enable().unwrap();
    let w = d.release().words;
    // set_frequency re-asserts the control word (with B28) before the two halves.
    assert_eq!(w, vec![0x2100, 0x2100, 0x50C7, 0x4000, 0xC000, 0x2000]);
    assert_eq!(set, 400); // 4295 · 25e6 / 2^28 = 400.003 Hz
}

#[test]
fn frequency_words() {
    // f · 2^28 / f_MCLK, rounded to nearest (hand-computed).
    let cases = [
        (0, 0),
        (400, 4_295),
        (1_000_000, 10_737_418),
        (12_500_000, 1 << 27), // f_MCLK / 2, the largest allowed
        (7_040_000, 75_591_424),
    ];
    for (hz, word) in cases {
        assert_eq!(frequency_word(hz, MCLK), Some(word), "{hz} Hz");
    }
    assert_eq!(frequency_word(12_500_001, MCLK), None);
    assert_eq!(frequency_word(1, 0), None);
    let mut d = Ad9833::new(Recorder::default(), MCLK);
    assert_eq!(
        d.set_frequency(Register::One, 13_000_000),
        Err(Error::Frequency)
    );
}

#[test]
fn frequency_split_into_14_bit_halves() {
    let mut d = Ad9833::new(Recorder::default(), MCLK);
    d.set_frequency(Register::One, 1_000_000).unwrap();
    let w = d.release().words;
    // 10 737 418 = 0xA3D70A: LSB half 0x170A, MSB half 0x028F; FREQ1 address bits 10.
    assert_eq!(w, vec![0x2000, 0x8000 | 0x170A, 0x8000 | 0x028F]);
}

#[test]
fn control_bits() {
    let mut d = Ad9833::new(Recorder::default(), MCLK);
    d.set_waveform(Waveform::Triangle).unwrap();
    d.set_waveform(Waveform::Square).unwrap();
    d.set_waveform(Waveform::SquareHalf).unwrap();
    d.set_waveform(Waveform::Sine).unwrap();
    d.select(Register::One).unwrap();
    d.sleep(true).unwrap();
    d.sleep(false).unwrap();
    d.select(Register::Zero).unwrap();
    d.set_phase(Register::One, 0x1FFF).unwrap(); // high bits dropped
    let w = d.release().words;
    assert_eq!(
        w,
        vec![0x2002, 0x2028, 0x2020, 0x2000, 0x2800, 0x28C0, 0x2800, 0x2000, 0xEFFF]
    );
}

#[test]
fn spi_errors_are_returned() {
    let mut d = Ad9833::new(
        Recorder {
            words: vec![],
            fail: true,
        },
        MCLK,
    );
    assert_eq!(d.init(), Err(Error::Spi(ErrorKind::Other)));
}
