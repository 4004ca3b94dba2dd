//! The capture tool round-trips a generated capture — monitor reports and a sweep, as
//! lines, frames and both, with command replies mixed in — and finds every injected
//! corruption at its byte offset. The Touchstone output is checked against the rules of
//! the Touchstone File Format Specification 1.1 (option line before data, one
//! `freq re im` triple per line, increasing frequency) by a small parser written here.

mod common;

use feedline::report::line::write_line_fmt;
use feedline::report::{MonitorFlags, MonitorRecord, Record, SweepPointRecord};
use feedline_host_tests::serial_capture::{self as capture, Source};

fn line(r: &Record) -> Vec<u8> {
    let mut s = String::new();
    write_line_fmt(&mut s, r).unwrap();
    s.into_bytes()
}

fn frame(r: &Record) -> Vec<u8> {
    let mut v = Vec::new();
    r.write_frame(&mut v).unwrap();
    v
}

fn monitor(seq: u32) -> Record {
    Record::Monitor(MonitorRecord {
        seq,
        time_ms: seq * 250,
        forward_mw: 100_000 + seq,
        reflected_mw: 1_000 + seq,
        delivered_mw: 99_000,
        vswr_milli: 1_220 + seq,
        return_loss_cdb: 2_000 - seq as u16,
        flags: MonitorFlags::from_bits(if seq.is_multiple_of(5) {
            MonitorFlags::ALARM
        } else {
            0
        })
        .unwrap(),
    })
}

fn point(i: u16, n: u16) -> Record {
    // An invented resonance near 7.15 MHz: Γ swings through zero mid-band.
    let x = f64::from(i) / f64::from(n - 1) - 0.5;
    Record::SweepPoint(SweepPointRecord {
        sweep: 7,
        index: i,
        count: n,
        freq_hz: 7_000_000 + u64::from(i) * 3_000,
        gamma_re_micro: (x * 1.2e6) as i32,
        gamma_im_micro: (-x * x * 4e5) as i32,
    })
}

struct Built {
    bytes: Vec<u8>,
    expected: Vec<Record>,
    bad_frames: Vec<usize>,
    bad_lines: Vec<usize>,
}

/// The capture: 30 monitor reports (as line, frame or both), command replies, a 51-point
/// sweep as frames; injected: 3 frames with a flipped bit, 2 lines with a changed digit,
/// one noise burst glued to the front of a line, and a frame cut off at the end.
fn build() -> Built {
    let mut b = Built {
        bytes: Vec::new(),
        expected: Vec::new(),
        bad_frames: Vec::new(),
        bad_lines: Vec::new(),
    };
    b.bytes.extend_from_slice(b"ok unlock\nok rate 250\n");
    for seq in 0..30u32 {
        let r = monitor(seq);
        let corrupt = matches!(seq, 4 | 9 | 11 | 23 | 27);
        match seq % 3 {
            0 => {
                let mut l = line(&r);
                let at = b.bytes.len();
                if corrupt {
                    // Change one digit of the forward power.
                    let pos = l.windows(4).position(|w| w == b"fwd=").unwrap() + 5;
                    l[pos] = if l[pos] == b'9' { b'8' } else { l[pos] + 1 };
                    b.bad_lines.push(at);
                } else {
                    b.expected.push(r);
                }
                b.bytes.extend_from_slice(&l);
            }
            1 => {
                let mut f = frame(&r);
                let at = b.bytes.len() + 1; // after the leading delimiter
                if corrupt {
                    let k = f.len() / 2;
                    f[k] ^= if f[k] == 0x40 { 0x01 } else { 0x40 };
                    b.bad_frames.push(at);
                } else {
                    b.expected.push(r);
                }
                b.bytes.extend_from_slice(&f);
            }
            _ => {
                // Both formats: the line, then the same record as a frame.
                let mut f = frame(&r);
                if corrupt {
                    let k = f.len() / 3;
                    f[k] ^= if f[k] == 0x02 { 0x01 } else { 0x02 };
                    b.bad_frames.push(b.bytes.len() + line(&r).len() + 1);
                }
                b.expected.push(r);
                b.bytes.extend_from_slice(&line(&r));
                b.bytes.extend_from_slice(&f);
            }
        }
        if seq == 17 {
            // Noise glued in front of the next line (a record line, seq 18 is a line).
            b.bytes.extend_from_slice(b"\x13\x37~");
        }
        if seq == 18 {
            // seq 18's line now starts with the noise: it is lost and reported.
            b.expected.pop();
            let start = b.bytes.len() - line(&r).len() - 3;
            b.bad_lines.push(start);
        }
    }
    b.bytes.extend_from_slice(b"ok sweep\n");
    for i in 0..51u16 {
        let r = point(i, 51);
        b.expected.push(r);
        b.bytes.extend_from_slice(&frame(&r));
    }
    b.bytes.extend_from_slice(b"err 3 unknown command\n");
    // A frame cut off by the end of the capture.
    let cut = frame(&monitor(99));
    b.bad_frames.push(b.bytes.len() + 1);
    b.bytes.extend_from_slice(&cut[..cut.len() - 5]);
    b.bad_lines.sort();
    b.bad_frames.sort();
    b
}

