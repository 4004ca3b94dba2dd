//! The two-slot (A/B) record store. Layout and method: see the [module documentation](super).
//!
//! Panic policy: nothing here panics; every offset is computed with checked arithmetic and
//! every buffer access is bounds-checked.

use embedded_storage::nor_flash::{NorFlash, NorFlashError};

use super::{Record, StoreError};

/// The CRC used for records: the crate's one CRC, CRC-32/ISO-HDLC ([`crate::checksum`]).
use crate::checksum::CRC32 as CRC;

const MAGIC: [u8; 4] = *b"FLR1";
const COMMIT: [u8; 4] = *b"FLOK";
const HEADER_LEN: usize = 16;
const CRC_LEN: usize = 4;
const ERASED: u8 = 0xFF;

/// The largest write unit supported (bytes).
pub const MAX_UNIT: usize = 4096;

/// One of the two slots.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Slot {
    /// The first slot, at the start of the region.
    A,
    /// The second slot, right after the first.
    B,
}

/// A loaded record with where it came from.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Loaded<R> {
    /// The record.
    pub record: R,
    /// Its sequence number (one more on every save).
    pub sequence: u32,
    /// The slot it was read from.
    pub slot: Slot,
}

/// What a slot holds.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum SlotState {
    Blank,
    Damaged,
    Intact {
        tag: u16,
        version: u16,
        sequence: u32,
        payload_len: usize,
    },
}

/// A two-slot record store in a region of a NOR flash.
#[derive(Debug)]
pub struct Store<F> {
    flash: F,
    base: u32,
    slot_len: u32,
}

fn round_up(x: usize, unit: usize) -> Option<usize> {
    if unit == 0 {
        return None;
    }
    let r = x.checked_rem(unit)?;
    if r == 0 {
        Some(x)
    } else {
        x.checked_add(unit - r)
    }
}

/// True when `a` is a newer sequence number than `b` (RFC 1982 serial arithmetic).
fn newer(a: u32, b: u32) -> bool {
    let d = a.wrapping_sub(b);
    d != 0 && d < 0x8000_0000
}

fn le_u16(b: &[u8], at: usize) -> Option<u16> {
    let s = b.get(at..at.checked_add(2)?)?;
    let mut a = [0u8; 2];
    a.copy_from_slice(s);
    Some(u16::from_le_bytes(a))
}

fn le_u32(b: &[u8], at: usize) -> Option<u32> {
    let s = b.get(at..at.checked_add(4)?)?;
    let mut a = [0u8; 4];
    a.copy_from_slice(s);
    Some(u32::from_le_bytes(a))
}

fn flash_err<E: NorFlashError>(e: E) -> StoreError {
    StoreError::Flash(e.kind())
}

impl<F: NorFlash> Store<F> {
    /// The write unit: the largest of 4, `READ_SIZE` and `WRITE_SIZE`.
    pub const UNIT: usize = {
        let mut u = 4;
        if F::READ_SIZE > u {
            u = F::READ_SIZE;
        }
        if F::WRITE_SIZE > u {
            u = F::WRITE_SIZE;
        }
        u
    };

    /// A store in `flash` using two slots of `slot_len` bytes from offset `base`.
    /// `base` and `slot_len` must be multiples of the erase size, the region must fit in
    /// the flash, the flash's read, write and erase sizes must be powers of two, and a slot
    /// must hold at least an empty record.
    pub fn new(flash: F, base: u32, slot_len: u32) -> Result<Self, StoreError> {
        let unit = Self::UNIT;
        let sizes_ok = F::READ_SIZE.is_power_of_two()
            && F::WRITE_SIZE.is_power_of_two()
            && F::ERASE_SIZE.is_power_of_two()
            && unit <= MAX_UNIT;
        let b = usize::try_from(base).map_err(|_| StoreError::BadLayout)?;
        let s = usize::try_from(slot_len).map_err(|_| StoreError::BadLayout)?;
        let end = s.checked_mul(2).and_then(|l| l.checked_add(b));
        let min_slot = round_up(HEADER_LEN + CRC_LEN, unit).and_then(|x| x.checked_add(unit));
        let ok = sizes_ok
            && b.checked_rem(F::ERASE_SIZE) == Some(0)
            && s.checked_rem(F::ERASE_SIZE) == Some(0)
            && s > 0
            && end.is_some_and(|e| e <= flash.capacity())
            && end.is_some_and(|e| u32::try_from(e).is_ok())
            && min_slot.is_some_and(|m| m <= s);
        if ok {
            Ok(Self {
                flash,
                base,
                slot_len,
            })
        } else {
            Err(StoreError::BadLayout)
        }
    }

