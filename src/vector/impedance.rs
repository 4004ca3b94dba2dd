//! Impedance and admittance from complex Γ, and the quantities derived from them.
//!
//! Relations (textbook transmission-line and circuit theory, e.g. D. M. Pozar,
//! *Microwave Engineering*, ch. 2):
//!
//! | quantity | formula |
//! |---|---|
//! | impedance | Z = Z0·(1 + Γ)/(1 − Γ) = R + jX |
//! | admittance | Y = 1/Z = (1/Z0)·(1 − Γ)/(1 + Γ) = G + jB |
//! | parallel equivalent | Rp = 1/G, Xp = −1/B |
//! | series L or C at f | X > 0: L = X/ω; X < 0: C = −1/(ωX) |
//! | parallel L or C at f | B < 0: L = −1/(ωB); B > 0: C = B/ω |
//! | quality factor | Q = \|X\|/R |
//!
//! Γ near +1 (an open) makes Z unbounded and Γ near −1 (a short) makes Y unbounded: the
//! normalised ratio |Z|/Z0 (or |Y|·Z0) is capped at [`RATIO_CEILING`] with the direction
//! kept, and [`Impedance::is_capped`] / [`Admittance::is_capped`] say so. The division
//! n/d compares squared norms and uses one reciprocal when both are of ordinary size, and
//! otherwise goes through `hypotf` as n·conj(d/|d|)/|d|; neither can overflow inside the cap.
//!
//! Supported: any finite Γ within the raw limit, including |Γ| > 1 (negative R, as an
//! uncorrected reading near an open can give). Parallel equivalents that are infinite
//! (G = 0 or B = 0) are `None`. Q is `None` for R ≤ 0.
//!
//! Panic policy: nothing here panics; bad input gives a [`VectorError`].

use num_complex::Complex32;

use super::{check_raw_gamma, finite, VectorError, FREQUENCY_LIMIT_HZ, FREQUENCY_MIN_HZ};
use crate::units::{Farads, Henries, Hertz, Ohms, Siemens};

/// The cap on |Z|/Z0 and on |Y|·Z0 (10⁶: 50 MΩ or 20 µS·10⁶ at Z0 = 50 Ω).
pub const RATIO_CEILING: f32 = 1.0e6;

/// The cap on the quality factor Q.
pub const Q_CEILING: f32 = 1.0e6;

/// The smallest and largest reference impedance accepted, in ohms.
pub const Z0_RANGE: (f32, f32) = (1.0e-3, 1.0e6);

/// The range of |n|² and |d|² taken by the fast path of [`capped_ratio`]: well inside
/// normal `f32`, so that no product in it can overflow or lose all precision.
const FAST_NORM_RANGE: (f32, f32) = (1.0e-30, 1.0e30);

/// n/d with |n/d| capped at `ceiling`. Returns the quotient and whether it was capped.
///
/// Fast path (all inputs of ordinary size): compare squared norms, one reciprocal. Otherwise
/// (a squared norm outside [`FAST_NORM_RANGE`]) the same with `hypotf`.
fn capped_ratio(n: Complex32, d: Complex32, ceiling: f32) -> (Complex32, bool) {
    let nn2 = n.norm_sqr();
    let dn2 = d.norm_sqr();
    let (lo, hi) = FAST_NORM_RANGE;
    if nn2 <= hi && dn2 >= lo && dn2 <= hi && nn2 < ceiling * ceiling * dn2 {
        let inv = 1.0 / dn2;
        return (
            Complex32::new(
                (n.re * d.re + n.im * d.im) * inv,
                (n.im * d.re - n.re * d.im) * inv,
            ),
            false,
        );
    }
    capped_ratio_scaled(n, d, ceiling)
}

/// [`capped_ratio`] through `hypotf`, safe for any finite inputs.
fn capped_ratio_scaled(n: Complex32, d: Complex32, ceiling: f32) -> (Complex32, bool) {
    let nn = libm::hypotf(n.re, n.im);
    let dn = libm::hypotf(d.re, d.im);
    if nn >= ceiling * dn {
        // Unbounded or beyond the cap: keep the direction, cap the magnitude.
        let dir = if nn > 0.0 && dn > 0.0 {
            (n / nn) * (d / dn).conj()
        } else if nn > 0.0 {
            n / nn
        } else {
            Complex32::new(1.0, 0.0)
        };
        return (dir * ceiling, true);
    }
    // Here dn > 0 and |n|/|d| < ceiling.
    ((n * (d / dn).conj()) / dn, false)
}

