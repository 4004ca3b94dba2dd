//! The report records and their binary payloads.
//!
//! Every record field is an integer in a stated fixed-point unit, so a monitor with no FPU
//! fills it without floating point, a line record prints it exactly, and a round trip
//! through either format gives back the same bits.
//!
//! | kind | type byte | payload bytes (little-endian) |
//! |---|---|---|
//! | [`MonitorRecord`] | `0x11` | seq u32, time_ms u32, forward_mw u32, reflected_mw u32, delivered_mw u32, vswr_milli u32, return_loss_cdb u16, flags u8 (27) |
//! | [`SweepPointRecord`] | `0x12` | sweep u16, index u16, count u16, freq_hz u64, gamma_re_micro i32, gamma_im_micro i32 (22) |
//! | [`StatusRecord`] | `0x13` | uptime_s u32, state u8, flags u8, rx_errors u16 (8) |
//!
//! The type byte's high nibble is the layout version ([`LAYOUT_VERSION`]); its low nibble
//! is the kind. Decoding checks every field's documented range, so a decoded record is
//! always one the writer could have produced.
//!
//! Panic policy: nothing here panics.

use super::frame::{self, Frame, WriteError, MAX_PAYLOAD};
use crate::reflection::Vswr;
use crate::units::{Db, Watts};

/// The layout version carried by frames (type-byte high nibble) and line records (`v=`).
pub const LAYOUT_VERSION: u8 = 1;

/// The largest VSWR a record holds, ×1000 ([`Vswr::CEILING`] × 1000).
pub const VSWR_MILLI_MAX: u32 = 1_000_000;
/// The largest return loss a record holds, in centi-dB (the 100 dB ceiling).
pub const RL_CDB_MAX: u16 = 10_000;
/// The largest |Re Γ| or |Im Γ| a record holds, ×10⁶. A measured Γ may exceed 1 slightly
/// through noise or calibration error, so components up to 2 are carried.
pub const GAMMA_MICRO_MAX: i32 = 2_000_000;

/// Why a frame or payload is not a valid record.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum RecordError {
    /// The type byte's version nibble is not [`LAYOUT_VERSION`].
    Version,
    /// The kind nibble names no record.
    UnknownKind,
    /// The payload has the wrong length for its kind.
    Length,
    /// A field is outside its documented range.
    OutOfRange,
}

/// Monitor status bits carried in [`MonitorRecord::flags`].
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct MonitorFlags(u8);

impl MonitorFlags {
    /// The VSWR alarm is raised.
    pub const ALARM: u8 = 0x01;
    /// The transmitter-protection output is asserted.
    pub const TRIP: u8 = 0x02;
    /// The values are peak-hold values, not averages.
    pub const PEAK: u8 = 0x04;
    /// A detector is above its calibrated range.
    pub const OVER: u8 = 0x08;
    /// Forward power is below the floor where VSWR means anything.
    pub const UNDER: u8 = 0x10;
    /// All defined bits.
    pub const ALL: u8 = 0x1F;
    /// Letters for each bit, lowest first, as printed in line records.
    pub const LETTERS: [u8; 5] = *b"ATPOU";

    /// Flags from bits; undefined bits are an error.
    pub fn from_bits(bits: u8) -> Result<Self, RecordError> {
        if bits & !Self::ALL == 0 {
            Ok(Self(bits))
        } else {
            Err(RecordError::OutOfRange)
        }
    }
    /// The bits.
    pub fn bits(self) -> u8 {
        self.0
    }
    /// True when every bit of `mask` is set.
    pub fn contains(self, mask: u8) -> bool {
        self.0 & mask == mask
    }
}

/// One monitor report: forward, reflected and delivered power, VSWR, return loss.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct MonitorRecord {
    /// Report sequence number (wraps).
    pub seq: u32,
    /// Device time of the report, milliseconds (wraps after ~49.7 days).
    pub time_ms: u32,
    /// Forward power, milliwatts.
    pub forward_mw: u32,
    /// Reflected power, milliwatts.
    pub reflected_mw: u32,
    /// Power delivered to the load, milliwatts.
    pub delivered_mw: u32,
    /// VSWR × 1000, in `1000..=VSWR_MILLI_MAX`.
    pub vswr_milli: u32,
    /// Return loss, centi-dB, in `0..=RL_CDB_MAX`.
    pub return_loss_cdb: u16,
    /// Status bits.
    pub flags: MonitorFlags,
}

