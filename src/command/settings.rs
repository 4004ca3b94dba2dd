//! The device settings the command console changes, and their power-fail-safe byte form.
//!
//! [`Settings::encode`] gives a fixed [`ENCODED_LEN`]-byte image: a layout version byte,
//! the fields little-endian in declaration order, and a CRC-32/ISO-HDLC of all bytes before
//! it ([`crate::checksum`]). [`Settings::decode`] checks the version, the CRC and
//! every field's range, so a torn or stale image is refused and the device falls back to
//! the other slot of the store or to [`Settings::DEFAULT`].
//!
//! Settings are kept with the same power-fail-safe A/B store as the calibration: they
//! implement [`crate::store::Record`] (tag [`SETTINGS_TAG`], version 1), whose payload is
//! the image above. The store adds its own header and CRC; the image's inner CRC-32
//! costs 4 bytes and keeps the image self-checking when used on its own. Give the settings
//! their own store region, apart from the calibration's.
//!
//! Panic policy: nothing here panics.

use crate::checksum;
use crate::store::{CodecError, Record};

/// The store record type tag of [`Settings`].
pub const SETTINGS_TAG: u16 = 0x5E77;

/// Layout version of the encoded image.
pub const SETTINGS_VERSION: u8 = 1;
/// Bytes of the encoded image, CRC included.
pub const ENCODED_LEN: usize = 46;

/// The lowest VSWR alarm trip point, ×1000 (1.1).
pub const TRIP_MILLI_MIN: u32 = 1100;
/// The highest VSWR alarm trip point, ×1000 (100).
pub const TRIP_MILLI_MAX: u32 = 100_000;
/// The longest alarm hold-off, ms.
pub const HOLDOFF_MS_MAX: u32 = 60_000;
/// The largest averaging count.
pub const AVERAGING_MAX: u16 = 256;
/// The fewest and most points in a sweep.
pub const POINTS_RANGE: (u16, u16) = (2, 1024);
/// The shortest report period when reports are on, ms (0 = off).
pub const RATE_MS_MIN: u32 = 50;
/// The longest report period, ms (one hour).
pub const RATE_MS_MAX: u32 = 3_600_000;

/// How periodic reports are sent.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum ReportFormat {
    /// Line records only.
    Text,
    /// Binary frames only.
    Binary,
    /// Both, a line then a frame.
    Both,
}

impl ReportFormat {
    /// The command word.
    pub fn word(self) -> &'static str {
        match self {
            ReportFormat::Text => "text",
            ReportFormat::Binary => "bin",
            ReportFormat::Both => "both",
        }
    }
    /// From the command word.
    pub fn from_word(w: &str) -> Option<Self> {
        [ReportFormat::Text, ReportFormat::Binary, ReportFormat::Both]
            .into_iter()
            .find(|f| f.word() == w)
    }
    fn code(self) -> u8 {
        match self {
            ReportFormat::Text => 0,
            ReportFormat::Binary => 1,
            ReportFormat::Both => 2,
        }
    }
    fn from_code(c: u8) -> Option<Self> {
        match c {
            0 => Some(ReportFormat::Text),
            1 => Some(ReportFormat::Binary),
            2 => Some(ReportFormat::Both),
            _ => None,
        }
    }
}

/// Why settings were refused.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum SettingsError {
    /// The image is not [`ENCODED_LEN`] bytes.
    Length,
    /// The image's version byte is not [`SETTINGS_VERSION`].
    Version,
    /// The image's CRC does not match (torn write, erased or worn flash).
    Crc,
    /// A field is outside its documented range.
    OutOfRange,
    /// Fields disagree: the alarm clear point is not below the trip point, or the band's
    /// start is not below its stop.
    Inconsistent,
}

