//! Survey C functions: refracted-ray triangulation, multi-view and range
//! corrections, depth tables and the error budget of `flatray_true_position`.
//!
//! Batch functions follow the batch rules of the module docs of `capi` (and
//! DESIGN.md): whole-call errors return at once and write nothing; otherwise
//! every element is attempted, with its own status and NaN outputs on failure,
//! and the return value is the status of the lowest-index failure. Large
//! batches run on every core (`RAYON_NUM_THREADS` sets the thread count) with
//! results identical to a one-thread run.

use super::batch::finish;
use super::types::{image_from, stack_from, FlatrayStack};
use super::{
    deliver, guard, optional_out, optional_slice_out, required_out, slice_in, slice_out,
    FlatrayStatus,
};
use crate::batch::NoStatus;
use crate::lines::LinesPoint;
use crate::stack::Stack;
use crate::survey::{
    self, correct_multiview, correct_multiview_shortcut, correct_range, triangulate,
    true_position_sensitivity, GroupIndices, Multiview, Uncertainty, Views,
};
use crate::vector::{Ray, Vec3};

/// Write a point and its optional RMS miss, NaN on error.
fn deliver_point(
    out: &mut Vec3,
    rms: Option<&mut f64>,
    result: Result<LinesPoint, FlatrayStatus>,
) -> Result<(), FlatrayStatus> {
    if let Some(r) = rms {
        *r = result.as_ref().map_or(f64::NAN, |h| h.rms_miss);
    }
    deliver(out, Vec3::NAN, result.map(|h| h.point))
}

/// Set an optional out-value to NaN and return `status` (a required pointer
/// was NULL).
fn null_with(rms: Option<&mut f64>, status: FlatrayStatus) -> Result<(), FlatrayStatus> {
    if let Some(r) = rms {
        *r = f64::NAN;
    }
    Err(status)
}

/// The true point seen along `count` lines of sight (refracted-ray
/// triangulation).
///
/// `lines_of_sight[i]`: origin = camera centre (observer's side), direction
/// toward the object in the observer's medium (any non-zero length). Each is
/// traced through the stack and the refracted rays are intersected by least
/// squares. `out_rms_miss` (optional): √(mean over the rays of the squared
/// perpendicular distance from the point to each full refracted line), metres.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `stack` or `out_point` NULL, or
///   `lines_of_sight` NULL with `count` > 0.
/// * `FLATRAY_ERR_DEGENERATE`: `count` < 2, or the refracted rays are (nearly)
///   parallel.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: invalid stack, non-finite origin, zero or
///   non-finite direction.
/// * `FLATRAY_ERR_WRONG_SIDE`: a camera past the first interface (under water),
///   or the rays meet before the last interface.
/// * `FLATRAY_ERR_MISSES_INTERFACE`, `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION`,
///   `FLATRAY_ERR_OUT_OF_RANGE`: as `flatray_trace`.
///
/// # Safety
/// `stack`: NULL or valid; `lines_of_sight`: NULL (only with `count` 0) or
/// valid for `count` rays; `out_point`: NULL or writable; `out_rms_miss`: NULL
/// (not wanted) or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_triangulate(
    stack: *const FlatrayStack,
    lines_of_sight: *const Ray,
    count: usize,
    out_point: *mut Vec3,
    out_rms_miss: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        let rms = unsafe { optional_out(out_rms_miss) };
        let out = match unsafe { required_out(out_point) } {
            Ok(out) => out,
            Err(status) => return null_with(rms, status),
        };
        let result = unsafe { stack_from(stack) }.and_then(|s| {
            let lines = unsafe { slice_in(lines_of_sight, count) }?;
            triangulate(&s, lines).map_err(FlatrayStatus::from)
        });
        deliver_point(out, rms, result)
    })
}

