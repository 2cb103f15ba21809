//! The batch C functions (true and apparent positions, lines of sight, traces)
//! with arbitrary counts, NULL pointers, observer counts
//! and elements.
//!
//! Invariants: a defined status; whole-call errors write nothing; otherwise
//! each element's status matches its outputs (finite for OK, NaN otherwise) and
//! the return value is the status of the lowest-index failure.
#![no_main]

#[path = "input.rs"]
mod input;

use flatray::capi::*;
use flatray::{Path, Ray, Vec3};
use input::{defined, is_nan3, is_unit, Input};
use libfuzzer_sys::fuzz_target;

const SENTINEL: f64 = -7.25;

fuzz_target!(|bytes: &[u8]| {
    let mut inp = Input::new(bytes);
    let c_stack = inp.stack();
    let count = usize::from(inp.u8() % 12);
    let observer_count = match inp.u8() % 4 {
        0 => 1,
        1 => count,
        _ => usize::from(inp.u8() % 12),
    };
    let flags = inp.u8();
    let image = if flags & 0x80 == 0 { i32::from(flags & 1) } else { inp.i32() };
    let observers: Vec<Vec3> = (0..observer_count).map(|_| inp.vec3()).collect();
    let points: Vec<Vec3> = (0..count).map(|_| inp.vec3()).collect();
    let rays: Vec<Ray> = (0..count).map(|_| Ray::new(inp.vec3(), inp.vec3())).collect();

    // Sometimes NULL: the arrays (with their counts), the optional outputs.
    let null = |bit: u8, len: usize| flags & bit != 0 && len > 0 && flags & 0x40 != 0;
    let obs_ptr = if null(0x02, observer_count) { std::ptr::null() } else { observers.as_ptr() };
    let pts_ptr = if null(0x04, count) { std::ptr::null() } else { points.as_ptr() };

    let whole_call_error = c_stack.to_stack().is_err()
        || (observer_count != 1 && observer_count != count)
        || !(0..=1).contains(&image)
        || (obs_ptr.is_null() && observer_count > 0)
        || (pts_ptr.is_null() && count > 0);

    for which in 0..2 {
        let mut out = vec![Vec3::new(SENTINEL, SENTINEL, SENTINEL); count];
        let mut status = vec![-99i32; count];
        let status_ptr = if flags & 0x08 != 0 { std::ptr::null_mut() } else { status.as_mut_ptr() };
        let f = if which == 0 { flatray_true_positions } else { flatray_apparent_positions };
        let r = unsafe {
            f(&c_stack, obs_ptr, observer_count, pts_ptr, count, image, out.as_mut_ptr(), status_ptr)
        } as i32;
        assert!(defined(r));
        if whole_call_error {
            assert!(r != 0, "a whole-call error returned OK");
            assert!(out.iter().all(|v| v.x == SENTINEL) && status.iter().all(|&s| s == -99), "whole-call error wrote outputs");
            continue;
        }
        assert!(out.iter().all(|v| v.is_finite() || is_nan3(*v)), "an element was skipped or half-written");
        if status_ptr.is_null() {
            assert_eq!(r == 0, out.iter().all(|v| v.is_finite()));
        } else {
            let first = status.iter().copied().find(|&s| s != 0).unwrap_or(0);
            assert_eq!(r, first, "return value is not the lowest-index failure");
            for (v, &s) in out.iter().zip(&status) {
                assert!(defined(s));
                assert!(if s == 0 { v.is_finite() } else { is_nan3(*v) });
            }
        }
    }

    // Lines of sight: the same rules, and each element equals its single call.
    {
        let los_whole_call_error = c_stack.to_stack().is_err()
            || (observer_count != 1 && observer_count != count)
            || (obs_ptr.is_null() && observer_count > 0)
            || (pts_ptr.is_null() && count > 0);
        let mut sentinel = Path::NAN;
        sentinel.geometric_length = SENTINEL;
        let mut paths = vec![sentinel; count];
        let mut status = vec![-99i32; count];
        let status_ptr = if flags & 0x08 != 0 { std::ptr::null_mut() } else { status.as_mut_ptr() };
        let r = unsafe {
            flatray_lines_of_sight(&c_stack, obs_ptr, observer_count, pts_ptr, count, paths.as_mut_ptr(), status_ptr)
        } as i32;
        assert!(defined(r));
        if los_whole_call_error {
            assert!(r != 0, "a whole-call error returned OK");
            assert!(paths.iter().all(|p| p.geometric_length == SENTINEL) && status.iter().all(|&s| s == -99), "whole-call error wrote outputs");
        } else {
            let mut first = 0;
            for (i, path) in paths.iter().enumerate() {
                let observer = observers[if observer_count == 1 { 0 } else { i }];
                let mut one = Path::NAN;
                let s1 = unsafe { flatray_line_of_sight(&c_stack, observer, points[i], &mut one) } as i32;
                if first == 0 {
                    first = s1;
                }
                if !status_ptr.is_null() {
                    assert_eq!(status[i], s1, "element status differs from the single call");
                }
                let fields = |p: &Path| [p.direction, p.entry, p.exit, Vec3::new(p.geometric_length, p.optical_length, p.transmittance)];
                if s1 == 0 {
                    let same = fields(path).iter().zip(fields(&one).iter()).all(|(a, b)| {
                        a.x.to_bits() == b.x.to_bits() && a.y.to_bits() == b.y.to_bits() && a.z.to_bits() == b.z.to_bits()
                    });
                    assert!(same, "a batch path differs from the single call");
                    assert!(fields(path).iter().all(|v| v.is_finite()));
                    assert!(is_unit(path.direction));
                    assert!((0.0..=1.0).contains(&path.transmittance));
                } else {
                    assert!(fields(path).iter().all(|v| is_nan3(*v)), "a failed path is not all NaN");
                }
            }
            assert_eq!(r, first, "return value is not the lowest-index failure");
        }
    }

    let mut out = vec![Ray::new(Vec3::new(SENTINEL, 0.0, 0.0), Vec3::ZERO); count];
    let mut t = vec![SENTINEL; count];
    let mut status = vec![-99i32; count];
    let rays_ptr = if null(0x10, count) { std::ptr::null() } else { rays.as_ptr() };
    let t_ptr = if flags & 0x20 != 0 { std::ptr::null_mut() } else { t.as_mut_ptr() };
    let r = unsafe {
        flatray_trace_rays(&c_stack, rays_ptr, count, out.as_mut_ptr(), t_ptr, status.as_mut_ptr())
    } as i32;
    assert!(defined(r));
    if c_stack.to_stack().is_err() || (rays_ptr.is_null() && count > 0) {
        assert!(r != 0);
        assert!(status.iter().all(|&s| s == -99) && out.iter().all(|o| o.origin.x == SENTINEL));
        return;
    }
    let first = status.iter().copied().find(|&s| s != 0).unwrap_or(0);
    assert_eq!(r, first);
    for ((ray, &s), &tt) in out.iter().zip(&status).zip(&t) {
        assert!(defined(s));
        if s == 0 {
            assert!(ray.origin.is_finite() && ray.direction.is_finite());
            assert!(t_ptr.is_null() || (0.0..=1.0).contains(&tt));
        } else {
            assert!(is_nan3(ray.origin) && is_nan3(ray.direction));
            assert!(t_ptr.is_null() || tt.is_nan());
        }
    }
});