#[test]
fn capture_round_trip_with_injected_corruption() {
    let b = build();
    let cap = capture::scan(&b.bytes);
    let got: Vec<Record> = cap.items.iter().map(|i| i.record).collect();
    assert_eq!(got, b.expected);
    let frames: Vec<usize> = cap.corrupted_frames().map(|c| c.offset).collect();
    let lines: Vec<usize> = cap.corrupted_lines().map(|c| c.offset).collect();
    assert_eq!(frames, b.bad_frames, "{}", capture::summary(&cap));
    assert_eq!(lines, b.bad_lines, "{}", capture::summary(&cap));
    assert_eq!(cap.other_lines, 4);
    assert!(cap.items.iter().any(|i| i.source == Source::Line));
    println!("{}", capture::summary(&cap));

    // CSV: a header and one row per good monitor report.
    let csv = capture::monitor_csv(&cap);
    let monitors = b
        .expected
        .iter()
        .filter(|r| matches!(r, Record::Monitor(_)))
        .count();
    assert_eq!(csv.lines().count(), 1 + monitors);
    assert!(csv
        .lines()
        .nth(1)
        .unwrap()
        .starts_with("0,0.000,100.000,1.000,99.000,1.220,20.00,1,"));

    let sweeps = capture::sweeps(&cap);
    assert_eq!(sweeps.len(), 1);
    assert!(sweeps[0].complete());
    let points = touchstone_points(&sweeps[0].touchstone());
    assert_eq!(points.len(), 51);
    for (i, (f, re, im)) in points.iter().enumerate() {
        let Record::SweepPoint(p) = point(i as u16, 51) else {
            unreachable!()
        };
        assert_eq!(*f, p.freq_hz as f64);
        assert!((re - f64::from(p.gamma_re_micro) / 1e6).abs() < 5e-7);
        assert!((im - f64::from(p.gamma_im_micro) / 1e6).abs() < 5e-7);
    }
}

/// A minimal Touchstone 1.1 reader for one-port files: comments after `!`, exactly one
/// option line `# <unit> S RI R <z>` before the data, then `freq re im` in increasing
/// frequency. Returns the points in Hz.
fn touchstone_points(text: &str) -> Vec<(f64, f64, f64)> {
    let mut option = None;
    let mut out: Vec<(f64, f64, f64)> = Vec::new();
    for raw in text.lines() {
        let l = raw.split('!').next().unwrap().trim();
        if l.is_empty() {
            continue;
        }
        if let Some(opt) = l.strip_prefix('#') {
            assert!(
                option.is_none() && out.is_empty(),
                "option line must come first, once"
            );
            let w: Vec<String> = opt.split_whitespace().map(|s| s.to_uppercase()).collect();
            assert_eq!(w, ["HZ", "S", "RI", "R", "50"]);
            option = Some(());
            continue;
        }
        assert!(option.is_some(), "data before the option line");
        let v: Vec<f64> = l.split_whitespace().map(|x| x.parse().unwrap()).collect();
        assert_eq!(v.len(), 3, "{l}");
        if let Some(last) = out.last() {
            assert!(v[0] > last.0, "frequencies must increase");
        }
        out.push((v[0], v[1], v[2]));
    }
    out
}

#[test]
fn lost_points_are_named_and_tool_exit_status() {
    // A sweep with point 3 corrupted.
    let mut bytes = Vec::new();
    for i in 0..6u16 {
        let mut f = frame(&point(i, 6));
        if i == 3 {
            f[6] ^= 0x08;
            if f[6] == 0 {
                f[6] = 0x55;
            }
        }
        bytes.extend_from_slice(&f);
    }
    let dir = std::env::temp_dir().join(format!("feedline-capture-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let input = dir.join("in.bin");
    std::fs::write(&input, &bytes).unwrap();
    let prefix = dir.join("out");
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_capture"))
        .arg(&input)
        .arg(&prefix)
        .output()
        .unwrap();
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(1), "{stderr}");
    assert!(stderr.contains("1 corrupted frames"), "{stderr}");
    assert!(stderr.contains("missing points"), "{stderr}");
    let s1p = std::fs::read_to_string(dir.join("out-sweep0.s1p")).unwrap();
    assert!(s1p.contains("! points lost in transit: 3"), "{s1p}");
    assert_eq!(touchstone_points(&s1p).len(), 5);
    let csv = std::fs::read_to_string(dir.join("out-points.csv")).unwrap();
    assert_eq!(csv.lines().count(), 1 + 5);

    // A clean capture from stdin exits 0.
    let clean: Vec<u8> = (0..4u16).flat_map(|i| frame(&point(i, 4))).collect();
    let mut child = std::process::Command::new(env!("CARGO_BIN_EXE_capture"))
        .arg("-")
        .arg(dir.join("clean"))
        .stdin(std::process::Stdio::piped())
        .stderr(std::process::Stdio::piped())
        .spawn()
        .unwrap();
    use std::io::Write;
    child.stdin.take().unwrap().write_all(&clean).unwrap();
    let out = child.wait_with_output().unwrap();
    assert_eq!(out.status.code(), Some(0));
    std::fs::remove_dir_all(&dir).unwrap();
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig::with_cases(300))]
    /// Arbitrary records, each as a line or a frame, are all recovered from a clean capture.
    #[test]
    fn clean_captures_recover_everything(recs in proptest::collection::vec((common::record(), proptest::bool::ANY), 0..30)) {
        let mut bytes = Vec::new();
        for (r, as_line) in &recs {
            bytes.extend(if *as_line { line(r) } else { frame(r) });
        }
        let cap = capture::scan(&bytes);
        proptest::prop_assert!(cap.corrupted.is_empty(), "{}", capture::summary(&cap));
        // Identical neighbours in different formats merge; compare after the same merge.
        let mut want: Vec<(Record, bool)> = Vec::new();
        for (r, l) in &recs {
            if want.last().is_some_and(|(p, pl)| p == r && pl != l) { continue; }
            want.push((*r, *l));
        }
        let got: Vec<Record> = cap.items.iter().map(|i| i.record).collect();
        let want: Vec<Record> = want.into_iter().map(|(r, _)| r).collect();
        proptest::prop_assert_eq!(got, want);
    }
}
