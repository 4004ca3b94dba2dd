//! Fault injection for the A/B record store: power cuts at every byte of a save, during and
//! right after the erase, every single-bit flip of a stored record, and foreign, truncated
//! or malformed data.
//!
//! The flash is `feedline_host_tests::sim_flash::SimFlash` (NOR semantics: erase to 0xFF,
//! writes only clear bits, no word written twice). The record is a calibration table
//! ([`CalTable`]), so what is checked is exactly "the previous good calibration stays
//! loadable".

use embedded_storage::nor_flash::NorFlashErrorKind;
use feedline::calibration::{record::CAL_TABLE_TAG, CalTable, OnePortTerms};
use feedline::store::{ByteReader, ByteWriter, CodecError, Record, Store, StoreError};
use feedline::units::Hertz;
use feedline_host_tests::sim_flash::{Cut, SimFlash};
use num_complex::Complex32;

const SECTOR: usize = 128;
const BASE: u32 = 512;
const SLOT: u32 = 512;
type Table = CalTable<8>;

fn table(seed: f32) -> Table {
    let mut t = Table::new();
    for i in 0..8 {
        let x = seed + i as f32 * 0.01;
        let terms = OnePortTerms::new(
            Complex32::new(0.1 * x, -0.05 * x),
            Complex32::new(0.02, 0.1 * x),
            Complex32::new(0.8, 0.2 * x),
        )
        .unwrap();
        t.insert(Hertz::new(1.0e6 * (i + 1) as f32), terms).unwrap();
    }
    t
}

fn store<const W: usize>(f: SimFlash<W, SECTOR>) -> Store<SimFlash<W, SECTOR>> {
    Store::new(f, BASE, SLOT).unwrap()
}

fn buffer<const W: usize>() -> Vec<u8> {
    vec![0u8; Store::<SimFlash<W, SECTOR>>::buffer_len::<Table>()]
}

/// Prepares a flash holding `saves` records (old = the last one saved).
fn prepared<const W: usize>(saves: usize) -> (SimFlash<W, SECTOR>, Table, u32) {
    let mut st = store(SimFlash::<W, SECTOR>::new(16));
    let mut buf = buffer::<W>();
    let mut seq = 0;
    let mut last = table(0.0);
    for s in 0..saves {
        last = table(s as f32);
        seq = st.save(&last, &mut buf).unwrap();
    }
    (st.release(), last, seq)
}

fn power_cut_at_every_byte<const W: usize>() -> (usize, usize) {
    let new = table(10.0);
    let third = table(20.0);
    let mut cases = 0;
    let mut old_loads = 0;
    // saves = 1: the save goes to slot B; saves = 2: to slot A.
    for saves in [1usize, 2] {
        let (base_flash, old, old_seq) = prepared::<W>(saves);
        for mode in [Cut::BeforeByte as fn(usize) -> Cut, Cut::DuringByte] {
            for k in 0.. {
                let mut f = base_flash.clone();
                f.arm(mode(k));
                let mut buf = buffer::<W>();
                let mut st = store(f);
                let result = st.save(&new, &mut buf);
                let mut f = st.release();
                let completed = result.is_ok();
                if !completed {
                    assert_eq!(result, Err(StoreError::Flash(NorFlashErrorKind::Other)));
                }
                f.power_on();
                let mut st = store(f);
                let loaded = st
                    .load::<Table>(&mut buf)
                    .unwrap_or_else(|e| panic!("W={W} saves={saves} k={k}: {e:?}"));
                cases += 1;
                if completed {
                    assert_eq!(loaded.record, new);
                    assert_eq!(loaded.sequence, old_seq + 1);
                } else if loaded.record == old {
                    assert_eq!(loaded.sequence, old_seq);
                    old_loads += 1;
                } else {
                    // Only a complete record may load as new (a cut inside the commit
                    // word that happened to leave it intact).
                    assert_eq!(loaded.record, new, "W={W} saves={saves} k={k}");
                    assert_eq!(loaded.sequence, old_seq + 1);
                }
                // The store recovers: the next save and load work.
                st.save(&third, &mut buf).unwrap();
                assert_eq!(st.load::<Table>(&mut buf).unwrap().record, third);
                if completed {
                    break;
                }
            }
        }
        // Cuts inside the erase, at each sector of the target slot.
        for s in 0..(SLOT as usize / SECTOR) {
            let mut f = base_flash.clone();
            f.arm(Cut::DuringErase(s));
            let mut buf = buffer::<W>();
            let mut st = store(f);
            assert!(st.save(&new, &mut buf).is_err());
            let mut f = st.release();
            f.power_on();
            let mut st = store(f);
            let loaded = st.load::<Table>(&mut buf).unwrap();
            assert_eq!((loaded.record, loaded.sequence), (old.clone(), old_seq));
            cases += 1;
            old_loads += 1;
        }
    }
    (cases, old_loads)
}