/// One point of a 1-port sweep: frequency and complex Γ.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SweepPointRecord {
    /// Sweep number (wraps); points of one sweep share it.
    pub sweep: u16,
    /// Index of this point, `< count`.
    pub index: u16,
    /// Points in the sweep, ≥ 1.
    pub count: u16,
    /// Frequency, hertz.
    pub freq_hz: u64,
    /// Re Γ × 10⁶, `|·| ≤ GAMMA_MICRO_MAX`.
    pub gamma_re_micro: i32,
    /// Im Γ × 10⁶, `|·| ≤ GAMMA_MICRO_MAX`.
    pub gamma_im_micro: i32,
}

/// What the device is doing.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum DeviceState {
    /// Waiting for commands.
    Idle,
    /// Watching a live line.
    Monitoring,
    /// Running a sweep.
    Sweeping,
    /// Waiting for or taking a calibration step.
    Calibrating,
}

impl DeviceState {
    /// The byte carried in frames.
    pub fn code(self) -> u8 {
        match self {
            DeviceState::Idle => 0,
            DeviceState::Monitoring => 1,
            DeviceState::Sweeping => 2,
            DeviceState::Calibrating => 3,
        }
    }
    /// From the frame byte.
    pub fn from_code(code: u8) -> Result<Self, RecordError> {
        match code {
            0 => Ok(DeviceState::Idle),
            1 => Ok(DeviceState::Monitoring),
            2 => Ok(DeviceState::Sweeping),
            3 => Ok(DeviceState::Calibrating),
            _ => Err(RecordError::OutOfRange),
        }
    }
    /// The word printed in line records.
    pub fn word(self) -> &'static str {
        match self {
            DeviceState::Idle => "idle",
            DeviceState::Monitoring => "mon",
            DeviceState::Sweeping => "sweep",
            DeviceState::Calibrating => "cal",
        }
    }
    /// From the line-record word.
    pub fn from_word(word: &str) -> Option<Self> {
        [
            DeviceState::Idle,
            DeviceState::Monitoring,
            DeviceState::Sweeping,
            DeviceState::Calibrating,
        ]
        .into_iter()
        .find(|s| s.word() == word)
    }
}

/// Device status: uptime, state, lock, calibration.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct StatusRecord {
    /// Seconds since power-up.
    pub uptime_s: u32,
    /// What the device is doing.
    pub state: DeviceState,
    /// Setting changes are refused (see the command module's unlock).
    pub locked: bool,
    /// A valid calibration is loaded.
    pub cal_valid: bool,
    /// Malformed command lines received since power-up (saturates).
    pub rx_errors: u16,
}

/// Any report record.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Record {
    /// A monitor report.
    Monitor(MonitorRecord),
    /// A sweep point.
    SweepPoint(SweepPointRecord),
    /// A status report.
    Status(StatusRecord),
}

/// Kind nibbles.
const KIND_MONITOR: u8 = 1;
const KIND_POINT: u8 = 2;
const KIND_STATUS: u8 = 3;
const LEN_MONITOR: usize = 27;
const LEN_POINT: usize = 22;
const LEN_STATUS: usize = 8;

/// Little-endian writer into a fixed payload buffer.
struct Put<'b> {
    buf: &'b mut [u8; MAX_PAYLOAD],
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

/// Little-endian reader over a payload.
struct Take<'b> {
    buf: &'b [u8],
    pos: usize,
}

impl Take<'_> {
    fn bytes<const K: usize>(&mut self) -> Result<[u8; K], RecordError> {
        let end = self.pos.saturating_add(K);
        let s = self.buf.get(self.pos..end).ok_or(RecordError::Length)?;
        self.pos = end;
        <[u8; K]>::try_from(s).map_err(|_| RecordError::Length)
    }
    fn u8(&mut self) -> Result<u8, RecordError> {
        Ok(u8::from_le_bytes(self.bytes()?))
    }
    fn u16(&mut self) -> Result<u16, RecordError> {
        Ok(u16::from_le_bytes(self.bytes()?))
    }
    fn u32(&mut self) -> Result<u32, RecordError> {
        Ok(u32::from_le_bytes(self.bytes()?))
    }
    fn i32(&mut self) -> Result<i32, RecordError> {
        Ok(i32::from_le_bytes(self.bytes()?))
    }
    fn u64(&mut self) -> Result<u64, RecordError> {
        Ok(u64::from_le_bytes(self.bytes()?))
    }
}

