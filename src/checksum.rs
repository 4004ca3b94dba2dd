//! The one CRC of the crate — reports, frames, stored settings and every record in the
//! store: CRC-32/ISO-HDLC. One CRC means one 1 KiB table in flash.
//!
//! Parameters as catalogued in Greg Cook's *Catalogue of parametrised CRC algorithms*
//! (CRC RevEng): width 32, poly 0x04C11DB7, init 0xFFFFFFFF, refin/refout true,
//! xorout 0xFFFFFFFF, check ("123456789") 0xCBF43926. The same CRC is the FCS of
//! ISO/IEC 13239 (HDLC) and IEEE 802.3.
//!
//! Why this CRC: a CRC whose generator has degree n and a non-zero x⁰ term detects every
//! error burst of length ≤ n (W. W. Peterson and D. T. Brown, "Cyclic Codes for Error
//! Detection", Proc. IRE 49(1), 1961). With n = 32 every burst of up to 32 bits inside the
//! protected bytes is detected, which covers the 16-bit bursts the frame tests demand with
//! margin; errors that also disturb the COBS framing are caught by the framing checks or
//! by the CRC with residual probability 2⁻³².
//!
//! Implementation: the `crc` crate with its default one-lane table: 256 × 4 bytes = 1 KiB
//! of flash, one table lookup per byte.
//!
//! Panic policy: nothing here panics.

use crc::{Crc, Digest, CRC_32_ISO_HDLC};

/// The CRC engine (const-built; its table lives in flash).
pub static CRC32: Crc<u32> = Crc::<u32>::new(&CRC_32_ISO_HDLC);

/// CRC-32/ISO-HDLC of `bytes`.
#[inline]
pub fn crc32(bytes: &[u8]) -> u32 {
    CRC32.checksum(bytes)
}

/// A running CRC-32/ISO-HDLC over bytes fed in pieces.
pub(crate) fn digest() -> Digest<'static, u32> {
    CRC32.digest()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (input, expected CRC). The first is the catalogue's check value; the others are
    /// the well-known CRC-32 values of the empty string and of "a" (from memory, and
    /// identical to zlib's `crc32`).
    const VECTORS: [(&[u8], u32); 3] = [
        (b"123456789", 0xCBF4_3926),
        (b"", 0x0000_0000),
        (b"a", 0xE8B7_BE43),
    ];

    #[test]
    fn catalogue_vectors() {
        for &(input, want) in VECTORS.iter() {
            assert_eq!(crc32(input), want);
            let mut d = digest();
            for b in input {
                d.update(core::slice::from_ref(b));
            }
            assert_eq!(d.finalize(), want);
        }
    }
}
