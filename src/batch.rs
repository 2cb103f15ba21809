//! Batch forms of the per-point functions, over caller slices, with a status
//! per element.
//!
//! Conventions (DESIGN.md): a whole-call error (observer count neither 1 nor
//! the point count, an output slice too short) returns at once and writes
//! nothing. Otherwise every element is attempted; a failing element gets its
//! own status and NaN outputs and does not stop the rest. Nothing allocates.

use crate::error::{Error, Result, Status};
use crate::image::{apparent_position, true_position, Image};
use crate::path::trace;
use crate::stack::Stack;
use crate::vector::{Ray, Vec3};

/// Where a batch writes each element's status.
///
/// Implemented for `[Status]`, for `[i32]` (the C codes) and for [`NoStatus`]
/// (discard).
pub trait StatusSink {
    /// How many statuses fit, `None` for no limit.
    fn capacity(&self) -> Option<usize>;
    /// Record the status of element `index` (ignored past the capacity).
    fn record(&mut self, index: usize, status: Status);
}

impl StatusSink for [Status] {
    fn capacity(&self) -> Option<usize> {
        Some(self.len())
    }
    #[inline]
    fn record(&mut self, index: usize, status: Status) {
        if let Some(slot) = self.get_mut(index) {
            *slot = status;
        }
    }
}

impl StatusSink for [i32] {
    fn capacity(&self) -> Option<usize> {
        Some(self.len())
    }
    #[inline]
    fn record(&mut self, index: usize, status: Status) {
        if let Some(slot) = self.get_mut(index) {
            *slot = status.code();
        }
    }
}

/// A [`StatusSink`] that keeps nothing (the summary still counts failures).
#[derive(Debug, Clone, Copy, Default)]
pub struct NoStatus;

impl StatusSink for NoStatus {
    fn capacity(&self) -> Option<usize> {
        None
    }
    #[inline]
    fn record(&mut self, _index: usize, _status: Status) {}
}

/// Summary of a batch in which every element was attempted.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct BatchReport {
    /// Elements that failed.
    pub failed: usize,
    /// The lowest-index failure: its index and error.
    pub first_failure: Option<(usize, Error)>,
}

impl BatchReport {
    /// `Status::Ok` when every element succeeded, else the status of the
    /// lowest-index failure (the C return value).
    pub fn status(&self) -> Status {
        match self.first_failure {
            None => Status::Ok,
            Some((_, e)) => e.status(),
        }
    }

    #[inline]
    fn note(&mut self, index: usize, error: Error) {
        self.failed += 1;
        if self.first_failure.is_none() {
            self.first_failure = Some((index, error));
        }
    }
}

/// Whole-call checks shared by the batches: `outputs` slices must hold
/// `count` elements and the sink `count` statuses.
fn check_lengths<S: StatusSink + ?Sized>(
    count: usize,
    outputs: &[usize],
    status: &S,
) -> Result<()> {
    if outputs.iter().any(|&len| len < count) || status.capacity().is_some_and(|c| c < count) {
        return Err(Error::BufferTooSmall(
            "an output slice is shorter than the input",
        ));
    }
    Ok(())
}

/// The observer of element `i`: one shared observer or one per point.
fn check_observers(observers: &[Vec3], count: usize) -> Result<()> {
    if observers.len() == 1 || observers.len() == count {
        Ok(())
    } else {
        Err(Error::InvalidArgument(
            "observers must hold 1 point (shared) or one per point",
        ))
    }
}

#[inline]
fn observer_of(observers: &[Vec3], i: usize) -> Vec3 {
    let j = if observers.len() == 1 { 0 } else { i };
    observers.get(j).copied().unwrap_or(Vec3::NAN)
}

