//! flatray: where things really are when you look at them through flat
//! refracting layers — a water surface, a tank wall, the flat port of a camera
//! housing.
//!
//! # The model
//!
//! A [`Stack`] is a set of parallel flat interfaces. Its `origin` is a point on
//! the first interface (the one nearest the observer) and its `normal` points
//! from the observer's side into the stack. The observer sits in a medium of
//! index `n_observer` where `(p − origin)·n̂ <= 0`; then come 0 to 8 layers
//! ([`Layer`]: thickness in metres, refractive index); past the last interface,
//! at `(p − origin)·n̂ >= T` (`T` the total thickness), lies the object's medium
//! of index `n_object`. Points on the wrong side, or inside a layer, are an
//! error, not a guess.
//!
//! * [`trace`]: a ray leaving the observer, refracted at every interface
//!   (Snell's law), and its Fresnel transmittance.
//! * [`line_of_sight`]: the physical light path from an observer to an object
//!   (Fermat's principle), solved to near machine precision.
//! * [`apparent_position`] / [`true_position`]: where an object appears (the
//!   sagittal or tangential [`Image`]) and, inversely, where it really is.
//! * [`apparent_depth`] / [`true_depth`]: the same for one interface, as scalars.
//! * [`batch`]: every per-point function over slices, with a status per point
//!   (on every core for large batches with the `parallel` feature).
//! * [`survey`]: through-water survey corrections: refracted-ray
//!   [`triangulate()`], multi-view correction of point clouds
//!   ([`correct_multiview`]), laser range correction ([`correct_range`]),
//!   depth tables and error budgets.
//! * [`refract`], [`fresnel`], [`critical_angle`]: one interface.
//! * [`camera`]: a lens behind a flat port (pixel ↔ ray, remap tables, field
//!   of view, stereo).
//! * [`capi`]: the C ABI (`include/flatray.h`).
//!
//! # Units and conventions
//!
//! SI throughout: metres, radians. Refractive indices are absolute (relative to
//! vacuum) phase indices. Directions passed in need not be unit length;
//! directions returned are unit vectors. Every failure is an [`Error`] whose
//! [`Status`] is the C status code; nothing panics on any input.
//!
//! # Example
//!
//! ```
//! use flatray::{apparent_position, true_position, Image, Stack, Vec3};
//! // A drone 12 m above a lake (z up, surface at z = 0), air 1.000 29, water 1.334.
//! let lake = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.000_29, 1.334)?;
//! let drone = Vec3::new(0.0, 0.0, 12.0);
//! let rock = Vec3::new(4.0, 1.0, -2.5);
//! let seen = apparent_position(&lake, drone, rock, Image::Sagittal)?;
//! assert!(seen.z > -2.5 / 1.3); // water always looks shallower than it is
//! let back = true_position(&lake, drone, seen, Image::Sagittal)?;
//! assert!((back - rock).length() < 1e-12);
//! # Ok::<(), flatray::Error>(())
//! ```
//!
//! # Features
//!
//! * `std` (default): the standard library; the C ABI catches panics.
//! * `libm`: pure-Rust maths, required for `#![no_std]` builds (with
//!   `--no-default-features`); with `std` it replaces std's maths. One of
//!   `std` and `libm` is required.
//! * `panic-handler`: a minimal `#[panic_handler]` for `no_std` static
//!   libraries linked from C firmware (never reached: the library is
//!   panic-free by construction).
//! * `parallel` (default, needs `std`): large batches run on every core
//!   (rayon; `RAYON_NUM_THREADS` sets the thread count). Results are identical
//!   with and without it.
//! * `cli` (default): the `flatray-correct` command-line tool (clap, csv,
//!   indicatif); the library never uses these crates.
#![no_std]
#![deny(missing_docs)]
#![deny(unsafe_op_in_unsafe_fn)]
// Library code is panic-free by construction: the C ABI must never unwind or
// abort, and without `std` a panic cannot be caught. Tests may unwrap.
#![cfg_attr(
    not(test),
    deny(
        clippy::unwrap_used,
        clippy::expect_used,
        clippy::panic,
        clippy::indexing_slicing,
        clippy::unreachable,
        clippy::todo,
        clippy::unimplemented
    )
)]

#[cfg(feature = "std")]
extern crate std;

#[cfg(all(not(feature = "std"), feature = "panic-handler"))]
mod panic_handler;

#[cfg(not(any(feature = "std", feature = "libm")))]
compile_error!(
    "flatray needs either the `std` feature (default) or the `libm` feature for its maths"
);

pub mod batch;
pub mod camera;
pub mod capi;
pub mod error;
pub mod image;
pub mod interface;
pub mod lines;
mod math;
/// Refractive-index models: air, water, seawater, window materials, user
/// formulas, and a stack builder. The C header generator skips this module (the
/// line below tells it so); the C ABI reaches it only through `capi`.
///
/// cbindgen:ignore
pub mod media;
pub mod path;
pub mod stack;
/// The C header generator skips this module (the line below tells it so); the C
/// ABI reaches it only through `capi`.
///
/// cbindgen:ignore
pub mod survey;
pub mod vector;

/// The README's Rust examples run as doc tests.
#[cfg(doctest)]
#[doc = include_str!("../README.md")]
mod readme_examples {}

pub use batch::{BatchReport, NoStatus, SinkSlots, StatusSink};
pub use error::{Error, Result, Status};
pub use image::{apparent_depth, apparent_position, true_depth, true_position, Image};
pub use interface::{critical_angle, fresnel, refract, Fresnel};
pub use media::{
    Air, Cauchy, Footing, IndexSample, Material, Medium, PureWater, Seawater, Sellmeier,
    StackBuilder,
};
pub use path::{line_of_sight, line_of_sight_with, trace, Path, SolveOptions, Traced};
pub use stack::{Layer, Region, Stack, MAX_LAYERS};
pub use survey::{
    correct_multiview, correct_multiview_shortcut, correct_range, triangulate, GroupIndices,
    Sensitivity, Uncertainty,
};
pub use vector::{Ray, Vec3};
