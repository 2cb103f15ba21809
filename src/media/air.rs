//! Air: the Ciddor (1996) equations, and the standard-air footing conversion.
//!
//! Source: P. E. Ciddor, "Refractive index of air: new equations for the visible
//! and near infrared", Appl. Opt. 35, 1566–1573 (1996).
//!
//! * Standard air (dry, 15 °C, 101 325 Pa, 450 ppm CO₂), Ciddor eq. 1, with the
//!   vacuum wavenumber `σ = 1/λ` in µm⁻¹:
//!   `10⁸ (n_as − 1) = k₁/(k₀ − σ²) + k₃/(k₂ − σ²)`,
//!   `k₀ = 238.0185 µm⁻²`, `k₁ = 5 792 105 µm⁻²`, `k₂ = 57.362 µm⁻²`,
//!   `k₃ = 167 917 µm⁻²`.
//! * CO₂ content `x_c` (ppm):
//!   `n_axs − 1 = (n_as − 1) [1 + 0.534 × 10⁻⁶ (x_c − 450)]`, and the molar mass
//!   of dry air `M_a = 10⁻³ [28.9635 + 12.011 × 10⁻⁶ (x_c − 400)] kg/mol`.
//! * Pure water vapour at 20 °C and 1333 Pa:
//!   `10⁸ (n_ws − 1) = 1.022 (w₀ + w₁σ² + w₂σ⁴ + w₃σ⁶)`, `w₀ = 295.235`,
//!   `w₁ = 2.6422`, `w₂ = −0.032380`, `w₃ = 0.004028` (µm⁻² powers).
//! * Moist air: `n − 1 = (ρ_a/ρ_axs)(n_axs − 1) + (ρ_w/ρ_ws)(n_ws − 1)`, the
//!   densities of the dry-air and water-vapour components from the BIPM
//!   1981/91 equation of state as given in Ciddor's paper:
//!   `ρ = p M_a / (Z R T) · [1 − x_w (1 − M_w/M_a)]` split into
//!   `ρ_a = p M_a (1 − x_w)/(Z R T)` and `ρ_w = p M_w x_w/(Z R T)`, with the
//!   compressibility
//!   `Z = 1 − (p/T)[a₀ + a₁t + a₂t² + (b₀ + b₁t)x_w + (c₀ + c₁t)x_w²] + (p/T)²(d + e x_w²)`,
//!   `ρ_axs` the dry-air density at 15 °C, 101 325 Pa (`x_w = 0`) and `ρ_ws` the
//!   vapour density at 20 °C, 1333 Pa (`x_w = 1`), `R = 8.314 510 J mol⁻¹ K⁻¹`,
//!   `M_w = 0.018 015 kg/mol`.
//! * Water-vapour mole fraction from relative humidity `h` (0…1):
//!   `x_w = f h p_sv / p`, the enhancement factor `f = 1.00062 + 3.14 × 10⁻⁸ p +
//!   5.6 × 10⁻⁷ t²` and the saturation vapour pressure over water
//!   `p_sv = exp(A T² + B T + C + D/T)` Pa, `A = 1.237 884 7 × 10⁻⁵ K⁻²`,
//!   `B = −1.912 131 6 × 10⁻² K⁻¹`, `C = 33.937 110 47`, `D = −6.343 164 5 × 10³ K`
//!   (the forms Ciddor adopts). Relative humidity is taken with respect to liquid
//!   water at every temperature.
//!
//! Validity (the range stated for the Ciddor equation by J. A. Stone and
//! J. H. Zimmerman, NIST Engineering Metrology Toolbox, "Index of refraction of
//! air", section VI): vacuum wavelength 300–1700 nm, −40 to 100 °C, 10–140 kPa,
//! relative humidity 0–1 (and a water-vapour mole fraction below 1),
//! CO₂ 0–2000 ppm. The default CO₂ content is 450 ppm ([`DEFAULT_CO2_PPM`]),
//! Ciddor's reference value.

use crate::error::{Error, Result};
use crate::math;
use crate::media::{all_finite, amount_in, kelvin, temperature_in, wavelength_in, IndexSample};

/// CO₂ content assumed when none is given, ppm (µmol/mol): the reference value of
/// Ciddor's standard air.
pub const DEFAULT_CO2_PPM: f64 = 450.0;

