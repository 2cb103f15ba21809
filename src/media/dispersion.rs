//! User-supplied dispersion formulas: 3-term Sellmeier and Cauchy.
//!
//! * Sellmeier (W. Sellmeier, Ann. Phys. Chem. 143, 271 (1871); the usual
//!   three-term form of optical catalogues):
//!   `n² = 1 + Σᵢ Bᵢ λ² / (λ² − Cᵢ)`, `λ` in µm, `Cᵢ` in µm².
//! * Cauchy (A.-L. Cauchy, 1836): `n = A + B/λ² + C/λ⁴`, `λ` in µm, `B` in µm²,
//!   `C` in µm⁴.
//!
//! Published coefficients are usually relative to air at wavelengths in air;
//! say so with [`Footing::StandardAir`] and flatray converts to absolute indices
//! at vacuum wavelengths (see the [footing](crate::media#footing) notes).
//! Each formula carries the wavelength range its coefficients were fitted over;
//! the range is checked on the vacuum wavelength and the default is unlimited.

use crate::error::{Error, Result};
use crate::math;
use crate::media::air::absolute_from_standard_air;
use crate::media::{wavelength_in, IndexSample};

/// What a dispersion formula's index and wavelength are relative to.
///
/// Crosses the C ABI as `int32_t` with these values.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[repr(i32)]
pub enum Footing {
    /// Absolute index at vacuum wavelengths.
    Vacuum = 0,
    /// Index relative to standard air at wavelengths in standard air (dry air,
    /// 15 °C, 101 325 Pa, 450 ppm CO₂), as in most glass catalogues.
    StandardAir = 1,
}

impl Footing {
    /// The numeric code used by the C ABI.
    pub const fn code(self) -> i32 {
        self as i32
    }

    /// The footing of a numeric code, or `None` for an unknown code.
    pub const fn from_code(code: i32) -> Option<Footing> {
        match code {
            0 => Some(Footing::Vacuum),
            1 => Some(Footing::StandardAir),
            _ => None,
        }
    }
}

/// Checks a wavelength range: both bounds not NaN, `0 <= min <= max`, `min`
/// finite (`max` may be `+inf`).
fn check_bounds(min_nm: f64, max_nm: f64) -> Result<()> {
    if min_nm.is_finite() && min_nm >= 0.0 && !max_nm.is_nan() && max_nm >= min_nm {
        Ok(())
    } else {
        Err(Error::InvalidArgument(
            "dispersion formula: wavelength range must satisfy 0 <= min <= max",
        ))
    }
}

/// Evaluates `f` (taking the wavelength on the formula's own footing) as an
/// absolute sample at vacuum wavelength `l`.
fn on_footing(
    footing: Footing,
    l: f64,
    f: impl Fn(f64) -> Result<(f64, f64)>,
) -> Result<IndexSample> {
    match footing {
        Footing::Vacuum => {
            let (n, dn) = f(l)?;
            IndexSample {
                wavelength_nm: l,
                index: n,
                dn_dwavelength_per_nm: dn,
            }
            .checked("the dispersion formula gives no finite positive index here")
        }
        Footing::StandardAir => absolute_from_standard_air(l, f),
    }
}

/// A three-term Sellmeier formula `n² = 1 + Σ Bᵢ λ²/(λ² − Cᵢ)` (λ in µm).
///
/// Unused terms have `Bᵢ = 0`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Sellmeier {
    /// `B₁, B₂, B₃`, dimensionless.
    pub b: [f64; 3],
    /// `C₁, C₂, C₃`, µm² (the squares of the resonance wavelengths).
    pub c_um2: [f64; 3],
    /// What the coefficients are relative to.
    pub footing: Footing,
    /// Shortest valid vacuum wavelength, nm.
    pub min_wavelength_nm: f64,
    /// Longest valid vacuum wavelength, nm (may be `f64::INFINITY`).
    pub max_wavelength_nm: f64,
}

impl Sellmeier {
    /// A Sellmeier formula valid at every wavelength where it gives a real index.
    pub const fn new(b: [f64; 3], c_um2: [f64; 3], footing: Footing) -> Sellmeier {
        Sellmeier {
            b,
            c_um2,
            footing,
            min_wavelength_nm: 0.0,
            max_wavelength_nm: f64::INFINITY,
        }
    }

    /// The same formula limited to vacuum wavelengths `min_nm..=max_nm`.
    pub const fn with_range_nm(self, min_nm: f64, max_nm: f64) -> Sellmeier {
        Sellmeier {
            min_wavelength_nm: min_nm,
            max_wavelength_nm: max_nm,
            ..self
        }
    }

