//! Apparent and true positions: where an object seems to be when seen through
//! a stack, and where it really is given where it seems to be.
//!
//! Two images of a point lie on the line of sight (DESIGN.md):
//!
//! * **sagittal**: where the line of sight crosses the line through the object
//!   parallel to the normal, the usual survey convention. Its depth below the
//!   first interface is `z_s = Σ_k h_k (n_0 cos θ_0)/(n_k cos θ_k)`;
//! * **tangential**: where neighbouring rays in the plane of incidence meet when
//!   extended back (the caustic), `z_t = Σ_k h_k (n_0/n_k)(cos θ_0/cos θ_k)³`,
//!
//! sums over the layers and the object's medium (thicknesses `h_k`, the object's
//! depth below the last interface for the object's medium). For one interface
//! these are `d (n₁/n₂) cos θ₁/cos θ₂` and `d (n₁/n₂) cos³θ₁/cos³θ₂`; see
//! W. J. Smith, *Modern Optical Engineering*, 4th ed. (2008), §2.6 on plane
//! refracting surfaces, and M. Born, E. Wolf, *Principles of Optics*, 7th ed.,
//! §4.2 on astigmatic pencils. Derivation: with `x_k(p) = h_k tan θ_k(p)`, the
//! caustic depth is `Σ_k h_k (d tan θ_k/dp)/(d tan θ_0/dp)` and
//! `d tan θ/dp = 1/(n cos³θ)`. Both tend to the paraxial depth `Σ h_k n_0/n_k`
//! when viewing along the normal.

use crate::error::{finite, positive, representable, Error, Result};
use crate::interface::{continue_into, Incidence};
use crate::math;
use crate::path::{solve, SolveOptions, Solved};
use crate::stack::Stack;
use crate::vector::Vec3;

/// Which image of an object point to compute (`FlatrayImage` in C).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[repr(i32)]
pub enum Image {
    /// On the normal through the object (survey "apparent depth").
    Sagittal = 0,
    /// On the caustic of rays in the plane of incidence.
    Tangential = 1,
}

impl Image {
    /// The image for a C code (`FLATRAY_IMAGE_*`), or `None` for an unknown code.
    pub const fn from_code(code: i32) -> Option<Image> {
        match code {
            0 => Some(Image::Sagittal),
            1 => Some(Image::Tangential),
            _ => None,
        }
    }

    /// Depth factor of one medium: the image depth per metre of true depth in a
    /// medium `k`, seen from medium 0, given `η = n_k / n_0` and projections
    /// `p_0 ∝ n_0 cos θ_0`, `p_k ∝ n_k cos θ_k` (any common scale).
    ///
    /// Sagittal `p_0/p_k`; tangential `(p_0/p_k)³ η²` (the module formulas with
    /// `n cos θ` factored out).
    #[inline]
    pub(crate) fn factor(self, eta: f64, p_0: f64, p_k: f64) -> f64 {
        let r = p_0 / p_k;
        match self {
            Image::Sagittal => r,
            Image::Tangential => r * r * r * eta * eta,
        }
    }
}

/// Where `object` appears to `observer` through `stack`.
///
/// Solves the line of sight ([`crate::line_of_sight`]) and places the chosen
/// [`Image`] on it (formulas in the [module docs](self)).
///
/// # Errors
/// As [`crate::line_of_sight`]; [`Error::OutOfRange`] when the image is too far
/// away to represent (a tangential image of a grazing ray).
///
/// # Example
/// ```
/// use flatray::{apparent_position, Image, Stack, Vec3};
/// // Looking straight down into a pool: 2 m of water (1.333) looks 2/1.333 m deep.
/// let pool = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.0, 1.333)?;
/// let a = apparent_position(&pool, Vec3::new(0.0, 0.0, 1.7), Vec3::new(0.0, 0.0, -2.0), Image::Sagittal)?;
/// assert!((a.z + 2.0 / 1.333).abs() < 1e-15);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn apparent_position(
    stack: &Stack,
    observer: Vec3,
    object: Vec3,
    image: Image,
) -> Result<Vec3> {
    let s = solve(stack, observer, object, &SolveOptions::DEFAULT)?;
    apparent_from(stack, &s, object, image)
}

