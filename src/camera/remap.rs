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
use crate::error::{positive, representable, Error, Result};
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
    /// `n_m / n_0`, when the observer's medium has the lowest index (then
    /// `tan θ_0 = u · n_m / n_0` needs no square root).
    observer_lowest: Option<f64>,
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
        let fixed =
            core::iter::once((h0, n0)).chain(port.layers().iter().map(|l| (l.thickness, l.index)));
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
            observer_lowest: if n0 == n_min { Some(n_min / n0) } else { None },
            relative_tolerance: options.relative_tolerance,
            max_iterations: options.max_iterations,
        }
    }

    /// `(F(u) / (n_m u), F'(u) / n_m, −F''(u) / (3 n_m u))` for an object depth
    /// `hx`: `Σ h_k/D_k`, `Σ h_k n_k²/D_k³` and `Σ h_k n_k² b_k/D_k⁵` with
    /// `D_k² = n_k² + b_k u²`, `b_k = n_k² − n_m²`.
    #[inline]
    fn sums(&self, u: f64, hx: f64) -> (f64, f64, f64) {
        let u2 = u * u;
        let mut f = self.linear;
        let mut df = self.linear;
        let mut curve = 0.0;
        let terms = self
            .bent
            .iter()
            .take(self.bent_count)
            .copied()
            .chain(core::iter::once((hx, self.object.0, self.object.1)));
        for (h, a, b) in terms {
            let inv = 1.0 / math::sqrt(a + b * u2);
            let inv2 = inv * inv;
            let t = h * inv;
            f += t;
            let t = t * a * inv2;
            df += t;
            curve += t * b * inv2;
        }
        (f, df, curve)
    }

    /// Solve `F(u) = lateral` for an object at depth `hx` past the port,
    /// starting from `start >= 0`, to the relative tolerance of
    /// [`SolveOptions::DEFAULT`] on the lateral distance (as
    /// [`crate::line_of_sight`]).
    ///
    /// Newton's method; a step is accepted without evaluating `F` again when
    /// the residual it leaves, `|F''(ξ)| Δu²/2` by Taylor's theorem, is within
    /// the tolerance with a safety factor of 4 (`F''` at the step's start
    /// stands for `F''(ξ)`: the steps taken that way are below 1e-6 in `u`,
    /// over which `F''` changes by far less than that factor). With a warm
    /// start this is the usual case, one evaluation per solve.
    fn solve(&self, lateral: f64, hx: f64, start: f64) -> Result<f64> {
        let tolerance = self.relative_tolerance * (lateral + self.back + hx);
        let mut u = if start.is_finite() && start > 0.0 {
            start
        } else {
            0.0
        };
        let mut iterations = 0;
        loop {
            let (f, df, curve) = self.sums(u, hx);
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
            let step = next - u;
            // 4 × |F''| Δu² / 2 with |F''| = 3 n_m u Σ h n² b / D⁵.
            let left = 6.0 * self.n_min * u * curve * step * step;
            if left <= tolerance && step.abs() <= 1e-6 {
                return Ok(next);
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
        // Points are metres from the camera: no overflow care needed here
        // (a non-finite result is caught by the solve's checks).
        let lateral = math::sqrt(lateral_v.dot(lateral_v));
        if lateral == 0.0 {
            return Ok((self.normal, ratio));
        }
        let u = self.solve(lateral, hx, ratio * lateral)?;
        let tan0 = match self.observer_lowest {
            Some(scale) => u * scale,
            None => {
                let (a0, b0) = self.observer;
                self.n_min * u / math::sqrt(a0 + b0 * u * u)
            }
        };
        let inv_lateral = 1.0 / lateral;
        Ok((
            self.normal + lateral_v * (tan0 * inv_lateral),
            u * inv_lateral,
        ))
    }
}

/// Target pixel rays of an ideal pinhole camera.
#[derive(Debug, Clone, Copy)]
struct Target {
    inv_fx: f64,
    inv_fy: f64,
    cx: f64,
    cy: f64,
}

impl Target {
    fn new(target: &Lens) -> Result<Target> {
        target.without_distortion().validate()?;
        Ok(Target {
            inv_fx: 1.0 / target.fx,
            inv_fy: 1.0 / target.fy,
            cx: target.cx,
            cy: target.cy,
        })
    }

    /// The point at range `distance` from the centre on the ray of pixel (i, j).
    #[inline]
    fn point(&self, i: f64, j: f64, distance: f64) -> Vec3 {
        let x = (i - self.cx) * self.inv_fx;
        let y = (j - self.cy) * self.inv_fy;
        let scale = distance / math::sqrt(x * x + y * y + 1.0);
        Vec3::new(x * scale, y * scale, scale)
    }
}

/// Walks along a row of target pixels, warm-starting each solve from the
/// quadratic extrapolation of the previous three pixels' solutions (the ratio
/// `u / X` is a smooth function of the pixel).
struct RowWalker<'a> {
    camera: &'a PortCamera,
    solver: &'a CentreSolver,
    target: Target,
    distance: f64,
    /// `u / X` of the last three pixels, newest first.
    history: [f64; 3],
    /// How many entries of `history` are consecutive solutions (0 to 3).
    known: usize,
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
            history: [0.0; 3],
            known: 0,
        }
    }

    /// The warm-start state to carry to the next row: the newest ratio.
    #[inline]
    fn state(&self) -> f64 {
        if self.known > 0 {
            let [newest, _, _] = self.history;
            newest
        } else {
            0.0
        }
    }

    /// Start a row from a saved state (the first pixel of the row above).
    #[inline]
    fn restart(&mut self, state: f64) {
        self.history = [state, 0.0, 0.0];
        self.known = usize::from(state > 0.0);
    }

    #[inline]
    fn predict(&self) -> f64 {
        let [r1, r2, r3] = self.history;
        match self.known {
            0 => 0.0,
            1 => r1,
            2 => 2.0 * r1 - r2,
            _ => 3.0 * (r1 - r2) + r3,
        }
    }

    /// The real-image pixel of the point at the walker's distance on target
    /// pixel (i, j), or `None` where that point is not visible.
    #[inline]
    fn pixel(&mut self, i: f64, j: f64) -> Option<(f64, f64)> {
        let p = self.target.point(i, j, self.distance);
        match self.solver.direction(p, self.predict()) {
            Ok((d, ratio)) => {
                let [r1, r2, _] = self.history;
                self.history = [ratio, r1, r2];
                self.known = (self.known + 1).min(3);
                self.camera.direction_to_pixel(d).ok()
            }
            Err(_) => {
                self.known = 0;
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
    /// outside the lens model's valid region) or its pixel lies beyond the range
    /// of `f32`. Source pixels are not clipped to any image size.
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
                // A pixel beyond the range of f32 (absurd intrinsics) is not
                // representable in the table: NaN like an invisible point.
                let entry = walker
                    .pixel(i as f64, jf)
                    .map(|(u, v)| (u as f32, v as f32))
                    .filter(|(u, v)| u.is_finite() && v.is_finite());
                match entry {
                    Some((u, v)) => {
                        *mu = u;
                        *mv = v;
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
    /// [`Error::WrongSide`] when no pixel is visible at both distances,
    /// [`Error::OutOfRange`] when the error is too large to represent.
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
        // Sum of (e / max)²: the root mean square without overflow for any
        // representable error (the scaled sum of squares of a vector norm).
        let mut scaled_sq = 0.0;
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
                    if e > max_px {
                        let r = max_px / e;
                        scaled_sq = 1.0 + scaled_sq * r * r;
                        max_px = e;
                    } else if e > 0.0 {
                        let r = e / max_px;
                        scaled_sq += r * r;
                    }
                    visible += 1;
                }
            }
        }
        if visible == 0 {
            return Err(Error::WrongSide(
                "no target pixel sees a point past the port at both distances",
            ));
        }
        representable(max_px, "the remap error is too large to represent")?;
        Ok(RemapResidual {
            max_px,
            rms_px: max_px * math::sqrt(scaled_sq / visible as f64),
            visible,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stack::{Layer, Stack};

    /// The warm-started, one-evaluation solves of a table walk agree with cold
    /// solves (from u = 0, iterated until the residual itself is within
    /// tolerance) in double precision, over a whole image.
    #[test]
    fn warm_starts_lose_no_accuracy() {
        // Invented camera: barrel distortion, a tilted two-layer port.
        let lens =
            Lens::pinhole(900.0, 905.0, 320.0, 240.0).with_distortion(-0.2, 0.04, 0.0, 5e-4, -3e-4);
        let port = Stack::new(
            Vec3::new(0.01, 0.0, 0.03),
            Vec3::new(0.08, 0.05, 1.0),
            1.000_28,
            &[Layer::new(0.01, 1.52), Layer::new(0.002, 1.49)],
            1.339,
        )
        .unwrap();
        let cam = PortCamera::new(lens, port).unwrap();
        let target = Lens::pinhole(1200.0, 1205.0, 320.0, 240.0);
        let solver = CentreSolver::new(&cam);
        for distance in [0.1, 1.0, 30.0] {
            let mut walker = RowWalker::new(&cam, &solver, Target::new(&target).unwrap(), distance);
            let mut worst: f64 = 0.0;
            for j in (0..480).step_by(7) {
                walker.restart(0.0);
                for i in 0..640 {
                    let (i, j) = (f64::from(i), f64::from(j));
                    let warm = walker.pixel(i, j);
                    let cold = cam.remap_pixel(&target, distance, i, j).ok();
                    match (warm, cold) {
                        (Some(a), Some(b)) => {
                            worst = worst.max((a.0 - b.0).abs()).max((a.1 - b.1).abs());
                        }
                        (None, None) => {}
                        other => panic!("{other:?} at ({i}, {j})"),
                    }
                }
            }
            // Both solves stop at 1e-14 relative of ~distance on the lateral
            // offset: ~1e-14 rad, 1e-11 px; 1e-9 px leaves room for rounding.
            assert!(worst < 1e-9, "{distance} m: {worst:e} px");
        }
    }
}