fn check_z0(z0: Ohms) -> Result<f32, VectorError> {
    let z = finite(z0.value())?;
    if (Z0_RANGE.0..=Z0_RANGE.1).contains(&z) {
        Ok(z)
    } else {
        Err(VectorError::OutOfRange)
    }
}

fn check_frequency(f: Hertz) -> Result<f32, VectorError> {
    let v = finite(f.value())?;
    if (FREQUENCY_MIN_HZ..=FREQUENCY_LIMIT_HZ).contains(&v) {
        Ok(v)
    } else {
        Err(VectorError::OutOfRange)
    }
}

/// An equivalent reactive element at one frequency.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Reactive {
    /// Inductive: an inductance.
    Inductance(Henries),
    /// Capacitive: a capacitance.
    Capacitance(Farads),
    /// No reactive part worth naming: |X| (or |B|) below 10⁻⁶ of the reference.
    Resistive,
}

/// The parallel-equivalent circuit of an impedance: a resistance in parallel with a
/// reactance. `None` means the element is absent (infinite: an open in parallel).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ParallelEquivalent {
    /// Rp = 1/G, or `None` for G ≈ 0.
    pub resistance: Option<Ohms>,
    /// Xp = −1/B, or `None` for B ≈ 0.
    pub reactance: Option<Ohms>,
}

/// An impedance Z = R + jX with its reference impedance.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Impedance {
    /// Z/Z0, |·| ≤ [`RATIO_CEILING`].
    zn: Complex32,
    z0: f32,
    capped: bool,
}

/// An admittance Y = G + jB with its reference impedance.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Admittance {
    /// Y·Z0, |·| ≤ [`RATIO_CEILING`].
    yn: Complex32,
    z0: f32,
    capped: bool,
}

const ONE: Complex32 = Complex32::new(1.0, 0.0);

/// Smallest normalised part treated as non-zero (relative to the reference).
const PART_FLOOR: f32 = 1.0 / RATIO_CEILING;

impl Impedance {
    /// Z = Z0·(1 + Γ)/(1 − Γ). Γ near +1 gives a capped, flagged result.
    pub fn from_gamma(gamma: Complex32, z0: Ohms) -> Result<Self, VectorError> {
        let g = check_raw_gamma(gamma)?;
        let z0 = check_z0(z0)?;
        let (zn, capped) = capped_ratio(ONE + g, ONE - g, RATIO_CEILING);
        Ok(Self { zn, z0, capped })
    }

    /// An impedance from its resistance and reactance (|Z|/Z0 above the ceiling is capped).
    pub fn new(r: Ohms, x: Ohms, z0: Ohms) -> Result<Self, VectorError> {
        let r = finite(r.value())?;
        let x = finite(x.value())?;
        let z0 = check_z0(z0)?;
        let (zn, capped) =
            capped_ratio(Complex32::new(r, x), Complex32::new(z0, 0.0), RATIO_CEILING);
        Ok(Self { zn, z0, capped })
    }

    /// Γ = (Z − Z0)/(Z + Z0) for this impedance (|Γ| is capped like Z; for R ≥ 0 it is ≤ 1).
    pub fn gamma(&self) -> Complex32 {
        capped_ratio(self.zn - ONE, self.zn + ONE, RATIO_CEILING).0
    }

    /// True when |Z|/Z0 reached [`RATIO_CEILING`] (Γ at or near +1: an open).
    pub fn is_capped(&self) -> bool {
        self.capped
    }

    /// The reference impedance Z0.
    pub fn reference(&self) -> Ohms {
        Ohms::new(self.z0)
    }

    /// Z in ohms as a complex number.
    pub fn complex(&self) -> Complex32 {
        self.zn * self.z0
    }

    /// Z/Z0.
    pub fn normalized(&self) -> Complex32 {
        self.zn
    }

    /// The resistance R (series equivalent).
    pub fn resistance(&self) -> Ohms {
        Ohms::new(self.zn.re * self.z0)
    }

    /// The reactance X (series equivalent); positive is inductive.
    pub fn reactance(&self) -> Ohms {
        Ohms::new(self.zn.im * self.z0)
    }

    /// |Z|.
    pub fn magnitude(&self) -> Ohms {
        Ohms::new(libm::hypotf(self.zn.re, self.zn.im) * self.z0)
    }

    /// The angle of Z in degrees, in −180..=180 (0 for Z = 0).
    pub fn angle_deg(&self) -> f32 {
        libm::atan2f(self.zn.im, self.zn.re).to_degrees()
    }

