//! Laser range correction.
//!
//! A ranging sensor (a bathymetric laser, an echo sounder looking through a
//! window) times a pulse and reports the point at distance `c t / (2 n_g0)`
//! along its beam, as if the pulse travelled straight through the observer's
//! medium at that medium's group velocity `c / n_g0`. The true point follows
//! the beam refracted at every interface (Snell's law, with phase indices),
//! with the travel time spent in each medium `k` covering `1 / n_gk` metres per
//! unit of group path: the measured group path `G = n_g0 R` (`R` the reported
//! range) is used up medium by medium, `Σ n_gk s_k = G`, `s_k` the length of the
//! beam in medium `k`. (Group index `n_g = n − λ dn/dλ`, e.g. M. Born,
//! E. Wolf, *Principles of Optics*, 7th ed., §1.3.4; the per-medium time
//! budget is the usual two-media bathymetric-lidar correction, common
//! practice, extended here to every layer.)
//!
//! A beam whose reported range ends before the first interface never entered
//! the water: the point comes back unchanged. One whose range ends inside a
//! layer is placed inside that layer.

use crate::batch::{run_points, BatchReport, StatusSink};
use crate::error::{positive, Error, Result};
use crate::interface::{continue_into, Incidence};
use crate::media::StackBuilder;
use crate::path::MAX_MEDIA;
use crate::stack::Stack;
use crate::vector::Vec3;

/// Group indices of every medium of a stack: observer, layers, object.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GroupIndices {
    values: [f64; MAX_MEDIA],
    count: usize,
}

impl GroupIndices {
    /// From a slice of `layer_count + 2` group indices (observer, layers in
    /// order, object), each finite and > 0.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for another length (checked against a stack
    /// when used) or more than 10 values, or a value not finite and > 0.
    pub fn new(values: &[f64]) -> Result<GroupIndices> {
        if values.len() < 2 || values.len() > MAX_MEDIA {
            return Err(Error::InvalidArgument(
                "group indices: one per medium (observer, layers, object), 2 to 10 values",
            ));
        }
        let mut out = [1.0; MAX_MEDIA];
        for (slot, &v) in out.iter_mut().zip(values) {
            *slot = positive(v, "group indices must be finite and > 0")?;
        }
        Ok(GroupIndices {
            values: out,
            count: values.len(),
        })
    }

    /// The phase indices of `stack`, for a medium without dispersion or when
    /// the group indices are unknown.
    pub fn phase_of(stack: &Stack) -> GroupIndices {
        let mut values = [1.0; MAX_MEDIA];
        let media = core::iter::once(stack.n_observer())
            .chain(stack.layers().iter().map(|l| l.index))
            .chain(core::iter::once(stack.n_object()));
        let mut count = 0;
        for (slot, n) in values.iter_mut().zip(media) {
            *slot = n;
            count += 1;
        }
        GroupIndices { values, count }
    }

    /// The group indices `n − λ dn/dλ` of the media of `builder` at the vacuum
    /// wavelength `wavelength_nm` (the refractive-index models of
    /// [`crate::media`]).
    ///
    /// # Errors
    /// As [`crate::media::Medium::group_index`]; [`Error::InvalidArgument`] for
    /// more than 8 layers.
    pub fn of_media(builder: &StackBuilder, wavelength_nm: f64) -> Result<GroupIndices> {
        let mut values = [1.0; MAX_MEDIA];
        let mut count = 0;
        let mut slots = values.iter_mut();
        let mut push = |v: f64| -> Result<()> {
            let slot = slots
                .next()
                .ok_or(Error::InvalidArgument("a stack holds at most 8 layers"))?;
            *slot = v;
            count += 1;
            Ok(())
        };
        push(builder.observer_medium().group_index(wavelength_nm)?)?;
        for layer in builder.layers() {
            push(layer.medium.group_index(wavelength_nm)?)?;
        }
        push(builder.object_medium().group_index(wavelength_nm)?)?;
        Ok(GroupIndices { values, count })
    }

    /// The values: observer, layers, object.
    pub fn as_slice(&self) -> &[f64] {
        self.values.get(..self.count).unwrap_or(&[])
    }

    /// `Err(InvalidArgument)` unless there is one value per medium of `stack`.
    fn check(&self, stack: &Stack) -> Result<()> {
        if self.count == stack.layers().len() + 2 {
            Ok(())
        } else {
            Err(Error::InvalidArgument(
                "group indices: layer_count + 2 values are needed (observer, layers, object)",
            ))
        }
    }
}

