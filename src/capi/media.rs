//! Refractive indices of the media flatray looks through (issue 3): pure water,
//! seawater, air, window materials and user Sellmeier/Cauchy formulas, as phase
//! and group indices.
//!
//! The physics is in [`crate::media`]; these wrappers check pointers, convert
//! enum codes and write one `double`.
//!
//! # Conventions of every function here
//!
//! * Indices are **absolute** (relative to vacuum) and `wavelength_nm` is the
//!   **vacuum** wavelength in nanometres. Temperatures in °C, pressures absolute
//!   in Pa (101 325 Pa at sea level), salinity practical (PSU), relative
//!   humidity a fraction 0…1.
//! * A NaN or infinite argument is `FLATRAY_ERR_INVALID_ARGUMENT` (checked
//!   before any range, so whatever the other arguments hold); a finite
//!   argument outside the model's range of validity (a wavelength ≤ 0, a negative
//!   pressure or salinity and a temperature below absolute zero included) is
//!   `FLATRAY_ERR_OUT_OF_RANGE`. An unknown `material` or `footing` code is
//!   `FLATRAY_ERR_INVALID_ARGUMENT`. On every error a non-NULL `out_n` is set to
//!   NaN.
//! * Group index: `n_g = n − λ dn/dλ` (λ the vacuum wavelength), from the
//!   analytic derivative of each model: the ratio of the vacuum speed of light to
//!   the speed of a pulse, what laser ranging through a medium needs.
//!
//! # User formulas and their footing
//!
//! `flatray_index_sellmeier` and `flatray_index_cauchy` (and their group-index
//! twins) take coefficients **as window and glass makers publish them: relative
//! to air, with λ the wavelength in air** — flatray reads them on the footing of
//! standard air (dry, 15 °C, 101 325 Pa, 450 ppm CO₂; Ciddor 1996 eq. 1) and
//! returns the absolute index at the vacuum wavelength,
//! `n(λ) = n_std(λ) · n_formula(λ / n_std(λ))`. They accept every vacuum
//! wavelength from 200 nm (below it flatray does not convert from standard air)
//! at which the formula gives a real, positive index; staying inside the
//! wavelength range the coefficients were fitted over is the caller's part.
//! `flatray_sample_sellmeier` and `flatray_sample_cauchy` take the footing
//! (`FLATRAY_FOOTING_VACUUM` for formulas that already give absolute indices at
//! vacuum wavelengths) and a wavelength range that flatray then enforces.
//!
//! # Seawater at depth
//!
//! `flatray_index_seawater` (Quan and Fry 1995) is seawater at the surface,
//! 101 325 Pa. `flatray_index_seawater_at_pressure` adds the pressure term
//! flatray uses in Rust and Python, the pure-water difference from IAPWS R9-97:
//! `n(T, S, p, λ) = n_sea(T, S, λ) + n_water(T, p, λ) − n_water(T, 101 325 Pa, λ)`
//! (about +1.5 × 10⁻⁴ per MPa, i.e. per ~100 m of depth). A caller can form
//! the same sum from the two surface functions.

use super::{deliver, guard, required, required_out, FlatrayStatus};
use crate::media::{
    water, Air, Cauchy, Footing, IndexSample, Material, PureWater, Seawater, Sellmeier,
    STANDARD_PRESSURE_PA,
};

/// A window or wall material with a built-in dispersion formula (passed to
/// functions as `int32_t`). The values are fixed and never renumbered.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[repr(C)]
pub enum FlatrayMaterial {
    /// Fused silica, Malitson (1965); 210–3710 nm.
    FLATRAY_MATERIAL_FUSED_SILICA = 0,
    /// Sapphire, ordinary ray, Malitson and Dodge (1972); 200–5000 nm.
    FLATRAY_MATERIAL_SAPPHIRE_ORDINARY = 1,
    /// PMMA (acrylic), fitted to Sultanova et al. (2009); 400–1060 nm.
    FLATRAY_MATERIAL_PMMA = 2,
    /// Polycarbonate, fitted to Sultanova et al. (2009); 400–1060 nm.
    FLATRAY_MATERIAL_POLYCARBONATE = 3,
    /// Soda-lime-silica window glass, Rubin (1985); 320–4600 nm.
    FLATRAY_MATERIAL_SODA_LIME_GLASS = 4,
}

