//! Bit-at-a-time CRC-32/ISO-HDLC, written straight from the parameters in the published
//! CRC catalogue (Greg Cook, *Catalogue of parametrised CRC algorithms*, CRC RevEng):
//! width 32, poly 0x04C11DB7, init 0xFFFFFFFF, reflected in and out, xorout 0xFFFFFFFF,
//! check 0xCBF43926. Reflected processing uses the bit-reversed polynomial 0xEDB88320.
//! No table, no crate: an independent check of the core's table-driven CRC.

/// CRC-32/ISO-HDLC of `bytes`, one bit at a time.
pub fn crc32_bitwise(bytes: &[u8]) -> u32 {
    let mut crc = 0xFFFF_FFFFu32;
    for &b in bytes {
        crc ^= u32::from(b);
        for _ in 0..8 {
            crc = if crc & 1 != 0 {
                (crc >> 1) ^ 0xEDB8_8320
            } else {
                crc >> 1
            };
        }
    }
    crc ^ 0xFFFF_FFFF
}
