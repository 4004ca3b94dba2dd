//! A 1-port Touchstone reader written from the Touchstone file format specification,
//! version 1.1 (IBIS Open Forum), apart from the core's writer.
//!
//! Rules applied (from the specification):
//! - `!` starts a comment that runs to the end of the line, anywhere on a line;
//! - the option line starts with `#` and holds, in any order and any letter case, a frequency
//!   unit (HZ, KHZ, MHZ, GHZ; default GHZ), a parameter (S, Y, Z, H, G; default S), a format
//!   (DB, MA, RI; default MA) and `R <n>` (default 50); only the first option line counts;
//! - a 1-port data line holds a frequency and two numbers; angles are in degrees;
//! - frequencies must be in increasing order.

use num_complex::Complex64;

/// One parsed data line, keeping the original number tokens.
#[derive(Clone, Debug)]
pub struct DataLine {
    /// Frequency in Hz.
    pub hertz: f64,
    /// S11.
    pub s11: Complex64,
    /// The three tokens as written.
    pub tokens: [String; 3],
}

/// A parsed 1-port file.
#[derive(Clone, Debug)]
pub struct OnePort {
    /// Comment texts (after the `!`).
    pub comments: Vec<String>,
    /// Option lines seen (only the first counts).
    pub option_lines: usize,
    /// Line number (from 1) of the first option line.
    pub option_line_at: Option<usize>,
    /// Frequency unit in Hz.
    pub unit_hz: f64,
    /// Parameter letter, upper case.
    pub parameter: String,
    /// Format, upper case.
    pub format: String,
    /// Reference resistance.
    pub r: f64,
    /// Data lines.
    pub data: Vec<DataLine>,
    /// Line number of the first data line.
    pub first_data_at: Option<usize>,
}

/// Parse a 1-port file. Errors name the line.
pub fn parse_one_port(text: &str) -> Result<OnePort, String> {
    let mut out = OnePort {
        comments: Vec::new(),
        option_lines: 0,
        option_line_at: None,
        unit_hz: 1e9,
        parameter: "S".into(),
        format: "MA".into(),
        r: 50.0,
        data: Vec::new(),
        first_data_at: None,
    };
    for (i, raw) in text.lines().enumerate() {
        let ln = i + 1;
        let (body, comment) = match raw.find('!') {
            Some(p) => (&raw[..p], Some(&raw[p + 1..])),
            None => (raw, None),
        };
        if let Some(c) = comment {
            out.comments.push(c.trim().to_string());
        }
        let body = body.trim();
        if body.is_empty() {
            continue;
        }
        if let Some(opts) = body.strip_prefix('#') {
            out.option_lines += 1;
            if out.option_lines > 1 {
                continue;
            }
            if !out.data.is_empty() {
                return Err(format!("line {ln}: option line after data"));
            }
            out.option_line_at = Some(ln);
            let toks: Vec<String> = opts.split_whitespace().map(|t| t.to_uppercase()).collect();
            let mut k = 0;
            while k < toks.len() {
                match toks[k].as_str() {
                    "HZ" => out.unit_hz = 1.0,
                    "KHZ" => out.unit_hz = 1e3,
                    "MHZ" => out.unit_hz = 1e6,
                    "GHZ" => out.unit_hz = 1e9,
                    "S" | "Y" | "Z" | "H" | "G" => out.parameter = toks[k].clone(),
                    "DB" | "MA" | "RI" => out.format = toks[k].clone(),
                    "R" => {
                        k += 1;
                        let v = toks.get(k).ok_or(format!("line {ln}: R without value"))?;
                        out.r = v.parse().map_err(|_| format!("line {ln}: bad R {v}"))?;
                    }
                    t => return Err(format!("line {ln}: unknown option {t}")),
                }
                k += 1;
            }
            continue;
        }
        let toks: Vec<&str> = body.split_whitespace().collect();
        if toks.len() != 3 {
            return Err(format!(
                "line {ln}: a 1-port data line has 3 numbers, got {}",
                toks.len()
            ));
        }
        let mut v = [0.0f64; 3];
        for (slot, t) in v.iter_mut().zip(toks.iter()) {
            *slot = t
                .parse()
                .map_err(|_| format!("line {ln}: bad number {t}"))?;
        }
        let hz = v[0] * out.unit_hz;
        if let Some(last) = out.data.last() {
            if hz <= last.hertz {
                return Err(format!("line {ln}: frequency not increasing"));
            }
        }
        let s11 = match out.format.as_str() {
            "RI" => Complex64::new(v[1], v[2]),
            "MA" => Complex64::from_polar(v[1], v[2].to_radians()),
            _ => Complex64::from_polar(10f64.powf(v[1] / 20.0), v[2].to_radians()),
        };
        out.first_data_at.get_or_insert(ln);
        out.data.push(DataLine {
            hertz: hz,
            s11,
            tokens: [toks[0].into(), toks[1].into(), toks[2].into()],
        });
    }
    Ok(out)
}