/// Shared body of the two single-point multi-view corrections.
unsafe fn multiview(
    stack: *const FlatrayStack,
    observers: *const Vec3,
    count: usize,
    apparent: Vec3,
    out_true: *mut Vec3,
    out_rms_miss: *mut f64,
    f: fn(&Stack, &[Vec3], Vec3) -> crate::Result<LinesPoint>,
) -> Result<(), FlatrayStatus> {
    // SAFETY: forwarded caller contract.
    let rms = unsafe { optional_out(out_rms_miss) };
    let out = match unsafe { required_out(out_true) } {
        Ok(out) => out,
        Err(status) => return null_with(rms, status),
    };
    let result = unsafe { stack_from(stack) }.and_then(|s| {
        let obs = unsafe { slice_in(observers, count) }?;
        f(&s, obs, apparent).map_err(FlatrayStatus::from)
    });
    deliver_point(out, rms, result)
}

/// The true point whose exact lines of sight from the `count` camera centres
/// `observers`, triangulated as straight lines by least squares (equal weights,
/// perpendicular distances), give the uncorrected point `apparent`. Solved by
/// Newton's method (started from `flatray_correct_multiview_shortcut`) to about
/// 1e-13 of the camera-to-point distance.
///
/// `out_rms_miss` (optional): the straight-line RMS miss of the solution, the
/// RMS perpendicular distance from `apparent` to the exact straight lines of
/// sight from the cameras to the true point, metres.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `stack` or `out_true` NULL, or `observers`
///   NULL with `count` > 0.
/// * `FLATRAY_ERR_DEGENERATE`: `count` < 2, or (nearly) parallel lines of sight.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: invalid stack, a non-finite point.
/// * `FLATRAY_ERR_WRONG_SIDE`: a camera past the first interface (under water),
///   `apparent` on the observer's side (above the surface), or no true point in
///   the object's medium fits.
/// * `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION`, `FLATRAY_ERR_OUT_OF_RANGE`,
///   `FLATRAY_ERR_NOT_CONVERGED`.
///
/// # Safety
/// `stack`: NULL or valid; `observers`: NULL (only with `count` 0) or valid for
/// `count` points; `out_true`: NULL or writable; `out_rms_miss`: NULL or
/// writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_correct_multiview(
    stack: *const FlatrayStack,
    observers: *const Vec3,
    count: usize,
    apparent: Vec3,
    out_true: *mut Vec3,
    out_rms_miss: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            multiview(
                stack,
                observers,
                count,
                apparent,
                out_true,
                out_rms_miss,
                correct_multiview,
            )
        }
    })
}

/// An approximation, for comparison: each camera's straight line to
/// `apparent` is traced through the stack and the refracted rays are
/// intersected by least squares; `out_rms_miss` is their RMS miss. Exact only
/// when the cameras stand symmetrically about the point.
///
/// # Returns
/// As `flatray_correct_multiview`, without `FLATRAY_ERR_NOT_CONVERGED`.
///
/// # Safety
/// As `flatray_correct_multiview`.
#[no_mangle]
pub unsafe extern "C" fn flatray_correct_multiview_shortcut(
    stack: *const FlatrayStack,
    observers: *const Vec3,
    count: usize,
    apparent: Vec3,
    out_true: *mut Vec3,
    out_rms_miss: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            multiview(
                stack,
                observers,
                count,
                apparent,
                out_true,
                out_rms_miss,
                correct_multiview_shortcut,
            )
        }
    })
}

/// Group indices from C: NULL or 0 values for the phase indices, else exactly
/// `layer_count + 2`.
unsafe fn groups_from(
    stack: &Stack,
    group_index: *const f64,
    group_count: usize,
) -> Result<Option<GroupIndices>, FlatrayStatus> {
    // SAFETY: forwarded caller contract.
    let values = unsafe { slice_in(group_index, group_count) }?;
    if values.is_empty() {
        return Ok(None);
    }
    if values.len() != stack.layers().len() + 2 {
        return Err(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT);
    }
    GroupIndices::new(values)
        .map(Some)
        .map_err(FlatrayStatus::from)
}