    /// Gives the flash back.
    pub fn release(self) -> F {
        self.flash
    }

    /// Length of the padded body (header, payload, padding, CRC) for a payload length.
    fn body_len(payload_len: usize) -> Option<usize> {
        round_up(
            HEADER_LEN.checked_add(payload_len)?.checked_add(CRC_LEN)?,
            Self::UNIT,
        )
    }

    /// The buffer length [`Store::load`] and [`Store::save`] need for record type `R`.
    pub fn buffer_len<R: Record>() -> usize {
        Self::body_len(R::MAX_ENCODED_LEN)
            .and_then(|b| b.checked_add(Self::UNIT))
            .unwrap_or(usize::MAX)
    }

    fn slot_start(&self, slot: Slot) -> u32 {
        match slot {
            Slot::A => self.base,
            // In range: checked in `new` (base + 2·slot_len fits in u32).
            Slot::B => self.base.saturating_add(self.slot_len),
        }
    }

    fn read(&mut self, slot: Slot, offset: usize, buf: &mut [u8]) -> Result<(), StoreError> {
        let off = u32::try_from(offset).map_err(|_| StoreError::BadLayout)?;
        let at = self
            .slot_start(slot)
            .checked_add(off)
            .ok_or(StoreError::BadLayout)?;
        self.flash.read(at, buf).map_err(flash_err)
    }

    /// Examines one slot, using `buf` (at least one unit long) as scratch.
    fn inspect(&mut self, slot: Slot, buf: &mut [u8]) -> Result<SlotState, StoreError> {
        let unit = Self::UNIT;
        let slot_len = usize::try_from(self.slot_len).map_err(|_| StoreError::BadLayout)?;
        let chunk_cap = buf
            .len()
            .checked_div(unit)
            .and_then(|n| n.checked_mul(unit))
            .ok_or(StoreError::BufferTooSmall)?;
        let head_len = round_up(HEADER_LEN, unit).ok_or(StoreError::BadLayout)?;
        if chunk_cap < head_len {
            return Err(StoreError::BufferTooSmall);
        }
        let head = buf.get_mut(..head_len).ok_or(StoreError::BufferTooSmall)?;
        self.read(slot, 0, head)?;
        if head.iter().all(|&b| b == ERASED) {
            return Ok(SlotState::Blank);
        }
        if head.get(..4) != Some(&MAGIC[..]) {
            return Ok(SlotState::Damaged);
        }
        let (Some(tag), Some(version), Some(sequence), Some(len)) = (
            le_u16(head, 4),
            le_u16(head, 6),
            le_u32(head, 8),
            le_u32(head, 12),
        ) else {
            return Ok(SlotState::Damaged);
        };
        let Ok(payload_len) = usize::try_from(len) else {
            return Ok(SlotState::Damaged);
        };
        let Some(body) = Self::body_len(payload_len) else {
            return Ok(SlotState::Damaged);
        };
        if body.checked_add(unit).is_none_or(|t| t > slot_len) {
            return Ok(SlotState::Damaged);
        }
        // CRC over [0, body − 4), stored CRC in [body − 4, body), streamed in chunks.
        let crc_pos = body - CRC_LEN;
        let mut digest = CRC.digest();
        let mut stored = [0u8; CRC_LEN];
        let mut off = 0usize;
        while off < body {
            let n = chunk_cap.min(body - off);
            let chunk = buf.get_mut(..n).ok_or(StoreError::BufferTooSmall)?;
            self.read(slot, off, chunk)?;
            let data_end = crc_pos.min(off + n);
            if data_end > off {
                digest.update(chunk.get(..data_end - off).unwrap_or(&[]));
            }
            for (i, &b) in chunk.iter().enumerate() {
                if let Some(k) = (off + i).checked_sub(crc_pos) {
                    if let Some(s) = stored.get_mut(k) {
                        *s = b;
                    }
                }
            }
            off += n;
        }
        if digest.finalize() != u32::from_le_bytes(stored) {
            return Ok(SlotState::Damaged);
        }
        let commit = buf.get_mut(..unit).ok_or(StoreError::BufferTooSmall)?;
        self.read(slot, body, commit)?;
        let committed = commit.get(..4) == Some(&COMMIT[..])
            && commit
                .get(4..)
                .is_some_and(|rest| rest.iter().all(|&b| b == ERASED));
        if !committed {
            return Ok(SlotState::Damaged);
        }
        Ok(SlotState::Intact {
            tag,
            version,
            sequence,
            payload_len,
        })
    }

