//! Error budget of a corrected point: partial derivatives of
//! [`crate::true_position`] and a first-order propagated covariance.
//!
//! The derivatives are exact (to rounding): the closed-form inverse of
//! [`crate::true_position`] is evaluated once more in forward-mode automatic
//! differentiation (dual numbers carrying the gradient with respect to the
//! eight inputs below), so no step size is involved. The inputs:
//!
//! * the **stack offset** `δ`, metres: the stack moved to `origin + δ n̂`, `n̂`
//!   the unit normal (away from the observer for `δ > 0`), e.g. an error in the
//!   water-surface level;
//! * the object medium's index `n_object`;
//! * the observer position (3 coordinates), metres;
//! * the apparent point (3 coordinates), metres.
//!
//! With independent inputs of standard deviations `σ`, the first-order
//! propagated covariance of the true point `P` is
//! `C = σ_δ² g_δ g_δᵀ + σ_n² g_n g_nᵀ + σ_O² J_O J_Oᵀ + σ_A² J_A J_Aᵀ`
//! (JCGM 100:2008, *Guide to the expression of uncertainty in measurement*,
//! §5.1.2, law of propagation of uncertainty, in matrix form; each position
//! has the same σ on each axis).

use core::ops::{Add, Div, Mul, Neg, Sub};

use crate::batch::{check_lengths, check_observers, observer_of, BatchReport, StatusSink};
use crate::error::{Error, Result};
use crate::image::{true_position, Image};
use crate::math;
use crate::stack::Stack;
use crate::survey::parallel::{self, fill};
use crate::vector::Vec3;

/// A 3×3 covariance matrix, row-major, m².
pub type Covariance = [[f64; 3]; 3];

/// Partial derivatives of a true point (metres) with respect to the inputs of
/// [`crate::true_position`] and the stack (see the [module docs](self)).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Sensitivity {
    /// `∂P/∂δ`: the stack moved by `δ` metres along its unit normal.
    pub d_offset: Vec3,
    /// `∂P/∂n_object`, metres per unit of index.
    pub d_n_object: Vec3,
    /// `∂P_i/∂O_j`, row `i` for the true point's coordinate, column `j` for the
    /// observer's.
    pub d_observer: [[f64; 3]; 3],
    /// `∂P_i/∂A_j` for the apparent point `A`.
    pub d_apparent: [[f64; 3]; 3],
}

/// Standard deviations of the independent inputs of a correction.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Uncertainty {
    /// Stack offset along its normal (e.g. the water level), metres.
    pub offset_m: f64,
    /// The object medium's refractive index.
    pub n_object: f64,
    /// Observer position, metres, on each axis.
    pub observer_m: f64,
    /// Apparent point, metres, on each axis.
    pub apparent_m: f64,
}

impl Uncertainty {
    fn checked(&self) -> Result<Uncertainty> {
        for s in [
            self.offset_m,
            self.n_object,
            self.observer_m,
            self.apparent_m,
        ] {
            if !(s.is_finite() && s >= 0.0) {
                return Err(Error::InvalidArgument(
                    "standard deviations must be finite and >= 0",
                ));
            }
        }
        Ok(*self)
    }
}

/// Standard uncertainty of one component of a corrected point, by source.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Budget {
    /// From the stack offset, metres.
    pub offset_m: f64,
    /// From the object medium's index, metres.
    pub n_object_m: f64,
    /// From the observer position, metres.
    pub observer_m: f64,
    /// From the apparent point, metres.
    pub apparent_m: f64,
    /// All together (root sum of squares), metres.
    pub total_m: f64,
}

impl Sensitivity {
    /// The first-order propagated covariance of the true point (row-major,
    /// m²) for independent inputs with standard deviations `u`.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for a standard deviation not finite and >= 0;
    /// [`Error::OutOfRange`] when an entry overflows.
    pub fn covariance(&self, u: &Uncertainty) -> Result<Covariance> {
        let u = u.checked()?;
        let mut c = [[0.0; 3]; 3];
        let g_d = comps(self.d_offset);
        let g_n = comps(self.d_n_object);
        for (i, row) in c.iter_mut().enumerate() {
            for (j, cell) in row.iter_mut().enumerate() {
                let (o_i, o_j) = (at(&self.d_observer, i), at(&self.d_observer, j));
                let (a_i, a_j) = (at(&self.d_apparent, i), at(&self.d_apparent, j));
                *cell = u.offset_m * u.offset_m * get(&g_d, i) * get(&g_d, j)
                    + u.n_object * u.n_object * get(&g_n, i) * get(&g_n, j)
                    + u.observer_m * u.observer_m * dot3(o_i, o_j)
                    + u.apparent_m * u.apparent_m * dot3(a_i, a_j);
            }
        }
        // Finite standard deviations can still square past f64 (a fuzz finding).
        if c.iter().flatten().all(|v| v.is_finite()) {
            Ok(c)
        } else {
            Err(Error::OutOfRange(
                "the propagated covariance is too large to represent",
            ))
        }
    }

