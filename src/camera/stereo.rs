//! Two flat-port cameras with a known relative pose: triangulation of a point
//! from one pixel in each image.
//!
//! Each pixel is back-projected through its own port into a ray in the water
//! ([`PortCamera::pixel_to_ray`]); camera B's ray is moved into camera A's
//! frame, and the point is the least-squares intersection of the two rays
//! ([`crate::lines::intersect`], shared with every triangulation in flatray).
//! Because the rays are the exact refracted rays, no in-water pinhole
//! approximation enters (the non-central model of Agrawal et al., CVPR 2012).

use crate::camera::port::PortCamera;
use crate::error::{Error, Result};
use crate::lines::intersect;
use crate::vector::{Ray, Vec3};

/// How far `RᵀR` may be from the identity (largest element) for `R` to count
/// as a rotation: rotations printed to 7 significant digits pass, transposed
/// or garbled matrices do not.
pub const ROTATION_TOLERANCE: f64 = 1e-6;

/// A rigid motion from camera B's frame to camera A's: `x_a = R x_b + t`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Pose {
    rotation: [[f64; 3]; 3],
    translation: Vec3,
}

impl Pose {
    /// The identity motion.
    pub const IDENTITY: Pose = Pose {
        rotation: [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]],
        translation: Vec3::ZERO,
    };

    /// A pose from its rotation `R` (rows) and translation `t` (metres).
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for a non-finite value, or an `R` that is not
    /// a proper rotation (`RᵀR = I` within [`ROTATION_TOLERANCE`], `det R > 0`).
    pub fn new(rotation: [[f64; 3]; 3], translation: Vec3) -> Result<Pose> {
        translation.finite("pose translation must be finite")?;
        if !rotation.iter().flatten().all(|v| v.is_finite()) {
            return Err(Error::InvalidArgument("pose rotation must be finite"));
        }
        let col = |j: usize| {
            let c = |i: usize| {
                rotation
                    .get(i)
                    .and_then(|r| r.get(j))
                    .copied()
                    .unwrap_or(f64::NAN)
            };
            Vec3::new(c(0), c(1), c(2))
        };
        let cols = [col(0), col(1), col(2)];
        for (j, a) in cols.iter().enumerate() {
            for (k, b) in cols.iter().enumerate() {
                let want = if j == k { 1.0 } else { 0.0 };
                if (a.dot(*b) - want).abs() > ROTATION_TOLERANCE {
                    return Err(Error::InvalidArgument(
                        "pose rotation must be orthonormal (R^T R = I)",
                    ));
                }
            }
        }
        let [c0, c1, c2] = cols;
        if c0.cross(c1).dot(c2) <= 0.0 {
            return Err(Error::InvalidArgument(
                "pose rotation must be proper (det R = +1, not a reflection)",
            ));
        }
        Ok(Pose {
            rotation,
            translation,
        })
    }

    /// A pose from 12 numbers: `R` row-major (9) then `t` (3), as in the C ABI.
    ///
    /// # Errors
    /// As [`Pose::new`].
    pub fn from_array(values: &[f64; 12]) -> Result<Pose> {
        let [r00, r01, r02, r10, r11, r12, r20, r21, r22, tx, ty, tz] = *values;
        Pose::new(
            [[r00, r01, r02], [r10, r11, r12], [r20, r21, r22]],
            Vec3::new(tx, ty, tz),
        )
    }

    /// The rotation, rows.
    pub fn rotation(&self) -> [[f64; 3]; 3] {
        self.rotation
    }

    /// The translation, metres.
    pub fn translation(&self) -> Vec3 {
        self.translation
    }

    /// `R v` (a direction).
    #[inline]
    pub fn rotate(&self, v: Vec3) -> Vec3 {
        let [r0, r1, r2] = self.rotation;
        let row = |r: [f64; 3]| r[0] * v.x + r[1] * v.y + r[2] * v.z;
        Vec3::new(row(r0), row(r1), row(r2))
    }

    /// `R p + t` (a point).
    #[inline]
    pub fn apply(&self, p: Vec3) -> Vec3 {
        self.rotate(p) + self.translation
    }
}

/// A triangulated point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StereoPoint {
    /// The point in camera A's frame, metres.
    pub point: Vec3,
    /// Root mean square distance from the point to the two refracted rays,
    /// metres (0 for rays that meet).
    pub rms_miss: f64,
}

/// Two flat-port cameras and the pose of B in A's frame.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StereoPair {
    /// Camera A: the reference frame.
    pub a: PortCamera,
    /// Camera B.
    pub b: PortCamera,
    /// From B's frame to A's: `x_a = R x_b + t`.
    pub b_to_a: Pose,
}

impl StereoPair {
    /// A pair of cameras.
    pub const fn new(a: PortCamera, b: PortCamera, b_to_a: Pose) -> StereoPair {
        StereoPair { a, b, b_to_a }
    }

    /// Camera B's refracted ray of its pixel `(u, v)`, in A's frame.
    ///
    /// # Errors
    /// As [`PortCamera::pixel_to_ray`].
    pub fn ray_b_in_a(&self, u: f64, v: f64) -> Result<Ray> {
        let r = self.b.pixel_to_ray(u, v)?;
        Ok(Ray::new(
            self.b_to_a.apply(r.origin),
            self.b_to_a.rotate(r.direction),
        ))
    }

    /// Triangulate the point seen at pixel `(u_a, v_a)` by A and `(u_b, v_b)`
    /// by B (real, distorted image coordinates).
    ///
    /// # Errors
    /// * As [`PortCamera::pixel_to_ray`] for either pixel.
    /// * [`Error::Degenerate`]: the two rays are parallel (or nearly so).
    /// * [`Error::WrongSide`]: the rays come closest behind a port (the
    ///   point would lie behind one camera's ray origin): the pixels do not
    ///   show one point.
    pub fn triangulate(&self, u_a: f64, v_a: f64, u_b: f64, v_b: f64) -> Result<StereoPoint> {
        let ra = self.a.pixel_to_ray(u_a, v_a)?;
        let rb = self.ray_b_in_a(u_b, v_b)?;
        let hit = intersect(&[ra, rb])?;
        for r in [ra, rb] {
            if (hit.point - r.origin).dot(r.direction) < 0.0 {
                return Err(Error::WrongSide(
                    "the rays come closest behind a port: the pixels do not show one point",
                ));
            }
        }
        Ok(StereoPoint {
            point: hit.point,
            rms_miss: hit.rms_miss,
        })
    }
}
