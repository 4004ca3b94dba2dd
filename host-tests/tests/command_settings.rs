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
