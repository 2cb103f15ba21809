//! Pure (ordinary) water: IAPWS R9-97.
//!
//! Source: IAPWS, *Release on the Refractive Index of Ordinary Water Substance as
//! a Function of Wavelength, Temperature and Pressure* (R9-97, 1997), the
//! formulation of A. H. Harvey, J. S. Gallagher and J. M. H. Levelt Sengers,
//! J. Phys. Chem. Ref. Data 27, 761 (1998).
//!
//! The Lorentz-Lorenz function is fitted in reduced density `ρ̄ = ρ/ρ*`,
//! temperature `T̄ = T/T*` and wavelength `λ̄ = λ/λ*`
//! (`ρ* = 1000 kg m⁻³`, `T* = 273.15 K`, `λ* = 0.589 µm`):
//!
//! `(n² − 1)/(n² + 2) · 1/ρ̄ = a₀ + a₁ρ̄ + a₂T̄ + a₃λ̄²T̄ + a₄/λ̄² + a₅/(λ̄² − λ̄_UV²)
//! + a₆/(λ̄² − λ̄_IR²) + a₇ρ̄²`
//!
//! with `a₀ = 0.244 257 733`, `a₁ = 9.746 344 76 × 10⁻³`,
//! `a₂ = −3.732 349 96 × 10⁻³`, `a₃ = 2.686 784 72 × 10⁻⁴`,
//! `a₄ = 1.589 205 70 × 10⁻³`, `a₅ = 2.459 342 59 × 10⁻³`, `a₆ = 0.900 704 920`,
//! `a₇ = −1.666 262 19 × 10⁻²`, `λ̄_UV = 0.229 202`, `λ̄_IR = 5.432 937`.
//! Writing the right-hand side times `ρ̄` as `A`, `n = √((1 + 2A)/(1 − A))`.
//!
//! Validity (R9-97): −12 °C to 500 °C, 0 to 1060 kg m⁻³, 0.2 to 1.1 µm, in the
//! stable fluid region and the supercooled liquid. The index is relative to
//! vacuum. flatray takes `λ` as the vacuum wavelength; this project could not
//! confirm the release's own wording on that point. Reading `λ` as a wavelength
//! in air instead would change `n` by about 5 × 10⁻⁶ at 589 nm, below the
//! formulation's uncertainty.
//!
//! For `(T, p)` inputs the density comes from IAPWS-IF97 region 1
//! ([`crate::media::if97`]), which limits [`PureWater`] to 0–350 °C and
//! `p_s(T)` to 100 MPa. [`index_at_density`] takes a density directly and keeps
//! the full R9-97 range (supercooled water included).

use crate::error::{Error, Result};
use crate::math;
use crate::media::{
    all_finite, amount_in, if97, kelvin, temperature_in, wavelength_in, IndexSample,
    STANDARD_PRESSURE_PA,
};

/// Shortest vacuum wavelength of R9-97, nm.
pub const MIN_WAVELENGTH_NM: f64 = 200.0;
/// Longest vacuum wavelength of R9-97, nm.
pub const MAX_WAVELENGTH_NM: f64 = 1100.0;
/// Lowest temperature of R9-97 (supercooled liquid), °C.
pub const MIN_TEMPERATURE_C: f64 = -12.0;
/// Highest temperature of R9-97, °C.
pub const MAX_TEMPERATURE_C: f64 = 500.0;
/// Highest density of R9-97, kg m⁻³.
pub const MAX_DENSITY_KG_PER_M3: f64 = 1060.0;

const A: [f64; 8] = [
    0.244_257_733,
    0.974_634_476e-2,
    -0.373_234_996e-2,
    0.268_678_472e-3,
    0.158_920_570e-2,
    0.245_934_259e-2,
    0.900_704_920,
    -0.166_626_219e-1,
];
const LAMBDA_UV: f64 = 0.229_202;
const LAMBDA_IR: f64 = 5.432_937;
/// `λ*` in nm.
const LAMBDA_STAR_NM: f64 = 589.0;
/// `T*` in K.
const T_STAR_K: f64 = 273.15;
/// `ρ*` in kg m⁻³.
const RHO_STAR: f64 = 1000.0;

