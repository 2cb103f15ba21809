//! The scalar C functions with arbitrary arguments: refraction, Fresnel,
//! critical angle, the depth helpers, status messages.
#![no_main]

#[path = "input.rs"]
mod input;

use flatray::capi::*;
use flatray::Vec3;
use input::{defined, is_nan3, is_unit, Input};
use libfuzzer_sys::fuzz_target;
use std::ffi::CStr;

fuzz_target!(|bytes: &[u8]| {
    let mut inp = Input::new(bytes);

    let (d, n, n1, n2) = (inp.vec3(), inp.vec3(), inp.f64(), inp.f64());
    let mut out = Vec3::ZERO;
    let s = unsafe { flatray_refract(d, n, n1, n2, &mut out) } as i32;
    assert!(defined(s));
    if s == 0 {
        assert!(is_unit(out), "refract gave {out:?}");
        // Snell: n1 sin θ1 = n2 sin θ2, within rounding.
        let nn = n.try_normalize().unwrap();
        let dd = d.try_normalize().unwrap();
        let s1 = (dd - nn * dd.dot(nn)).length();
        let s2 = (out - nn * out.dot(nn)).length();
        // Snell in ratio form, s1 = (n2/n1) s2, where the sines are normal
        // numbers (subnormal sines carry too few digits to check).
        let eta = n2 / n1;
        if s1.is_normal() && s2.is_normal() && eta.is_normal() {
            assert!(
                // The sines come from differences of unit vectors: each carries an
                // absolute error of a few ε, which η multiplies on the right.
                (s1 - eta * s2).abs() <= 1e-12 * s1.max(eta * s2) + 8.0 * f64::EPSILON * (1.0 + eta),
                "Snell violated: d {d:?} n {n:?} n1 {n1:e} n2 {n2:e} out {out:?}"
            );
        }
    } else {
        assert!(is_nan3(out));
    }

    let (c, n1, n2) = (inp.f64(), inp.f64(), inp.f64());
    let mut f = flatray::Fresnel::NAN;
    let s = unsafe { flatray_fresnel(c, n1, n2, &mut f) } as i32;
    assert!(defined(s));
    if s == 0 {
        for v in [f.rs, f.rp, f.ts, f.tp, f.r, f.t] {
            assert!((0.0..=1.0 + 1e-15).contains(&v), "Fresnel out of [0, 1]: {f:?}");
        }
        assert!((f.r + f.t - 1.0).abs() < 1e-12, "R + T != 1: {f:?}");
    } else {
        assert!(f.r.is_nan() && f.t.is_nan());
    }

    let (n1, n2) = (inp.f64(), inp.f64());
    let mut angle = 0.0;
    let s = unsafe { flatray_critical_angle(n1, n2, &mut angle) } as i32;
    assert!(defined(s));
    if s == 0 {
        assert!((0.0..=std::f64::consts::FRAC_PI_2).contains(&angle));
    } else {
        assert!(angle.is_nan());
    }

    let (depth, view, n1, n2, image) = (inp.f64(), inp.f64(), inp.f64(), inp.f64(), inp.i32());
    for f in [flatray_apparent_depth, flatray_true_depth] {
        let mut out = 0.0;
        let s = unsafe { f(depth, view, n1, n2, image, &mut out) } as i32;
        assert!(defined(s));
        if s == 0 {
            assert!(out.is_finite() && out >= 0.0, "depth {out}");
        } else {
            assert!(out.is_nan());
        }
    }

    let code = inp.i32();
    let m = unsafe { CStr::from_ptr(flatray_status_message(code)) };
    assert!(!m.to_bytes().is_empty());
});
