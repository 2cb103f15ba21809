//! Window materials: published dispersion formulas of common port and wall
//! materials.
//!
//! | material | formula (λ in µm) | source | range |
//! | --- | --- | --- | --- |
//! | fused silica | `n² − 1 = 0.6961663λ²/(λ² − 0.0684043²) + 0.4079426λ²/(λ² − 0.1162414²) + 0.8974794λ²/(λ² − 9.896161²)` | I. H. Malitson, "Interspecimen comparison of the refractive index of fused silica", J. Opt. Soc. Am. 55, 1205 (1965), at 20 °C | 210–3710 nm |
//! | sapphire, ordinary ray | `n_o² − 1 = 1.4313493λ²/(λ² − 0.0726631²) + 0.65054713λ²/(λ² − 0.1193242²) + 5.3414021λ²/(λ² − 18.028251²)` | I. H. Malitson and M. J. Dodge (1972), as printed by M. J. Dodge, "Refractive index", *CRC Handbook of Laser Science and Technology* Vol. IV, Optical Materials Part 2 (1986), p. 30; 20 °C | 200–5000 nm |
//! | soda-lime window glass | `n = 1.5130 − 0.003169λ² + 0.003962/λ²` | M. Rubin, "Optical properties of soda lime silica glasses", Sol. Energy Mater. 12, 275 (1985) | 320–4600 nm |
//! | PMMA (acrylic) | `n² − 1 = 1.181868λ²/(λ² − 0.01131328)` | one-term Sellmeier fitted by this project (`tests/data/fit_polymer_dispersion.py`) to the measured indices of N. Sultanova, S. Kasarova and I. Nikolov, Acta Phys. Pol. A 116, 585 (2009) | 400–1060 nm |
//! | polycarbonate | `n² − 1 = 1.418199λ²/(λ² − 0.02130420)` | as PMMA | 400–1060 nm |
//!
//! **Footing.** All five sources give indices relative to (room) air at
//! wavelengths in air, the convention of refractometry and catalogues. flatray
//! treats them as relative to standard air and converts to absolute indices at
//! vacuum wavelengths (see the [footing](crate::media#footing) notes);
//! [`Material::relative_to_air_index`] returns the source's own value. Ranges
//! are checked on the vacuum wavelength.
//!
//! The polymer fits reproduce the eight measured values (436.8–1052 nm) to
//! within 0.0005 (PMMA) and 0.0011 (polycarbonate), against a stated measurement
//! accuracy of ±0.001 on values printed to three decimals; the paper presents
//! its dispersion curves over 400–1060 nm, so 400–436.8 nm is a short
//! extrapolation.

use crate::error::{Error, Result};
use crate::media::air::absolute_from_standard_air;
use crate::media::dispersion::{Footing, Sellmeier};
use crate::media::{wavelength_in, IndexSample, C_LINE_AIR_NM, D_LINE_AIR_NM, F_LINE_AIR_NM};

/// A window or wall material with a built-in dispersion formula.
///
/// Crosses the C ABI as `int32_t` with these values, which are never
/// renumbered.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[repr(i32)]
pub enum Material {
    /// Fused silica (amorphous SiO₂), Malitson (1965).
    FusedSilica = 0,
    /// Sapphire (α-Al₂O₃), ordinary ray, Malitson and Dodge (1972). A flat port
    /// cut with the optic axis along its normal shows this index at normal
    /// incidence.
    SapphireOrdinary = 1,
    /// Poly(methyl methacrylate), acrylic, fitted to Sultanova et al. (2009).
    Pmma = 2,
    /// Polycarbonate, fitted to Sultanova et al. (2009).
    Polycarbonate = 3,
    /// Soda-lime-silica window glass, Rubin (1985).
    SodaLimeGlass = 4,
}

const FUSED_SILICA: Sellmeier = Sellmeier::new(
    [0.696_166_3, 0.407_942_6, 0.897_479_4],
    [
        0.068_404_3 * 0.068_404_3,
        0.116_241_4 * 0.116_241_4,
        9.896_161 * 9.896_161,
    ],
    Footing::StandardAir,
);

const SAPPHIRE_ORDINARY: Sellmeier = Sellmeier::new(
    [1.431_349_3, 0.650_547_13, 5.341_402_1],
    [
        0.072_663_1 * 0.072_663_1,
        0.119_324_2 * 0.119_324_2,
        18.028_251 * 18.028_251,
    ],
    Footing::StandardAir,
);

