//! Refractive-index models of the media flatray looks through, their group
//! indices, and a builder that turns media plus conditions into a
//! [`Stack`](crate::Stack).
//!
//! | medium | model | module | validity |
//! | --- | --- | --- | --- |
//! | air | Ciddor (1996) | [`air`](crate::media::air) | −40…100 °C, 10…140 kPa, RH 0…1, CO₂ 0…2000 ppm, 300…1700 nm |
//! | pure water | IAPWS R9-97 with IAPWS-IF97 region-1 density | [`water`](crate::media::water), [`if97`](crate::media::if97) | 0…350 °C, p_s(T)…100 MPa, 200…1100 nm |
//! | seawater | Quan & Fry (1995) plus the IAPWS pressure term | [`seawater`](crate::media::seawater) | 0…30 °C, 0…35 PSU, 400…700 nm, p_s(T)…100 MPa |
//! | window materials | published dispersion fits | [`materials`](crate::media::materials) | per material |
//! | user formulas | 3-term Sellmeier, Cauchy | [`dispersion`](crate::media::dispersion) | as the user states |
//!
//! # Footing
//!
//! Every index returned here is **absolute** (relative to vacuum) and every
//! `wavelength_nm` is a **vacuum** wavelength in nanometres. Most published
//! dispersion fits for glasses, crystals and polymers, and the Quan-Fry seawater
//! equation, give the index relative to the surrounding air at wavelengths
//! measured in that air. flatray converts such a fit on the footing of
//! *standard air* (dry air at 15 °C, 101 325 Pa, 450 ppm CO₂, the reference air of
//! Ciddor 1996, eq. 1; see [`air::standard_air_index`](crate::media::air::standard_air_index)):
//!
//! `n_abs(λ) = n_std(λ) · n_rel(λ / n_std(λ))`
//!
//! with `λ` the vacuum wavelength and `λ / n_std(λ)` the wavelength in standard
//! air. The factor `n_std ≈ 1.000 277` is larger than the accuracy of any model
//! here; the wavelength shift (about 0.16 nm at 589 nm) matters at the 10⁻⁵ level
//! only for the most dispersive media. Which footing each source uses is stated on
//! its model.
//!
//! # Group index
//!
//! Every model evaluates its index and the analytic derivative `dn/dλ`
//! ([`IndexSample`]); the group index is `n_g = n − λ dn/dλ`.
//!
//! # Errors
//!
//! One rule for every model's conditions and wavelength, the same in Rust, C and
//! Python:
//!
//! * [`Error::InvalidArgument`]: a NaN or infinite input (and, for user
//!   formulas, non-finite coefficients or a malformed wavelength range).
//! * [`Error::OutOfRange`]: any finite input outside the model's range of
//!   validity (each model states its range) — a wavelength ≤ 0, a temperature
//!   below absolute zero and a negative pressure, salinity, humidity, CO₂
//!   fraction or density included — or a state the model does not describe
//!   (water below its boiling pressure, a user formula with no real index).

use crate::error::{Error, Result};

pub mod air;
pub mod builder;
pub mod dispersion;
pub mod if97;
pub mod materials;
pub mod seawater;
pub mod water;

pub use air::{standard_air_index, Air, DEFAULT_CO2_PPM};
pub use builder::{Medium, MediumLayer, StackBuilder};
pub use dispersion::{Cauchy, Footing, Sellmeier};
pub use materials::Material;
pub use seawater::Seawater;
pub use water::PureWater;

/// One standard atmosphere, Pa: the default pressure of air and water at the
/// surface.
pub const STANDARD_PRESSURE_PA: f64 = 101_325.0;

/// Celsius to kelvin offset (ITS-90: 0 °C = 273.15 K).
pub(crate) const KELVIN_OFFSET: f64 = 273.15;

/// Fraunhofer d line (helium), nm in standard air: the usual reference
/// wavelength of catalogue indices `n_d`.
pub const D_LINE_AIR_NM: f64 = 587.5618;
/// Fraunhofer F line (hydrogen), nm in standard air.
pub const F_LINE_AIR_NM: f64 = 486.1327;
/// Fraunhofer C line (hydrogen), nm in standard air.
pub const C_LINE_AIR_NM: f64 = 656.2725;

/// A refractive index and its slope at one vacuum wavelength.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct IndexSample {
    /// Vacuum wavelength, nm.
    pub wavelength_nm: f64,
    /// Absolute (phase) refractive index `n`.
    pub index: f64,
    /// `dn/dλ`, per nm of vacuum wavelength.
    pub dn_dwavelength_per_nm: f64,
}

impl IndexSample {
    /// Group index `n_g = n − λ dn/dλ` (λ the vacuum wavelength): the ratio of
    /// the vacuum speed of light to the speed of a pulse in the medium.
    #[inline]
    pub fn group_index(&self) -> f64 {
        self.index - self.wavelength_nm * self.dn_dwavelength_per_nm
    }

