//! Serial reports: human-readable line records and compact binary frames, streamed into
//! `embedded_io::Write` or `core::fmt::Write` with no allocation, and a streaming frame
//! receiver that resynchronises after noise.
//!
//! - [`record`]: the records (monitor reading, sweep point, status) as fixed-point integers
//!   in stated units, and their binary payloads.
//! - [`mod@line`]: one record a line, fixed field order, units stated, version field, CRC-32.
//! - [`frame`]: length, type, payload, CRC-32, COBS-stuffed between `0x00` delimiters.
//! - [`cobs`]: Consistent Overhead Byte Stuffing (Cheshire & Baker 1999).
//! - [`checksum`]: CRC-32/ISO-HDLC from the published CRC catalogue (1 KiB table).
//!
//! Both formats can share one serial line: a frame always sits between two `0x00` bytes,
//! which never occur in a text line, so a receiver splits the stream at `0x00` and treats a
//! segment that parses as line records as text (see `host-tests/src/bin/capture.rs`).
//!
//! Supported: the three record kinds, layout version 1, payloads up to 64 bytes. Not
//! supported: acknowledgement or retransmission (a logger detects and counts corrupt
//! frames; the next report replaces a lost one), encryption or authentication.
//!
//! Panic policy: no public function here panics; writers that accept zero bytes give an
//! error instead of the panic in `embedded_io::Write::write_all`.

pub use crate::checksum;
pub mod cobs;
pub mod frame;
pub mod line;
pub mod record;

pub use frame::{Frame, FrameDecoder, FrameError, WriteError};
pub use line::LineError;
pub use record::{
    DeviceState, MonitorFlags, MonitorRecord, Record, RecordError, StatusRecord, SweepPointRecord,
};
