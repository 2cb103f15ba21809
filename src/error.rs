//! Status codes and the Rust error type.
//!
//! [`Status`] is the numeric code shared with the C ABI (`FlatrayStatus`): the
//! values are fixed by the ABI contract and are never renumbered; new codes are
//! appended. [`Error`] is what Rust callers see: one variant per failure status,
//! some carrying a short static explanation of what was wrong.

use core::ffi::CStr;

/// Outcome code of a flatray operation, numerically identical to the C enum
/// `FlatrayStatus`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[repr(i32)]
pub enum Status {
    /// Success.
    Ok = 0,
    /// A required pointer was NULL (C ABI only).
    NullPointer = 1,
    /// NaN or infinite input, index <= 0, thickness <= 0, bad normal or
    /// direction, unknown enum value, too many layers, a count or domain error.
    InvalidArgument = 2,
    /// A ray would need total internal reflection to go on.
    TotalInternalReflection = 3,
    /// A ray is parallel to the interfaces or points away from the stack.
    MissesInterface = 4,
    /// A point is not on the side of the stack where it must be.
    WrongSide = 5,
    /// An iterative solve did not reach its accuracy.
    NotConverged = 6,
    /// Outside a model's validity range, or a result too large to represent.
    OutOfRange = 7,
    /// A caller buffer is smaller than the call needs.
    BufferTooSmall = 8,
    /// A caught panic: a bug in flatray, reported instead of aborting.
    Internal = 9,
    /// Geometry that fixes no answer: parallel lines of sight, a single view.
    Degenerate = 10,
}

impl Status {
    /// Every status, in code order.
    /// cbindgen:ignore
    pub const ALL: [Status; 11] = [
        Status::Ok,
        Status::NullPointer,
        Status::InvalidArgument,
        Status::TotalInternalReflection,
        Status::MissesInterface,
        Status::WrongSide,
        Status::NotConverged,
        Status::OutOfRange,
        Status::BufferTooSmall,
        Status::Internal,
        Status::Degenerate,
    ];

    /// The numeric code (the value of the C enum constant).
    #[inline]
    pub const fn code(self) -> i32 {
        self as i32
    }

    /// The status for a numeric code, or `None` for a code flatray does not define.
    pub const fn from_code(code: i32) -> Option<Status> {
        Some(match code {
            0 => Status::Ok,
            1 => Status::NullPointer,
            2 => Status::InvalidArgument,
            3 => Status::TotalInternalReflection,
            4 => Status::MissesInterface,
            5 => Status::WrongSide,
            6 => Status::NotConverged,
            7 => Status::OutOfRange,
            8 => Status::BufferTooSmall,
            9 => Status::Internal,
            10 => Status::Degenerate,
            _ => return None,
        })
    }

    /// A static, NUL-terminated English sentence describing the status.
    pub const fn message_cstr(self) -> &'static CStr {
        match self {
            Status::Ok => c"success",
            Status::NullPointer => c"a required pointer argument was NULL",
            Status::InvalidArgument => c"invalid argument: a NaN or infinite value, an index or thickness <= 0, a zero or non-finite direction or normal, an unknown enum value, more than 8 layers, or a count or value outside its domain",
            Status::TotalInternalReflection => c"total internal reflection: no ray can cross the interface at this angle",
            Status::MissesInterface => c"the ray is parallel to the interfaces or points away from the stack",
            Status::WrongSide => c"a point is on the wrong side of the stack: the observer must be before the first interface, the object past the last one, and an apparent point beyond the first interface and deep enough to image a point in the object medium",
            Status::NotConverged => c"an iterative solve did not reach its accuracy",
            Status::OutOfRange => c"outside the model's validity range, or a result too large to represent",
            Status::BufferTooSmall => c"an output buffer is smaller than the call needs",
            Status::Internal => c"internal error: a bug in flatray was caught; please report it",
            Status::Degenerate => c"degenerate geometry: it fixes no answer (fewer than two views, or parallel lines of sight)",
        }
    }

    /// The same sentence as [`Status::message_cstr`], as `&str`.
    pub fn message(self) -> &'static str {
        self.message_cstr().to_str().unwrap_or("flatray status")
    }
}

