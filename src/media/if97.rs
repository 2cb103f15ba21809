//! Density of liquid water from temperature and pressure: IAPWS-IF97 region 1.
//!
//! Source: IAPWS, *Revised Release on the IAPWS Industrial Formulation 1997 for
//! the Thermodynamic Properties of Water and Steam* (R7-97, 2012 edition), with
//! W. Wagner et al., J. Eng. Gas Turbines Power 122, 150 (2000).
//!
//! * Region 1 (compressed and saturated liquid) is the dimensionless Gibbs free
//!   energy `γ(π, τ) = g/(RT) = Σ nᵢ (7.1 − π)^Iᵢ (τ − 1.222)^Jᵢ` (release eq. 7),
//!   with `π = p/p*`, `τ = T*/T`, `p* = 16.53 MPa`, `T* = 1386 K` and the 34
//!   coefficients of release Table 2. Properties follow from its derivatives
//!   (release Table 3): `v = (RT/p) π γ_π`, `h = RT τ γ_τ`, `u = RT (τ γ_τ − π γ_π)`,
//!   `s = R (τ γ_τ − γ)`, `c_p = −R τ² γ_ττ`,
//!   `w² = RT γ_π² / [(γ_π − τ γ_πτ)²/(τ² γ_ττ) − γ_ππ]`, with the specific gas
//!   constant `R = 0.461526 kJ kg⁻¹ K⁻¹` (release eq. 1).
//! * Region 1 covers 273.15 K ≤ T ≤ 623.15 K and `p_s(T) ≤ p ≤ 100 MPa`, where the
//!   saturation pressure `p_s(T)` is the region-4 equation (release eq. 30, with
//!   the ten coefficients of Table 34). Below `p_s(T)` water boils: that state is
//!   steam (region 2), which this module does not model, so it is
//!   [`Error::OutOfRange`].
//!
//! IF97 reproduces the scientific formulation IAPWS-95 closely: for the liquid
//! between 0 and 60 °C and 0.1 and 100 MPa the two densities differ by at most
//! about 2 × 10⁻⁵ relative (measured against the `iapws` Python package in
//! `tests/data/`), which moves the refractive index of [`crate::media::water`] by
//! less than 10⁻⁵.

use crate::error::{Error, Result};
use crate::math;
use crate::media::{all_finite, amount_in, kelvin, temperature_in};

/// Specific gas constant of water in IF97, J kg⁻¹ K⁻¹ (release eq. 1:
/// 0.461526 kJ kg⁻¹ K⁻¹).
pub const GAS_CONSTANT_J_PER_KG_K: f64 = 461.526;

/// Lowest temperature of region 1, °C (273.15 K).
pub const MIN_TEMPERATURE_C: f64 = 0.0;
/// Highest temperature of region 1, °C (623.15 K).
pub const MAX_TEMPERATURE_C: f64 = 350.0;
/// Highest pressure of region 1, Pa (100 MPa).
pub const MAX_PRESSURE_PA: f64 = 100.0e6;

/// Reducing pressure of region 1, Pa (`p* = 16.53 MPa`, release eq. 7).
const P_STAR_PA: f64 = 16.53e6;
/// Reducing temperature of region 1, K (`T* = 1386 K`, release eq. 7).
const T_STAR_K: f64 = 1386.0;

/// Release Table 2: `(Iᵢ, Jᵢ, nᵢ)` of the region-1 Gibbs free energy.
const REGION1: [(i32, i32, f64); 34] = [
    (0, -2, 0.146_329_712_131_67),
    (0, -1, -0.845_481_871_691_14),
    (0, 0, -0.375_636_036_720_40e1),
    (0, 1, 0.338_551_691_683_85e1),
    (0, 2, -0.957_919_633_878_72),
    (0, 3, 0.157_720_385_132_28),
    (0, 4, -0.166_164_171_995_01e-1),
    (0, 5, 0.812_146_299_835_68e-3),
    (1, -9, 0.283_190_801_238_04e-3),
    (1, -7, -0.607_063_015_658_74e-3),
    (1, -1, -0.189_900_682_184_19e-1),
    (1, 0, -0.325_297_487_705_05e-1),
    (1, 1, -0.218_417_171_754_14e-1),
    (1, 3, -0.528_383_579_699_30e-4),
    (2, -3, -0.471_843_210_732_67e-3),
    (2, 0, -0.300_017_807_930_26e-3),
    (2, 1, 0.476_613_939_069_87e-4),
    (2, 3, -0.441_418_453_308_46e-5),
    (2, 17, -0.726_949_962_975_94e-15),
    (3, -4, -0.316_796_448_450_54e-4),
    (3, 0, -0.282_707_979_853_12e-5),
    (3, 6, -0.852_051_281_201_03e-9),
    (4, -5, -0.224_252_819_080_00e-5),
    (4, -2, -0.651_712_228_956_01e-6),
    (4, 10, -0.143_417_299_379_24e-12),
    (5, -8, -0.405_169_968_601_17e-6),
    (8, -11, -0.127_343_017_416_41e-8),
    (8, -6, -0.174_248_712_306_34e-9),
    (21, -29, -0.687_621_312_955_31e-18),
    (23, -31, 0.144_783_078_285_21e-19),
    (29, -38, 0.263_357_816_627_95e-22),
    (30, -39, -0.119_476_226_400_71e-22),
    (31, -40, 0.182_280_945_814_04e-23),
    (32, -41, -0.935_370_872_924_58e-25),
];