/// The true point of a laser range from `sensor` reported as `uncorrected`
/// (straight beam at the observer medium's group velocity): the beam refracted
/// at every interface, the travel time rescaled in each medium by its group
/// index. A point whose beam ends before the first interface comes back
/// unchanged; one whose beam ends inside a layer lies in that layer.
///
/// `group_index`: `group_count` = layer_count + 2 values (observer, layers...,
/// object), or NULL with 0 to use the phase indices.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `stack` or `out_true` NULL, `group_index`
///   NULL with `group_count` > 0.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: invalid stack, a non-finite point, a
///   `group_count` other than 0 or layer_count + 2, a group index not finite
///   and > 0.
/// * `FLATRAY_ERR_WRONG_SIDE`: the sensor past the first interface.
/// * `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION`, `FLATRAY_ERR_OUT_OF_RANGE`.
///
/// # Safety
/// `stack`: NULL or valid; `group_index`: NULL (only with `group_count` 0) or
/// valid for `group_count` doubles; `out_true`: NULL or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_correct_range(
    stack: *const FlatrayStack,
    sensor: Vec3,
    uncorrected: Vec3,
    group_index: *const f64,
    group_count: usize,
    out_true: *mut Vec3,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        let out = unsafe { required_out(out_true) }?;
        let result = unsafe { stack_from(stack) }.and_then(|s| {
            let g = unsafe { groups_from(&s, group_index, group_count) }?;
            correct_range(&s, sensor, uncorrected, g.as_ref()).map_err(FlatrayStatus::from)
        });
        deliver(out, Vec3::NAN, result)
    })
}

/// `flatray_correct_range` of `count` uncorrected points. `sensors` holds 1
/// position (shared by all) or `count`. `out_status` may be NULL.
///
/// # Returns
/// `FLATRAY_OK` when every point succeeded, else the status of the lowest-index
/// failing point. Whole-call errors (nothing written):
/// `FLATRAY_ERR_NULL_POINTER` (NULL stack, NULL array with a count above 0),
/// `FLATRAY_ERR_INVALID_ARGUMENT` (invalid stack, `sensor_count` neither 1 nor
/// `count`, a bad `group_count` or group index).
///
/// # Safety
/// `stack`: NULL or valid; each array NULL (only with a count of 0, or for the
/// optional `out_status`) or valid for its count (`out_true` and `out_status`:
/// `count`); outputs must not overlap inputs.
#[no_mangle]
pub unsafe extern "C" fn flatray_correct_ranges(
    stack: *const FlatrayStack,
    sensors: *const Vec3,
    sensor_count: usize,
    uncorrected: *const Vec3,
    count: usize,
    group_index: *const f64,
    group_count: usize,
    out_true: *mut Vec3,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        let s = unsafe { stack_from(stack) }?;
        if sensor_count != 1 && sensor_count != count {
            return Err(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT);
        }
        let g = unsafe { groups_from(&s, group_index, group_count) }?;
        let sensors = unsafe { slice_in(sensors, sensor_count) }?;
        let points = unsafe { slice_in(uncorrected, count) }?;
        let out = unsafe { slice_out(out_true, count) }?;
        match unsafe { optional_slice_out(out_status, count) }? {
            Some(st) => finish(survey::correct_ranges(
                &s,
                sensors,
                points,
                g.as_ref(),
                out,
                st,
            )),
            None => finish(survey::correct_ranges(
                &s,
                sensors,
                points,
                g.as_ref(),
                out,
                &mut NoStatus,
            )),
        }
    })
}

