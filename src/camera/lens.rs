//! The in-air lens: pinhole intrinsics with Brown–Conrady distortion, and its
//! inverse.
//!
//! Camera frame: x right, y down, z forward, origin at the centre of
//! projection. A direction `(X, Y, Z)` with `Z > 0` has the *normalised*
//! (undistorted) image coordinates `x = X/Z`, `y = Y/Z`. The lens moves them to
//! the distorted coordinates (Brown–Conrady model: radial terms after A. E.
//! Conrady, "Decentred lens-systems", MNRAS 79 (1919) 384–390, and D. C. Brown,
//! "Decentering distortion of lenses", Photogrammetric Engineering 32(3)
//! (1966) 444–462; the even-polynomial radial and two-term tangential form
//! below is the one in common practice), with `r² = x² + y²`:
//!
//! ```text
//! x_d = x (1 + k1 r² + k2 r⁴ + k3 r⁶) + 2 p1 x y + p2 (r² + 2 x²)
//! y_d = y (1 + k1 r² + k2 r⁴ + k3 r⁶) + p1 (r² + 2 y²) + 2 p2 x y
//! ```
//!
//! and the pixel is `(u, v) = (fx x_d + cx, fy y_d + cy)`, pixel (0, 0) the
//! centre of the top-left pixel, u to the right, v down.
//!
//! # Where the model is valid
//!
//! A polynomial distortion folds back on itself far enough from the centre
//! (strong barrel distortion turns round), where two directions would share a
//! pixel. flatray uses the model only in its *valid region*: normalised
//! points with `r² < s_fold`, where `s_fold` is the smallest positive root of
//! `d r_d/d r = 1 + 3 k1 s + 5 k2 s² + 7 k3 s³` (`s = r²`; infinity when there is
//! none), and where the Jacobian determinant of the map above is positive.
//! Inside it the map is locally one-to-one and the undistortion (Newton's
//! method on the 2×2 system) converges; outside it a projection is
//! [`Error::OutOfRange`] and an undistortion [`Error::NotConverged`].

use crate::error::{finite, Error, Result};
use crate::math;

/// Pinhole intrinsics and Brown–Conrady distortion of a lens in air
/// (`FlatrayLens` in C).
///
/// Normalised coordinates `(x, y) = (X/Z, Y/Z)` of a direction in the camera
/// frame (x right, y down, z forward) are distorted, with `r² = x² + y²`, to
/// `x_d = x (1 + k1 r² + k2 r⁴ + k3 r⁶) + 2 p1 x y + p2 (r² + 2 x²)`,
/// `y_d = y (1 + k1 r² + k2 r⁴ + k3 r⁶) + p1 (r² + 2 y²) + 2 p2 x y`
/// (Brown 1966, Conrady 1919), and the pixel is `(fx x_d + cx, fy y_d + cy)`.
/// Units: `fx`, `fy`, `cx`, `cy` in pixels; the distortion coefficients are
/// unitless. `fx` and `fy` must be finite and > 0, every other field finite.
/// The model is used only where it is one-to-one (see `flatray::camera::lens`).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
#[repr(C)]
pub struct Lens {
    /// Focal length along x, pixels, > 0.
    pub fx: f64,
    /// Focal length along y, pixels, > 0.
    pub fy: f64,
    /// Principal point, x, pixels.
    pub cx: f64,
    /// Principal point, y, pixels.
    pub cy: f64,
    /// Radial distortion, r² term.
    pub k1: f64,
    /// Radial distortion, r⁴ term.
    pub k2: f64,
    /// Radial distortion, r⁶ term.
    pub k3: f64,
    /// Tangential (decentring) distortion, first term.
    pub p1: f64,
    /// Tangential (decentring) distortion, second term.
    pub p2: f64,
}

/// Tolerance of the undistortion, in normalised image coordinates: the last
/// Newton step is at most this long (the error after it is of the order of its
/// square, far smaller).
pub const UNDISTORT_TOLERANCE: f64 = 1e-12;