    /// The standard uncertainty of the true point's component along `along`
    /// (any non-zero length, e.g. the stack normal for depth), by source.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for a bad `u` or a zero or non-finite `along`;
    /// [`Error::OutOfRange`] when the total overflows.
    pub fn budget(&self, u: &Uncertainty, along: Vec3) -> Result<Budget> {
        let u = u.checked()?;
        let e = along.direction("the budget direction must be finite and non-zero")?;
        let ea = comps(e);
        let project = |m: &[[f64; 3]; 3]| -> f64 {
            // |eᵀ M|: the gradient of e·P with respect to three coordinates.
            let mut s = 0.0;
            for j in 0..3 {
                let col: f64 = (0..3).map(|i| get(&ea, i) * get(&at(m, i), j)).sum();
                s += col * col;
            }
            math::sqrt(s)
        };
        let offset_m = u.offset_m * e.dot(self.d_offset).abs();
        let n_object_m = u.n_object * e.dot(self.d_n_object).abs();
        let observer_m = u.observer_m * project(&self.d_observer);
        let apparent_m = u.apparent_m * project(&self.d_apparent);
        let total_m = math::sqrt(
            offset_m * offset_m
                + n_object_m * n_object_m
                + observer_m * observer_m
                + apparent_m * apparent_m,
        );
        if !total_m.is_finite() {
            return Err(Error::OutOfRange(
                "the uncertainty budget is too large to represent",
            ));
        }
        Ok(Budget {
            offset_m,
            n_object_m,
            observer_m,
            apparent_m,
            total_m,
        })
    }
}

fn comps(v: Vec3) -> [f64; 3] {
    [v.x, v.y, v.z]
}
fn get(a: &[f64; 3], i: usize) -> f64 {
    a.get(i).copied().unwrap_or(0.0)
}
fn at(m: &[[f64; 3]; 3], i: usize) -> [f64; 3] {
    m.get(i).copied().unwrap_or([0.0; 3])
}
fn dot3(a: [f64; 3], b: [f64; 3]) -> f64 {
    a.iter().zip(b.iter()).map(|(x, y)| x * y).sum()
}

/// Number of inputs differentiated: offset, n_object, observer (3), apparent (3).
const INPUTS: usize = 8;

/// A dual number: a value and its gradient with respect to the inputs.
#[derive(Debug, Clone, Copy)]
struct D {
    v: f64,
    g: [f64; INPUTS],
}

impl D {
    fn c(v: f64) -> D {
        D {
            v,
            g: [0.0; INPUTS],
        }
    }
    fn var(v: f64, k: usize) -> D {
        let mut d = D::c(v);
        if let Some(slot) = d.g.get_mut(k) {
            *slot = 1.0;
        }
        d
    }
    fn map(self, v: f64, dv: f64) -> D {
        // Chain rule: f(x) with f'(x) = dv.
        let mut g = self.g;
        for x in g.iter_mut() {
            *x *= dv;
        }
        D { v, g }
    }
    fn sqrt(self) -> D {
        let r = math::sqrt(self.v);
        self.map(r, 0.5 / r)
    }
    fn scale(self, s: f64) -> D {
        self.map(self.v * s, s)
    }
}

impl Add for D {
    type Output = D;
    fn add(self, o: D) -> D {
        let mut g = self.g;
        for (x, y) in g.iter_mut().zip(o.g) {
            *x += y;
        }
        D { v: self.v + o.v, g }
    }
}
impl Sub for D {
    type Output = D;
    fn sub(self, o: D) -> D {
        self + (-o)
    }
}
impl Neg for D {
    type Output = D;
    fn neg(self) -> D {
        self.scale(-1.0)
    }
}
impl Mul for D {
    type Output = D;
    fn mul(self, o: D) -> D {
        let mut g = self.g;
        for (x, y) in g.iter_mut().zip(o.g) {
            *x = *x * o.v + self.v * y;
        }
        D { v: self.v * o.v, g }
    }
}
impl Div for D {
    type Output = D;
    fn div(self, o: D) -> D {
        let inv = o.map(1.0 / o.v, -1.0 / (o.v * o.v));
        self * inv
    }
}

