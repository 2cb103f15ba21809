//! Rays through a stack: the trace (back-projection of an observer's ray) and
//! the line of sight (the physical light path between an observer and an
//! object, found from Fermat's principle).
//!
//! Both use the ray parameter `p = n sin θ`, which is the same in every medium
//! of a flat stack (Snell's law), and the cancellation-free form
//! `(n_k cos θ_k)² = (n_k − n_0)(n_k + n_0) + (n_0 cos θ_0)²` for the cosine in
//! medium `k` (see [`crate::interface`]).

use crate::error::{representable, Error, Result};
use crate::interface::{continue_into, index_ratio, Fresnel, Incidence};
use crate::math;
use crate::stack::{Stack, MAX_LAYERS};
use crate::vector::{Ray, Vec3};

/// Number of media a path crosses at most: observer, 8 layers, object.
pub(crate) const MAX_MEDIA: usize = MAX_LAYERS + 2;

/// A ray traced through a stack into the object's medium.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Traced {
    /// The ray in the object's medium: origin on the last interface, unit direction.
    pub ray: Ray,
    /// Transmittance of unpolarised light through every interface,
    /// `(Π Ts + Π Tp) / 2`, in `[0, 1]`.
    pub transmittance: f64,
}

/// Trace a ray leaving the observer through the stack (back-projection).
///
/// The ray is refracted at every interface by Snell's law; the result is the ray
/// in the object's medium, starting on the last interface, and the
/// transmittance of unpolarised light, `(Π Ts + Π Tp)/2` over the interfaces
/// (Fresnel, see [`crate::fresnel`]).
///
/// # Errors
/// * [`Error::InvalidArgument`]: non-finite origin, zero or non-finite direction.
/// * [`Error::WrongSide`]: the origin is past the first interface.
/// * [`Error::MissesInterface`]: the direction is parallel to the interfaces or
///   points away from the stack.
/// * [`Error::TotalInternalReflection`]: the ray cannot leave some interface.
/// * [`Error::OutOfRange`]: the result is not representable (a nearly grazing ray
///   far from the stack).
///
/// # Example
/// ```
/// use flatray::{trace, Ray, Stack, Vec3};
/// // Looking straight down at a water surface 2 m below the eye.
/// let lake = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.0, 1.333)?;
/// let out = trace(&lake, Ray::new(Vec3::new(0.0, 0.0, 2.0), Vec3::new(0.0, 0.0, -1.0)))?;
/// assert_eq!(out.ray.origin, Vec3::ZERO);
/// assert_eq!(out.ray.direction, Vec3::new(0.0, 0.0, -1.0));
/// // Normal incidence: T = 1 − ((1.333 − 1)/(1.333 + 1))² (Hecht, Optics, eq. 4.67).
/// assert!((out.transmittance - (1.0 - (0.333f64 / 2.333).powi(2))).abs() < 1e-15);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn trace(stack: &Stack, observer_ray: Ray) -> Result<Traced> {
    let origin = observer_ray.origin.finite("ray origin must be finite")?;
    let d = observer_ray
        .direction
        .direction("ray direction must be finite and non-zero")?;
    let normal = stack.normal();
    let h0 = stack.height(origin);
    if h0 > 0.0 {
        return Err(Error::WrongSide(
            "the observer ray must start on the observer's side of the stack",
        ));
    }
    let cos0 = d.dot(normal);
    if cos0 <= 0.0 {
        return Err(Error::MissesInterface(
            "the ray is parallel to the interfaces or points away from the stack",
        ));
    }
    // Everything per medium is relative to the observer's index n0 (see
    // `continue_into`): η = n/n0, q = n cos θ / n0, tan θ = sin θ0 / q.
    let n0 = stack.n_observer();
    let tangential = d - normal * cos0; // length sin θ0
                                        // A second projection removes the rounding residue along the normal, which
                                        // the lateral steps (1/q per metre, large for a much thinner medium) would
                                        // otherwise turn into a visible height error (a fuzz finding).
    let tangential = tangential - normal * tangential.dot(normal);
    let inc = Incidence::from_parts(cos0, tangential);
    let mut position = origin + d * (-h0 / cos0);
    let mut prev_n = n0;
    let mut prev_q = cos0;
    let mut prod_ts = 1.0;
    let mut prod_tp = 1.0;
    for layer in stack.layers() {
        let (_, q) = continue_into(layer.index, n0, inc)?;
        let f = Fresnel::from_projections(index_ratio(layer.index, prev_n)?, prev_q, q);
        prod_ts *= f.ts;
        prod_tp *= f.tp;
        position += tangential * (layer.thickness / q) + normal * layer.thickness;
        prev_n = layer.index;
        prev_q = q;
    }
    let n_x = stack.n_object();
    let (eta_x, q_x) = continue_into(n_x, n0, inc)?;
    let f = Fresnel::from_projections(index_ratio(n_x, prev_n)?, prev_q, q_x);
    prod_ts *= f.ts;
    prod_tp *= f.tp;
    // As in `refract`: t̂ = (tangential + q n̂)/η, renormalised to the last bit.
    let direction = ((tangential + normal * q_x) * (1.0 / eta_x))
        .direction("refracted direction underflowed")?;
    if !position.is_finite() {
        return Err(Error::OutOfRange(
            "the ray meets the stack too far away to represent",
        ));
    }
    Ok(Traced {
        ray: Ray::new(position, direction),
        transmittance: 0.5 * (prod_ts + prod_tp),
    })
}

