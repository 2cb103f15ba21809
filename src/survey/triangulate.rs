//! Refracted-ray triangulation: lines of sight from cameras, traced through the
//! stack, meet (in the least-squares sense) at the true point.

use crate::batch::{check_lengths, BatchReport, StatusSink};
use crate::error::{Error, Result, Status};
use crate::lines::{intersect_with, LinesPoint};
use crate::path::trace;
use crate::stack::{Region, Stack};
use crate::survey::parallel::{self, SinkPart};
use crate::vector::{Ray, Vec3};

/// The true point seen along `lines_of_sight`: each line (origin = camera
/// centre on the observer's side, direction toward the object in the
/// observer's medium, any non-zero length) is traced through the stack
/// ([`crate::trace`], Snell's law at every interface) and the refracted rays
/// are intersected by least squares ([`crate::lines::intersect`]: the point
/// minimising the sum of squared perpendicular distances to the full lines).
///
/// `rms_miss` (metres) is `√(mean of the squared perpendicular distances)` from
/// the point to the refracted lines: 0 for consistent measurements, larger for
/// noisy ones. This is the exact method when image measurements are at hand;
/// with only an uncorrected point use [`super::correct_multiview`].
///
/// # Errors
/// * [`Error::Degenerate`]: fewer than two lines, or refracted rays (nearly)
///   parallel.
/// * As [`crate::trace`] for each line: [`Error::InvalidArgument`],
///   [`Error::WrongSide`] (a camera past the first interface, i.e. under
///   water), [`Error::MissesInterface`] (a line parallel to the interfaces or
///   pointing away), [`Error::TotalInternalReflection`], [`Error::OutOfRange`].
/// * [`Error::WrongSide`]: the refracted rays meet before the last interface
///   (they diverge: no object point fits them).
///
/// # Example
/// ```
/// use flatray::{line_of_sight, survey::triangulate, Ray, Stack, Vec3};
/// let lake = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.000_28, 1.339)?;
/// let rock = Vec3::new(2.0, -1.0, -1.5);
/// let cams = [Vec3::new(0.0, 0.0, 30.0), Vec3::new(12.0, 3.0, 28.0)];
/// let los = cams.map(|c| Ray::new(c, line_of_sight(&lake, c, rock).unwrap().direction));
/// let hit = triangulate(&lake, &los)?;
/// assert!((hit.point - rock).length() < 1e-9);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn triangulate(stack: &Stack, lines_of_sight: &[Ray]) -> Result<LinesPoint> {
    triangulate_by(stack, lines_of_sight.len(), |i| {
        lines_of_sight
            .get(i)
            .copied()
            .ok_or(Error::InvalidArgument("line index out of range"))
    })
}

/// [`triangulate`] over `count` lines of sight produced by `line(i)`.
pub(crate) fn triangulate_by(
    stack: &Stack,
    count: usize,
    line: impl Fn(usize) -> Result<Ray>,
) -> Result<LinesPoint> {
    if count < 2 {
        return Err(Error::Degenerate("at least two lines of sight are needed"));
    }
    let hit = intersect_with(count, |i| trace(stack, line(i)?).map(|t| t.ray))?;
    in_object_medium(stack, hit.point)?;
    Ok(hit)
}

/// `Err(WrongSide)` unless `p` is in the object's medium.
pub(crate) fn in_object_medium(stack: &Stack, p: Vec3) -> Result<()> {
    if stack.region(p) == Region::Object {
        Ok(())
    } else {
        Err(Error::WrongSide(
            "the refracted rays meet before the last interface",
        ))
    }
}

/// Check CSR-style group offsets: group `i` is `items[offsets[i]..offsets[i+1]]`.
/// Returns the number of groups (`offsets.len() − 1`, 0 for an empty slice).
pub(crate) fn check_offsets(offsets: &[usize], items: usize) -> Result<usize> {
    let bad = Error::InvalidArgument(
        "group offsets must be non-decreasing and end within the item array",
    );
    let mut prev = None;
    for &o in offsets {
        if prev.is_some_and(|p| o < p) || o > items {
            return Err(bad);
        }
        prev = Some(o);
    }
    Ok(offsets.len().saturating_sub(1))
}

/// The range `offsets[i]..offsets[i+1]`.
#[inline]
pub(crate) fn group(offsets: &[usize], i: usize) -> (usize, usize) {
    let start = offsets.get(i).copied().unwrap_or(0);
    let end = offsets.get(i + 1).copied().unwrap_or(start);
    (start, end.max(start))
}

/// [`triangulate`] for many points: point `i` is seen along
/// `lines[offsets[i]..offsets[i + 1]]` (so `offsets` holds one more entry than
/// there are points, non-decreasing, the last at most `lines.len()`).
///
/// Writes each point to `out[i]` and, when given, its RMS miss to `rms[i]`
/// (NaN for a failed point), and each status to `status`. Runs on every core
/// for large batches (the `parallel` feature).
///
/// # Errors
/// Whole-call errors only (nothing written): [`Error::InvalidArgument`] for
/// malformed offsets, [`Error::BufferTooSmall`] for short outputs. Element
/// failures are in the returned [`BatchReport`] and in `status`.
pub fn triangulations<S: StatusSink + ?Sized>(
    stack: &Stack,
    lines: &[Ray],
    offsets: &[usize],
    out: &mut [Vec3],
    rms: Option<&mut [f64]>,
    status: &mut S,
) -> Result<BatchReport> {
    let n = check_offsets(offsets, lines.len())?;
    let rms_len = rms.as_deref().map_or(usize::MAX, <[f64]>::len);
    check_lengths(n, &[out.len(), rms_len], status)?;
    let out = out.get_mut(..n).unwrap_or(&mut []);
    let rms = rms.map(|r| r.get_mut(..n).unwrap_or(&mut []));
    Ok(run_groups(n, out, rms, status, |i| {
        let (start, end) = group(offsets, i);
        triangulate_by(stack, end - start, |k| {
            lines
                .get(start + k)
                .copied()
                .ok_or(Error::InvalidArgument("line index out of range"))
        })
    }))
}

/// Run `each(i)` for `n` points, writing points, optional RMS misses and statuses.
pub(crate) fn run_groups<S, F>(
    n: usize,
    out: &mut [Vec3],
    rms: Option<&mut [f64]>,
    status: &mut S,
    each: F,
) -> BatchReport
where
    S: StatusSink + ?Sized,
    F: Fn(usize) -> Result<LinesPoint> + Sync,
{
    parallel::run_with_grain(
        parallel::COSTLY_GRAIN,
        n,
        (out, rms),
        status,
        |offset, (out, mut rms): (&mut [Vec3], Option<&mut [f64]>), sink: &mut SinkPart<'_>| {
            let mut report = BatchReport::default();
            for (i, slot) in out.iter_mut().enumerate() {
                let (p, r) = match each(offset + i) {
                    Ok(hit) => {
                        sink.record(i, Status::Ok);
                        (hit.point, hit.rms_miss)
                    }
                    Err(e) => {
                        sink.record(i, e.status());
                        report.note(offset + i, e);
                        (Vec3::NAN, f64::NAN)
                    }
                };
                *slot = p;
                if let Some(r_slot) = rms.as_deref_mut().and_then(|r| r.get_mut(i)) {
                    *r_slot = r;
                }
            }
            report
        },
    )
}
