//! One flat interface between two media: Snell's law in vector form, the
//! Fresnel power coefficients and the critical angle.
//!
//! Sources: E. Hecht, *Optics*, 5th ed. (Pearson, 2017), §4.4 (Snell's law)
//! and §4.6 (Fresnel equations, eqs. 4.42–4.45 for the amplitude coefficients,
//! 4.56–4.62 for reflectance and transmittance); the vector form of Snell's law
//! as in A. S. Glassner (ed.), *An Introduction to Ray Tracing* (1989), ch. 4.

use crate::error::{positive, Error, Result};
use crate::math;
use crate::vector::Vec3;

/// Largest ratio of two refractive indices flatray computes with (and the
/// reciprocal the smallest). Real media span ratios below 10; beyond 1e100 the
/// squares in the formulas would overflow, so such inputs are
/// [`Error::OutOfRange`] rather than a silently wrong result.
pub const MAX_INDEX_RATIO: f64 = 1e100;

/// The index ratio `η = n_t / n_i`, checked against [`MAX_INDEX_RATIO`].
#[inline]
pub(crate) fn index_ratio(n_t: f64, n_i: f64) -> Result<f64> {
    let eta = n_t / n_i;
    if (1.0 / MAX_INDEX_RATIO..=MAX_INDEX_RATIO).contains(&eta) {
        Ok(eta)
    } else {
        Err(Error::OutOfRange(
            "the ratio of two refractive indices is beyond 1e100",
        ))
    }
}

/// The angle of incidence as its cosine and squared sine, each computed
/// directly (from a direction: `cos = d̂·n̂`, `sin² = |d̂ − cos n̂|²`), so neither is
/// taken as `1 − the other` where that would cancel.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Incidence {
    /// `cos θ`, in `[0, 1]`.
    pub cos: f64,
    /// `sin² θ`, in `[0, 1]`.
    pub sin2: f64,
}

impl Incidence {
    /// From the cosine alone: `sin² = (1 − cos)(1 + cos)` (exact for cos near 1).
    #[inline]
    pub fn from_cos(cos: f64) -> Incidence {
        Incidence {
            cos,
            sin2: (1.0 - cos) * (1.0 + cos),
        }
    }

    /// From the cosine and the tangential part `d̂ − cos n̂` of a unit direction.
    #[inline]
    pub fn from_parts(cos: f64, tangential: Vec3) -> Incidence {
        Incidence {
            cos,
            sin2: tangential.dot(tangential),
        }
    }
}

/// `q = n_t cos θ_t / n_i` for light crossing from index `n_i` into
/// `n_t = η n_i` at incidence `inc` (Snell's law): `q² = η² − sin² θ_i`,
/// written relative to `n_i` so that no index is squared (tiny or huge indices
/// cannot underflow or overflow). For `η >= 1` it is evaluated as
/// `(η − 1)(η + 1) + cos² θ_i`, a sum of non-negative terms, so grazing rays
/// keep their accuracy; for `η < 1` as `η² − sin² θ_i` with the sine computed
/// directly, so a ray near the normal cannot be mistaken for one that crosses.
/// Returns `None` beyond the critical angle (`q² < 0`).
#[inline]
pub(crate) fn projected_ratio(eta: f64, inc: Incidence) -> Option<f64> {
    let sq = if eta >= 1.0 {
        (eta - 1.0) * (eta + 1.0) + inc.cos * inc.cos
    } else {
        eta * eta - inc.sin2
    };
    if sq >= 0.0 {
        Some(math::sqrt(sq))
    } else {
        None
    }
}

/// How a ray with incidence `inc` in a medium of index `n_0` continues
/// into a parallel medium of index `n`: `(η, q)` with `η = n / n_0` and
/// `q = n cos θ / n_0` ([`projected_ratio`]), the same in every medium of a flat
/// stack because `n sin θ` is (Snell's law).
///
/// # Errors
/// [`Error::TotalInternalReflection`] when the ray cannot enter the medium (or
/// would only graze it, `q = 0`); [`Error::OutOfRange`] for an index ratio
/// beyond [`MAX_INDEX_RATIO`].
#[inline]
pub(crate) fn continue_into(n: f64, n_0: f64, inc: Incidence) -> Result<(f64, f64)> {
    let eta = index_ratio(n, n_0)?;
    match projected_ratio(eta, inc) {
        Some(q) if q > 0.0 => Ok((eta, q)),
        _ => Err(Error::TotalInternalReflection(
            "the ray cannot cross an interface of the stack",
        )),
    }
}