/// Shortest vacuum wavelength of the air model, nm.
pub const MIN_WAVELENGTH_NM: f64 = 300.0;
/// Longest vacuum wavelength of the air model, nm.
pub const MAX_WAVELENGTH_NM: f64 = 1700.0;

/// Shortest vacuum wavelength of [`standard_air_index`], nm (the range usually
/// quoted for Ciddor's eq. 1, 0.23–1.69 µm, that of the dry-air dispersion data
/// it was built from).
pub const STANDARD_AIR_MIN_WAVELENGTH_NM: f64 = 230.0;
/// Longest vacuum wavelength of [`standard_air_index`], nm.
pub const STANDARD_AIR_MAX_WAVELENGTH_NM: f64 = 1690.0;

// Ciddor (1996) eq. 1: standard-air dispersion, µm⁻².
const K0: f64 = 238.0185;
const K1: f64 = 5_792_105.0;
const K2: f64 = 57.362;
const K3: f64 = 167_917.0;
// Ciddor (1996): water vapour at 20 °C, 1333 Pa.
const W0: f64 = 295.235;
const W1: f64 = 2.6422;
const W2: f64 = -0.032_380;
const W3: f64 = 0.004_028;
const CF: f64 = 1.022;
// BIPM 1981/91 compressibility, as used by Ciddor (1996).
const A0: f64 = 1.581_23e-6; // K Pa⁻¹
const A1: f64 = -2.9331e-8; // Pa⁻¹
const A2: f64 = 1.1043e-10; // K⁻¹ Pa⁻¹
const B0: f64 = 5.707e-6; // K Pa⁻¹
const B1: f64 = -2.051e-8; // Pa⁻¹
const C0: f64 = 1.9898e-4; // K Pa⁻¹
const C1: f64 = -2.376e-6; // Pa⁻¹
const D: f64 = 1.83e-11; // K² Pa⁻²
const E: f64 = -0.765e-8; // K² Pa⁻²
                          // Saturation vapour pressure over water (BIPM 1981/91, as used by Ciddor).
const SVP_A: f64 = 1.237_884_7e-5; // K⁻²
const SVP_B: f64 = -1.912_131_6e-2; // K⁻¹
const SVP_C: f64 = 33.937_110_47;
const SVP_D: f64 = -6.343_164_5e3; // K
                                   // Enhancement factor of water vapour in air.
const F_ALPHA: f64 = 1.000_62;
const F_BETA: f64 = 3.14e-8; // Pa⁻¹
const F_GAMMA: f64 = 5.6e-7; // °C⁻²
/// Molar gas constant used by Ciddor (1996), J mol⁻¹ K⁻¹.
const R_MOLAR: f64 = 8.314_510;
/// Molar mass of water, kg/mol.
const M_WATER: f64 = 0.018_015;

/// `(n − 1, d(n − 1)/dσ²)` of standard air at `sigma2 = σ²` (µm⁻²).
fn standard_refractivity(sigma2: f64) -> (f64, f64) {
    let u = K0 - sigma2;
    let v = K2 - sigma2;
    (
        1e-8 * (K1 / u + K3 / v),
        1e-8 * (K1 / (u * u) + K3 / (v * v)),
    )
}

/// `σ²` in µm⁻² and `dσ²/dλ` per nm, for a vacuum wavelength in nm.
fn wavenumber_squared(wavelength_nm: f64) -> (f64, f64) {
    let s = 1000.0 / wavelength_nm;
    (s * s, -2.0 * s * s / wavelength_nm)
}

/// Standard-air index and its slope per nm, without range checks (the caller
/// guarantees a wavelength well above the 132 nm pole of eq. 1).
pub(crate) fn standard_air(wavelength_nm: f64) -> (f64, f64) {
    let (sigma2, dsigma2) = wavenumber_squared(wavelength_nm);
    let (r, dr) = standard_refractivity(sigma2);
    (1.0 + r, dr * dsigma2)
}

/// Index of standard air (dry, 15 °C, 101 325 Pa, 450 ppm CO₂) at a vacuum
/// wavelength, by Ciddor (1996) eq. 1:
/// `10⁸ (n − 1) = 5 792 105/(238.0185 − σ²) + 167 917/(57.362 − σ²)`, `σ` in µm⁻¹.
///
/// This is the air on whose footing flatray converts published indices that
/// are relative to air (see the [footing](crate::media#footing) notes).
///
/// # Errors
/// [`Error::InvalidArgument`] for a non-finite wavelength;
/// [`Error::OutOfRange`] outside 230–1690 nm.
pub fn standard_air_index(wavelength_nm: f64) -> Result<f64> {
    let l = wavelength_in(
        wavelength_nm,
        STANDARD_AIR_MIN_WAVELENGTH_NM,
        STANDARD_AIR_MAX_WAVELENGTH_NM,
        "standard air: wavelength_nm outside 230 to 1690 nm (Ciddor 1996 eq. 1)",
    )?;
    Ok(standard_air(l).0)
}

