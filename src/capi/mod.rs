//! The C ABI (version 1): every `extern "C"` item of flatray.
//!
//! The names, argument order, units and meanings are a contract (DESIGN.md);
//! the header `include/flatray.h` is generated from this module by cbindgen.
//! Nothing here computes physics: each function checks its pointers, converts
//! its arguments, calls the Rust API and writes the result.
//!
//! # Safety rules, stated once
//!
//! * A pointer argument is either NULL or valid for reads (inputs) or writes
//!   (outputs) of its type, properly aligned. NULL where a value is required is
//!   `FLATRAY_ERR_NULL_POINTER`; NULL is accepted for documented optional
//!   outputs and for arrays whose count is 0.
//! * An array pointer with count `n` is valid for `n` elements. Input and output
//!   arrays of one call must not overlap.
//! * On error, a non-NULL out-value is set to NaN (never left half-written);
//!   integer outputs are left untouched.
//! * Every function runs behind a panic guard: with the `std` feature a panic
//!   (a bug) returns `FLATRAY_ERR_INTERNAL` instead of unwinding into C.
//!   Without `std` the library is panic-free by construction.
#![allow(non_camel_case_types, clippy::missing_safety_doc)]

mod batch;
mod camera;
mod geometry;
mod media;
mod status;
mod survey;
mod types;

pub use batch::*;
pub use camera::*;
pub use geometry::*;
pub use media::*;
pub use status::*;
pub use survey::*;
pub use types::*;

use crate::error::Error;

/// Run `f`, turning a panic into `fallback` (with `std`; without it, just run).
#[inline]
pub(crate) fn guard_or<T>(fallback: T, f: impl FnOnce() -> T) -> T {
    #[cfg(feature = "std")]
    {
        std::panic::catch_unwind(std::panic::AssertUnwindSafe(f)).unwrap_or(fallback)
    }
    #[cfg(not(feature = "std"))]
    {
        let _ = fallback;
        f()
    }
}

/// Run the body of a status-returning C function behind the panic guard.
#[inline]
pub(crate) fn guard(f: impl FnOnce() -> Result<(), FlatrayStatus>) -> FlatrayStatus {
    guard_or(FlatrayStatus::FLATRAY_ERR_INTERNAL, || match f() {
        Ok(()) => FlatrayStatus::FLATRAY_OK,
        Err(status) => status,
    })
}

impl From<Error> for FlatrayStatus {
    fn from(e: Error) -> FlatrayStatus {
        FlatrayStatus::from(e.status())
    }
}

/// Reference to a required input, or `FLATRAY_ERR_NULL_POINTER`.
#[inline]
pub(crate) unsafe fn required<'a, T>(ptr: *const T) -> Result<&'a T, FlatrayStatus> {
    // SAFETY: the caller promises NULL or a valid, aligned pointer.
    unsafe { ptr.as_ref() }.ok_or(FlatrayStatus::FLATRAY_ERR_NULL_POINTER)
}

/// Mutable reference to a required output, or `FLATRAY_ERR_NULL_POINTER`.
#[inline]
pub(crate) unsafe fn required_out<'a, T>(ptr: *mut T) -> Result<&'a mut T, FlatrayStatus> {
    // SAFETY: the caller promises NULL or a valid, aligned pointer.
    unsafe { ptr.as_mut() }.ok_or(FlatrayStatus::FLATRAY_ERR_NULL_POINTER)
}

/// An optional output: `None` for NULL.
#[inline]
pub(crate) unsafe fn optional_out<'a, T>(ptr: *mut T) -> Option<&'a mut T> {
    // SAFETY: the caller promises NULL or a valid, aligned pointer.
    unsafe { ptr.as_mut() }
}

/// Largest element count whose byte size fits `isize` (a `slice` requirement).
#[inline]
fn fits<T>(len: usize) -> Result<(), FlatrayStatus> {
    let size = core::mem::size_of::<T>().max(1);
    if len <= (isize::MAX as usize) / size {
        Ok(())
    } else {
        Err(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT)
    }
}

/// An input array: NULL with length 0 is empty, NULL otherwise is an error.
#[inline]
pub(crate) unsafe fn slice_in<'a, T>(ptr: *const T, len: usize) -> Result<&'a [T], FlatrayStatus> {
    if len == 0 {
        return Ok(&[]);
    }
    if ptr.is_null() {
        return Err(FlatrayStatus::FLATRAY_ERR_NULL_POINTER);
    }
    fits::<T>(len)?;
    // SAFETY: non-NULL, and the caller promises `len` valid, aligned elements.
    Ok(unsafe { core::slice::from_raw_parts(ptr, len) })
}

/// An output array: NULL with length 0 is empty, NULL otherwise is an error.
#[inline]
pub(crate) unsafe fn slice_out<'a, T>(
    ptr: *mut T,
    len: usize,
) -> Result<&'a mut [T], FlatrayStatus> {
    if len == 0 {
        return Ok(&mut []);
    }
    if ptr.is_null() {
        return Err(FlatrayStatus::FLATRAY_ERR_NULL_POINTER);
    }
    fits::<T>(len)?;
    // SAFETY: non-NULL, and the caller promises `len` valid, aligned elements.
    Ok(unsafe { core::slice::from_raw_parts_mut(ptr, len) })
}

/// An optional output array: `None` for NULL.
#[inline]
pub(crate) unsafe fn optional_slice_out<'a, T>(
    ptr: *mut T,
    len: usize,
) -> Result<Option<&'a mut [T]>, FlatrayStatus> {
    if ptr.is_null() {
        return Ok(None);
    }
    // SAFETY: forwarded from the caller.
    unsafe { slice_out(ptr, len) }.map(Some)
}

/// Write `result` to `out`: the value on success, `nan` and the error status otherwise.
#[inline]
pub(crate) fn deliver<T, E: Into<FlatrayStatus>>(
    out: &mut T,
    nan: T,
    result: Result<T, E>,
) -> Result<(), FlatrayStatus> {
    match result {
        Ok(v) => {
            *out = v;
            Ok(())
        }
        Err(e) => {
            *out = nan;
            Err(e.into())
        }
    }
}

#[cfg(all(test, feature = "std"))]
mod tests {
    use super::*;

    #[test]
    fn a_panic_becomes_the_internal_status() {
        // Silence the default hook's message for this deliberate panic.
        let hook = std::panic::take_hook();
        std::panic::set_hook(std::boxed::Box::new(|_| {}));
        let status = guard(|| -> Result<(), FlatrayStatus> { panic!("deliberate") });
        std::panic::set_hook(hook);
        assert_eq!(status, FlatrayStatus::FLATRAY_ERR_INTERNAL);
    }

    #[test]
    fn null_with_zero_count_is_an_empty_slice() {
        let s: &[f64] = unsafe { slice_in(core::ptr::null(), 0) }.unwrap();
        assert!(s.is_empty());
        let e = unsafe { slice_in::<f64>(core::ptr::null(), 3) };
        assert_eq!(e.err(), Some(FlatrayStatus::FLATRAY_ERR_NULL_POINTER));
        let huge =
            unsafe { slice_in::<f64>(core::ptr::NonNull::dangling().as_ptr(), usize::MAX / 4) };
        assert_eq!(
            huge.err(),
            Some(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT)
        );
    }
}