/// Most Newton steps of the undistortion before [`Error::NotConverged`]; inside
/// the valid region it typically takes 3 to 6.
pub const UNDISTORT_MAX_ITERATIONS: u32 = 100;

impl Lens {
    /// A distortion-free pinhole lens.
    pub const fn pinhole(fx: f64, fy: f64, cx: f64, cy: f64) -> Lens {
        Lens {
            fx,
            fy,
            cx,
            cy,
            k1: 0.0,
            k2: 0.0,
            k3: 0.0,
            p1: 0.0,
            p2: 0.0,
        }
    }

    /// The same intrinsics with radial (`k1`, `k2`, `k3`) and tangential (`p1`,
    /// `p2`) distortion.
    pub const fn with_distortion(self, k1: f64, k2: f64, k3: f64, p1: f64, p2: f64) -> Lens {
        Lens {
            k1,
            k2,
            k3,
            p1,
            p2,
            ..self
        }
    }

    /// The same intrinsics without distortion.
    pub const fn without_distortion(self) -> Lens {
        Lens::pinhole(self.fx, self.fy, self.cx, self.cy)
    }

    /// Check every field and precompute the valid region.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] when `fx` or `fy` is not finite and `> 0`, or
    /// another field is not finite.
    pub fn validate(&self) -> Result<Distortion> {
        if !(self.fx.is_finite() && self.fx > 0.0 && self.fy.is_finite() && self.fy > 0.0) {
            return Err(Error::InvalidArgument(
                "lens focal lengths fx and fy must be finite and > 0",
            ));
        }
        for v in [self.cx, self.cy] {
            finite(v, "lens principal point must be finite")?;
        }
        for v in [self.k1, self.k2, self.k3, self.p1, self.p2] {
            finite(v, "lens distortion coefficients must be finite")?;
        }
        Ok(Distortion::new(self))
    }

    /// Normalised (undistorted) coordinates to the pixel, through the
    /// distortion (module formulas).
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for an invalid lens or non-finite input;
    /// [`Error::OutOfRange`] outside the model's valid region.
    pub fn project(&self, x: f64, y: f64) -> Result<(f64, f64)> {
        self.validate()?.project(x, y)
    }

    /// The pixel `(u, v)` to normalised (undistorted) coordinates: the inverse
    /// of [`Lens::project`], by Newton's method to [`UNDISTORT_TOLERANCE`].
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for an invalid lens or non-finite input;
    /// [`Error::NotConverged`] when the pixel is not the image of any point of
    /// the valid region.
    ///
    /// # Example
    /// ```
    /// use flatray::camera::Lens;
    /// let lens = Lens::pinhole(1000.0, 1000.0, 640.0, 360.0).with_distortion(-0.2, 0.05, 0.0, 1e-3, -5e-4);
    /// let (x, y) = lens.unproject(1200.0, 100.0)?;
    /// let (u, v) = lens.project(x, y)?;
    /// assert!((u - 1200.0).abs() < 1e-9 && (v - 100.0).abs() < 1e-9);
    /// # Ok::<(), flatray::Error>(())
    /// ```
    pub fn unproject(&self, u: f64, v: f64) -> Result<(f64, f64)> {
        self.validate()?.unproject(u, v)
    }
}

/// A validated [`Lens`] with its valid region worked out (from
/// [`Lens::validate`]); the per-pixel maps of the camera use this.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Distortion {
    lens: Lens,
    /// `s_fold`: the valid region is `r² < fold_r2` (infinity when the radial
    /// map never turns round).
    fold_r2: f64,
    /// No distortion terms at all: the maps are the identity.
    identity: bool,
    /// Tangential terms present. Without them the Jacobian determinant is
    /// `radial · d(r·radial)/dr`, positive wherever `r² < fold_r2` (there
    /// `r·radial` rises from 0, so both factors are positive), and need not
    /// be checked.
    tangential: bool,
}

