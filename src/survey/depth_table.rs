//! Depth tables: the single-interface depth helpers over slices, and the
//! correction factor (true depth / apparent depth) against viewing angle.
//!
//! For one flat interface, a point at true depth `d` seen at view angle `θ₁`
//! (in the observer's medium, from the normal) appears at depth
//! `d (n₁/n₂) cos θ₁/cos θ₂` (sagittal image) or `d (n₁/n₂) cos³θ₁/cos³θ₂`
//! (tangential), `n₁ sin θ₁ = n₂ sin θ₂` (see [`crate::image`]). The
//! **correction factor** `k(θ₁) = true / apparent` is therefore
//! `(n₂/n₁) cos θ₂/cos θ₁` (sagittal) or `(n₂/n₁)(cos θ₂/cos θ₁)³`
//! (tangential): `n₂/n₁` at nadir, growing with the view angle.
//!
//! Practitioners often multiply every apparent depth by the single constant
//! `n_water / n_air ≈ 1.34` (R. M. Westaway, S. N. Lane, D. M. Hicks, "Remote
//! sensing of clear-water, shallow, gravel-bed rivers using digital
//! photogrammetry", *Photogrammetric Engineering & Remote Sensing* 67(11),
//! 2001, name it). That is the nadir value of `k`; [`correction_factors`]
//! shows how far off it is at oblique views.

use crate::batch::{check_lengths, BatchReport, StatusSink};
use crate::error::{positive, Error, Result};
use crate::image::{apparent_depth, true_depth, Image};
use crate::survey::parallel::{self, fill};

/// The single constant correction factor of clear water seen from air that
/// practitioners apply at every view angle: 1.34 (Westaway, Lane and Hicks,
/// 2001, see the [module docs](self)), the ratio of the refractive indices of
/// water and air rounded to two decimals.
pub const CLEAR_WATER_NADIR_FACTOR: f64 = 1.34;

/// The correction factor at nadir, `n_object / n_observer` (the paraxial limit
/// of both images).
///
/// # Errors
/// [`Error::InvalidArgument`] unless both indices are finite and > 0.
pub fn nadir_correction_factor(n_observer: f64, n_object: f64) -> Result<f64> {
    let n1 = positive(n_observer, "n_observer must be finite and > 0")?;
    let n2 = positive(n_object, "n_object must be finite and > 0")?;
    Ok(n2 / n1)
}

/// The correction factor `true depth / apparent depth` of one flat interface at
/// `view_angle` radians (observer's medium, from the normal, `[0, π/2)`):
/// `(n₂/n₁) cos θ₂/cos θ₁` (sagittal) or `(n₂/n₁)(cos θ₂/cos θ₁)³`
/// (tangential). It is [`crate::true_depth`] of a unit apparent depth.
///
/// # Errors
/// As [`crate::true_depth`].
///
/// # Example
/// ```
/// use flatray::{survey::correction_factor, Image};
/// let k0 = correction_factor(0.0, 1.000_28, 1.339, Image::Sagittal)?;
/// assert!((k0 - 1.339 / 1.000_28).abs() < 1e-15);
/// let k30 = correction_factor(30f64.to_radians(), 1.000_28, 1.339, Image::Sagittal)?;
/// assert!(k30 > k0); // oblique views look even shallower
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn correction_factor(
    view_angle: f64,
    n_observer: f64,
    n_object: f64,
    image: Image,
) -> Result<f64> {
    true_depth(1.0, view_angle, n_observer, n_object, image)
}

fn check_indices(n_observer: f64, n_object: f64) -> Result<()> {
    nadir_correction_factor(n_observer, n_object).map(|_| ())
}

fn pairwise<S, F>(
    depths: &[f64],
    view_angles: &[f64],
    out: &mut [f64],
    status: &mut S,
    each: F,
) -> Result<BatchReport>
where
    S: StatusSink + ?Sized,
    F: Fn(f64, f64) -> Result<f64> + Sync,
{
    let n = depths.len();
    if view_angles.len() != n {
        return Err(Error::InvalidArgument("one view angle per depth is needed"));
    }
    check_lengths(n, &[out.len()], status)?;
    let out = out.get_mut(..n).unwrap_or(&mut []);
    Ok(parallel::run(
        n,
        (depths, view_angles, out),
        status,
        |offset, (d, a, out), sink| {
            fill(offset, out, f64::NAN, sink, |i| {
                let depth = d.get(i).copied().unwrap_or(f64::NAN);
                let angle = a.get(i).copied().unwrap_or(f64::NAN);
                each(depth, angle)
            })
        },
    ))
}

