//! Fixed-point quantity types of the integer chain: each a newtype over an integer with its
//! Q format in the name.
//!
//! | type | holds | format | range kept |
//! |---|---|---|---|
//! | [`DbQ16`] | a level ratio in dB (return loss, mismatch loss, cable loss, directivity) | Q16.16 in `i32` | ±32768 dB |
//! | [`DbmQ16`] | an absolute power in dBm | Q16.16 in `i32` | ±32768 dBm |
//! | [`GammaQ31`] | \|Γ\| | Q1.31 in `u32`, 2^31 = 1.0 | `0..=2^31` |
//! | [`VswrQ16`] | VSWR | Q16.16 in `u32` | `1.0..=`[`VSWR_CEILING_Q16`] |
//!
//! Qm.n means n fraction bits: the stored integer is the value · 2^n. Arithmetic on these
//! types saturates. `to_f32` is for display and logging only; nothing in the measurement
//! chain calls it (the host test `fixed_no_float` checks the chain's machine code for
//! floating-point routines).
//!
//! Panic policy: nothing here panics.

use core::ops::{Add, Sub};

/// The largest return or mismatch loss reported, 100 dB in Q16.16 (the same ceiling as the
/// f32 path's `reflection::DB_CEILING`).
pub const DB_CEILING_Q16: i32 = 100 << 16;

/// The largest VSWR reported, 1000 in Q16.16 (the f32 path's `Vswr::CEILING`).
pub const VSWR_CEILING_Q16: u32 = 1000 << 16;

/// One in Q1.31 (|Γ| = 1, a total reflection).
pub const GAMMA_ONE_Q31: u32 = 1 << 31;

