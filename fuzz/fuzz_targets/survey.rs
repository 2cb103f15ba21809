//! The survey C functions with arbitrary stacks, views, ranges, group indices,
//! view offsets and counts: triangulation, multi-view and range corrections,
//! depth tables and the error budget.
//!
//! Invariants: a defined status; an OK result is finite (an RMS miss >= 0, a
//! covariance symmetric with a non-negative diagonal, depths and factors >= 0);
//! a failed single call leaves NaN; a batch's return value is its lowest-index
//! failure and each element's outputs match its status.
#![no_main]

#[path = "input.rs"]
mod input;

use flatray::capi::*;
use flatray::{Ray, Vec3};
use input::{defined, is_nan3, Input};
use libfuzzer_sys::fuzz_target;

/// The statuses of a batch agree with its return value and outputs.
fn check_batch(r: i32, status: &[i32], ok_finite: impl Fn(usize) -> bool) {
    assert!(defined(r));
    if status.iter().all(|&s| s == -99) {
        return; // whole-call error: nothing written (checked by the caller if needed)
    }
    let first = status.iter().copied().find(|&s| s != 0).unwrap_or(0);
    assert_eq!(r, first, "return value is not the lowest-index failure");
    for (i, &s) in status.iter().enumerate() {
        assert!(defined(s));
        assert_eq!(s == 0, ok_finite(i), "element {i}: status {s} but outputs disagree");
    }
}