impl MonitorRecord {
    /// Checks every field's documented range.
    pub fn validate(&self) -> Result<(), RecordError> {
        if (1000..=VSWR_MILLI_MAX).contains(&self.vswr_milli) && self.return_loss_cdb <= RL_CDB_MAX
        {
            Ok(())
        } else {
            Err(RecordError::OutOfRange)
        }
    }
}

impl SweepPointRecord {
    /// Checks every field's documented range.
    pub fn validate(&self) -> Result<(), RecordError> {
        let g = -GAMMA_MICRO_MAX..=GAMMA_MICRO_MAX;
        if self.count >= 1
            && self.index < self.count
            && g.contains(&self.gamma_re_micro)
            && g.contains(&self.gamma_im_micro)
        {
            Ok(())
        } else {
            Err(RecordError::OutOfRange)
        }
    }
}

impl Record {
    /// The frame type byte: version nibble and kind nibble.
    pub fn type_byte(&self) -> u8 {
        let kind = match self {
            Record::Monitor(_) => KIND_MONITOR,
            Record::SweepPoint(_) => KIND_POINT,
            Record::Status(_) => KIND_STATUS,
        };
        (LAYOUT_VERSION << 4) | kind
    }

    /// Checks every field's documented range.
    pub fn validate(&self) -> Result<(), RecordError> {
        match self {
            Record::Monitor(m) => m.validate(),
            Record::SweepPoint(p) => p.validate(),
            Record::Status(_) => Ok(()),
        }
    }

    /// Writes the binary payload into `out`; returns its length.
    pub fn encode_payload(&self, out: &mut [u8; MAX_PAYLOAD]) -> usize {
        let mut p = Put { buf: out, len: 0 };
        match self {
            Record::Monitor(m) => {
                p.bytes(m.seq.to_le_bytes());
                p.bytes(m.time_ms.to_le_bytes());
                p.bytes(m.forward_mw.to_le_bytes());
                p.bytes(m.reflected_mw.to_le_bytes());
                p.bytes(m.delivered_mw.to_le_bytes());
                p.bytes(m.vswr_milli.to_le_bytes());
                p.bytes(m.return_loss_cdb.to_le_bytes());
                p.bytes([m.flags.bits()]);
            }
            Record::SweepPoint(s) => {
                p.bytes(s.sweep.to_le_bytes());
                p.bytes(s.index.to_le_bytes());
                p.bytes(s.count.to_le_bytes());
                p.bytes(s.freq_hz.to_le_bytes());
                p.bytes(s.gamma_re_micro.to_le_bytes());
                p.bytes(s.gamma_im_micro.to_le_bytes());
            }
            Record::Status(s) => {
                let flags = u8::from(s.locked) | (u8::from(s.cal_valid) << 1);
                p.bytes(s.uptime_s.to_le_bytes());
                p.bytes([s.state.code(), flags]);
                p.bytes(s.rx_errors.to_le_bytes());
            }
        }
        p.len
    }

    /// Decodes a record from a frame's type byte and payload, checking every range.
    pub fn from_payload(type_byte: u8, payload: &[u8]) -> Result<Record, RecordError> {
        if type_byte >> 4 != LAYOUT_VERSION {
            return Err(RecordError::Version);
        }
        let mut t = Take {
            buf: payload,
            pos: 0,
        };
        let (record, want) = match type_byte & 0x0F {
            KIND_MONITOR => (
                Record::Monitor(MonitorRecord {
                    seq: t.u32()?,
                    time_ms: t.u32()?,
                    forward_mw: t.u32()?,
                    reflected_mw: t.u32()?,
                    delivered_mw: t.u32()?,
                    vswr_milli: t.u32()?,
                    return_loss_cdb: t.u16()?,
                    flags: MonitorFlags::from_bits(t.u8()?)?,
                }),
                LEN_MONITOR,
            ),
            KIND_POINT => (
                Record::SweepPoint(SweepPointRecord {
                    sweep: t.u16()?,
                    index: t.u16()?,
                    count: t.u16()?,
                    freq_hz: t.u64()?,
                    gamma_re_micro: t.i32()?,
                    gamma_im_micro: t.i32()?,
                }),
                LEN_POINT,
            ),
            KIND_STATUS => {
                let uptime_s = t.u32()?;
                let state = DeviceState::from_code(t.u8()?)?;
                let flags = t.u8()?;
                if flags & !0x03 != 0 {
                    return Err(RecordError::OutOfRange);
                }
                (
                    Record::Status(StatusRecord {
                        uptime_s,
                        state,
                        locked: flags & 1 != 0,
                        cal_valid: flags & 2 != 0,
                        rx_errors: t.u16()?,
                    }),
                    LEN_STATUS,
                )
            }
            _ => return Err(RecordError::UnknownKind),
        };
        if payload.len() != want {
            return Err(RecordError::Length);
        }
        record.validate()?;
        Ok(record)
    }

