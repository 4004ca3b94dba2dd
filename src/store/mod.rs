//! Power-fail-safe persistent records on NOR flash (through the `embedded-storage` traits).
//!
//! # Method
//! Two slots (A and B), each a whole number of erase sectors. A save goes to the slot that
//! does *not* hold the newest intact record: erase it, write header + payload + CRC, then
//! write a separate commit word. A load checks both slots and takes the intact one with the
//! newer sequence number (serial-number arithmetic, RFC 1982, so the 32-bit counter may
//! wrap). A power cut at any moment of a save therefore leaves the previous record intact in
//! the other slot: the half-written slot fails its CRC or lacks its commit word. This is the
//! usual double-buffered ("ping-pong") record scheme for flash (common practice).
//!
//! # Slot layout (little-endian)
//! ```text
//! 0   magic "FLR1"        4 bytes
//! 4   record type tag     u16      (Record::TYPE_TAG)
//! 6   record version      u16      (Record::VERSION)
//! 8   sequence number     u32
//! 12  payload length      u32
//! 16  payload             length bytes (Record::encode)
//! ..  padding 0xFF        to make the body a multiple of the write unit, CRC included
//! ..  CRC-32            u32 over every byte before it (magic … padding)
//! ..  commit unit         "FLOK" then 0xFF up to one write unit
//! ```
//! The write unit is the largest of 4 bytes and the flash's `READ_SIZE` and `WRITE_SIZE`
//! (all powers of two). Every byte of the layout is checked on load, so any single-bit
//! flip is detected.
//!
//! CRC: CRC-32/ISO-HDLC ([`crate::checksum`], shared with the serial reports so a firmware
//! carries one 1 KiB table). Like any 32-bit CRC it detects every burst error up to 32 bits
//! long, so every single-bit flip (W. W. Peterson and D. T. Brown, Proc. IRE 49(1), 1961);
//! its Hamming distance is at least 4 for messages up to 91 607 bits (from memory, after
//! P. Koopman's CRC tables), far beyond any record a slot holds. The host tests flip every
//! bit of a stored record and check that each flip is caught.
//!
//! # Records
//! Anything implementing [`Record`] can be stored: a type tag, a version, and an
//! encode/decode into a byte buffer. The [`codec`] module has a small little-endian
//! reader and writer for that. One store region holds one record type; give each type its
//! own region.
//!
//! Not supported: wear levelling beyond the two slots, more than one record per slot,
//! records larger than a slot.
//!
//! Panic policy: nothing in this module panics; corrupted, truncated or foreign data gives
//! a [`StoreError`], never a panic or a wrong record.

pub mod codec;
pub mod slots;

pub use codec::{ByteReader, ByteWriter};
pub use slots::{Loaded, Slot, Store};

use embedded_storage::nor_flash::NorFlashErrorKind;

/// Why a record could not be encoded or decoded.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum CodecError {
    /// The output buffer is too small for the record.
    BufferTooSmall,
    /// The input ended before the record did.
    Truncated,
    /// The bytes do not form a valid record (bad value, bad order, trailing bytes, …).
    Malformed,
    /// The record version is not one this firmware reads.
    UnsupportedVersion,
}

/// Why the store could not load or save.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum StoreError {
    /// The flash driver failed.
    Flash(NorFlashErrorKind),
    /// The region or slot size does not fit the flash (alignment, bounds, unit sizes).
    BadLayout,
    /// The caller's buffer is smaller than [`Store::buffer_len`] for this record type.
    BufferTooSmall,
    /// The record does not fit in one slot.
    RecordTooLarge,
    /// Both slots are erased: nothing was ever saved.
    Empty,
    /// No slot holds an intact record (partly written, erased mid-way or damaged).
    Corrupt,
    /// An intact record of another type (its tag) is stored here.
    Foreign(u16),
    /// The newest intact record could not be decoded.
    Decode(CodecError),
    /// The record could not be encoded.
    Encode(CodecError),
    /// Read-back after the save did not match: the flash may be worn.
    VerifyFailed,
}

/// A value that the [`Store`] can persist.
pub trait Record: Sized {
    /// A tag identifying the record type (distinct per type within one firmware).
    const TYPE_TAG: u16;
    /// The encoding version written by [`Record::encode`].
    const VERSION: u16;
    /// The largest number of bytes [`Record::encode`] writes.
    const MAX_ENCODED_LEN: usize;

    /// Writes the record into `out`, returning the number of bytes written.
    fn encode(&self, out: &mut [u8]) -> Result<usize, CodecError>;

    /// Reads a record written with encoding `version` (older versions may be migrated;
    /// unknown ones give [`CodecError::UnsupportedVersion`]). Must check every value: the
    /// bytes passed the CRC but may come from older firmware.
    fn decode(version: u16, bytes: &[u8]) -> Result<Self, CodecError>;
}
