//! Batch forms of the per-point functions (true and apparent positions, lines
//! of sight, traces), over caller slices, with a status per element.
//!
//! Conventions (DESIGN.md): a whole-call error (observer count neither 1 nor
//! the point count, an output slice too short) returns at once and writes
//! nothing. Otherwise every element is attempted; a failing element gets its
//! own status and NaN outputs and does not stop the rest. Nothing allocates.
//!
//! With the `parallel` feature (on by default) a batch of a few thousand
//! elements or more runs on every core (see [`crate::survey::parallel`]); each
//! element is computed by the same code, so the results are identical to a
//! one-thread run. The survey batches ([`crate::survey`]) follow the same rules.

use crate::error::{Error, Result, Status};
use crate::image::{apparent_position, true_position, Image};
use crate::path::{line_of_sight, trace, Path};
use crate::stack::Stack;
use crate::survey::parallel::{self, fill};
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
    /// The sink as plain storage a batch can split across threads. The default,
    /// [`SinkSlots::Opaque`], makes batches run on the calling thread and call
    /// [`StatusSink::record`] in index order.
    fn slots(&mut self) -> SinkSlots<'_> {
        SinkSlots::Opaque
    }
}

/// What a [`StatusSink`] is made of, so a batch can split it across threads.
#[derive(Debug)]
pub enum SinkSlots<'a> {
    /// A slice of statuses, indexed by element.
    Statuses(&'a mut [Status]),
    /// A slice of C status codes, indexed by element.
    Codes(&'a mut [i32]),
    /// Statuses are not kept.
    Discard,
    /// Anything else: the batch calls [`StatusSink::record`] itself.
    Opaque,
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
    fn slots(&mut self) -> SinkSlots<'_> {
        SinkSlots::Statuses(self)
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
    fn slots(&mut self) -> SinkSlots<'_> {
        SinkSlots::Codes(self)
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
    fn slots(&mut self) -> SinkSlots<'_> {
        SinkSlots::Discard
    }
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

    /// Count a failure of element `index`.
    #[inline]
    pub(crate) fn note(&mut self, index: usize, error: Error) {
        self.failed += 1;
        if self.first_failure.is_none() {
            self.first_failure = Some((index, error));
        }
    }

    /// The report of two consecutive pieces of a batch, `self` the earlier one.
    #[inline]
    pub(crate) fn merge(self, later: BatchReport) -> BatchReport {
        BatchReport {
            failed: self.failed + later.failed,
            first_failure: self.first_failure.or(later.first_failure),
        }
    }
}

/// Whole-call checks shared by the batches: `outputs` slices must hold
/// `count` elements and the sink `count` statuses.
pub(crate) fn check_lengths<S: StatusSink + ?Sized>(
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
pub(crate) fn check_observers(observers: &[Vec3], count: usize) -> Result<()> {
    if observers.len() == 1 || observers.len() == count {
        Ok(())
    } else {
        Err(Error::InvalidArgument(
            "observers must hold 1 point (shared) or one per point",
        ))
    }
}

#[inline]
pub(crate) fn observer_of(observers: &[Vec3], i: usize) -> Vec3 {
    let j = if observers.len() == 1 { 0 } else { i };
    observers.get(j).copied().unwrap_or(Vec3::NAN)
}

/// Run `each(observer, point)` over the points, writing results (`nan` for a
/// failed element) and statuses (on every core for large batches).
pub(crate) fn run_points<T, S, F>(
    observers: &[Vec3],
    points: &[Vec3],
    out: &mut [T],
    nan: T,
    status: &mut S,
    each: F,
) -> Result<BatchReport>
where
    T: Copy + Send + Sync,
    S: StatusSink + ?Sized,
    F: Fn(Vec3, Vec3) -> Result<T> + Sync,
{
    check_observers(observers, points.len())?;
    check_lengths(points.len(), &[out.len()], status)?;
    let n = points.len();
    let out = out.get_mut(..n).unwrap_or(&mut []);
    Ok(parallel::run(
        n,
        (points, out),
        status,
        |offset, (points, out), sink| {
            fill(offset, out, nan, sink, |i| {
                let p = points.get(i).copied().unwrap_or(Vec3::NAN);
                each(observer_of(observers, offset + i), p)
            })
        },
    ))
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
    run_points(observers, apparent, out, Vec3::NAN, status, |o, a| {
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
    run_points(observers, objects, out, Vec3::NAN, status, |o, x| {
        apparent_position(stack, o, x, image)
    })
}

/// [`line_of_sight`] from each observer to each object point (default
/// accuracy); conventions as [`true_positions`]. A failed element's path is
/// [`Path::NAN`].
///
/// # Errors
/// As [`true_positions`].
///
/// # Example
/// ```
/// use flatray::{batch, Layer, Path, Stack, Status, Vec3};
/// // A camera behind a 10 mm glass port (z forward); the second object is
/// // inside the port, not in the water.
/// let port = Stack::new(Vec3::new(0.0, 0.0, 0.04), Vec3::new(0.0, 0.0, 1.0),
///                       1.000_28, &[Layer::new(0.010, 1.52)], 1.339)?;
/// let camera = [Vec3::ZERO];
/// let objects = [Vec3::new(0.3, -0.1, 2.0), Vec3::new(0.0, 0.0, 0.045)];
/// let mut paths = [Path::NAN; 2];
/// let mut status = [Status::Ok; 2];
/// let report = batch::lines_of_sight(&port, &camera, &objects, &mut paths, &mut status[..])?;
/// assert_eq!(status, [Status::Ok, Status::WrongSide]);
/// assert_eq!(report.first_failure.map(|f| f.0), Some(1));
/// assert!((paths[0].direction.length() - 1.0).abs() < 1e-15);
/// assert!(paths[1].optical_length.is_nan());
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn lines_of_sight<S: StatusSink + ?Sized>(
    stack: &Stack,
    observers: &[Vec3],
    objects: &[Vec3],
    out: &mut [Path],
    status: &mut S,
) -> Result<BatchReport> {
    run_points(observers, objects, out, Path::NAN, status, |o, x| {
        line_of_sight(stack, o, x)
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
    let n = rays.len();
    let out = out.get_mut(..n).unwrap_or(&mut []);
    let transmittance = transmittance
        .take()
        .map(|t| t.get_mut(..n).unwrap_or(&mut []));
    Ok(parallel::run(
        n,
        (rays, out, transmittance),
        status,
        |offset, (rays, out, mut transmittance), sink| {
            let mut report = BatchReport::default();
            for (i, (&ray, slot)) in rays.iter().zip(out.iter_mut()).enumerate() {
                let (value, t) = match trace(stack, ray) {
                    Ok(traced) => {
                        sink.record(i, Status::Ok);
                        (traced.ray, traced.transmittance)
                    }
                    Err(e) => {
                        sink.record(i, e.status());
                        report.note(offset + i, e);
                        (Ray::NAN, f64::NAN)
                    }
                };
                *slot = value;
                if let Some(t_slot) = transmittance.as_deref_mut().and_then(|t| t.get_mut(i)) {
                    *t_slot = t;
                }
            }
            report
        },
    ))
}
