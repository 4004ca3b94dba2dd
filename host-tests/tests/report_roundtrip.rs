//! Protocol round trips of the report formats, and cross-checks of the frame layout
//! against outside references: the `cobs` crate (an independent COBS implementation of
//! Cheshire & Baker 1999) and a bit-at-a-time CRC-32/ISO-HDLC written from the published
//! CRC catalogue's parameters (`feedline_host_tests::reference::crc32`).

mod common;

use feedline::report::frame::{encode_frame, write_frame, FrameDecoder, MAX_PAYLOAD, MAX_WIRE};
use feedline::report::line::{parse_line, write_line, write_line_fmt, MAX_LINE};
use feedline::report::{checksum, Record};
use feedline_host_tests::reference::crc32::crc32_bitwise;
use proptest::prelude::*;

/// The catalogue's check value for CRC-32/ISO-HDLC ("123456789" → 0xCBF43926).
#[test]
fn crc_matches_catalogue_and_bitwise_reference() {
    assert_eq!(crc32_bitwise(b"123456789"), 0xCBF4_3926);
    assert_eq!(checksum::crc32(b"123456789"), 0xCBF4_3926);
}

/// The frame content as the module doc of `report::frame` lays it out, built here by
/// hand with the reference CRC.
fn reference_content(kind: u8, payload: &[u8]) -> Vec<u8> {
    let mut c = vec![payload.len() as u8, kind];
    c.extend_from_slice(payload);
    let crc = crc32_bitwise(&c);
    c.extend_from_slice(&crc.to_le_bytes());
    c
}

fn decode_stream(wire: &[u8]) -> Vec<Result<(u8, Vec<u8>), feedline::report::FrameError>> {
    let mut rx: FrameDecoder = FrameDecoder::new();
    let mut out = Vec::new();
    for &b in wire {
        if let Some(r) = rx.push(b) {
            out.push(r.map(|f| (f.kind(), f.payload().to_vec())));
        }
    }
    out
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(2000))]

    /// Our encoder equals 0x00 + cobs-crate encoding + 0x00 of the reference content, and
    /// our decoder accepts the cobs crate's encoding.
    #[test]
    fn frame_layout_matches_references(
        kind in any::<u8>(),
        payload in proptest::collection::vec(prop_oneof![Just(0u8), any::<u8>()], 0..=MAX_PAYLOAD),
    ) {
        let content = reference_content(kind, &payload);
        let mut want = vec![0u8];
        want.extend(cobs::encode_vec(&content));
        want.push(0);

        let mut wire = [0u8; MAX_WIRE];
        let n = encode_frame(kind, &payload, &mut wire).unwrap();
        prop_assert_eq!(&wire[..n], &want[..]);

        let mut streamed: Vec<u8> = Vec::new();
        let m = write_frame(&mut streamed, kind, &payload).unwrap();
        prop_assert_eq!(m, n);
        prop_assert_eq!(&streamed[..], &want[..]);

        let got = decode_stream(&want);
        prop_assert_eq!(got, vec![Ok((kind, payload.clone()))]);
        // And the cobs crate decodes our encoding back to the reference content.
        prop_assert_eq!(cobs::decode_vec(&wire[1..n - 1]).unwrap(), content);
    }

    /// Record → frame → record and record → line → record give back the same record,
    /// and the line re-prints identically.
    #[test]
    fn records_round_trip(r in common::record()) {
        let mut wire = Vec::new();
        r.write_frame(&mut wire).unwrap();
        let mut rx: FrameDecoder = FrameDecoder::new();
        let mut back = None;
        for &b in &wire {
            if let Some(f) = rx.push(b) {
                back = Some(Record::from_frame(&f.unwrap()));
            }
        }
        prop_assert_eq!(back, Some(Ok(r)));

        let mut text = String::new();
        write_line_fmt(&mut text, &r).unwrap();
        prop_assert!(text.len() <= MAX_LINE, "{} bytes", text.len());
        prop_assert!(text.ends_with('\n') && text.bytes().all(|b| b != 0));
        prop_assert_eq!(parse_line(&text), Ok(r));
        let mut io: Vec<u8> = Vec::new();
        let n = write_line(&mut io, &r).unwrap();
        prop_assert_eq!(n, text.len());
        prop_assert_eq!(&io[..], text.as_bytes());
        // The line's CRC is the reference CRC of the text before " crc=".
        let (body, crc) = text.trim_end().rsplit_once(" crc=").unwrap();
        prop_assert_eq!(u32::from_str_radix(crc, 16).unwrap(), crc32_bitwise(body.as_bytes()));
    }

    /// Frames stay in step through arbitrary interleaved noise: every frame whose bytes
    /// were left intact and that has a delimiter-separated boundary is received.
    #[test]
    fn resynchronises_after_noise(
        records in proptest::collection::vec(common::record(), 1..8),
        noise in proptest::collection::vec(proptest::collection::vec(any::<u8>(), 0..40), 8),
    ) {
        let mut wire = Vec::new();
        for (r, junk) in records.iter().zip(&noise) {
            wire.extend_from_slice(junk);
            r.write_frame(&mut wire).unwrap();
        }
        let mut rx: FrameDecoder = FrameDecoder::new();
        let mut got = Vec::new();
        for &b in &wire {
            if let Some(Ok(f)) = rx.push(b) {
                if let Ok(r) = Record::from_frame(&f) {
                    got.push(r);
                }
            }
        }
        prop_assert_eq!(got, records);
    }
}

/// An example of each line kind, written out by hand from the grammar in the module doc
/// of `report::line` (the CRC digits come from the bit-wise reference CRC).
#[test]
fn line_examples_by_hand() {
    use feedline::report::{DeviceState, StatusRecord, SweepPointRecord};
    let cases = [
        (
            Record::SweepPoint(SweepPointRecord {
                sweep: 3,
                index: 10,
                count: 101,
                freq_hz: 7_100_000,
                gamma_re_micro: 123_456,
                gamma_im_micro: -12_345,
            }),
            "fl.pt v=1 sw=3 i=10 n=101 f=7100000Hz gre=0.123456 gim=-0.012345",
        ),
        (
            Record::Status(StatusRecord {
                uptime_s: 3600,
                state: DeviceState::Monitoring,
                locked: true,
                cal_valid: true,
                rx_errors: 0,
            }),
            "fl.sts v=1 up=3600s state=mon lock=1 cal=1 errs=0",
        ),
    ];
    for (r, body) in cases {
        let want = format!("{body} crc={:08x}\n", crc32_bitwise(body.as_bytes()));
        let mut text = String::new();
        write_line_fmt(&mut text, &r).unwrap();
        assert_eq!(text, want);
        println!("{}", text.trim_end());
    }
}
