//! Terminal pictures: VSWR against frequency as one text row per point, and the fault list
//! as a small table, streamed through [`core::fmt::Write`] with no storage of the sweep.
//!
//! Layout (feedline's own): a header row naming the scale, a ruler with `+` at the VSWR ticks
//! 1.5, 2, 3 and 5 that fit, then per point
//! `<frequency> <VSWR> |<bar>` where the bar is `=` up to the point's VSWR on a logarithmic
//! scale from 1 to the chart's top, a `:` column marks the threshold, `>` at the right end
//! means off-scale, and a note (such as `lowest`) may follow the bar.
//!
//! Panic policy: nothing here panics; write failures give [`core::fmt::Error`].

use crate::dtf::Fault;
use crate::fmt_decimal::write_fixed;
use crate::reflection::Vswr;
use crate::units::Hertz;
use core::fmt::{self, Write};

/// The widest bar, in columns.
pub const MAX_COLUMNS: usize = 100;

/// A VSWR-against-frequency bar chart for a terminal.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct VswrChart {
    columns: usize,
    top: f32,
    threshold: Option<f32>,
}

impl VswrChart {
    /// A chart `columns` wide (clamped to 8..=[`MAX_COLUMNS`]) whose right end is VSWR `top`
    /// (at least 1.1), with an optional threshold mark.
    pub fn new(columns: usize, top: Vswr, threshold: Option<Vswr>) -> Self {
        Self {
            columns: columns.clamp(8, MAX_COLUMNS),
            top: top.value().max(1.1),
            threshold: threshold.map(|t| t.value()),
        }
    }

    /// Column of VSWR `s` (0 for 1, `columns` for `top`), or `None` past the top.
    fn column(&self, s: f32) -> Option<usize> {
        let x = libm::logf(s.max(1.0)) / libm::logf(self.top);
        if x.is_nan() || x > 1.0 {
            return None;
        }
        let c = libm::roundf(x * self.columns as f32);
        Some((c.max(0.0) as usize).min(self.columns))
    }

    /// The header and ruler rows.
    pub fn header<W: Write>(&self, w: &mut W) -> fmt::Result {
        w.write_str("      MHz   VSWR  1")?;
        write_fixed(w, self.top, 1, self.columns)?;
        w.write_char('\n')?;
        w.write_str("                 ")?;
        let ticks = [1.5f32, 2.0, 3.0, 5.0];
        for c in 0..=self.columns {
            let tick = ticks
                .iter()
                .any(|&t| t < self.top && self.column(t) == Some(c));
            w.write_char(if c == 0 || tick { '+' } else { '-' })?;
        }
        w.write_char('\n')
    }

    /// One row: the point's frequency, VSWR and bar, then `note` if given.
    pub fn row<W: Write>(
        &self,
        w: &mut W,
        f: Hertz,
        vswr: Vswr,
        note: Option<&str>,
    ) -> fmt::Result {
        let s = vswr.value();
        write_fixed(w, f.value() * 1.0e-6, 3, 9)?;
        w.write_char(' ')?;
        write_fixed(w, s, 2, 6)?;
        w.write_str(" |")?;
        let fill = self.column(s);
        let mark = self.threshold.and_then(|t| self.column(t));
        for c in 1..=self.columns {
            let ch = match fill {
                Some(n) if c <= n => '=',
                None if c == self.columns => '>',
                None => '=',
                _ if mark == Some(c) => ':',
                _ => ' ',
            };
            w.write_char(ch)?;
        }
        match note {
            Some(n) => writeln!(w, " {n}"),
            None => w.write_char('\n'),
        }
    }
}

/// The fault list as a table: index, distance, return loss.
pub fn fault_table<W: Write>(w: &mut W, faults: &[Fault]) -> fmt::Result {
    writeln!(w, "  no.  distance m  return loss dB")?;
    if faults.is_empty() {
        return writeln!(w, "  (no reflection above the threshold)");
    }
    for (i, f) in faults.iter().enumerate() {
        write!(w, "  {:>3}  ", i.saturating_add(1))?;
        write_fixed(w, f.distance.value(), 2, 10)?;
        w.write_str("  ")?;
        write_fixed(w, f.return_loss.value(), 1, 14)?;
        w.write_char('\n')?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    use heapless::String;

    #[test]
    fn rows_have_the_designed_layout() {
        let c = VswrChart::new(10, Vswr::new(4.0).unwrap(), Some(Vswr::new(2.0).unwrap()));
        let mut s: String<512> = String::new();
        c.header(&mut s).unwrap();
        c.row(
            &mut s,
            Hertz::new(145.0e6),
            Vswr::new(1.0).unwrap(),
            Some("lowest"),
        )
        .unwrap();
        c.row(&mut s, Hertz::new(146.0e6), Vswr::new(4.0).unwrap(), None)
            .unwrap();
        c.row(&mut s, Hertz::new(147.0e6), Vswr::new(9.0).unwrap(), None)
            .unwrap();
        let lines: heapless::Vec<&str, 8> = s.lines().collect();
        // log(2)/log(4) = 0.5 → the threshold mark at column 5.
        assert_eq!(lines[2], "  145.000   1.00 |    :      lowest");
        assert_eq!(lines[3], "  146.000   4.00 |==========");
        assert_eq!(lines[4], "  147.000   9.00 |=========>");
        assert!(lines[1].starts_with("                 +"));
    }
}
