//! The command console: a locked device refuses every setting or calibration change,
//! malformed or over-long input never panics and always gets exactly one `err` reply, and
//! accepted commands re-print in a canonical form that parses back to the same command.

use feedline::command::{
    parse, Action, CalStep, Command, CommandError, Console, Reply, ReportFormat, Settings,
    UNLOCK_WINDOW_MS,
};
use proptest::prelude::*;

/// One line in, the responses out.
fn send(c: &mut Console, line: &str, now: u32) -> Vec<feedline::command::Response> {
    let mut out = Vec::new();
    for b in line.bytes().chain(std::iter::once(b'\n')) {
        if let Some(r) = c.push(b, now) {
            out.push(r);
        }
    }
    out
}

fn text(r: &Reply) -> String {
    let mut s = String::new();
    r.write_to(&mut s).unwrap();
    s
}

/// Every command that changes settings or calibration, in valid form (each would be
/// accepted when unlocked, checked below).
const CHANGES: [&str; 16] = [
    "alarm trip 3.5",
    "alarm clear 1.5",
    "alarm holdoff 250",
    "alarm floor 2.5",
    "avg 32",
    "band 7000000 7300000 201",
    "rate 500",
    "rate 0",
    "form both",
    "cal open",
    "cal short",
    "cal load",
    "cal drop",
    "keep",
    "form bin",
    "avg 1",
];

#[test]
fn locked_device_refuses_every_change() {
    let mut c: Console = Console::new(Settings::DEFAULT);
    for line in CHANGES {
        let r = send(&mut c, line, 5);
        assert_eq!(r.len(), 1, "{line}");
        assert_eq!(r[0].reply, Reply::Refused(CommandError::Locked), "{line}");
        assert_eq!(r[0].action, None, "{line}");
        assert_eq!(text(&r[0].reply), "err 9 locked, send unlock first\n");
        assert_eq!(c.settings(), &Settings::DEFAULT, "{line}");
    }
    // Commands that change nothing are answered while locked.
    for (line, action) in [
        ("stat", Some(Action::ReportStatus)),
        ("show", None),
        ("sweep", Some(Action::StartSweep)),
        ("halt", Some(Action::Halt)),
    ] {
        let r = send(&mut c, line, 5);
        assert_eq!(r[0].action, action, "{line}");
        assert!(text(&r[0].reply).starts_with("ok "), "{line}");
    }
}

#[test]
fn unlock_window_lock_and_keep_relock() {
    let mut c: Console = Console::new(Settings::DEFAULT);
    // Every change is accepted inside the window...
    send(&mut c, "unlock", 1000);
    for line in CHANGES.iter().filter(|l| **l != "keep") {
        let r = send(&mut c, line, 1000 + UNLOCK_WINDOW_MS - 1);
        assert!(matches!(r[0].reply, Reply::Done(_)), "{line}: {:?}", r[0]);
    }
    // ...and refused once it has run out.
    let r = send(&mut c, "avg 2", 1000 + UNLOCK_WINDOW_MS);
    assert_eq!(r[0].reply, Reply::Refused(CommandError::Locked));
    // `lock` closes it early.
    send(&mut c, "unlock", 5000);
    send(&mut c, "lock", 5001);
    assert!(c.is_locked(5002));
    assert_eq!(
        send(&mut c, "avg 2", 5002)[0].reply,
        Reply::Refused(CommandError::Locked)
    );
    // `keep` stores and relocks.
    send(&mut c, "unlock", 6000);
    let r = send(&mut c, "keep", 6001);
    assert_eq!(r[0].action, Some(Action::Store));
    assert!(c.is_locked(6002));
    // The window works across the wrap of the millisecond clock.
    send(&mut c, "unlock", u32::MAX - 10);
    assert!(!c.is_locked(5));
    let r = send(&mut c, "avg 2", 5);
    assert_eq!(r[0].action, Some(Action::Apply));
    assert_eq!(c.settings().averaging, 2);
}

#[test]
fn calibration_needs_all_three_standards() {
    let mut c: Console = Console::new(Settings::DEFAULT);
    send(&mut c, "unlock", 0);
    assert_eq!(
        send(&mut c, "cal done", 1)[0].reply,
        Reply::Refused(CommandError::State)
    );
    for s in ["cal load", "cal open"] {
        send(&mut c, s, 1);
    }
    assert_eq!(
        send(&mut c, "cal done", 1)[0].reply,
        Reply::Refused(CommandError::State)
    );
    assert_eq!(
        send(&mut c, "cal short", 1)[0].action,
        Some(Action::Calibrate(CalStep::Short))
    );
    assert_eq!(
        send(&mut c, "cal done", 1)[0].action,
        Some(Action::Calibrate(CalStep::Done))
    );
    // After done, a new calibration starts from nothing.
    assert_eq!(
        send(&mut c, "cal done", 1)[0].reply,
        Reply::Refused(CommandError::State)
    );
}

