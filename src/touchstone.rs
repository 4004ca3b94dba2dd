//! Touchstone 1-port export (version 1.1 of the Touchstone file format, the open
//! specification published by the IBIS Open Forum), streamed through [`core::fmt::Write`]
//! with no allocation.
//!
//! What is written, following the specification's rules:
//!
//! - comment lines start with `!` (any text; a comment holding line breaks becomes several
//!   comment lines);
//! - one option line `# <unit> S <format> R <z0>`, written before the first data line, with
//!   unit `HZ`, `KHZ`, `MHZ` or `GHZ` and format `MA` (magnitude, angle in degrees), `DB`
//!   (20·log10 magnitude, angle in degrees) or `RI` (real, imaginary);
//! - one data line per point, `<frequency> <S11 part 1> <S11 part 2>`, frequencies strictly
//!   increasing (the specification requires ascending order).
//!
//! Numbers: frequency in the chosen unit, its exact decimal value when that has at most 15
//! significant digits (every f32 frequency from 4096 Hz to 10^15 Hz), else the shortest decimal
//! that reads back to the same f32 frequency (also after a reader multiplies it by the unit);
//! magnitudes and real/imaginary parts with 6 decimals, dB with 4, angles (degrees) with 3,
//! rounded to nearest (ties to even); the reference impedance as the shortest decimal of its
//! f32. All are written by [`crate::fmt_decimal`] (integer arithmetic, no `core::fmt` float
//! formatting). A zero magnitude in `DB` format is written as −[`DB_CEILING`] dB.
//!
//! Not supported: 2-port and larger files, version 2.0 keywords, noise data, other
//! parameters than S.
//!
//! Panic policy: nothing here panics; write failures and bad points give a
//! [`TouchstoneError`].

use crate::fmt_decimal::{write_fixed, write_scaled, write_shortest};
use crate::reflection::DB_CEILING;
use crate::units::{Hertz, Ohms};
use core::fmt::Write;
use num_complex::Complex32;

/// The frequency unit of the file.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum FrequencyUnit {
    /// Hertz (`HZ`).
    Hz,
    /// Kilohertz (`KHZ`).
    KHz,
    /// Megahertz (`MHZ`).
    MHz,
    /// Gigahertz (`GHZ`).
    GHz,
}

impl FrequencyUnit {
    /// The option-line token.
    pub fn token(self) -> &'static str {
        match self {
            FrequencyUnit::Hz => "HZ",
            FrequencyUnit::KHz => "KHZ",
            FrequencyUnit::MHz => "MHZ",
            FrequencyUnit::GHz => "GHZ",
        }
    }

    /// The power of ten of hertz per unit (0, 3, 6 or 9).
    pub fn decimal_shift(self) -> u8 {
        match self {
            FrequencyUnit::Hz => 0,
            FrequencyUnit::KHz => 3,
            FrequencyUnit::MHz => 6,
            FrequencyUnit::GHz => 9,
        }
    }

    /// Hertz per unit.
    pub fn hertz(self) -> f64 {
        match self {
            FrequencyUnit::Hz => 1.0,
            FrequencyUnit::KHz => 1.0e3,
            FrequencyUnit::MHz => 1.0e6,
            FrequencyUnit::GHz => 1.0e9,
        }
    }
}

/// How each S11 value is written.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum DataFormat {
    /// Magnitude and angle in degrees (`MA`).
    MagnitudeAngle,
    /// Magnitude in dB (20·log10) and angle in degrees (`DB`).
    DecibelAngle,
    /// Real and imaginary parts (`RI`).
    RealImaginary,
}

impl DataFormat {
    /// The option-line token.
    pub fn token(self) -> &'static str {
        match self {
            DataFormat::MagnitudeAngle => "MA",
            DataFormat::DecibelAngle => "DB",
            DataFormat::RealImaginary => "RI",
        }
    }
}

/// Why a Touchstone file could not be written.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum TouchstoneError {
    /// The underlying writer failed.
    Write,
    /// A frequency or S11 value is NaN or infinite.
    NotFinite,
    /// A frequency is negative or not above the previous one.
    NotIncreasing,
    /// The reference impedance is not finite and positive.
    BadReference,
}

impl From<core::fmt::Error> for TouchstoneError {
    fn from(_: core::fmt::Error) -> Self {
        TouchstoneError::Write
    }
}

/// A streaming 1-port Touchstone writer.
#[derive(Debug)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TouchstoneWriter<W> {
    out: W,
    unit: FrequencyUnit,
    format: DataFormat,
    z0: f32,
    option_written: bool,
    last: Option<f32>,
    points: usize,
}