    /// The admittance Y = 1/Z (|Y|·Z0 capped at [`RATIO_CEILING`], flagged near a short).
    pub fn admittance(&self) -> Admittance {
        let (yn, capped) = capped_ratio(ONE, self.zn, RATIO_CEILING);
        Admittance {
            yn,
            z0: self.z0,
            capped,
        }
    }

    /// The parallel-equivalent resistance and reactance.
    pub fn parallel(&self) -> ParallelEquivalent {
        self.admittance().parallel()
    }

    /// The series-equivalent element at frequency `f`: X > 0 → L = X/ω, X < 0 →
    /// C = −1/(ωX).
    pub fn series_element(&self, f: Hertz) -> Result<Reactive, VectorError> {
        let f = check_frequency(f)?;
        let omega = core::f32::consts::TAU * f;
        let xn = self.zn.im;
        if xn.abs() < PART_FLOOR {
            return Ok(Reactive::Resistive);
        }
        let x = xn * self.z0;
        if x > 0.0 {
            Ok(Reactive::Inductance(Henries::new(x / omega)))
        } else {
            Ok(Reactive::Capacitance(Farads::new(-1.0 / (omega * x))))
        }
    }

    /// The parallel-equivalent element at frequency `f` (see [`Admittance::element`]).
    pub fn parallel_element(&self, f: Hertz) -> Result<Reactive, VectorError> {
        self.admittance().element(f)
    }

    /// Q = |X|/R, capped at [`Q_CEILING`]; `None` for R ≤ 0 (lossless or active).
    pub fn q(&self) -> Option<f32> {
        let r = self.zn.re;
        let x = self.zn.im.abs();
        if r <= 0.0 {
            None
        } else if x >= Q_CEILING * r {
            Some(Q_CEILING)
        } else {
            Some(x / r)
        }
    }
}

impl Admittance {
    /// Y = (1/Z0)·(1 − Γ)/(1 + Γ). Γ near −1 gives a capped, flagged result.
    pub fn from_gamma(gamma: Complex32, z0: Ohms) -> Result<Self, VectorError> {
        let g = check_raw_gamma(gamma)?;
        let z0 = check_z0(z0)?;
        let (yn, capped) = capped_ratio(ONE - g, ONE + g, RATIO_CEILING);
        Ok(Self { yn, z0, capped })
    }

    /// True when |Y|·Z0 reached [`RATIO_CEILING`] (Γ at or near −1: a short).
    pub fn is_capped(&self) -> bool {
        self.capped
    }

    /// Y in siemens as a complex number.
    pub fn complex(&self) -> Complex32 {
        self.yn / self.z0
    }

    /// Y·Z0.
    pub fn normalized(&self) -> Complex32 {
        self.yn
    }

    /// The conductance G.
    pub fn conductance(&self) -> Siemens {
        Siemens::new(self.yn.re / self.z0)
    }

    /// The susceptance B; positive is capacitive.
    pub fn susceptance(&self) -> Siemens {
        Siemens::new(self.yn.im / self.z0)
    }

    /// |Y|.
    pub fn magnitude(&self) -> Siemens {
        Siemens::new(libm::hypotf(self.yn.re, self.yn.im) / self.z0)
    }

    /// The impedance Z = 1/Y (capped near an open).
    pub fn impedance(&self) -> Impedance {
        let (zn, capped) = capped_ratio(ONE, self.yn, RATIO_CEILING);
        Impedance {
            zn,
            z0: self.z0,
            capped,
        }
    }

    /// Rp = 1/G and Xp = −1/B; `None` where the part is below 10⁻⁶/Z0 (an open).
    pub fn parallel(&self) -> ParallelEquivalent {
        let g = self.yn.re;
        let b = self.yn.im;
        ParallelEquivalent {
            resistance: (g.abs() >= PART_FLOOR).then(|| Ohms::new(self.z0 / g)),
            reactance: (b.abs() >= PART_FLOOR).then(|| Ohms::new(-self.z0 / b)),
        }
    }

    /// The parallel-equivalent element at frequency `f`: B > 0 → C = B/ω,
    /// B < 0 → L = −1/(ωB).
    pub fn element(&self, f: Hertz) -> Result<Reactive, VectorError> {
        let f = check_frequency(f)?;
        let omega = core::f32::consts::TAU * f;
        let bn = self.yn.im;
        if bn.abs() < PART_FLOOR {
            return Ok(Reactive::Resistive);
        }
        let b = bn / self.z0;
        if b > 0.0 {
            Ok(Reactive::Capacitance(Farads::new(b / omega)))
        } else {
            Ok(Reactive::Inductance(Henries::new(-1.0 / (omega * b))))
        }
    }
}