/// Shortest wavelength at which flatray converts from the standard-air footing,
/// nm. Below 230 nm eq. 1 is extrapolated; its nearest pole is at 132 nm, so
/// over 200–230 nm (where fused silica and sapphire fits start) it stays smooth.
pub(crate) const FOOTING_MIN_WAVELENGTH_NM: f64 = 200.0;

/// Absolute index at vacuum wavelength `wavelength_nm` from a formula relative to
/// standard air that takes the wavelength in standard air:
/// `n(λ) = n_std(λ) · n_rel(λ / n_std(λ))`.
///
/// `relative(λ_air_nm)` returns the relative index and its slope per nm of air
/// wavelength. The slope follows by the chain rule:
/// `dn/dλ = n_std' n_rel + n_std n_rel' (n_std − λ n_std') / n_std²`.
pub(crate) fn absolute_from_standard_air(
    wavelength_nm: f64,
    relative: impl Fn(f64) -> Result<(f64, f64)>,
) -> Result<IndexSample> {
    if wavelength_nm < FOOTING_MIN_WAVELENGTH_NM {
        return Err(Error::OutOfRange(
            "wavelength_nm below 200 nm, where flatray stops converting from the standard-air footing",
        ));
    }
    let (a, da) = standard_air(wavelength_nm);
    let air_wavelength = wavelength_nm / a;
    let (n_rel, dn_rel) = relative(air_wavelength)?;
    let dair_dvac = (a - wavelength_nm * da) / (a * a);
    IndexSample {
        wavelength_nm,
        index: a * n_rel,
        dn_dwavelength_per_nm: da * n_rel + a * dn_rel * dair_dvac,
    }
    .checked("the dispersion formula gives no finite positive index here")
}

/// Compressibility of moist air, BIPM 1981/91 (as in Ciddor 1996):
/// `p` in Pa, `t_k` in K, `x_w` the water-vapour mole fraction.
fn compressibility(p: f64, t_k: f64, x_w: f64) -> f64 {
    let t = t_k - crate::media::KELVIN_OFFSET;
    let q = p / t_k;
    1.0 - q * (A0 + A1 * t + A2 * t * t + (B0 + B1 * t) * x_w + (C0 + C1 * t) * x_w * x_w)
        + q * q * (D + E * x_w * x_w)
}

/// Moist air of given temperature, pressure, humidity and CO₂ content: the
/// Ciddor (1996) model (see the module docs for every equation and the range).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Air {
    /// Air temperature, °C (−40 to 100).
    pub temperature_c: f64,
    /// Absolute pressure, Pa (10 to 140 kPa).
    pub pressure_pa: f64,
    /// Relative humidity as a fraction, 0 (dry) to 1 (saturated), with respect
    /// to liquid water.
    pub relative_humidity: f64,
    /// CO₂ content, ppm (µmol/mol), 0 to 2000; [`DEFAULT_CO2_PPM`] by default.
    pub co2_ppm: f64,
}

impl Air {
    /// Ciddor's standard air: dry, 15 °C, 101 325 Pa, 450 ppm CO₂.
    pub const STANDARD: Air = Air {
        temperature_c: 15.0,
        pressure_pa: 101_325.0,
        relative_humidity: 0.0,
        co2_ppm: DEFAULT_CO2_PPM,
    };

    /// Air at `temperature_c` (°C), absolute `pressure_pa` (Pa) and
    /// `relative_humidity` (0…1), with [`DEFAULT_CO2_PPM`] of CO₂.
    pub const fn new(temperature_c: f64, pressure_pa: f64, relative_humidity: f64) -> Air {
        Air {
            temperature_c,
            pressure_pa,
            relative_humidity,
            co2_ppm: DEFAULT_CO2_PPM,
        }
    }

    /// The same air with `co2_ppm` of CO₂.
    pub const fn with_co2_ppm(self, co2_ppm: f64) -> Air {
        Air { co2_ppm, ..self }
    }