/// Stored device settings.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Settings {
    /// VSWR at or above which the alarm trips, ×1000, in `TRIP_MILLI_MIN..=TRIP_MILLI_MAX`.
    pub trip_vswr_milli: u32,
    /// VSWR below which a tripped alarm clears, ×1000, in `1000..trip_vswr_milli`.
    pub clear_vswr_milli: u32,
    /// How long the VSWR must stay above the trip point before the alarm trips, ms.
    pub holdoff_ms: u32,
    /// Forward power below which no alarm is raised (VSWR is noise there), mW.
    pub floor_mw: u32,
    /// Readings averaged per report, `1..=AVERAGING_MAX`.
    pub averaging: u16,
    /// Sweep start, Hz.
    pub start_hz: u64,
    /// Sweep stop, Hz, above the start.
    pub stop_hz: u64,
    /// Points per sweep, within [`POINTS_RANGE`].
    pub points: u16,
    /// Period of monitor reports, ms; 0 turns them off.
    pub report_period_ms: u32,
    /// Format of periodic reports.
    pub report_format: ReportFormat,
}

impl Default for Settings {
    fn default() -> Self {
        Self::DEFAULT
    }
}

struct Put<'b> {
    buf: &'b mut [u8; ENCODED_LEN],
    len: usize,
}

impl Put<'_> {
    fn bytes<const K: usize>(&mut self, b: [u8; K]) {
        let end = self.len.saturating_add(K);
        if let Some(slot) = self.buf.get_mut(self.len..end) {
            for (d, s) in slot.iter_mut().zip(b) {
                *d = s;
            }
            self.len = end;
        }
    }
}

struct Take<'b> {
    buf: &'b [u8],
    pos: usize,
}

impl Take<'_> {
    fn bytes<const K: usize>(&mut self) -> Result<[u8; K], SettingsError> {
        let end = self.pos.saturating_add(K);
        let s = self.buf.get(self.pos..end).ok_or(SettingsError::Length)?;
        self.pos = end;
        <[u8; K]>::try_from(s).map_err(|_| SettingsError::Length)
    }
    fn u16(&mut self) -> Result<u16, SettingsError> {
        Ok(u16::from_le_bytes(self.bytes()?))
    }
    fn u32(&mut self) -> Result<u32, SettingsError> {
        Ok(u32::from_le_bytes(self.bytes()?))
    }
    fn u64(&mut self) -> Result<u64, SettingsError> {
        Ok(u64::from_le_bytes(self.bytes()?))
    }
}

impl Settings {
    /// Factory settings: trip at 3.0, clear at 2.5, 100 ms hold-off, no power floor,
    /// averaging 8, a 1–30 MHz sweep of 101 points, reports every second as text.
    /// (Invented defaults for a general-purpose HF device.)
    pub const DEFAULT: Settings = Settings {
        trip_vswr_milli: 3000,
        clear_vswr_milli: 2500,
        holdoff_ms: 100,
        floor_mw: 0,
        averaging: 8,
        start_hz: 1_000_000,
        stop_hz: 30_000_000,
        points: 101,
        report_period_ms: 1000,
        report_format: ReportFormat::Text,
    };

    /// Checks every field's range and the fields' mutual consistency.
    pub fn validate(&self) -> Result<(), SettingsError> {
        let in_range = (TRIP_MILLI_MIN..=TRIP_MILLI_MAX).contains(&self.trip_vswr_milli)
            && self.clear_vswr_milli >= 1000
            && self.holdoff_ms <= HOLDOFF_MS_MAX
            && (1..=AVERAGING_MAX).contains(&self.averaging)
            && (POINTS_RANGE.0..=POINTS_RANGE.1).contains(&self.points)
            && (self.report_period_ms == 0
                || (RATE_MS_MIN..=RATE_MS_MAX).contains(&self.report_period_ms));
        if !in_range {
            return Err(SettingsError::OutOfRange);
        }
        if self.clear_vswr_milli >= self.trip_vswr_milli || self.start_hz >= self.stop_hz {
            return Err(SettingsError::Inconsistent);
        }
        Ok(())
    }