/// Shared body of the two multi-view batches.
#[allow(clippy::too_many_arguments)]
unsafe fn multiview_batch(
    stack: *const FlatrayStack,
    cameras: *const Vec3,
    camera_count: usize,
    view_offsets: *const usize,
    view_ids: *const u32,
    view_id_count: usize,
    apparent: *const Vec3,
    count: usize,
    out_true: *mut Vec3,
    out_rms_miss: *mut f64,
    out_status: *mut i32,
    method: Multiview,
) -> Result<(), FlatrayStatus> {
    // SAFETY (whole function): forwarded caller contract for each pointer.
    let s = unsafe { stack_from(stack) }?;
    let cameras = unsafe { slice_in(cameras, camera_count) }?;
    let offsets_len = if count == 0 && view_offsets.is_null() {
        0
    } else {
        count
            .checked_add(1)
            .ok_or(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT)?
    };
    let offsets = unsafe { slice_in(view_offsets, offsets_len) }?;
    let ids = unsafe { slice_in(view_ids, view_id_count) }?;
    let points = unsafe { slice_in(apparent, count) }?;
    let out = unsafe { slice_out(out_true, count) }?;
    let rms = unsafe { optional_slice_out(out_rms_miss, count) }?;
    let views = Views {
        cameras,
        offsets,
        ids,
    };
    match unsafe { optional_slice_out(out_status, count) }? {
        Some(st) => finish(survey::correct_multiviews(
            &s, &views, points, method, out, rms, st,
        )),
        None => finish(survey::correct_multiviews(
            &s,
            &views,
            points,
            method,
            out,
            rms,
            &mut NoStatus,
        )),
    }
}

/// `flatray_correct_multiview` of `count` uncorrected points, each seen by its
/// own cameras: point `i` was seen by `cameras[view_ids[k]]` for `k` from
/// `view_offsets[i]` to `view_offsets[i + 1] - 1`. `view_offsets` holds
/// `count + 1` non-decreasing entries, the last at most `view_id_count` (NULL
/// when `count` is 0). A camera id of `camera_count` or more fails its point
/// with `FLATRAY_ERR_INVALID_ARGUMENT`. `out_rms_miss` and `out_status` may be
/// NULL.
///
/// # Returns
/// `FLATRAY_OK` when every point succeeded, else the status of the lowest-index
/// failing point. Whole-call errors (nothing written):
/// `FLATRAY_ERR_NULL_POINTER`, `FLATRAY_ERR_INVALID_ARGUMENT` (invalid stack,
/// malformed `view_offsets`).
///
/// # Safety
/// `stack`: NULL or valid; every array NULL (only with a count of 0, or for the
/// optional outputs) or valid for its count (`view_offsets`: `count + 1`;
/// outputs: `count`); outputs must not overlap inputs.
#[no_mangle]
pub unsafe extern "C" fn flatray_correct_multiviews(
    stack: *const FlatrayStack,
    cameras: *const Vec3,
    camera_count: usize,
    view_offsets: *const usize,
    view_ids: *const u32,
    view_id_count: usize,
    apparent: *const Vec3,
    count: usize,
    out_true: *mut Vec3,
    out_rms_miss: *mut f64,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            multiview_batch(
                stack,
                cameras,
                camera_count,
                view_offsets,
                view_ids,
                view_id_count,
                apparent,
                count,
                out_true,
                out_rms_miss,
                out_status,
                Multiview::Exact,
            )
        }
    })
}

/// `flatray_correct_multiview_shortcut` (the approximation) of `count` points;
/// arguments as `flatray_correct_multiviews`.
///
/// # Returns
/// As `flatray_correct_multiviews`.
///
/// # Safety
/// As `flatray_correct_multiviews`.
#[no_mangle]
pub unsafe extern "C" fn flatray_correct_multiviews_shortcut(
    stack: *const FlatrayStack,
    cameras: *const Vec3,
    camera_count: usize,
    view_offsets: *const usize,
    view_ids: *const u32,
    view_id_count: usize,
    apparent: *const Vec3,
    count: usize,
    out_true: *mut Vec3,
    out_rms_miss: *mut f64,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            multiview_batch(
                stack,
                cameras,
                camera_count,
                view_offsets,
                view_ids,
                view_id_count,
                apparent,
                count,
                out_true,
                out_rms_miss,
                out_status,
                Multiview::Shortcut,
            )
        }
    })
}

