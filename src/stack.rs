//! A stack of parallel flat refracting interfaces, validated once.
//!
//! Geometry (DESIGN.md): `origin` is a point on the first interface, the one
//! nearest the observer; the unit `normal` points from the observer's side into
//! the stack. A point `p` has the *height* `h(p) = (p − origin)·n̂` (metres):
//! the observer's medium (index `n_observer`) is `h <= 0`, layer `i` spans
//! `[T_i, T_i + thickness_i]`, and the object's medium (index `n_object`) is
//! `h >= T`, `T` the total thickness.

use crate::error::{positive, Error, Result};
use crate::vector::Vec3;

/// Most layers a stack can hold (`FLATRAY_MAX_LAYERS` in C).
pub const MAX_LAYERS: usize = 8;

/// One flat layer between two interfaces.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Layer {
    /// Thickness along the normal, metres, > 0.
    pub thickness: f64,
    /// Refractive index (absolute, phase), > 0.
    pub index: f64,
}

impl Layer {
    /// A layer of `thickness` metres and refractive index `index`.
    pub const fn new(thickness: f64, index: f64) -> Layer {
        Layer { thickness, index }
    }
}

/// Where a point lies relative to a stack.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Region {
    /// In the observer's medium, `h <= 0` (the first interface included).
    Observer,
    /// Strictly inside layer `i` (counting from 0 at the observer's side).
    Layer(usize),
    /// In the object's medium, `h >= T` (the last interface included).
    Object,
}

/// Parallel flat layers between an observer's medium and an object's medium.
///
/// Built only through [`Stack::new`], which validates every value, so every
/// `Stack` in existence is usable: finite, positive indices and thicknesses, a
/// unit normal and at most [`MAX_LAYERS`] layers.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Stack {
    origin: Vec3,
    normal: Vec3,
    n_observer: f64,
    layers: [Layer; MAX_LAYERS],
    layer_count: usize,
    n_object: f64,
    total_thickness: f64,
}

impl Stack {
    /// A validated stack.
    ///
    /// * `origin`: a point on the first interface, metres.
    /// * `normal`: from the observer's side into the stack, any non-zero length.
    /// * `n_observer`, `n_object`: refractive indices of the two outer media.
    /// * `layers`: 0 to [`MAX_LAYERS`] layers in order from the observer.
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for a non-finite origin, a zero, subnormal or
    /// non-finite normal, an index or thickness that is not finite and > 0, more
    /// than [`MAX_LAYERS`] layers, or a total thickness that overflows.
    ///
    /// # Example
    /// ```
    /// use flatray::{Layer, Stack, Vec3};
    /// // A camera housing: air inside, a 10 mm glass port, water outside.
    /// let port = Stack::new(
    ///     Vec3::new(0.0, 0.0, 0.05),
    ///     Vec3::new(0.0, 0.0, 1.0),
    ///     1.000_29,
    ///     &[Layer::new(0.010, 1.52)],
    ///     1.34,
    /// )?;
    /// assert_eq!(port.layers().len(), 1);
    /// assert!((port.total_thickness() - 0.010).abs() < 1e-15);
    /// # Ok::<(), flatray::Error>(())
    /// ```
    pub fn new(
        origin: Vec3,
        normal: Vec3,
        n_observer: f64,
        layers: &[Layer],
        n_object: f64,
    ) -> Result<Stack> {
        let origin = origin.finite("stack origin must be finite")?;
        let normal = normal.direction("stack normal must be finite and non-zero")?;
        let n_observer = positive(n_observer, "n_observer must be finite and > 0")?;
        let n_object = positive(n_object, "n_object must be finite and > 0")?;
        if layers.len() > MAX_LAYERS {
            return Err(Error::InvalidArgument("a stack holds at most 8 layers"));
        }
        let mut stored = [Layer::new(0.0, 1.0); MAX_LAYERS];
        let mut total_thickness = 0.0;
        for (slot, layer) in stored.iter_mut().zip(layers) {
            let thickness = positive(layer.thickness, "layer thickness must be finite and > 0")?;
            let index = positive(layer.index, "layer index must be finite and > 0")?;
            *slot = Layer::new(thickness, index);
            total_thickness += thickness;
        }
        if !total_thickness.is_finite() {
            return Err(Error::InvalidArgument("total stack thickness overflows"));
        }
        Ok(Stack {
            origin,
            normal,
            n_observer,
            layers: stored,
            layer_count: layers.len(),
            n_object,
            total_thickness,
        })
    }

    /// A single interface between two media (no layers), e.g. a water surface.
    ///
    /// # Errors
    /// As [`Stack::new`].
    pub fn single_interface(
        origin: Vec3,
        normal: Vec3,
        n_observer: f64,
        n_object: f64,
    ) -> Result<Stack> {
        Stack::new(origin, normal, n_observer, &[], n_object)
    }

    /// A point on the first interface, metres.
    #[inline]
    pub fn origin(&self) -> Vec3 {
        self.origin
    }

    /// Unit normal, from the observer's side into the stack.
    #[inline]
    pub fn normal(&self) -> Vec3 {
        self.normal
    }

