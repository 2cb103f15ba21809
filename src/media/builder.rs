//! Media with their conditions, and a builder from media to a [`Stack`].
//!
//! ```
//! use flatray::media::{Material, Medium, StackBuilder};
//! // A camera in air at 1 atm behind an 8 mm sapphire port, looking into
//! // seawater at 4 °C and 35 PSU, at 532 nm.
//! let stack = StackBuilder::new(
//!     Medium::air(20.0, 101_325.0, 0.5),
//!     Medium::seawater(4.0, 35.0),
//! )
//! .layer(0.008, Medium::Material(Material::SapphireOrdinary))
//! .build(532.0)?;
//! assert_eq!(stack.layers().len(), 1);
//! // Sapphire is the densest of the three, air the least dense.
//! assert!(stack.layers()[0].index > stack.n_object());
//! assert!(stack.n_object() > stack.n_observer());
//! # Ok::<(), flatray::Error>(())
//! ```
//!
//! Everything here is `Copy` and allocation-free.

use crate::error::{Error, Result};
use crate::media::air::Air;
use crate::media::dispersion::{Cauchy, Sellmeier};
use crate::media::materials::Material;
use crate::media::seawater::Seawater;
use crate::media::water::PureWater;
use crate::media::IndexSample;
use crate::stack::{Layer, Stack, MAX_LAYERS};
use crate::vector::Vec3;

/// A medium together with the conditions its index depends on.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Medium {
    /// Air, Ciddor (1996): see [`Air`].
    Air(Air),
    /// Pure water, IAPWS R9-97 with IF97 density: see [`PureWater`].
    PureWater(PureWater),
    /// Seawater, Quan and Fry (1995) plus the IAPWS pressure term: see
    /// [`Seawater`].
    Seawater(Seawater),
    /// A built-in window material: see [`Material`].
    Material(Material),
    /// A user Sellmeier formula: see [`Sellmeier`].
    Sellmeier(Sellmeier),
    /// A user Cauchy formula: see [`Cauchy`].
    Cauchy(Cauchy),
    /// A fixed, non-dispersive index (finite, > 0); its group index equals it.
    Index(f64),
}

impl Medium {
    /// Vacuum (index 1 at every wavelength).
    pub const VACUUM: Medium = Medium::Index(1.0);

    /// Air at `temperature_c` (°C), absolute `pressure_pa` (Pa) and
    /// `relative_humidity` (0…1), 450 ppm CO₂.
    pub const fn air(temperature_c: f64, pressure_pa: f64, relative_humidity: f64) -> Medium {
        Medium::Air(Air::new(temperature_c, pressure_pa, relative_humidity))
    }

    /// Pure water at `temperature_c` (°C) and absolute `pressure_pa` (Pa).
    pub const fn pure_water(temperature_c: f64, pressure_pa: f64) -> Medium {
        Medium::PureWater(PureWater::new(temperature_c, pressure_pa))
    }

    /// Seawater at `temperature_c` (°C) and `salinity_psu` at the surface
    /// (101 325 Pa); for depth use `Medium::Seawater(Seawater::new(..).with_pressure(..))`.
    pub const fn seawater(temperature_c: f64, salinity_psu: f64) -> Medium {
        Medium::Seawater(Seawater::new(temperature_c, salinity_psu))
    }

    /// Absolute index and slope at a vacuum wavelength.
    ///
    /// # Errors
    /// As the underlying model; for [`Medium::Index`],
    /// [`Error::InvalidArgument`] unless the index is finite and > 0 and the
    /// wavelength finite, [`Error::OutOfRange`] for a wavelength ≤ 0.
    pub fn sample(&self, wavelength_nm: f64) -> Result<IndexSample> {
        match self {
            Medium::Air(m) => m.sample(wavelength_nm),
            Medium::PureWater(m) => m.sample(wavelength_nm),
            Medium::Seawater(m) => m.sample(wavelength_nm),
            Medium::Material(m) => m.sample(wavelength_nm),
            Medium::Sellmeier(m) => m.sample(wavelength_nm),
            Medium::Cauchy(m) => m.sample(wavelength_nm),
            Medium::Index(n) => {
                if !wavelength_nm.is_finite() {
                    return Err(Error::InvalidArgument("wavelength_nm must be finite"));
                }
                if wavelength_nm <= 0.0 {
                    return Err(Error::OutOfRange("wavelength_nm must be > 0"));
                }
                if !(n.is_finite() && *n > 0.0) {
                    return Err(Error::InvalidArgument(
                        "a fixed index must be finite and > 0",
                    ));
                }
                Ok(IndexSample {
                    wavelength_nm,
                    index: *n,
                    dn_dwavelength_per_nm: 0.0,
                })
            }
        }
    }

