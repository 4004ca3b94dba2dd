//! Compact binary frames: length, type, payload and CRC-32, COBS-stuffed between `0x00`
//! delimiters.
//!
//! Frame content before stuffing (all multi-byte values little-endian):
//!
//! | offset | size | field |
//! |---|---|---|
//! | 0 | 1 | payload length `n` (0..=[`MAX_PAYLOAD`]) |
//! | 1 | 1 | type: high nibble = layout version, low nibble = kind (see [`super::record`]) |
//! | 2 | n | payload |
//! | 2 + n | 4 | CRC-32/ISO-HDLC of bytes 0 .. 2 + n ([`super::checksum`]) |
//!
//! On the wire: `0x00`, the COBS encoding of the content ([`super::cobs`]), `0x00`. The
//! leading delimiter ends any noise or text before the frame, so a receiver that joined
//! mid-stream or lost bytes is back in step at the next frame; the decoder ignores empty
//! segments. A frame with the largest payload is 70 content bytes and at most 73 wire bytes.
//!
//! ```
//! use feedline::report::frame::{encode_frame, FrameDecoder};
//! let mut wire = [0u8; 80];
//! let n = encode_frame(0x1F, &[1, 2, 0, 3], &mut wire).unwrap();
//! let mut rx: FrameDecoder = FrameDecoder::new();
//! let mut got = None;
//! for &b in &wire[..n] {
//!     if let Some(Ok(f)) = rx.push(b) {
//!         got = Some((f.kind(), f.payload().len()));
//!     }
//! }
//! assert_eq!(got, Some((0x1F, 4)));
//! ```
//!
//! Panic policy: nothing here panics; a writer that accepts zero bytes gives
//! [`WriteError::WriteZero`] rather than the panic of `embedded_io::Write::write_all`.

use super::checksum;
use super::cobs::{self, Sink, Step, Unstuffer};

/// The largest payload a frame carries, in bytes.
pub const MAX_PAYLOAD: usize = 64;
/// Content bytes around the payload: length, type, 4 CRC bytes.
pub const OVERHEAD: usize = 6;
/// The largest frame content (before stuffing).
pub const MAX_CONTENT: usize = MAX_PAYLOAD + OVERHEAD;
/// The largest frame on the wire: content, one COBS code byte, two delimiters.
pub const MAX_WIRE: usize = MAX_CONTENT + 3;

/// Why a frame could not be built or was rejected on receipt.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum FrameError {
    /// The payload is longer than [`MAX_PAYLOAD`] (sending) or the segment did not fit the
    /// decoder's buffer (receiving).
    TooLong,
    /// The output buffer is too small for the encoded frame.
    BufferTooSmall,
    /// The segment's last COBS block was cut short (bytes lost or a code byte hit).
    Stuffing,
    /// Fewer than [`OVERHEAD`] content bytes.
    TooShort,
    /// The length byte disagrees with the number of bytes received.
    LengthMismatch,
    /// The CRC does not match the content.
    Crc,
}

/// An error while writing into an `embedded_io::Write`.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum WriteError<E> {
    /// The underlying writer failed.
    Io(E),
    /// The underlying writer accepted zero bytes.
    WriteZero,
    /// The frame itself is invalid (payload too long).
    Frame(FrameError),
    /// Formatting failed (a line record's field out of its documented range).
    Format,
}

/// Writes all of `buf` into `w`, turning a zero-length write into an error.
pub(crate) fn write_all<W: embedded_io::Write>(
    w: &mut W,
    mut buf: &[u8],
) -> Result<(), WriteError<W::Error>> {
    while !buf.is_empty() {
        match w.write(buf) {
            Ok(0) => return Err(WriteError::WriteZero),
            Ok(n) => buf = buf.get(n..).unwrap_or(&[]),
            Err(e) => return Err(WriteError::Io(e)),
        }
    }
    Ok(())
}

/// Stages bytes for an `embedded_io::Write` in small chunks.
struct IoSink<'w, W: embedded_io::Write> {
    w: &'w mut W,
    buf: [u8; 16],
    len: usize,
}