/// Message for any numeric code, including codes flatray does not define.
pub fn message_for_code(code: i32) -> &'static CStr {
    match Status::from_code(code) {
        Some(status) => status.message_cstr(),
        None => c"unknown flatray status code",
    }
}

/// Why a flatray operation failed.
///
/// Each variant maps to one [`Status`] (see [`Error::status`]); the `&'static str`
/// payloads name the offending argument or condition.
#[derive(Debug, Clone, Copy, PartialEq, Eq, thiserror::Error)]
pub enum Error {
    /// See [`Status::InvalidArgument`].
    #[error("invalid argument: {0}")]
    InvalidArgument(&'static str),
    /// See [`Status::TotalInternalReflection`].
    #[error("total internal reflection: {0}")]
    TotalInternalReflection(&'static str),
    /// See [`Status::MissesInterface`].
    #[error("the ray misses the interface: {0}")]
    MissesInterface(&'static str),
    /// See [`Status::WrongSide`].
    #[error("wrong side of the stack: {0}")]
    WrongSide(&'static str),
    /// See [`Status::NotConverged`].
    #[error("not converged: {0}")]
    NotConverged(&'static str),
    /// See [`Status::OutOfRange`].
    #[error("out of range: {0}")]
    OutOfRange(&'static str),
    /// See [`Status::BufferTooSmall`].
    #[error("buffer too small: {0}")]
    BufferTooSmall(&'static str),
    /// See [`Status::Degenerate`].
    #[error("degenerate geometry: {0}")]
    Degenerate(&'static str),
}

impl Error {
    /// The status code of this error.
    pub const fn status(&self) -> Status {
        match self {
            Error::InvalidArgument(_) => Status::InvalidArgument,
            Error::TotalInternalReflection(_) => Status::TotalInternalReflection,
            Error::MissesInterface(_) => Status::MissesInterface,
            Error::WrongSide(_) => Status::WrongSide,
            Error::NotConverged(_) => Status::NotConverged,
            Error::OutOfRange(_) => Status::OutOfRange,
            Error::BufferTooSmall(_) => Status::BufferTooSmall,
            Error::Degenerate(_) => Status::Degenerate,
        }
    }

    /// The short explanation carried by the error.
    pub const fn detail(&self) -> &'static str {
        match self {
            Error::InvalidArgument(s)
            | Error::TotalInternalReflection(s)
            | Error::MissesInterface(s)
            | Error::WrongSide(s)
            | Error::NotConverged(s)
            | Error::OutOfRange(s)
            | Error::BufferTooSmall(s)
            | Error::Degenerate(s) => s,
        }
    }
}

/// Result type of flatray operations.
pub type Result<T> = core::result::Result<T, Error>;

/// `Err(InvalidArgument(what))` unless `x` is finite.
#[inline]
pub(crate) fn finite(x: f64, what: &'static str) -> Result<f64> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(Error::InvalidArgument(what))
    }
}

/// `Err(InvalidArgument(what))` unless `x` is finite and > 0.
#[inline]
pub(crate) fn positive(x: f64, what: &'static str) -> Result<f64> {
    if x.is_finite() && x > 0.0 {
        Ok(x)
    } else {
        Err(Error::InvalidArgument(what))
    }
}

/// `Err(OutOfRange(what))` unless `x` is finite: the guard on every result.
#[inline]
pub(crate) fn representable(x: f64, what: &'static str) -> Result<f64> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(Error::OutOfRange(what))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn codes_round_trip_and_every_code_has_a_message() {
        for (i, s) in Status::ALL.iter().enumerate() {
            assert_eq!(s.code(), i as i32);
            assert_eq!(Status::from_code(s.code()), Some(*s));
            assert!(!s.message().is_empty());
        }
        assert_eq!(Status::from_code(-1), None);
        assert_eq!(
            message_for_code(12345).to_bytes(),
            b"unknown flatray status code"
        );
    }
}
