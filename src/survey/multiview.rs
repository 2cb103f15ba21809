//! Multi-view correction of a point cloud triangulated as if light travelled
//! straight.
//!
//! Often all that is left of a photogrammetric survey is the uncorrected point
//! `A` (the least-squares intersection of straight lines of sight) and the
//! centres of the cameras that saw it. The true point `P` is the one whose
//! *exact* lines of sight from those centres, triangulated as straight lines in
//! the same way, give `A` back:
//!
//! `F(P) = LS({ line(c_i, d_i(P)) }) = A`,
//!
//! `d_i(P)` the line-of-sight direction from camera `c_i` to `P`
//! ([`crate::line_of_sight`], Fermat's principle) and `LS` the least-squares
//! point of lines with equal weights and perpendicular distances
//! ([`crate::lines`]). These are three equations in three unknowns;
//! [`correct_multiview`] solves them by Newton's method, starting from the
//! shortcut below, to [`MultiviewOptions::DEFAULT`] accuracy (well below
//! 1e-9 m at survey scales).
//!
//! The **shortcut** ([`correct_multiview_shortcut`]) traces each camera's
//! straight line to `A` through the surface and intersects the refracted rays.
//! It is exact only when the cameras stand symmetrically about the point; for
//! a real drone layout it misses by centimetres to decimetres. It is offered
//! for comparison and as the starting point of the solve.

use crate::batch::{check_lengths, BatchReport, StatusSink};
use crate::error::{Error, Result};
use crate::lines::{intersect_with, point_with, rms_miss_with, LinesPoint};
use crate::path::{line_of_sight, trace};
use crate::stack::Stack;
use crate::survey::triangulate::{check_offsets, group, in_object_medium, run_groups};
use crate::vector::{Ray, Vec3};

/// Accuracy settings of [`correct_multiview_with`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MultiviewOptions {
    /// The solve stops when a Newton step moves the point by less than
    /// `relative_tolerance × scale`, `scale` the largest camera-to-point
    /// distance (at least 1 m).
    pub relative_tolerance: f64,
    /// Most Newton steps before [`Error::NotConverged`].
    pub max_iterations: u32,
}

impl MultiviewOptions {
    /// Defaults: a relative tolerance of 1e-13 (3e-12 m at 30 m, a few ulps of
    /// the scale) and 50 steps (a solve typically takes 3 to 6).
    pub const DEFAULT: MultiviewOptions = MultiviewOptions {
        relative_tolerance: 1e-13,
        max_iterations: 50,
    };
}

impl Default for MultiviewOptions {
    fn default() -> Self {
        MultiviewOptions::DEFAULT
    }
}

/// Which multi-view correction a batch applies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Multiview {
    /// [`correct_multiview`]: the exact solve.
    Exact,
    /// [`correct_multiview_shortcut`]: the approximation.
    Shortcut,
}

/// Step of the finite-difference Jacobian, relative to the scale: central
/// differences have truncation error O(h²/scale²) ≈ 1e-12 and rounding error
/// ≈ 1e-15 × cond / 1e-6 ≈ 1e-8 relative, so Newton converges at a rate of
/// about 1e-8 per step.
const JACOBIAN_STEP: f64 = 1e-6;

/// A step below `STALL × scale` that no longer reduces the residual is
/// accepted: the residual has reached the rounding floor of the straight-line
/// triangulation (about 1e-15 × scale × its condition number).
const STALL: f64 = 1e-11;