/// A vector of dual numbers.
#[derive(Debug, Clone, Copy)]
struct DV {
    x: D,
    y: D,
    z: D,
}

impl DV {
    fn c(v: Vec3) -> DV {
        DV {
            x: D::c(v.x),
            y: D::c(v.y),
            z: D::c(v.z),
        }
    }
    fn var(v: Vec3, first: usize) -> DV {
        DV {
            x: D::var(v.x, first),
            y: D::var(v.y, first + 1),
            z: D::var(v.z, first + 2),
        }
    }
    fn dot(self, o: DV) -> D {
        self.x * o.x + self.y * o.y + self.z * o.z
    }
    fn add(self, o: DV) -> DV {
        DV {
            x: self.x + o.x,
            y: self.y + o.y,
            z: self.z + o.z,
        }
    }
    fn sub(self, o: DV) -> DV {
        DV {
            x: self.x - o.x,
            y: self.y - o.y,
            z: self.z - o.z,
        }
    }
    fn mul(self, s: D) -> DV {
        DV {
            x: self.x * s,
            y: self.y * s,
            z: self.z * s,
        }
    }
}

/// The sensitivity of [`crate::true_position`] to the stack offset, the
/// object medium's index, the observer and the apparent point (module docs).
///
/// Formulas differentiated (see [`crate::image`]): with `v = A − O`,
/// `cos θ₀ = v·n̂/|v|`, `q_k = n_k cos θ_k = √(n_k² − n₀² + n₀² cos² θ₀)`, the
/// depth factor of each medium `f_k` (sagittal `n₀ cos θ₀ / q_k`, tangential
/// `(n₀ cos θ₀/q_k)³ (n_k/n₀)²`), the apparent depth `z_a` and observer
/// height `h_O` relative to the stack, the object's depth below the last
/// interface is `z_x = (z_a − Σ t_k f_k) / f_x`; the sagittal true point is
/// `A + n̂ (T + z_x − z_a)`, the tangential one
/// `O + n̂ (T − h_O + z_x) + v_⊥ (−h_O/(v·n̂) + (n₀/|v|)(Σ t_k/q_k + z_x/q_x))`,
/// `v_⊥` the part of `v` across the normal.
///
/// # Errors
/// As [`crate::true_position`].
///
/// # Example
/// ```
/// use flatray::{survey::true_position_sensitivity, Image, Stack, Vec3};
/// let lake = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.0, 1.34)?;
/// let s = true_position_sensitivity(&lake, Vec3::new(0.0, 0.0, 10.0),
///                                   Vec3::new(0.0, 0.0, -1.0), Image::Sagittal)?;
/// // At nadir the true depth is 1.34 × the apparent depth below the surface. With the
/// // surface δ lower (z = −δ) the true point is at z = −δ − 1.34 (1 − δ): it rises by 0.34 δ.
/// assert!((s.d_offset.z - (1.34 - 1.0)).abs() < 1e-12);
/// assert!((s.d_apparent[2][2] - 1.34).abs() < 1e-12);
/// # Ok::<(), flatray::Error>(())
/// ```
pub fn true_position_sensitivity(
    stack: &Stack,
    observer: Vec3,
    apparent: Vec3,
    image: Image,
) -> Result<Sensitivity> {
    // Every validation and error of the plain computation.
    true_position(stack, observer, apparent, image)?;
    let normal = DV::c(stack.normal());
    let origin = DV::c(stack.origin());
    let offset = D::var(0.0, 0);
    let n_x = D::var(stack.n_object(), 1);
    let o = DV::var(observer, 2);
    let a = DV::var(apparent, 5);
    let n0 = stack.n_observer();
    let n0d = D::c(n0);

    let h_o = o.sub(origin).dot(normal) - offset;
    let z_a = a.sub(origin).dot(normal) - offset;
    let v = a.sub(o);
    let vn = v.dot(normal);
    let vlen = v.dot(v).sqrt();
    let ncos0 = (vn / vlen).scale(n0);
    let factor = |n_k: D, q_k: D| -> D {
        let r = ncos0 / q_k;
        match image {
            Image::Sagittal => r,
            Image::Tangential => {
                let m = n_k / n0d;
                r * r * r * m * m
            }
        }
    };
    let q_of = |n_k: D| ((n_k - n0d) * (n_k + n0d) + ncos0 * ncos0).sqrt();
    let mut sum_f = D::c(0.0);
    let mut sum_tq = D::c(0.0);
    for layer in stack.layers() {
        let n_k = D::c(layer.index);
        let q_k = q_of(n_k);
        let t = D::c(layer.thickness);
        sum_f = sum_f + t * factor(n_k, q_k);
        sum_tq = sum_tq + t / q_k;
    }
    let q_x = q_of(n_x);
    let depth_x = (z_a - sum_f) / factor(n_x, q_x);
    let t_total = D::c(stack.total_thickness());
    let truth = match image {
        Image::Sagittal => a.add(normal.mul(t_total + depth_x - z_a)),
        Image::Tangential => {
            let across = v.sub(normal.mul(vn));
            let g = (-h_o) / vn + (sum_tq + depth_x / q_x) * (n0d / vlen);
            o.add(normal.mul(t_total - h_o + depth_x))
                .add(across.mul(g))
        }
    };
    let rows = [truth.x, truth.y, truth.z];
    let pick = |k: usize| -> Vec3 {
        let g = |d: &D| d.g.get(k).copied().unwrap_or(f64::NAN);
        Vec3::new(g(&truth.x), g(&truth.y), g(&truth.z))
    };
    let block = |first: usize| -> [[f64; 3]; 3] {
        let mut m = [[0.0; 3]; 3];
        for (row, d) in m.iter_mut().zip(rows.iter()) {
            for (j, cell) in row.iter_mut().enumerate() {
                *cell = d.g.get(first + j).copied().unwrap_or(f64::NAN);
            }
        }
        m
    };
    let s = Sensitivity {
        d_offset: pick(0),
        d_n_object: pick(1),
        d_observer: block(2),
        d_apparent: block(5),
    };
    let finite = s.d_offset.is_finite()
        && s.d_n_object.is_finite()
        && s.d_observer
            .iter()
            .chain(s.d_apparent.iter())
            .flatten()
            .all(|x| x.is_finite());
    if finite {
        Ok(s)
    } else {
        Err(Error::OutOfRange(
            "the sensitivity is too large to represent",
        ))
    }
}