    /// The newest intact slot holding a record of type `R`, with its state.
    fn newest<R: Record>(a: SlotState, b: SlotState) -> Option<(Slot, u32, u16, usize)> {
        let ours = |s: SlotState| match s {
            SlotState::Intact {
                tag,
                version,
                sequence,
                payload_len,
            } if tag == R::TYPE_TAG => Some((sequence, version, payload_len)),
            _ => None,
        };
        match (ours(a), ours(b)) {
            (Some((sa, va, la)), Some((sb, vb, lb))) => {
                if newer(sb, sa) {
                    Some((Slot::B, sb, vb, lb))
                } else {
                    Some((Slot::A, sa, va, la))
                }
            }
            (Some((s, v, l)), None) => Some((Slot::A, s, v, l)),
            (None, Some((s, v, l))) => Some((Slot::B, s, v, l)),
            (None, None) => None,
        }
    }

    /// Loads the newest intact record of type `R`. `buf` must be at least
    /// [`Store::buffer_len`]`::<R>()` bytes.
    ///
    /// Errors: [`StoreError::Empty`] when both slots are erased, [`StoreError::Foreign`]
    /// when only records of another type are intact, [`StoreError::Corrupt`] when no slot is
    /// intact, [`StoreError::Decode`] when the newest intact record does not decode.
    pub fn load<R: Record>(&mut self, buf: &mut [u8]) -> Result<Loaded<R>, StoreError> {
        if buf.len() < Self::buffer_len::<R>() {
            return Err(StoreError::BufferTooSmall);
        }
        let a = self.inspect(Slot::A, buf)?;
        let b = self.inspect(Slot::B, buf)?;
        let Some((slot, sequence, version, payload_len)) = Self::newest::<R>(a, b) else {
            return Err(match (a, b) {
                (SlotState::Intact { tag, .. }, _) | (_, SlotState::Intact { tag, .. }) => {
                    StoreError::Foreign(tag)
                }
                (SlotState::Blank, SlotState::Blank) => StoreError::Empty,
                _ => StoreError::Corrupt,
            });
        };
        if payload_len > R::MAX_ENCODED_LEN {
            return Err(StoreError::Decode(super::CodecError::Malformed));
        }
        let body = Self::body_len(payload_len).ok_or(StoreError::Corrupt)?;
        let whole = buf.get_mut(..body).ok_or(StoreError::BufferTooSmall)?;
        self.read(slot, 0, whole)?;
        // Re-check the CRC on the bytes actually decoded.
        let crc_pos = body - CRC_LEN;
        let data = whole.get(..crc_pos).ok_or(StoreError::Corrupt)?;
        let stored = le_u32(whole, crc_pos).ok_or(StoreError::Corrupt)?;
        if CRC.checksum(data) != stored {
            return Err(StoreError::Corrupt);
        }
        let payload_end = HEADER_LEN
            .checked_add(payload_len)
            .ok_or(StoreError::Corrupt)?;
        let payload = whole
            .get(HEADER_LEN..payload_end)
            .ok_or(StoreError::Corrupt)?;
        let record = R::decode(version, payload).map_err(StoreError::Decode)?;
        Ok(Loaded {
            record,
            sequence,
            slot,
        })
    }

