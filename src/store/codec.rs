//! A little-endian byte writer and reader over slices, for [`Record`](super::Record)
//! encodings. Every access is bounds-checked and reports [`CodecError`]; nothing panics.

use super::CodecError;

/// Writes little-endian values into a byte slice.
#[derive(Debug)]
pub struct ByteWriter<'a> {
    buf: &'a mut [u8],
    pos: usize,
}

impl<'a> ByteWriter<'a> {
    /// A writer at the start of `buf`.
    pub fn new(buf: &'a mut [u8]) -> Self {
        Self { buf, pos: 0 }
    }

    /// Bytes written so far.
    pub fn position(&self) -> usize {
        self.pos
    }

    /// Writes raw bytes.
    pub fn put_bytes(&mut self, bytes: &[u8]) -> Result<(), CodecError> {
        let end = self
            .pos
            .checked_add(bytes.len())
            .ok_or(CodecError::BufferTooSmall)?;
        let dst = self
            .buf
            .get_mut(self.pos..end)
            .ok_or(CodecError::BufferTooSmall)?;
        dst.copy_from_slice(bytes);
        self.pos = end;
        Ok(())
    }

    /// Writes one byte.
    pub fn put_u8(&mut self, v: u8) -> Result<(), CodecError> {
        self.put_bytes(&[v])
    }

    /// Writes a `u16`.
    pub fn put_u16(&mut self, v: u16) -> Result<(), CodecError> {
        self.put_bytes(&v.to_le_bytes())
    }

    /// Writes a `u32`.
    pub fn put_u32(&mut self, v: u32) -> Result<(), CodecError> {
        self.put_bytes(&v.to_le_bytes())
    }

    /// Writes an `f32` (IEEE 754 bits).
    pub fn put_f32(&mut self, v: f32) -> Result<(), CodecError> {
        self.put_bytes(&v.to_le_bytes())
    }
}

/// Reads little-endian values from a byte slice.
#[derive(Debug)]
pub struct ByteReader<'a> {
    buf: &'a [u8],
    pos: usize,
}

impl<'a> ByteReader<'a> {
    /// A reader at the start of `buf`.
    pub fn new(buf: &'a [u8]) -> Self {
        Self { buf, pos: 0 }
    }

    /// Bytes not yet read.
    pub fn remaining(&self) -> usize {
        self.buf.len().saturating_sub(self.pos)
    }

    /// [`CodecError::Malformed`] unless every byte was read.
    pub fn finish(&self) -> Result<(), CodecError> {
        if self.remaining() == 0 {
            Ok(())
        } else {
            Err(CodecError::Malformed)
        }
    }

    fn take<const K: usize>(&mut self) -> Result<[u8; K], CodecError> {
        let end = self.pos.checked_add(K).ok_or(CodecError::Truncated)?;
        let src = self.buf.get(self.pos..end).ok_or(CodecError::Truncated)?;
        let mut out = [0u8; K];
        out.copy_from_slice(src);
        self.pos = end;
        Ok(out)
    }

    /// Reads one byte.
    pub fn get_u8(&mut self) -> Result<u8, CodecError> {
        Ok(u8::from_le_bytes(self.take::<1>()?))
    }

    /// Reads a `u16`.
    pub fn get_u16(&mut self) -> Result<u16, CodecError> {
        Ok(u16::from_le_bytes(self.take::<2>()?))
    }

    /// Reads a `u32`.
    pub fn get_u32(&mut self) -> Result<u32, CodecError> {
        Ok(u32::from_le_bytes(self.take::<4>()?))
    }

    /// Reads an `f32`; [`CodecError::Malformed`] for NaN or infinity.
    pub fn get_finite_f32(&mut self) -> Result<f32, CodecError> {
        let v = f32::from_le_bytes(self.take::<4>()?);
        if v.is_finite() {
            Ok(v)
        } else {
            Err(CodecError::Malformed)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_trip_and_bounds() {
        let mut buf = [0u8; 11];
        let mut w = ByteWriter::new(&mut buf);
        w.put_u8(7).unwrap();
        w.put_u16(0xBEEF).unwrap();
        w.put_u32(0x0102_0304).unwrap();
        w.put_f32(1.5).unwrap();
        assert_eq!(w.put_u8(0), Err(CodecError::BufferTooSmall));
        assert_eq!(buf[1..3], [0xEF, 0xBE]);
        let mut r = ByteReader::new(&buf);
        assert_eq!(r.get_u8(), Ok(7));
        assert_eq!(r.get_u16(), Ok(0xBEEF));
        assert_eq!(r.get_u32(), Ok(0x0102_0304));
        assert_eq!(r.get_finite_f32(), Ok(1.5));
        r.finish().unwrap();
        assert_eq!(r.get_u8(), Err(CodecError::Truncated));
        let nan = f32::NAN.to_le_bytes();
        assert_eq!(
            ByteReader::new(&nan).get_finite_f32(),
            Err(CodecError::Malformed)
        );
    }
}