/// The first-order propagated covariance (row-major, m²) of
/// [`crate::true_position`] for independent inputs with standard deviations
/// `u` ([`Sensitivity::covariance`]).
///
/// # Errors
/// As [`true_position_sensitivity`]; [`Error::InvalidArgument`] for a standard
/// deviation not finite and >= 0; [`Error::OutOfRange`] when an entry overflows.
pub fn true_position_covariance(
    stack: &Stack,
    observer: Vec3,
    apparent: Vec3,
    image: Image,
    u: &Uncertainty,
) -> Result<Covariance> {
    let u = u.checked()?;
    true_position_sensitivity(stack, observer, apparent, image)?.covariance(&u)
}

/// [`true_position_covariance`] of every apparent point (`observers`: one
/// shared or one per point); a failed point gets NaN entries. Runs on every
/// core for large batches.
///
/// # Errors
/// Whole-call errors only (nothing written): [`Error::InvalidArgument`] for an
/// observer count neither 1 nor `apparent.len()` or a bad `u`;
/// [`Error::BufferTooSmall`] for short outputs.
pub fn true_position_covariances<S: StatusSink + ?Sized>(
    stack: &Stack,
    observers: &[Vec3],
    apparent: &[Vec3],
    image: Image,
    u: &Uncertainty,
    out: &mut [Covariance],
    status: &mut S,
) -> Result<BatchReport> {
    let u = u.checked()?;
    check_observers(observers, apparent.len())?;
    let n = apparent.len();
    check_lengths(n, &[out.len()], status)?;
    let out = out.get_mut(..n).unwrap_or(&mut []);
    Ok(parallel::run(
        n,
        (apparent, out),
        status,
        |offset, (a, out), sink| {
            fill(offset, out, [[f64::NAN; 3]; 3], sink, |i| {
                let ap = a.get(i).copied().unwrap_or(Vec3::NAN);
                true_position_covariance(stack, observer_of(observers, offset + i), ap, image, &u)
            })
        },
    ))
}