    /// Water-vapour mole fraction `x_w = f h p_sv / p` (see the module docs).
    ///
    /// # Errors
    /// As [`Air::sample`], without the wavelength.
    pub fn water_vapour_mole_fraction(&self) -> Result<f64> {
        all_finite(
            &[self.temperature_c, self.pressure_pa, self.relative_humidity],
            "air: temperature_c, pressure_pa and relative_humidity must be finite",
        )?;
        let t = temperature_in(
            self.temperature_c,
            -40.0,
            100.0,
            "air: temperature_c outside -40 to 100 °C (Ciddor 1996)",
        )?;
        let p = amount_in(
            self.pressure_pa,
            10.0e3,
            140.0e3,
            "air: pressure_pa must be finite",
            "air: pressure_pa outside 10 to 140 kPa (Ciddor 1996)",
        )?;
        let h = amount_in(
            self.relative_humidity,
            0.0,
            1.0,
            "air: relative_humidity must be finite",
            "air: relative_humidity outside 0 to 1",
        )?;
        let t_k = kelvin(t);
        let svp = math::exp(SVP_A * t_k * t_k + SVP_B * t_k + SVP_C + SVP_D / t_k);
        let f = F_ALPHA + F_BETA * p + F_GAMMA * t * t;
        let x_w = f * h * svp / p;
        if x_w < 1.0 {
            Ok(x_w)
        } else {
            Err(Error::OutOfRange(
                "air: more water vapour than the pressure can hold (mole fraction >= 1)",
            ))
        }
    }

    /// Index and slope at a vacuum wavelength (Ciddor 1996; analytic slope of
    /// the dispersion terms, the densities not depending on wavelength).
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for a non-finite input;
    /// [`Error::OutOfRange`] for any finite input outside the validity stated in
    /// the module docs (a wavelength ≤ 0, a temperature below absolute zero, a
    /// negative pressure, humidity or CO₂ content included).
    pub fn sample(&self, wavelength_nm: f64) -> Result<IndexSample> {
        all_finite(
            &[
                self.temperature_c,
                self.pressure_pa,
                self.relative_humidity,
                self.co2_ppm,
                wavelength_nm,
            ],
            "air: every condition and the wavelength must be finite",
        )?;
        let l = wavelength_in(
            wavelength_nm,
            MIN_WAVELENGTH_NM,
            MAX_WAVELENGTH_NM,
            "air: wavelength_nm outside 300 to 1700 nm (Ciddor 1996)",
        )?;
        let x_c = amount_in(
            self.co2_ppm,
            0.0,
            2000.0,
            "air: co2_ppm must be finite",
            "air: co2_ppm outside 0 to 2000 ppm (Ciddor 1996)",
        )?;
        let x_w = self.water_vapour_mole_fraction()?;
        let t_k = kelvin(self.temperature_c);
        let p = self.pressure_pa;

        let (sigma2, dsigma2) = wavenumber_squared(l);
        let co2_factor = 1.0 + 0.534e-6 * (x_c - 450.0);
        let (r_as, dr_as) = standard_refractivity(sigma2);
        let (r_axs, dr_axs) = (r_as * co2_factor, dr_as * co2_factor);
        let r_ws = CF * 1e-8 * (W0 + sigma2 * (W1 + sigma2 * (W2 + sigma2 * W3)));
        let dr_ws = CF * 1e-8 * (W1 + sigma2 * (2.0 * W2 + sigma2 * 3.0 * W3));

        let m_a = 1e-3 * (28.9635 + 12.011e-6 * (x_c - 400.0));
        let t_std = kelvin(15.0);
        let rho_axs = 101_325.0 * m_a / (compressibility(101_325.0, t_std, 0.0) * R_MOLAR * t_std);
        let t_ws = kelvin(20.0);
        let rho_ws = 1333.0 * M_WATER / (compressibility(1333.0, t_ws, 1.0) * R_MOLAR * t_ws);
        let zrt = compressibility(p, t_k, x_w) * R_MOLAR * t_k;
        let rho_a = p * m_a * (1.0 - x_w) / zrt;
        let rho_w = p * M_WATER * x_w / zrt;

        let (fa, fw) = (rho_a / rho_axs, rho_w / rho_ws);
        IndexSample {
            wavelength_nm: l,
            index: 1.0 + fa * r_axs + fw * r_ws,
            dn_dwavelength_per_nm: (fa * dr_axs + fw * dr_ws) * dsigma2,
        }
        .checked("air: no finite index")
    }