    /// Saves `record` into the slot not holding the newest record, then verifies it.
    /// Returns the new record's sequence number. `buf` must be at least
    /// [`Store::buffer_len`]`::<R>()` bytes.
    pub fn save<R: Record>(&mut self, record: &R, buf: &mut [u8]) -> Result<u32, StoreError> {
        let unit = Self::UNIT;
        if buf.len() < Self::buffer_len::<R>() {
            return Err(StoreError::BufferTooSmall);
        }
        let a = self.inspect(Slot::A, buf)?;
        let b = self.inspect(Slot::B, buf)?;
        let (target, sequence) = match Self::newest::<R>(a, b) {
            Some((Slot::A, s, _, _)) => (Slot::B, s.wrapping_add(1)),
            Some((Slot::B, s, _, _)) => (Slot::A, s.wrapping_add(1)),
            // No record of this type yet: prefer a slot that holds no intact record.
            None => match (a, b) {
                (SlotState::Intact { .. }, SlotState::Blank | SlotState::Damaged) => (Slot::B, 1),
                _ => (Slot::A, 1),
            },
        };
        // Encode the payload in place after the header.
        let area_end = HEADER_LEN
            .checked_add(R::MAX_ENCODED_LEN)
            .ok_or(StoreError::RecordTooLarge)?;
        let payload_area = buf
            .get_mut(HEADER_LEN..area_end)
            .ok_or(StoreError::BufferTooSmall)?;
        let len = record.encode(payload_area).map_err(StoreError::Encode)?;
        if len > R::MAX_ENCODED_LEN {
            return Err(StoreError::Encode(super::CodecError::BufferTooSmall));
        }
        let body = Self::body_len(len).ok_or(StoreError::RecordTooLarge)?;
        let slot_len = usize::try_from(self.slot_len).map_err(|_| StoreError::BadLayout)?;
        let total = body.checked_add(unit).ok_or(StoreError::RecordTooLarge)?;
        if total > slot_len {
            return Err(StoreError::RecordTooLarge);
        }
        let len32 = u32::try_from(len).map_err(|_| StoreError::RecordTooLarge)?;
        let image = buf.get_mut(..total).ok_or(StoreError::BufferTooSmall)?;
        let tag = R::TYPE_TAG.to_le_bytes();
        let version = R::VERSION.to_le_bytes();
        let seq = sequence.to_le_bytes();
        let len_bytes = len32.to_le_bytes();
        let header = MAGIC
            .iter()
            .chain(&tag)
            .chain(&version)
            .chain(&seq)
            .chain(&len_bytes);
        let head = image
            .get_mut(..HEADER_LEN)
            .ok_or(StoreError::BufferTooSmall)?;
        for (dst, src) in head.iter_mut().zip(header) {
            *dst = *src;
        }
        let crc_pos = body - CRC_LEN;
        image
            .get_mut(HEADER_LEN + len..crc_pos)
            .ok_or(StoreError::BufferTooSmall)?
            .fill(ERASED);
        let crc = CRC.checksum(image.get(..crc_pos).ok_or(StoreError::BufferTooSmall)?);
        image
            .get_mut(crc_pos..body)
            .ok_or(StoreError::BufferTooSmall)?
            .copy_from_slice(&crc.to_le_bytes());
        let commit = image
            .get_mut(body..total)
            .ok_or(StoreError::BufferTooSmall)?;
        commit.fill(ERASED);
        commit
            .get_mut(..4)
            .ok_or(StoreError::BufferTooSmall)?
            .copy_from_slice(&COMMIT);

        let start = self.slot_start(target);
        let end = start
            .checked_add(self.slot_len)
            .ok_or(StoreError::BadLayout)?;
        self.flash.erase(start, end).map_err(flash_err)?;
        let body_bytes = image.get(..body).ok_or(StoreError::BufferTooSmall)?;
        self.flash.write(start, body_bytes).map_err(flash_err)?;
        let body32 = u32::try_from(body).map_err(|_| StoreError::BadLayout)?;
        let commit_at = start.checked_add(body32).ok_or(StoreError::BadLayout)?;
        let commit_bytes = image.get(body..total).ok_or(StoreError::BufferTooSmall)?;
        self.flash
            .write(commit_at, commit_bytes)
            .map_err(flash_err)?;

        match self.inspect(target, buf)? {
            SlotState::Intact {
                tag,
                sequence: s,
                payload_len,
                ..
            } if tag == R::TYPE_TAG && s == sequence && payload_len == len => Ok(sequence),
            _ => Err(StoreError::VerifyFailed),
        }
    }

