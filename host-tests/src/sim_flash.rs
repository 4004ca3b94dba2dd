//! A simulated NOR flash for fault-injection tests of the record store.
//!
//! Behaves like NOR flash as the `embedded-storage` traits describe it: erase sets a whole
//! sector to 0xFF, a write can only clear bits (new = old AND data), and a word may be
//! written only once between erases (a second write is a bug in the caller and panics the
//! test). Power can be cut at a chosen point:
//!
//! * [`Cut::BeforeByte`]`(k)`: bytes `0..k` of the programmed stream are written, nothing
//!   after (k = 0 is a cut between the erase and the first write);
//! * [`Cut::DuringByte`]`(k)`: like `BeforeByte(k)`, and byte k is left half-programmed
//!   (some of its bits cleared, chosen by a fixed pseudo-random pattern);
//! * [`Cut::DuringErase`]`(s)`: the s-th sector of the next erase is left with random
//!   content and the sectors after it unerased.
//!
//! After a cut every operation fails until [`SimFlash::power_on`].

use embedded_storage::nor_flash::{ErrorType, NorFlash, NorFlashErrorKind, ReadNorFlash};

/// Where power is lost.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Cut {
    /// Before programming byte `k` of the stream of written bytes.
    BeforeByte(usize),
    /// While programming byte `k` (it ends up partly programmed).
    DuringByte(usize),
    /// While erasing sector number `s` of the next erase call.
    DuringErase(usize),
}

/// A RAM-backed NOR flash with `WRITE`-byte write units and `ERASE`-byte sectors.
#[derive(Clone, Debug)]
pub struct SimFlash<const WRITE: usize, const ERASE: usize> {
    mem: Vec<u8>,
    written: Vec<bool>,
    cut: Option<Cut>,
    programmed: usize,
    powered: bool,
    rng: u64,
}

impl<const WRITE: usize, const ERASE: usize> SimFlash<WRITE, ERASE> {
    /// An erased flash of `sectors` sectors.
    pub fn new(sectors: usize) -> Self {
        let len = sectors * ERASE;
        Self {
            mem: vec![0xFF; len],
            written: vec![false; len / WRITE],
            cut: None,
            programmed: 0,
            powered: true,
            rng: 0x9E37_79B9_7F4A_7C15,
        }
    }

    /// Arms a power cut; the byte count starts from zero now.
    pub fn arm(&mut self, cut: Cut) {
        self.cut = Some(cut);
        self.programmed = 0;
    }

    /// Restores power and disarms any cut.
    pub fn power_on(&mut self) {
        self.powered = true;
        self.cut = None;
        self.programmed = 0;
    }

    /// True while power is on.
    pub fn is_powered(&self) -> bool {
        self.powered
    }

    /// The raw contents.
    pub fn bytes(&self) -> &[u8] {
        &self.mem
    }

    /// Flips one bit (for corruption tests).
    pub fn flip_bit(&mut self, byte: usize, bit: u8) {
        self.mem[byte] ^= 1 << bit;
    }

    /// Overwrites raw contents, bypassing NOR rules (for corruption tests).
    pub fn poke(&mut self, at: usize, data: &[u8]) {
        self.mem[at..at + data.len()].copy_from_slice(data);
    }

    fn next_random(&mut self) -> u8 {
        // xorshift64*
        self.rng ^= self.rng >> 12;
        self.rng ^= self.rng << 25;
        self.rng ^= self.rng >> 27;
        (self.rng.wrapping_mul(0x2545_F491_4F6C_DD1D) >> 56) as u8
    }
}

impl<const WRITE: usize, const ERASE: usize> ErrorType for SimFlash<WRITE, ERASE> {
    type Error = NorFlashErrorKind;
}

impl<const WRITE: usize, const ERASE: usize> ReadNorFlash for SimFlash<WRITE, ERASE> {
    const READ_SIZE: usize = 1;

    fn read(&mut self, offset: u32, bytes: &mut [u8]) -> Result<(), Self::Error> {
        if !self.powered {
            return Err(NorFlashErrorKind::Other);
        }
        let o = offset as usize;
        let src = self
            .mem
            .get(o..o + bytes.len())
            .ok_or(NorFlashErrorKind::OutOfBounds)?;
        bytes.copy_from_slice(src);
        Ok(())
    }

    fn capacity(&self) -> usize {
        self.mem.len()
    }
}

impl<const WRITE: usize, const ERASE: usize> NorFlash for SimFlash<WRITE, ERASE> {
    const WRITE_SIZE: usize = WRITE;
    const ERASE_SIZE: usize = ERASE;

    fn erase(&mut self, from: u32, to: u32) -> Result<(), Self::Error> {
        if !self.powered {
            return Err(NorFlashErrorKind::Other);
        }
        let (from, to) = (from as usize, to as usize);
        if from > to || to > self.mem.len() {
            return Err(NorFlashErrorKind::OutOfBounds);
        }
        if !from.is_multiple_of(ERASE) || !to.is_multiple_of(ERASE) {
            return Err(NorFlashErrorKind::NotAligned);
        }
        for (n, sector) in (from..to).step_by(ERASE).enumerate() {
            if self.cut == Some(Cut::DuringErase(n)) {
                for i in sector..sector + ERASE {
                    let r = self.next_random();
                    self.mem[i] = r;
                }
                self.powered = false;
                return Err(NorFlashErrorKind::Other);
            }
            self.mem[sector..sector + ERASE].fill(0xFF);
            self.written[sector / WRITE..(sector + ERASE) / WRITE].fill(false);
        }
        Ok(())
    }

    fn write(&mut self, offset: u32, bytes: &[u8]) -> Result<(), Self::Error> {
        if !self.powered {
            return Err(NorFlashErrorKind::Other);
        }
        let o = offset as usize;
        if o + bytes.len() > self.mem.len() {
            return Err(NorFlashErrorKind::OutOfBounds);
        }
        if !o.is_multiple_of(WRITE) || !bytes.len().is_multiple_of(WRITE) {
            return Err(NorFlashErrorKind::NotAligned);
        }
        for w in o / WRITE..(o + bytes.len()) / WRITE {
            assert!(!self.written[w], "word {w} written twice without erase");
            self.written[w] = true;
        }
        for (i, &b) in bytes.iter().enumerate() {
            match self.cut {
                Some(Cut::BeforeByte(k)) if self.programmed == k => {
                    self.powered = false;
                    return Err(NorFlashErrorKind::Other);
                }
                Some(Cut::DuringByte(k)) if self.programmed == k => {
                    // Some bits that should be cleared are cleared, others not.
                    let keep = self.next_random();
                    self.mem[o + i] &= b | keep;
                    self.powered = false;
                    return Err(NorFlashErrorKind::Other);
                }
                _ => {}
            }
            self.mem[o + i] &= b;
            self.programmed += 1;
        }
        Ok(())
    }
}
