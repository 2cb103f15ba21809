//! Batch C functions: true positions, apparent positions, lines of sight and
//! ray traces.
//!
//! Whole-call errors (NULL stack, invalid stack, `observer_count` neither 1 nor
//! `count`, unknown `image`, NULL arrays with a count above 0) return at once
//! and write nothing. Otherwise every element is attempted; a failing element
//! gets its own status in `out_status` (when not NULL) and NaN outputs. The
//! return value is `FLATRAY_OK` when all succeeded, else the status of the
//! lowest-index failure.

use super::types::{image_from, stack_from, FlatrayStack};
use super::{guard, optional_slice_out, slice_in, slice_out, FlatrayStatus};
use crate::batch::{self, BatchReport, NoStatus, StatusSink};
use crate::path::Path;
use crate::vector::{Ray, Vec3};
use crate::{Image, Stack};

pub(crate) fn finish(report: crate::Result<BatchReport>) -> Result<(), FlatrayStatus> {
    let report = report.map_err(FlatrayStatus::from)?;
    match FlatrayStatus::from(report.status()) {
        FlatrayStatus::FLATRAY_OK => Ok(()),
        status => Err(status),
    }
}

/// Which point batch to run.
#[derive(Clone, Copy)]
enum PointOp {
    True,
    Apparent,
}

fn run_op<S: StatusSink + ?Sized>(
    op: PointOp,
    stack: &Stack,
    observers: &[Vec3],
    points: &[Vec3],
    image: Image,
    out: &mut [Vec3],
    status: &mut S,
) -> crate::Result<BatchReport> {
    match op {
        PointOp::True => batch::true_positions(stack, observers, points, image, out, status),
        PointOp::Apparent => {
            batch::apparent_positions(stack, observers, points, image, out, status)
        }
    }
}

/// Shared body of the two point batches.
#[allow(clippy::too_many_arguments)]
unsafe fn point_batch(
    stack: *const FlatrayStack,
    observers: *const Vec3,
    observer_count: usize,
    points: *const Vec3,
    count: usize,
    image: i32,
    out: *mut Vec3,
    out_status: *mut i32,
    op: PointOp,
) -> Result<(), FlatrayStatus> {
    // SAFETY (whole function): forwarded caller contract for each pointer.
    let stack = unsafe { stack_from(stack) }?;
    if observer_count != 1 && observer_count != count {
        return Err(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT);
    }
    let image = image_from(image)?;
    let observers = unsafe { slice_in(observers, observer_count) }?;
    let points = unsafe { slice_in(points, count) }?;
    let out = unsafe { slice_out(out, count) }?;
    match unsafe { optional_slice_out(out_status, count) }? {
        Some(status) => finish(run_op(op, &stack, observers, points, image, out, status)),
        None => finish(run_op(
            op,
            &stack,
            observers,
            points,
            image,
            out,
            &mut NoStatus,
        )),
    }
}

/// True positions of `count` apparent points (see `flatray_true_position`).
///
/// `observers` holds 1 point (shared by all) or `count` points. `out_true` has
/// room for `count` points; `out_status` is NULL or has room for `count` codes.
///
/// # Returns
/// `FLATRAY_OK` when every point succeeded, else the status of the lowest-index
/// failing point; whole-call errors `FLATRAY_ERR_NULL_POINTER` and
/// `FLATRAY_ERR_INVALID_ARGUMENT` (see the module rules) write nothing.
///
/// # Safety
/// `stack` NULL or valid; each array NULL (only with a count of 0) or valid for
/// its count; outputs must not overlap inputs.
#[no_mangle]
pub unsafe extern "C" fn flatray_true_positions(
    stack: *const FlatrayStack,
    observers: *const Vec3,
    observer_count: usize,
    apparent: *const Vec3,
    count: usize,
    image: i32,
    out_true: *mut Vec3,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            point_batch(
                stack,
                observers,
                observer_count,
                apparent,
                count,
                image,
                out_true,
                out_status,
                PointOp::True,
            )
        }
    })
}

/// Apparent positions of `count` object points (see
/// `flatray_apparent_position`); conventions as `flatray_true_positions`.
///
/// # Returns
/// As `flatray_true_positions`.
///
/// # Safety
/// As `flatray_true_positions`.
#[no_mangle]
pub unsafe extern "C" fn flatray_apparent_positions(
    stack: *const FlatrayStack,
    observers: *const Vec3,
    observer_count: usize,
    objects: *const Vec3,
    count: usize,
    image: i32,
    out_apparent: *mut Vec3,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract.
        unsafe {
            point_batch(
                stack,
                observers,
                observer_count,
                objects,
                count,
                image,
                out_apparent,
                out_status,
                PointOp::Apparent,
            )
        }
    })
}

/// Lines of sight from observers to `count` object points (see
/// `flatray_line_of_sight`), on every core for large batches.
///
/// `observers` holds 1 point (shared by all) or `count` points. `out_paths` has
/// room for `count` paths; `out_status` is NULL or has room for `count` codes.
/// A failing point gets its status and a path of NaN fields.
///
/// # Returns
/// `FLATRAY_OK` when every point succeeded, else the status of the lowest-index
/// failing point; whole-call errors `FLATRAY_ERR_NULL_POINTER` (NULL stack, or
/// an array NULL with a count above 0) and `FLATRAY_ERR_INVALID_ARGUMENT`
/// (invalid stack, `observer_count` neither 1 nor `count`) write nothing.
///
/// # Safety
/// `stack` NULL or valid; each array NULL (only with a count of 0, or for
/// `out_status`) or valid for its count; outputs must not overlap inputs.
#[no_mangle]
pub unsafe extern "C" fn flatray_lines_of_sight(
    stack: *const FlatrayStack,
    observers: *const Vec3,
    observer_count: usize,
    objects: *const Vec3,
    count: usize,
    out_paths: *mut Path,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for each pointer.
        let stack = unsafe { stack_from(stack) }?;
        if observer_count != 1 && observer_count != count {
            return Err(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT);
        }
        let observers = unsafe { slice_in(observers, observer_count) }?;
        let objects = unsafe { slice_in(objects, count) }?;
        let out = unsafe { slice_out(out_paths, count) }?;
        match unsafe { optional_slice_out(out_status, count) }? {
            Some(status) => finish(batch::lines_of_sight(
                &stack, observers, objects, out, status,
            )),
            None => finish(batch::lines_of_sight(
                &stack,
                observers,
                objects,
                out,
                &mut NoStatus,
            )),
        }
    })
}