/// Place an image on a solved line of sight.
pub(crate) fn apparent_from(stack: &Stack, s: &Solved, object: Vec3, image: Image) -> Result<Vec3> {
    let n0 = s.n.first().copied().unwrap_or(1.0);
    let d0 = s.d.first().copied().unwrap_or(1.0);
    // n_k cos θ_k ∝ D_k with the same factor in every medium, so D can stand in
    // for n cos θ in the depth factors.
    let depth: f64 = s
        .beyond_observer()
        .map(|(h, n, d)| h * image.factor(n / n0, d0, d))
        .sum();
    let normal = stack.normal();
    let apparent = match image {
        // On the normal through the object, at image depth below the first interface.
        Image::Sagittal => object + normal * (depth - stack.height(object)),
        // On the line of sight, image depth below the entry point.
        Image::Tangential => s.entry + (s.lateral_dir * s.tan(0) + normal) * depth,
    };
    if apparent.is_finite() {
        Ok(apparent)
    } else {
        Err(Error::OutOfRange("the image is too far away to represent"))
    }
}

/// Where an object really is, given where it appears (`apparent`) to `observer`.
///
/// The line of sight is the straight line from the observer through the
/// apparent point; it fixes the ray parameter, so the inverse is closed-form:
/// the object's depth below the last interface is
/// `(z_a − Σ_layers t_i f_i) / f_object`, `z_a` the apparent depth below the
/// first interface and `f` the image's depth factor of each medium. The
/// sagittal true point lies on the normal through the apparent point; the
/// tangential one on the refracted ray.
///
/// # Errors
/// * [`Error::InvalidArgument`]: a non-finite point.
/// * [`Error::WrongSide`]: the observer past the first interface, the apparent
///   point on the observer's side, or too shallow to be the image of any point
///   in the object's medium.
/// * [`Error::TotalInternalReflection`]: the line of sight cannot enter the
///   object's medium.
/// * [`Error::OutOfRange`]: the result is too far away to represent.
///
/// # Example
/// ```
/// use flatray::{apparent_position, true_position, Image, Stack, Vec3};
/// let pool = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.0, 1.333)?;
/// let eye = Vec3::new(0.0, 0.0, 1.7);
/// let stone = Vec3::new(2.5, 1.0, -1.2);
/// let seen = apparent_position(&pool, eye, stone, Image::Sagittal)?;
/// let back = true_position(&pool, eye, seen, Image::Sagittal)?;
/// assert!((back - stone).length() < 1e-12);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn true_position(stack: &Stack, observer: Vec3, apparent: Vec3, image: Image) -> Result<Vec3> {
    let observer = observer.finite("observer must be finite")?;
    let apparent = apparent.finite("apparent point must be finite")?;
    let normal = stack.normal();
    let h_obs = stack.height(observer);
    if h_obs > 0.0 {
        return Err(Error::WrongSide(
            "the observer must be on the observer's side of the first interface",
        ));
    }
    let z_a = stack.height(apparent);
    if z_a < 0.0 {
        return Err(Error::WrongSide(
            "the apparent point must lie beyond the first interface",
        ));
    }
    let sight = apparent - observer;
    let d = sight.try_normalize().ok_or(Error::WrongSide(
        "the apparent point coincides with the observer",
    ))?;
    let cos0 = d.dot(normal);
    if cos0 <= 0.0 {
        return Err(Error::WrongSide(
            "the line of sight to the apparent point does not cross the first interface",
        ));
    }
    // Per medium, relative to the observer's index n0 (see
    // `interface::continue_into`): η = n/n0, q = n cos θ / n0, tan θ = sin θ0 / q.
    let n0 = stack.n_observer();
    let tangential = d - normal * cos0; // length sin θ0
                                        // A second projection removes the rounding residue along the normal, which
                                        // the lateral steps (1/q per metre, large for a much thinner medium) would
                                        // otherwise turn into a visible height error (a fuzz finding).
    let tangential = tangential - normal * tangential.dot(normal);
    let inc = Incidence::from_parts(cos0, tangential);
    let entry = observer + d * (-h_obs / cos0);
    let mut exit = entry;
    let mut layer_depth = 0.0;
    for layer in stack.layers() {
        let (eta, q) = continue_into(layer.index, n0, inc)?;
        layer_depth += layer.thickness * image.factor(eta, cos0, q);
        exit += tangential * (layer.thickness / q) + normal * layer.thickness;
    }
    let (eta_x, q_x) = continue_into(stack.n_object(), n0, inc)?;
    let remaining = z_a - layer_depth;
    if remaining < 0.0 {
        return Err(Error::WrongSide(
            "the apparent point is too shallow to be the image of a point in the object's medium",
        ));
    }
    let depth_x = remaining / image.factor(eta_x, cos0, q_x);
    let truth = match image {
        Image::Sagittal => apparent + normal * (stack.total_thickness() + depth_x - z_a),
        Image::Tangential => exit + (tangential * (1.0 / q_x) + normal) * depth_x,
    };
    if truth.is_finite() {
        Ok(truth)
    } else {
        Err(Error::OutOfRange(
            "the true point is too far away to represent",
        ))
    }
}

