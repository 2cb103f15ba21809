//! `FlatrayStatus`, `flatray_status_message` and `flatray_version`.

use core::ffi::c_char;

use super::guard_or;
use crate::error::{message_for_code, Status};

/// Outcome of every fallible C function. The values are fixed and never
/// renumbered; later versions only append.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[repr(C)]
pub enum FlatrayStatus {
    /// Success.
    FLATRAY_OK = 0,
    /// A required pointer argument was NULL.
    FLATRAY_ERR_NULL_POINTER = 1,
    /// NaN/inf, index <= 0, thickness <= 0, bad normal, bad enum, too many layers.
    FLATRAY_ERR_INVALID_ARGUMENT = 2,
    /// A ray would need total internal reflection.
    FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION = 3,
    /// Ray parallel to or pointing away from the stack.
    FLATRAY_ERR_MISSES_INTERFACE = 4,
    /// A point not where the stack says it must be.
    FLATRAY_ERR_WRONG_SIDE = 5,
    /// An iterative solve did not converge.
    FLATRAY_ERR_NOT_CONVERGED = 6,
    /// Outside a model's validity range, or a result too large to represent.
    FLATRAY_ERR_OUT_OF_RANGE = 7,
    /// An output buffer is too small.
    FLATRAY_ERR_BUFFER_TOO_SMALL = 8,
    /// A caught panic: a bug, reported, never an abort.
    FLATRAY_ERR_INTERNAL = 9,
    /// Geometry that fixes no answer: parallel lines of sight, one view.
    FLATRAY_ERR_DEGENERATE = 10,
}

impl From<Status> for FlatrayStatus {
    fn from(s: Status) -> FlatrayStatus {
        match s {
            Status::Ok => FlatrayStatus::FLATRAY_OK,
            Status::NullPointer => FlatrayStatus::FLATRAY_ERR_NULL_POINTER,
            Status::InvalidArgument => FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT,
            Status::TotalInternalReflection => FlatrayStatus::FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION,
            Status::MissesInterface => FlatrayStatus::FLATRAY_ERR_MISSES_INTERFACE,
            Status::WrongSide => FlatrayStatus::FLATRAY_ERR_WRONG_SIDE,
            Status::NotConverged => FlatrayStatus::FLATRAY_ERR_NOT_CONVERGED,
            Status::OutOfRange => FlatrayStatus::FLATRAY_ERR_OUT_OF_RANGE,
            Status::BufferTooSmall => FlatrayStatus::FLATRAY_ERR_BUFFER_TOO_SMALL,
            Status::Internal => FlatrayStatus::FLATRAY_ERR_INTERNAL,
            Status::Degenerate => FlatrayStatus::FLATRAY_ERR_DEGENERATE,
        }
    }
}

/// The library version, e.g. `"0.1.0"`: a static NUL-terminated string.
#[no_mangle]
pub extern "C" fn flatray_version() -> *const c_char {
    guard_or(VERSION.as_ptr().cast(), || VERSION.as_ptr().cast())
}

/// `CARGO_PKG_VERSION`, NUL-terminated.
const VERSION: &[u8] = concat!(env!("CARGO_PKG_VERSION"), "\0").as_bytes();

/// A static NUL-terminated English message for a status code; never NULL, also
/// for codes flatray does not define.
#[no_mangle]
pub extern "C" fn flatray_status_message(status: i32) -> *const c_char {
    guard_or(Status::Internal.message_cstr().as_ptr(), || {
        message_for_code(status).as_ptr()
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn c_status_values_match_rust_status_codes() {
        for s in Status::ALL {
            assert_eq!(FlatrayStatus::from(s) as i32, s.code());
        }
    }
}