    /// Decodes a record from a received frame.
    pub fn from_frame(frame: &Frame<'_>) -> Result<Record, RecordError> {
        Self::from_payload(frame.kind(), frame.payload())
    }

    /// Streams this record as a binary frame into `w`; returns the bytes written.
    pub fn write_frame<W: embedded_io::Write>(
        &self,
        w: &mut W,
    ) -> Result<usize, WriteError<W::Error>> {
        let mut buf = [0u8; MAX_PAYLOAD];
        let n = self.encode_payload(&mut buf);
        frame::write_frame(w, self.type_byte(), buf.get(..n).unwrap_or(&[]))
    }

    /// Encodes this record as a binary frame into `out`; returns the bytes used.
    pub fn encode_frame(&self, out: &mut [u8]) -> Result<usize, frame::FrameError> {
        let mut buf = [0u8; MAX_PAYLOAD];
        let n = self.encode_payload(&mut buf);
        frame::encode_frame(self.type_byte(), buf.get(..n).unwrap_or(&[]), out)
    }
}

impl MonitorRecord {
    /// The record for a report of the fixed-point in-line [`crate::monitor::Monitor`],
    /// taken at device time `time_ms`. Powers are rounded from µW to mW; VSWR and return
    /// loss are rounded from Q16.16 to thousandths and hundredths. Flags: `ALARM` and
    /// `TRIP` when the alarm is tripped (the protection output follows it), `UNDER` when
    /// the forward power is below the monitor's gate; `PEAK` and `OVER` are never set (the
    /// report carries averages, and the monitor flags no over-range).
    pub fn from_report(report: &crate::monitor::Report, time_ms: u32) -> MonitorRecord {
        let mw = |uw: u32| uw.saturating_add(500) / 1000;
        let vswr = (u64::from(report.vswr.to_bits())
            .saturating_mul(1000)
            .saturating_add(32_768))
            >> 16;
        let vswr = u32::try_from(vswr)
            .unwrap_or(VSWR_MILLI_MAX)
            .clamp(1000, VSWR_MILLI_MAX);
        let rl = (i64::from(report.return_loss.to_bits())
            .saturating_mul(100)
            .saturating_add(32_768))
            >> 16;
        let rl = u16::try_from(rl.clamp(0, i64::from(RL_CDB_MAX))).unwrap_or(RL_CDB_MAX);
        let tripped = report.alarm == crate::monitor::AlarmState::Tripped;
        let mut flags = 0u8;
        if tripped {
            flags |= MonitorFlags::ALARM | MonitorFlags::TRIP;
        }
        if !report.transmitting {
            flags |= MonitorFlags::UNDER;
        }
        MonitorRecord {
            seq: report.sequence,
            time_ms,
            forward_mw: mw(report.forward_uw),
            reflected_mw: mw(report.reflected_uw),
            delivered_mw: mw(report.delivered_uw),
            vswr_milli: vswr,
            return_loss_cdb: rl,
            flags: MonitorFlags(flags),
        }
    }
}

/// Power in watts to record milliwatts: `None` for NaN, negative or above `u32::MAX` mW.
pub fn milliwatts(p: Watts) -> Option<u32> {
    let mw = p.value() * 1000.0;
    if mw.is_finite() && (0.0..=4_294_967_040.0).contains(&mw) {
        Some(libm::roundf(mw) as u32)
    } else {
        None
    }
}