/// R9-97 without range checks: index and slope per nm.
fn r9_97(t_k: f64, rho: f64, wavelength_nm: f64) -> IndexSample {
    let [a0, a1, a2, a3, a4, a5, a6, a7] = A;
    let d = rho / RHO_STAR;
    let t = t_k / T_STAR_K;
    let l = wavelength_nm / LAMBDA_STAR_NM;
    let l2 = l * l;
    let uv = l2 - LAMBDA_UV * LAMBDA_UV;
    let ir = l2 - LAMBDA_IR * LAMBDA_IR;
    let big_a = d * (a0 + a1 * d + a2 * t + a3 * l2 * t + a4 / l2 + a5 / uv + a6 / ir + a7 * d * d);
    // dA/d(λ̄²), then d(λ̄²)/dλ = 2λ/λ*² per nm.
    let da_dl2 = d * (a3 * t - a4 / (l2 * l2) - a5 / (uv * uv) - a6 / (ir * ir));
    let dl2 = 2.0 * wavelength_nm / (LAMBDA_STAR_NM * LAMBDA_STAR_NM);
    let n = math::sqrt((1.0 + 2.0 * big_a) / (1.0 - big_a));
    // dn/dA = 3 / (2 n (1 − A)²).
    let dn_da = 3.0 / (2.0 * n * (1.0 - big_a) * (1.0 - big_a));
    IndexSample {
        wavelength_nm,
        index: n,
        dn_dwavelength_per_nm: dn_da * da_dl2 * dl2,
    }
}

/// R9-97 index and slope of water of known density.
///
/// `temperature_c` in °C, `density_kg_per_m3` in kg m⁻³, `wavelength_nm` the
/// vacuum wavelength in nm; see the module docs for the formula.
///
/// # Errors
/// [`Error::InvalidArgument`] for a non-finite input;
/// [`Error::OutOfRange`] outside −12…500 °C, 0…1060 kg m⁻³ or 200…1100 nm.
pub fn sample_at_density(
    temperature_c: f64,
    density_kg_per_m3: f64,
    wavelength_nm: f64,
) -> Result<IndexSample> {
    all_finite(
        &[temperature_c, density_kg_per_m3, wavelength_nm],
        "water: temperature_c, density_kg_per_m3 and wavelength_nm must be finite",
    )?;
    let t = temperature_in(
        temperature_c,
        MIN_TEMPERATURE_C,
        MAX_TEMPERATURE_C,
        "water: temperature_c outside -12 to 500 °C (IAPWS R9-97)",
    )?;
    let rho = amount_in(
        density_kg_per_m3,
        0.0,
        MAX_DENSITY_KG_PER_M3,
        "water: density_kg_per_m3 must be finite",
        "water: density_kg_per_m3 outside 0 to 1060 kg/m3 (IAPWS R9-97)",
    )?;
    let l = wavelength_in(
        wavelength_nm,
        MIN_WAVELENGTH_NM,
        MAX_WAVELENGTH_NM,
        "water: wavelength_nm outside 200 to 1100 nm (IAPWS R9-97)",
    )?;
    r9_97(kelvin(t), rho, l).checked("water: no finite index")
}

/// R9-97 absolute refractive index of water of known density (see
/// [`sample_at_density`]).
///
/// # Errors
/// As [`sample_at_density`].
pub fn index_at_density(
    temperature_c: f64,
    density_kg_per_m3: f64,
    wavelength_nm: f64,
) -> Result<f64> {
    sample_at_density(temperature_c, density_kg_per_m3, wavelength_nm).map(|s| s.index)
}

/// Pure liquid water at a temperature and absolute pressure: IAPWS R9-97 with
/// the IAPWS-IF97 region-1 density.
///
/// Valid for 0–350 °C, the saturation pressure `p_s(T)` up to 100 MPa, and
/// vacuum wavelengths 200–1100 nm.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PureWater {
    /// Temperature, °C.
    pub temperature_c: f64,
    /// Absolute pressure, Pa (surface: [`STANDARD_PRESSURE_PA`]; add about
    /// 9.8 kPa per metre of fresh water below the surface).
    pub pressure_pa: f64,
}

impl PureWater {
    /// Water at `temperature_c` (°C) and absolute `pressure_pa` (Pa).
    pub const fn new(temperature_c: f64, pressure_pa: f64) -> PureWater {
        PureWater {
            temperature_c,
            pressure_pa,
        }
    }

    /// Water at `temperature_c` (°C) under one standard atmosphere.
    pub const fn at_surface(temperature_c: f64) -> PureWater {
        PureWater::new(temperature_c, STANDARD_PRESSURE_PA)
    }

    /// Density, kg m⁻³, from IAPWS-IF97 region 1.
    ///
    /// # Errors
    /// As [`if97::density_kg_per_m3`].
    pub fn density_kg_per_m3(&self) -> Result<f64> {
        if97::density_kg_per_m3(self.temperature_c, self.pressure_pa)
    }