/// The light path between an observer and an object through a stack.
///
/// Laid out as `FlatrayPath` in C.
#[derive(Debug, Clone, Copy, PartialEq)]
#[repr(C)]
pub struct Path {
    /// Unit direction at the observer, toward the stack (the line of sight).
    pub direction: Vec3,
    /// Where the path meets the first interface, metres.
    pub entry: Vec3,
    /// Where the path meets the last interface, metres (equal to `entry` for a
    /// single interface).
    pub exit: Vec3,
    /// Length of the path from observer to object, metres.
    pub geometric_length: f64,
    /// Optical path length `Σ n_k s_k`, metres.
    pub optical_length: f64,
    /// Transmittance of unpolarised light, `(Π Ts + Π Tp) / 2`.
    pub transmittance: f64,
}

impl Path {
    /// Every field NaN: what fallible calls write on error.
    /// cbindgen:ignore
    pub const NAN: Path = Path {
        direction: Vec3::NAN,
        entry: Vec3::NAN,
        exit: Vec3::NAN,
        geometric_length: f64::NAN,
        optical_length: f64::NAN,
        transmittance: f64::NAN,
    };
}

/// Accuracy settings of the line-of-sight solve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SolveOptions {
    /// The solve stops when the lateral miss at the object is below
    /// `relative_tolerance × (lateral offset + total depth)`.
    pub relative_tolerance: f64,
    /// Most Newton steps before [`Error::NotConverged`].
    pub max_iterations: u32,
}

impl SolveOptions {
    /// Defaults: a relative tolerance of 1e-14 (a few ulps of the geometry's
    /// scale; 1e-10 m at 10 km) and 200 iterations (a solve typically takes 3 to 8;
    /// the slowest cases, grazing paths whose lowest-index medium has zero
    /// thickness, gain a factor of about 1.5 per step).
    pub const DEFAULT: SolveOptions = SolveOptions {
        relative_tolerance: 1e-14,
        max_iterations: 200,
    };
}

impl Default for SolveOptions {
    fn default() -> Self {
        SolveOptions::DEFAULT
    }
}