impl Distortion {
    fn new(lens: &Lens) -> Distortion {
        let identity =
            lens.k1 == 0.0 && lens.k2 == 0.0 && lens.k3 == 0.0 && lens.p1 == 0.0 && lens.p2 == 0.0;
        Distortion {
            lens: *lens,
            fold_r2: fold_radius_squared(3.0 * lens.k1, 5.0 * lens.k2, 7.0 * lens.k3),
            identity,
            tangential: lens.p1 != 0.0 || lens.p2 != 0.0,
        }
    }

    /// The lens.
    #[inline]
    pub fn lens(&self) -> &Lens {
        &self.lens
    }

    /// `s_fold`, the squared normalised radius where the radial distortion
    /// turns round (`f64::INFINITY` when it never does).
    #[inline]
    pub fn fold_radius_squared(&self) -> f64 {
        self.fold_r2
    }

    /// Distorted normalised coordinates and the Jacobian determinant of the map
    /// at `(x, y)`.
    #[inline]
    fn distort_with_det(&self, x: f64, y: f64) -> (f64, f64, f64) {
        let l = &self.lens;
        let x2 = x * x;
        let y2 = y * y;
        let xy = x * y;
        let r2 = x2 + y2;
        let radial = 1.0 + r2 * (l.k1 + r2 * (l.k2 + r2 * l.k3));
        // d(radial)/d(r²)
        let dradial = l.k1 + r2 * (2.0 * l.k2 + r2 * 3.0 * l.k3);
        let xd = x * radial + 2.0 * l.p1 * xy + l.p2 * (r2 + 2.0 * x2);
        let yd = y * radial + l.p1 * (r2 + 2.0 * y2) + 2.0 * l.p2 * xy;
        let (a, b, c, d) = self.jacobian_parts(x, y, radial, dradial);
        (xd, yd, a * d - b * c)
    }

    /// Jacobian `[[∂xd/∂x, ∂xd/∂y], [∂yd/∂x, ∂yd/∂y]]` of the distortion.
    #[inline]
    fn jacobian_parts(&self, x: f64, y: f64, radial: f64, dradial: f64) -> (f64, f64, f64, f64) {
        let l = &self.lens;
        let a = radial + 2.0 * x * x * dradial + 2.0 * l.p1 * y + 6.0 * l.p2 * x;
        let b = 2.0 * x * y * dradial + 2.0 * l.p1 * x + 2.0 * l.p2 * y;
        let c = 2.0 * x * y * dradial + 2.0 * l.p1 * x + 2.0 * l.p2 * y;
        let d = radial + 2.0 * y * y * dradial + 6.0 * l.p1 * y + 2.0 * l.p2 * x;
        (a, b, c, d)
    }

    /// `true` when `(x, y)` lies in the valid region.
    #[inline]
    pub fn is_valid(&self, x: f64, y: f64) -> bool {
        if self.identity {
            return x.is_finite() && y.is_finite();
        }
        let r2 = x * x + y * y;
        if r2 >= self.fold_r2 || !r2.is_finite() {
            return false;
        }
        if !self.tangential {
            return true;
        }
        let (_, _, det) = self.distort_with_det(x, y);
        det > 0.0
    }

    /// Distorted normalised coordinates of `(x, y)`, with no validity check.
    #[inline]
    pub fn distort(&self, x: f64, y: f64) -> (f64, f64) {
        if self.identity {
            return (x, y);
        }
        let l = &self.lens;
        let r2 = x * x + y * y;
        let radial = 1.0 + r2 * (l.k1 + r2 * (l.k2 + r2 * l.k3));
        if !self.tangential {
            return (x * radial, y * radial);
        }
        let xy = x * y;
        (
            x * radial + 2.0 * l.p1 * xy + l.p2 * (r2 + 2.0 * x * x),
            y * radial + l.p1 * (r2 + 2.0 * y * y) + 2.0 * l.p2 * xy,
        )
    }

