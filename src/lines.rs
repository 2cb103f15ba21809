//! The least-squares point of several lines in 3D: the point that minimises
//! the sum of squared perpendicular distances to the lines.
//!
//! Shared by every triangulation in flatray (survey views, stereo cameras).
//!
//! For lines `o_i + s d̂_i`, the squared distance of `p` to line `i` is
//! `|(I − d̂_i d̂_iᵀ)(p − o_i)|²`; setting the gradient of the sum to zero gives
//! the 3×3 normal equations `A p = b` with `A = Σ (I − d̂_i d̂_iᵀ)` and
//! `b = Σ (I − d̂_i d̂_iᵀ) o_i` (e.g. R. Hartley, A. Zisserman, *Multiple View
//! Geometry*, 2nd ed., §12.2 discusses this midpoint-type estimate; the algebra
//! is elementary). `A` is symmetric positive semi-definite with eigenvalues in
//! `[0, N]`; it is singular exactly when all lines are parallel.

use crate::error::{Error, Result};
use crate::math;
use crate::vector::{Ray, Vec3};

/// Least-squares intersection of lines.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LinesPoint {
    /// The point closest to all lines in the least-squares sense, metres.
    pub point: Vec3,
    /// `√(mean of the squared perpendicular distances)` from the point to the
    /// full lines, metres.
    pub rms_miss: f64,
}

/// Smallest pivot of the normal equations, relative to the number of lines,
/// below which the lines count as parallel: lines within about 1e-6 rad of
/// parallel (pivot ≈ α²/2 per pair) fix no point to better than 1e6 times their
/// scale, which no survey or camera can use.
pub const PARALLEL_PIVOT: f64 = 1e-12;

/// The least-squares point of `lines` (origins and directions; directions need
/// not be unit length).
///
/// # Errors
/// * [`Error::Degenerate`]: fewer than two lines, or lines (nearly) parallel.
/// * [`Error::InvalidArgument`]: a non-finite origin, a zero or non-finite direction.
/// * [`Error::OutOfRange`]: the point is too far to represent.
///
/// # Example
/// ```
/// use flatray::{lines::intersect, Ray, Vec3};
/// let a = Ray::new(Vec3::new(-1.0, 0.0, 0.0), Vec3::new(1.0, 0.0, 1.0));
/// let b = Ray::new(Vec3::new(1.0, 0.0, 0.0), Vec3::new(-1.0, 0.0, 1.0));
/// let hit = intersect(&[a, b])?;
/// assert!((hit.point - Vec3::new(0.0, 0.0, 1.0)).length() < 1e-15);
/// assert!(hit.rms_miss < 1e-15);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn intersect(lines: &[Ray]) -> Result<LinesPoint> {
    intersect_with(lines.len(), |i| {
        lines
            .get(i)
            .copied()
            .ok_or(Error::InvalidArgument("line index out of range"))
    })
}

/// [`intersect`] over `count` lines produced on demand by `line(i)`,
/// `i = 0..count`, so callers that compute their lines (refracted rays, views
/// chosen by index) need no buffer. `line` is called twice per line (once for
/// the normal equations, once for the miss distances) and must return the same
/// line both times; its first error is returned.
///
/// # Errors
/// As [`intersect`], plus any error of `line`.
pub fn intersect_with<F>(count: usize, line: F) -> Result<LinesPoint>
where
    F: Fn(usize) -> Result<Ray>,
{
    let point = point_with(count, &line)?;
    let rms_miss = rms_miss_with(point, count, &line)?;
    Ok(LinesPoint { point, rms_miss })
}

/// The least-squares point of [`intersect_with`] without the miss distances:
/// `line` is called once per line. For iterative solvers that need only the point.
///
/// # Errors
/// As [`intersect_with`].
pub fn point_with<F>(count: usize, line: F) -> Result<Vec3>
where
    F: Fn(usize) -> Result<Ray>,
{
    if count < 2 {
        return Err(Error::Degenerate("at least two lines are needed"));
    }
    // Work relative to the first origin so large coordinates do not cost digits.
    let mut base = Vec3::ZERO;
    // Symmetric A as (xx, xy, xz, yy, yz, zz).
    let mut a = [0.0f64; 6];
    let mut b = Vec3::ZERO;
    for i in 0..count {
        let l = line(i)?;
        let origin = l.origin.finite("line origin must be finite")?;
        if i == 0 {
            base = origin;
        }
        let o = origin - base;
        let d = l
            .direction
            .direction("line direction must be finite and non-zero")?;
        let m = [
            1.0 - d.x * d.x,
            -d.x * d.y,
            -d.x * d.z,
            1.0 - d.y * d.y,
            -d.y * d.z,
            1.0 - d.z * d.z,
        ];
        for (acc, v) in a.iter_mut().zip(m) {
            *acc += v;
        }
        b += Vec3::new(
            m[0] * o.x + m[1] * o.y + m[2] * o.z,
            m[1] * o.x + m[3] * o.y + m[4] * o.z,
            m[2] * o.x + m[4] * o.y + m[5] * o.z,
        );
    }
    let threshold = PARALLEL_PIVOT * count as f64;
    let p = solve_spd(a, b, threshold)
        .ok_or(Error::Degenerate("the lines are parallel or nearly so"))?;
    let point = base + p;
    if !point.is_finite() {
        return Err(Error::OutOfRange(
            "the intersection is too far to represent",
        ));
    }
    Ok(point)
}