/// Refract a direction at a plane interface (Snell's law, vector form).
///
/// With `d̂` the unit incident direction, `n̂` the unit normal oriented along the
/// propagation (`d̂·n̂ > 0`), `η = n_from / n_to` and `cos θ_i = d̂·n̂`:
///
/// `t̂ = η (d̂ − cos θ_i n̂) + cos θ_t n̂`, with `n_to cos θ_t = √(n_to² − n_from² sin² θ_i)`.
///
/// `normal` may have either orientation and any non-zero length; `direction`
/// any non-zero length. The result is a unit vector.
///
/// # Errors
/// * [`Error::InvalidArgument`]: zero, subnormal-length or non-finite `direction`
///   or `normal`; an index that is not finite and > 0.
/// * [`Error::MissesInterface`]: `direction` lies in the interface plane.
/// * [`Error::TotalInternalReflection`]: beyond the critical angle.
/// * [`Error::OutOfRange`]: indices whose ratio exceeds [`MAX_INDEX_RATIO`].
///
/// # Example
/// ```
/// use flatray::{refract, Vec3};
/// // 45 degrees from air into water of index 1.333.
/// let d = Vec3::new(1.0, 0.0, 1.0);
/// let t = refract(d, Vec3::new(0.0, 0.0, 1.0), 1.0, 1.333)?;
/// let sin_t = t.x; // the x axis lies in the interface
/// assert!((sin_t - 0.5f64.sqrt() / 1.333).abs() < 1e-15);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn refract(direction: Vec3, normal: Vec3, n_from: f64, n_to: f64) -> Result<Vec3> {
    let d = direction.direction("direction must be finite and non-zero")?;
    let mut n = normal.direction("normal must be finite and non-zero")?;
    let n_from = positive(n_from, "n_from must be finite and > 0")?;
    let n_to = positive(n_to, "n_to must be finite and > 0")?;
    let mut cos_i = d.dot(n);
    if cos_i < 0.0 {
        n = -n;
        cos_i = -cos_i;
    }
    if cos_i <= 0.0 {
        return Err(Error::MissesInterface(
            "the direction lies in the interface plane",
        ));
    }
    let tangential = d - n * cos_i;
    let eta = index_ratio(n_to, n_from)?;
    let q = projected_ratio(eta, Incidence::from_parts(cos_i, tangential)).ok_or(
        Error::TotalInternalReflection("the incidence angle is beyond the critical angle"),
    )?;
    // t̂ = (d̂ − cos θ_i n̂)/η + (n_to cos θ_t / n_to) n̂, and n_to cos θ_t / n_to = q/η.
    let t = (tangential + n * q) * (1.0 / eta);
    // |t| = 1 up to rounding; renormalise so the output is unit to the last bit.
    t.direction("refracted direction underflowed")
}

/// Fresnel power coefficients of a dielectric interface.
///
/// `rs`, `rp` are reflectances and `ts`, `tp` transmittances for s and p
/// polarisation (`rs + ts = 1`, `rp + tp = 1`); `r`, `t` are the means for
/// unpolarised light. Laid out as `FlatrayFresnel` in C.
#[derive(Debug, Clone, Copy, PartialEq)]
#[repr(C)]
pub struct Fresnel {
    /// Reflectance, s polarisation.
    pub rs: f64,
    /// Reflectance, p polarisation.
    pub rp: f64,
    /// Transmittance, s polarisation.
    pub ts: f64,
    /// Transmittance, p polarisation.
    pub tp: f64,
    /// Reflectance of unpolarised light, `(rs + rp) / 2`.
    pub r: f64,
    /// Transmittance of unpolarised light, `(ts + tp) / 2`.
    pub t: f64,
}

impl Fresnel {
    /// Every coefficient NaN: what fallible calls write on error.
    /// cbindgen:ignore
    pub const NAN: Fresnel = Fresnel {
        rs: f64::NAN,
        rp: f64::NAN,
        ts: f64::NAN,
        tp: f64::NAN,
        r: f64::NAN,
        t: f64::NAN,
    };

    /// Total reflection: `r = rs = rp = 1`, `t = ts = tp = 0`.
    /// cbindgen:ignore
    pub const TOTAL_REFLECTION: Fresnel = Fresnel {
        rs: 1.0,
        rp: 1.0,
        ts: 0.0,
        tp: 0.0,
        r: 1.0,
        t: 0.0,
    };