/// The media crossed between two points, with the solved ray parameter.
///
/// Medium 0 is the observer's, then the layers, then the object's. The solve
/// variable is `u = tan θ_m` in the medium of lowest index `n_m`; then in any
/// medium `k`, with `ν_k = n_k / n_m` and `D_k = √(ν_k² + (ν_k² − 1) u²)`:
/// `tan θ_k = u / D_k` and `n_k cos θ_k ∝ D_k` (the same factor
/// `1/√(1 + u²)` for every medium), which stay accurate at grazing angles.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Solved {
    /// Media count (layers + 2).
    pub count: usize,
    /// Index of each medium.
    pub n: [f64; MAX_MEDIA],
    /// Distance along the normal travelled in each medium, metres.
    pub h: [f64; MAX_MEDIA],
    /// `D_k` of each medium at the solution.
    pub d: [f64; MAX_MEDIA],
    /// The solved `u = tan θ` in the lowest-index medium.
    pub u: f64,
    /// Unit lateral direction from observer toward object (zero when the object
    /// is on the observer's normal).
    pub lateral_dir: Vec3,
    /// Where the path meets the first interface.
    pub entry: Vec3,
}

impl Solved {
    /// `tan θ_k` in medium `k`.
    #[inline]
    pub fn tan(&self, k: usize) -> f64 {
        let d = self.d.get(k).copied().unwrap_or(f64::NAN);
        self.u / d
    }

    /// The media after the observer's: `(h_k, n_k, D_k)` of each layer and the
    /// object's medium.
    #[inline]
    pub fn beyond_observer(&self) -> impl Iterator<Item = (f64, f64, f64)> + '_ {
        self.h
            .iter()
            .zip(self.n.iter())
            .zip(self.d.iter())
            .take(self.count)
            .skip(1)
            .map(|((&h, &n), &d)| (h, n, d))
    }
}