// The C codes are the Rust codes.
const _: () = {
    assert!(FlatrayMaterial::FLATRAY_MATERIAL_FUSED_SILICA as i32 == Material::FusedSilica.code());
    assert!(
        FlatrayMaterial::FLATRAY_MATERIAL_SAPPHIRE_ORDINARY as i32
            == Material::SapphireOrdinary.code()
    );
    assert!(FlatrayMaterial::FLATRAY_MATERIAL_PMMA as i32 == Material::Pmma.code());
    assert!(
        FlatrayMaterial::FLATRAY_MATERIAL_POLYCARBONATE as i32 == Material::Polycarbonate.code()
    );
    assert!(
        FlatrayMaterial::FLATRAY_MATERIAL_SODA_LIME_GLASS as i32 == Material::SodaLimeGlass.code()
    );
};

/// What a user dispersion formula's index and wavelength are relative to
/// (passed to functions as `int32_t`).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[repr(C)]
pub enum FlatrayFooting {
    /// Absolute index at vacuum wavelengths.
    FLATRAY_FOOTING_VACUUM = 0,
    /// Index relative to standard air at wavelengths in standard air, as in
    /// glass catalogues (the footing of `flatray_index_sellmeier`).
    FLATRAY_FOOTING_STANDARD_AIR = 1,
}

const _: () = {
    assert!(FlatrayFooting::FLATRAY_FOOTING_VACUUM as i32 == Footing::Vacuum.code());
    assert!(FlatrayFooting::FLATRAY_FOOTING_STANDARD_AIR as i32 == Footing::StandardAir.code());
};

/// A material code, or `FLATRAY_ERR_INVALID_ARGUMENT`.
fn material_from(code: i32) -> Result<Material, FlatrayStatus> {
    Material::from_code(code).ok_or(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT)
}

/// A footing code, or `FLATRAY_ERR_INVALID_ARGUMENT`.
fn footing_from(code: i32) -> Result<Footing, FlatrayStatus> {
    Footing::from_code(code).ok_or(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT)
}

/// Phase or group index of a sample.
#[derive(Clone, Copy)]
enum Kind {
    Phase,
    Group,
}

impl Kind {
    fn of(self, s: IndexSample) -> f64 {
        match self {
            Kind::Phase => s.index,
            Kind::Group => s.group_index(),
        }
    }
}

/// Evaluate `sample` and write the phase or group index to the required `out`
/// (NaN on error).
unsafe fn write_index(
    out: *mut f64,
    kind: Kind,
    sample: impl FnOnce() -> Result<IndexSample, FlatrayStatus>,
) -> Result<(), FlatrayStatus> {
    // SAFETY: forwarded caller contract (NULL or writable).
    let out = unsafe { required_out(out) }?;
    deliver(out, f64::NAN, sample().map(|s| kind.of(s)))
}

/// The three coefficients behind a required `const double[3]` pointer.
unsafe fn three(ptr: *const f64) -> Result<[f64; 3], FlatrayStatus> {
    // SAFETY: forwarded caller contract (NULL or valid for reading 3 doubles;
    // `[f64; 3]` has the alignment of `f64`).
    unsafe { required(ptr.cast::<[f64; 3]>()) }.copied()
}

/// A standard-air-footing Sellmeier formula from C pointers.
unsafe fn catalogue_sellmeier(
    b: *const f64,
    c_um2: *const f64,
) -> Result<Sellmeier, FlatrayStatus> {
    // SAFETY: forwarded caller contract.
    let (b, c) = unsafe { (three(b)?, three(c_um2)?) };
    Ok(Sellmeier::new(b, c, Footing::StandardAir))
}

