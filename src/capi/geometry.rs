//! Single-call geometry: refraction, Fresnel, critical angle, trace, line of
//! sight, apparent and true positions and the scalar depth helpers.

use super::types::{image_from, stack_from, FlatrayStack};
use super::{deliver, guard, optional_out, required_out, FlatrayStatus};
use crate::interface::{critical_angle, fresnel, refract, Fresnel};
use crate::path::{line_of_sight, trace, Path};
use crate::vector::{Ray, Vec3};
use crate::{image, Image};

/// Refract `direction` at a plane with normal `normal` (Snell's law, vector form).
///
/// `direction` is the incident propagation direction, `normal` either
/// orientation; neither need be unit length. Writes the unit refracted
/// direction.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `out_direction` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: zero/non-finite direction or normal, index not > 0.
/// * `FLATRAY_ERR_MISSES_INTERFACE`: `direction` lies in the interface plane.
/// * `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION`: beyond the critical angle.
///
/// # Safety
/// `out_direction`: NULL or valid for writing one `FlatrayVec3`.
#[no_mangle]
pub unsafe extern "C" fn flatray_refract(
    direction: Vec3,
    normal: Vec3,
    n_from: f64,
    n_to: f64,
    out_direction: *mut Vec3,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        let out = unsafe { required_out(out_direction) }?;
        deliver(out, Vec3::NAN, refract(direction, normal, n_from, n_to))
    })
}

/// Fresnel power coefficients at incidence `cos_incidence` in `[0, 1]` from
/// `n_from` into `n_to`. Beyond the critical angle: total reflection, `FLATRAY_OK`.
///
/// # Returns
/// `FLATRAY_OK`; `FLATRAY_ERR_NULL_POINTER` for a NULL `out`;
/// `FLATRAY_ERR_INVALID_ARGUMENT` for `cos_incidence` outside `[0, 1]` or NaN,
/// or an index not finite and > 0.
///
/// # Safety
/// `out`: NULL or valid for writing one `FlatrayFresnel`.
#[no_mangle]
pub unsafe extern "C" fn flatray_fresnel(
    cos_incidence: f64,
    n_from: f64,
    n_to: f64,
    out: *mut Fresnel,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        let out = unsafe { required_out(out) }?;
        deliver(out, Fresnel::NAN, fresnel(cos_incidence, n_from, n_to))
    })
}

/// Critical angle, radians, from `n_from` into a less dense `n_to`.
///
/// # Returns
/// `FLATRAY_OK`; `FLATRAY_ERR_NULL_POINTER`; `FLATRAY_ERR_INVALID_ARGUMENT` for
/// an index not finite and > 0, or `n_from <= n_to` (no critical angle).
///
/// # Safety
/// `out_radians`: NULL or valid for writing one `double`.
#[no_mangle]
pub unsafe extern "C" fn flatray_critical_angle(
    n_from: f64,
    n_to: f64,
    out_radians: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        let out = unsafe { required_out(out_radians) }?;
        deliver(out, f64::NAN, critical_angle(n_from, n_to))
    })
}

/// Trace a ray leaving the observer through the stack into the object's medium.
///
/// Writes the object-medium ray (origin on the last interface, unit direction)
/// and, when `out_transmittance` is not NULL, the transmittance of unpolarised
/// light `(Π Ts + Π Tp)/2`.
///
/// # Returns
/// `FLATRAY_OK`; `FLATRAY_ERR_NULL_POINTER` (stack or `out_object_ray`);
/// `FLATRAY_ERR_INVALID_ARGUMENT` (bad stack or ray); `FLATRAY_ERR_WRONG_SIDE`
/// (origin past the first interface); `FLATRAY_ERR_MISSES_INTERFACE`;
/// `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION`; `FLATRAY_ERR_OUT_OF_RANGE`.
///
/// # Safety
/// `stack`: NULL or a valid `FlatrayStack`; `out_object_ray`: NULL or writable;
/// `out_transmittance`: NULL (not wanted) or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_trace(
    stack: *const FlatrayStack,
    observer_ray: Ray,
    out_object_ray: *mut Ray,
    out_transmittance: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        let out_t = unsafe { optional_out(out_transmittance) };
        let out = match unsafe { required_out(out_object_ray) } {
            Ok(out) => out,
            Err(status) => {
                if let Some(t) = out_t {
                    *t = f64::NAN;
                }
                return Err(status);
            }
        };
        let result = unsafe { stack_from(stack) }
            .and_then(|s| trace(&s, observer_ray).map_err(FlatrayStatus::from));
        if let Some(out_t) = out_t {
            *out_t = result.as_ref().map_or(f64::NAN, |r| r.transmittance);
        }
        deliver(out, Ray::NAN, result.map(|r| r.ray))
    })
}