    /// `(n, dn/dλ per nm)` at `wavelength_nm` on the formula's own footing,
    /// without range checks: `d(n²)/dλ = −Σ 2 Bᵢ Cᵢ λ / (λ² − Cᵢ)²`.
    pub(crate) fn raw(&self, wavelength_nm: f64) -> Result<(f64, f64)> {
        let l = wavelength_nm * 1e-3;
        let l2 = l * l;
        let mut n2 = 1.0;
        let mut dn2 = 0.0;
        for (&b, &c) in self.b.iter().zip(self.c_um2.iter()) {
            let q = l2 - c;
            n2 += b * l2 / q;
            dn2 -= 2.0 * b * c * l / (q * q);
        }
        if !(n2.is_finite() && n2 > 0.0 && dn2.is_finite()) {
            return Err(Error::OutOfRange(
                "Sellmeier formula gives no real index at this wavelength (at or near a resonance)",
            ));
        }
        let n = math::sqrt(n2);
        Ok((n, dn2 / (2.0 * n) * 1e-3))
    }

    /// Index and slope at a vacuum wavelength.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for non-finite coefficients, a malformed range
    /// or a non-finite wavelength; [`Error::OutOfRange`] for a wavelength ≤ 0 or
    /// outside the formula's range, where the formula gives no real positive
    /// index, or below 200 nm on the [`Footing::StandardAir`] footing.
    pub fn sample(&self, wavelength_nm: f64) -> Result<IndexSample> {
        if !self
            .b
            .iter()
            .chain(self.c_um2.iter())
            .all(|x| x.is_finite())
        {
            return Err(Error::InvalidArgument(
                "Sellmeier coefficients must be finite",
            ));
        }
        check_bounds(self.min_wavelength_nm, self.max_wavelength_nm)?;
        let l = wavelength_in(
            wavelength_nm,
            self.min_wavelength_nm,
            self.max_wavelength_nm,
            "wavelength_nm outside the Sellmeier formula's range",
        )?;
        on_footing(self.footing, l, |x| self.raw(x))
    }

    /// Absolute (phase) refractive index at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Sellmeier::sample`].
    pub fn refractive_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.index)
    }

    /// Group index `n − λ dn/dλ` at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Sellmeier::sample`].
    pub fn group_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.group_index())
    }
}

/// A Cauchy formula `n = A + B/λ² + C/λ⁴` (λ in µm).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Cauchy {
    /// `A`, dimensionless.
    pub a: f64,
    /// `B`, µm².
    pub b_um2: f64,
    /// `C`, µm⁴.
    pub c_um4: f64,
    /// What the coefficients are relative to.
    pub footing: Footing,
    /// Shortest valid vacuum wavelength, nm.
    pub min_wavelength_nm: f64,
    /// Longest valid vacuum wavelength, nm (may be `f64::INFINITY`).
    pub max_wavelength_nm: f64,
}

impl Cauchy {
    /// A Cauchy formula valid at every wavelength where it gives a positive index.
    pub const fn new(a: f64, b_um2: f64, c_um4: f64, footing: Footing) -> Cauchy {
        Cauchy {
            a,
            b_um2,
            c_um4,
            footing,
            min_wavelength_nm: 0.0,
            max_wavelength_nm: f64::INFINITY,
        }
    }

    /// The same formula limited to vacuum wavelengths `min_nm..=max_nm`.
    pub const fn with_range_nm(self, min_nm: f64, max_nm: f64) -> Cauchy {
        Cauchy {
            min_wavelength_nm: min_nm,
            max_wavelength_nm: max_nm,
            ..self
        }
    }

    /// `(n, dn/dλ per nm)` on the formula's own footing:
    /// `dn/dλ = −2B/λ³ − 4C/λ⁵`.
    fn raw(&self, wavelength_nm: f64) -> Result<(f64, f64)> {
        let l = wavelength_nm * 1e-3;
        let inv2 = 1.0 / (l * l);
        let n = self.a + inv2 * (self.b_um2 + inv2 * self.c_um4);
        let dn = -inv2 / l * (2.0 * self.b_um2 + 4.0 * self.c_um4 * inv2) * 1e-3;
        Ok((n, dn))
    }

    /// Index and slope at a vacuum wavelength.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for non-finite coefficients, a malformed range
    /// or a non-finite wavelength; [`Error::OutOfRange`] for a wavelength ≤ 0 or
    /// outside the formula's range, where it gives no finite positive index, or
    /// below 200 nm on the [`Footing::StandardAir`] footing.
    pub fn sample(&self, wavelength_nm: f64) -> Result<IndexSample> {
        if !(self.a.is_finite() && self.b_um2.is_finite() && self.c_um4.is_finite()) {
            return Err(Error::InvalidArgument("Cauchy coefficients must be finite"));
        }
        check_bounds(self.min_wavelength_nm, self.max_wavelength_nm)?;
        let l = wavelength_in(
            wavelength_nm,
            self.min_wavelength_nm,
            self.max_wavelength_nm,
            "wavelength_nm outside the Cauchy formula's range",
        )?;
        on_footing(self.footing, l, |x| self.raw(x))
    }

