//! Seawater: the Quan and Fry (1995) equation, with a pressure term from IAPWS.
//!
//! Source: X. Quan and E. S. Fry, "Empirical equation for the index of
//! refraction of seawater", Appl. Opt. 34, 3477–3480 (1995), a ten-coefficient fit
//! to the data selected by R. W. Austin and G. Halikas, *The index of refraction
//! of seawater*, SIO Ref. 76-1 (Scripps Institution of Oceanography, 1976):
//!
//! `n(S, T, λ) = n₀ + (n₁ + n₂T + n₃T²) S + n₄T² + (n₅ + n₆S + n₇T)/λ + n₈/λ² + n₉/λ³`
//!
//! with `T` in °C, `S` in ‰ (taken equal to PSU here), `λ` in nm, and
//! `n₀ = 1.31405`, `n₁ = 1.779 × 10⁻⁴`, `n₂ = −1.05 × 10⁻⁶`, `n₃ = 1.6 × 10⁻⁸`,
//! `n₄ = −2.02 × 10⁻⁶`, `n₅ = 15.868`, `n₆ = 0.01155`, `n₇ = −0.00423`,
//! `n₈ = −4382`, `n₉ = 1.1455 × 10⁶`.
//! Range of the fitted data: 0–30 °C, 0–35 ‰, 400–700 nm, atmospheric pressure.
//!
//! **Footing.** The Austin-Halikas data are indices relative to air (the
//! equation gives 1.3330 for fresh water at 20 °C and 589 nm, the familiar
//! relative-to-air value, where the absolute index is 1.3334), at wavelengths in
//! air. flatray therefore evaluates the equation at the wavelength in standard
//! air and multiplies by the standard-air index (see the
//! [footing](crate::media#footing) notes); the wavelength part of this
//! conversion is an assumption about the source data and moves `n` by about
//! 5 × 10⁻⁶, below the equation's accuracy.
//!
//! **Pressure.** Quan-Fry holds at atmospheric pressure. At depth flatray adds
//! the pressure dependence of pure water from IAPWS R9-97 with IF97 densities
//! ([`crate::media::water`]):
//!
//! `n_sw(T, S, λ, p) = n_QF(T, S, λ) + [n_w(T, p, λ) − n_w(T, p₀, λ)]`,
//! `p₀ = 101 325 Pa`.
//!
//! This assumes that dissolved salt changes the pressure coefficient of the
//! index only slightly; flatray does not check it against a seawater data set
//! or algorithm with explicit pressure terms (such as Millard and Seaver,
//! Deep-Sea Res. 37, 1909 (1990)). The pure-water term is about +1.5 × 10⁻⁴ per
//! 10⁶ Pa (roughly per 100 m of depth). `pressure_pa` is absolute: about
//! `101 325 + 10 070 · depth_m` Pa in the open ocean.

use crate::error::Result;
use crate::media::air::absolute_from_standard_air;
use crate::media::water::PureWater;
use crate::media::STANDARD_PRESSURE_PA;
use crate::media::{all_finite, amount_in, if97, temperature_in, wavelength_in, IndexSample};

/// Shortest wavelength of the Quan-Fry data, nm.
pub const MIN_WAVELENGTH_NM: f64 = 400.0;
/// Longest wavelength of the Quan-Fry data, nm.
pub const MAX_WAVELENGTH_NM: f64 = 700.0;
/// Lowest temperature of the Quan-Fry data, °C.
pub const MIN_TEMPERATURE_C: f64 = 0.0;
/// Highest temperature of the Quan-Fry data, °C.
pub const MAX_TEMPERATURE_C: f64 = 30.0;
/// Highest salinity of the Quan-Fry data, PSU (‰).
pub const MAX_SALINITY_PSU: f64 = 35.0;

const N: [f64; 10] = [
    1.31405, 1.779e-4, -1.05e-6, 1.6e-8, -2.02e-6, 15.868, 0.01155, -0.00423, -4382.0, 1.1455e6,
];

/// Quan-Fry without range checks: `(n, dn/dλ)` with `λ` in nm, relative to air.
fn quan_fry(t: f64, s: f64, wavelength_nm: f64) -> (f64, f64) {
    let [n0, n1, n2, n3, n4, n5, n6, n7, n8, n9] = N;
    let inv = 1.0 / wavelength_nm;
    let b = n5 + n6 * s + n7 * t;
    let n = n0 + (n1 + n2 * t + n3 * t * t) * s + n4 * t * t + inv * (b + inv * (n8 + inv * n9));
    let dn = -inv * inv * (b + inv * (2.0 * n8 + inv * 3.0 * n9));
    (n, dn)
}