    /// Absolute (phase) refractive index at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Air::sample`].
    pub fn refractive_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.index)
    }

    /// Group index `n − λ dn/dλ` at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Air::sample`].
    pub fn group_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.group_index())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::media::testutil::check_slope;

    // Edlén (1966) and Ciddor (1996): dry standard air (15 °C, 101 325 Pa) at the
    // sodium line has n − 1 ≈ 2.77e-4. Tolerance: half a unit in the last quoted
    // digit, 0.005e-4.
    #[test]
    fn standard_air_at_sodium_line() {
        let n = Air::STANDARD.refractive_index(589.0).unwrap();
        assert!((n - 1.0 - 2.77e-4).abs() <= 0.005e-4, "n - 1 = {}", n - 1.0);
        let eq1 = standard_air_index(589.0).unwrap();
        // The full model at the standard conditions reduces to eq. 1 exactly
        // (same densities in numerator and denominator, no water vapour).
        assert!((n - eq1).abs() < 1e-15);
    }

    // Ciddor (1996) eq. 1, evaluated by hand (mpmath, 30 digits) from the
    // published constants: 10^8 (n - 1) at 532 nm = 27820.83179,
    // at 656.2725 nm = 27625.21236. Tolerance 1e-12 (double rounding only).
    #[test]
    fn standard_air_eq1_hand_values() {
        assert!((standard_air_index(532.0).unwrap() - 1.0 - 2.782_083_179e-4).abs() < 1e-12);
        assert!((standard_air_index(656.2725).unwrap() - 1.0 - 2.762_521_236e-4).abs() < 1e-12);
    }

    #[test]
    fn humidity_lowers_and_pressure_raises_the_index() {
        let dry = Air::new(20.0, 101_325.0, 0.0)
            .refractive_index(633.0)
            .unwrap();
        let wet = Air::new(20.0, 101_325.0, 1.0)
            .refractive_index(633.0)
            .unwrap();
        let high = Air::new(20.0, 110_000.0, 0.0)
            .refractive_index(633.0)
            .unwrap();
        assert!(wet < dry && high > dry);
        // Common practice (shop-floor rule): at 20 °C, n − 1 changes by about
        // 2.7e-9 per Pa; checked loosely (±10 %).
        let per_pa = (high - dry) / (110_000.0 - 101_325.0);
        assert!((per_pa - 2.7e-9).abs() < 0.27e-9, "{per_pa}");
    }

    #[test]
    fn slope_matches_finite_difference() {
        for air in [
            Air::STANDARD,
            Air::new(35.0, 90_000.0, 0.8).with_co2_ppm(800.0),
        ] {
            for l in [320.0, 532.0, 1000.0, 1650.0] {
                check_slope(|w| air.sample(w), l);
            }
        }
    }

    #[test]
    fn rejects_bad_input() {
        let a = Air::STANDARD;
        assert!(matches!(
            a.refractive_index(f64::NAN),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            a.refractive_index(-500.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(a.refractive_index(0.0), Err(Error::OutOfRange(_))));
        assert!(matches!(
            a.refractive_index(250.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            a.refractive_index(1800.0),
            Err(Error::OutOfRange(_))
        ));
        let bad = |air: Air| air.refractive_index(600.0);
        assert!(matches!(
            bad(Air::new(f64::NAN, 1e5, 0.0)),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            bad(Air::new(-300.0, 1e5, 0.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Air::new(-50.0, 1e5, 0.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Air::new(120.0, 1e5, 0.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Air::new(20.0, -1.0, 0.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Air::new(20.0, 5e3, 0.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Air::new(20.0, 2e5, 0.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Air::new(20.0, 1e5, -0.1)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Air::new(20.0, 1e5, 1.1)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Air::new(20.0, 1e5, f64::INFINITY)),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            bad(Air::STANDARD.with_co2_ppm(-1.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Air::STANDARD.with_co2_ppm(5000.0)),
            Err(Error::OutOfRange(_))
        ));
        // Saturated air at 100 °C and 10 kPa would be more than pure vapour.
        assert!(matches!(
            bad(Air::new(100.0, 10e3, 1.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            standard_air_index(200.0),
            Err(Error::OutOfRange(_))
        ));
    }
}