/// Solve the line of sight from `observer` to `object` (Fermat's principle).
#[inline]
pub(crate) fn solve(
    stack: &Stack,
    observer: Vec3,
    object: Vec3,
    options: &SolveOptions,
) -> Result<Solved> {
    let observer = observer.finite("observer must be finite")?;
    let object = object.finite("object must be finite")?;
    let normal = stack.normal();
    let h_obs = stack.height(observer);
    if h_obs > 0.0 {
        return Err(Error::WrongSide(
            "the observer must be on the observer's side of the first interface",
        ));
    }
    let h_obj = stack.height(object) - stack.total_thickness();
    if h_obj < 0.0 {
        return Err(Error::WrongSide(
            "the object must be in the object's medium, past the last interface",
        ));
    }

    let mut n = [1.0; MAX_MEDIA];
    let mut h = [0.0; MAX_MEDIA];
    let count = stack.layers().len() + 2;
    let slots = n.iter_mut().zip(h.iter_mut());
    let media = core::iter::once((stack.n_observer(), -h_obs))
        .chain(stack.layers().iter().map(|l| (l.index, l.thickness)))
        .chain(core::iter::once((stack.n_object(), h_obj)));
    for ((n_slot, h_slot), (n_k, h_k)) in slots.zip(media) {
        *n_slot = n_k;
        *h_slot = h_k;
    }
    let n_min = n.iter().take(count).fold(f64::INFINITY, |a, &b| a.min(b));

    let delta = object - observer;
    let lateral = delta - normal * delta.dot(normal);
    let lateral_len = lateral.length();
    representable(lateral_len, "observer and object are too far apart")?;
    let (lateral_dir, target) = match lateral.try_normalize() {
        Some(dir) => (dir, lateral_len),
        None => (Vec3::ZERO, 0.0),
    };
    let depth_scale: f64 = h.iter().take(count).sum();
    representable(depth_scale, "observer and object are too far apart")?;

    // Indices relative to the lowest, ν_k = n_k / n_m >= 1 (no index is squared,
    // so tiny or huge indices cannot underflow or overflow), and
    // b_k = ν_k² − 1 >= 0, exact in its factored form.
    let mut nu = [1.0; MAX_MEDIA];
    let mut b = [0.0; MAX_MEDIA];
    let mut linear_height = 0.0; // Σ h_k over media with n_k = n_m
    let mut bound = 0.0; // sup F = Σ h_k / √b_k over the other media
    for (((nu_k, b_k), &n_k), &h_k) in nu
        .iter_mut()
        .zip(b.iter_mut())
        .zip(n.iter())
        .zip(h.iter())
        .take(count)
    {
        *nu_k = index_ratio(n_k, n_min)?;
        *b_k = (*nu_k - 1.0) * (*nu_k + 1.0);
        if *b_k == 0.0 {
            linear_height += h_k;
        } else {
            bound += h_k / math::sqrt(*b_k);
        }
    }
    if linear_height == 0.0 && target >= bound {
        return Err(Error::TotalInternalReflection(
            "no ray connects observer and object: it would have to graze an interface",
        ));
    }

    // F(u) = u Σ h_k / D_k, D_k = √(ν_k² + b_k u²), is increasing and concave
    // in u (each term is u/√(a + b u²) or linear), F(0) = 0. Newton's method from u = 0 therefore
    // climbs monotonically to the root (the tangent of a concave function lies
    // above it), needing no bracket: each step is a safe under-estimate.
    let tolerance = options.relative_tolerance * (target + depth_scale);
    let mut u = 0.0;
    let mut converged = target <= tolerance;
    let mut iterations = 0;
    while !converged {
        if iterations >= options.max_iterations {
            return Err(Error::NotConverged(
                "the line-of-sight solve ran out of iterations",
            ));
        }
        iterations += 1;
        let mut f = 0.0;
        let mut df = 0.0;
        let u2 = u * u;
        for ((&nu_k, &h_k), &b_k) in nu.iter().zip(h.iter()).zip(b.iter()).take(count) {
            let a_k = nu_k * nu_k;
            let inv = 1.0 / math::sqrt(a_k + b_k * u2);
            f += h_k * inv;
            df += h_k * a_k * inv * inv * inv;
        }
        let residual = target - u * f;
        if residual <= tolerance {
            converged = true;
            continue;
        }
        let next = u + residual / df;
        if next <= u || !next.is_finite() || next > 1e150 {
            // No more progress in floating point: accept only if close.
            if residual <= 1e3 * tolerance {
                converged = true;
                continue;
            }
            return Err(Error::NotConverged(
                "the line-of-sight solve stalled before reaching its accuracy",
            ));
        }
        u = next;
    }

    let mut d = [1.0; MAX_MEDIA];
    let u2 = u * u;
    for ((d_k, &nu_k), &b_k) in d.iter_mut().zip(nu.iter()).zip(b.iter()).take(count) {
        *d_k = math::sqrt(nu_k * nu_k + b_k * u2);
    }
    let h0 = h.first().copied().unwrap_or(0.0);
    let tan0 = u / d.first().copied().unwrap_or(1.0);
    let entry = observer + (lateral_dir * tan0 + normal) * h0;
    Ok(Solved {
        count,
        n,
        h,
        d,
        u,
        lateral_dir,
        entry,
    })
}