/// Checks temperature and salinity against the Quan-Fry range.
fn check_t_s(temperature_c: f64, salinity_psu: f64) -> Result<(f64, f64)> {
    let t = temperature_in(
        temperature_c,
        MIN_TEMPERATURE_C,
        MAX_TEMPERATURE_C,
        "seawater: temperature_c outside 0 to 30 °C (Quan and Fry 1995)",
    )?;
    let s = amount_in(
        salinity_psu,
        0.0,
        MAX_SALINITY_PSU,
        "seawater: salinity_psu must be finite",
        "seawater: salinity_psu outside 0 to 35 (Quan and Fry 1995)",
    )?;
    Ok((t, s))
}

/// The Quan-Fry equation exactly as published: the index **relative to air**
/// at `air_wavelength_nm` (the wavelength in air, nm), `temperature_c` (°C) and
/// `salinity_psu` (‰), atmospheric pressure. See the module docs.
///
/// # Errors
/// [`Error::InvalidArgument`](crate::Error::InvalidArgument) for a non-finite input;
/// [`Error::OutOfRange`](crate::Error::OutOfRange) outside 0–30 °C, 0–35 PSU or 400–700 nm.
pub fn quan_fry_relative_to_air(
    temperature_c: f64,
    salinity_psu: f64,
    air_wavelength_nm: f64,
) -> Result<f64> {
    all_finite(
        &[temperature_c, salinity_psu, air_wavelength_nm],
        "seawater: temperature_c, salinity_psu and the wavelength must be finite",
    )?;
    let (t, s) = check_t_s(temperature_c, salinity_psu)?;
    let l = wavelength_in(
        air_wavelength_nm,
        MIN_WAVELENGTH_NM,
        MAX_WAVELENGTH_NM,
        "seawater: wavelength outside 400 to 700 nm (Quan and Fry 1995)",
    )?;
    Ok(quan_fry(t, s, l).0)
}

/// Seawater of given temperature, salinity and absolute pressure (Quan-Fry at
/// the surface plus the IAPWS pure-water pressure term; see the module docs).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Seawater {
    /// Temperature, °C (0 to 30).
    pub temperature_c: f64,
    /// Practical salinity, PSU (0 to 35).
    pub salinity_psu: f64,
    /// Absolute pressure, Pa: [`STANDARD_PRESSURE_PA`] at the surface, up to
    /// 100 MPa (IAPWS-IF97 region 1).
    pub pressure_pa: f64,
}

impl Seawater {
    /// Seawater at the surface (101 325 Pa).
    pub const fn new(temperature_c: f64, salinity_psu: f64) -> Seawater {
        Seawater {
            temperature_c,
            salinity_psu,
            pressure_pa: STANDARD_PRESSURE_PA,
        }
    }

    /// The same water at absolute `pressure_pa` (Pa).
    pub const fn with_pressure(self, pressure_pa: f64) -> Seawater {
        Seawater {
            pressure_pa,
            ..self
        }
    }

    /// Index and slope at a vacuum wavelength.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`](crate::Error::InvalidArgument) for a non-finite input;
    /// [`Error::OutOfRange`](crate::Error::OutOfRange) outside 0–30 °C, 0–35 PSU, 400–700 nm or
    /// 0–100 MPa, or below the saturation pressure of water.
    pub fn sample(&self, wavelength_nm: f64) -> Result<IndexSample> {
        all_finite(
            &[
                self.temperature_c,
                self.salinity_psu,
                self.pressure_pa,
                wavelength_nm,
            ],
            "seawater: every condition and the wavelength must be finite",
        )?;
        let (t, s) = check_t_s(self.temperature_c, self.salinity_psu)?;
        let l = wavelength_in(
            wavelength_nm,
            MIN_WAVELENGTH_NM,
            MAX_WAVELENGTH_NM,
            "seawater: wavelength_nm outside 400 to 700 nm (Quan and Fry 1995)",
        )?;
        let p = amount_in(
            self.pressure_pa,
            0.0,
            if97::MAX_PRESSURE_PA,
            "seawater: pressure_pa must be finite (absolute pressure)",
            "seawater: pressure_pa outside 0 to 100 MPa (IAPWS-IF97 region 1)",
        )?;
        // The equation's range is checked on the vacuum wavelength; the air
        // wavelength is 0.03 % shorter, well inside the fitted data's spread.
        let surface = absolute_from_standard_air(l, |la| Ok(quan_fry(t, s, la)))?;
        if p == STANDARD_PRESSURE_PA {
            return Ok(surface);
        }
        let deep = PureWater::new(t, p).sample(l)?;
        let shallow = PureWater::new(t, STANDARD_PRESSURE_PA).sample(l)?;
        IndexSample {
            wavelength_nm: l,
            index: surface.index + (deep.index - shallow.index),
            dn_dwavelength_per_nm: surface.dn_dwavelength_per_nm
                + (deep.dn_dwavelength_per_nm - shallow.dn_dwavelength_per_nm),
        }
        .checked("seawater: no finite index")
    }