    /// Erases both slots (a factory reset of this record).
    pub fn erase(&mut self) -> Result<(), StoreError> {
        let end = self
            .slot_start(Slot::B)
            .checked_add(self.slot_len)
            .ok_or(StoreError::BadLayout)?;
        self.flash.erase(self.base, end).map_err(flash_err)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::store::{ByteReader, ByteWriter, CodecError};
    use embedded_storage::nor_flash::{ErrorType, NorFlashErrorKind, ReadNorFlash};

    /// A RAM-backed NOR flash (write ANDs bits, erase sets 0xFF) for the unit tests.
    struct RamFlash([u8; 1024]);

    impl ErrorType for RamFlash {
        type Error = NorFlashErrorKind;
    }
    impl ReadNorFlash for RamFlash {
        const READ_SIZE: usize = 1;
        fn read(&mut self, offset: u32, bytes: &mut [u8]) -> Result<(), Self::Error> {
            let o = offset as usize;
            let src = self
                .0
                .get(o..o + bytes.len())
                .ok_or(NorFlashErrorKind::OutOfBounds)?;
            bytes.copy_from_slice(src);
            Ok(())
        }
        fn capacity(&self) -> usize {
            self.0.len()
        }
    }
    impl NorFlash for RamFlash {
        const WRITE_SIZE: usize = 4;
        const ERASE_SIZE: usize = 128;
        fn erase(&mut self, from: u32, to: u32) -> Result<(), Self::Error> {
            self.0
                .get_mut(from as usize..to as usize)
                .ok_or(NorFlashErrorKind::OutOfBounds)?
                .fill(0xFF);
            Ok(())
        }
        fn write(&mut self, offset: u32, bytes: &[u8]) -> Result<(), Self::Error> {
            let o = offset as usize;
            let dst = self
                .0
                .get_mut(o..o + bytes.len())
                .ok_or(NorFlashErrorKind::OutOfBounds)?;
            for (d, s) in dst.iter_mut().zip(bytes) {
                *d &= *s;
            }
            Ok(())
        }
    }

    #[derive(Debug, PartialEq)]
    struct Counter(u32);
    impl Record for Counter {
        const TYPE_TAG: u16 = 0x0001;
        const VERSION: u16 = 1;
        const MAX_ENCODED_LEN: usize = 4;
        fn encode(&self, out: &mut [u8]) -> Result<usize, CodecError> {
            let mut w = ByteWriter::new(out);
            w.put_u32(self.0)?;
            Ok(w.position())
        }
        fn decode(_version: u16, bytes: &[u8]) -> Result<Self, CodecError> {
            let mut r = ByteReader::new(bytes);
            let v = r.get_u32()?;
            r.finish()?;
            Ok(Counter(v))
        }
    }

    #[test]
    fn save_load_alternates_slots() {
        let mut store = Store::new(RamFlash([0xFF; 1024]), 256, 128).unwrap();
        let mut buf = [0u8; 64];
        assert_eq!(store.load::<Counter>(&mut buf), Err(StoreError::Empty));
        assert_eq!(store.save(&Counter(7), &mut buf), Ok(1));
        assert_eq!(store.save(&Counter(8), &mut buf), Ok(2));
        let l = store.load::<Counter>(&mut buf).unwrap();
        assert_eq!((l.record, l.sequence, l.slot), (Counter(8), 2, Slot::B));
        assert_eq!(store.save(&Counter(9), &mut buf), Ok(3));
        let l = store.load::<Counter>(&mut buf).unwrap();
        assert_eq!((l.record, l.slot), (Counter(9), Slot::A));
        store.erase().unwrap();
        assert_eq!(store.load::<Counter>(&mut buf), Err(StoreError::Empty));
    }

    #[test]
    fn layout_and_buffer_checks() {
        assert_eq!(
            Store::new(RamFlash([0xFF; 1024]), 100, 128).err(),
            Some(StoreError::BadLayout)
        );
        assert_eq!(
            Store::new(RamFlash([0xFF; 1024]), 512, 512).err(),
            Some(StoreError::BadLayout)
        );
        let mut store = Store::new(RamFlash([0xFF; 1024]), 0, 128).unwrap();
        let mut small = [0u8; 8];
        assert_eq!(
            store.save(&Counter(1), &mut small),
            Err(StoreError::BufferTooSmall)
        );
    }

    #[test]
    fn serial_numbers_wrap() {
        assert!(newer(1, 0));
        assert!(newer(0, u32::MAX));
        assert!(!newer(5, 5));
        assert!(!newer(0, 1));
    }
}