/// `flatray_true_depth` of `count` apparent depths, each at its own view angle
/// (single flat interface; depths in metres >= 0, angles in radians in
/// [0, π/2)). `out_status` may be NULL.
///
/// # Returns
/// `FLATRAY_OK` when every element succeeded, else the status of the
/// lowest-index failure (`FLATRAY_ERR_INVALID_ARGUMENT` for a negative or NaN
/// depth or an angle out of range, `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION`).
/// Whole-call errors (nothing written): `FLATRAY_ERR_NULL_POINTER`,
/// `FLATRAY_ERR_INVALID_ARGUMENT` (an index not finite and > 0, unknown
/// `image`).
///
/// # Safety
/// Each array NULL (only with `count` 0, or for `out_status`) or valid for
/// `count` elements; outputs must not overlap inputs.
#[no_mangle]
pub unsafe extern "C" fn flatray_true_depths(
    apparent_depths: *const f64,
    view_angles: *const f64,
    count: usize,
    n_observer: f64,
    n_object: f64,
    image: i32,
    out_depths: *mut f64,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        let image = image_from(image)?;
        // SAFETY: caller contract for every pointer.
        let depths = unsafe { slice_in(apparent_depths, count) }?;
        let angles = unsafe { slice_in(view_angles, count) }?;
        let out = unsafe { slice_out(out_depths, count) }?;
        match unsafe { optional_slice_out(out_status, count) }? {
            Some(st) => finish(survey::true_depths(
                depths, angles, n_observer, n_object, image, out, st,
            )),
            None => finish(survey::true_depths(
                depths,
                angles,
                n_observer,
                n_object,
                image,
                out,
                &mut NoStatus,
            )),
        }
    })
}

/// Correction factors `true depth / apparent depth` of one flat interface at
/// `count` view angles (radians, observer's medium): `n_object / n_observer`
/// at nadir, growing with the angle. `out_status` may be NULL.
///
/// # Returns
/// As `flatray_true_depths`.
///
/// # Safety
/// `view_angles` and `out_factors`: NULL (only with `count` 0) or valid for
/// `count` doubles; `out_status`: NULL or valid for `count` codes.
#[no_mangle]
pub unsafe extern "C" fn flatray_correction_factors(
    view_angles: *const f64,
    count: usize,
    n_observer: f64,
    n_object: f64,
    image: i32,
    out_factors: *mut f64,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        let image = image_from(image)?;
        // SAFETY: caller contract for every pointer.
        let angles = unsafe { slice_in(view_angles, count) }?;
        let out = unsafe { slice_out(out_factors, count) }?;
        match unsafe { optional_slice_out(out_status, count) }? {
            Some(st) => finish(survey::correction_factors(
                angles, n_observer, n_object, image, out, st,
            )),
            None => finish(survey::correction_factors(
                angles,
                n_observer,
                n_object,
                image,
                out,
                &mut NoStatus,
            )),
        }
    })
}

/// Fill every non-NULL array of `outs` (with its length) with NaN.
unsafe fn nan_fill(outs: &[(*mut f64, usize)]) {
    for &(ptr, len) in outs {
        // SAFETY: caller contract: NULL or valid for `len` doubles.
        if let Ok(s) = unsafe { slice_out(ptr, len) } {
            s.fill(f64::NAN);
        }
    }
}