impl<W: embedded_io::Write> IoSink<'_, W> {
    fn flush(&mut self) -> Result<(), WriteError<W::Error>> {
        let chunk = self.buf.get(..self.len).unwrap_or(&[]);
        write_all(self.w, chunk)?;
        self.len = 0;
        Ok(())
    }
}

impl<W: embedded_io::Write> Sink for IoSink<'_, W> {
    type Error = WriteError<W::Error>;
    fn put(&mut self, byte: u8) -> Result<(), Self::Error> {
        if self.len >= self.buf.len() {
            self.flush()?;
        }
        if let Some(slot) = self.buf.get_mut(self.len) {
            *slot = byte;
            self.len = self.len.saturating_add(1);
        }
        Ok(())
    }
}

/// Writes into a byte slice.
struct SliceSink<'b> {
    out: &'b mut [u8],
    len: usize,
}

impl Sink for SliceSink<'_> {
    type Error = FrameError;
    fn put(&mut self, byte: u8) -> Result<(), FrameError> {
        let slot = self
            .out
            .get_mut(self.len)
            .ok_or(FrameError::BufferTooSmall)?;
        *slot = byte;
        self.len = self.len.saturating_add(1);
        Ok(())
    }
}

/// Header and CRC bytes of a frame's content.
fn header_and_crc(kind: u8, payload: &[u8]) -> Result<([u8; 2], [u8; 4]), FrameError> {
    let len = u8::try_from(payload.len()).map_err(|_| FrameError::TooLong)?;
    if payload.len() > MAX_PAYLOAD {
        return Err(FrameError::TooLong);
    }
    let header = [len, kind];
    let mut d = checksum::digest();
    d.update(&header);
    d.update(payload);
    Ok((header, d.finalize().to_le_bytes()))
}

fn emit<S: Sink>(sink: &mut S, kind: u8, payload: &[u8]) -> Result<usize, S::Error>
where
    S::Error: From<FrameError>,
{
    let (header, crc) = header_and_crc(kind, payload)?;
    sink.put(0)?;
    let n = cobs::encode(&[&header, payload, &crc], sink)?;
    sink.put(0)?;
    Ok(n.saturating_add(2))
}

impl<E> From<FrameError> for WriteError<E> {
    fn from(e: FrameError) -> Self {
        WriteError::Frame(e)
    }
}

/// Encodes one frame, delimiters included, into `out`; returns the bytes used.
pub fn encode_frame(kind: u8, payload: &[u8], out: &mut [u8]) -> Result<usize, FrameError> {
    let mut sink = SliceSink { out, len: 0 };
    emit(&mut sink, kind, payload)
}

/// Streams one frame, delimiters included, into `w` with no frame buffer (16 bytes of
/// staging); returns the bytes written.
pub fn write_frame<W: embedded_io::Write>(
    w: &mut W,
    kind: u8,
    payload: &[u8],
) -> Result<usize, WriteError<W::Error>> {
    let mut sink = IoSink {
        w,
        buf: [0; 16],
        len: 0,
    };
    let n = emit(&mut sink, kind, payload)?;
    sink.flush()?;
    Ok(n)
}

/// A received, CRC-checked frame, borrowed from the decoder's buffer.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Frame<'a> {
    kind: u8,
    payload: &'a [u8],
}

impl<'a> Frame<'a> {
    /// The type byte (version nibble and kind nibble).
    pub fn kind(&self) -> u8 {
        self.kind
    }
    /// The payload bytes.
    pub fn payload(&self) -> &'a [u8] {
        self.payload
    }
}

/// Checks decoded frame content: length byte, CRC.
pub fn check_content(content: &[u8]) -> Result<Frame<'_>, FrameError> {
    if content.len() < OVERHEAD {
        return Err(FrameError::TooShort);
    }
    let (header, rest) = content.split_at_checked(2).ok_or(FrameError::TooShort)?;
    let (&len, &kind) = match header {
        [l, k] => (l, k),
        _ => return Err(FrameError::TooShort),
    };
    let n = usize::from(len);
    if rest.len() != n.saturating_add(4) {
        return Err(FrameError::LengthMismatch);
    }
    let (payload, crc) = rest.split_at_checked(n).ok_or(FrameError::LengthMismatch)?;
    let got = match crc {
        [a, b, c, d] => u32::from_le_bytes([*a, *b, *c, *d]),
        _ => return Err(FrameError::LengthMismatch),
    };
    let mut d = checksum::digest();
    d.update(header);
    d.update(payload);
    if d.finalize() != got {
        return Err(FrameError::Crc);
    }
    Ok(Frame { kind, payload })
}