    /// Index and slope at a vacuum wavelength.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for a non-finite input;
    /// [`Error::OutOfRange`] outside 0–350 °C, 0–100 MPa or 200–1100 nm, or
    /// below the saturation pressure (boiling water).
    pub fn sample(&self, wavelength_nm: f64) -> Result<IndexSample> {
        all_finite(
            &[self.temperature_c, self.pressure_pa, wavelength_nm],
            "water: temperature_c, pressure_pa and wavelength_nm must be finite",
        )?;
        let l = wavelength_in(
            wavelength_nm,
            MIN_WAVELENGTH_NM,
            MAX_WAVELENGTH_NM,
            "water: wavelength_nm outside 200 to 1100 nm (IAPWS R9-97)",
        )?;
        let rho = self.density_kg_per_m3()?;
        if rho > MAX_DENSITY_KG_PER_M3 {
            // IF97 stays below about 1059 kg/m3 over region 1; kept as a guard.
            return Err(Error::OutOfRange(
                "water: density above 1060 kg/m3 (IAPWS R9-97)",
            ));
        }
        r9_97(kelvin(self.temperature_c), rho, l).checked("water: no finite index")
    }

    /// Absolute (phase) refractive index at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`PureWater::sample`].
    pub fn refractive_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.index)
    }

    /// Group index `n − λ dn/dλ` at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`PureWater::sample`].
    pub fn group_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.group_index())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::media::air::standard_air_index;
    use crate::media::testutil::check_slope;

    // Check values: the two examples in the docstring of `_Refractive` in the
    // `iapws` Python package (1.5.5), which cites the R9-97 release:
    // (997.047435 kg/m3, 298.15 K, 0.2265 um) -> 1.39277824 and
    // (30.4758534 kg/m3, 773.15 K, 0.5893 um) -> 1.00949307. Tolerance: half a
    // unit in the 8th decimal.
    #[test]
    fn r9_97_verification_values() {
        let n1 = index_at_density(25.0, 997.047_435, 226.5).unwrap();
        assert!((n1 - 1.392_778_24).abs() <= 5e-9, "{n1}");
        let n2 = index_at_density(500.0, 30.475_853_4, 589.3).unwrap();
        assert!((n2 - 1.009_493_07).abs() <= 5e-9, "{n2}");
    }

    // Handbook value (common practice; quoted from memory as the usual table
    // value): pure water at 20 °C and the sodium D line has n = 1.3330 relative
    // to air, about 1.33335 absolute. Tolerances: half a unit in the last quoted
    // digit for the relative value (5e-5); 2e-5 for the absolute value, which
    // carries the relative value's rounding in principle but is known better.
    #[test]
    fn handbook_sodium_line_at_20c() {
        let n = PureWater::at_surface(20.0).refractive_index(589.3).unwrap();
        assert!((n - 1.333_35).abs() < 2e-5, "{n}");
        let rel = n / standard_air_index(589.3).unwrap();
        assert!((rel - 1.3330).abs() < 5e-5, "{rel}");
    }

    #[test]
    fn group_index_near_532_matches_finite_difference() {
        for w in [PureWater::at_surface(4.0), PureWater::new(25.0, 30e6)] {
            for l in [201.0, 520.0, 532.0, 545.0, 1099.0] {
                check_slope(|x| w.sample(x), l);
            }
        }
        check_slope(|x| sample_at_density(-10.0, 998.0, x), 532.0);
        // Water is normally dispersive in the visible: n_g > n.
        let w = PureWater::at_surface(20.0);
        assert!(w.group_index(532.0).unwrap() > w.refractive_index(532.0).unwrap() + 0.01);
    }

    #[test]
    fn rejects_bad_input() {
        let w = PureWater::at_surface(20.0);
        assert!(matches!(
            w.refractive_index(f64::NAN),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            w.refractive_index(-532.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            w.refractive_index(150.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            w.refractive_index(1200.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            PureWater::at_surface(-5.0).refractive_index(532.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            PureWater::at_surface(120.0).refractive_index(532.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            PureWater::new(20.0, 2e8).refractive_index(532.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            PureWater::new(20.0, -1.0).refractive_index(532.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            index_at_density(20.0, 1100.0, 532.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            index_at_density(20.0, -1.0, 532.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            index_at_density(-20.0, 990.0, 532.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            index_at_density(f64::INFINITY, 990.0, 532.0),
            Err(Error::InvalidArgument(_))
        ));
        // Supercooled water is inside R9-97 when the density is given.
        assert!(index_at_density(-10.0, 998.1, 532.0).is_ok());
    }
}
