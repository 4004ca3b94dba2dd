//! The logic of the `capture` host tool: split a serial capture into line records and
//! binary frames, check their CRCs, and render CSV and Touchstone 1-port files.
//!
//! A capture is a byte stream in which the device may mix text lines and frames. A frame
//! always sits between two `0x00` bytes and a text line never holds one, so the stream is
//! cut at every `0x00`; each segment is tried as a frame first (COBS, length, CRC-32), and
//! a segment that is not a good frame but reads as text (ends in `\n` or at the end of the
//! capture, at least 90 % printable ASCII) is read as lines. Lines starting with the record
//! tag `fl.` (or holding it or ` crc=` anywhere, as when noise hit the line's start) are
//! parsed and CRC-checked; other lines (command replies, chatter) are counted and skipped.
//! Everything else is a corrupted frame, reported with its byte offset.
//!
//! Touchstone output follows the Touchstone File Format Specification version 1.1 (EIA/IBIS
//! Open Forum): an option line `# Hz S RI R 50`, then one `frequency Re(S11) Im(S11)` line
//! per point in increasing frequency, `!` comments.
//!
//! Calls the core; this is a tool, not part of the independent reference model.

use std::fmt::Write as _;

use feedline::report::frame::FrameDecoder;
use feedline::report::line::parse_line;
use feedline::report::{MonitorFlags, Record};

/// Where a record came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Source {
    /// A text line record.
    Line,
    /// A binary frame.
    Frame,
}

/// One good record and where it started in the capture.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Item {
    /// Byte offset of the line or of the frame's first byte after its leading delimiter.
    pub offset: usize,
    /// Line or frame.
    pub source: Source,
    /// The record.
    pub record: Record,
}

/// One corrupted frame or line.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Corruption {
    /// Byte offset where it started.
    pub offset: usize,
    /// Its length in bytes.
    pub len: usize,
    /// Line or frame.
    pub source: Source,
    /// Why it was rejected.
    pub reason: String,
}

/// Everything read from a capture.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Capture {
    /// Good records in capture order (a record sent both as a line and as a frame right
    /// after each other appears once).
    pub items: Vec<Item>,
    /// Rejected frames and lines in capture order.
    pub corrupted: Vec<Corruption>,
    /// Text lines that are not records (replies, chatter).
    pub other_lines: usize,
}

impl Capture {
    /// Corrupted frames.
    pub fn corrupted_frames(&self) -> impl Iterator<Item = &Corruption> {
        self.corrupted.iter().filter(|c| c.source == Source::Frame)
    }
    /// Corrupted lines.
    pub fn corrupted_lines(&self) -> impl Iterator<Item = &Corruption> {
        self.corrupted.iter().filter(|c| c.source == Source::Line)
    }
}

fn looks_like_text(seg: &[u8], at_end: bool) -> bool {
    let printable = seg
        .iter()
        .filter(|&&b| (0x20..=0x7E).contains(&b) || b == b'\n' || b == b'\r' || b == b'\t')
        .count();
    (seg.last() == Some(&b'\n') || at_end) && printable * 10 >= seg.len() * 9
}

impl Capture {
    fn push(&mut self, item: Item) {
        if let Some(last) = self.items.last() {
            if last.record == item.record && last.source != item.source {
                return; // the same record sent in both formats
            }
        }
        self.items.push(item);
    }