/// Release Table 34: `n₁ … n₁₀` of the saturation-pressure equation (eq. 30).
const SATURATION: [f64; 10] = [
    0.116_705_214_527_67e4,
    -0.724_213_167_032_06e6,
    -0.170_738_469_400_92e2,
    0.120_208_247_024_70e5,
    -0.323_255_503_223_33e7,
    0.149_151_086_135_30e2,
    -0.482_326_573_615_91e4,
    0.405_113_405_420_57e6,
    -0.238_555_575_678_49,
    0.650_175_348_447_98e3,
];

/// Highest temperature of the saturation-pressure equation, °C (the critical
/// temperature 647.096 K).
pub const SATURATION_MAX_TEMPERATURE_C: f64 = 647.096 - 273.15;

/// Saturation (boiling) pressure of water, Pa, at `temperature_c`.
///
/// IAPWS-IF97 region 4, release eq. 30: with `ϑ = T + n₉/(T − n₁₀)` (T in K),
/// `A = ϑ² + n₁ϑ + n₂`, `B = n₃ϑ² + n₄ϑ + n₅`, `C = n₆ϑ² + n₇ϑ + n₈`,
/// `p_s = 1 MPa · [2C / (−B + √(B² − 4AC))]⁴`.
/// Valid from 273.15 K to the critical temperature 647.096 K (0 to 373.946 °C).
///
/// # Errors
/// [`Error::InvalidArgument`] for a non-finite temperature;
/// [`Error::OutOfRange`] outside 0 to 373.946 °C.
pub fn saturation_pressure_pa(temperature_c: f64) -> Result<f64> {
    let t_c = temperature_in(
        temperature_c,
        MIN_TEMPERATURE_C,
        SATURATION_MAX_TEMPERATURE_C,
        "saturation pressure: temperature_c outside 0 to 373.946 °C (IF97 eq. 30)",
    )?;
    Ok(saturation_pressure_unchecked(kelvin(t_c)))
}

/// Eq. 30 without range checks; `t_k` in K within the equation's range.
fn saturation_pressure_unchecked(t_k: f64) -> f64 {
    let [n1, n2, n3, n4, n5, n6, n7, n8, n9, n10] = SATURATION;
    let theta = t_k + n9 / (t_k - n10);
    let a = theta * theta + n1 * theta + n2;
    let b = n3 * theta * theta + n4 * theta + n5;
    let c = n6 * theta * theta + n7 * theta + n8;
    let ratio = 2.0 * c / (-b + math::sqrt(b * b - 4.0 * a * c));
    let r2 = ratio * ratio;
    1.0e6 * r2 * r2
}

/// Thermodynamic properties of liquid water in IF97 region 1.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Region1Properties {
    /// Specific volume `v`, m³ kg⁻¹.
    pub specific_volume_m3_per_kg: f64,
    /// Density `ρ = 1/v`, kg m⁻³.
    pub density_kg_per_m3: f64,
    /// Specific enthalpy `h`, J kg⁻¹.
    pub specific_enthalpy_j_per_kg: f64,
    /// Specific internal energy `u`, J kg⁻¹.
    pub specific_internal_energy_j_per_kg: f64,
    /// Specific entropy `s`, J kg⁻¹ K⁻¹.
    pub specific_entropy_j_per_kg_k: f64,
    /// Specific isobaric heat capacity `c_p`, J kg⁻¹ K⁻¹.
    pub isobaric_heat_capacity_j_per_kg_k: f64,
    /// Speed of sound `w`, m s⁻¹.
    pub speed_of_sound_m_per_s: f64,
}