    /// Absolute (phase) refractive index at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Seawater::sample`].
    pub fn refractive_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.index)
    }

    /// Group index `n − λ dn/dλ` at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Seawater::sample`].
    pub fn group_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.group_index())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::Error;
    use crate::media::air::standard_air_index;
    use crate::media::testutil::check_slope;

    // Hand values from the published coefficients (Quan and Fry 1995, eq. 1),
    // worked with exact decimal arithmetic (mpmath, 30 digits):
    //   T = 20, S = 0,  λ = 589.3: 1.33300443427695
    //   T = 0,  S = 35, λ = 400:   1.3514680625 (exact)
    //   T = 30, S = 35, λ = 700:   1.3353215787172
    // The equation is printed to 5-6 significant digits, so these only check the
    // copying of the coefficients; tolerance 1e-9 (double rounding).
    #[test]
    fn quan_fry_hand_values() {
        let cases = [
            (20.0, 0.0, 589.3, 1.333_004_434_276_95),
            (0.0, 35.0, 400.0, 1.351_468_062_5),
            (30.0, 35.0, 700.0, 1.335_321_578_717_2),
        ];
        for (t, s, l, want) in cases {
            let got = quan_fry_relative_to_air(t, s, l).unwrap();
            assert!((got - want).abs() < 1e-9, "{t} {s} {l}: {got} vs {want}");
        }
    }

    // Common practice: 35 PSU seawater is about 0.0064 above fresh water at
    // 20 °C (visible light). Checked to ±0.0002 at the sodium line.
    #[test]
    fn salt_raises_index_by_about_0_0064() {
        let fresh = Seawater::new(20.0, 0.0).refractive_index(589.3).unwrap();
        let sea = Seawater::new(20.0, 35.0).refractive_index(589.3).unwrap();
        assert!(((sea - fresh) - 0.0064).abs() < 0.0002, "{}", sea - fresh);
    }

    // Footing conversion: absolute index at vacuum wavelength λ equals the
    // standard-air index times the published (relative) value at λ / n_air.
    #[test]
    fn absolute_is_air_index_times_relative_at_air_wavelength() {
        let l = 532.0;
        let n_air = standard_air_index(l).unwrap();
        let rel = quan_fry_relative_to_air(10.0, 35.0, l / n_air).unwrap();
        let abs = Seawater::new(10.0, 35.0).refractive_index(l).unwrap();
        assert!((abs - n_air * rel).abs() < 1e-14);
        assert!(
            (abs - rel - 3.7e-4).abs() < 0.2e-4,
            "footing moves n by ~n_air-1 times n"
        );
    }

    #[test]
    fn pressure_term_is_the_pure_water_difference() {
        let surface = Seawater::new(4.0, 35.0);
        let deep = surface.with_pressure(STANDARD_PRESSURE_PA + 20e6);
        let dn = deep.refractive_index(532.0).unwrap() - surface.refractive_index(532.0).unwrap();
        let w_deep = PureWater::new(4.0, STANDARD_PRESSURE_PA + 20e6).refractive_index(532.0);
        let w_surf = PureWater::at_surface(4.0).refractive_index(532.0);
        assert!((dn - (w_deep.unwrap() - w_surf.unwrap())).abs() < 1e-14);
        // About 1.5e-4 per MPa near the surface (IAPWS R9-97 with IF97; common
        // practice quotes ~1.5e-5 per bar): 20 MPa gives ~3e-3.
        assert!(dn > 2.5e-3 && dn < 3.5e-3, "{dn}");
    }

    #[test]
    fn group_index_near_532_matches_finite_difference() {
        for w in [
            Seawater::new(4.0, 35.0),
            Seawater::new(25.0, 10.0).with_pressure(5e7),
        ] {
            for l in [401.0, 520.0, 532.0, 545.0, 699.0] {
                check_slope(|x| w.sample(x), l);
            }
        }
    }

    #[test]
    fn rejects_bad_input() {
        let ok = Seawater::new(10.0, 35.0);
        assert!(matches!(
            ok.refractive_index(f64::NAN),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            ok.refractive_index(-1.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            ok.refractive_index(390.0),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            ok.refractive_index(710.0),
            Err(Error::OutOfRange(_))
        ));
        let bad = |w: Seawater| w.refractive_index(532.0);
        assert!(matches!(
            bad(Seawater::new(-1.0, 35.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Seawater::new(31.0, 35.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Seawater::new(10.0, 36.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Seawater::new(10.0, -1.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(Seawater::new(10.0, f64::NAN)),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            bad(ok.with_pressure(-5.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(ok.with_pressure(2e8)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            bad(ok.with_pressure(100.0)),
            Err(Error::OutOfRange(_))
        ));
        assert!(matches!(
            quan_fry_relative_to_air(10.0, 35.0, 800.0),
            Err(Error::OutOfRange(_))
        ));
    }
}