    fn text(&mut self, seg: &[u8], base: usize) {
        let mut start = 0usize;
        for piece in seg.split_inclusive(|&b| b == b'\n') {
            let offset = base + start;
            start += piece.len();
            let trimmed = piece.strip_suffix(b"\n").unwrap_or(piece);
            let trimmed = trimmed.strip_suffix(b"\r").unwrap_or(trimmed);
            if trimmed.is_empty() {
                continue;
            }
            let has = |pat: &[u8]| trimmed.windows(pat.len()).any(|w| w == pat);
            if !has(b"fl.") && !has(b" crc=") && trimmed.iter().all(|b| b.is_ascii()) {
                self.other_lines += 1;
                continue;
            }
            let parsed = std::str::from_utf8(trimmed)
                .map_err(|_| "not UTF-8".to_string())
                .and_then(|s| parse_line(s).map_err(|e| format!("{e:?}")));
            match parsed {
                Ok(record) => self.push(Item {
                    offset,
                    source: Source::Line,
                    record,
                }),
                Err(reason) => self.corrupted.push(Corruption {
                    offset,
                    len: piece.len(),
                    source: Source::Line,
                    reason,
                }),
            }
        }
    }

    fn segment(&mut self, seg: &[u8], base: usize, at_end: bool) {
        if seg.is_empty() {
            return;
        }
        let mut rx: FrameDecoder = FrameDecoder::new();
        let mut result = None;
        for &b in seg.iter().chain(std::iter::once(&0u8)) {
            if let Some(r) = rx.push(b) {
                result = Some(
                    r.map_err(|e| format!("{e:?}"))
                        .and_then(|f| Record::from_frame(&f).map_err(|e| format!("record {e:?}"))),
                );
            }
        }
        match result {
            Some(Ok(record)) if !at_end => self.push(Item {
                offset: base,
                source: Source::Frame,
                record,
            }),
            _ if looks_like_text(seg, at_end) => self.text(seg, base),
            Some(Ok(_)) => self.corrupted.push(Corruption {
                offset: base,
                len: seg.len(),
                source: Source::Frame,
                reason: "capture ended inside the frame".into(),
            }),
            other => self.corrupted.push(Corruption {
                offset: base,
                len: seg.len(),
                source: Source::Frame,
                reason: match other {
                    Some(Err(e)) => e,
                    _ => "no frame".into(),
                },
            }),
        }
    }
}

/// Reads a whole capture.
pub fn scan(bytes: &[u8]) -> Capture {
    let mut cap = Capture::default();
    let mut start = 0usize;
    for (i, &b) in bytes.iter().enumerate() {
        if b == 0 {
            cap.segment(&bytes[start..i], start, false);
            start = i + 1;
        }
    }
    cap.segment(&bytes[start..], start, true);
    cap
}

/// Monitor records as CSV, one row each, with a header naming units.
pub fn monitor_csv(cap: &Capture) -> String {
    let mut s = String::from(
        "seq,time_s,forward_W,reflected_W,delivered_W,vswr,return_loss_dB,alarm,trip,peak,over,under,source,offset\n",
    );
    for it in &cap.items {
        if let Record::Monitor(m) = it.record {
            let bit = |mask| u8::from(m.flags.contains(mask));
            let _ = writeln!(
                s,
                "{},{:.3},{:.3},{:.3},{:.3},{:.3},{:.2},{},{},{},{},{},{},{}",
                m.seq,
                f64::from(m.time_ms) / 1e3,
                f64::from(m.forward_mw) / 1e3,
                f64::from(m.reflected_mw) / 1e3,
                f64::from(m.delivered_mw) / 1e3,
                f64::from(m.vswr_milli) / 1e3,
                f64::from(m.return_loss_cdb) / 1e2,
                bit(MonitorFlags::ALARM),
                bit(MonitorFlags::TRIP),
                bit(MonitorFlags::PEAK),
                bit(MonitorFlags::OVER),
                bit(MonitorFlags::UNDER),
                match it.source {
                    Source::Line => "line",
                    Source::Frame => "frame",
                },
                it.offset
            );
        }
    }
    s
}

/// Sweep points as CSV.
pub fn points_csv(cap: &Capture) -> String {
    let mut s = String::from("sweep,index,count,freq_Hz,gamma_re,gamma_im\n");
    for it in &cap.items {
        if let Record::SweepPoint(p) = it.record {
            let _ = writeln!(
                s,
                "{},{},{},{},{:.6},{:.6}",
                p.sweep,
                p.index,
                p.count,
                p.freq_hz,
                f64::from(p.gamma_re_micro) / 1e6,
                f64::from(p.gamma_im_micro) / 1e6
            );
        }
    }
    s
}

