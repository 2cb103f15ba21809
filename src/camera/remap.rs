//! Remap tables from the real (flat-port) image to an ideal pinhole camera in
//! the water, and the error such a table makes at other distances.
//!
//! A flat-port camera has no single viewpoint (Agrawal et al., CVPR 2012,
//! §3), so no image warp can turn it into a pinhole camera for every distance
//! at once: a table is exact for the points at one range `D` from the centre of
//! projection and misplaces nearer and farther points. [`PortCamera::remap_error`]
//! measures by how much.
//!
//! # Speed
//!
//! Each table entry needs the line of sight from the centre of projection to a
//! point in the water. It lies in the plane of the port normal `n̂` and the
//! point, and is fixed by the point's lateral distance `X` from the normal
//! through the centre and its depths in each medium (Fermat's principle; see
//! [`crate::line_of_sight`], which solves the same equation). With the ray
//! parameter written as `u = tan θ_m` in the medium of lowest index `n_m`,
//!
//! `X = F(u) = n_m u Σ_k h_k / √(n_k² + (n_k² − n_m²) u²)`,
//!
//! increasing and concave for `u >= 0`, so Newton's method converges from any
//! start (from above the root one step lands below it, from below it climbs
//! monotonically). Neighbouring pixels have nearly the same `u`, so each
//! entry starts from its left neighbour's solution scaled by the ratio of
//! their lateral distances and typically needs one Newton step; the per-port
//! sums are precomputed, and nothing allocates.

use crate::camera::lens::Lens;
use crate::camera::port::PortCamera;
use crate::error::{positive, Error, Result};
use crate::math;
use crate::path::SolveOptions;
use crate::stack::MAX_LAYERS;
use crate::vector::Vec3;

/// How a remap table performs at a distance other than the one it was built
/// for (see [`PortCamera::remap_error`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RemapResidual {
    /// Largest misplacement, pixels of the real image.
    pub max_px: f64,
    /// Root mean square misplacement over the pixels counted, pixels.
    pub rms_px: f64,
    /// Target pixels visible at both distances (the pixels counted).
    pub visible: usize,
}

/// Media after the observer's: the layers and the object's medium.
const MAX_BEYOND: usize = MAX_LAYERS + 1;

/// Per-camera constants of the line-of-sight solve from the centre of
/// projection.
#[derive(Debug, Clone, Copy)]
pub(crate) struct CentreSolver {
    normal: Vec3,
    /// Height of the last interface above the centre: `h0 + T`.
    back: f64,
    n_min: f64,
    /// `Σ h_k / n_k` over the media of the housing and port whose index is
    /// `n_min` (their `D_k = n_k` is constant).
    linear: f64,
    /// Layers and observer's medium with `n_k > n_min`: `(h_k, n_k², n_k² − n_m²)`.
    bent: [(f64, f64, f64); MAX_BEYOND],
    bent_count: usize,
    /// `(n_x², n_x² − n_m²)` of the object's medium.
    object: (f64, f64),
    /// `(n_0², n_0² − n_m²)` of the observer's medium, for the direction.
    observer: (f64, f64),
    relative_tolerance: f64,
    max_iterations: u32,
}

impl CentreSolver {
    pub(crate) fn new(camera: &PortCamera) -> CentreSolver {
        let port = camera.port();
        let h0 = -port.height(Vec3::ZERO);
        let n0 = port.n_observer();
        let nx = port.n_object();
        let n_min = port
            .layers()
            .iter()
            .map(|l| l.index)
            .fold(n0.min(nx), f64::min);
        let split = |n: f64| (n * n, (n - n_min) * (n + n_min));
        let mut bent = [(0.0, 0.0, 0.0); MAX_BEYOND];
        let mut bent_count = 0;
        let mut linear = 0.0;
        let fixed = core::iter::once((h0, n0))
            .chain(port.layers().iter().map(|l| (l.thickness, l.index)));
        for (h, n) in fixed {
            let (a, b) = split(n);
            if b == 0.0 {
                linear += h / n;
            } else if let Some(slot) = bent.get_mut(bent_count) {
                *slot = (h, a, b);
                bent_count += 1;
            }
        }
        let options = SolveOptions::DEFAULT;
        CentreSolver {
            normal: port.normal(),
            back: h0 + port.total_thickness(),
            n_min,
            linear,
            bent,
            bent_count,
            object: split(nx),
            observer: split(n0),
            relative_tolerance: options.relative_tolerance,
            max_iterations: options.max_iterations,
        }
    }