/// The line of sight from `observer` to `object` through `stack`, with
/// default accuracy ([`SolveOptions::DEFAULT`]).
///
/// Fermat's principle makes the light path unique; with the ray parameter
/// `p = n sin θ` (constant through the stack) the lateral offset
/// `F(p) = Σ h_k tan θ_k` is strictly increasing, and flatray solves
/// `F = lateral distance` by Newton's method in `u = tan θ` of the
/// lowest-index medium, where `F` is concave (so the iteration is monotone and
/// needs no bracket). For one interface this is equivalent to the quartic of
/// A. Agrawal, S. Ramalingam, Y. Taguchi, V. Chari, "A theory of multi-layer flat
/// refractive geometry", CVPR 2012.
///
/// # Errors
/// * [`Error::InvalidArgument`]: a non-finite point.
/// * [`Error::WrongSide`]: the observer past the first interface, or the object
///   not past the last one.
/// * [`Error::TotalInternalReflection`]: no ray connects the points (only when
///   the lowest-index medium has zero path length, e.g. an observer on the
///   interface looking at a far lateral point).
/// * [`Error::NotConverged`], [`Error::OutOfRange`]: extreme geometry.
///
/// # Example
/// ```
/// use flatray::{line_of_sight, Stack, Vec3};
/// // A drone 10 m above a lake; a stone 2 m deep, 3 m to the side.
/// let lake = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.000_29, 1.333)?;
/// let path = line_of_sight(&lake, Vec3::new(0.0, 0.0, 10.0), Vec3::new(3.0, 0.0, -2.0))?;
/// // Snell's law at the entry point: n1 sin θ1 = n2 sin θ2.
/// let sin1 = path.direction.x;
/// let below = Vec3::new(3.0, 0.0, -2.0) - path.entry;
/// let sin2 = below.x / below.length();
/// assert!((1.000_29 * sin1 - 1.333 * sin2).abs() < 1e-14);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn line_of_sight(stack: &Stack, observer: Vec3, object: Vec3) -> Result<Path> {
    line_of_sight_with(stack, observer, object, &SolveOptions::DEFAULT)
}

/// [`line_of_sight`] with explicit accuracy settings.
///
/// # Errors
/// As [`line_of_sight`].
pub fn line_of_sight_with(
    stack: &Stack,
    observer: Vec3,
    object: Vec3,
    options: &SolveOptions,
) -> Result<Path> {
    let s = solve(stack, observer, object, options)?;
    path_from(stack, &s)
}

/// `1/cos θ = √(1 + tan² θ)` for `tan θ >= 0`, without the cost of a general
/// `hypot`: the square cannot overflow below 1e150, and above it `√(1 + t²)`
/// rounds to `t`.
#[inline]
fn sec_from_tan(t: f64) -> f64 {
    if t < 1e150 {
        math::sqrt(1.0 + t * t)
    } else {
        t
    }
}

/// Assemble the [`Path`] of a solved line of sight.
pub(crate) fn path_from(stack: &Stack, s: &Solved) -> Result<Path> {
    let normal = stack.normal();
    let u = s.u;
    let d0 = s.d.first().copied().unwrap_or(1.0);
    // Unit direction in medium k: (u ê + D_k n̂) / √(u² + D_k²).
    let direction = (s.lateral_dir * u + normal * d0).direction("direction underflowed")?;
    let mut exit = s.entry;
    let mut geometric = 0.0;
    let mut optical = 0.0;
    let mut prod_ts = 1.0;
    let mut prod_tp = 1.0;
    let mut prev: Option<(f64, f64)> = None;
    for (k, ((&n_k, &h_k), &d_k)) in
        s.n.iter()
            .zip(s.h.iter())
            .zip(s.d.iter())
            .take(s.count)
            .enumerate()
    {
        // Segment length h_k / cos θ_k with 1/cos θ_k = √(u² + D_k²) / D_k.
        let seg = h_k * sec_from_tan(u / d_k);
        geometric += seg;
        optical += n_k * seg;
        if let Some((n_prev, d_prev)) = prev {
            // n cos θ is proportional to D in every medium; the Fresnel
            // coefficients depend only on the ratio.
            let f = Fresnel::from_projections(index_ratio(n_k, n_prev)?, d_prev, d_k);
            prod_ts *= f.ts;
            prod_tp *= f.tp;
        }
        prev = Some((n_k, d_k));
        if k > 0 && k + 1 < s.count {
            exit += (s.lateral_dir * (u / d_k) + normal) * h_k;
        }
    }
    let path = Path {
        direction,
        entry: s.entry,
        exit,
        geometric_length: geometric,
        optical_length: optical,
        transmittance: 0.5 * (prod_ts + prod_tp),
    };
    if !(path.entry.is_finite() && path.exit.is_finite() && optical.is_finite()) {
        return Err(Error::OutOfRange("the path is too long to represent"));
    }
    Ok(path)
}