    /// Normalised coordinates to the pixel (see [`Lens::project`]).
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for non-finite input, [`Error::OutOfRange`]
    /// outside the valid region or for a pixel too large to represent.
    #[inline]
    pub fn project(&self, x: f64, y: f64) -> Result<(f64, f64)> {
        if !(x.is_finite() && y.is_finite()) {
            return Err(Error::InvalidArgument(
                "normalised coordinates must be finite",
            ));
        }
        let (xd, yd) = if self.identity {
            (x, y)
        } else {
            let r2 = x * x + y * y;
            let (xd, yd, det) = if self.tangential {
                self.distort_with_det(x, y)
            } else {
                let (xd, yd) = self.distort(x, y);
                (xd, yd, 1.0)
            };
            if r2 >= self.fold_r2 || det <= 0.0 {
                return Err(Error::OutOfRange(
                    "the direction lies outside the region where the lens distortion model is one-to-one",
                ));
            }
            (xd, yd)
        };
        let u = self.lens.fx * xd + self.lens.cx;
        let v = self.lens.fy * yd + self.lens.cy;
        if u.is_finite() && v.is_finite() {
            Ok((u, v))
        } else {
            Err(Error::OutOfRange("the pixel is too far out to represent"))
        }
    }

    /// The pixel to normalised coordinates (see [`Lens::unproject`]).
    ///
    /// # Errors
    /// As [`Lens::unproject`].
    pub fn unproject(&self, u: f64, v: f64) -> Result<(f64, f64)> {
        if !(u.is_finite() && v.is_finite()) {
            return Err(Error::InvalidArgument("pixel coordinates must be finite"));
        }
        let xd = (u - self.lens.cx) / self.lens.fx;
        let yd = (v - self.lens.cy) / self.lens.fy;
        if !(xd.is_finite() && yd.is_finite()) {
            return Err(Error::OutOfRange("the pixel is too far out to represent"));
        }
        if self.identity {
            return Ok((xd, yd));
        }
        self.undistort(xd, yd)
    }

    /// Solve `distort(x, y) = (xd, yd)` by Newton's method on the 2×2 system,
    /// with step halving so the residual never grows and the iterate never
    /// leaves the valid region.
    fn undistort(&self, xd: f64, yd: f64) -> Result<(f64, f64)> {
        let not_converged = Error::NotConverged(
            "the pixel is not the image of a direction in the region where the lens distortion model is one-to-one",
        );
        // Start from one fixed-point step, x = xd / radial(xd), when it is valid.
        let (mut x, mut y) = (xd, yd);
        {
            let l = &self.lens;
            let r2 = xd * xd + yd * yd;
            let radial = 1.0 + r2 * (l.k1 + r2 * (l.k2 + r2 * l.k3));
            if radial > 0.0 && self.is_valid(xd / radial, yd / radial) {
                x = xd / radial;
                y = yd / radial;
            } else if !self.is_valid(x, y) {
                x = 0.0;
                y = 0.0;
            }
        }
        let (fx0, fy0) = self.distort(x, y);
        let mut rx = fx0 - xd;
        let mut ry = fy0 - yd;
        let mut residual = rx * rx + ry * ry;
        for _ in 0..UNDISTORT_MAX_ITERATIONS {
            let l = &self.lens;
            let r2 = x * x + y * y;
            let radial = 1.0 + r2 * (l.k1 + r2 * (l.k2 + r2 * l.k3));
            let dradial = l.k1 + r2 * (2.0 * l.k2 + r2 * 3.0 * l.k3);
            let (a, b, c, d) = self.jacobian_parts(x, y, radial, dradial);
            let det = a * d - b * c;
            if det.is_nan() || det <= 0.0 {
                return Err(not_converged);
            }
            // Newton step: J Δ = r.
            let mut dx = (d * rx - b * ry) / det;
            let mut dy = (a * ry - c * rx) / det;
            let step = math::hypot(dx, dy);
            if step <= UNDISTORT_TOLERANCE {
                let (x1, y1) = (x - dx, y - dy);
                if self.is_valid(x1, y1) {
                    return Ok((x1, y1));
                }
                return Err(not_converged);
            }
            // Halve the step until it stays valid and does not raise the residual.
            let mut accepted = false;
            for _ in 0..60 {
                let (x1, y1) = (x - dx, y - dy);
                if self.is_valid(x1, y1) {
                    let (gx, gy) = self.distort(x1, y1);
                    let (sx, sy) = (gx - xd, gy - yd);
                    let r1 = sx * sx + sy * sy;
                    if r1 <= residual {
                        x = x1;
                        y = y1;
                        rx = sx;
                        ry = sy;
                        residual = r1;
                        accepted = true;
                        break;
                    }
                }
                dx *= 0.5;
                dy *= 0.5;
            }
            if !accepted {
                // No decrease along the Newton direction: converged to rounding
                // only if the residual is already at rounding level.
                let floor = 4.0 * f64::EPSILON * (1.0 + math::hypot(xd, yd));
                if residual <= floor * floor {
                    return Ok((x, y));
                }
                return Err(not_converged);
            }
        }
        Err(not_converged)
    }
}