    /// Absolute (phase) refractive index at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Cauchy::sample`].
    pub fn refractive_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.index)
    }

    /// Group index `n − λ dn/dλ` at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Cauchy::sample`].
    pub fn group_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.group_index())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::media::air::standard_air_index;
    use crate::media::testutil::check_slope;

    // Malitson (1965) fused silica written as a user Sellmeier formula; the
    // resonance wavelengths squared: 0.0684043² = 0.004679148..., etc.
    fn silica(footing: Footing) -> Sellmeier {
        Sellmeier::new(
            [0.696_166_3, 0.407_942_6, 0.897_479_4],
            [
                0.068_404_3 * 0.068_404_3,
                0.116_241_4 * 0.116_241_4,
                9.896_161 * 9.896_161,
            ],
            footing,
        )
        .with_range_nm(210.0, 3710.0)
    }

    // Hand value: Malitson's formula at 587.5618 nm evaluated with mpmath from the
    // published coefficients, 1.458463687 (Malitson's table: 1.45846). Tolerance
    // 1e-9 (only double rounding is in play).
    #[test]
    fn sellmeier_vacuum_footing_is_the_formula() {
        let n = silica(Footing::Vacuum).refractive_index(587.5618).unwrap();
        assert!((n - 1.458_463_687).abs() < 1e-9, "{n}");
    }

    // Footing conversion: n_abs(λ_vac) = n_air(λ_vac) · n_rel(λ_vac / n_air).
    #[test]
    fn standard_air_footing_converts() {
        let l = 600.0;
        let n_air = standard_air_index(l).unwrap();
        let rel = silica(Footing::Vacuum).refractive_index(l / n_air).unwrap();
        let abs = silica(Footing::StandardAir).refractive_index(l).unwrap();
        assert!((abs - n_air * rel).abs() < 1e-15);
        let c = Cauchy::new(1.5, 0.004, 0.0, Footing::StandardAir);
        let abs = c.refractive_index(l).unwrap();
        let la = l / n_air * 1e-3;
        assert!((abs - n_air * (1.5 + 0.004 / (la * la))).abs() < 1e-15);
    }

    // Cauchy by hand: A = 1.5, B = 0.004 um², C = 1e-4 um⁴ at 0.5 um:
    // 1.5 + 0.004/0.25 + 1e-4/0.0625 = 1.5 + 0.016 + 0.0016 = 1.5176.
    #[test]
    fn cauchy_hand_value() {
        let c = Cauchy::new(1.5, 0.004, 1e-4, Footing::Vacuum);
        assert!((c.refractive_index(500.0).unwrap() - 1.5176).abs() < 1e-14);
    }

    #[test]
    fn slopes_match_finite_difference() {
        for f in [Footing::Vacuum, Footing::StandardAir] {
            for l in [250.0, 532.0, 1550.0] {
                check_slope(|x| silica(f).sample(x), l);
                check_slope(|x| Cauchy::new(1.5, 0.004, 1e-4, f).sample(x), l);
            }
        }
    }

    #[test]
    fn footing_codes_round_trip() {
        for f in [Footing::Vacuum, Footing::StandardAir] {
            assert_eq!(Footing::from_code(f.code()), Some(f));
        }
        assert_eq!(Footing::from_code(2), None);
        assert_eq!(Footing::from_code(-1), None);
    }

    #[test]
    fn rejects_bad_input() {
        let s = silica(Footing::StandardAir);
        assert!(matches!(
            s.refractive_index(f64::NAN),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            s.refractive_index(-600.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            s.refractive_index(200.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            s.refractive_index(4000.0),
            Err(Error::OutOfRange(_))
        ));
        let mut nan = s;
        nan.b[1] = f64::NAN;
        assert!(matches!(
            nan.refractive_index(600.0),
            Err(Error::InvalidArgument(_))
        ));
        let inverted = s.with_range_nm(800.0, 400.0);
        assert!(matches!(
            inverted.refractive_index(600.0),
            Err(Error::InvalidArgument(_))
        ));
        // At a resonance (λ² = C₁, λ = 100 nm) there is no index.
        let res = Sellmeier::new([1.0, 0.0, 0.0], [0.1 * 0.1, 0.0, 0.0], Footing::Vacuum);
        assert!(matches!(
            res.refractive_index(100.0),
            Err(Error::OutOfRange(_))
        ));
        // Just below it (95 nm) n² < 0.
        assert!(matches!(
            res.refractive_index(95.0),
            Err(Error::OutOfRange(_))
        ));
        // Standard-air footing is not converted below 200 nm.
        let low = Sellmeier::new([1.0, 0.0, 0.0], [0.01, 0.0, 0.0], Footing::StandardAir);
        assert!(matches!(
            low.refractive_index(190.0),
            Err(Error::OutOfRange(_))
        ));
        let neg = Cauchy::new(-1.0, 0.0, 0.0, Footing::Vacuum);
        assert!(matches!(
            neg.refractive_index(500.0),
            Err(Error::OutOfRange(_))
        ));
        let inf = Cauchy::new(1.5, f64::INFINITY, 0.0, Footing::Vacuum);
        assert!(matches!(
            inf.refractive_index(500.0),
            Err(Error::InvalidArgument(_))
        ));
    }
}