    /// `(F(u) / (n_m u), F'(u) / n_m)` for an object depth `hx`.
    #[inline]
    fn sums(&self, u: f64, hx: f64) -> (f64, f64) {
        let u2 = u * u;
        let mut f = self.linear;
        let mut df = self.linear;
        for &(h, a, b) in self.bent.iter().take(self.bent_count) {
            let d2 = a + b * u2;
            let inv = 1.0 / math::sqrt(d2);
            f += h * inv;
            df += h * a * inv / d2;
        }
        let (a, b) = self.object;
        let d2 = a + b * u2;
        let inv = 1.0 / math::sqrt(d2);
        f += hx * inv;
        df += hx * a * inv / d2;
        (f, df)
    }

    /// Solve `F(u) = lateral` for an object at depth `hx` past the port,
    /// starting from `start >= 0`.
    fn solve(&self, lateral: f64, hx: f64, start: f64) -> Result<f64> {
        let tolerance = self.relative_tolerance * (lateral + self.back + hx);
        let mut u = if start.is_finite() && start > 0.0 {
            start
        } else {
            0.0
        };
        let mut iterations = 0;
        loop {
            let (f, df) = self.sums(u, hx);
            let residual = lateral - self.n_min * u * f;
            if residual.abs() <= tolerance {
                return Ok(u);
            }
            if iterations >= self.max_iterations {
                return Err(Error::NotConverged(
                    "the line-of-sight solve ran out of iterations",
                ));
            }
            iterations += 1;
            let mut next = u + residual / (self.n_min * df);
            if next.is_nan() || next < 0.0 {
                next = 0.0;
            }
            if residual > 0.0 && (next <= u || next > 1e150) {
                // Climbing from below and no progress in floating point.
                if residual <= 1e3 * tolerance {
                    return Ok(u);
                }
                if self.linear == 0.0 {
                    return Err(Error::TotalInternalReflection(
                        "no ray connects the centre of projection and the point",
                    ));
                }
                return Err(Error::NotConverged(
                    "the line-of-sight solve stalled before reaching its accuracy",
                ));
            }
            u = next;
        }
    }

    /// The direction in the housing (scaled so that `·n̂ = 1`) of the line of
    /// sight from the centre to `point`, and the solved ratio `u / X` (`u` the
    /// ray parameter of the module docs, `X` the point's lateral distance) for
    /// warm starts; `ratio` is a guess of it (0 when none).
    #[inline]
    pub(crate) fn direction(&self, point: Vec3, ratio: f64) -> Result<(Vec3, f64)> {
        let along = point.dot(self.normal);
        let hx = along - self.back;
        if hx.is_nan() || hx < 0.0 {
            return Err(Error::WrongSide(
                "the point is not past the port, in the object's medium",
            ));
        }
        let lateral_v = point - self.normal * along;
        let lateral = lateral_v.length();
        if lateral == 0.0 {
            return Ok((self.normal, ratio));
        }
        let u = self.solve(lateral, hx, ratio * lateral)?;
        let (a0, b0) = self.observer;
        let tan0 = self.n_min * u / math::sqrt(a0 + b0 * u * u);
        Ok((self.normal + lateral_v * (tan0 / lateral), u / lateral))
    }
}

/// Target pixel rays of an ideal pinhole camera.
#[derive(Debug, Clone, Copy)]
struct Target {
    fx: f64,
    fy: f64,
    cx: f64,
    cy: f64,
}

impl Target {
    fn new(target: &Lens) -> Result<Target> {
        target.without_distortion().validate()?;
        Ok(Target {
            fx: target.fx,
            fy: target.fy,
            cx: target.cx,
            cy: target.cy,
        })
    }

