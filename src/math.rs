//! Floating-point functions, from `std` when it is on and from `libm` otherwise.
//!
//! The physics core calls only these, so the same code builds for firmware
//! (`--no-default-features --features libm`) and for hosts. With the `libm`
//! feature the libm functions are used even when `std` is on: the test suite
//! runs that way too (`cargo test --features libm`) to show both give the same
//! results.

// A table of functions shared by every module; a build need not use all of them.
#![allow(dead_code)]

#[cfg(all(feature = "std", not(feature = "libm")))]
mod imp {
    #[inline]
    pub fn sqrt(x: f64) -> f64 {
        x.sqrt()
    }
    #[inline]
    pub fn sin(x: f64) -> f64 {
        x.sin()
    }
    #[inline]
    pub fn cos(x: f64) -> f64 {
        x.cos()
    }
    #[inline]
    pub fn asin(x: f64) -> f64 {
        x.asin()
    }
    #[inline]
    pub fn atan2(y: f64, x: f64) -> f64 {
        y.atan2(x)
    }
    #[inline]
    pub fn tan(x: f64) -> f64 {
        x.tan()
    }
    #[inline]
    pub fn acos(x: f64) -> f64 {
        x.acos()
    }
    #[inline]
    pub fn atan(x: f64) -> f64 {
        x.atan()
    }
    #[inline]
    pub fn exp(x: f64) -> f64 {
        x.exp()
    }
    #[inline]
    pub fn ln(x: f64) -> f64 {
        x.ln()
    }
    #[inline]
    pub fn log10(x: f64) -> f64 {
        x.log10()
    }
    #[inline]
    pub fn cbrt(x: f64) -> f64 {
        x.cbrt()
    }
    #[inline]
    pub fn powf(x: f64, y: f64) -> f64 {
        x.powf(y)
    }
    #[inline]
    pub fn hypot(x: f64, y: f64) -> f64 {
        x.hypot(y)
    }
    #[inline]
    pub fn powi(x: f64, n: i32) -> f64 {
        x.powi(n)
    }
}

#[cfg(feature = "libm")]
mod imp {
    #[inline]
    pub fn sqrt(x: f64) -> f64 {
        libm::sqrt(x)
    }
    #[inline]
    pub fn sin(x: f64) -> f64 {
        libm::sin(x)
    }
    #[inline]
    pub fn cos(x: f64) -> f64 {
        libm::cos(x)
    }
    #[inline]
    pub fn asin(x: f64) -> f64 {
        libm::asin(x)
    }
    #[inline]
    pub fn atan2(y: f64, x: f64) -> f64 {
        libm::atan2(y, x)
    }
    #[inline]
    pub fn tan(x: f64) -> f64 {
        libm::tan(x)
    }
    #[inline]
    pub fn acos(x: f64) -> f64 {
        libm::acos(x)
    }
    #[inline]
    pub fn atan(x: f64) -> f64 {
        libm::atan(x)
    }
    #[inline]
    pub fn exp(x: f64) -> f64 {
        libm::exp(x)
    }
    #[inline]
    pub fn ln(x: f64) -> f64 {
        libm::log(x)
    }
    #[inline]
    pub fn log10(x: f64) -> f64 {
        libm::log10(x)
    }
    #[inline]
    pub fn cbrt(x: f64) -> f64 {
        libm::cbrt(x)
    }
    #[inline]
    pub fn powf(x: f64, y: f64) -> f64 {
        libm::pow(x, y)
    }
    #[inline]
    pub fn hypot(x: f64, y: f64) -> f64 {
        libm::hypot(x, y)
    }
    #[inline]
    pub fn powi(x: f64, n: i32) -> f64 {
        libm::pow(x, f64::from(n))
    }
}

pub use imp::*;