impl<W: Write> TouchstoneWriter<W> {
    /// A writer to `out` with the given unit, format and reference impedance (finite, > 0).
    /// Nothing is written until the first comment or point.
    pub fn new(
        out: W,
        unit: FrequencyUnit,
        format: DataFormat,
        z0: Ohms,
    ) -> Result<Self, TouchstoneError> {
        let z = z0.value();
        if !z.is_finite() || z <= 0.0 {
            return Err(TouchstoneError::BadReference);
        }
        Ok(Self {
            out,
            unit,
            format,
            z0: z,
            option_written: false,
            last: None,
            points: 0,
        })
    }

    /// Write `text` as comment lines (one `!` line per line of `text`).
    pub fn comment(&mut self, text: &str) -> Result<(), TouchstoneError> {
        for line in text.split(['\n', '\r']) {
            self.out.write_str("! ")?;
            self.out.write_str(line)?;
            self.out.write_char('\n')?;
        }
        Ok(())
    }

    /// Write the option line now (otherwise it is written before the first point).
    pub fn option_line(&mut self) -> Result<(), TouchstoneError> {
        if self.option_written {
            return Ok(());
        }
        write!(
            self.out,
            "# {} S {} R ",
            self.unit.token(),
            self.format.token()
        )?;
        write_shortest(&mut self.out, self.z0)?;
        self.out.write_char('\n')?;
        self.option_written = true;
        Ok(())
    }

    /// Write one data line: S11 = `gamma` at `frequency`.
    pub fn point(&mut self, frequency: Hertz, gamma: Complex32) -> Result<(), TouchstoneError> {
        let f = frequency.value();
        if !f.is_finite() || !gamma.re.is_finite() || !gamma.im.is_finite() {
            return Err(TouchstoneError::NotFinite);
        }
        if f < 0.0 || self.last.is_some_and(|l| f <= l) {
            return Err(TouchstoneError::NotIncreasing);
        }
        self.option_line()?;
        write_scaled(&mut self.out, f, self.unit.decimal_shift())?;
        let mag = gamma.norm();
        let deg = if mag > 0.0 {
            libm::atan2f(gamma.im, gamma.re).to_degrees()
        } else {
            0.0
        };
        // `+ 0.0` turns −0 into +0, so no "-0.000" is written for a zero part.
        let (a, da, b, db) = match self.format {
            DataFormat::MagnitudeAngle => (mag, 6, deg + 0.0, 3),
            DataFormat::DecibelAngle => {
                let db = if mag > 0.0 {
                    (20.0 * libm::log10f(mag)).max(-DB_CEILING)
                } else {
                    -DB_CEILING
                };
                (db, 4, deg + 0.0, 3)
            }
            DataFormat::RealImaginary => (gamma.re + 0.0, 6, gamma.im + 0.0, 6),
        };
        self.out.write_char(' ')?;
        write_fixed(&mut self.out, a, da, 0)?;
        self.out.write_char(' ')?;
        write_fixed(&mut self.out, b, db, 0)?;
        self.out.write_char('\n')?;
        self.last = Some(f);
        self.points = self.points.saturating_add(1);
        Ok(())
    }

    /// Data lines written so far.
    pub fn points(&self) -> usize {
        self.points
    }

    /// Finish (writing the option line if no point was written) and give the writer back.
    pub fn finish(mut self) -> Result<W, TouchstoneError> {
        self.option_line()?;
        Ok(self.out)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use heapless::String;

    #[test]
    fn writes_option_line_comments_and_points() {
        let s: String<256> = String::new();
        let mut t = TouchstoneWriter::new(
            s,
            FrequencyUnit::MHz,
            DataFormat::MagnitudeAngle,
            Ohms::new(50.0),
        )
        .unwrap();
        t.comment("demo\nsecond").unwrap();
        t.point(Hertz::new(145.5e6), Complex32::new(0.0, 0.5))
            .unwrap();
        assert_eq!(
            t.point(Hertz::new(145.0e6), Complex32::new(0.0, 0.5)),
            Err(TouchstoneError::NotIncreasing)
        );
        let s = t.finish().unwrap();
        assert_eq!(
            s.as_str(),
            "! demo\n! second\n# MHZ S MA R 50\n145.5 0.500000 90.000\n"
        );
        assert_eq!(
            TouchstoneWriter::new(
                String::<8>::new(),
                FrequencyUnit::Hz,
                DataFormat::RealImaginary,
                Ohms::new(0.0)
            )
            .err(),
            Some(TouchstoneError::BadReference)
        );
        // A writer that runs out of room reports Write.
        let mut t = TouchstoneWriter::new(
            String::<8>::new(),
            FrequencyUnit::Hz,
            DataFormat::RealImaginary,
            Ohms::new(50.0),
        )
        .unwrap();
        assert_eq!(
            t.point(Hertz::new(1.0), Complex32::new(0.1, 0.0)),
            Err(TouchstoneError::Write)
        );
    }
}