/// A sweep found in the capture.
#[derive(Clone, Debug, PartialEq)]
pub struct Sweep {
    /// The sweep number.
    pub sweep: u16,
    /// Points the device announced.
    pub count: u16,
    /// (frequency Hz, Re Γ, Im Γ) by point index; `None` where the point was lost.
    pub points: Vec<Option<(u64, f64, f64)>>,
}

impl Sweep {
    /// True when every point arrived.
    pub fn complete(&self) -> bool {
        self.points.iter().all(Option::is_some)
    }

    /// The sweep as a Touchstone 1.1 one-port file (S11 in real/imaginary form, 50 Ω),
    /// points sorted by frequency, repeated frequencies dropped. Lost points are left out
    /// and named in a comment.
    pub fn touchstone(&self) -> String {
        let mut s = String::new();
        let _ = writeln!(s, "! feedline capture, sweep {}", self.sweep);
        let lost: Vec<String> = (0..self.points.len())
            .filter(|&i| self.points[i].is_none())
            .map(|i| i.to_string())
            .collect();
        if !lost.is_empty() {
            let _ = writeln!(s, "! points lost in transit: {}", lost.join(" "));
        }
        s.push_str("# Hz S RI R 50\n");
        let mut pts: Vec<(u64, f64, f64)> = self.points.iter().flatten().copied().collect();
        pts.sort_by_key(|p| p.0);
        pts.dedup_by_key(|p| p.0);
        for (f, re, im) in pts {
            let _ = writeln!(s, "{f} {re:.6} {im:.6}");
        }
        s
    }
}

/// The sweeps in the capture, in order of first appearance. A new sweep starts when the
/// sweep number or point count changes.
pub fn sweeps(cap: &Capture) -> Vec<Sweep> {
    let mut out: Vec<Sweep> = Vec::new();
    for it in &cap.items {
        if let Record::SweepPoint(p) = it.record {
            let same = out
                .last()
                .is_some_and(|s| s.sweep == p.sweep && usize::from(p.count) == s.points.len());
            if !same {
                out.push(Sweep {
                    sweep: p.sweep,
                    count: p.count,
                    points: vec![None; usize::from(p.count)],
                });
            }
            if let Some(s) = out.last_mut() {
                s.points[usize::from(p.index)] = Some((
                    p.freq_hz,
                    f64::from(p.gamma_re_micro) / 1e6,
                    f64::from(p.gamma_im_micro) / 1e6,
                ));
            }
        }
    }
    out
}

/// The stderr summary: counts, and every corrupted frame and line with its offset.
pub fn summary(cap: &Capture) -> String {
    let lines = cap
        .items
        .iter()
        .filter(|i| i.source == Source::Line)
        .count();
    let mut s = format!(
        "capture: {} records ({} from lines, {} from frames), {} other lines\n",
        cap.items.len(),
        lines,
        cap.items.len() - lines,
        cap.other_lines
    );
    let frames: Vec<&Corruption> = cap.corrupted_frames().collect();
    let bad_lines: Vec<&Corruption> = cap.corrupted_lines().collect();
    let _ = writeln!(s, "capture: {} corrupted frames", frames.len());
    for c in &frames {
        let _ = writeln!(
            s,
            "  frame at offset {} ({} bytes): {}",
            c.offset, c.len, c.reason
        );
    }
    let _ = writeln!(s, "capture: {} corrupted lines", bad_lines.len());
    for c in &bad_lines {
        let _ = writeln!(
            s,
            "  line at offset {} ({} bytes): {}",
            c.offset, c.len, c.reason
        );
    }
    s
}