/// The smallest positive root of `g(s) = 1 + a s + b s² + c s³`, or infinity.
///
/// `g` is monotone between the roots of `g'(s) = a + 2 b s + 3 c s²`; the first
/// interval `[s0, s1]` with `g(s1) <= 0` holds the root, found by bisection to
/// the last bit.
fn fold_radius_squared(a: f64, b: f64, c: f64) -> f64 {
    let g = |s: f64| 1.0 + s * (a + s * (b + s * c));
    // Positive critical points of g, ascending.
    let mut breaks = [f64::INFINITY; 3];
    let mut n = 0;
    let mut push = |s: f64| {
        if s > 0.0 && s.is_finite() {
            if let Some(slot) = breaks.get_mut(n) {
                *slot = s;
                n += 1;
            }
        }
    };
    if c != 0.0 {
        let disc = b * b - 3.0 * a * c;
        if disc >= 0.0 {
            let sq = math::sqrt(disc);
            // Roots of 3c s² + 2b s + a, in the cancellation-free pairing.
            let q = -(b + if b >= 0.0 { sq } else { -sq });
            if q != 0.0 {
                push(q / (3.0 * c));
                push(a / q);
            } else {
                push(0.0);
            }
        }
    } else if b != 0.0 {
        push(-a / (2.0 * b));
    }
    let [first, second, _] = &mut breaks;
    if *second < *first {
        core::mem::swap(first, second);
    }
    let mut lo = 0.0;
    for &hi in breaks.iter() {
        let hi_value = if hi.is_finite() {
            g(hi)
        } else {
            // The sign at infinity is that of the leading coefficient.
            let lead = if c != 0.0 {
                c
            } else if b != 0.0 {
                b
            } else {
                a
            };
            if lead < 0.0 {
                -1.0
            } else {
                1.0
            }
        };
        if hi_value <= 0.0 {
            let mut top = hi;
            if !top.is_finite() {
                // Find a finite upper bound with g(top) <= 0.
                top = if lo > 0.0 { 2.0 * lo } else { 1.0 };
                let mut guard = 0;
                while g(top) > 0.0 && guard < 2100 {
                    top *= 2.0;
                    guard += 1;
                }
                if g(top).is_nan() || g(top) > 0.0 {
                    return f64::INFINITY;
                }
            }
            let mut bottom = lo;
            for _ in 0..200 {
                let mid = 0.5 * (bottom + top);
                if mid <= bottom || mid >= top {
                    break;
                }
                if g(mid) > 0.0 {
                    bottom = mid;
                } else {
                    top = mid;
                }
            }
            return bottom;
        }
        if !hi.is_finite() {
            break;
        }
        lo = hi;
    }
    f64::INFINITY
}

#[cfg(test)]
mod tests {
    use super::*;

    fn strong() -> Lens {
        Lens::pinhole(900.0, 905.0, 640.0, 360.0).with_distortion(-0.32, 0.11, -0.015, 8e-4, -6e-4)
    }