/// Pure water: IAPWS R9-97 with the IAPWS-IF97 region-1 density.
///
/// `temperature_c` 0–350 °C, absolute `pressure_pa` from the saturation
/// (boiling) pressure to 100 MPa (101 325 Pa at the surface; add about 9.8 kPa
/// per metre of fresh water), `wavelength_nm` 200–1100 nm (vacuum). Writes the
/// absolute phase index.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `out_n` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: an argument is NaN or infinite.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: an argument outside the ranges above, or a
///   pressure below the boiling pressure at that temperature.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_index_pure_water(
    temperature_c: f64,
    pressure_pa: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Phase, || {
                Ok(PureWater::new(temperature_c, pressure_pa).sample(wavelength_nm)?)
            })
        }
    })
}

/// Group index `n − λ dn/dλ` of pure water (model and ranges as
/// `flatray_index_pure_water`).
///
/// # Returns
/// As `flatray_index_pure_water`.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_group_index_pure_water(
    temperature_c: f64,
    pressure_pa: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Group, || {
                Ok(PureWater::new(temperature_c, pressure_pa).sample(wavelength_nm)?)
            })
        }
    })
}

/// Water of known density (extension): IAPWS R9-97 itself, for callers with
/// their own equation of state (supercooled water included).
///
/// `temperature_c` −12 to 500 °C, `density_kg_per_m3` 0–1060 kg m⁻³,
/// `wavelength_nm` 200–1100 nm (vacuum): the release's range. Writes the
/// absolute phase index.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `out_n` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: an argument is NaN or infinite.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: an argument outside the ranges above.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_index_water_at_density(
    temperature_c: f64,
    density_kg_per_m3: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Phase, || {
                Ok(water::sample_at_density(
                    temperature_c,
                    density_kg_per_m3,
                    wavelength_nm,
                )?)
            })
        }
    })
}

/// Seawater at the surface (101 325 Pa): Quan and Fry (1995), converted to an
/// absolute index at the vacuum wavelength on the standard-air footing.
///
/// `temperature_c` 0–30 °C, `salinity_psu` 0–35 (practical salinity),
/// `wavelength_nm` 400–700 nm (vacuum). For water at depth see
/// `flatray_index_seawater_at_pressure`.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `out_n` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: an argument is NaN or infinite.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: an argument outside the ranges above.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_index_seawater(
    temperature_c: f64,
    salinity_psu: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Phase, || {
                Ok(Seawater::new(temperature_c, salinity_psu).sample(wavelength_nm)?)
            })
        }
    })
}

/// Group index of seawater at the surface (model and ranges as
/// `flatray_index_seawater`).
///
/// # Returns
/// As `flatray_index_seawater`.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_group_index_seawater(
    temperature_c: f64,
    salinity_psu: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Group, || {
                Ok(Seawater::new(temperature_c, salinity_psu).sample(wavelength_nm)?)
            })
        }
    })
}

/// Seawater at absolute `pressure_pa` (extension): the surface value of
/// `flatray_index_seawater` plus the pure-water pressure term
/// `n_water(T, p, λ) − n_water(T, 101 325 Pa, λ)` (IAPWS R9-97 with IF97
/// densities). `pressure_pa` from the saturation pressure of water to 100 MPa,
/// about `101 325 + 10 070 · depth_m` Pa in the open ocean; the other ranges as
/// `flatray_index_seawater`. At exactly 101 325 Pa the result equals
/// `flatray_index_seawater`.
///
/// # Returns
/// As `flatray_index_seawater`, `FLATRAY_ERR_OUT_OF_RANGE` also for a pressure
/// outside its range.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_index_seawater_at_pressure(
    temperature_c: f64,
    salinity_psu: f64,
    pressure_pa: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Phase, || {
                Ok(Seawater::new(temperature_c, salinity_psu)
                    .with_pressure(pressure_pa)
                    .sample(wavelength_nm)?)
            })
        }
    })
}

/// Group index of seawater at absolute `pressure_pa` (extension; model and
/// ranges as `flatray_index_seawater_at_pressure`).
///
/// # Returns
/// As `flatray_index_seawater_at_pressure`.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_group_index_seawater_at_pressure(
    temperature_c: f64,
    salinity_psu: f64,
    pressure_pa: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Group, || {
                Ok(Seawater::new(temperature_c, salinity_psu)
                    .with_pressure(pressure_pa)
                    .sample(wavelength_nm)?)
            })
        }
    })
}