    /// Coefficients from the projections `a ∝ n_i cos θ_i` and `b ∝ n_t cos θ_t`
    /// and the index ratio `η = n_t / n_i` (any common scale of `a` and `b`
    /// cancels). Hecht eqs. 4.42–4.45 squared, with `T = 1 − R` written out:
    ///
    /// `Rs = ((a − b)/(a + b))²`, `Ts = 4ab/(a + b)²`;
    /// with `x = η² a` and `y = b` (Hecht's `n_t cos θ_i` and `n_i cos θ_t`,
    /// both scaled by `n_i η = n_t`): `Rp = ((x − y)/(x + y))²`, `Tp = 4xy/(x + y)²`.
    ///
    /// Evaluated as `Ts = 4 (a s)(b s)` with `s = 1/(a + b)`, so each factor is in
    /// `[0, 1]`: no overflow (`η` is within [`MAX_INDEX_RATIO`] and the
    /// projections are first scaled near 1 when they are not), `T` clamped to 1 against rounding,
    /// and both `T` and `R` keep their relative accuracy at grazing incidence.
    /// Requires `a, b >= 0`, not both 0.
    #[inline]
    pub(crate) fn from_projections(eta: f64, a: f64, b: f64) -> Fresnel {
        // Projections from a grazing line-of-sight solve can be huge; bring them
        // near 1 first so that η² a cannot overflow (a fuzz finding).
        let m = a.max(b);
        let (a, b) = if (1e-100..=1e100).contains(&m) {
            (a, b)
        } else {
            (a / m, b / m)
        };
        let (rs, ts) = reflect_transmit(a, b);
        let (rp, tp) = reflect_transmit(eta * eta * a, b);
        Fresnel {
            rs,
            rp,
            ts,
            tp,
            r: 0.5 * (rs + rp),
            t: 0.5 * (ts + tp),
        }
    }
}

/// `(((u − v)/(u + v))², 4uv/(u + v)²)` for `u, v >= 0` not both zero, as
/// `((u s − v s)², 4 (u s)(v s))` with `s = 1/(u + v)`: one division, factors in
/// `[0, 1]`.
#[inline]
fn reflect_transmit(u: f64, v: f64) -> (f64, f64) {
    let s = 1.0 / (u + v);
    let (us, vs) = (u * s, v * s);
    let diff = us - vs;
    // 4 (us)(vs) ≤ 1 in exact arithmetic; the rounding of us and vs can push it
    // an ulp above 1 when u ≈ v (a fuzz finding), so clamp.
    (diff * diff, (4.0 * us * vs).min(1.0))
}

/// Fresnel power coefficients for light meeting a flat interface from a medium
/// of index `n_from` into one of index `n_to`, at incidence `cos_incidence`
/// (cosine of the angle from the normal, in `[0, 1]`).
///
/// Beyond the critical angle the light is totally reflected and the result is
/// [`Fresnel::TOTAL_REFLECTION`] (not an error). At grazing incidence
/// (`cos_incidence = 0`) everything is reflected; between equal indices
/// everything is transmitted.
///
/// # Errors
/// [`Error::InvalidArgument`] when `cos_incidence` is outside `[0, 1]` or NaN,
/// or an index is not finite and > 0; [`Error::OutOfRange`] when the ratio of
/// the indices exceeds [`MAX_INDEX_RATIO`].
///
/// # Example
/// ```
/// // Normal incidence on glass of index 1.5: R = ((1.5 − 1)/(1.5 + 1))² = 0.04
/// // (Hecht, Optics, eq. 4.67).
/// let f = flatray::fresnel(1.0, 1.0, 1.5)?;
/// assert!((f.r - 0.04).abs() < 1e-15);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn fresnel(cos_incidence: f64, n_from: f64, n_to: f64) -> Result<Fresnel> {
    if !(0.0..=1.0).contains(&cos_incidence) {
        return Err(Error::InvalidArgument("cos_incidence must be in [0, 1]"));
    }
    let n_from = positive(n_from, "n_from must be finite and > 0")?;
    let n_to = positive(n_to, "n_to must be finite and > 0")?;
    if n_from == n_to {
        return Ok(Fresnel {
            rs: 0.0,
            rp: 0.0,
            ts: 1.0,
            tp: 1.0,
            r: 0.0,
            t: 1.0,
        });
    }
    let eta = index_ratio(n_to, n_from)?;
    Ok(
        match projected_ratio(eta, Incidence::from_cos(cos_incidence)) {
            Some(q) if cos_incidence > 0.0 || q > 0.0 => {
                Fresnel::from_projections(eta, cos_incidence, q)
            }
            _ => Fresnel::TOTAL_REFLECTION,
        },
    )
}