    #[test]
    fn fold_radius_is_where_the_radial_map_turns_round() {
        // r_d = r (1 + k1 r²), k1 < 0: d r_d/dr = 1 + 3 k1 r² = 0 at r² = -1/(3 k1) (elementary).
        let s = fold_radius_squared(3.0 * -0.25, 0.0, 0.0);
        assert!((s - 1.0 / 0.75).abs() < 1e-15);
        assert_eq!(fold_radius_squared(0.3, 0.0, 0.0), f64::INFINITY);
        assert_eq!(fold_radius_squared(0.0, 0.0, 0.0), f64::INFINITY);
        // A cubic with a root: check g vanishes there and is positive before it.
        let (a, b, c) = (3.0 * -0.32, 5.0 * 0.11, 7.0 * -0.015);
        let s = fold_radius_squared(a, b, c);
        let g = |s: f64| 1.0 + a * s + b * s * s + c * s * s * s;
        assert!(g(s).abs() < 1e-12, "{s} {}", g(s));
        for i in 0..100 {
            assert!(g(s * i as f64 / 100.0) > 0.0);
        }
        // Positive leading term, dipping below zero between two roots.
        let s = fold_radius_squared(-3.0, 0.5, 0.2);
        assert!(g_of(-3.0, 0.5, 0.2, s).abs() < 1e-12);
    }

    fn g_of(a: f64, b: f64, c: f64, s: f64) -> f64 {
        1.0 + a * s + b * s * s + c * s * s * s
    }

    #[test]
    fn unproject_inverts_project_over_the_image() {
        let d = strong().validate().unwrap();
        for i in 0..=40 {
            for j in 0..=24 {
                let u = -0.5 + 1280.0 * i as f64 / 40.0;
                let v = -0.5 + 720.0 * j as f64 / 24.0;
                let (x, y) = d.unproject(u, v).unwrap();
                let (u2, v2) = d.project(x, y).unwrap();
                // 1e-12 normalised tolerance times fx ≈ 1e-9 px, plus rounding.
                assert!((u2 - u).abs() < 1e-8 && (v2 - v).abs() < 1e-8, "{u} {v}");
            }
        }
    }

    #[test]
    fn outside_the_valid_region_is_reported() {
        let lens =
            Lens::pinhole(1000.0, 1000.0, 0.0, 0.0).with_distortion(-0.25, 0.0, 0.0, 0.0, 0.0);
        let d = lens.validate().unwrap();
        // The largest distorted radius is r(1 - 0.25 r²) at r² = 4/3: 2/(3√3)·2 ≈ 0.7698.
        let peak = (4.0f64 / 3.0).sqrt() * (1.0 - 0.25 * 4.0 / 3.0);
        assert!(d.unproject(1000.0 * (peak - 1e-3), 0.0).is_ok());
        assert!(matches!(
            d.unproject(1000.0 * (peak + 1e-3), 0.0),
            Err(Error::NotConverged(_))
        ));
        assert!(matches!(d.project(1.2, 0.0), Err(Error::OutOfRange(_))));
        assert!(d.project(1.1, 0.0).is_ok());
    }

    #[test]
    fn bad_lenses() {
        for lens in [
            Lens::pinhole(0.0, 1.0, 0.0, 0.0),
            Lens::pinhole(1.0, -1.0, 0.0, 0.0),
            Lens::pinhole(f64::NAN, 1.0, 0.0, 0.0),
            Lens::pinhole(1.0, 1.0, f64::INFINITY, 0.0),
            Lens::pinhole(1.0, 1.0, 0.0, 0.0).with_distortion(f64::NAN, 0.0, 0.0, 0.0, 0.0),
        ] {
            assert!(matches!(lens.validate(), Err(Error::InvalidArgument(_))));
        }
        let d = strong().validate().unwrap();
        assert!(matches!(
            d.unproject(f64::NAN, 0.0),
            Err(Error::InvalidArgument(_))
        ));
    }
}