/// The true point of a range measured from `sensor` and reported as
/// `uncorrected` (a straight beam at the observer medium's group velocity),
/// with `group` indices of the media (`None`: the stack's phase indices).
///
/// Method (module docs): the beam direction is `uncorrected − sensor`; it is
/// refracted at every interface and the group path `n_g0 |uncorrected − sensor|`
/// is used up medium by medium. A point whose beam ends before the first
/// interface (or never meets it) is returned unchanged; one whose beam ends
/// inside a layer lies in that layer.
///
/// # Errors
/// * [`Error::InvalidArgument`]: a non-finite point; group indices whose count
///   is not `layer_count + 2`.
/// * [`Error::WrongSide`]: the sensor past the first interface.
/// * [`Error::TotalInternalReflection`]: the beam cannot enter a medium it must
///   reach.
/// * [`Error::OutOfRange`]: the result is not representable.
///
/// # Example
/// ```
/// use flatray::{survey::correct_range, Stack, Vec3};
/// // A green laser 20 m above a lake, straight down; water group index 1.37.
/// let lake = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.000_28, 1.334)?;
/// let group = flatray::survey::GroupIndices::new(&[1.000_29, 1.37])?;
/// let sensor = Vec3::new(0.0, 0.0, 20.0);
/// // Reported 2 m below the surface: the beam spent 2·1.000 29 m of group path in water.
/// let truth = correct_range(&lake, sensor, Vec3::new(0.0, 0.0, -2.0), Some(&group))?;
/// assert!((truth.z + 2.0 * 1.000_29 / 1.37).abs() < 1e-12);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn correct_range(
    stack: &Stack,
    sensor: Vec3,
    uncorrected: Vec3,
    group: Option<&GroupIndices>,
) -> Result<Vec3> {
    let phase;
    let group = match group {
        Some(g) => {
            g.check(stack)?;
            g
        }
        None => {
            phase = GroupIndices::phase_of(stack);
            &phase
        }
    };
    let sensor = sensor.finite("sensor must be finite")?;
    let uncorrected = uncorrected.finite("uncorrected point must be finite")?;
    let normal = stack.normal();
    let h_s = stack.height(sensor);
    if h_s > 0.0 {
        return Err(Error::WrongSide(
            "the sensor must be on the observer's side of the first interface",
        ));
    }
    let beam = uncorrected - sensor;
    let Some(d) = beam.try_normalize() else {
        return Ok(uncorrected); // zero range: nothing travelled
    };
    let range = beam.length();
    let cos0 = d.dot(normal);
    if cos0 <= 0.0 {
        return Ok(uncorrected); // the beam never meets the stack
    }
    let to_surface = -h_s / cos0;
    if range <= to_surface {
        return Ok(uncorrected); // the beam ended before the first interface
    }
    let mut g = group.as_slice().iter().copied();
    let ng0 = g.next().unwrap_or(1.0);
    // Group path left after the observer's medium, metres × index.
    let mut remaining = ng0 * (range - to_surface);
    let n0 = stack.n_observer();
    let tangential = d - normal * cos0; // length sin θ0
    let inc = Incidence::from_parts(cos0, tangential);
    let mut position = sensor + d * to_surface;
    // In a medium of index n = η n0 with q = n cos θ / n0
    // (`interface::continue_into`): unit direction (sin θ0 ê + q n̂) / η, length
    // per metre of thickness η / q, lateral advance per metre sin θ0 / q.
    let medium_ray = |n: f64| -> Result<(f64, f64, Vec3)> {
        let (eta, q) = continue_into(n, n0, inc)?;
        Ok((eta, q, (tangential + normal * q) * (1.0 / eta)))
    };
    for layer in stack.layers() {
        let ng = g.next().unwrap_or(layer.index);
        let (eta, q, dir) = medium_ray(layer.index)?;
        let length = layer.thickness * eta / q;
        if remaining <= ng * length {
            return finish(position + dir * (remaining / ng));
        }
        remaining -= ng * length;
        position += tangential * (layer.thickness / q) + normal * layer.thickness;
    }
    let ng = g.next().unwrap_or(stack.n_object());
    let (_, _, dir) = medium_ray(stack.n_object())?;
    finish(position + dir * (remaining / ng))
}

fn finish(p: Vec3) -> Result<Vec3> {
    if p.is_finite() {
        Ok(p)
    } else {
        Err(Error::OutOfRange(
            "the corrected point is too far to represent",
        ))
    }
}

/// [`correct_range`] of every uncorrected point. `sensors` holds one sensor
/// position shared by all points or one per point; `out` and `status` hold at
/// least `uncorrected.len()` elements. Runs on every core for large batches.
///
/// # Errors
/// Whole-call errors only (nothing written): [`Error::InvalidArgument`] for a
/// sensor count neither 1 nor `uncorrected.len()` or group indices whose count
/// is not `layer_count + 2`; [`Error::BufferTooSmall`] for short outputs.
/// Element failures are in the returned [`BatchReport`] and in `status`.
pub fn correct_ranges<S: StatusSink + ?Sized>(
    stack: &Stack,
    sensors: &[Vec3],
    uncorrected: &[Vec3],
    group: Option<&GroupIndices>,
    out: &mut [Vec3],
    status: &mut S,
) -> Result<BatchReport> {
    if let Some(g) = group {
        g.check(stack)?;
    }
    run_points(sensors, uncorrected, out, Vec3::NAN, status, |s, u| {
        correct_range(stack, s, u, group)
    })
}
