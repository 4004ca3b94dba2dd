//! A small SVG renderer for captured sweeps: VSWR and return loss against frequency, a Smith
//! chart, and distance to fault. Plain SVG text, written here; no drawing library.
//!
//! The distance-to-fault panel runs the core's transform ([`feedline::dtf`]) on the capture,
//! exactly as the firmware would.

use crate::capture::Capture;
use feedline::dtf::{transform_in_place, DtfSetup, Fault, FaultSearch, LossCoefficients, Window};
use feedline::units::{Db, Hertz, Meters};
use num_complex::{Complex32, Complex64};
use std::fmt::Write;

const TRACE: &str = "#1f5fa8";
const ACCENT: &str = "#c0392b";
const GRID: &str = "#d9d9d9";
const INK: &str = "#222";

/// A rectangle on the canvas with data ranges for x and y.
struct Panel {
    x: f64,
    y: f64,
    w: f64,
    h: f64,
    xr: (f64, f64),
    yr: (f64, f64),
}

impl Panel {
    fn px(&self, v: f64) -> f64 {
        self.x + (v - self.xr.0) / (self.xr.1 - self.xr.0) * self.w
    }
    fn py(&self, v: f64) -> f64 {
        let v = v.clamp(self.yr.0, self.yr.1);
        self.y + self.h - (v - self.yr.0) / (self.yr.1 - self.yr.0) * self.h
    }
}

/// A tick step of 1, 2 or 5 × 10^k giving about `n` ticks over `span`.
fn nice_step(span: f64, n: f64) -> f64 {
    let raw = span / n;
    let p = 10f64.powf(raw.log10().floor());
    let m = raw / p;
    p * if m < 1.5 {
        1.0
    } else if m < 3.5 {
        2.0
    } else if m < 7.5 {
        5.0
    } else {
        10.0
    }
}

fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
}

/// Axes, grid, tick labels and titles of a panel.
fn axes(s: &mut String, p: &Panel, title: &str, xlabel: &str, ylabel: &str) {
    let _ = writeln!(
        s,
        r#"<rect x="{:.1}" y="{:.1}" width="{:.1}" height="{:.1}" fill="white" stroke="{INK}" stroke-width="1"/>"#,
        p.x, p.y, p.w, p.h
    );
    let xs = nice_step(p.xr.1 - p.xr.0, 6.0);
    let mut v = (p.xr.0 / xs).ceil() * xs;
    while v <= p.xr.1 + 1e-9 * xs {
        let x = p.px(v);
        let _ = writeln!(
            s,
            r#"<line x1="{x:.1}" y1="{:.1}" x2="{x:.1}" y2="{:.1}" stroke="{GRID}"/><text x="{x:.1}" y="{:.1}" font-size="11" text-anchor="middle" fill="{INK}">{}</text>"#,
            p.y,
            p.y + p.h,
            p.y + p.h + 14.0,
            trim(v)
        );
        v += xs;
    }
    let ys = nice_step(p.yr.1 - p.yr.0, 5.0);
    let mut v = (p.yr.0 / ys).ceil() * ys;
    while v <= p.yr.1 + 1e-9 * ys {
        let y = p.py(v);
        let _ = writeln!(
            s,
            r#"<line x1="{:.1}" y1="{y:.1}" x2="{:.1}" y2="{y:.1}" stroke="{GRID}"/><text x="{:.1}" y="{:.1}" font-size="11" text-anchor="end" fill="{INK}">{}</text>"#,
            p.x,
            p.x + p.w,
            p.x - 5.0,
            y + 4.0,
            trim(v)
        );
        v += ys;
    }
    let _ = writeln!(
        s,
        r#"<text x="{:.1}" y="{:.1}" font-size="14" font-weight="bold" fill="{INK}">{}</text>"#,
        p.x,
        p.y - 8.0,
        esc(title)
    );
    let _ = writeln!(
        s,
        r#"<text x="{:.1}" y="{:.1}" font-size="12" text-anchor="middle" fill="{INK}">{}</text>"#,
        p.x + p.w / 2.0,
        p.y + p.h + 32.0,
        esc(xlabel)
    );
    let _ = writeln!(
        s,
        r#"<text transform="translate({:.1},{:.1}) rotate(-90)" font-size="12" text-anchor="middle" fill="{INK}">{}</text>"#,
        p.x - 38.0,
        p.y + p.h / 2.0,
        esc(ylabel)
    );
}