#[test]
fn power_cut_at_every_byte_loads_old_or_new() {
    let (c1, o1) = power_cut_at_every_byte::<1>();
    let (c4, o4) = power_cut_at_every_byte::<4>();
    let (c8, o8) = power_cut_at_every_byte::<8>();
    let (c16, o16) = power_cut_at_every_byte::<16>();
    println!(
        "power cuts: write size 1: {c1} cases ({o1} loaded the old record), 4: {c4} ({o4}), 8: {c8} ({o8}), 16: {c16} ({o16}); none loaded anything else"
    );
    // Every byte of the save was a cut point (header + payload + CRC + commit unit).
    assert!(c1 > 2 * 2 * 250);
}

fn flip_every_bit<const W: usize>() -> usize {
    let mut flips = 0;
    // Two records: the newer in slot B. A flip there must fall back to the older one.
    let (two, _, seq) = prepared::<W>(2);
    let older = table(0.0);
    let mut buf = buffer::<W>();
    let extent = Store::<SimFlash<W, SECTOR>>::buffer_len::<Table>();
    let b_start = (BASE + SLOT) as usize;
    for byte in b_start..b_start + extent {
        for bit in 0..8 {
            let mut f = two.clone();
            f.flip_bit(byte, bit);
            let loaded = store(f).load::<Table>(&mut buf).unwrap();
            assert_eq!(
                (&loaded.record, loaded.sequence),
                (&older, seq - 1),
                "byte {byte} bit {bit}"
            );
            flips += 1;
        }
    }
    // One record only (slot A): every flip is reported as corrupt.
    let (one, _, _) = prepared::<W>(1);
    let a_start = BASE as usize;
    for byte in a_start..a_start + extent {
        for bit in 0..8 {
            let mut f = one.clone();
            f.flip_bit(byte, bit);
            assert_eq!(
                store(f).load::<Table>(&mut buf),
                Err(StoreError::Corrupt),
                "byte {byte} bit {bit}"
            );
            flips += 1;
        }
    }
    flips
}

#[test]
fn every_single_bit_flip_is_detected() {
    let n = flip_every_bit::<1>() + flip_every_bit::<4>() + flip_every_bit::<16>();
    println!("bit flips: {n} single-bit flips, every one detected");
}

/// A record of another type, standing in for device settings.
#[derive(Debug, PartialEq)]
struct Other(u32);
impl Record for Other {
    const TYPE_TAG: u16 = 0x5E77;
    const VERSION: u16 = 1;
    const MAX_ENCODED_LEN: usize = 4;
    fn encode(&self, out: &mut [u8]) -> Result<usize, CodecError> {
        let mut w = ByteWriter::new(out);
        w.put_u32(self.0)?;
        Ok(w.position())
    }
    fn decode(_: u16, bytes: &[u8]) -> Result<Self, CodecError> {
        let mut r = ByteReader::new(bytes);
        let v = r.get_u32()?;
        r.finish()?;
        Ok(Other(v))
    }
}

/// Bytes written under the calibration table's tag with encoding version `V`, bypassing its
/// encoder: a record from other firmware.
struct Impostor<const V: u16>(Vec<u8>);
impl<const V: u16> Record for Impostor<V> {
    const TYPE_TAG: u16 = CAL_TABLE_TAG;
    const VERSION: u16 = V;
    const MAX_ENCODED_LEN: usize = <Table as Record>::MAX_ENCODED_LEN;
    fn encode(&self, out: &mut [u8]) -> Result<usize, CodecError> {
        let mut w = ByteWriter::new(out);
        w.put_bytes(&self.0)?;
        Ok(w.position())
    }
    fn decode(_: u16, _: &[u8]) -> Result<Self, CodecError> {
        Err(CodecError::Malformed)
    }
}

