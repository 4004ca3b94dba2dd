//! Settings images for the power-fail-safe store: round trips, and refusal of every
//! damaged image (each single-bit flip, every truncation, erased flash).

use feedline::command::settings::{ENCODED_LEN, POINTS_RANGE};
use feedline::command::{ReportFormat, Settings, SettingsError};
use proptest::prelude::*;

fn valid_settings() -> impl Strategy<Value = Settings> {
    (
        (1100u32..=100_000).prop_flat_map(|trip| (Just(trip), 1000u32..trip)),
        0u32..=60_000,
        any::<u32>(),
        1u16..=256,
        (0u64..u64::MAX).prop_flat_map(|a| (Just(a), (a + 1)..=u64::MAX)),
        POINTS_RANGE.0..=POINTS_RANGE.1,
        prop_oneof![Just(0u32), 50u32..=3_600_000],
        prop_oneof![
            Just(ReportFormat::Text),
            Just(ReportFormat::Binary),
            Just(ReportFormat::Both)
        ],
    )
        .prop_map(
            |((trip, clear), holdoff, floor, avg, (start, stop), points, rate, form)| Settings {
                trip_vswr_milli: trip,
                clear_vswr_milli: clear,
                holdoff_ms: holdoff,
                floor_mw: floor,
                averaging: avg,
                start_hz: start,
                stop_hz: stop,
                points,
                report_period_ms: rate,
                report_format: form,
            },
        )
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(500))]

    #[test]
    fn round_trip_and_every_bit_flip_refused(s in valid_settings()) {
        prop_assert_eq!(s.validate(), Ok(()));
        let img = s.encode();
        prop_assert_eq!(Settings::decode(&img), Ok(s));
        for bit in 0..ENCODED_LEN * 8 {
            let mut bad = img;
            bad[bit / 8] ^= 1 << (bit % 8);
            prop_assert!(Settings::decode(&bad).is_err(), "bit {}", bit);
        }
        for n in 0..ENCODED_LEN {
            prop_assert_eq!(Settings::decode(&img[..n]), Err(SettingsError::Length));
        }
    }

    #[test]
    fn arbitrary_images_never_panic(img in proptest::collection::vec(any::<u8>(), 0..64)) {
        if let Ok(s) = Settings::decode(&img) {
            prop_assert_eq!(s.validate(), Ok(()));
        }
    }
}

#[test]
fn erased_and_zeroed_flash_refused() {
    assert_eq!(
        Settings::decode(&[0xFF; ENCODED_LEN]),
        Err(SettingsError::Crc)
    );
    assert_eq!(
        Settings::decode(&[0x00; ENCODED_LEN]),
        Err(SettingsError::Crc)
    );
}

/// Settings live in the same power-fail-safe A/B store as the calibration: a power cut at
/// any byte of a save leaves either the old or the new settings loadable, never damaged
/// or default ones.
mod store {
    use super::*;
    use feedline::store::{Record, Store};
    use feedline_host_tests::sim_flash::{Cut, SimFlash};

    const SECTOR: usize = 128;
    type Flash = SimFlash<4, SECTOR>;

    fn buf() -> Vec<u8> {
        vec![0u8; Store::<Flash>::buffer_len::<Settings>()]
    }

    fn changed(avg: u16) -> Settings {
        Settings {
            averaging: avg,
            report_format: ReportFormat::Both,
            ..Settings::DEFAULT
        }
    }

    #[test]
    fn save_load_and_power_cut_at_every_byte() {
        assert_eq!(<Settings as Record>::MAX_ENCODED_LEN, ENCODED_LEN);
        let mut st = Store::new(Flash::new(8), 0, 256).unwrap();
        let mut b = buf();
        st.save(&changed(4), &mut b).unwrap();
        let old = changed(4);
        assert_eq!(st.load::<Settings>(&mut b).unwrap().record, old);
        let flash = st.release();

        let new = changed(64);
        let (mut saw_old, mut saw_new) = (0, 0);
        for k in 0.. {
            let mut f = flash.clone();
            f.arm(Cut::BeforeByte(k));
            let mut st = Store::new(f, 0, 256).unwrap();
            let finished = st.save(&new, &mut b).is_ok();
            let mut f = st.release();
            f.power_on();
            let mut st = Store::new(f, 0, 256).unwrap();
            let got = st.load::<Settings>(&mut b).unwrap().record;
            assert!(got == old || got == new, "cut at byte {k}: {got:?}");
            if got == old {
                saw_old += 1;
            } else {
                saw_new += 1;
            }
            if finished {
                assert_eq!(got, new);
                break;
            }
        }
        println!(
            "settings save cut at {} points: old kept {saw_old}, new {saw_new}",
            saw_old + saw_new
        );
        assert!(saw_old > 0 && saw_new > 0);
    }
}
