//! Consistent Overhead Byte Stuffing (COBS): removes every `0x00` from a frame so that
//! `0x00` can mark frame boundaries on the wire.
//!
//! Method: S. Cheshire and M. Baker, "Consistent Overhead Byte Stuffing", IEEE/ACM
//! Transactions on Networking 7(2), 1999. Data is cut into blocks at each zero byte (or
//! after 254 non-zero bytes); each block is sent as a code byte `n` (1..=255) followed by
//! `n − 1` non-zero data bytes, and a zero is implied after every block whose code is not
//! `0xFF`, except after the last. The overhead is at most one byte per 254 (plus one).
//!
//! Why our own encoder instead of the `cobs` crate: the frame content here is at most 70
//! bytes and is encoded straight from its pieces (header, payload, CRC) into the output
//! writer with no intermediate buffer, and the decoder is fused with the frame checks in
//! a byte-at-a-time state machine. Both fit in under a hundred lines with no slice
//! indexing, which keeps the link-time no-panic proof simple; the crate's decoder indexes
//! slices and brings in `thiserror`. The host tests cross-check this encoder and decoder
//! against the `cobs` crate.
//!
//! Panic policy: nothing here panics; every slice access is checked.

/// The largest run of non-zero bytes one COBS block carries.
const MAX_RUN: usize = 254;

/// A byte sink for the encoder.
pub(crate) trait Sink {
    /// The sink's error.
    type Error;
    /// Takes one byte.
    fn put(&mut self, byte: u8) -> Result<(), Self::Error>;
}

/// The byte at `index` of the concatenation of `pieces`.
fn byte_at(pieces: &[&[u8]], mut index: usize) -> Option<u8> {
    for piece in pieces {
        match piece.get(index) {
            Some(&b) => return Some(b),
            None => index = index.saturating_sub(piece.len()),
        }
    }
    None
}

/// COBS-encodes the concatenation of `pieces` into `sink` (no delimiters).
/// Returns the number of bytes put.
pub(crate) fn encode<S: Sink>(pieces: &[&[u8]], sink: &mut S) -> Result<usize, S::Error> {
    let len: usize = pieces.iter().fold(0usize, |a, p| a.saturating_add(p.len()));
    let mut written = 0usize;
    let mut pos = 0usize;
    loop {
        // Count the run of non-zero bytes starting at `pos`.
        let mut run = 0usize;
        while run < MAX_RUN {
            match byte_at(pieces, pos.saturating_add(run)) {
                Some(b) if b != 0 => run += 1,
                _ => break,
            }
        }
        // run ≤ 254, so run + 1 fits a u8.
        sink.put(u8::try_from(run.saturating_add(1)).unwrap_or(u8::MAX))?;
        for i in 0..run {
            sink.put(byte_at(pieces, pos.saturating_add(i)).unwrap_or(1))?;
        }
        written = written.saturating_add(run).saturating_add(1);
        pos = pos.saturating_add(run);
        if pos >= len {
            break;
        }
        if run == MAX_RUN {
            continue;
        }
        // The byte at `pos` is a zero: it is implied by the block just written.
        pos = pos.saturating_add(1);
        if pos >= len {
            // A zero as the last byte needs one final empty block.
            sink.put(1)?;
            written = written.saturating_add(1);
            break;
        }
    }
    Ok(written)
}

/// What feeding one byte to a [`Unstuffer`] produced.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) enum Step {
    /// Nothing yet (a byte was stored or a code byte read).
    Pending,
    /// A delimiter with no data before it (idle line or back-to-back delimiters).
    Idle,
    /// A delimiter ended a well-formed block sequence of this many decoded bytes.
    Done(usize),
    /// A delimiter ended a segment whose last block was cut short.
    Truncated,
    /// A delimiter ended a segment that did not fit the buffer.
    Overflow,
}

/// A byte-at-a-time COBS decoder writing into a caller-held buffer.
#[derive(Clone, Copy, Debug, Default)]
pub(crate) struct Unstuffer {
    /// Decoded bytes so far.
    len: usize,
    /// Data bytes still expected in the current block.
    remaining: u8,
    /// Code byte of the current block (0: no block read yet in this segment).
    code: u8,
    /// The segment no longer fits the buffer.
    overflow: bool,
}

impl Unstuffer {
    /// A decoder between segments.
    pub(crate) const fn new() -> Self {
        Self {
            len: 0,
            remaining: 0,
            code: 0,
            overflow: false,
        }
    }

