//! Diode detector through a calibration table: piecewise-linear interpolation between
//! (output volts, input dBm) points measured by the builder against a known source.
//!
//! The table must hold at least two points, at most `N`, with both columns strictly
//! increasing (a diode detector's output rises with input level). Readings outside the
//! table's span are refused rather than extrapolated.

use super::DetectorError;
use crate::units::{Dbm, Volts};
use heapless::Vec;

/// A diode detector calibration table of at most `N` points.
#[derive(Clone, Debug, PartialEq)]
pub struct DiodeTable<const N: usize> {
    points: Vec<(f32, f32), N>,
}

#[cfg(feature = "defmt")]
impl<const N: usize> defmt::Format for DiodeTable<N> {
    fn format(&self, f: defmt::Formatter) {
        defmt::write!(f, "DiodeTable({} points)", self.points.len())
    }
}

impl<const N: usize> DiodeTable<N> {
    /// A table from (output volts, input level) points in increasing order.
    pub fn new(points: &[(Volts, Dbm)]) -> Result<Self, DetectorError> {
        if points.len() < 2 {
            return Err(DetectorError::TableTooShort);
        }
        let mut v: Vec<(f32, f32), N> = Vec::new();
        for &(volts, level) in points {
            let (x, y) = (volts.value(), level.value());
            if !x.is_finite() || !y.is_finite() {
                return Err(DetectorError::NotFinite);
            }
            if let Some(&(px, py)) = v.last() {
                if x <= px || y <= py {
                    return Err(DetectorError::TableNotMonotonic);
                }
            }
            v.push((x, y)).map_err(|_| DetectorError::TableTooLong)?;
        }
        Ok(DiodeTable { points: v })
    }

    /// Number of points in the table.
    pub fn len(&self) -> usize {
        self.points.len()
    }

    /// Always false: a table holds at least two points.
    pub fn is_empty(&self) -> bool {
        self.points.is_empty()
    }

    /// The input level for a detector output voltage.
    pub fn level(&self, output: Volts) -> Result<Dbm, DetectorError> {
        let x = output.value();
        if !x.is_finite() {
            return Err(DetectorError::NotFinite);
        }
        for w in self.points.windows(2) {
            if let [(x0, y0), (x1, y1)] = *w {
                if x >= x0 && x <= x1 {
                    // x1 > x0 is guaranteed by construction.
                    let t = (x - x0) / (x1 - x0);
                    return Ok(Dbm::new(y0 + t * (y1 - y0)));
                }
            }
        }
        Err(DetectorError::OutOfTable)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn table() -> DiodeTable<8> {
        let pts = [
            (Volts::new(0.010), Dbm::new(-30.0)),
            (Volts::new(0.100), Dbm::new(-20.0)),
            (Volts::new(0.500), Dbm::new(-10.0)),
            (Volts::new(1.600), Dbm::new(0.0)),
        ];
        DiodeTable::new(&pts).unwrap()
    }

    /// (volts, expected dBm or None when outside the table); the expectations are the
    /// straight line between the table's points.
    const VECTORS: [(f32, Option<f32>); 5] = [
        (0.010, Some(-30.0)),
        (0.055, Some(-25.0)),
        (0.300, Some(-15.0)),
        (1.600, Some(0.0)),
        (2.000, None),
    ];
    const BOUND_DB: f32 = 1e-4;

    #[test]
    fn vectors() {
        let t = table();
        for &(v, want) in VECTORS.iter() {
            match (t.level(Volts::new(v)), want) {
                (Ok(p), Some(w)) => assert!((p.value() - w).abs() < BOUND_DB),
                (Err(DetectorError::OutOfTable), None) => {}
                other => panic!("{v}: {other:?}"),
            }
        }
    }

    #[test]
    fn refuses_bad_tables() {
        let short = [(Volts::new(0.1), Dbm::new(-20.0))];
        assert_eq!(
            DiodeTable::<4>::new(&short),
            Err(DetectorError::TableTooShort)
        );
        let bent = [
            (Volts::new(0.1), Dbm::new(-20.0)),
            (Volts::new(0.2), Dbm::new(-25.0)),
        ];
        assert_eq!(
            DiodeTable::<4>::new(&bent),
            Err(DetectorError::TableNotMonotonic)
        );
        let long = [
            (Volts::new(0.1), Dbm::new(-20.0)),
            (Volts::new(0.2), Dbm::new(-15.0)),
            (Volts::new(0.3), Dbm::new(-10.0)),
        ];
        assert_eq!(
            DiodeTable::<2>::new(&long),
            Err(DetectorError::TableTooLong)
        );
        let nan = [
            (Volts::new(0.1), Dbm::new(-20.0)),
            (Volts::new(f32::NAN), Dbm::new(-15.0)),
        ];
        assert_eq!(DiodeTable::<4>::new(&nan), Err(DetectorError::NotFinite));
    }
}
