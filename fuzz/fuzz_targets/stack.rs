//! Stack-based C functions with arbitrary stacks, points and rays: trace, line
//! of sight, apparent and true positions.
//!
//! Invariants: every call returns a defined status; an OK result is finite,
//! directions are unit vectors, transmittances lie in [0, 1], a traced ray
//! starts on the last interface and a line of sight enters on the first; an
//! error leaves NaN outputs.
#![no_main]

#[path = "input.rs"]
mod input;

use flatray::capi::*;
use flatray::{Path, Ray, Vec3};
use input::{defined, is_nan3, is_unit, Input};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|bytes: &[u8]| {
    let mut inp = Input::new(bytes);
    let c_stack = inp.stack();
    let valid = c_stack.to_stack().ok();

    // Tolerance for "lies on an interface": rounding of the coordinates
    // involved (the result, the inputs it came from, the stack).
    let on_plane_tol = |p: Vec3, inputs: &[Vec3]| {
        let s = valid.as_ref().unwrap();
        let scale: f64 = inputs.iter().map(|v| v.length()).sum();
        1e-12 * (p.length() + scale + s.origin().length() + s.total_thickness() + 1.0)
    };

    let ray = Ray::new(inp.vec3(), inp.vec3());
    let mut out = Ray::NAN;
    let mut t = 0.0;
    let s = unsafe { flatray_trace(&c_stack, ray, &mut out, &mut t) } as i32;
    assert!(defined(s));
    if s == 0 {
        let stack = valid.as_ref().expect("OK only for a valid stack");
        assert!(out.origin.is_finite() && is_unit(out.direction), "trace gave {out:?}");
        assert!((0.0..=1.0).contains(&t), "transmittance {t}: stack {c_stack:?} ray {ray:?} out {out:?}");
        let h = stack.height(out.origin) - stack.total_thickness();
        let tol = on_plane_tol(out.origin, &[ray.origin]);
        assert!(h.abs() <= tol, "traced ray is {h:e} m off the last interface (tolerance {tol:e}): stack {c_stack:?} ray {ray:?} out {out:?}");
        assert!(out.direction.dot(stack.normal()) > 0.0, "traced ray goes back");
    } else {
        assert!(is_nan3(out.origin) && is_nan3(out.direction) && t.is_nan());
    }

    let (observer, object) = (inp.vec3(), inp.vec3());
    let mut path = Path::NAN;
    let s = unsafe { flatray_line_of_sight(&c_stack, observer, object, &mut path) } as i32;
    assert!(defined(s));
    if s == 0 {
        let stack = valid.as_ref().expect("OK only for a valid stack");
        assert!(is_unit(path.direction));
        assert!(path.entry.is_finite() && path.exit.is_finite());
        assert!(path.geometric_length.is_finite() && path.geometric_length >= 0.0);
        assert!(path.optical_length.is_finite() && path.optical_length >= 0.0);
        assert!((0.0..=1.0).contains(&path.transmittance), "path transmittance: stack {c_stack:?} observer {observer:?} object {object:?} path {path:?}");
        assert!(
            stack.height(path.entry).abs() <= on_plane_tol(path.entry, &[observer, object]),
            "entry {:e} m off the first interface: stack {c_stack:?} observer {observer:?} object {object:?} path {path:?}",
            stack.height(path.entry)
        );
    } else {
        assert!(is_nan3(path.direction) && path.optical_length.is_nan());
    }

    let image = match inp.u8() {
        0..=120 => 0,
        121..=240 => 1,
        _ => inp.i32(),
    };
    let mut apparent = Vec3::ZERO;
    let s = unsafe { flatray_apparent_position(&c_stack, observer, object, image, &mut apparent) } as i32;
    assert!(defined(s));
    if s == 0 {
        assert!(apparent.is_finite());
        let mut back = Vec3::ZERO;
        let s2 = unsafe { flatray_true_position(&c_stack, observer, apparent, image, &mut back) } as i32;
        assert!(defined(s2));
        if s2 == 0 {
            assert!(back.is_finite());
        } else {
            assert!(is_nan3(back));
        }
    } else {
        assert!(is_nan3(apparent));
    }

    let other = inp.vec3();
    let mut truth = Vec3::ZERO;
    let s = unsafe { flatray_true_position(&c_stack, observer, other, image, &mut truth) } as i32;
    assert!(defined(s));
    assert!(if s == 0 { truth.is_finite() } else { is_nan3(truth) });
});
