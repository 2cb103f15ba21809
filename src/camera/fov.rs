//! What a flat-port camera sees: field of view in the water and in air, the
//! in-water focal length along the axis, and where total internal reflection
//! starts.
//!
//! Behind a flat port the view narrows: a ray leaving the lens at `θ_a` from
//! the port normal goes on in the water at `θ_w` with
//! `n_a sin θ_a = n_w sin θ_w` (Snell's law; the window's own index drops out
//! because the interfaces are parallel), so a perpendicular port turns an
//! in-air field of view `2θ_a` into `2 asin(n_a sin θ_a / n_w)`, and near the
//! axis angles shrink by `n_a/n_w`: the image is magnified by about
//! `n_w/n_a ≈ 1.33` (common practice for flat ports).

use crate::camera::lens::Lens;
use crate::camera::port::PortCamera;
use crate::error::{Error, Result};
use crate::math;
use crate::vector::Vec3;

/// Angles of view, radians, for an image of given size.
///
/// Horizontal: between the rays of the left and right image edges
/// (`u = −0.5` and `u = width − 0.5`) on the row `v = cy`; vertical: between
/// the top and bottom edges (`v = −0.5`, `v = height − 0.5`) on the column
/// `u = cx`; diagonal: between the outer corners `(−0.5, −0.5)` and
/// `(width − 0.5, height − 0.5)`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldOfView {
    /// Horizontal angle of view, radians.
    pub horizontal: f64,
    /// Vertical angle of view, radians.
    pub vertical: f64,
    /// Diagonal angle of view, radians.
    pub diagonal: f64,
}

/// Number of directions sampled around the critical cone by
/// [`PortCamera::tir_radius`] before the nearest one is refined.
const TIR_SAMPLES: usize = 1024;

/// The angle between two unit vectors, `2 atan2(|a − b|, |a + b|)`: accurate
/// for small and for nearly opposite angles (unlike `acos(a·b)`).
#[inline]
pub(crate) fn angle_between(a: Vec3, b: Vec3) -> f64 {
    2.0 * math::atan2((a - b).length(), (a + b).length())
}

/// The three pixel pairs of a field of view.
fn edge_pairs(width: u32, height: u32, cx: f64, cy: f64) -> Result<[[(f64, f64); 2]; 3]> {
    if width == 0 || height == 0 {
        return Err(Error::InvalidArgument(
            "the image must be at least 1 x 1 pixels",
        ));
    }
    let right = f64::from(width) - 0.5;
    let bottom = f64::from(height) - 0.5;
    Ok([
        [(-0.5, cy), (right, cy)],
        [(cx, -0.5), (cx, bottom)],
        [(-0.5, -0.5), (right, bottom)],
    ])
}

fn field_of_view_with(
    width: u32,
    height: u32,
    cx: f64,
    cy: f64,
    ray: impl Fn(f64, f64) -> Result<Vec3>,
) -> Result<FieldOfView> {
    let pairs = edge_pairs(width, height, cx, cy)?;
    let mut angles = [0.0; 3];
    for (angle, [a, b]) in angles.iter_mut().zip(pairs) {
        *angle = angle_between(ray(a.0, a.1)?, ray(b.0, b.1)?);
    }
    let [horizontal, vertical, diagonal] = angles;
    Ok(FieldOfView {
        horizontal,
        vertical,
        diagonal,
    })
}

impl Lens {
    /// Field of view of the bare lens in its own medium (in air, without a
    /// port), for an image of `width` × `height` pixels.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for an invalid lens or a 0-wide or 0-high
    /// image; [`Error::NotConverged`] when an edge pixel lies outside the lens
    /// model's valid region.
    pub fn field_of_view(&self, width: u32, height: u32) -> Result<FieldOfView> {
        let model = self.validate()?;
        field_of_view_with(width, height, self.cx, self.cy, |u, v| {
            let (x, y) = model.unproject(u, v)?;
            Vec3::new(x, y, 1.0).direction("pixel direction overflowed")
        })
    }
}

