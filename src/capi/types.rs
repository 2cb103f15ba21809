//! Plain C structs and enums of the ABI that are not shared with the Rust API.
//!
//! `FlatrayVec3`, `FlatrayRay`, `FlatrayFresnel` and `FlatrayPath` are the Rust
//! types [`crate::Vec3`], [`crate::Ray`], [`crate::Fresnel`] and
//! [`crate::Path`] (all `#[repr(C)]`), renamed in the header by cbindgen.

use super::FlatrayStatus;
use crate::error::Error;
use crate::image::Image;
use crate::stack::{Layer, Stack, MAX_LAYERS};
use crate::vector::Vec3;

/// Most layers a `FlatrayStack` can hold.
pub const FLATRAY_MAX_LAYERS: usize = 8;

const _: () = assert!(FLATRAY_MAX_LAYERS == MAX_LAYERS);

/// Which image of an object point (passed to functions as `int32_t`).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[repr(C)]
pub enum FlatrayImage {
    /// On the normal through the object (survey "apparent depth").
    FLATRAY_IMAGE_SAGITTAL = 0,
    /// On the caustic of rays in the plane of incidence.
    FLATRAY_IMAGE_TANGENTIAL = 1,
}

/// Parallel flat layers between an observer's medium and an object's medium
/// (see DESIGN.md, "Geometry").
#[derive(Debug, Clone, Copy, PartialEq)]
#[repr(C)]
pub struct FlatrayStack {
    /// A point on the first interface, metres.
    pub origin: Vec3,
    /// From the observer's side into the stack; any non-zero length.
    pub normal: Vec3,
    /// Refractive index of the observer's medium.
    pub n_observer: f64,
    /// Number of layers, 0 to `FLATRAY_MAX_LAYERS`.
    pub layer_count: u32,
    /// Layer thicknesses, metres; slots at and past `layer_count` are ignored.
    pub thickness: [f64; FLATRAY_MAX_LAYERS],
    /// Layer refractive indices; slots at and past `layer_count` are ignored.
    pub n_layer: [f64; FLATRAY_MAX_LAYERS],
    /// Refractive index of the object's medium.
    pub n_object: f64,
}

impl FlatrayStack {
    /// Validate into a Rust [`Stack`].
    pub fn to_stack(&self) -> Result<Stack, Error> {
        let count = usize::try_from(self.layer_count).unwrap_or(usize::MAX);
        if count > MAX_LAYERS {
            return Err(Error::InvalidArgument("layer_count must be at most 8"));
        }
        let mut layers = [Layer::new(0.0, 0.0); MAX_LAYERS];
        for ((slot, &t), &n) in layers.iter_mut().zip(&self.thickness).zip(&self.n_layer) {
            *slot = Layer::new(t, n);
        }
        let layers = layers.get(..count).unwrap_or(&[]);
        Stack::new(
            self.origin,
            self.normal,
            self.n_observer,
            layers,
            self.n_object,
        )
    }

    /// The C description of a Rust [`Stack`].
    pub fn from_stack(stack: &Stack) -> FlatrayStack {
        let mut out = FlatrayStack {
            origin: stack.origin(),
            normal: stack.normal(),
            n_observer: stack.n_observer(),
            layer_count: 0,
            thickness: [0.0; FLATRAY_MAX_LAYERS],
            n_layer: [0.0; FLATRAY_MAX_LAYERS],
            n_object: stack.n_object(),
        };
        for ((layer, t), n) in stack
            .layers()
            .iter()
            .zip(&mut out.thickness)
            .zip(&mut out.n_layer)
        {
            *t = layer.thickness;
            *n = layer.index;
            out.layer_count += 1;
        }
        out
    }
}

/// Validate a required stack pointer.
pub(crate) unsafe fn stack_from(ptr: *const FlatrayStack) -> Result<Stack, FlatrayStatus> {
    // SAFETY: forwarded from the caller (NULL or valid).
    let s = unsafe { super::required(ptr) }?;
    s.to_stack().map_err(FlatrayStatus::from)
}

/// An image code, or `FLATRAY_ERR_INVALID_ARGUMENT`.
pub(crate) fn image_from(code: i32) -> Result<Image, FlatrayStatus> {
    Image::from_code(code).ok_or(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT)
}