/// `√(mean of the squared perpendicular distances)` from `point` to `count`
/// lines produced by `line(i)`: the quality figure of [`intersect`] for any
/// point, e.g. a given apparent point.
///
/// # Errors
/// [`Error::Degenerate`] for no lines; [`Error::InvalidArgument`] for a zero or
/// non-finite direction; [`Error::OutOfRange`] when the result overflows; any
/// error of `line`.
pub fn rms_miss_with<F>(point: Vec3, count: usize, line: F) -> Result<f64>
where
    F: Fn(usize) -> Result<Ray>,
{
    if count == 0 {
        return Err(Error::Degenerate("at least one line is needed"));
    }
    // Σ |perp|² with the running scale of the largest distance (as a scaled
    // hypot), so distances beyond 1e154 m cannot overflow the squares.
    let mut scale = 0.0f64;
    let mut sum = 0.0;
    for i in 0..count {
        let l = line(i)?;
        let d = l
            .direction
            .direction("line direction must be finite and non-zero")?;
        let v = point - l.origin;
        let dist = (v - d * v.dot(d)).length();
        if dist > scale {
            sum = sum * (scale / dist) * (scale / dist) + 1.0;
            scale = dist;
        } else if scale > 0.0 {
            sum += (dist / scale) * (dist / scale);
        }
    }
    let rms = scale * math::sqrt(sum / count as f64);
    if rms.is_finite() {
        Ok(rms)
    } else {
        Err(Error::OutOfRange("the RMS miss is too large to represent"))
    }
}

/// `pivot > min`, false for NaN.
#[inline]
fn above(pivot: f64, min: f64) -> bool {
    pivot > min
}

/// Solve `A x = b` for symmetric positive semi-definite `A` (packed
/// `xx, xy, xz, yy, yz, zz`) by an LDLᵀ factorisation; `None` when a pivot is
/// at or below `min_pivot` (singular or nearly so).
fn solve_spd(a: [f64; 6], b: Vec3, min_pivot: f64) -> Option<Vec3> {
    let [a00, a01, a02, a11, a12, a22] = a;
    let d0 = a00;
    if !above(d0, min_pivot) {
        return None;
    }
    let l10 = a01 / d0;
    let l20 = a02 / d0;
    let d1 = a11 - l10 * l10 * d0;
    if !above(d1, min_pivot) {
        return None;
    }
    let l21 = (a12 - l20 * l10 * d0) / d1;
    let d2 = a22 - l20 * l20 * d0 - l21 * l21 * d1;
    if !above(d2, min_pivot) {
        return None;
    }
    // Forward: L y = b; diagonal: z = y / d; back: Lᵀ x = z.
    let y0 = b.x;
    let y1 = b.y - l10 * y0;
    let y2 = b.z - l20 * y0 - l21 * y1;
    let z2 = y2 / d2;
    let z1 = y1 / d1 - l21 * z2;
    let z0 = y0 / d0 - l10 * z1 - l20 * z2;
    Some(Vec3::new(z0, z1, z2))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn skew_lines_meet_at_the_midpoint_of_their_common_perpendicular() {
        // Two skew lines: the x axis at z = 0 and the y axis at z = 2. The
        // least-squares point is (0, 0, 1) at distance 1 from each (elementary).
        let a = Ray::new(Vec3::new(5.0, 0.0, 0.0), Vec3::new(1.0, 0.0, 0.0));
        let b = Ray::new(Vec3::new(0.0, -3.0, 2.0), Vec3::new(0.0, 2.0, 0.0));
        let hit = intersect(&[a, b]).unwrap();
        assert!((hit.point - Vec3::new(0.0, 0.0, 1.0)).length() < 1e-15);
        assert!((hit.rms_miss - 1.0).abs() < 1e-15);
    }

    #[test]
    fn many_lines_through_one_point_far_from_the_origin() {
        let target = Vec3::new(1e6 + 0.25, -2e6, 35.5);
        let lines: std::vec::Vec<Ray> = (0..7)
            .map(|i| {
                let o = Vec3::new(
                    1e6 + i as f64 * 13.0,
                    -2e6 + (i * i) as f64,
                    80.0 + i as f64,
                );
                Ray::new(o, target - o)
            })
            .collect();
        let hit = intersect(&lines).unwrap();
        assert!((hit.point - target).length() < 1e-9, "{:?}", hit.point);
        assert!(hit.rms_miss < 1e-9);
    }

    #[test]
    fn parallel_lines_and_single_lines_are_degenerate() {
        let a = Ray::new(Vec3::ZERO, Vec3::new(0.0, 0.0, 1.0));
        let b = Ray::new(Vec3::new(1.0, 0.0, 0.0), Vec3::new(0.0, 0.0, 2.0));
        assert!(matches!(intersect(&[a, b]), Err(Error::Degenerate(_))));
        assert!(matches!(intersect(&[a]), Err(Error::Degenerate(_))));
        assert!(matches!(intersect(&[]), Err(Error::Degenerate(_))));
        let nan = Ray::new(Vec3::new(f64::NAN, 0.0, 0.0), Vec3::new(1.0, 0.0, 0.0));
        assert!(matches!(
            intersect(&[a, nan]),
            Err(Error::InvalidArgument(_))
        ));
    }
}
