//! A camera behind a flat port: pixel to ray (back-projection) and point to
//! pixel (forward projection), single and batch.
//!
//! The port is a [`Stack`] given in the camera frame (x right, y down,
//! z forward, origin at the centre of projection): the observer's medium is
//! the air (or gas) inside the housing, the layers are the port's window(s),
//! the object's medium is the water outside. The port may be tilted and
//! offset; the centre of projection must lie on the observer's side. Such a
//! camera has no single viewpoint: the rays of its pixels do not meet in one
//! point in the water (A. Agrawal, S. Ramalingam, Y. Taguchi, V. Chari, "A
//! theory of multi-layer flat refractive geometry", CVPR 2012, §3).
//!
//! * Back-projection: the pixel is undistorted ([`Lens::unproject`]), the
//!   direction `(x, y, 1)` leaves the centre and is refracted through the port
//!   by Snell's law ([`crate::trace`]); the result is the ray in the water,
//!   starting on the port's outer face.
//! * Forward projection: the line of sight from the centre to the point is
//!   solved from Fermat's principle ([`crate::line_of_sight`]); its direction in
//!   the housing is projected through the lens.

use crate::batch::{BatchReport, StatusSink};
use crate::camera::lens::{Distortion, Lens};
use crate::error::{Error, Result, Status};
use crate::path::{line_of_sight, trace};
use crate::stack::Stack;
use crate::vector::{Ray, Vec3};

/// A lens in a housing with a flat port: the exact non-central camera model.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PortCamera {
    lens: Distortion,
    port: Stack,
}

impl PortCamera {
    /// A camera with `lens` behind `port` (a stack in the camera frame).
    ///
    /// # Errors
    /// * [`Error::InvalidArgument`]: an invalid lens ([`Lens::validate`]).
    /// * [`Error::WrongSide`]: the centre of projection (the camera frame's
    ///   origin) is not on the observer's side of the port.
    ///
    /// # Example
    /// ```
    /// use flatray::camera::{Lens, PortCamera};
    /// use flatray::{Layer, Stack, Vec3};
    /// // An 8 mm glass port 30 mm in front of the lens, sea water outside.
    /// let port = Stack::new(Vec3::new(0.0, 0.0, 0.03), Vec3::new(0.0, 0.0, 1.0),
    ///                       1.000_28, &[Layer::new(0.008, 1.52)], 1.339)?;
    /// let cam = PortCamera::new(Lens::pinhole(1400.0, 1400.0, 959.5, 539.5), port)?;
    /// let ray = cam.pixel_to_ray(1500.0, 300.0)?;
    /// let (u, v) = cam.point_to_pixel(ray.at(2.0))?;
    /// assert!((u - 1500.0).abs() < 1e-9 && (v - 300.0).abs() < 1e-9);
    /// # Ok::<(), flatray::Error>(())
    /// ```
    pub fn new(lens: Lens, port: Stack) -> Result<PortCamera> {
        let lens = lens.validate()?;
        if port.height(Vec3::ZERO) > 0.0 {
            return Err(Error::WrongSide(
                "the centre of projection must be inside the housing, before the port",
            ));
        }
        Ok(PortCamera { lens, port })
    }

    /// The lens.
    #[inline]
    pub fn lens(&self) -> &Lens {
        self.lens.lens()
    }

    /// The validated lens with its valid region.
    #[inline]
    pub fn distortion(&self) -> &Distortion {
        &self.lens
    }

    /// The port.
    #[inline]
    pub fn port(&self) -> &Stack {
        &self.port
    }

    /// The unit direction, in the housing, of the ray through pixel `(u, v)`.
    ///
    /// # Errors
    /// As [`Lens::unproject`].
    pub fn pixel_direction(&self, u: f64, v: f64) -> Result<Vec3> {
        let (x, y) = self.lens.unproject(u, v)?;
        Vec3::new(x, y, 1.0).direction("pixel direction overflowed")
    }

    /// Back-projection: the ray in the object's medium (the water) of pixel
    /// `(u, v)` of the real (distorted) image; origin on the port's outer face,
    /// unit direction.
    ///
    /// # Errors
    /// * [`Error::InvalidArgument`]: non-finite `u` or `v`.
    /// * [`Error::NotConverged`]: the pixel lies outside the image of the lens
    ///   model's valid region ([`crate::camera::lens`]).
    /// * [`Error::MissesInterface`]: the pixel's ray does not reach the port.
    /// * [`Error::TotalInternalReflection`]: its ray cannot cross the port.
    /// * [`Error::OutOfRange`]: the ray meets the port too far away to represent.
    pub fn pixel_to_ray(&self, u: f64, v: f64) -> Result<Ray> {
        let d = self.pixel_direction(u, v)?;
        Ok(trace(&self.port, Ray::new(Vec3::ZERO, d))?.ray)
    }