    /// Refractive index of the observer's medium.
    #[inline]
    pub fn n_observer(&self) -> f64 {
        self.n_observer
    }

    /// Refractive index of the object's medium.
    #[inline]
    pub fn n_object(&self) -> f64 {
        self.n_object
    }

    /// The layers, from the observer's side.
    #[inline]
    pub fn layers(&self) -> &[Layer] {
        self.layers.get(..self.layer_count).unwrap_or(&[])
    }

    /// Total thickness `T` of the layers, metres (0 for a single interface).
    #[inline]
    pub fn total_thickness(&self) -> f64 {
        self.total_thickness
    }

    /// Signed distance of `p` past the first interface, along the normal:
    /// `h(p) = (p − origin)·n̂`, metres; negative on the observer's side.
    #[inline]
    pub fn height(&self, p: Vec3) -> f64 {
        (p - self.origin).dot(self.normal)
    }

    /// The region of a point of height `h` ([`Stack::height`]).
    pub fn region_of_height(&self, h: f64) -> Region {
        if h <= 0.0 {
            return Region::Observer;
        }
        if h >= self.total_thickness {
            return Region::Object;
        }
        let mut top = 0.0;
        for (i, layer) in self.layers().iter().enumerate() {
            top += layer.thickness;
            if h < top {
                return Region::Layer(i);
            }
        }
        Region::Object
    }

    /// The region of the point `p`.
    #[inline]
    pub fn region(&self, p: Vec3) -> Region {
        self.region_of_height(self.height(p))
    }

    /// The same stack with every index replaced by `n_observer`, the layers'
    /// indices and `n_object`, keeping geometry.
    ///
    /// # Errors
    /// As [`Stack::new`], and [`Error::InvalidArgument`] when `layer_indices`
    /// has a different length than the stack's layers.
    pub fn with_indices(
        &self,
        n_observer: f64,
        layer_indices: &[f64],
        n_object: f64,
    ) -> Result<Stack> {
        if layer_indices.len() != self.layer_count {
            return Err(Error::InvalidArgument("one index per layer is needed"));
        }
        let mut layers = self.layers;
        for (layer, &n) in layers.iter_mut().zip(layer_indices) {
            layer.index = n;
        }
        let layers = layers.get(..self.layer_count).unwrap_or(&[]);
        Stack::new(self.origin, self.normal, n_observer, layers, n_object)
    }

    /// The same stack moved by `offset` metres along its normal (away from the
    /// observer for `offset > 0`).
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for a non-finite offset or result.
    pub fn shifted(&self, offset: f64) -> Result<Stack> {
        let origin =
            (self.origin + self.normal * offset).finite("shifted origin must be finite")?;
        Ok(Stack { origin, ..*self })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn z_stack(layers: &[Layer]) -> Result<Stack> {
        Stack::new(Vec3::ZERO, Vec3::new(0.0, 0.0, 2.0), 1.0, layers, 1.33)
    }

    #[test]
    fn validation_rejects_each_bad_value() {
        let ok = Layer::new(0.01, 1.5);
        assert!(z_stack(&[ok]).is_ok());
        assert!(z_stack(&[ok; 8]).is_ok());
        assert!(matches!(z_stack(&[ok; 9]), Err(Error::InvalidArgument(_))));
        for bad in [
            Layer::new(0.0, 1.5),
            Layer::new(-0.01, 1.5),
            Layer::new(f64::NAN, 1.5),
            Layer::new(0.01, 0.0),
            Layer::new(0.01, f64::INFINITY),
        ] {
            assert!(matches!(
                z_stack(&[ok, bad]),
                Err(Error::InvalidArgument(_))
            ));
        }
        let zero_normal = Stack::new(Vec3::ZERO, Vec3::ZERO, 1.0, &[], 1.33);
        assert!(matches!(zero_normal, Err(Error::InvalidArgument(_))));
        let nan_origin = Stack::new(
            Vec3::new(f64::NAN, 0.0, 0.0),
            Vec3::new(0.0, 0.0, 1.0),
            1.0,
            &[],
            1.33,
        );
        assert!(matches!(nan_origin, Err(Error::InvalidArgument(_))));
        let huge = z_stack(&[Layer::new(f64::MAX, 1.5), Layer::new(f64::MAX, 1.5)]);
        assert!(matches!(huge, Err(Error::InvalidArgument(_))));
    }

    #[test]
    fn regions_follow_heights() {
        let s = z_stack(&[Layer::new(0.01, 1.5), Layer::new(0.02, 1.4)]).unwrap();
        assert_eq!(s.normal(), Vec3::new(0.0, 0.0, 1.0));
        assert_eq!(s.region(Vec3::new(5.0, 0.0, -1.0)), Region::Observer);
        assert_eq!(s.region(Vec3::ZERO), Region::Observer);
        assert_eq!(s.region(Vec3::new(0.0, 0.0, 0.005)), Region::Layer(0));
        assert_eq!(s.region(Vec3::new(0.0, 0.0, 0.015)), Region::Layer(1));
        assert_eq!(s.region(Vec3::new(0.0, 0.0, 0.03)), Region::Object);
        assert_eq!(s.region(Vec3::new(0.0, 0.0, 7.0)), Region::Object);
    }
}