/// The true point whose exact lines of sight from `observers` triangulate, as
/// straight lines, to the uncorrected point `apparent`, with default accuracy.
///
/// `observers`: camera centres (metres) on the observer's side of the stack,
/// at least two. `apparent`: the point triangulated as if light travelled
/// straight, beyond the first interface. The result's `rms_miss` (metres) is
/// the straight-line RMS miss of the solution: `√(mean squared perpendicular
/// distance)` from `apparent` to the exact straight lines of sight from the
/// cameras to the true point, the residual the original triangulation would
/// have shown for perfect measurements.
///
/// Method: Newton's method on `F(P) = A` (module docs) with a
/// central-difference Jacobian, damped by step halving, started from
/// [`correct_multiview_shortcut`].
///
/// # Errors
/// * [`Error::Degenerate`]: fewer than two observers, or lines of sight
///   (nearly) parallel (e.g. cameras stacked on one vertical over the point).
/// * [`Error::InvalidArgument`]: a non-finite point.
/// * [`Error::WrongSide`]: an observer past the first interface (a camera under
///   water), an apparent point on the observer's side (above the surface), or
///   no true point in the object's medium fits.
/// * [`Error::TotalInternalReflection`], [`Error::OutOfRange`]: as
///   [`crate::line_of_sight`] and [`crate::trace`].
/// * [`Error::NotConverged`]: the solve did not reach its accuracy.
///
/// # Example
/// ```
/// use flatray::{lines, line_of_sight, survey::correct_multiview, Ray, Stack, Vec3};
/// let lake = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.000_28, 1.339)?;
/// let rock = Vec3::new(3.0, -1.0, -2.0);
/// let cams = [Vec3::new(0.0, 0.0, 40.0), Vec3::new(15.0, 2.0, 38.0), Vec3::new(4.0, 14.0, 41.0)];
/// // What a refraction-blind triangulation reports.
/// let los = cams.map(|c| Ray::new(c, line_of_sight(&lake, c, rock).unwrap().direction));
/// let seen = lines::intersect(&los)?.point;
/// let fixed = correct_multiview(&lake, &cams, seen)?;
/// assert!((fixed.point - rock).length() < 1e-9);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn correct_multiview(stack: &Stack, observers: &[Vec3], apparent: Vec3) -> Result<LinesPoint> {
    correct_multiview_with(stack, observers, apparent, &MultiviewOptions::DEFAULT)
}

/// [`correct_multiview`] with explicit accuracy settings.
///
/// # Errors
/// As [`correct_multiview`].
pub fn correct_multiview_with(
    stack: &Stack,
    observers: &[Vec3],
    apparent: Vec3,
    options: &MultiviewOptions,
) -> Result<LinesPoint> {
    solve(
        stack,
        observers.len(),
        |i| observer_at(observers, i),
        apparent,
        options,
    )
}

/// The common approximation: each camera's straight line to `apparent` traced
/// through the stack ([`crate::trace`]), the refracted rays intersected by least
/// squares ([`crate::lines`]); `rms_miss` is their RMS miss. Exact only for
/// cameras placed symmetrically about the point.
///
/// # Errors
/// As [`correct_multiview`], without [`Error::NotConverged`].
pub fn correct_multiview_shortcut(
    stack: &Stack,
    observers: &[Vec3],
    apparent: Vec3,
) -> Result<LinesPoint> {
    shortcut(
        stack,
        observers.len(),
        |i| observer_at(observers, i),
        apparent,
    )
}

fn observer_at(observers: &[Vec3], i: usize) -> Result<Vec3> {
    observers
        .get(i)
        .copied()
        .ok_or(Error::InvalidArgument("observer index out of range"))
}

/// Shared checks: at least two views, finite points on the right sides.
/// Returns the scale: the largest observer-to-apparent distance, at least 1 m.
fn validate(
    stack: &Stack,
    count: usize,
    observer: &impl Fn(usize) -> Result<Vec3>,
    apparent: Vec3,
) -> Result<f64> {
    if count < 2 {
        return Err(Error::Degenerate("at least two views are needed"));
    }
    let apparent = apparent.finite("apparent point must be finite")?;
    if stack.height(apparent) < 0.0 {
        return Err(Error::WrongSide(
            "the apparent point must lie beyond the first interface",
        ));
    }
    let mut scale: f64 = 1.0;
    for i in 0..count {
        let c = observer(i)?.finite("observer must be finite")?;
        if stack.height(c) > 0.0 {
            return Err(Error::WrongSide(
                "every observer must be on the observer's side of the first interface",
            ));
        }
        scale = scale.max((c - apparent).length());
    }
    if !scale.is_finite() {
        return Err(Error::OutOfRange("the views are too far apart"));
    }
    Ok(scale)
}

fn shortcut(
    stack: &Stack,
    count: usize,
    observer: impl Fn(usize) -> Result<Vec3>,
    apparent: Vec3,
) -> Result<LinesPoint> {
    validate(stack, count, &observer, apparent)?;
    let hit = intersect_with(count, |i| {
        let c = observer(i)?;
        trace(stack, Ray::new(c, apparent - c)).map(|t| t.ray)
    })?;
    in_object_medium(stack, hit.point)?;
    Ok(hit)
}

/// The exact straight line of sight from camera `i` to `p`.
#[inline]
fn sight(
    stack: &Stack,
    observer: &impl Fn(usize) -> Result<Vec3>,
    i: usize,
    p: Vec3,
) -> Result<Ray> {
    let c = observer(i)?;
    Ok(Ray::new(c, line_of_sight(stack, c, p)?.direction))
}