    /// Absolute (phase) refractive index at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Medium::sample`].
    pub fn index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.index)
    }

    /// Group index `n − λ dn/dλ` at a vacuum wavelength.
    ///
    /// # Errors
    /// As [`Medium::sample`].
    pub fn group_index(&self, wavelength_nm: f64) -> Result<f64> {
        self.sample(wavelength_nm).map(|s| s.group_index())
    }
}

/// One layer of a [`StackBuilder`]: a thickness and a medium.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MediumLayer {
    /// Thickness along the normal, metres, > 0.
    pub thickness_m: f64,
    /// The layer's medium.
    pub medium: Medium,
}

/// Builds a [`Stack`] from media and conditions at one wavelength.
///
/// Geometry defaults to the first interface through the origin with the normal
/// `+z` (from the observer into the stack); change it with
/// [`StackBuilder::origin`] and [`StackBuilder::normal`]. Layers are added from
/// the observer's side. The builder is `Copy`, holds at most
/// [`MAX_LAYERS`] layers in a fixed array, and one builder can build stacks at
/// many wavelengths.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StackBuilder {
    origin: Vec3,
    normal: Vec3,
    observer: Medium,
    layers: [MediumLayer; MAX_LAYERS],
    layer_count: usize,
    too_many_layers: bool,
    object: Medium,
}

impl StackBuilder {
    /// A builder with the observer in `observer` and the object in `object`, no
    /// layers yet.
    pub const fn new(observer: Medium, object: Medium) -> StackBuilder {
        StackBuilder {
            origin: Vec3::ZERO,
            normal: Vec3::new(0.0, 0.0, 1.0),
            observer,
            layers: [MediumLayer {
                thickness_m: 0.0,
                medium: Medium::VACUUM,
            }; MAX_LAYERS],
            layer_count: 0,
            too_many_layers: false,
            object,
        }
    }

    /// A point on the first interface, metres.
    pub const fn origin(self, origin: Vec3) -> StackBuilder {
        StackBuilder { origin, ..self }
    }

    /// The interface normal, from the observer's side into the stack (any
    /// non-zero length).
    pub const fn normal(self, normal: Vec3) -> StackBuilder {
        StackBuilder { normal, ..self }
    }

    /// Adds a layer of `thickness_m` metres of `medium` after the ones already
    /// added. A ninth layer makes [`StackBuilder::build`] fail.
    pub fn layer(mut self, thickness_m: f64, medium: Medium) -> StackBuilder {
        match self.layers.get_mut(self.layer_count) {
            Some(slot) => {
                *slot = MediumLayer {
                    thickness_m,
                    medium,
                };
                self.layer_count += 1;
            }
            None => self.too_many_layers = true,
        }
        self
    }

    /// The observer's medium.
    pub fn observer_medium(&self) -> Medium {
        self.observer
    }

    /// The object's medium.
    pub fn object_medium(&self) -> Medium {
        self.object
    }

    /// The layers added so far, from the observer's side.
    pub fn layers(&self) -> &[MediumLayer] {
        self.layers.get(..self.layer_count).unwrap_or(&[])
    }

