//! Persisting a [`CalTable`] through the [`store`](crate::store) as a [`Record`].
//!
//! Encoding, version 1 (little-endian): point count `u16`, reserved `u16` (0), then per
//! point the frequency in Hz and the real and imaginary parts of e00, e11 and e10e01, all
//! `f32` — 28 bytes a point. Decoding re-checks everything the table's own API checks
//! (finite values, term ranges, strictly ascending frequencies, count ≤ `N`, no trailing
//! bytes), so a record that passed the CRC but came from other firmware cannot yield a
//! wrong table.
//!
//! Panic policy: nothing here panics.

use num_complex::Complex32;

use super::table::CalTable;
use super::terms::OnePortTerms;
use crate::store::{ByteReader, ByteWriter, CodecError, Record};
use crate::units::Hertz;

/// The record type tag of a calibration table.
pub const CAL_TABLE_TAG: u16 = 0xCA1B;

/// Bytes per stored calibration point.
pub const POINT_BYTES: usize = 28;

const HEADER_BYTES: usize = 4;

impl<const N: usize> Record for CalTable<N> {
    const TYPE_TAG: u16 = CAL_TABLE_TAG;
    const VERSION: u16 = 1;
    const MAX_ENCODED_LEN: usize = HEADER_BYTES + POINT_BYTES * N;

    fn encode(&self, out: &mut [u8]) -> Result<usize, CodecError> {
        let count = u16::try_from(self.len()).map_err(|_| CodecError::Malformed)?;
        let mut w = ByteWriter::new(out);
        w.put_u16(count)?;
        w.put_u16(0)?;
        for p in self.points() {
            w.put_f32(p.frequency.value())?;
            for c in [
                p.terms.directivity(),
                p.terms.source_match(),
                p.terms.tracking(),
            ] {
                w.put_f32(c.re)?;
                w.put_f32(c.im)?;
            }
        }
        Ok(w.position())
    }

    fn decode(version: u16, bytes: &[u8]) -> Result<Self, CodecError> {
        if version != 1 {
            return Err(CodecError::UnsupportedVersion);
        }
        let mut r = ByteReader::new(bytes);
        let count = usize::from(r.get_u16()?);
        if r.get_u16()? != 0 || count > N {
            return Err(CodecError::Malformed);
        }
        let mut table = CalTable::<N>::new();
        let mut last: Option<f32> = None;
        for _ in 0..count {
            let f = r.get_finite_f32()?;
            let mut c = [Complex32::new(0.0, 0.0); 3];
            for z in c.iter_mut() {
                *z = Complex32::new(r.get_finite_f32()?, r.get_finite_f32()?);
            }
            let [e00, e11, t] = c;
            let terms = OnePortTerms::new(e00, e11, t).map_err(|_| CodecError::Malformed)?;
            if last.is_some_and(|l| f <= l) {
                return Err(CodecError::Malformed);
            }
            last = Some(f);
            table
                .insert(Hertz::new(f), terms)
                .map_err(|_| CodecError::Malformed)?;
        }
        r.finish()?;
        Ok(table)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_trip() {
        let mut t = CalTable::<4>::new();
        for i in 0..3u8 {
            let x = f32::from(i) * 0.1;
            let terms = OnePortTerms::new(
                Complex32::new(x, -x),
                Complex32::new(0.01, x),
                Complex32::new(0.9, x),
            )
            .unwrap();
            t.insert(Hertz::new(1.0e6 * f32::from(i + 1)), terms)
                .unwrap();
        }
        let mut buf = [0u8; <CalTable<4> as Record>::MAX_ENCODED_LEN];
        let n = t.encode(&mut buf).unwrap();
        assert_eq!(n, 4 + 3 * POINT_BYTES);
        assert_eq!(CalTable::<4>::decode(1, &buf[..n]).unwrap(), t);
        assert_eq!(
            CalTable::<4>::decode(2, &buf[..n]),
            Err(CodecError::UnsupportedVersion)
        );
        assert_eq!(
            CalTable::<4>::decode(1, &buf[..n - 1]),
            Err(CodecError::Truncated)
        );
        assert_eq!(
            CalTable::<2>::decode(1, &buf[..n]),
            Err(CodecError::Malformed)
        );
        assert_eq!(
            CalTable::<4>::decode(1, &buf[..n + 1]),
            Err(CodecError::Malformed)
        );
    }
}
