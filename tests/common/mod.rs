//! Helpers shared by the integration tests.
#![allow(dead_code)]

use flatray::Vec3;

/// Assert `|actual − expected| <= tol`, printing both and the difference.
#[track_caller]
pub fn assert_close(actual: f64, expected: f64, tol: f64, what: &str) {
    let diff = (actual - expected).abs();
    assert!(
        diff <= tol,
        "{what}: expected {expected:.17e}, got {actual:.17e}, difference {diff:.3e} > tolerance {tol:.3e}"
    );
}

/// Assert two points are within `tol` metres.
#[track_caller]
pub fn assert_near(actual: Vec3, expected: Vec3, tol: f64, what: &str) {
    let diff = (actual - expected).length();
    assert!(
        diff <= tol,
        "{what}: expected {expected:?}, got {actual:?}, distance {diff:.3e} > tolerance {tol:.3e}"
    );
}

/// Distance from `p` to the ray `origin + s·dir`, `s >= 0` (dir unit).
pub fn distance_to_ray(p: Vec3, origin: Vec3, dir: Vec3) -> f64 {
    let v = p - origin;
    let s = v.dot(dir).max(0.0);
    (v - dir * s).length()
}