/// A built-in window material (`material` is a `FlatrayMaterial` value),
/// converted from its source's air footing to the absolute index at the vacuum
/// `wavelength_nm`. Each material's wavelength range is in `FlatrayMaterial`
/// and `flatray_material_wavelength_range`.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `out_n` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: unknown `material`, or a NaN or infinite
///   wavelength.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: a wavelength outside the material's range.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_index_material(
    material: i32,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Phase, || {
                Ok(material_from(material)?.sample(wavelength_nm)?)
            })
        }
    })
}

/// Group index of a built-in window material (extension; as
/// `flatray_index_material`).
///
/// # Returns
/// As `flatray_index_material`.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_group_index_material(
    material: i32,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Group, || {
                Ok(material_from(material)?.sample(wavelength_nm)?)
            })
        }
    })
}

/// The vacuum wavelengths, nm, over which a built-in material's formula is
/// valid (extension).
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `out_min_nm` or `out_max_nm` is NULL (the
///   other, when not NULL, is set to NaN).
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: unknown `material` (both set to NaN).
///
/// # Safety
/// `out_min_nm`, `out_max_nm`: NULL or valid for writing one `double` each.
#[no_mangle]
pub unsafe extern "C" fn flatray_material_wavelength_range(
    material: i32,
    out_min_nm: *mut f64,
    out_max_nm: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for both pointers.
        let (lo, hi) = unsafe { (out_min_nm.as_mut(), out_max_nm.as_mut()) };
        let range = match (&lo, &hi) {
            (Some(_), Some(_)) => material_from(material).map(Material::wavelength_range_nm),
            _ => Err(FlatrayStatus::FLATRAY_ERR_NULL_POINTER),
        };
        let (min, max) = *range.as_ref().unwrap_or(&(f64::NAN, f64::NAN));
        if let Some(lo) = lo {
            *lo = min;
        }
        if let Some(hi) = hi {
            *hi = max;
        }
        range.map(|_| ())
    })
}

/// A user three-term Sellmeier formula `n² = 1 + Σ bᵢ λ²/(λ² − cᵢ)` (λ in µm,
/// `c_um2` in µm²; unused terms have `bᵢ = 0`), with coefficients **as catalogues
/// publish them: relative to air at wavelengths in air**. flatray reads them on
/// the footing of standard air (dry, 15 °C, 101 325 Pa, 450 ppm CO₂; its index
/// `n_std` from Ciddor 1996 eq. 1) and writes the absolute index at the vacuum
/// `wavelength_nm`, `n_std(λ) · n_formula(λ / n_std(λ))`. Accepts every vacuum wavelength from
/// 200 nm at which the formula gives a real positive index; keeping to the
/// coefficients' fitted range is the caller's part (`flatray_sample_sellmeier`
/// enforces a range and takes other footings).
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `b`, `c_um2` or `out_n` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: a coefficient or the wavelength is NaN or
///   infinite.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: a wavelength below 200 nm, or one at which the
///   formula gives no real positive index (at or beyond a resonance).
///
/// # Safety
/// `b`, `c_um2`: NULL or valid for reading 3 `double`s each; `out_n`: NULL or
/// valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_index_sellmeier(
    b: *const f64,
    c_um2: *const f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        unsafe {
            write_index(out_n, Kind::Phase, || {
                Ok(catalogue_sellmeier(b, c_um2)?.sample(wavelength_nm)?)
            })
        }
    })
}

/// Group index of a user Sellmeier formula (extension; footing, wavelengths and
/// errors as `flatray_index_sellmeier`).
///
/// # Returns
/// As `flatray_index_sellmeier`.
///
/// # Safety
/// As `flatray_index_sellmeier`.
#[no_mangle]
pub unsafe extern "C" fn flatray_group_index_sellmeier(
    b: *const f64,
    c_um2: *const f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        unsafe {
            write_index(out_n, Kind::Group, || {
                Ok(catalogue_sellmeier(b, c_um2)?.sample(wavelength_nm)?)
            })
        }
    })
}