/// Checks `(temperature_c, pressure_pa)` against region 1 and returns
/// `(T in K, p in Pa)`.
fn region1_state(temperature_c: f64, pressure_pa: f64) -> Result<(f64, f64)> {
    all_finite(
        &[temperature_c, pressure_pa],
        "water: temperature_c and pressure_pa must be finite",
    )?;
    let t_c = temperature_in(
        temperature_c,
        MIN_TEMPERATURE_C,
        MAX_TEMPERATURE_C,
        "water: temperature_c outside 0 to 350 °C (IAPWS-IF97 region 1)",
    )?;
    let p = amount_in(
        pressure_pa,
        0.0,
        MAX_PRESSURE_PA,
        "water: pressure_pa must be finite (absolute pressure)",
        "water: pressure_pa outside 0 to 100 MPa (IAPWS-IF97 region 1)",
    )?;
    let t_k = kelvin(t_c);
    if p < saturation_pressure_unchecked(t_k) {
        return Err(Error::OutOfRange(
            "water: pressure_pa below the saturation pressure: the water would boil (IAPWS-IF97 region 1 needs p >= p_s(T))",
        ));
    }
    Ok((t_k, p))
}

/// Region-1 properties at `temperature_c` (°C) and absolute `pressure_pa` (Pa).
///
/// IAPWS-IF97 region 1 (release eq. 7 and Table 3); see the module docs.
///
/// # Errors
/// [`Error::InvalidArgument`] for a non-finite input; [`Error::OutOfRange`]
/// outside 0–350 °C or 0–100 MPa, or below the saturation pressure.
pub fn region1_properties(temperature_c: f64, pressure_pa: f64) -> Result<Region1Properties> {
    let (t_k, p) = region1_state(temperature_c, pressure_pa)?;
    let pi = p / P_STAR_PA;
    let tau = T_STAR_K / t_k;
    let x = 7.1 - pi;
    let y = tau - 1.222;
    let (mut g, mut g_p, mut g_pp, mut g_t, mut g_tt, mut g_pt) = (0.0, 0.0, 0.0, 0.0, 0.0, 0.0);
    for &(i, j, n) in REGION1.iter() {
        let fi = f64::from(i);
        let fj = f64::from(j);
        let xi = math::powi(x, i);
        let yj = math::powi(y, j);
        let xi1 = math::powi(x, i - 1);
        let yj1 = math::powi(y, j - 1);
        g += n * xi * yj;
        g_p -= n * fi * xi1 * yj;
        g_pp += n * fi * (fi - 1.0) * math::powi(x, i - 2) * yj;
        g_t += n * xi * fj * yj1;
        g_tt += n * xi * fj * (fj - 1.0) * math::powi(y, j - 2);
        g_pt -= n * fi * xi1 * fj * yj1;
    }
    let r = GAS_CONSTANT_J_PER_KG_K;
    let v = r * t_k / p * pi * g_p;
    let w2 =
        r * t_k * g_p * g_p / ((g_p - tau * g_pt) * (g_p - tau * g_pt) / (tau * tau * g_tt) - g_pp);
    let props = Region1Properties {
        specific_volume_m3_per_kg: v,
        density_kg_per_m3: 1.0 / v,
        specific_enthalpy_j_per_kg: r * t_k * tau * g_t,
        specific_internal_energy_j_per_kg: r * t_k * (tau * g_t - pi * g_p),
        specific_entropy_j_per_kg_k: r * (tau * g_t - g),
        isobaric_heat_capacity_j_per_kg_k: -r * tau * tau * g_tt,
        speed_of_sound_m_per_s: math::sqrt(w2),
    };
    if props.density_kg_per_m3.is_finite() && props.density_kg_per_m3 > 0.0 {
        Ok(props)
    } else {
        Err(Error::OutOfRange(
            "water: IF97 region 1 gave no finite density",
        ))
    }
}