#[cfg(feature = "defmt")]
impl defmt::Format for Impedance {
    fn format(&self, f: defmt::Formatter) {
        defmt::write!(
            f,
            "Impedance {{ z/z0: ({=f32}, {=f32}), z0: {=f32}, capped: {=bool} }}",
            self.zn.re,
            self.zn.im,
            self.z0,
            self.capped
        )
    }
}

#[cfg(feature = "defmt")]
impl defmt::Format for Admittance {
    fn format(&self, f: defmt::Formatter) {
        defmt::write!(
            f,
            "Admittance {{ y*z0: ({=f32}, {=f32}), z0: {=f32}, capped: {=bool} }}",
            self.yn.re,
            self.yn.im,
            self.z0,
            self.capped
        )
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (Γ re, Γ im, R, X) at Z0 = 50 Ω, by hand from Z = Z0(1+Γ)/(1−Γ).
    const VECTORS: [(f32, f32, f32, f32); 4] = [
        (0.0, 0.0, 50.0, 0.0),
        (1.0 / 3.0, 0.0, 100.0, 0.0),
        (-1.0 / 3.0, 0.0, 25.0, 0.0),
        // Γ = j: Z = 50(1+j)/(1−j) = 50j.
        (0.0, 1.0, 0.0, 50.0),
    ];
    /// Bound on |ΔR| and |ΔX| in ohms for the vectors above.
    const TOLERANCE_OHMS: f32 = 1.0e-4;

    #[test]
    fn vectors() {
        for &(gr, gi, r, x) in VECTORS.iter() {
            let z = Impedance::from_gamma(Complex32::new(gr, gi), Ohms::new(50.0)).unwrap();
            assert!((z.resistance().value() - r).abs() < TOLERANCE_OHMS, "{z:?}");
            assert!((z.reactance().value() - x).abs() < TOLERANCE_OHMS, "{z:?}");
            assert!(!z.is_capped());
            let back = z.gamma();
            assert!((back - Complex32::new(gr, gi)).norm() < 1e-6);
        }
    }

    #[test]
    fn open_and_short_are_capped() {
        let open = Impedance::from_gamma(Complex32::new(1.0, 0.0), Ohms::new(50.0)).unwrap();
        assert!(open.is_capped());
        assert!((open.magnitude().value() - 50.0 * RATIO_CEILING).abs() < 1.0);
        assert_eq!(
            open.parallel().resistance.map(|r| r.value() > 0.0),
            Some(true)
        );
        let short = Admittance::from_gamma(Complex32::new(-1.0, 0.0), Ohms::new(50.0)).unwrap();
        assert!(short.is_capped());
        let z = Impedance::from_gamma(Complex32::new(-1.0, 0.0), Ohms::new(50.0)).unwrap();
        assert_eq!(z.magnitude().value(), 0.0);
        assert_eq!(z.q(), None);
        assert!(z.admittance().is_capped());
    }

    #[test]
    fn elements() {
        // 50 + j50 Ω at 1 MHz: L = 50/(2π·1e6) = 7.957747 µH.
        let z = Impedance::new(Ohms::new(50.0), Ohms::new(50.0), Ohms::new(50.0)).unwrap();
        match z.series_element(Hertz::new(1.0e6)).unwrap() {
            Reactive::Inductance(l) => assert!((l.value() - 7.957_747e-6).abs() < 1e-11),
            other => panic!("{other:?}"),
        }
        // Parallel: Y = 1/(50+50j) = 0.01 − 0.01j S → Rp = 100, Xp = 100, Lp = 15.91549 µH.
        let p = z.parallel();
        assert!((p.resistance.unwrap().value() - 100.0).abs() < 1e-3);
        assert!((p.reactance.unwrap().value() - 100.0).abs() < 1e-3);
        match z.parallel_element(Hertz::new(1.0e6)).unwrap() {
            Reactive::Inductance(l) => assert!((l.value() - 1.591_549e-5).abs() < 1e-10),
            other => panic!("{other:?}"),
        }
        assert_eq!(z.q(), Some(1.0));
        // 50 − j100 Ω at 1 MHz: C = 1/(2π·1e6·100) = 1.591549 nF.
        let z = Impedance::new(Ohms::new(50.0), Ohms::new(-100.0), Ohms::new(50.0)).unwrap();
        match z.series_element(Hertz::new(1.0e6)).unwrap() {
            Reactive::Capacitance(c) => assert!((c.value() - 1.591_549e-9).abs() < 1e-14),
            other => panic!("{other:?}"),
        }
        assert_eq!(
            z.series_element(Hertz::new(0.0)),
            Err(VectorError::OutOfRange)
        );
    }
}