    /// The point at range `distance` from the centre on the ray of pixel (i, j).
    #[inline]
    fn point(&self, i: f64, j: f64, distance: f64) -> Vec3 {
        let x = (i - self.cx) / self.fx;
        let y = (j - self.cy) / self.fy;
        let scale = distance / math::sqrt(x * x + y * y + 1.0);
        Vec3::new(x * scale, y * scale, scale)
    }
}

/// Walks along a row of target pixels, warm-starting each solve.
struct RowWalker<'a> {
    camera: &'a PortCamera,
    solver: &'a CentreSolver,
    target: Target,
    distance: f64,
    /// `u / X` of the previous pixel (0 when none).
    ratio: f64,
}

impl<'a> RowWalker<'a> {
    fn new(
        camera: &'a PortCamera,
        solver: &'a CentreSolver,
        target: Target,
        distance: f64,
    ) -> Self {
        RowWalker {
            camera,
            solver,
            target,
            distance,
            ratio: 0.0,
        }
    }

    /// The warm-start state.
    #[inline]
    fn state(&self) -> f64 {
        self.ratio
    }

    /// Continue from a saved state (the first pixel of the row above: the
    /// best start for the first pixel of the next row).
    #[inline]
    fn restart(&mut self, state: f64) {
        self.ratio = state;
    }

    /// The real-image pixel of the point at the walker's distance on target
    /// pixel (i, j), or `None` where that point is not visible.
    #[inline]
    fn pixel(&mut self, i: f64, j: f64) -> Option<(f64, f64)> {
        let p = self.target.point(i, j, self.distance);
        match self.solver.direction(p, self.ratio) {
            Ok((d, ratio)) => {
                self.ratio = ratio;
                self.camera.direction_to_pixel(d).ok()
            }
            Err(_) => {
                self.ratio = 0.0;
                None
            }
        }
    }
}

fn check_image(width: u32, height: u32) -> Result<usize> {
    if width == 0 || height == 0 {
        return Err(Error::InvalidArgument(
            "the image must be at least 1 x 1 pixels",
        ));
    }
    usize::try_from(u64::from(width) * u64::from(height))
        .map_err(|_| Error::InvalidArgument("the image has more pixels than memory can address"))
}

impl PortCamera {
    /// The real-image pixel of the point at range `object_distance` metres from
    /// the centre of projection on the ray of pixel `(i, j)` of the ideal
    /// pinhole camera `target` (its distortion terms are ignored): one entry of
    /// [`PortCamera::remap_table`], computed on its own.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for an invalid target, a non-finite pixel or a
    /// distance not finite and > 0; otherwise as [`PortCamera::point_to_pixel`]
    /// (e.g. [`Error::WrongSide`] when that point is inside the housing).
    pub fn remap_pixel(
        &self,
        target: &Lens,
        object_distance: f64,
        i: f64,
        j: f64,
    ) -> Result<(f64, f64)> {
        let target = Target::new(target)?;
        let distance = positive(object_distance, "object distance must be finite and > 0")?;
        if !(i.is_finite() && j.is_finite()) {
            return Err(Error::InvalidArgument("pixel coordinates must be finite"));
        }
        let solver = CentreSolver::new(self);
        let (d, _) = solver.direction(target.point(i, j, distance), 0.0)?;
        self.direction_to_pixel(d)
    }