    /// The fixed-size image: version, fields, CRC-32.
    pub fn encode(&self) -> [u8; ENCODED_LEN] {
        let mut buf = [0u8; ENCODED_LEN];
        let mut p = Put {
            buf: &mut buf,
            len: 0,
        };
        p.bytes([SETTINGS_VERSION]);
        p.bytes(self.trip_vswr_milli.to_le_bytes());
        p.bytes(self.clear_vswr_milli.to_le_bytes());
        p.bytes(self.holdoff_ms.to_le_bytes());
        p.bytes(self.floor_mw.to_le_bytes());
        p.bytes(self.averaging.to_le_bytes());
        p.bytes(self.start_hz.to_le_bytes());
        p.bytes(self.stop_hz.to_le_bytes());
        p.bytes(self.points.to_le_bytes());
        p.bytes(self.report_period_ms.to_le_bytes());
        p.bytes([self.report_format.code()]);
        let body = p.len;
        let crc = checksum::crc32(p.buf.get(..body).unwrap_or(&[]));
        p.bytes(crc.to_le_bytes());
        buf
    }

    /// Settings from an image, checking length, version, CRC and every range.
    pub fn decode(image: &[u8]) -> Result<Settings, SettingsError> {
        if image.len() != ENCODED_LEN {
            return Err(SettingsError::Length);
        }
        let (body, crc) = image
            .split_at_checked(ENCODED_LEN.saturating_sub(4))
            .ok_or(SettingsError::Length)?;
        let want = <[u8; 4]>::try_from(crc).map_err(|_| SettingsError::Length)?;
        if checksum::crc32(body) != u32::from_le_bytes(want) {
            return Err(SettingsError::Crc);
        }
        let mut t = Take { buf: body, pos: 0 };
        if t.bytes::<1>()? != [SETTINGS_VERSION] {
            return Err(SettingsError::Version);
        }
        let s = Settings {
            trip_vswr_milli: t.u32()?,
            clear_vswr_milli: t.u32()?,
            holdoff_ms: t.u32()?,
            floor_mw: t.u32()?,
            averaging: t.u16()?,
            start_hz: t.u64()?,
            stop_hz: t.u64()?,
            points: t.u16()?,
            report_period_ms: t.u32()?,
            report_format: ReportFormat::from_code(u8::from_le_bytes(t.bytes()?))
                .ok_or(SettingsError::OutOfRange)?,
        };
        s.validate()?;
        Ok(s)
    }
}

impl Record for Settings {
    const TYPE_TAG: u16 = SETTINGS_TAG;
    const VERSION: u16 = SETTINGS_VERSION as u16;
    const MAX_ENCODED_LEN: usize = ENCODED_LEN;

    fn encode(&self, out: &mut [u8]) -> Result<usize, CodecError> {
        let slot = out
            .get_mut(..ENCODED_LEN)
            .ok_or(CodecError::BufferTooSmall)?;
        for (d, s) in slot.iter_mut().zip(Settings::encode(self)) {
            *d = s;
        }
        Ok(ENCODED_LEN)
    }

    fn decode(version: u16, bytes: &[u8]) -> Result<Self, CodecError> {
        if version != Self::VERSION {
            return Err(CodecError::UnsupportedVersion);
        }
        Settings::decode(bytes).map_err(|e| match e {
            SettingsError::Length => CodecError::Truncated,
            SettingsError::Version => CodecError::UnsupportedVersion,
            _ => CodecError::Malformed,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn default_is_valid_and_round_trips() {
        assert_eq!(Settings::DEFAULT.validate(), Ok(()));
        let img = Settings::DEFAULT.encode();
        assert_eq!(Settings::decode(&img), Ok(Settings::DEFAULT));
    }

    #[test]
    fn damaged_images_are_refused() {
        let img = Settings::DEFAULT.encode();
        assert_eq!(Settings::decode(&img[..45]), Err(SettingsError::Length));
        assert_eq!(
            Settings::decode(&[0xFF; ENCODED_LEN]),
            Err(SettingsError::Crc)
        );
        for byte in 0..ENCODED_LEN {
            let mut bad = img;
            bad[byte] ^= 0x10;
            assert!(Settings::decode(&bad).is_err(), "byte {byte}");
        }
        let mut inconsistent = Settings::DEFAULT;
        inconsistent.clear_vswr_milli = inconsistent.trip_vswr_milli;
        assert_eq!(inconsistent.validate(), Err(SettingsError::Inconsistent));
    }
}
