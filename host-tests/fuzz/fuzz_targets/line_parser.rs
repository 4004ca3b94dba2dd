//! Arbitrary bytes into the line-record parser, twice: as they are (mostly stopped by the
//! CRC), and with a correct ` crc=` appended so the field parser behind the CRC is reached.
//! Checks: no panic; a line that parses re-prints byte for byte (the parser accepts only
//! the writer's canonical form).
#![no_main]

use feedline::report::checksum::crc32;
use feedline::report::line::{parse_line, write_line_fmt};
use libfuzzer_sys::fuzz_target;

fn check(text: &str) {
    if let Ok(r) = parse_line(text) {
        let mut again = String::new();
        write_line_fmt(&mut again, &r).expect("a parsed record prints");
        let canon = text.strip_suffix('\n').unwrap_or(text);
        let canon = canon.strip_suffix('\r').unwrap_or(canon);
        assert_eq!(again.trim_end_matches('\n'), canon);
    }
}

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = core::str::from_utf8(data) {
        check(text);
        if !text.contains('\n') {
            check(&format!("{text} crc={:08x}", crc32(text.as_bytes())));
        }
    }
});
