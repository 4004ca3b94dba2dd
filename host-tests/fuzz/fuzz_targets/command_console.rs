//! Arbitrary bytes into the command console, with a clock that advances by an amount taken
//! from the input. Checks: no panic; the settings stay valid; no command that changes
//! settings or calibration is accepted while the console is locked; every reply prints.
#![no_main]

use feedline::command::{Action, Console, Reply, Settings};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let mut console: Console<32> = Console::new(Settings::DEFAULT);
    let mut now: u32 = 0;
    for &b in data {
        // Bytes above 0x7F also move the clock, by up to ~2 minutes, to exercise the
        // unlock window.
        if b > 0x7F {
            now = now.wrapping_add(u32::from(b & 0x7F) * 1000);
        }
        let locked_before = console.is_locked(now);
        if let Some(r) = console.push(b, now) {
            if let Reply::Done(cmd) = r.reply {
                if cmd.needs_unlock() {
                    assert!(!locked_before, "{cmd:?} accepted while locked");
                }
            }
            if matches!(r.action, Some(Action::Apply)) {
                assert!(!locked_before);
            }
            let mut s = String::new();
            r.reply.write_to(&mut s).expect("reply prints");
            assert!(s.ends_with('\n') && s.is_ascii());
        }
        assert_eq!(console.settings().validate(), Ok(()));
    }
});