/// A user Cauchy formula `n = a + b/λ² + c/λ⁴` (λ in µm, `b_um2` in µm²,
/// `c_um4` in µm⁴), with coefficients relative to air at wavelengths in air, as
/// published: read on the standard-air footing, like `flatray_index_sellmeier`,
/// and written as the absolute index at the vacuum `wavelength_nm` (200 nm and
/// up, where the formula gives a positive index).
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `out_n` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: a coefficient or the wavelength is NaN or
///   infinite.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: a wavelength below 200 nm, or a formula value
///   that is not a positive index.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_index_cauchy(
    a: f64,
    b_um2: f64,
    c_um4: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Phase, || {
                Ok(Cauchy::new(a, b_um2, c_um4, Footing::StandardAir).sample(wavelength_nm)?)
            })
        }
    })
}

/// Group index of a user Cauchy formula (extension; as `flatray_index_cauchy`).
///
/// # Returns
/// As `flatray_index_cauchy`.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_group_index_cauchy(
    a: f64,
    b_um2: f64,
    c_um4: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Group, || {
                Ok(Cauchy::new(a, b_um2, c_um4, Footing::StandardAir).sample(wavelength_nm)?)
            })
        }
    })
}

/// Write a formula's sample: `out_n` required, `out_group_n` optional.
unsafe fn write_sample(
    out_n: *mut f64,
    out_group_n: *mut f64,
    sample: impl FnOnce() -> Result<IndexSample, FlatrayStatus>,
) -> Result<(), FlatrayStatus> {
    // SAFETY: forwarded caller contract (NULL or writable).
    let group = unsafe { out_group_n.as_mut() };
    let result = unsafe { required_out(out_n) }.and_then(|out| {
        let s = sample();
        *out = s.as_ref().map_or(f64::NAN, |s| s.index);
        s
    });
    if let Some(g) = group {
        *g = result.as_ref().map_or(f64::NAN, |s| s.group_index());
    }
    result.map(|_| ())
}

/// A user Sellmeier formula with every option (extension): `footing` is a
/// `FlatrayFooting` value (`FLATRAY_FOOTING_STANDARD_AIR` as
/// `flatray_index_sellmeier`, or `FLATRAY_FOOTING_VACUUM` for coefficients that
/// give absolute indices at vacuum wavelengths), and flatray enforces the vacuum
/// wavelength range `min_wavelength_nm..=max_wavelength_nm` (`max` may be
/// `INFINITY` for no upper limit; on the standard-air footing wavelengths below
/// 200 nm are out of range whatever the range says). Writes the phase index to
/// `out_n` and, when `out_group_n` is not NULL, the group index to it.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `b`, `c_um2` or `out_n` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: unknown `footing`; a NaN or infinite
///   coefficient or wavelength; a NaN or infinite `min_wavelength_nm`, a NaN
///   `max_wavelength_nm`, or not `0 <= min <= max`.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: a wavelength outside the range, or one at which
///   the formula gives no real positive index.
///
/// # Safety
/// `b`, `c_um2`: NULL or valid for reading 3 `double`s each; `out_n`: NULL or
/// writable; `out_group_n`: NULL (not wanted) or writable.
#[no_mangle]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn flatray_sample_sellmeier(
    b: *const f64,
    c_um2: *const f64,
    footing: i32,
    min_wavelength_nm: f64,
    max_wavelength_nm: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
    out_group_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        unsafe {
            write_sample(out_n, out_group_n, || {
                let (b, c) = (three(b)?, three(c_um2)?);
                Ok(Sellmeier::new(b, c, footing_from(footing)?)
                    .with_range_nm(min_wavelength_nm, max_wavelength_nm)
                    .sample(wavelength_nm)?)
            })
        }
    })
}