    /// The stack at a vacuum wavelength: every medium's absolute phase index
    /// evaluated at `wavelength_nm`, then [`Stack::new`].
    ///
    /// # Errors
    /// [`Error::InvalidArgument`] for more than [`MAX_LAYERS`] layers or as
    /// [`Stack::new`]; otherwise the first error of a medium's model (observer,
    /// then layers in order, then object).
    pub fn build(&self, wavelength_nm: f64) -> Result<Stack> {
        if self.too_many_layers {
            return Err(Error::InvalidArgument("a stack holds at most 8 layers"));
        }
        let n_observer = self.observer.index(wavelength_nm)?;
        let mut layers = [Layer::new(0.0, 1.0); MAX_LAYERS];
        for (out, layer) in layers.iter_mut().zip(self.layers()) {
            *out = Layer::new(layer.thickness_m, layer.medium.index(wavelength_nm)?);
        }
        let n_object = self.object.index(wavelength_nm)?;
        let used = layers.get(..self.layer_count).unwrap_or(&[]);
        Stack::new(self.origin, self.normal, n_observer, used, n_object)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::media::dispersion::Footing;

    #[test]
    fn builds_the_camera_port_example() {
        let b = StackBuilder::new(
            Medium::air(20.0, 101_325.0, 0.5),
            Medium::seawater(4.0, 35.0),
        )
        .layer(0.008, Medium::Material(Material::SapphireOrdinary));
        let s = b.build(532.0).unwrap();
        assert_eq!(s.layers().len(), 1);
        assert_eq!(
            s.n_object(),
            Seawater::new(4.0, 35.0).refractive_index(532.0).unwrap()
        );
        assert_eq!(
            s.layers()[0].index,
            Material::SapphireOrdinary.refractive_index(532.0).unwrap()
        );
        assert_eq!(
            s.n_observer(),
            Air::new(20.0, 101_325.0, 0.5)
                .refractive_index(532.0)
                .unwrap()
        );
        assert_eq!(s.layers()[0].thickness, 0.008);
        // Same builder, another wavelength: dispersion shows.
        let red = b.build(650.0).unwrap();
        assert!(red.n_object() < s.n_object() && red.layers()[0].index < s.layers()[0].index);
    }

    #[test]
    fn geometry_and_all_medium_kinds() {
        let media = [
            Medium::air(10.0, 95_000.0, 0.2),
            Medium::pure_water(15.0, 2e6),
            Medium::seawater(10.0, 30.0),
            Medium::Material(Material::Pmma),
            Medium::Sellmeier(Sellmeier::new(
                [1.0, 0.0, 0.0],
                [0.01, 0.0, 0.0],
                Footing::Vacuum,
            )),
            Medium::Cauchy(Cauchy::new(1.5, 0.004, 0.0, Footing::StandardAir)),
            Medium::Index(1.6),
            Medium::VACUUM,
        ];
        let mut b = StackBuilder::new(Medium::VACUUM, Medium::Index(1.33))
            .origin(Vec3::new(1.0, 2.0, 3.0))
            .normal(Vec3::new(0.0, 0.0, -2.0));
        for m in media {
            b = b.layer(0.001, m);
        }
        let s = b.build(550.0).unwrap();
        assert_eq!(s.layers().len(), 8);
        assert_eq!(s.normal(), Vec3::new(0.0, 0.0, -1.0));
        assert_eq!(s.origin(), Vec3::new(1.0, 2.0, 3.0));
        for (layer, m) in s.layers().iter().zip(media) {
            assert_eq!(layer.index, m.index(550.0).unwrap());
        }
        assert_eq!(Medium::Index(1.6).group_index(550.0).unwrap(), 1.6);
        // A ninth layer.
        let nine = b.layer(0.001, Medium::VACUUM);
        assert!(matches!(nine.build(550.0), Err(Error::InvalidArgument(_))));
        assert_eq!(nine.layers().len(), 8);
    }

    #[test]
    fn errors_propagate() {
        let b = StackBuilder::new(Medium::VACUUM, Medium::seawater(4.0, 35.0));
        // Quan-Fry stops at 700 nm.
        assert!(matches!(b.build(800.0), Err(Error::OutOfRange(_))));
        assert!(matches!(b.build(f64::NAN), Err(Error::InvalidArgument(_))));
        assert!(matches!(b.build(-532.0), Err(Error::OutOfRange(_))));
        let bad_layer = b.layer(-0.01, Medium::Material(Material::FusedSilica));
        assert!(matches!(
            bad_layer.build(532.0),
            Err(Error::InvalidArgument(_))
        ));
        let bad_index = StackBuilder::new(Medium::Index(f64::NAN), Medium::VACUUM);
        assert!(matches!(
            bad_index.build(532.0),
            Err(Error::InvalidArgument(_))
        ));
        let zero_index = StackBuilder::new(Medium::Index(0.0), Medium::VACUUM);
        assert!(matches!(
            zero_index.build(532.0),
            Err(Error::InvalidArgument(_))
        ));
        let boiling = StackBuilder::new(Medium::VACUUM, Medium::pure_water(20.0, 100.0));
        assert!(matches!(boiling.build(532.0), Err(Error::OutOfRange(_))));
        let bad_normal = StackBuilder::new(Medium::VACUUM, Medium::VACUUM).normal(Vec3::ZERO);
        assert!(matches!(
            bad_normal.build(532.0),
            Err(Error::InvalidArgument(_))
        ));
    }
}
