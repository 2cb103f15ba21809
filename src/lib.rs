//! flatray: true and apparent positions through flat refracting layers.
#![no_std]
#![deny(missing_docs)]

#[cfg(feature = "std")]
extern crate std;

#[cfg(not(any(feature = "std", feature = "libm")))]
compile_error!(
    "flatray needs either the `std` feature (default) or the `libm` feature for its maths"
);

pub mod error;
mod math;
pub mod stack;
pub mod vector;

pub use error::{Error, Result, Status};
pub use stack::{Layer, Region, Stack, MAX_LAYERS};
pub use vector::{Ray, Vec3};