    /// `Err(OutOfRange)` unless index and slope are finite and the index > 0.
    pub(crate) fn checked(self, what: &'static str) -> Result<IndexSample> {
        if self.index.is_finite() && self.index > 0.0 && self.dn_dwavelength_per_nm.is_finite() {
            Ok(self)
        } else {
            Err(Error::OutOfRange(what))
        }
    }
}

/// `t_c + 273.15`.
#[inline]
pub(crate) fn kelvin(t_c: f64) -> f64 {
    t_c + KELVIN_OFFSET
}

/// `Err(InvalidArgument(what))` unless every value is finite: checked before
/// any range, so that a NaN or infinite argument is `InvalidArgument` whatever
/// the others hold (a finite value out of range next to it does not turn it
/// into `OutOfRange`).
pub(crate) fn all_finite(values: &[f64], what: &'static str) -> Result<()> {
    if values.iter().all(|v| v.is_finite()) {
        Ok(())
    } else {
        Err(Error::InvalidArgument(what))
    }
}

/// A temperature within `[lo, hi]` °C: non-finite is `InvalidArgument`; any
/// finite value outside the range (below absolute zero included) is
/// `OutOfRange(range_msg)`.
pub(crate) fn temperature_in(t_c: f64, lo: f64, hi: f64, range_msg: &'static str) -> Result<f64> {
    if !t_c.is_finite() {
        return Err(Error::InvalidArgument("temperature_c must be finite"));
    }
    if t_c < lo || t_c > hi {
        return Err(Error::OutOfRange(range_msg));
    }
    Ok(t_c)
}

/// A quantity within `[lo, hi]`: non-finite is `InvalidArgument(invalid_msg)`;
/// any finite value outside the range (a negative one included) is
/// `OutOfRange(range_msg)`.
pub(crate) fn amount_in(
    x: f64,
    lo: f64,
    hi: f64,
    invalid_msg: &'static str,
    range_msg: &'static str,
) -> Result<f64> {
    if !x.is_finite() {
        return Err(Error::InvalidArgument(invalid_msg));
    }
    if x < lo || x > hi {
        return Err(Error::OutOfRange(range_msg));
    }
    Ok(x)
}

/// A wavelength within `[lo, hi]` nm: non-finite is `InvalidArgument`; any
/// finite value outside the range (zero and negative values included) is
/// `OutOfRange(range_msg)`.
pub(crate) fn wavelength_in(
    wavelength_nm: f64,
    lo: f64,
    hi: f64,
    range_msg: &'static str,
) -> Result<f64> {
    if !wavelength_nm.is_finite() {
        return Err(Error::InvalidArgument("wavelength_nm must be finite"));
    }
    if wavelength_nm <= 0.0 || wavelength_nm < lo || wavelength_nm > hi {
        return Err(Error::OutOfRange(range_msg));
    }
    Ok(wavelength_nm)
}

#[cfg(test)]
pub(crate) mod testutil {
    //! Shared helpers of the media unit tests.

    use super::IndexSample;
    use crate::error::Result;

    /// Central-difference check of an analytic slope.
    ///
    /// Step `h = 0.01 nm`. The truncation error of the central difference is
    /// `h² |n'''| / 6`: for the most dispersive cases here (water and sapphire
    /// near 200 nm, `|n'''|` about 2e-6 nm⁻³, computed with mpmath) about 4e-11
    /// per nm, 2e-8 of the slope there (~2e-3 per nm); for water at 532 nm
    /// (`|n'''|` ≈ 1.8e-9 nm⁻³) about
    /// 3e-14 per nm. The rounding error is `ε n / h ≈ 2.2e-16 · 1.8 / 0.01 ≈ 4e-14`
    /// per nm. The tolerance `1e-6 |slope| + 1e-12` per nm covers both with a wide
    /// margin and still catches any wrong term in a derivative (air slopes of
    /// ~1.5e-8 per nm are checked to ~1e-4 relative). The group index then agrees
    /// to `λ · tol`.
    pub fn check_slope(f: impl Fn(f64) -> Result<IndexSample>, wavelength_nm: f64) {
        let h = 0.01;
        let s = f(wavelength_nm).unwrap();
        let up = f(wavelength_nm + h).unwrap().index;
        let down = f(wavelength_nm - h).unwrap().index;
        let fd = (up - down) / (2.0 * h);
        let tol = 1e-6 * s.dn_dwavelength_per_nm.abs() + 1e-12;
        assert!(
            (s.dn_dwavelength_per_nm - fd).abs() < tol,
            "slope at {wavelength_nm} nm: analytic {} vs difference {fd}",
            s.dn_dwavelength_per_nm
        );
        let ng_fd = s.index - wavelength_nm * fd;
        assert!((s.group_index() - ng_fd).abs() <= wavelength_nm * tol);
    }
}