// Fitted by tests/data/fit_polymer_dispersion.py (see the module docs).
const PMMA: Sellmeier = Sellmeier::new(
    [1.181_868, 0.0, 0.0],
    [0.011_313_28, 0.0, 0.0],
    Footing::StandardAir,
);
const POLYCARBONATE: Sellmeier = Sellmeier::new(
    [1.418_199, 0.0, 0.0],
    [0.021_304_20, 0.0, 0.0],
    Footing::StandardAir,
);

/// Rubin (1985): `(n, dn/dλ per nm)` at `air_wavelength_nm`, relative to air.
fn rubin(air_wavelength_nm: f64) -> (f64, f64) {
    let l = air_wavelength_nm * 1e-3;
    let l2 = l * l;
    let n = 1.5130 - 0.003_169 * l2 + 0.003_962 / l2;
    let dn = (-2.0 * 0.003_169 * l - 2.0 * 0.003_962 / (l2 * l)) * 1e-3;
    (n, dn)
}

impl Material {
    /// Every material, in code order.
    pub const ALL: [Material; 5] = [
        Material::FusedSilica,
        Material::SapphireOrdinary,
        Material::Pmma,
        Material::Polycarbonate,
        Material::SodaLimeGlass,
    ];

    /// The numeric code used by the C ABI.
    pub const fn code(self) -> i32 {
        self as i32
    }

    /// The material of a numeric code, or `None` for an unknown code.
    pub const fn from_code(code: i32) -> Option<Material> {
        match code {
            0 => Some(Material::FusedSilica),
            1 => Some(Material::SapphireOrdinary),
            2 => Some(Material::Pmma),
            3 => Some(Material::Polycarbonate),
            4 => Some(Material::SodaLimeGlass),
            _ => None,
        }
    }