fuzz_target!(|bytes: &[u8]| {
    let mut inp = Input::new(bytes);
    let stack = inp.stack();
    let n = usize::from(inp.u8() % 6);
    let cameras: Vec<Vec3> = (0..n).map(|_| inp.vec3()).collect();
    let lines: Vec<Ray> = (0..n).map(|_| Ray::new(inp.vec3(), inp.vec3())).collect();
    let apparent = inp.vec3();
    let image = if inp.u8() < 250 { i32::from(inp.u8() & 1) } else { inp.i32() };

    // Triangulation of refracted lines of sight.
    let (mut p, mut rms) = (Vec3::ZERO, 0.0);
    let s = unsafe { flatray_triangulate(&stack, lines.as_ptr(), n, &mut p, &mut rms) } as i32;
    assert!(defined(s));
    assert!(
        if s == 0 { p.is_finite() && rms >= 0.0 && rms.is_finite() } else { is_nan3(p) && rms.is_nan() },
        "triangulate status {s} point {p:?} rms {rms}: stack {stack:?} lines {lines:?}"
    );

    // Multi-view correction, exact and shortcut.
    for f in [flatray_correct_multiview, flatray_correct_multiview_shortcut] {
        let (mut p, mut rms) = (Vec3::ZERO, 0.0);
        let s = unsafe { f(&stack, cameras.as_ptr(), n, apparent, &mut p, &mut rms) } as i32;
        assert!(defined(s));
        assert!(if s == 0 { p.is_finite() && rms >= 0.0 && rms.is_finite() } else { is_nan3(p) && rms.is_nan() });
    }

    // Range correction, with phase or arbitrary group indices.
    let group_count = match inp.u8() % 3 {
        0 => 0,
        1 => (stack.layer_count as usize).saturating_add(2).min(16),
        _ => usize::from(inp.u8() % 12),
    };
    let group: Vec<f64> = (0..group_count).map(|_| inp.f64()).collect();
    let group_ptr = if group_count == 0 { std::ptr::null() } else { group.as_ptr() };
    let sensor = inp.vec3();
    let mut t = Vec3::ZERO;
    let s = unsafe { flatray_correct_range(&stack, sensor, apparent, group_ptr, group_count, &mut t) } as i32;
    assert!(defined(s));
    assert!(if s == 0 { t.is_finite() } else { is_nan3(t) });

    let mut out = vec![Vec3::new(-7.0, -7.0, -7.0); n];
    let mut status = vec![-99i32; n];
    let sensor_count = if inp.u8() & 1 == 0 { 1 } else { n };
    let sensors = [sensor; 8];
    let r = unsafe {
        flatray_correct_ranges(&stack, sensors.as_ptr(), sensor_count, cameras.as_ptr(), n, group_ptr, group_count,
            out.as_mut_ptr(), status.as_mut_ptr())
    } as i32;
    check_batch(r, &status, |i| out[i].is_finite());

    // Multi-view batches with arbitrary (possibly malformed) view offsets and ids.
    let count = usize::from(inp.u8() % 4);
    let ids: Vec<u32> = (0..usize::from(inp.u8() % 10)).map(|_| u32::from(inp.u8() % 8)).collect();
    let mut offsets: Vec<usize> = (0..=count).map(|_| usize::from(inp.u8() % 12)).collect();
    if inp.u8() & 1 == 0 {
        offsets.sort_unstable();
    }
    let points: Vec<Vec3> = (0..count).map(|_| inp.vec3()).collect();
    for f in [flatray_correct_multiviews, flatray_correct_multiviews_shortcut] {
        let mut out = vec![Vec3::new(-7.0, -7.0, -7.0); count];
        let mut rms = vec![-7.0; count];
        let mut status = vec![-99i32; count];
        let r = unsafe {
            f(&stack, cameras.as_ptr(), n, offsets.as_ptr(), ids.as_ptr(), ids.len(), points.as_ptr(), count,
                out.as_mut_ptr(), rms.as_mut_ptr(), status.as_mut_ptr())
        } as i32;
        check_batch(r, &status, |i| out[i].is_finite() && rms[i] >= 0.0);
    }

    // Depth tables.
    let m = usize::from(inp.u8() % 6);
    let depths: Vec<f64> = (0..m).map(|_| inp.f64()).collect();
    let angles: Vec<f64> = (0..m).map(|_| inp.f64()).collect();
    let (n0, n1) = (inp.f64(), inp.f64());
    let mut out = vec![-7.0; m];
    let mut status = vec![-99i32; m];
    let r = unsafe {
        flatray_true_depths(depths.as_ptr(), angles.as_ptr(), m, n0, n1, image, out.as_mut_ptr(), status.as_mut_ptr())
    } as i32;
    check_batch(r, &status, |i| out[i].is_finite() && out[i] >= 0.0);
    let mut status = vec![-99i32; m];
    let r = unsafe {
        flatray_correction_factors(angles.as_ptr(), m, n0, n1, image, out.as_mut_ptr(), status.as_mut_ptr())
    } as i32;
    check_batch(r, &status, |i| out[i].is_finite() && out[i] > 0.0);

    // Error budget.
    let observer = inp.vec3();
    let (mut a, mut b, mut c, mut d) = ([0.0; 3], [0.0; 3], [0.0; 9], [0.0; 9]);
    let s = unsafe {
        flatray_true_position_sensitivity(&stack, observer, apparent, image, a.as_mut_ptr(), b.as_mut_ptr(),
            c.as_mut_ptr(), d.as_mut_ptr())
    } as i32;
    assert!(defined(s));
    let all = a.iter().chain(&b).chain(&c).chain(&d);
    assert!(if s == 0 { all.clone().all(|v| v.is_finite()) } else { all.clone().all(|v| v.is_nan()) });
    let sigmas = [inp.f64(), inp.f64(), inp.f64(), inp.f64()];
    let mut cov = [0.0; 9];
    let s = unsafe {
        flatray_true_position_covariance(&stack, observer, apparent, image, sigmas[0], sigmas[1], sigmas[2],
            sigmas[3], cov.as_mut_ptr())
    } as i32;
    assert!(defined(s));
    if s == 0 {
        assert!(cov.iter().all(|v| v.is_finite()), "covariance {cov:?} sigmas {sigmas:?} stack {stack:?} observer {observer:?} apparent {apparent:?} image {image}");
        for i in 0..3 {
            assert!(cov[4 * i] >= 0.0, "negative variance {cov:?}");
            for j in 0..3 {
                let (x, y) = (cov[3 * i + j], cov[3 * j + i]);
                assert!((x - y).abs() <= 1e-12 * (x.abs() + y.abs()) + f64::MIN_POSITIVE, "asymmetric {cov:?}");
            }
        }
    } else {
        assert!(cov.iter().all(|v| v.is_nan()));
    }
});