#[test]
fn foreign_truncated_and_malformed_data_give_typed_errors() {
    let mut buf = buffer::<4>();
    // Foreign record type.
    let mut st = store(SimFlash::<4, SECTOR>::new(16));
    st.save(&Other(42), &mut buf).unwrap();
    assert_eq!(st.load::<Table>(&mut buf), Err(StoreError::Foreign(0x5E77)));
    assert_eq!(st.load::<Other>(&mut buf).unwrap().record, Other(42));
    // A first save of a table goes to the slot without an intact record, so both are then
    // readable by their own type (one region is meant for one type: the next table save
    // would overwrite the other record).
    st.save(&table(1.0), &mut buf).unwrap();
    assert_eq!(st.load::<Table>(&mut buf).unwrap().record, table(1.0));
    assert_eq!(st.load::<Other>(&mut buf).unwrap().record, Other(42));

    // Intact CRC, our tag, but a payload the table decoder refuses (NaN terms, bad order,
    // wrong count): typed decode error, never a wrong table.
    let mut bad = table(2.0).encode_vec();
    bad[8..12].copy_from_slice(&f32::NAN.to_le_bytes());
    let mut st = store(SimFlash::<4, SECTOR>::new(16));
    st.save(&Impostor::<1>(bad), &mut buf).unwrap();
    assert_eq!(
        st.load::<Table>(&mut buf),
        Err(StoreError::Decode(CodecError::Malformed))
    );
    let mut swapped = table(2.0).encode_vec();
    let (p0, p1) = (4..32, 32..60);
    let first: Vec<u8> = swapped[p0.clone()].to_vec();
    let second: Vec<u8> = swapped[p1.clone()].to_vec();
    swapped[p0].copy_from_slice(&second);
    swapped[p1].copy_from_slice(&first);
    let mut st = store(SimFlash::<4, SECTOR>::new(16));
    st.save(&Impostor::<1>(swapped), &mut buf).unwrap();
    assert_eq!(
        st.load::<Table>(&mut buf),
        Err(StoreError::Decode(CodecError::Malformed))
    );

    // A valid table encoding under a version this firmware does not read.
    let mut st = store(SimFlash::<4, SECTOR>::new(16));
    st.save(&Impostor::<2>(table(2.0).encode_vec()), &mut buf)
        .unwrap();
    assert_eq!(
        st.load::<Table>(&mut buf),
        Err(StoreError::Decode(CodecError::UnsupportedVersion))
    );

    // Truncated: the tail of a stored record erased.
    let mut st = store(SimFlash::<4, SECTOR>::new(16));
    st.save(&table(3.0), &mut buf).unwrap();
    let mut f = st.release();
    f.poke(BASE as usize + 100, &[0xFF; 200]);
    assert_eq!(store(f).load::<Table>(&mut buf), Err(StoreError::Corrupt));

    // Random garbage in both slots.
    let mut f = SimFlash::<4, SECTOR>::new(16);
    let garbage: Vec<u8> = (0..(2 * SLOT as usize))
        .map(|i| (i * 37 % 251) as u8)
        .collect();
    f.poke(BASE as usize, &garbage);
    assert_eq!(store(f).load::<Table>(&mut buf), Err(StoreError::Corrupt));

    // Never saved.
    assert_eq!(
        store(SimFlash::<4, SECTOR>::new(16)).load::<Table>(&mut buf),
        Err(StoreError::Empty)
    );

    // Too small a buffer, too large a record, a bad layout.
    let mut st = store(SimFlash::<4, SECTOR>::new(16));
    let mut small = [0u8; 16];
    assert_eq!(
        st.save(&table(1.0), &mut small),
        Err(StoreError::BufferTooSmall)
    );
    let mut big = CalTable::<64>::new();
    for i in 0..64 {
        big.insert(Hertz::new(i as f32), OnePortTerms::IDENTITY)
            .unwrap();
    }
    let mut bigbuf = vec![0u8; Store::<SimFlash<4, SECTOR>>::buffer_len::<CalTable<64>>()];
    assert_eq!(st.save(&big, &mut bigbuf), Err(StoreError::RecordTooLarge));
    assert_eq!(
        Store::new(SimFlash::<4, SECTOR>::new(16), 100, SLOT).err(),
        Some(StoreError::BadLayout)
    );
    assert_eq!(
        Store::new(SimFlash::<4, SECTOR>::new(4), 0, 1024).err(),
        Some(StoreError::BadLayout)
    );
}

#[test]
fn sequence_numbers_alternate_slots_and_survive_many_saves() {
    let mut st = store(SimFlash::<4, SECTOR>::new(16));
    let mut buf = buffer::<4>();
    for i in 1..=50u32 {
        let t = table(i as f32);
        assert_eq!(st.save(&t, &mut buf), Ok(i));
        let l = st.load::<Table>(&mut buf).unwrap();
        assert_eq!((l.record, l.sequence), (t, i));
    }
}

trait EncodeVec {
    fn encode_vec(&self) -> Vec<u8>;
}
impl EncodeVec for Table {
    fn encode_vec(&self) -> Vec<u8> {
        let mut v = vec![0u8; <Table as Record>::MAX_ENCODED_LEN];
        let n = self.encode(&mut v).unwrap();
        v.truncate(n);
        v
    }
}

mod random_damage {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(500))]

        /// Random bytes written anywhere over two stored records: the load gives the older
        /// record, the newer one, or a typed error — never a panic or any other table.
        #[test]
        fn random_damage_never_yields_another_table(at in 0usize..(2 * SLOT as usize), data in prop::collection::vec(any::<u8>(), 1..64)) {
            let (mut f, newer, seq) = prepared::<4>(2);
            let older = table(0.0);
            let end = (at + data.len()).min(2 * SLOT as usize);
            f.poke(BASE as usize + at, &data[..end - at]);
            let mut buf = buffer::<4>();
            match store(f).load::<Table>(&mut buf) {
                Ok(l) => prop_assert!(
                    (l.record == newer && l.sequence == seq) || (l.record == older && l.sequence == seq - 1)
                ),
                Err(e) => prop_assert!(matches!(e, StoreError::Corrupt)),
            }
        }
    }
}