    /// A short English name.
    pub const fn name(self) -> &'static str {
        match self {
            Material::FusedSilica => "fused silica",
            Material::SapphireOrdinary => "sapphire (ordinary ray)",
            Material::Pmma => "PMMA (acrylic)",
            Material::Polycarbonate => "polycarbonate",
            Material::SodaLimeGlass => "soda-lime window glass",
        }
    }

    /// The published source of the dispersion formula.
    pub const fn source(self) -> &'static str {
        match self {
            Material::FusedSilica => "Malitson, J. Opt. Soc. Am. 55, 1205 (1965)",
            Material::SapphireOrdinary => {
                "Malitson and Dodge (1972), Sellmeier formula as printed in the CRC Handbook of Laser Science and Technology Vol. IV (1986)"
            }
            Material::Pmma | Material::Polycarbonate => {
                "one-term Sellmeier fitted to the measurements of Sultanova, Kasarova and Nikolov, Acta Phys. Pol. A 116, 585 (2009)"
            }
            Material::SodaLimeGlass => "Rubin, Sol. Energy Mater. 12, 275 (1985)",
        }
    }

    /// Valid vacuum wavelengths `(min, max)`, nm.
    pub const fn wavelength_range_nm(self) -> (f64, f64) {
        match self {
            Material::FusedSilica => (210.0, 3710.0),
            Material::SapphireOrdinary => (200.0, 5000.0),
            Material::Pmma | Material::Polycarbonate => (400.0, 1060.0),
            Material::SodaLimeGlass => (320.0, 4600.0),
        }
    }

    /// Checks a wavelength against [`Material::wavelength_range_nm`].
    fn check(self, wavelength_nm: f64) -> Result<f64> {
        let (lo, hi) = self.wavelength_range_nm();
        wavelength_in(
            wavelength_nm,
            lo,
            hi,
            "material: wavelength_nm outside the dispersion formula's range",
        )
    }

    /// The source formula on its own footing: `(n, dn/dλ)` relative to air at
    /// an air wavelength in nm.
    fn relative(self, air_wavelength_nm: f64) -> Result<(f64, f64)> {
        match self {
            Material::FusedSilica => FUSED_SILICA.raw(air_wavelength_nm),
            Material::SapphireOrdinary => SAPPHIRE_ORDINARY.raw(air_wavelength_nm),
            Material::Pmma => PMMA.raw(air_wavelength_nm),
            Material::Polycarbonate => POLYCARBONATE.raw(air_wavelength_nm),
            Material::SodaLimeGlass => Ok(rubin(air_wavelength_nm)),
        }
    }

    /// The index exactly as the source gives it: relative to air, at a
    /// wavelength in air (nm). Useful to compare with catalogue values.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for a non-finite wavelength;
    /// [`Error::OutOfRange`] outside [`Material::wavelength_range_nm`].
    pub fn relative_to_air_index(self, air_wavelength_nm: f64) -> Result<f64> {
        let l = self.check(air_wavelength_nm)?;
        self.relative(l).map(|(n, _)| n)
    }

    /// Abbe number `V_d = (n_d − 1)/(n_F − n_C)` on the source's own footing
    /// (relative to air at the d, F and C lines in air), the catalogue
    /// convention.
    ///
    /// # Errors
    /// None in practice (the three lines lie inside every material's range);
    /// the `Result` keeps the function panic-free.
    pub fn abbe_number(self) -> Result<f64> {
        let nd = self.relative_to_air_index(D_LINE_AIR_NM)?;
        let nf = self.relative_to_air_index(F_LINE_AIR_NM)?;
        let nc = self.relative_to_air_index(C_LINE_AIR_NM)?;
        let v = (nd - 1.0) / (nf - nc);
        if v.is_finite() {
            Ok(v)
        } else {
            Err(Error::OutOfRange("material: no finite Abbe number"))
        }
    }

    /// Absolute index and slope at a vacuum wavelength.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for a non-finite wavelength;
    /// [`Error::OutOfRange`] outside [`Material::wavelength_range_nm`].
    pub fn sample(self, wavelength_nm: f64) -> Result<IndexSample> {
        let l = self.check(wavelength_nm)?;
        absolute_from_standard_air(l, |la| self.relative(la))
    }

    /// Absolute (phase) refractive index at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Material::sample`].
    pub fn refractive_index(self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.index)
    }

    /// Group index `n − λ dn/dλ` at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Material::sample`].
    pub fn group_index(self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.group_index())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::media::air::standard_air_index;
    use crate::media::testutil::check_slope;

    #[test]
    fn codes_round_trip() {
        for (i, m) in Material::ALL.iter().enumerate() {
            assert_eq!(m.code(), i as i32);
            assert_eq!(Material::from_code(m.code()), Some(*m));
            assert!(!m.name().is_empty() && !m.source().is_empty());
        }
        assert_eq!(Material::from_code(5), None);
        assert_eq!(Material::from_code(-1), None);
        assert_eq!(Material::from_code(i32::MAX), None);
    }

    #[test]
    fn slopes_match_finite_difference() {
        for m in Material::ALL {
            let (lo, hi) = m.wavelength_range_nm();
            for l in [lo + 1.0, 532.0, 0.5 * (lo + hi), hi - 1.0] {
                check_slope(|x| m.sample(x), l);
            }
        }
    }

    // Footing: the absolute index at vacuum wavelength λ is the standard-air
    // index at λ times the source's relative value at the air wavelength
    // λ / n_air; the ratio exceeds 1 by n_air − 1 ≈ 2.77e-4 plus the small
    // wavelength shift (dispersion times 0.17 nm).
    #[test]
    fn absolute_index_is_relative_times_standard_air() {
        for m in Material::ALL {
            let l = 600.0;
            let n_air = standard_air_index(l).unwrap();
            let abs = m.refractive_index(l).unwrap();
            let rel = m.relative_to_air_index(l / n_air).unwrap();
            assert!((abs - n_air * rel).abs() < 1e-14, "{m:?}");
            let ratio = abs / m.relative_to_air_index(l).unwrap() - 1.0;
            assert!(ratio > 2.7e-4 && ratio < 2.9e-4, "{m:?} {ratio}");
        }
    }

    #[test]
    fn rejects_bad_input() {
        for m in Material::ALL {
            let (lo, hi) = m.wavelength_range_nm();
            assert!(matches!(
                m.refractive_index(f64::NAN),
                Err(Error::InvalidArgument(_))
            ));
            assert!(matches!(
                m.refractive_index(-532.0),
                Err(Error::OutOfRange(_))
            ));
            assert!(matches!(m.refractive_index(0.0), Err(Error::OutOfRange(_))));
            assert!(matches!(
                m.refractive_index(lo - 1.0),
                Err(Error::OutOfRange(_))
            ));
            assert!(matches!(
                m.refractive_index(hi + 1.0),
                Err(Error::OutOfRange(_))
            ));
            assert!(matches!(
                m.group_index(f64::INFINITY),
                Err(Error::InvalidArgument(_))
            ));
            assert!(matches!(
                m.relative_to_air_index(hi + 1.0),
                Err(Error::OutOfRange(_))
            ));
        }
    }
}