/// Density of liquid water, kg m⁻³, at `temperature_c` (°C) and absolute
/// `pressure_pa` (Pa): `ρ = 1/v` with `v = (RT/p) π γ_π` of IAPWS-IF97 region 1
/// (release eq. 7 and Table 3).
///
/// Only `γ_π` is needed, so this is cheaper than [`region1_properties`].
///
/// # Errors
/// As [`region1_properties`].
pub fn density_kg_per_m3(temperature_c: f64, pressure_pa: f64) -> Result<f64> {
    let (t_k, p) = region1_state(temperature_c, pressure_pa)?;
    let pi = p / P_STAR_PA;
    let x = 7.1 - pi;
    let y = T_STAR_K / t_k - 1.222;
    let mut g_p = 0.0;
    for &(i, j, n) in REGION1.iter().filter(|(i, _, _)| *i != 0) {
        g_p -= n * f64::from(i) * math::powi(x, i - 1) * math::powi(y, j);
    }
    let rho = p / (GAS_CONSTANT_J_PER_KG_K * t_k * pi * g_p);
    if rho.is_finite() && rho > 0.0 {
        Ok(rho)
    } else {
        Err(Error::OutOfRange(
            "water: IF97 region 1 gave no finite density",
        ))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const K: f64 = 273.15;

    /// Relative difference.
    fn rel(a: f64, b: f64) -> f64 {
        ((a - b) / b).abs()
    }

    // Check values: IAPWS-IF97 release (R7-97, 2012), Table 5, "thermodynamic
    // property values calculated with eq. 7 for selected values of T and p",
    // printed to 9 significant digits. Tolerance 5e-9 relative: half a unit in
    // the 9th digit of the smallest printed mantissa (0.1...) is 5e-9.
    #[test]
    fn region1_matches_release_table_5() {
        // (T K, p MPa, v m3/kg, h kJ/kg, u kJ/kg, s kJ/kg/K, cp kJ/kg/K, w m/s)
        let table5 = [
            (
                300.0,
                3.0,
                0.100215168e-2,
                0.115331273e3,
                0.112324818e3,
                0.392294792,
                0.417301218e1,
                0.150773921e4,
            ),
            (
                300.0,
                80.0,
                0.971180894e-3,
                0.184142828e3,
                0.106448356e3,
                0.368563852,
                0.401008987e1,
                0.163469054e4,
            ),
            (
                500.0,
                3.0,
                0.120241800e-2,
                0.975542239e3,
                0.971934985e3,
                0.258041912e1,
                0.465580682e1,
                0.124071337e4,
            ),
        ];
        for (t, p, v, h, u, s, cp, w) in table5 {
            let r = region1_properties(t - K, p * 1e6).unwrap();
            assert!(
                rel(r.specific_volume_m3_per_kg, v) < 5e-9,
                "v at {t} K {p} MPa"
            );
            assert!(rel(r.specific_enthalpy_j_per_kg, h * 1e3) < 5e-9, "h");
            assert!(
                rel(r.specific_internal_energy_j_per_kg, u * 1e3) < 5e-9,
                "u"
            );
            assert!(rel(r.specific_entropy_j_per_kg_k, s * 1e3) < 5e-9, "s");
            assert!(
                rel(r.isobaric_heat_capacity_j_per_kg_k, cp * 1e3) < 5e-9,
                "cp"
            );
            assert!(rel(r.speed_of_sound_m_per_s, w) < 5e-9, "w");
            let rho = density_kg_per_m3(t - K, p * 1e6).unwrap();
            assert!(rel(rho, 1.0 / v) < 5e-9, "density");
        }
    }

    // Check values: IAPWS-IF97 release, Table 35 (saturation pressure from eq. 30):
    // 300 K -> 0.353658941e-2 MPa, 500 K -> 0.263889776e1 MPa,
    // 600 K -> 0.123443146e2 MPa. Same 9-digit tolerance as above.
    #[test]
    fn saturation_pressure_matches_release_table_35() {
        for (t, ps) in [
            (300.0, 0.353658941e-2),
            (500.0, 0.263889776e1),
            (600.0, 0.123443146e2),
        ] {
            let got = saturation_pressure_pa(t - K).unwrap();
            assert!(rel(got, ps * 1e6) < 5e-9, "p_s at {t} K: {got}");
        }
    }

    #[test]
    fn region1_limits() {
        // Below the saturation pressure: steam, not liquid.
        assert!(matches!(
            density_kg_per_m3(20.0, 1000.0),
            Err(Error::OutOfRange(_))
        ));
        // Water boils at 100 °C at 1 atm (p_s(373.15 K) = 101.418 kPa > 101.325 kPa).
        assert!(matches!(
            density_kg_per_m3(100.0, 101_325.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(density_kg_per_m3(99.0, 101_325.0).is_ok());
        assert!(matches!(
            density_kg_per_m3(-1.0, 101_325.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            density_kg_per_m3(351.0, 50e6),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            density_kg_per_m3(20.0, 100.1e6),
            Err(Error::OutOfRange(_))
        ));
        assert!(density_kg_per_m3(20.0, 100.0e6).is_ok());
        assert!(density_kg_per_m3(0.0, 101_325.0).is_ok());
        assert!(matches!(
            density_kg_per_m3(20.0, -1.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            density_kg_per_m3(-300.0, 1e5),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            density_kg_per_m3(f64::NAN, 1e5),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            density_kg_per_m3(20.0, f64::INFINITY),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            saturation_pressure_pa(400.0),
            Err(Error::OutOfRange(_))
        ));
    }
}