fn trim(v: f64) -> String {
    let s = format!("{v:.3}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".into()
    } else {
        s.into()
    }
}

fn polyline(s: &mut String, p: &Panel, pts: impl Iterator<Item = (f64, f64)>, color: &str) {
    let mut d = String::new();
    for (x, y) in pts {
        let _ = write!(d, "{:.1},{:.1} ", p.px(x), p.py(y));
    }
    let _ = writeln!(
        s,
        r#"<polyline points="{}" fill="none" stroke="{color}" stroke-width="1.6"/>"#,
        d.trim_end()
    );
}

fn vswr_of(g: Complex64) -> f64 {
    let m = g.norm().min(0.999_999);
    (1.0 + m) / (1.0 - m)
}

fn rl_of(g: Complex64) -> f64 {
    (-20.0 * g.norm().max(1e-6).log10()).min(60.0)
}

fn mhz(c: &Capture) -> (f64, f64) {
    let a = c.points.first().map_or(0.0, |p| p.0) * 1e-6;
    let b = c.points.last().map_or(1.0, |p| p.0) * 1e-6;
    (a, if b > a { b } else { a + 1.0 })
}

/// VSWR against frequency, with a threshold line.
fn vswr_panel(s: &mut String, c: &Capture, x: f64, y: f64, threshold: f64) {
    let top = c
        .points
        .iter()
        .map(|p| vswr_of(p.1))
        .fold(1.5f64, f64::max)
        .min(6.0);
    let p = Panel {
        x,
        y,
        w: 380.0,
        h: 240.0,
        xr: mhz(c),
        yr: (1.0, top.ceil()),
    };
    axes(s, &p, "VSWR", "frequency, MHz", "VSWR");
    let ty = p.py(threshold);
    let _ = writeln!(
        s,
        r#"<line x1="{:.1}" y1="{ty:.1}" x2="{:.1}" y2="{ty:.1}" stroke="{ACCENT}" stroke-dasharray="5,4"/><text x="{:.1}" y="{:.1}" font-size="11" text-anchor="end" fill="{ACCENT}">limit {threshold}</text>"#,
        p.x,
        p.x + p.w,
        p.x + p.w - 4.0,
        ty - 4.0
    );
    polyline(
        s,
        &p,
        c.points.iter().map(|(f, g)| (f * 1e-6, vswr_of(*g))),
        TRACE,
    );
}

/// Return loss against frequency.
fn rl_panel(s: &mut String, c: &Capture, x: f64, y: f64) {
    let top = c.points.iter().map(|p| rl_of(p.1)).fold(10.0f64, f64::max);
    let p = Panel {
        x,
        y,
        w: 380.0,
        h: 240.0,
        xr: mhz(c),
        yr: (0.0, (top / 10.0).ceil() * 10.0),
    };
    axes(s, &p, "Return loss", "frequency, MHz", "return loss, dB");
    polyline(
        s,
        &p,
        c.points.iter().map(|(f, g)| (f * 1e-6, rl_of(*g))),
        TRACE,
    );
}

