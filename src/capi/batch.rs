//! Batch C functions: true positions, apparent positions and ray traces.
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
