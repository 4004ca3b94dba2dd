//! Arbitrary bytes into the streaming frame decoder. Checks: no panic; every accepted
//! frame has a payload within MAX_PAYLOAD; every record decoded from a frame re-encodes to
//! a frame that decodes to the same record. The input is also given straight to the
//! payload decoder (first byte as the type), which the CRC otherwise shields.
#![no_main]

use feedline::report::frame::{FrameDecoder, MAX_PAYLOAD, MAX_WIRE};
use feedline::report::Record;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    if let Some((&kind, payload)) = data.split_first() {
        if let Ok(r) = Record::from_payload(kind, payload) {
            assert_eq!(r.type_byte(), kind);
        }
    }
    let mut rx: FrameDecoder = FrameDecoder::new();
    for &b in data {
        if let Some(Ok(frame)) = rx.push(b) {
            assert!(frame.payload().len() <= MAX_PAYLOAD);
            if let Ok(r) = Record::from_frame(&frame) {
                let mut wire = [0u8; MAX_WIRE];
                let n = r
                    .encode_frame(&mut wire)
                    .expect("a decoded record re-encodes");
                let mut again: FrameDecoder = FrameDecoder::new();
                let mut back = None;
                for &w in &wire[..n] {
                    if let Some(f) = again.push(w) {
                        back = Some(Record::from_frame(&f.expect("own frame is good")));
                    }
                }
                assert_eq!(back, Some(Ok(r)));
            }
        }
    }
});