/// A VSWR to record units (×1000, rounded); always in range since [`Vswr`] is capped.
pub fn vswr_milli(v: Vswr) -> u32 {
    let x = libm::roundf(v.value() * 1000.0);
    if x.is_finite() {
        (x as u32).clamp(1000, VSWR_MILLI_MAX)
    } else {
        VSWR_MILLI_MAX
    }
}

/// A return loss to record centi-dB: `None` for NaN or negative; capped at 100 dB.
pub fn return_loss_cdb(rl: Db) -> Option<u16> {
    let x = rl.value() * 100.0;
    if x.is_finite() && x >= 0.0 {
        Some((libm::roundf(x) as u32).min(u32::from(RL_CDB_MAX)) as u16)
    } else {
        None
    }
}

/// A Γ component to record micro units: `None` for NaN or beyond ±2.
pub fn gamma_micro(x: f32) -> Option<i32> {
    let m = x * 1.0e6;
    if m.is_finite() && m.abs() <= GAMMA_MICRO_MAX as f32 {
        Some(libm::roundf(m) as i32)
    } else {
        None
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (watts, expected mW) and (VSWR, expected milli): the scaling is exact arithmetic.
    const MW_VECTORS: [(f32, Option<u32>); 5] = [
        (0.0, Some(0)),
        (1.5, Some(1500)),
        (1500.0, Some(1_500_000)),
        (-1.0, None),
        (f32::NAN, None),
    ];

    #[test]
    fn conversions() {
        for &(w, want) in MW_VECTORS.iter() {
            assert_eq!(milliwatts(Watts::new(w)), want, "{w}");
        }
        assert_eq!(vswr_milli(Vswr::new(1.5).unwrap()), 1500);
        assert_eq!(vswr_milli(Vswr::new(5000.0).unwrap()), VSWR_MILLI_MAX);
        assert_eq!(return_loss_cdb(Db::new(19.084)), Some(1908));
        assert_eq!(return_loss_cdb(Db::new(400.0)), Some(RL_CDB_MAX));
        assert_eq!(gamma_micro(-0.25), Some(-250_000));
        assert_eq!(gamma_micro(3.0), None);
    }

    #[test]
    fn from_monitor_report() {
        use crate::fixed::{DbQ16, VswrQ16};
        use crate::monitor::{AlarmState, Report};
        let rep = Report {
            sequence: 9,
            forward_uw: 1_500_000_499,
            reflected_uw: 12_500_500,
            delivered_uw: 1_487_500_000,
            transmitting: true,
            vswr: VswrQ16::from_bits(78_643), // 1.19999… → 1.200
            return_loss: DbQ16::from_bits(1_365_115), // 20.83 dB
            peak_forward_uw: 0,
            peak_vswr: None,
            alarm: AlarmState::Tripped,
            pin_errors: 0,
        };
        let m = MonitorRecord::from_report(&rep, 77);
        assert_eq!(
            (
                m.seq,
                m.time_ms,
                m.forward_mw,
                m.reflected_mw,
                m.delivered_mw
            ),
            (9, 77, 1_500_000, 12_501, 1_487_500)
        );
        assert_eq!((m.vswr_milli, m.return_loss_cdb), (1200, 2083));
        assert_eq!(m.flags.bits(), MonitorFlags::ALARM | MonitorFlags::TRIP);
        assert_eq!(m.validate(), Ok(()));
    }

    #[test]
    fn payload_round_trip_and_length_check() {
        let r = Record::Status(StatusRecord {
            uptime_s: 77,
            state: DeviceState::Sweeping,
            locked: true,
            cal_valid: false,
            rx_errors: 3,
        });
        let mut buf = [0u8; MAX_PAYLOAD];
        let n = r.encode_payload(&mut buf);
        assert_eq!(n, LEN_STATUS);
        assert_eq!(Record::from_payload(r.type_byte(), &buf[..n]), Ok(r));
        assert_eq!(
            Record::from_payload(r.type_byte(), &buf[..n + 1]),
            Err(RecordError::Length)
        );
        assert_eq!(
            Record::from_payload(0x23, &buf[..n]),
            Err(RecordError::Version)
        );
        assert_eq!(
            Record::from_payload(0x1E, &buf[..n]),
            Err(RecordError::UnknownKind)
        );
    }
}