/// Depth factor of a single interface at `view_angle` (radians, in the
/// observer's medium, from the normal).
fn single_interface_factor(
    view_angle: f64,
    n_observer: f64,
    n_object: f64,
    image: Image,
) -> Result<f64> {
    let view_angle = finite(view_angle, "view_angle must be finite")?;
    if !(0.0..core::f64::consts::FRAC_PI_2).contains(&view_angle) {
        return Err(Error::InvalidArgument(
            "view_angle must be in [0, pi/2) radians",
        ));
    }
    let n0 = positive(n_observer, "n_observer must be finite and > 0")?;
    let n1 = positive(n_object, "n_object must be finite and > 0")?;
    let cos0 = math::cos(view_angle);
    let sin0 = math::sin(view_angle);
    let inc = Incidence {
        cos: cos0,
        sin2: sin0 * sin0,
    };
    match continue_into(n1, n0, inc) {
        Ok((eta, q)) => Ok(image.factor(eta, cos0, q)),
        Err(Error::TotalInternalReflection(_)) => Err(Error::TotalInternalReflection(
            "no ray from the object's medium reaches the observer at this view angle",
        )),
        Err(e) => Err(e),
    }
}

/// Apparent depth below a single flat interface (scalar form for surveys).
///
/// `true_depth` metres below the interface, `>= 0`; `view_angle` radians in the
/// observer's medium from the normal, in `[0, π/2)`. Sagittal:
/// `d (n₁/n₂) cos θ₁/cos θ₂`; tangential: `d (n₁/n₂) cos³θ₁/cos³θ₂` (see the
/// [module docs](self)).
///
/// # Errors
/// [`Error::InvalidArgument`] for NaN or infinite input, a negative depth, a view
/// angle outside `[0, π/2)` or an index not > 0;
/// [`Error::TotalInternalReflection`] for a view angle no ray from the object's
/// medium can reach (observer in the denser medium beyond the critical angle);
/// [`Error::OutOfRange`] when the result overflows.
///
/// # Example
/// ```
/// use flatray::{apparent_depth, Image};
/// // 3 m of water seen from the air along the normal looks 3/1.333 m deep.
/// let d = apparent_depth(3.0, 0.0, 1.0, 1.333, Image::Sagittal)?;
/// assert!((d - 3.0 / 1.333).abs() < 1e-15);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn apparent_depth(
    true_depth: f64,
    view_angle: f64,
    n_observer: f64,
    n_object: f64,
    image: Image,
) -> Result<f64> {
    let depth = finite(true_depth, "true_depth must be finite")?;
    if depth < 0.0 {
        return Err(Error::InvalidArgument("true_depth must be >= 0"));
    }
    let f = single_interface_factor(view_angle, n_observer, n_object, image)?;
    representable(depth * f, "the apparent depth is too large to represent")
}

/// True depth below a single flat interface from an apparent depth: the inverse
/// of [`apparent_depth`] at the same view angle.
///
/// # Errors
/// As [`apparent_depth`].
///
/// # Example
/// ```
/// use flatray::{true_depth, Image};
/// let d = true_depth(1.5, 0.3, 1.0, 1.333, Image::Sagittal)?;
/// assert!(d > 1.5 * 1.333); // oblique views make water look even shallower
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn true_depth(
    apparent_depth: f64,
    view_angle: f64,
    n_observer: f64,
    n_object: f64,
    image: Image,
) -> Result<f64> {
    let depth = finite(apparent_depth, "apparent_depth must be finite")?;
    if depth < 0.0 {
        return Err(Error::InvalidArgument("apparent_depth must be >= 0"));
    }
    let f = single_interface_factor(view_angle, n_observer, n_object, image)?;
    representable(depth / f, "the true depth is too large to represent")
}