/// `F(p)`: the straight-line least-squares point of the exact lines of sight.
fn forward(
    stack: &Stack,
    count: usize,
    observer: &impl Fn(usize) -> Result<Vec3>,
    p: Vec3,
) -> Result<Vec3> {
    point_with(count, |i| sight(stack, observer, i, p))
}

/// 3×3 matrix, rows.
type Mat3 = [Vec3; 3];

/// `J = ∂F/∂p` by central differences along an orthonormal basis `e1, e2, n̂`
/// (moving along `e1`, `e2` keeps the height; along `n̂` a one-sided
/// second-order difference is used when `p` is within two steps of the last
/// interface).
fn jacobian(
    stack: &Stack,
    count: usize,
    observer: &impl Fn(usize) -> Result<Vec3>,
    p: Vec3,
    f_p: Vec3,
    h: f64,
) -> Result<Mat3> {
    let n = stack.normal();
    let helper = if n.x.abs() < 0.9 {
        Vec3::new(1.0, 0.0, 0.0)
    } else {
        Vec3::new(0.0, 1.0, 0.0)
    };
    let e1 = n.cross(helper).direction("basis underflowed")?;
    let e2 = n.cross(e1);
    let f = |q: Vec3| forward(stack, count, observer, q);
    // Column k: derivative of F along basis vector b_k.
    let along = |b: Vec3| -> Result<Vec3> { Ok((f(p + b * h)? - f(p - b * h)?) * (0.5 / h)) };
    let c1 = along(e1)?;
    let c2 = along(e2)?;
    let cn = if stack.height(p) - 2.0 * h >= stack.total_thickness() {
        along(n)?
    } else {
        // (−3 F(p) + 4 F(p + h n̂) − F(p + 2h n̂)) / (2h)
        (f_p * -3.0 + f(p + n * h)? * 4.0 - f(p + n * (2.0 * h))?) * (0.5 / h)
    };
    // J = [c1 c2 cn] Bᵀ with B = [e1 e2 n̂] orthonormal: J_rc = Σ_k col_k[r] b_k[c].
    let row = |r: fn(Vec3) -> f64| e1 * r(c1) + e2 * r(c2) + n * r(cn);
    Ok([row(|v| v.x), row(|v| v.y), row(|v| v.z)])
}

/// Solve `J x = r` (Cramer's rule; `None` when `J` is singular or nearly so).
fn solve3(j: &Mat3, r: Vec3) -> Option<Vec3> {
    let [a, b, c] = *j;
    // Columns of J.
    let c0 = Vec3::new(a.x, b.x, c.x);
    let c1 = Vec3::new(a.y, b.y, c.y);
    let c2 = Vec3::new(a.z, b.z, c.z);
    let det = c0.dot(c1.cross(c2));
    let size = c0.length() * c1.length() * c2.length();
    // Written so that a NaN determinant is rejected too.
    if det.abs().partial_cmp(&(1e-12 * size)) != Some(core::cmp::Ordering::Greater) {
        return None;
    }
    let x = Vec3::new(
        r.dot(c1.cross(c2)) / det,
        c0.dot(r.cross(c2)) / det,
        c0.dot(c1.cross(r)) / det,
    );
    x.is_finite().then_some(x)
}

