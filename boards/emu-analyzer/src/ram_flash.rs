//! A RAM-backed NOR flash for the emulated board, behind the `embedded-storage` NOR-flash
//! traits the core's record store (`feedline::store`) uses.
//!
//! It behaves as NOR flash does: erase sets whole sectors to 0xFF, a write can only clear
//! bits (new = old AND data), reads and writes must be aligned to their unit. The emulated
//! board has no flash the firmware may write, so this stands where a real board's flash
//! driver would.
//!
//! Panic policy: nothing here panics; misuse gives a `NorFlashErrorKind`.

use embedded_storage::nor_flash::{ErrorType, NorFlash, NorFlashErrorKind, ReadNorFlash};

/// `N` bytes of RAM as a NOR flash with 4-byte write units and 1 KiB sectors.
pub struct RamFlash<const N: usize> {
    mem: [u8; N],
    /// Bytes that may still be programmed before the simulated power cut (`None`: no cut).
    budget: Option<usize>,
}

impl<const N: usize> RamFlash<N> {
    /// An erased flash.
    pub const fn new() -> Self {
        Self {
            mem: [0xFF; N],
            budget: None,
        }
    }

    /// Simulates a power cut after `bytes` more bytes are programmed: the write that reaches
    /// the limit stores only its first bytes and fails, as do all later ones.
    pub fn cut_after(&mut self, bytes: usize) {
        self.budget = Some(bytes);
    }

    /// Power back on: writes work again.
    pub fn power_on(&mut self) {
        self.budget = None;
    }

    fn range(
        &self,
        offset: u32,
        len: usize,
        unit: usize,
    ) -> Result<(usize, usize), NorFlashErrorKind> {
        let start = usize::try_from(offset).map_err(|_| NorFlashErrorKind::OutOfBounds)?;
        let end = start
            .checked_add(len)
            .ok_or(NorFlashErrorKind::OutOfBounds)?;
        if end > N {
            return Err(NorFlashErrorKind::OutOfBounds);
        }
        if !start.is_multiple_of(unit) || !len.is_multiple_of(unit) {
            return Err(NorFlashErrorKind::NotAligned);
        }
        Ok((start, end))
    }
}

impl<const N: usize> ErrorType for RamFlash<N> {
    type Error = NorFlashErrorKind;
}

impl<const N: usize> ReadNorFlash for RamFlash<N> {
    const READ_SIZE: usize = 1;

    fn read(&mut self, offset: u32, bytes: &mut [u8]) -> Result<(), Self::Error> {
        let (a, b) = self.range(offset, bytes.len(), Self::READ_SIZE)?;
        let src = self.mem.get(a..b).ok_or(NorFlashErrorKind::OutOfBounds)?;
        bytes.copy_from_slice(src);
        Ok(())
    }

    fn capacity(&self) -> usize {
        N
    }
}

impl<const N: usize> NorFlash for RamFlash<N> {
    const WRITE_SIZE: usize = 4;
    const ERASE_SIZE: usize = 1024;

    fn erase(&mut self, from: u32, to: u32) -> Result<(), Self::Error> {
        let len = to.checked_sub(from).ok_or(NorFlashErrorKind::OutOfBounds)?;
        let len = usize::try_from(len).map_err(|_| NorFlashErrorKind::OutOfBounds)?;
        let (a, b) = self.range(from, len, Self::ERASE_SIZE)?;
        self.mem
            .get_mut(a..b)
            .ok_or(NorFlashErrorKind::OutOfBounds)?
            .fill(0xFF);
        Ok(())
    }

    fn write(&mut self, offset: u32, bytes: &[u8]) -> Result<(), Self::Error> {
        let (a, b) = self.range(offset, bytes.len(), Self::WRITE_SIZE)?;
        let allowed = self.budget.unwrap_or(usize::MAX);
        let dst = self
            .mem
            .get_mut(a..b)
            .ok_or(NorFlashErrorKind::OutOfBounds)?;
        let mut done = 0usize;
        for (d, s) in dst.iter_mut().zip(bytes).take(allowed) {
            *d &= *s;
            done += 1;
        }
        if let Some(left) = self.budget.as_mut() {
            *left = left.saturating_sub(done);
            if done < bytes.len() {
                return Err(NorFlashErrorKind::Other);
            }
        }
        Ok(())
    }
}