    /// Forward projection: the pixel `(u, v)` of the real (distorted) image at
    /// which the point `point` (metres, camera frame, in the object's medium)
    /// appears.
    ///
    /// # Errors
    /// * [`Error::InvalidArgument`]: a non-finite point.
    /// * [`Error::WrongSide`]: the point is not past the port (inside the
    ///   housing or the window, or behind the camera), or its line of sight
    ///   leaves the centre backwards (`z <= 0`).
    /// * [`Error::OutOfRange`]: the direction lies outside the lens model's
    ///   valid region, or the pixel is too far out to represent.
    /// * [`Error::TotalInternalReflection`], [`Error::NotConverged`]: as
    ///   [`crate::line_of_sight`].
    pub fn point_to_pixel(&self, point: Vec3) -> Result<(f64, f64)> {
        let path = line_of_sight(&self.port, Vec3::ZERO, point)?;
        self.direction_to_pixel(path.direction)
    }

    /// The pixel of a direction in the housing, leaving the centre.
    ///
    /// # Errors
    /// [`Error::WrongSide`] for a direction with `z <= 0`, otherwise as
    /// [`Lens::project`].
    pub fn direction_to_pixel(&self, d: Vec3) -> Result<(f64, f64)> {
        if d.z.is_nan() || d.z <= 0.0 {
            return Err(Error::WrongSide(
                "the line of sight leaves the centre of projection backwards (z <= 0)",
            ));
        }
        let inv_z = 1.0 / d.z;
        self.lens.project(d.x * inv_z, d.y * inv_z)
    }

    /// [`PortCamera::pixel_to_ray`] of every pixel `uv[i] = [u, v]`.
    ///
    /// Every element is attempted; a failing one gets its status and a NaN
    /// ray. `out` and `status` must hold `uv.len()` elements.
    ///
    /// # Errors
    /// [`Error::BufferTooSmall`] for a short output (nothing written).
    pub fn pixels_to_rays<S: StatusSink + ?Sized>(
        &self,
        uv: &[[f64; 2]],
        out: &mut [Ray],
        status: &mut S,
    ) -> Result<BatchReport> {
        check_lengths(uv.len(), out.len(), status)?;
        let mut report = BatchReport::default();
        for (i, (&[u, v], slot)) in uv.iter().zip(out.iter_mut()).enumerate() {
            *slot = match self.pixel_to_ray(u, v) {
                Ok(ray) => {
                    status.record(i, Status::Ok);
                    ray
                }
                Err(e) => {
                    status.record(i, e.status());
                    report.note(i, e);
                    Ray::NAN
                }
            };
        }
        Ok(report)
    }

    /// [`PortCamera::point_to_pixel`] of every point; `out[i] = [u, v]`, NaN
    /// for a failed point. Conventions as [`PortCamera::pixels_to_rays`].
    ///
    /// # Errors
    /// [`Error::BufferTooSmall`] for a short output (nothing written).
    pub fn points_to_pixels<S: StatusSink + ?Sized>(
        &self,
        points: &[Vec3],
        out: &mut [[f64; 2]],
        status: &mut S,
    ) -> Result<BatchReport> {
        check_lengths(points.len(), out.len(), status)?;
        let mut report = BatchReport::default();
        for (i, (&p, slot)) in points.iter().zip(out.iter_mut()).enumerate() {
            *slot = match self.point_to_pixel(p) {
                Ok((u, v)) => {
                    status.record(i, Status::Ok);
                    [u, v]
                }
                Err(e) => {
                    status.record(i, e.status());
                    report.note(i, e);
                    [f64::NAN; 2]
                }
            };
        }
        Ok(report)
    }
}

fn check_lengths<S: StatusSink + ?Sized>(count: usize, out: usize, status: &S) -> Result<()> {
    if out < count || status.capacity().is_some_and(|c| c < count) {
        return Err(Error::BufferTooSmall(
            "an output slice is shorter than the input",
        ));
    }
    Ok(())
}