/// The light path between `observer` and `object` (Fermat's principle).
///
/// # Returns
/// `FLATRAY_OK`; `FLATRAY_ERR_NULL_POINTER`; `FLATRAY_ERR_INVALID_ARGUMENT`;
/// `FLATRAY_ERR_WRONG_SIDE` (observer past the first interface or object not
/// past the last); `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION` (no ray connects
/// them); `FLATRAY_ERR_NOT_CONVERGED`; `FLATRAY_ERR_OUT_OF_RANGE`.
///
/// # Safety
/// `stack`: NULL or valid; `out_path`: NULL or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_line_of_sight(
    stack: *const FlatrayStack,
    observer: Vec3,
    object: Vec3,
    out_path: *mut Path,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        let out = unsafe { required_out(out_path) }?;
        let result = unsafe { stack_from(stack) }
            .and_then(|s| line_of_sight(&s, observer, object).map_err(FlatrayStatus::from));
        deliver(out, Path::NAN, result)
    })
}

/// Run a stack-and-image function, writing NaN on every failure.
unsafe fn with_stack_image(
    stack: *const FlatrayStack,
    image: i32,
    out: *mut Vec3,
    f: impl FnOnce(&crate::Stack, Image) -> crate::Result<Vec3>,
) -> Result<(), FlatrayStatus> {
    // SAFETY: forwarded caller contract.
    let out = unsafe { required_out(out) }?;
    let result = unsafe { stack_from(stack) }.and_then(|s| {
        let i = image_from(image)?;
        f(&s, i).map_err(FlatrayStatus::from)
    });
    deliver(out, Vec3::NAN, result)
}

/// Where `object` appears to `observer`: the sagittal or tangential image
/// (`image` is `FLATRAY_IMAGE_SAGITTAL` or `FLATRAY_IMAGE_TANGENTIAL`).
///
/// # Returns
/// As `flatray_line_of_sight`, plus `FLATRAY_ERR_INVALID_ARGUMENT` for an
/// unknown `image` and `FLATRAY_ERR_OUT_OF_RANGE` for an image too far away.
///
/// # Safety
/// `stack`: NULL or valid; `out_apparent`: NULL or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_apparent_position(
    stack: *const FlatrayStack,
    observer: Vec3,
    object: Vec3,
    image: i32,
    out_apparent: *mut Vec3,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            with_stack_image(stack, image, out_apparent, |s, i| {
                image::apparent_position(s, observer, object, i)
            })
        }
    })
}

/// Where an object really is, given its `apparent` position seen from `observer`.
///
/// # Returns
/// `FLATRAY_OK`; `FLATRAY_ERR_NULL_POINTER`; `FLATRAY_ERR_INVALID_ARGUMENT`
/// (non-finite point, bad stack, unknown `image`); `FLATRAY_ERR_WRONG_SIDE`
/// (observer past the first interface, apparent point on the observer's side or
/// too shallow to image any point of the object's medium);
/// `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION`; `FLATRAY_ERR_OUT_OF_RANGE`.
///
/// # Safety
/// `stack`: NULL or valid; `out_true`: NULL or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_true_position(
    stack: *const FlatrayStack,
    observer: Vec3,
    apparent: Vec3,
    image: i32,
    out_true: *mut Vec3,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            with_stack_image(stack, image, out_true, |s, i| {
                image::true_position(s, observer, apparent, i)
            })
        }
    })
}

/// Apparent depth below one flat interface: `true_depth` metres (>= 0) seen at
/// `view_angle` radians in `[0, π/2)` from the normal in the observer's medium.
///
/// # Returns
/// `FLATRAY_OK`; `FLATRAY_ERR_NULL_POINTER`; `FLATRAY_ERR_INVALID_ARGUMENT`
/// (NaN/inf, negative depth or angle, angle >= π/2, index not > 0, unknown
/// `image`); `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION` (no ray from the object's
/// medium reaches that view angle); `FLATRAY_ERR_OUT_OF_RANGE`.
///
/// # Safety
/// `out_depth`: NULL or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_apparent_depth(
    true_depth: f64,
    view_angle: f64,
    n_observer: f64,
    n_object: f64,
    image: i32,
    out_depth: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        let out = unsafe { required_out(out_depth) }?;
        let result = image_from(image).and_then(|i| {
            image::apparent_depth(true_depth, view_angle, n_observer, n_object, i)
                .map_err(FlatrayStatus::from)
        });
        deliver(out, f64::NAN, result)
    })
}

/// True depth below one flat interface from an apparent depth; the inverse of
/// `flatray_apparent_depth` at the same view angle.
///
/// # Returns
/// As `flatray_apparent_depth`.
///
/// # Safety
/// `out_depth`: NULL or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_true_depth(
    apparent_depth: f64,
    view_angle: f64,
    n_observer: f64,
    n_object: f64,
    image: i32,
    out_depth: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        let out = unsafe { required_out(out_depth) }?;
        let result = image_from(image).and_then(|i| {
            image::true_depth(apparent_depth, view_angle, n_observer, n_object, i)
                .map_err(FlatrayStatus::from)
        });
        deliver(out, f64::NAN, result)
    })
}
