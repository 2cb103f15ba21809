//! `Vec3`, a plain three-component vector of `f64` (metres for points, unitless
//! for directions), and [`Ray`].
//!
//! Both are `#[repr(C)]` and cross the C boundary unchanged as `FlatrayVec3`
//! and `FlatrayRay`.

use core::ops::{Add, AddAssign, Mul, Neg, Sub};

use crate::error::{Error, Result};
use crate::math;

/// A point (metres) or a direction in 3D.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
#[repr(C)]
pub struct Vec3 {
    /// x component.
    pub x: f64,
    /// y component.
    pub y: f64,
    /// z component.
    pub z: f64,
}

impl Vec3 {
    /// The zero vector.
    /// cbindgen:ignore
    pub const ZERO: Vec3 = Vec3::new(0.0, 0.0, 0.0);
    /// A vector with every component NaN: what fallible calls write on error.
    /// cbindgen:ignore
    pub const NAN: Vec3 = Vec3::new(f64::NAN, f64::NAN, f64::NAN);

    /// A vector from its components.
    #[inline]
    pub const fn new(x: f64, y: f64, z: f64) -> Vec3 {
        Vec3 { x, y, z }
    }

    /// Dot product.
    #[inline]
    pub fn dot(self, o: Vec3) -> f64 {
        self.x * o.x + self.y * o.y + self.z * o.z
    }

    /// Cross product.
    #[inline]
    pub fn cross(self, o: Vec3) -> Vec3 {
        Vec3::new(
            self.y * o.z - self.z * o.y,
            self.z * o.x - self.x * o.z,
            self.x * o.y - self.y * o.x,
        )
    }

    /// Euclidean length. Large components are rescaled first, so the length of a
    /// vector near `f64::MAX` is finite when it is representable.
    #[inline]
    pub fn length(self) -> f64 {
        let sq = self.dot(self);
        // Fast path: the sum of squares neither overflowed nor lost digits to
        // underflow (each square of a component above 1e-146 is normal).
        if (1e-290..=1e290).contains(&sq) {
            return math::sqrt(sq);
        }
        let m = self.x.abs().max(self.y.abs()).max(self.z.abs());
        if m == 0.0 || !m.is_finite() {
            return m;
        }
        // Divide (not multiply by 1/m, which overflows for subnormal m).
        let s = Vec3::new(self.x / m, self.y / m, self.z / m);
        m * math::sqrt(s.dot(s))
    }

    /// `true` when every component is finite.
    #[inline]
    pub fn is_finite(self) -> bool {
        self.x.is_finite() && self.y.is_finite() && self.z.is_finite()
    }

    /// The unit vector along `self`, or `None` for a zero, subnormal-length or
    /// non-finite vector.
    ///
    /// See also [`Vec3::direction`], which returns the library's error instead.
    #[inline]
    pub fn try_normalize(self) -> Option<Vec3> {
        if !self.is_finite() {
            return None;
        }
        let len = self.length();
        if len.is_normal() {
            Some(Vec3::new(self.x / len, self.y / len, self.z / len))
        } else {
            None
        }
    }

    /// The unit vector along `self`.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] naming `what` for a zero, subnormal-length or
    /// non-finite vector.
    #[inline]
    pub fn direction(self, what: &'static str) -> Result<Vec3> {
        self.try_normalize().ok_or(Error::InvalidArgument(what))
    }

    /// `Err(InvalidArgument(what))` unless every component is finite.
    #[inline]
    pub(crate) fn finite(self, what: &'static str) -> Result<Vec3> {
        if self.is_finite() {
            Ok(self)
        } else {
            Err(Error::InvalidArgument(what))
        }
    }
}

impl Add for Vec3 {
    type Output = Vec3;
    #[inline]
    fn add(self, o: Vec3) -> Vec3 {
        Vec3::new(self.x + o.x, self.y + o.y, self.z + o.z)
    }
}

impl AddAssign for Vec3 {
    #[inline]
    fn add_assign(&mut self, o: Vec3) {
        *self = *self + o;
    }
}

impl Sub for Vec3 {
    type Output = Vec3;
    #[inline]
    fn sub(self, o: Vec3) -> Vec3 {
        Vec3::new(self.x - o.x, self.y - o.y, self.z - o.z)
    }
}

impl Mul<f64> for Vec3 {
    type Output = Vec3;
    #[inline]
    fn mul(self, s: f64) -> Vec3 {
        Vec3::new(self.x * s, self.y * s, self.z * s)
    }
}

impl Neg for Vec3 {
    type Output = Vec3;
    #[inline]
    fn neg(self) -> Vec3 {
        Vec3::new(-self.x, -self.y, -self.z)
    }
}

/// A ray: an origin (metres) and a propagation direction.
///
/// Directions returned by flatray are unit vectors; directions passed in need not
/// be (they are normalised, and a zero or non-finite one is an error).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
#[repr(C)]
pub struct Ray {
    /// Start point, metres.
    pub origin: Vec3,
    /// Propagation direction.
    pub direction: Vec3,
}

impl Ray {
    /// A ray from its origin and direction.
    #[inline]
    pub const fn new(origin: Vec3, direction: Vec3) -> Ray {
        Ray { origin, direction }
    }

    /// A ray with every component NaN: what fallible calls write on error.
    /// cbindgen:ignore
    pub const NAN: Ray = Ray::new(Vec3::NAN, Vec3::NAN);

    /// The point `origin + s * direction`.
    #[inline]
    pub fn at(&self, s: f64) -> Vec3 {
        self.origin + self.direction * s
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn normalize_rejects_degenerate_vectors() {
        assert!(Vec3::ZERO.try_normalize().is_none());
        assert!(Vec3::new(1e-310, 0.0, 0.0).try_normalize().is_none());
        assert!(Vec3::new(f64::NAN, 1.0, 0.0).try_normalize().is_none());
        assert!(Vec3::new(f64::INFINITY, 1.0, 0.0).try_normalize().is_none());
        let u = Vec3::new(3.0, 0.0, 4.0).try_normalize().unwrap();
        assert_eq!(u, Vec3::new(0.6, 0.0, 0.8));
    }

    #[test]
    fn length_survives_huge_and_tiny_components() {
        // 3-4-5 triangle scaled (exact in binary up to rounding of the scale).
        let big = Vec3::new(3e200, 4e200, 0.0).length();
        assert!((big / 5e200 - 1.0).abs() < 1e-15);
        let small = Vec3::new(3e-200, 4e-200, 0.0).length();
        assert!((small / 5e-200 - 1.0).abs() < 1e-15);
        // Subnormal components (a fuzz finding: 1/m overflowed and gave NaN).
        let tiny = Vec3::new(3.435_361_644_027e-311, 0.0, 0.0).length();
        assert_eq!(tiny, 3.435_361_644_027e-311);
    }
}