/// A Smith chart (normalised impedance grid) with the Γ trace.
fn smith_panel(s: &mut String, c: &Capture, cx: f64, cy: f64, r: f64, id: &str) {
    let _ = writeln!(
        s,
        r#"<text x="{:.1}" y="{:.1}" font-size="14" font-weight="bold" fill="{INK}">Smith chart (Z0 = {} Ω)</text>"#,
        cx - r,
        cy - r - 12.0,
        c.z0
    );
    let _ = writeln!(
        s,
        r#"<defs><clipPath id="{id}"><circle cx="{cx:.1}" cy="{cy:.1}" r="{r:.1}"/></clipPath></defs>"#
    );
    let _ = writeln!(s, r#"<g clip-path="url(#{id})">"#);
    let _ = writeln!(
        s,
        r#"<circle cx="{cx:.1}" cy="{cy:.1}" r="{r:.1}" fill="white"/>"#
    );
    for rn in [0.2, 0.5, 1.0, 2.0, 5.0] {
        let (c0, rr) = (rn / (1.0 + rn), 1.0 / (1.0 + rn));
        let _ = writeln!(
            s,
            r#"<circle cx="{:.1}" cy="{cy:.1}" r="{:.1}" fill="none" stroke="{GRID}"/>"#,
            cx + c0 * r,
            rr * r
        );
    }
    for xn in [0.2f64, 0.5, 1.0, 2.0, 5.0] {
        for sign in [1.0, -1.0] {
            let _ = writeln!(
                s,
                r#"<circle cx="{:.1}" cy="{:.1}" r="{:.1}" fill="none" stroke="{GRID}"/>"#,
                cx + r,
                cy - sign * r / xn,
                r / xn
            );
        }
    }
    let _ = writeln!(
        s,
        r#"<line x1="{:.1}" y1="{cy:.1}" x2="{:.1}" y2="{cy:.1}" stroke="{GRID}"/>"#,
        cx - r,
        cx + r
    );
    let mut d = String::new();
    for (_, g) in &c.points {
        let _ = write!(d, "{:.1},{:.1} ", cx + g.re * r, cy - g.im * r);
    }
    let _ = writeln!(
        s,
        r#"<polyline points="{}" fill="none" stroke="{TRACE}" stroke-width="1.2"/>"#,
        d.trim_end()
    );
    let _ = writeln!(s, "</g>");
    let _ = writeln!(
        s,
        r#"<circle cx="{cx:.1}" cy="{cy:.1}" r="{r:.1}" fill="none" stroke="{INK}"/>"#
    );
    if let (Some(a), Some(b)) = (c.points.first(), c.points.last()) {
        for (g, label) in [(a.1, "start"), (b.1, "stop")] {
            let (x, y) = (cx + g.re * r, cy - g.im * r);
            let _ = writeln!(
                s,
                r#"<circle cx="{x:.1}" cy="{y:.1}" r="3" fill="{ACCENT}"/><text x="{:.1}" y="{:.1}" font-size="10" fill="{ACCENT}">{label}</text>"#,
                x + 5.0,
                y - 4.0
            );
        }
    }
}

/// The distance-to-fault response of a capture through the core (Kaiser β = 6, 1024 bins,
/// faults stronger than 35 dB searched to `range` metres): (distance, return loss) per bin,
/// the faults, and the resolution.
pub fn dtf_of(c: &Capture, range: f64) -> (Vec<(f64, f64)>, Vec<Fault>, f64) {
    let n = c.points.len().clamp(2, 1024);
    let mut buf = vec![Complex32::new(0.0, 0.0); 1024];
    for (slot, (_, g)) in buf.iter_mut().zip(c.points.iter()) {
        *slot = Complex32::new(g.re as f32, g.im as f32);
    }
    let (a, b) = (
        c.points.first().map_or(0.0, |p| p.0),
        c.points.last().map_or(1.0, |p| p.0),
    );
    let setup = DtfSetup {
        start: Hertz::new(a as f32),
        stop: Hertz::new(b as f32),
        window: Window::Kaiser { beta: 6.0 },
        velocity_factor: c.vf as f32,
        loss: LossCoefficients::new(c.loss.0 as f32, c.loss.1 as f32)
            .unwrap_or(LossCoefficients::new(0.0, 0.0).expect("zero loss is valid")),
    };
    match transform_in_place(&mut buf, n, &setup) {
        Ok(r) => {
            let res = r.resolution().value() as f64;
            let faults = r.faults::<8>(&FaultSearch {
                threshold: Db::new(35.0),
                min_separation: Meters::new((4.0 * res) as f32),
                max_distance: Meters::new(range as f32),
            });
            let trace = r
                .iter()
                .map(|(d, rl)| (d.value() as f64, rl.value() as f64))
                .collect();
            (trace, faults.to_vec(), res)
        }
        Err(_) => (Vec::new(), Vec::new(), 0.0),
    }
}

/// Distance to fault: reflection level (−return loss) against distance, faults labelled.
fn dtf_panel(s: &mut String, c: &Capture, x: f64, y: f64, range: f64) {
    let (trace, faults, res) = dtf_of(c, range);
    let p = Panel {
        x,
        y,
        w: 380.0,
        h: 240.0,
        xr: (0.0, range),
        yr: (-60.0, 0.0),
    };
    axes(
        s,
        &p,
        &format!("Distance to fault (resolution {res:.2} m)"),
        "distance, m",
        "reflection, dB",
    );
    polyline(
        s,
        &p,
        trace
            .iter()
            .filter(|(d, _)| *d <= range)
            .map(|(d, rl)| (*d, -rl)),
        TRACE,
    );
    for f in faults
        .iter()
        .filter(|f| (f.distance.value() as f64) <= range)
    {
        let (d, rl) = (f.distance.value() as f64, f.return_loss.value() as f64);
        let (px, py) = (p.px(d), p.py(-rl));
        let _ = writeln!(
            s,
            r#"<circle cx="{px:.1}" cy="{py:.1}" r="3.5" fill="none" stroke="{ACCENT}" stroke-width="1.5"/><text x="{:.1}" y="{:.1}" font-size="10" fill="{ACCENT}">{d:.2} m, {rl:.1} dB</text>"#,
            px + 6.0,
            (py - 6.0).max(p.y + 10.0)
        );
    }
}

fn document(w: f64, h: f64, body: &str, title: &str) -> String {
    format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" viewBox=\"0 0 {w} {h}\" font-family=\"sans-serif\">\n<title>{}</title>\n<rect width=\"100%\" height=\"100%\" fill=\"#fafafa\"/>\n{body}</svg>\n",
        esc(title)
    )
}