/// A streaming frame receiver: feed it bytes one at a time; it reports each frame or each
/// corrupted segment at the delimiter that ends it, and is back in step from the next
/// delimiter on. `N` is the buffer size (default: the largest frame content).
#[derive(Clone, Debug)]
pub struct FrameDecoder<const N: usize = MAX_CONTENT> {
    buf: [u8; N],
    state: Unstuffer,
}

impl<const N: usize> Default for FrameDecoder<N> {
    fn default() -> Self {
        Self::new()
    }
}

impl<const N: usize> FrameDecoder<N> {
    /// An empty decoder.
    pub const fn new() -> Self {
        Self {
            buf: [0; N],
            state: Unstuffer::new(),
        }
    }

    /// Forgets any partial frame (e.g. after a line break or a timeout).
    pub fn reset(&mut self) {
        self.state = Unstuffer::default();
    }

    /// Feeds one byte. `None`: nothing to report yet (or an empty segment). `Some(Ok)`: a
    /// good frame. `Some(Err)`: the segment just ended was corrupted.
    pub fn push(&mut self, byte: u8) -> Option<Result<Frame<'_>, FrameError>> {
        match self.state.push(&mut self.buf, byte) {
            Step::Pending | Step::Idle => None,
            Step::Truncated => Some(Err(FrameError::Stuffing)),
            Step::Overflow => Some(Err(FrameError::TooLong)),
            Step::Done(n) => Some(check_content(self.buf.get(..n).unwrap_or(&[]))),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn decode_all(wire: &[u8]) -> (usize, usize) {
        let mut rx: FrameDecoder = FrameDecoder::new();
        let (mut good, mut bad) = (0, 0);
        for &b in wire {
            match rx.push(b) {
                Some(Ok(_)) => good += 1,
                Some(Err(_)) => bad += 1,
                None => {}
            }
        }
        (good, bad)
    }

    #[test]
    fn round_trip_all_lengths() {
        let mut payload = [0u8; MAX_PAYLOAD];
        for (i, p) in payload.iter_mut().enumerate() {
            *p = (i % 7) as u8; // plenty of zeros
        }
        for n in 0..=MAX_PAYLOAD {
            let mut wire = [0u8; MAX_WIRE];
            let len = encode_frame(0x12, &payload[..n], &mut wire).unwrap();
            assert!(len <= MAX_WIRE);
            assert!(wire[1..len - 1].iter().all(|&b| b != 0));
            let mut rx: FrameDecoder = FrameDecoder::new();
            let mut seen = false;
            for &b in &wire[..len] {
                if let Some(r) = rx.push(b) {
                    let f = r.unwrap();
                    assert_eq!((f.kind(), f.payload()), (0x12, &payload[..n]));
                    seen = true;
                }
            }
            assert!(seen);
        }
    }

    #[test]
    fn too_long_payload_is_refused() {
        let mut wire = [0u8; 200];
        assert_eq!(
            encode_frame(1, &[1u8; MAX_PAYLOAD + 1], &mut wire),
            Err(FrameError::TooLong)
        );
        assert_eq!(
            encode_frame(1, &[1u8; 4], &mut wire[..5]),
            Err(FrameError::BufferTooSmall)
        );
    }

    #[test]
    fn noise_then_frame_resynchronises() {
        let mut wire = [0u8; 100];
        wire[..5].copy_from_slice(&[0x33, 0x44, 0x01, 0x07, 0x99]);
        let n = encode_frame(0x11, b"hello", &mut wire[5..]).unwrap();
        assert_eq!(decode_all(&wire[..5 + n]), (1, 1));
    }
}