/// [`crate::true_depth`] of every apparent depth at its view angle
/// (`apparent_depths[i]` metres >= 0, `view_angles[i]` radians in `[0, π/2)`).
///
/// # Errors
/// Whole-call errors only (nothing written): [`Error::InvalidArgument`] when
/// the slices differ in length or an index is not finite and > 0;
/// [`Error::BufferTooSmall`] for short outputs. Element failures (a negative
/// depth, an angle outside its range, a view angle no ray can reach) are in the
/// returned [`BatchReport`] and in `status`.
///
/// # Example
/// ```
/// use flatray::{survey::true_depths, Image, Status};
/// let mut out = [0.0; 3];
/// let mut status = [Status::Ok; 3];
/// let report = true_depths(&[1.0, 2.0, -1.0], &[0.0, 0.3, 0.0], 1.000_28, 1.339,
///                          Image::Sagittal, &mut out, &mut status[..])?;
/// assert_eq!(report.failed, 1);
/// assert_eq!(status[2], Status::InvalidArgument);
/// # Ok::<(), flatray::Error>(())
/// ```
#[allow(clippy::too_many_arguments)]
pub fn true_depths<S: StatusSink + ?Sized>(
    apparent_depths: &[f64],
    view_angles: &[f64],
    n_observer: f64,
    n_object: f64,
    image: Image,
    out: &mut [f64],
    status: &mut S,
) -> Result<BatchReport> {
    check_indices(n_observer, n_object)?;
    pairwise(apparent_depths, view_angles, out, status, |d, a| {
        true_depth(d, a, n_observer, n_object, image)
    })
}

/// [`crate::apparent_depth`] of every true depth at its view angle; as
/// [`true_depths`].
///
/// # Errors
/// As [`true_depths`].
#[allow(clippy::too_many_arguments)]
pub fn apparent_depths<S: StatusSink + ?Sized>(
    true_depths: &[f64],
    view_angles: &[f64],
    n_observer: f64,
    n_object: f64,
    image: Image,
    out: &mut [f64],
    status: &mut S,
) -> Result<BatchReport> {
    check_indices(n_observer, n_object)?;
    pairwise(true_depths, view_angles, out, status, |d, a| {
        apparent_depth(d, a, n_observer, n_object, image)
    })
}

/// A table of [`correction_factor`] at each of `view_angles` (radians).
///
/// # Errors
/// As [`true_depths`].
///
/// # Example
/// ```
/// use flatray::{survey::{correction_factors, CLEAR_WATER_NADIR_FACTOR}, Image, NoStatus};
/// let angles: Vec<f64> = (0..6).map(|d| (d as f64 * 10.0).to_radians()).collect();
/// let mut k = vec![0.0; angles.len()];
/// correction_factors(&angles, 1.000_28, 1.339, Image::Sagittal, &mut k, &mut NoStatus)?;
/// assert!((k[0] - CLEAR_WATER_NADIR_FACTOR).abs() < 0.005);
/// assert!(k.windows(2).all(|w| w[1] > w[0]));
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn correction_factors<S: StatusSink + ?Sized>(
    view_angles: &[f64],
    n_observer: f64,
    n_object: f64,
    image: Image,
    out: &mut [f64],
    status: &mut S,
) -> Result<BatchReport> {
    check_indices(n_observer, n_object)?;
    let n = view_angles.len();
    check_lengths(n, &[out.len()], status)?;
    let out = out.get_mut(..n).unwrap_or(&mut []);
    Ok(parallel::run(
        n,
        (view_angles, out),
        status,
        |offset, (a, out), sink| {
            fill(offset, out, f64::NAN, sink, |i| {
                let angle = a.get(i).copied().unwrap_or(f64::NAN);
                correction_factor(angle, n_observer, n_object, image)
            })
        },
    ))
}