/// A user Cauchy formula with every option (extension): footing and wavelength
/// range as `flatray_sample_sellmeier`. Writes the phase index to `out_n` and,
/// when `out_group_n` is not NULL, the group index to it.
///
/// # Returns
/// As `flatray_sample_sellmeier` (there are no coefficient pointers).
///
/// # Safety
/// `out_n`: NULL or writable; `out_group_n`: NULL (not wanted) or writable.
#[no_mangle]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn flatray_sample_cauchy(
    a: f64,
    b_um2: f64,
    c_um4: f64,
    footing: i32,
    min_wavelength_nm: f64,
    max_wavelength_nm: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
    out_group_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for both pointers.
        unsafe {
            write_sample(out_n, out_group_n, || {
                Ok(Cauchy::new(a, b_um2, c_um4, footing_from(footing)?)
                    .with_range_nm(min_wavelength_nm, max_wavelength_nm)
                    .sample(wavelength_nm)?)
            })
        }
    })
}

/// Moist air: the Ciddor (1996) equations with 450 ppm CO₂.
///
/// `temperature_c` −40 to 100 °C, absolute `pressure_pa` 10–140 kPa (101 325 Pa
/// at sea level), `relative_humidity` 0 (dry) to 1 (saturated, over liquid
/// water), `wavelength_nm` 300–1700 nm (vacuum).
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `out_n` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: an argument is NaN or infinite.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: an argument outside the ranges above, or more
///   water vapour than the pressure can hold.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_index_air(
    temperature_c: f64,
    pressure_pa: f64,
    relative_humidity: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Phase, || {
                Ok(
                    Air::new(temperature_c, pressure_pa, relative_humidity)
                        .sample(wavelength_nm)?,
                )
            })
        }
    })
}

/// Group index of moist air (extension; model and ranges as
/// `flatray_index_air`).
///
/// # Returns
/// As `flatray_index_air`.
///
/// # Safety
/// `out_n`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_group_index_air(
    temperature_c: f64,
    pressure_pa: f64,
    relative_humidity: f64,
    wavelength_nm: f64,
    out_n: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            write_index(out_n, Kind::Group, || {
                Ok(
                    Air::new(temperature_c, pressure_pa, relative_humidity)
                        .sample(wavelength_nm)?,
                )
            })
        }
    })
}

/// One standard atmosphere, Pa: the absolute pressure at sea level, and that of
/// `flatray_index_seawater`.
pub const FLATRAY_STANDARD_PRESSURE_PA: f64 = 101325.0;

const _: () = assert!(FLATRAY_STANDARD_PRESSURE_PA == STANDARD_PRESSURE_PA);

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn codes_are_total() {
        for code in [-1, 5, i32::MIN, i32::MAX] {
            assert_eq!(
                material_from(code).err(),
                Some(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT)
            );
        }
        for code in [-1, 2, i32::MAX] {
            assert_eq!(
                footing_from(code).err(),
                Some(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT)
            );
        }
        for m in Material::ALL {
            assert_eq!(material_from(m.code()), Ok(m));
        }
    }

    #[test]
    fn wrappers_return_the_rust_values() {
        let mut n = 0.0;
        let s = unsafe { flatray_index_seawater(4.0, 35.0, 532.0, &mut n) };
        assert_eq!(s, FlatrayStatus::FLATRAY_OK);
        assert_eq!(n, Seawater::new(4.0, 35.0).refractive_index(532.0).unwrap());
        let s = unsafe { flatray_index_seawater_at_pressure(4.0, 35.0, 101_325.0, 532.0, &mut n) };
        assert_eq!(s, FlatrayStatus::FLATRAY_OK);
        assert_eq!(n, Seawater::new(4.0, 35.0).refractive_index(532.0).unwrap());
        let b = [1.0, 0.0, 0.0];
        let c = [0.01, 0.0, 0.0];
        let mut g = 0.0;
        let s = unsafe {
            flatray_sample_sellmeier(
                b.as_ptr(),
                c.as_ptr(),
                0,
                0.0,
                f64::INFINITY,
                500.0,
                &mut n,
                &mut g,
            )
        };
        assert_eq!(s, FlatrayStatus::FLATRAY_OK);
        let want = Sellmeier::new(b, c, Footing::Vacuum).sample(500.0).unwrap();
        assert_eq!((n, g), (want.index, want.group_index()));
    }
}