/// Run `each` over the points, writing results and statuses.
fn run_points<S, F>(
    observers: &[Vec3],
    points: &[Vec3],
    out: &mut [Vec3],
    status: &mut S,
    each: F,
) -> Result<BatchReport>
where
    S: StatusSink + ?Sized,
    F: Fn(Vec3, Vec3) -> Result<Vec3>,
{
    check_observers(observers, points.len())?;
    check_lengths(points.len(), &[out.len()], status)?;
    let mut report = BatchReport::default();
    for (i, (&p, slot)) in points.iter().zip(out.iter_mut()).enumerate() {
        match each(observer_of(observers, i), p) {
            Ok(v) => {
                *slot = v;
                status.record(i, Status::Ok);
            }
            Err(e) => {
                *slot = Vec3::NAN;
                status.record(i, e.status());
                report.note(i, e);
            }
        }
    }
    Ok(report)
}

/// [`true_position`] of every apparent point.
///
/// `observers` holds one point shared by all, or one per apparent point. `out`
/// and `status` must hold at least `apparent.len()` elements.
///
/// # Errors
/// Whole-call errors only (nothing written): [`Error::InvalidArgument`] for an
/// observer count that is neither 1 nor `apparent.len()`,
/// [`Error::BufferTooSmall`] for short outputs. Element failures are in the
/// returned [`BatchReport`] and in `status`.
///
/// # Example
/// ```
/// use flatray::{batch, Image, Stack, Status, Vec3};
/// let pool = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.0, 1.333)?;
/// let eye = [Vec3::new(0.0, 0.0, 1.5)];
/// let seen = [Vec3::new(1.0, 0.0, -1.0), Vec3::new(0.0, 0.0, 2.0)]; // the second is above water
/// let mut truth = [Vec3::ZERO; 2];
/// let mut status = [Status::Ok; 2];
/// let report = batch::true_positions(&pool, &eye, &seen, Image::Sagittal, &mut truth, &mut status[..])?;
/// assert_eq!(report.failed, 1);
/// assert_eq!(status, [Status::Ok, Status::WrongSide]);
/// assert!(truth[1].x.is_nan());
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn true_positions<S: StatusSink + ?Sized>(
    stack: &Stack,
    observers: &[Vec3],
    apparent: &[Vec3],
    image: Image,
    out: &mut [Vec3],
    status: &mut S,
) -> Result<BatchReport> {
    run_points(observers, apparent, out, status, |o, a| {
        true_position(stack, o, a, image)
    })
}

/// [`apparent_position`] of every object point; conventions as
/// [`true_positions`].
///
/// # Errors
/// As [`true_positions`].
pub fn apparent_positions<S: StatusSink + ?Sized>(
    stack: &Stack,
    observers: &[Vec3],
    objects: &[Vec3],
    image: Image,
    out: &mut [Vec3],
    status: &mut S,
) -> Result<BatchReport> {
    run_points(observers, objects, out, status, |o, x| {
        apparent_position(stack, o, x, image)
    })
}

/// [`trace`] of every ray. `transmittance`, when given, receives each ray's
/// transmittance (NaN for a failed ray).
///
/// # Errors
/// [`Error::BufferTooSmall`] for short outputs (nothing written).
pub fn trace_rays<S: StatusSink + ?Sized>(
    stack: &Stack,
    rays: &[Ray],
    out: &mut [Ray],
    mut transmittance: Option<&mut [f64]>,
    status: &mut S,
) -> Result<BatchReport> {
    let t_len = transmittance.as_deref().map_or(usize::MAX, <[f64]>::len);
    check_lengths(rays.len(), &[out.len(), t_len], status)?;
    let mut report = BatchReport::default();
    for (i, (&ray, slot)) in rays.iter().zip(out.iter_mut()).enumerate() {
        let (value, t) = match trace(stack, ray) {
            Ok(traced) => {
                status.record(i, Status::Ok);
                (traced.ray, traced.transmittance)
            }
            Err(e) => {
                status.record(i, e.status());
                report.note(i, e);
                (Ray::NAN, f64::NAN)
            }
        };
        *slot = value;
        if let Some(t_slot) = transmittance.as_deref_mut().and_then(|t| t.get_mut(i)) {
            *t_slot = t;
        }
    }
    Ok(report)
}