fn solve(
    stack: &Stack,
    count: usize,
    observer: impl Fn(usize) -> Result<Vec3>,
    apparent: Vec3,
    options: &MultiviewOptions,
) -> Result<LinesPoint> {
    let scale = validate(stack, count, &observer, apparent)?;
    let start = shortcut(stack, count, &observer, apparent)?.point;
    let tolerance = options.relative_tolerance * scale;
    let stall = STALL * scale;
    let h = JACOBIAN_STEP * scale;
    let t_last = stack.total_thickness();

    let mut p = start;
    let mut f_p = forward(stack, count, &observer, p)?;
    let mut r = f_p - apparent;
    let mut j = jacobian(stack, count, &observer, p, f_p, h)?;
    let mut previous_step = f64::INFINITY;
    let mut converged = false;
    for _ in 0..options.max_iterations {
        let delta = -solve3(&j, r).ok_or(Error::Degenerate(
            "the views do not fix the point (parallel lines of sight)",
        ))?;
        let step = delta.length();
        if step <= tolerance {
            let q = p + delta;
            if stack.height(q) >= t_last {
                p = q;
            }
            converged = true;
            break;
        }
        // Damped step: halve until the point stays in the object medium and
        // the residual decreases.
        let r_len = r.length();
        let mut t = 1.0;
        let mut accepted = None;
        for _ in 0..40 {
            let q = p + delta * t;
            if stack.height(q) >= t_last {
                if let Ok(f_q) = forward(stack, count, &observer, q) {
                    let r_q = f_q - apparent;
                    if r_q.length() < r_len {
                        accepted = Some((q, f_q, r_q));
                        break;
                    }
                }
            }
            t *= 0.5;
        }
        let Some((q, f_q, r_q)) = accepted else {
            if step <= stall {
                // At the rounding floor: no step can reduce the residual.
                converged = true;
                break;
            }
            return Err(Error::NotConverged(
                "the multi-view solve could not reduce its residual",
            ));
        };
        let moved = step * t;
        p = q;
        f_p = f_q;
        r = r_q;
        if moved <= tolerance {
            converged = true;
            break;
        }
        if moved > 0.25 * previous_step {
            // Convergence slowed: refresh the Jacobian.
            j = jacobian(stack, count, &observer, p, f_p, h)?;
        }
        previous_step = moved;
    }
    if !converged {
        return Err(Error::NotConverged(
            "the multi-view solve ran out of iterations",
        ));
    }
    let rms_miss = rms_miss_with(apparent, count, |i| sight(stack, &observer, i, p))?;
    Ok(LinesPoint { point: p, rms_miss })
}

/// Cameras and which of them saw each point, for [`correct_multiviews`].
///
/// Point `i` was seen by the cameras `cameras[ids[k]]` for `k` in
/// `offsets[i]..offsets[i + 1]`: `offsets` holds one more entry than there are
/// points, non-decreasing, the last at most `ids.len()`.
#[derive(Debug, Clone, Copy)]
pub struct Views<'a> {
    /// Camera centres, metres.
    pub cameras: &'a [Vec3],
    /// Start of each point's camera ids in `ids`, plus the end of the last.
    pub offsets: &'a [usize],
    /// Camera ids (indices into `cameras`).
    pub ids: &'a [u32],
}

impl Views<'_> {
    /// The `k`-th camera of point `i`.
    fn camera(&self, start: usize, k: usize) -> Result<Vec3> {
        let id = self
            .ids
            .get(start + k)
            .copied()
            .ok_or(Error::InvalidArgument("view index out of range"))?;
        usize::try_from(id)
            .ok()
            .and_then(|id| self.cameras.get(id).copied())
            .ok_or(Error::InvalidArgument("camera id out of range"))
    }
}

/// [`correct_multiview`] (or the shortcut, by `method`) of every apparent
/// point, with the cameras of each point given by `views`.
///
/// Writes each true point to `out[i]` and, when given, its RMS miss to `rms[i]`
/// (NaN for a failed point), and each status to `status`; a camera id outside
/// `views.cameras` fails that point with [`Error::InvalidArgument`]. Runs on
/// every core for large batches.
///
/// # Errors
/// Whole-call errors only (nothing written): [`Error::InvalidArgument`] when
/// `views.offsets` does not hold `apparent.len() + 1` non-decreasing entries
/// ending within `views.ids`; [`Error::BufferTooSmall`] for short outputs.
pub fn correct_multiviews<S: StatusSink + ?Sized>(
    stack: &Stack,
    views: &Views<'_>,
    apparent: &[Vec3],
    method: Multiview,
    out: &mut [Vec3],
    rms: Option<&mut [f64]>,
    status: &mut S,
) -> Result<BatchReport> {
    let groups = check_offsets(views.offsets, views.ids.len())?;
    let n = apparent.len();
    if groups != n && !(n == 0 && views.offsets.is_empty()) {
        return Err(Error::InvalidArgument(
            "view offsets must hold one more entry than there are points",
        ));
    }
    let rms_len = rms.as_deref().map_or(usize::MAX, <[f64]>::len);
    check_lengths(n, &[out.len(), rms_len], status)?;
    let out = out.get_mut(..n).unwrap_or(&mut []);
    let rms = rms.map(|r| r.get_mut(..n).unwrap_or(&mut []));
    Ok(run_groups(n, out, rms, status, |i| {
        let a = apparent.get(i).copied().unwrap_or(Vec3::NAN);
        let (start, end) = group(views.offsets, i);
        let camera = |k: usize| views.camera(start, k);
        match method {
            Multiview::Exact => solve(stack, end - start, camera, a, &MultiviewOptions::DEFAULT),
            Multiview::Shortcut => shortcut(stack, end - start, camera, a),
        }
    }))
}