/// Error budget of `flatray_true_position`: partial derivatives of the true
/// point (metres) with respect to the stack's offset `d` along its normal (the
/// stack moved to origin + d n̂, n̂ the unit normal, away from the observer for
/// d > 0) (`out_d_offset`, 3 doubles), to `n_object` (`out_d_n_object`, 3), to
/// the observer position (`out_d_observer`, 9, row-major d true_i / d obs_j)
/// and to the apparent point (`out_d_apparent`, 9). Exact derivatives of the
/// closed-form inverse (forward-mode automatic differentiation).
///
/// # Returns
/// As `flatray_true_position`; `FLATRAY_ERR_NULL_POINTER` when any output is
/// NULL (the others are set to NaN).
///
/// # Safety
/// `stack`: NULL or valid; each output NULL or valid for writing its number of
/// doubles.
#[no_mangle]
pub unsafe extern "C" fn flatray_true_position_sensitivity(
    stack: *const FlatrayStack,
    observer: Vec3,
    apparent: Vec3,
    image: i32,
    out_d_offset: *mut f64,
    out_d_n_object: *mut f64,
    out_d_observer: *mut f64,
    out_d_apparent: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        let outs = [
            (out_d_offset, 3),
            (out_d_n_object, 3),
            (out_d_observer, 9),
            (out_d_apparent, 9),
        ];
        // SAFETY: caller contract for every pointer.
        unsafe { nan_fill(&outs) };
        let d_offset = unsafe { slice_out(out_d_offset, 3) }?;
        let d_n = unsafe { slice_out(out_d_n_object, 3) }?;
        let d_obs = unsafe { slice_out(out_d_observer, 9) }?;
        let d_app = unsafe { slice_out(out_d_apparent, 9) }?;
        let s = unsafe { stack_from(stack) }?;
        let image = image_from(image)?;
        let sens = true_position_sensitivity(&s, observer, apparent, image)?;
        for (slot, v) in
            d_offset
                .iter_mut()
                .zip([sens.d_offset.x, sens.d_offset.y, sens.d_offset.z])
        {
            *slot = v;
        }
        for (slot, v) in
            d_n.iter_mut()
                .zip([sens.d_n_object.x, sens.d_n_object.y, sens.d_n_object.z])
        {
            *slot = v;
        }
        for (slot, v) in d_obs.iter_mut().zip(sens.d_observer.iter().flatten()) {
            *slot = *v;
        }
        for (slot, v) in d_app.iter_mut().zip(sens.d_apparent.iter().flatten()) {
            *slot = *v;
        }
        Ok(())
    })
}

/// First-order propagated covariance (row-major 3×3, m²) of the true point of
/// `flatray_true_position` from independent standard deviations: stack offset
/// (m), `n_object`, observer position (m, each axis), apparent point (m, each
/// axis). `C = Σ σ² J Jᵀ` over the inputs (law of propagation of uncertainty,
/// JCGM 100:2008 §5.1.2).
///
/// # Returns
/// As `flatray_true_position`; `FLATRAY_ERR_NULL_POINTER` for a NULL
/// `out_covariance`; `FLATRAY_ERR_INVALID_ARGUMENT` also for a standard
/// deviation not finite and >= 0.
///
/// # Safety
/// `stack`: NULL or valid; `out_covariance`: NULL or valid for writing 9
/// doubles.
#[no_mangle]
pub unsafe extern "C" fn flatray_true_position_covariance(
    stack: *const FlatrayStack,
    observer: Vec3,
    apparent: Vec3,
    image: i32,
    sigma_offset: f64,
    sigma_n_object: f64,
    sigma_observer: f64,
    sigma_apparent: f64,
    out_covariance: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        let out = unsafe { slice_out(out_covariance, 9) }?;
        out.fill(f64::NAN);
        let s = unsafe { stack_from(stack) }?;
        let image = image_from(image)?;
        let u = Uncertainty {
            offset_m: sigma_offset,
            n_object: sigma_n_object,
            observer_m: sigma_observer,
            apparent_m: sigma_apparent,
        };
        let c = survey::true_position_covariance(&s, observer, apparent, image, &u)?;
        for (slot, v) in out.iter_mut().zip(c.iter().flatten()) {
            *slot = *v;
        }
        Ok(())
    })
}