/// VSWR against frequency alone.
pub fn vswr_svg(c: &Capture, threshold: f64) -> String {
    let mut s = String::new();
    vswr_panel(&mut s, c, 60.0, 40.0, threshold);
    document(470.0, 330.0, &s, &c.title)
}

/// Return loss against frequency alone.
pub fn return_loss_svg(c: &Capture) -> String {
    let mut s = String::new();
    rl_panel(&mut s, c, 60.0, 40.0);
    document(470.0, 330.0, &s, &c.title)
}

/// The Smith chart alone.
pub fn smith_svg(c: &Capture) -> String {
    let mut s = String::new();
    smith_panel(&mut s, c, 180.0, 190.0, 150.0, "smith-clip");
    document(360.0, 360.0, &s, &c.title)
}

/// Distance to fault alone, up to `range` metres.
pub fn dtf_svg(c: &Capture, range: f64) -> String {
    let mut s = String::new();
    dtf_panel(&mut s, c, 60.0, 40.0, range);
    document(470.0, 330.0, &s, &c.title)
}

/// All four in one picture (the README example).
pub fn overview_svg(c: &Capture, threshold: f64, range: f64) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        r#"<text x="20" y="24" font-size="15" fill="{INK}">{}</text>"#,
        esc(&c.title)
    );
    vswr_panel(&mut s, c, 70.0, 60.0, threshold);
    rl_panel(&mut s, c, 530.0, 60.0);
    smith_panel(&mut s, c, 260.0, 530.0, 150.0, "smith-clip-overview");
    dtf_panel(&mut s, c, 530.0, 400.0, range);
    document(940.0, 720.0, &s, &c.title)
}