#[test]
fn malformed_lines_each_get_one_typed_error() {
    let cases: [(&[u8], CommandError); 12] = [
        (b"frobnicate", CommandError::Unknown),
        (b"alarm", CommandError::Missing),
        (b"alarm trip x", CommandError::Number),
        (b"alarm trip -2", CommandError::Number),
        (b"alarm trip 1.05", CommandError::Range),
        (b"avg 0", CommandError::Range),
        (b"band 9 3 101", CommandError::Inconsistent),
        (b"rate 10", CommandError::Range),
        (b"stat now", CommandError::Extra),
        (b"form sideways", CommandError::Unknown),
        (b"st\xffat", CommandError::NotText),
        (b"show\tall", CommandError::NotText),
    ];
    let mut c: Console = Console::new(Settings::DEFAULT);
    for (line, want) in cases {
        let mut got = Vec::new();
        for &b in line.iter().chain(b"\n") {
            // Unlocked at each line's start so range errors show, not the lock.
            if let Some(r) = c.push(b, 0) {
                got.push(r);
            }
        }
        if got.is_empty() || got[0].reply == Reply::Refused(CommandError::Locked) {
            send(&mut c, "unlock", 0);
            got.clear();
            for &b in line.iter().chain(b"\n") {
                if let Some(r) = c.push(b, 0) {
                    got.push(r);
                }
            }
        }
        assert_eq!(got.len(), 1, "{line:?}");
        assert_eq!(got[0].reply, Reply::Refused(want), "{line:?}");
        let t = text(&got[0].reply);
        assert!(t.starts_with(&format!("err {} ", want.code())), "{t}");
    }
    assert_eq!(c.settings(), &Settings::DEFAULT);
}

fn command() -> impl Strategy<Value = Command> {
    prop_oneof![
        Just(Command::Status),
        Just(Command::Show),
        Just(Command::Unlock),
        Just(Command::Lock),
        Just(Command::Sweep),
        Just(Command::Halt),
        Just(Command::Keep),
        any::<u32>().prop_map(Command::AlarmTrip),
        any::<u32>().prop_map(Command::AlarmClear),
        any::<u32>().prop_map(Command::AlarmHoldoff),
        any::<u32>().prop_map(Command::AlarmFloor),
        any::<u16>().prop_map(Command::Average),
        (
            0u64..=9_999_999_999_999_999_999,
            0u64..=9_999_999_999_999_999_999,
            any::<u16>()
        )
            .prop_map(|(a, b, p)| Command::Band {
                start_hz: a,
                stop_hz: b,
                points: p
            }),
        any::<u32>().prop_map(Command::Rate),
        prop_oneof![
            Just(ReportFormat::Text),
            Just(ReportFormat::Binary),
            Just(ReportFormat::Both)
        ]
        .prop_map(Command::Form),
        prop_oneof![
            Just(CalStep::Open),
            Just(CalStep::Short),
            Just(CalStep::Load),
            Just(CalStep::Done),
            Just(CalStep::Drop)
        ]
        .prop_map(Command::Cal),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1000))]

    /// The `ok` reply re-prints the command so that it parses back to the same command.
    #[test]
    fn canonical_form_parses_back(cmd in command()) {
        let t = text(&Reply::Done(cmd));
        let canon = t.strip_prefix("ok ").unwrap().trim_end();
        prop_assert_eq!(parse(canon), Ok(Some(cmd)));
    }

    /// Arbitrary bytes never panic the console; each line ending yields at most one
    /// response, every response prints as one ASCII line, the settings stay valid, and
    /// nothing changes settings while locked.
    #[test]
    fn arbitrary_bytes_are_safe(raw in proptest::collection::vec(any::<u16>(), 0..400)) {
        let mut c: Console<48> = Console::new(Settings::DEFAULT);
        let mut now = 0u32;
        // Biased towards line ends, spaces and letters so that lines are short and some
        // words are real.
        let bytes = raw.iter().map(|&r| match r >> 8 {
            0..=15 => b'\n',
            16..=47 => b' ',
            48..=127 => b"unlockalarmtripavgbandcal0123456789."[usize::from(r & 0xFF) % 36],
            _ => r as u8,
        });
        for b in bytes {
            now = now.wrapping_add(997);
            let locked = c.is_locked(now);
            let before = *c.settings();
            if let Some(r) = c.push(b, now) {
                prop_assert_eq!(b, b'\n');
                let t = text(&r.reply);
                prop_assert!(t.is_ascii() && t.ends_with('\n') && t.matches('\n').count() == 1);
                if locked {
                    prop_assert_eq!(&before, c.settings());
                }
            }
            prop_assert_eq!(c.settings().validate(), Ok(()));
        }
    }

    /// Every non-blank line gets exactly one reply, however it is cut.
    #[test]
    fn one_reply_per_line(lines in proptest::collection::vec("[ -~]{0,80}", 1..20)) {
        let mut c: Console<48> = Console::new(Settings::DEFAULT);
        let mut replies = 0usize;
        for l in &lines {
            for b in l.bytes().chain(std::iter::once(b'\n')) {
                if c.push(b, 0).is_some() {
                    replies += 1;
                }
            }
        }
        let nonblank = lines.iter().filter(|l| !l.trim_matches(' ').is_empty() || l.len() > 48).count();
        prop_assert_eq!(replies, nonblank);
    }
}