impl PortCamera {
    /// Field of view in the object's medium (the water): the angles between the
    /// refracted rays of the image edges (see [`FieldOfView`]).
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for a 0-wide or 0-high image; otherwise as
    /// [`PortCamera::pixel_to_ray`] for an edge pixel (e.g.
    /// [`Error::TotalInternalReflection`] when an edge's ray cannot leave the
    /// housing).
    ///
    /// # Example
    /// ```
    /// use flatray::camera::{Lens, PortCamera};
    /// use flatray::{Layer, Stack, Vec3};
    /// let port = Stack::new(Vec3::new(0.0, 0.0, 0.02), Vec3::new(0.0, 0.0, 1.0),
    ///                       1.0, &[Layer::new(0.01, 1.5)], 1.333)?;
    /// let cam = PortCamera::new(Lens::pinhole(800.0, 800.0, 799.5, 599.5), port)?;
    /// let air = cam.lens().field_of_view(1600, 1200)?;
    /// let water = cam.field_of_view(1600, 1200)?;
    /// // Snell's law at the edges: sin(half angle in air) = 1.333 sin(half angle in water).
    /// let expected = 2.0 * ((air.horizontal / 2.0).sin() / 1.333).asin();
    /// assert!((water.horizontal - expected).abs() < 1e-12);
    /// # Ok::<(), flatray::Error>(())
    /// ```
    pub fn field_of_view(&self, width: u32, height: u32) -> Result<FieldOfView> {
        let lens = self.lens();
        field_of_view_with(width, height, lens.cx, lens.cy, |u, v| {
            Ok(self.pixel_to_ray(u, v)?.direction)
        })
    }

    /// Field of view of the lens in the housing's medium, without the port
    /// (the "in air" view); see [`Lens::field_of_view`].
    ///
    /// # Errors
    /// As [`Lens::field_of_view`].
    pub fn field_of_view_in_air(&self, width: u32, height: u32) -> Result<FieldOfView> {
        self.lens().field_of_view(width, height)
    }

    /// The effective focal lengths `(fx_w, fy_w)` in pixels of the camera in
    /// the water along its axis: the focal lengths of the pinhole camera whose
    /// rays turn by the same angle per pixel at the principal point,
    /// `f_w = 1 / (dθ_w/du)` at `(cx, cy)` (likewise along v), `θ_w` the
    /// direction of the refracted ray.
    ///
    /// For a port perpendicular to the axis this is `f · n_w/n_a` (Snell's law
    /// near the normal, `n_a θ_a ≈ n_w θ_w`, whatever the window's thickness and
    /// index). The derivative is a central difference over `h = 10⁻³ f` pixels
    /// with one Richardson step (error `O((h/f)⁴) ≈ 10⁻¹²` relative).
    ///
    /// # Errors
    /// As [`PortCamera::pixel_to_ray`] near the principal point.
    pub fn focal_length_in_water(&self) -> Result<(f64, f64)> {
        let lens = *self.lens();
        let rate = |along_u: bool, h: f64| -> Result<f64> {
            let (du, dv) = if along_u { (h, 0.0) } else { (0.0, h) };
            let a = self.pixel_to_ray(lens.cx - du, lens.cy - dv)?.direction;
            let b = self.pixel_to_ray(lens.cx + du, lens.cy + dv)?.direction;
            Ok(angle_between(a, b) / (2.0 * h))
        };
        let mut out = [0.0; 2];
        for (slot, (along_u, f)) in out.iter_mut().zip([(true, lens.fx), (false, lens.fy)]) {
            let h = 1e-3 * f;
            let coarse = rate(along_u, h)?;
            let fine = rate(along_u, 0.5 * h)?;
            let rate = (4.0 * fine - coarse) / 3.0;
            *slot = 1.0 / rate;
            if !(slot.is_finite() && *slot > 0.0) {
                return Err(Error::OutOfRange(
                    "the in-water focal length is not representable",
                ));
            }
        }
        let [fx, fy] = out;
        Ok((fx, fy))
    }