    fn store(&mut self, buf: &mut [u8], byte: u8) {
        match buf.get_mut(self.len) {
            Some(slot) => {
                *slot = byte;
                self.len = self.len.saturating_add(1);
            }
            None => self.overflow = true,
        }
    }

    /// Feeds one wire byte.
    pub(crate) fn push(&mut self, buf: &mut [u8], byte: u8) -> Step {
        if byte == 0 {
            let step = if self.code == 0 {
                Step::Idle
            } else if self.overflow {
                Step::Overflow
            } else if self.remaining != 0 {
                Step::Truncated
            } else {
                Step::Done(self.len)
            };
            *self = Self::default();
            return step;
        }
        if self.remaining == 0 {
            // A code byte: first close the previous block with its implied zero.
            if self.code != 0 && self.code != 0xFF {
                self.store(buf, 0);
            }
            self.code = byte;
            self.remaining = byte.saturating_sub(1);
        } else {
            self.store(buf, byte);
            self.remaining = self.remaining.saturating_sub(1);
        }
        Step::Pending
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    struct Buf<const N: usize> {
        data: [u8; N],
        len: usize,
    }
    impl<const N: usize> Sink for Buf<N> {
        type Error = ();
        fn put(&mut self, byte: u8) -> Result<(), ()> {
            let slot = self.data.get_mut(self.len).ok_or(())?;
            *slot = byte;
            self.len += 1;
            Ok(())
        }
    }

    /// (decoded, encoded) pairs: the examples of Cheshire & Baker's paper and the
    /// encoding rules above, worked by hand.
    const VECTORS: [(&[u8], &[u8]); 6] = [
        (&[], &[0x01]),
        (&[0x00], &[0x01, 0x01]),
        (&[0x00, 0x00], &[0x01, 0x01, 0x01]),
        (&[0x11, 0x22, 0x00, 0x33], &[0x03, 0x11, 0x22, 0x02, 0x33]),
        (&[0x11, 0x22, 0x33, 0x44], &[0x05, 0x11, 0x22, 0x33, 0x44]),
        (&[0x11, 0x00, 0x00, 0x00], &[0x02, 0x11, 0x01, 0x01, 0x01]),
    ];

    #[test]
    fn vectors_encode_and_decode() {
        for &(plain, wire) in VECTORS.iter() {
            let mut out = Buf::<16> {
                data: [0; 16],
                len: 0,
            };
            // Split the input in two pieces to exercise piece boundaries.
            let (a, b) = plain.split_at(plain.len() / 2);
            let n = encode(&[a, b], &mut out).unwrap();
            assert_eq!(&out.data[..n], wire, "{plain:?}");

            let mut dec = Unstuffer::default();
            let mut buf = [0u8; 16];
            for &w in wire {
                assert_eq!(dec.push(&mut buf, w), Step::Pending);
            }
            assert_eq!(dec.push(&mut buf, 0), Step::Done(plain.len()));
            assert_eq!(&buf[..plain.len()], plain);
        }
    }

    #[test]
    fn long_runs_use_ff_blocks() {
        let plain = [0x5Au8; 300];
        let mut out = Buf::<310> {
            data: [0; 310],
            len: 0,
        };
        let n = encode(&[&plain], &mut out).unwrap();
        assert_eq!(n, 302);
        assert_eq!(out.data[0], 0xFF);
        assert_eq!(out.data[255], 47);
        let mut dec = Unstuffer::default();
        let mut buf = [0u8; 300];
        for &w in &out.data[..n] {
            dec.push(&mut buf, w);
        }
        assert_eq!(dec.push(&mut buf, 0), Step::Done(300));
        assert_eq!(buf, plain);
    }

    #[test]
    fn truncated_and_overflow() {
        let mut dec = Unstuffer::default();
        let mut buf = [0u8; 2];
        assert_eq!(dec.push(&mut buf, 0), Step::Idle);
        dec.push(&mut buf, 0x04);
        dec.push(&mut buf, 0x11);
        assert_eq!(dec.push(&mut buf, 0), Step::Truncated);
        for _ in 0..4 {
            dec.push(&mut buf, 0x05);
        }
        assert_eq!(dec.push(&mut buf, 0), Step::Overflow);
        // It resynchronises on the next segment.
        dec.push(&mut buf, 0x02);
        dec.push(&mut buf, 0x09);
        assert_eq!(dec.push(&mut buf, 0), Step::Done(1));
        assert_eq!(buf[0], 9);
    }
}