/// The critical angle, radians, for light going from `n_from` into a less dense
/// medium `n_to`: `θ_c = asin(n_to / n_from)` (Hecht §4.7).
///
/// # Errors
/// [`Error::InvalidArgument`] when an index is not finite and > 0, or when
/// `n_from <= n_to` (no critical angle exists).
///
/// # Example
/// ```
/// // Water (1.333) to air: about 48.6 degrees (common practice).
/// let c = flatray::critical_angle(1.333, 1.0)?;
/// assert!((c.to_degrees() - 48.6).abs() < 0.05);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn critical_angle(n_from: f64, n_to: f64) -> Result<f64> {
    let n_from = positive(n_from, "n_from must be finite and > 0")?;
    let n_to = positive(n_to, "n_to must be finite and > 0")?;
    if n_from <= n_to {
        return Err(Error::InvalidArgument(
            "no critical angle: n_from must be greater than n_to",
        ));
    }
    Ok(math::asin(n_to / n_from))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Identities hold to a few ulps of 1; 8 ε leaves room for the rounding of
    /// a square root and three products.
    const IDENTITY_TOL: f64 = 8.0 * f64::EPSILON;

    #[test]
    fn refraction_obeys_snell_and_keeps_plane_of_incidence() {
        let n = Vec3::new(0.0, 0.0, 1.0);
        for deg in [0.0f64, 10.0, 30.0, 60.0, 89.0] {
            let a = deg.to_radians();
            let d = Vec3::new(a.sin(), 0.0, a.cos());
            let t = refract(d, n, 1.0, 1.5).unwrap();
            assert!((t.length() - 1.0).abs() < IDENTITY_TOL);
            assert!((1.5 * t.x - a.sin()).abs() < IDENTITY_TOL, "Snell at {deg}");
            assert_eq!(t.y, 0.0);
            assert!(t.z > 0.0);
        }
    }

    #[test]
    fn normal_orientation_does_not_matter() {
        let d = Vec3::new(0.3, 0.1, 1.0);
        let a = refract(d, Vec3::new(0.0, 0.0, 1.0), 1.0, 1.33).unwrap();
        let b = refract(d, Vec3::new(0.0, 0.0, -5.0), 1.0, 1.33).unwrap();
        assert_eq!(a, b);
    }

    #[test]
    fn refraction_errors() {
        let n = Vec3::new(0.0, 0.0, 1.0);
        assert!(matches!(
            refract(Vec3::new(1.0, 0.0, 0.0), n, 1.0, 1.5),
            Err(Error::MissesInterface(_))
        ));
        // 60 degrees from water (1.333) to air exceeds the 48.6 degree critical angle.
        let d = Vec3::new(60f64.to_radians().sin(), 0.0, 60f64.to_radians().cos());
        assert!(matches!(
            refract(d, n, 1.333, 1.0),
            Err(Error::TotalInternalReflection(_))
        ));
        assert!(matches!(
            refract(Vec3::ZERO, n, 1.0, 1.5),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            refract(n, Vec3::ZERO, 1.0, 1.5),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            refract(n, n, 0.0, 1.5),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            refract(n, n, 1.0, f64::NAN),
            Err(Error::InvalidArgument(_))
        ));
    }

    #[test]
    fn fresnel_energy_and_limits() {
        for &(n1, n2) in &[(1.0, 1.5), (1.5, 1.0), (1.0, 1.333), (1.333, 1.52)] {
            for i in 0..=100 {
                let c = i as f64 / 100.0;
                let f = fresnel(c, n1, n2).unwrap();
                assert!((f.rs + f.ts - 1.0).abs() < IDENTITY_TOL);
                assert!((f.rp + f.tp - 1.0).abs() < IDENTITY_TOL);
                assert!((f.r + f.t - 1.0).abs() < IDENTITY_TOL);
            }
        }
        assert_eq!(fresnel(0.0, 1.0, 1.5).unwrap(), Fresnel::TOTAL_REFLECTION);
        assert_eq!(fresnel(0.2, 1.5, 1.0).unwrap(), Fresnel::TOTAL_REFLECTION);
        assert_eq!(fresnel(0.0, 1.2, 1.2).unwrap().t, 1.0);
        assert!(matches!(
            fresnel(1.1, 1.0, 1.5),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            fresnel(-0.1, 1.0, 1.5),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            fresnel(f64::NAN, 1.0, 1.5),
            Err(Error::InvalidArgument(_))
        ));
    }

    #[test]
    fn critical_angle_errors() {
        assert!(matches!(
            critical_angle(1.0, 1.333),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            critical_angle(1.2, 1.2),
            Err(Error::InvalidArgument(_))
        ));
        assert!(matches!(
            critical_angle(-1.0, 1.0),
            Err(Error::InvalidArgument(_))
        ));
    }
}