    /// The distance in pixels from the principal point `(cx, cy)` to the
    /// nearest pixel whose ray would need total internal reflection to leave
    /// the housing, or `None` when no pixel of the lens model's valid region
    /// needs it.
    ///
    /// A ray leaving the centre at `θ` from the port normal crosses every
    /// interface while `n_0 sin θ <= n_k` for every later medium `k` (Snell's
    /// law), so the boundary is the cone `θ_c = asin(min_k n_k / n_0)` about
    /// the normal; it exists only when the housing's medium is denser than
    /// some later one (a water-filled housing looking into air, for example).
    /// The cone is mapped to the image through the lens (1024 directions
    /// around it, the nearest refined by golden-section search to 1e-12 rad),
    /// and its nearest pixel's distance is returned (0 when the principal
    /// point's own ray is beyond the cone).
    ///
    /// # Errors
    /// As [`PortCamera::pixel_direction`] at the principal point.
    pub fn tir_radius(&self) -> Result<Option<f64>> {
        let port = self.port();
        let n0 = port.n_observer();
        let n_after = port
            .layers()
            .iter()
            .map(|l| l.index)
            .fold(port.n_object(), f64::min);
        if n_after >= n0 {
            return Ok(None);
        }
        let normal = port.normal();
        let sin_c = n_after / n0;
        let cos_c = math::sqrt((1.0 - sin_c) * (1.0 + sin_c));
        let lens = *self.lens();
        let axis = self.pixel_direction(lens.cx, lens.cy)?;
        if axis.dot(normal) <= cos_c {
            return Ok(Some(0.0));
        }
        // An orthonormal basis (e1, e2) perpendicular to the normal.
        let helper = if normal.x.abs() < 0.9 {
            Vec3::new(1.0, 0.0, 0.0)
        } else {
            Vec3::new(0.0, 1.0, 0.0)
        };
        let e1 = normal
            .cross(helper)
            .direction("port normal is degenerate")?;
        let e2 = normal.cross(e1);
        let distance = |psi: f64| -> Option<f64> {
            let d = normal * cos_c + (e1 * math::cos(psi) + e2 * math::sin(psi)) * sin_c;
            let (u, v) = self.direction_to_pixel(d).ok()?;
            Some(math::hypot(u - lens.cx, v - lens.cy))
        };
        let step = 2.0 * core::f64::consts::PI / TIR_SAMPLES as f64;
        let mut best: Option<(usize, f64)> = None;
        for k in 0..TIR_SAMPLES {
            if let Some(r) = distance(k as f64 * step) {
                if best.map_or(true, |(_, b)| r < b) {
                    best = Some((k, r));
                }
            }
        }
        let Some((k, sampled)) = best else {
            return Ok(None);
        };
        // Golden-section search on [ψ_k − step, ψ_k + step]; an invalid point
        // counts as infinitely far.
        let far = |psi: f64| distance(psi).unwrap_or(f64::INFINITY);
        let ratio = 0.5 * (math::sqrt(5.0) - 1.0);
        let mut lo = (k as f64 - 1.0) * step;
        let mut hi = (k as f64 + 1.0) * step;
        let mut a = hi - ratio * (hi - lo);
        let mut b = lo + ratio * (hi - lo);
        let mut fa = far(a);
        let mut fb = far(b);
        for _ in 0..200 {
            if hi - lo <= 1e-12 {
                break;
            }
            if fa <= fb {
                hi = b;
                b = a;
                fb = fa;
                a = hi - ratio * (hi - lo);
                fa = far(a);
            } else {
                lo = a;
                a = b;
                fa = fb;
                b = lo + ratio * (hi - lo);
                fb = far(b);
            }
        }
        Ok(Some(sampled.min(fa).min(fb)))
    }
}