macro_rules! signed_q16 {
    ($(#[$doc:meta])* $name:ident, $unit:literal) => {
        $(#[$doc])*
        #[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Default)]
        #[cfg_attr(feature = "defmt", derive(defmt::Format))]
        pub struct $name(i32);

        impl $name {
            #[doc = concat!("Zero ", $unit, ".")]
            pub const ZERO: Self = Self(0);

            #[doc = concat!("A value from its raw Q16.16 bits (value in ", $unit, " · 65536).")]
            #[inline]
            pub const fn from_bits(bits: i32) -> Self {
                Self(bits)
            }

            #[doc = concat!("A whole number of ", $unit, ".")]
            #[inline]
            pub const fn from_int(value: i16) -> Self {
                Self((value as i32) << 16)
            }

            /// A value in hundredths (e.g. `from_centi(1_755)` is 17.55), rounded to the
            /// nearest Q16.16 step and saturated.
            #[inline]
            pub const fn from_centi(centi: i32) -> Self {
                // centi · 65536 / 100 = centi · 32768 / 50, rounded half away from zero, in
                // i64 (meant for constants, not the hot path).
                let n = centi as i64 * 32_768;
                let v = if n < 0 { (n - 25) / 50 } else { (n + 25) / 50 };
                let v = if v > i32::MAX as i64 {
                    i32::MAX
                } else if v < i32::MIN as i64 {
                    i32::MIN
                } else {
                    v as i32
                };
                Self(v)
            }

            /// The raw Q16.16 bits.
            #[inline]
            pub const fn to_bits(self) -> i32 {
                self.0
            }

            #[doc = concat!("The value in ", $unit, " as `f32`, for display only.")]
            #[inline]
            pub fn to_f32(self) -> f32 {
                self.0 as f32 / 65_536.0
            }

            /// Saturating half (rounds toward −∞).
            #[inline]
            pub const fn half(self) -> Self {
                Self(self.0 >> 1)
            }
        }
    };
}

signed_q16!(
    /// A level ratio in decibels, Q16.16 in an `i32` (resolution 1/65536 dB ≈ 1.5e-5 dB).
    DbQ16,
    "dB"
);
signed_q16!(
    /// An absolute power in dBm, Q16.16 in an `i32`.
    DbmQ16,
    "dBm"
);

impl Add for DbQ16 {
    type Output = DbQ16;
    /// Saturating sum.
    #[inline]
    fn add(self, rhs: DbQ16) -> DbQ16 {
        DbQ16(self.0.saturating_add(rhs.0))
    }
}

impl Sub for DbQ16 {
    type Output = DbQ16;
    /// Saturating difference.
    #[inline]
    fn sub(self, rhs: DbQ16) -> DbQ16 {
        DbQ16(self.0.saturating_sub(rhs.0))
    }
}

impl Sub for DbmQ16 {
    type Output = DbQ16;
    /// The level difference in dB, saturating.
    #[inline]
    fn sub(self, rhs: DbmQ16) -> DbQ16 {
        DbQ16(self.0.saturating_sub(rhs.0))
    }
}

impl Add<DbQ16> for DbmQ16 {
    type Output = DbmQ16;
    /// A power raised by a level ratio, saturating.
    #[inline]
    fn add(self, rhs: DbQ16) -> DbmQ16 {
        DbmQ16(self.0.saturating_add(rhs.0))
    }
}

impl Sub<DbQ16> for DbmQ16 {
    type Output = DbmQ16;
    /// A power lowered by a level ratio, saturating.
    #[inline]
    fn sub(self, rhs: DbQ16) -> DbmQ16 {
        DbmQ16(self.0.saturating_sub(rhs.0))
    }
}

/// |Γ| in Q1.31 in a `u32`: 2^31 is 1.0 (resolution 4.7e-10). Held in `0..=2^31`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct GammaQ31(u32);

impl GammaQ31 {
    /// A perfect match, |Γ| = 0.
    pub const MATCHED: GammaQ31 = GammaQ31(0);
    /// A total reflection, |Γ| = 1.
    pub const TOTAL: GammaQ31 = GammaQ31(GAMMA_ONE_Q31);

    /// |Γ| from raw Q1.31 bits, clamped to 1.0.
    #[inline]
    pub const fn from_bits(bits: u32) -> Self {
        if bits > GAMMA_ONE_Q31 {
            GammaQ31(GAMMA_ONE_Q31)
        } else {
            GammaQ31(bits)
        }
    }

    /// The raw Q1.31 bits, in `0..=2^31`.
    #[inline]
    pub const fn to_bits(self) -> u32 {
        self.0
    }

    /// |Γ| from raw bits the caller has proven to be `≤ 2^31` (no clamp).
    #[inline]
    pub(crate) const fn from_bits_within_one(bits: u32) -> Self {
        GammaQ31(bits)
    }

    /// |Γ| + `rhs`, clamped to 1.0.
    #[inline]
    pub const fn saturating_add(self, rhs: GammaQ31) -> Self {
        Self::from_bits(self.0.saturating_add(rhs.0))
    }

    /// |Γ| − `rhs`, clamped to 0.
    #[inline]
    pub const fn saturating_sub(self, rhs: GammaQ31) -> Self {
        GammaQ31(self.0.saturating_sub(rhs.0))
    }

    /// |Γ| as `f32`, for display only.
    #[inline]
    pub fn to_f32(self) -> f32 {
        self.0 as f32 / 2_147_483_648.0
    }
}

/// VSWR in Q16.16 in a `u32`. Held in `1.0..=1000.0` ([`VSWR_CEILING_Q16`]).
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct VswrQ16(u32);

impl VswrQ16 {
    /// VSWR from raw bits the caller has proven to be in `2^16..=`[`VSWR_CEILING_Q16`]
    /// (no clamp).
    #[inline]
    pub(crate) const fn from_bits_in_range(bits: u32) -> Self {
        VswrQ16(bits)
    }

    /// VSWR 1 (a perfect match).
    pub const ONE: VswrQ16 = VswrQ16(1 << 16);
    /// The ceiling, 1000 (a total reflection reads as this).
    pub const CEILING: VswrQ16 = VswrQ16(VSWR_CEILING_Q16);

    /// A VSWR from raw Q16.16 bits, clamped into `1.0..=1000.0`.
    #[inline]
    pub const fn from_bits(bits: u32) -> Self {
        if bits < 1 << 16 {
            Self::ONE
        } else if bits > VSWR_CEILING_Q16 {
            Self::CEILING
        } else {
            VswrQ16(bits)
        }
    }

    /// The raw Q16.16 bits.
    #[inline]
    pub const fn to_bits(self) -> u32 {
        self.0
    }

    /// The VSWR as `f32`, for display only.
    #[inline]
    pub fn to_f32(self) -> f32 {
        self.0 as f32 / 65_536.0
    }
}

impl Default for VswrQ16 {
    fn default() -> Self {
        Self::ONE
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn formats() {
        assert_eq!(DbQ16::from_int(20).to_bits(), 20 * 65_536);
        assert_eq!(DbQ16::from_centi(1_755).to_bits(), 1_150_157); // 17.55 · 65536 = 1150156.8
        assert_eq!(DbQ16::from_centi(-50).to_bits(), -32_768);
        assert_eq!(DbQ16::from_int(3).to_f32(), 3.0);
        assert_eq!(GammaQ31::from_bits(u32::MAX), GammaQ31::TOTAL);
        assert_eq!(GammaQ31::TOTAL.to_f32(), 1.0);
        assert_eq!(VswrQ16::from_bits(0), VswrQ16::ONE);
        assert_eq!(VswrQ16::from_bits(u32::MAX), VswrQ16::CEILING);
    }

    #[test]
    fn saturating_arithmetic() {
        let big = DbQ16::from_bits(i32::MAX);
        assert_eq!(big + DbQ16::from_int(1), big);
        assert_eq!(
            DbQ16::from_bits(i32::MIN) - DbQ16::from_int(1).half(),
            DbQ16::from_bits(i32::MIN)
        );
        let p = DbmQ16::from_int(10) - DbmQ16::from_int(-20);
        assert_eq!(p, DbQ16::from_int(30));
        assert_eq!(
            DbmQ16::from_int(10) - DbQ16::from_int(3),
            DbmQ16::from_int(7)
        );
        let g = GammaQ31::from_bits(3 << 29);
        assert_eq!(g.saturating_add(g), GammaQ31::TOTAL);
        assert_eq!(GammaQ31::MATCHED.saturating_sub(g), GammaQ31::MATCHED);
    }
}