    /// Fill a remap table: for every pixel `(i, j)` of the ideal pinhole camera
    /// `target` in the water (same centre of projection; its distortion terms
    /// are ignored), `map_u[j·width + i]`, `map_v[j·width + i]` receive the
    /// pixel of the real image where the point at range `object_distance`
    /// metres from the centre on that target pixel's ray appears, NaN where
    /// that point is not visible (inside the housing, behind the camera, or
    /// outside the lens model's valid region). Source pixels are not clipped to
    /// any image size.
    ///
    /// Row-major, pixel (0, 0) the centre of the top-left pixel. Accuracy: the
    /// entries are the exact model's pixels rounded to `f32` (about 6e-5 px at
    /// 1000 px); see the [module docs](self) for the method.
    ///
    /// Returns the number of visible entries.
    ///
    /// # Errors
    /// * [`Error::InvalidArgument`]: a 0 × 0 (or 0-wide or 0-high) image, an
    ///   invalid target, a distance not finite and > 0.
    /// * [`Error::BufferTooSmall`]: a map shorter than `width·height`.
    ///
    /// Nothing is written on error.
    pub fn remap_table(
        &self,
        target: &Lens,
        object_distance: f64,
        width: u32,
        height: u32,
        map_u: &mut [f32],
        map_v: &mut [f32],
    ) -> Result<usize> {
        let pixels = check_image(width, height)?;
        let target = Target::new(target)?;
        let distance = positive(object_distance, "object distance must be finite and > 0")?;
        if map_u.len() < pixels || map_v.len() < pixels {
            return Err(Error::BufferTooSmall(
                "a remap table needs width x height entries",
            ));
        }
        let solver = CentreSolver::new(self);
        let mut walker = RowWalker::new(self, &solver, target, distance);
        let mut visible = 0;
        let w = width as usize;
        let rows = map_u.chunks_exact_mut(w).zip(map_v.chunks_exact_mut(w));
        let mut row_start = 0.0;
        for (j, (row_u, row_v)) in rows.take(height as usize).enumerate() {
            walker.restart(row_start);
            let jf = j as f64;
            for (i, (mu, mv)) in row_u.iter_mut().zip(row_v.iter_mut()).enumerate() {
                match walker.pixel(i as f64, jf) {
                    Some((u, v)) => {
                        *mu = u as f32;
                        *mv = v as f32;
                        visible += 1;
                    }
                    None => {
                        *mu = f32::NAN;
                        *mv = f32::NAN;
                    }
                }
                if i == 0 {
                    row_start = walker.state();
                }
            }
        }
        Ok(visible)
    }

    /// How far a remap table built for `table_distance` misplaces points at
    /// `object_distance` (both metres of range from the centre of projection).
    ///
    /// For every pixel of the target image, the table's entry (the real pixel
    /// of the point at `table_distance` on that target ray) is compared with
    /// the real pixel of the point at `object_distance` on the same ray; the
    /// result is the largest and the root mean square distance between the two,
    /// in pixels of the real image, over the pixels visible at both distances.
    /// It is zero at `object_distance = table_distance` and grows away from it,
    /// because the camera has no single viewpoint (Agrawal et al. 2012, §3).
    ///
    /// # Errors
    /// As [`PortCamera::remap_table`] (without the buffer check), and
    /// [`Error::WrongSide`] when no pixel is visible at both distances.
    pub fn remap_error(
        &self,
        target: &Lens,
        table_distance: f64,
        object_distance: f64,
        width: u32,
        height: u32,
    ) -> Result<RemapResidual> {
        check_image(width, height)?;
        let target = Target::new(target)?;
        let table = positive(table_distance, "table distance must be finite and > 0")?;
        let object = positive(object_distance, "object distance must be finite and > 0")?;
        let solver = CentreSolver::new(self);
        let mut at_table = RowWalker::new(self, &solver, target, table);
        let mut at_object = RowWalker::new(self, &solver, target, object);
        let mut max_px: f64 = 0.0;
        let mut sum_sq = 0.0;
        let mut visible = 0usize;
        let mut row_start = (0.0, 0.0);
        for j in 0..height {
            let jf = f64::from(j);
            at_table.restart(row_start.0);
            at_object.restart(row_start.1);
            for i in 0..width {
                let i_f = f64::from(i);
                let a = at_table.pixel(i_f, jf);
                let b = at_object.pixel(i_f, jf);
                if i == 0 {
                    row_start = (at_table.state(), at_object.state());
                }
                if let (Some(a), Some(b)) = (a, b) {
                    let e = math::hypot(a.0 - b.0, a.1 - b.1);
                    max_px = max_px.max(e);
                    sum_sq += e * e;
                    visible += 1;
                }
            }
        }
        if visible == 0 {
            return Err(Error::WrongSide(
                "no target pixel sees a point past the port at both distances",
            ));
        }
        Ok(RemapResidual {
            max_px,
            rms_px: math::sqrt(sum_sq / visible as f64),
            visible,
        })
    }
}