/// Trace `count` observer rays (see `flatray_trace`). `out_transmittance` and
/// `out_status` may be NULL.
///
/// # Returns
/// As `flatray_true_positions`.
///
/// # Safety
/// `stack` NULL or valid; each array NULL (only with a count of 0, or for the
/// optional outputs) or valid for `count` elements; outputs must not overlap
/// inputs.
#[no_mangle]
pub unsafe extern "C" fn flatray_trace_rays(
    stack: *const FlatrayStack,
    observer_rays: *const Ray,
    count: usize,
    out_object_rays: *mut Ray,
    out_transmittance: *mut f64,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for each pointer.
        let stack = unsafe { stack_from(stack) }?;
        let rays = unsafe { slice_in(observer_rays, count) }?;
        let out = unsafe { slice_out(out_object_rays, count) }?;
        let transmittance = unsafe { optional_slice_out(out_transmittance, count) }?;
        match unsafe { optional_slice_out(out_status, count) }? {
            Some(status) => finish(batch::trace_rays(&stack, rays, out, transmittance, status)),
            None => finish(batch::trace_rays(
                &stack,
                rays,
                out,
                transmittance,
                &mut NoStatus,
            )),
        }
    })
}

#[cfg(all(test, feature = "std"))]
mod tests {
    use super::*;
    use crate::capi::FlatrayStack;

    fn lake() -> FlatrayStack {
        FlatrayStack {
            origin: Vec3::ZERO,
            normal: Vec3::new(0.0, 0.0, -1.0),
            n_observer: 1.000_28,
            layer_count: 0,
            thickness: [0.0; 8],
            n_layer: [0.0; 8],
            n_object: 1.334,
        }
    }

    #[test]
    fn lines_of_sight_report_each_point() {
        let drone = [Vec3::new(0.0, 0.0, 12.0)];
        let rocks = [
            Vec3::new(4.0, 1.0, -2.5),
            Vec3::new(f64::NAN, 0.0, -1.0),
            Vec3::new(1.0, 0.0, 3.0), // above the water
        ];
        let mut paths = [Path::NAN; 3];
        let mut status = [-1i32; 3];
        let rc = unsafe {
            flatray_lines_of_sight(
                &lake(),
                drone.as_ptr(),
                1,
                rocks.as_ptr(),
                3,
                paths.as_mut_ptr(),
                status.as_mut_ptr(),
            )
        };
        assert_eq!(rc, FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT); // the NaN point
        assert_eq!(status, [0, 2, 5]);
        let single = crate::line_of_sight(&lake().to_stack().unwrap(), drone[0], rocks[0]);
        assert_eq!(single, Ok(paths[0]));
        assert!(paths[1].direction.z.is_nan() && paths[2].transmittance.is_nan());
    }

    #[test]
    fn lines_of_sight_whole_call_errors_write_nothing() {
        let observers = [Vec3::new(0.0, 0.0, 12.0); 2];
        let rocks = [Vec3::new(4.0, 1.0, -2.5); 3];
        let mut paths = [Path::NAN; 3];
        paths[0].geometric_length = 7.0;
        let mut status = [-1i32; 3];
        let call = |stack: *const FlatrayStack,
                    obs: *const Vec3,
                    obs_n: usize,
                    pts: *const Vec3,
                    paths: &mut [Path; 3],
                    status: &mut [i32; 3]| unsafe {
            flatray_lines_of_sight(
                stack,
                obs,
                obs_n,
                pts,
                3,
                paths.as_mut_ptr(),
                status.as_mut_ptr(),
            )
        };
        let o = observers.as_ptr();
        let p = rocks.as_ptr();
        let null: *const Vec3 = core::ptr::null();
        let mut bad = lake();
        bad.n_object = -1.0;
        for (rc, want) in [
            (call(&lake(), o, 2, p, &mut paths, &mut status), 2), // 2 observers, 3 points
            (call(core::ptr::null(), o, 1, p, &mut paths, &mut status), 1),
            (call(&bad, o, 1, p, &mut paths, &mut status), 2),
            (call(&lake(), null, 1, p, &mut paths, &mut status), 1),
            (call(&lake(), o, 1, null, &mut paths, &mut status), 1),
        ] {
            assert_eq!(rc as i32, want);
            assert_eq!(status, [-1; 3]);
            assert_eq!(paths[0].geometric_length, 7.0);
        }
        let rc = unsafe {
            flatray_lines_of_sight(
                &lake(),
                o,
                1,
                p,
                3,
                core::ptr::null_mut(),
                status.as_mut_ptr(),
            )
        };
        assert_eq!(rc, FlatrayStatus::FLATRAY_ERR_NULL_POINTER);
        // An empty batch may be all NULL.
        let rc = unsafe {
            flatray_lines_of_sight(
                &lake(),
                null,
                0,
                null,
                0,
                core::ptr::null_mut(),
                core::ptr::null_mut(),
            )
        };
        assert_eq!(rc, FlatrayStatus::FLATRAY_OK);
    }
}
