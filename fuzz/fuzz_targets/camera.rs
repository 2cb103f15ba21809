//! The camera C functions with arbitrary lenses, ports, pixels, points, image
//! sizes, buffers and poses (NULL pointers included).
//!
//! Invariants: a defined status, never `FLATRAY_ERR_INTERNAL` (a caught
//! panic); OK results are finite (rays with unit directions, angles in
//! [0, π], `max >= rms >= 0`); errors leave NaN out-values; whole-call errors of
//! the remap table and the batches write nothing; table entries are a pixel or
//! NaN in both maps; a NaN or infinite scalar argument never gives OK.
#![no_main]

#[path = "input.rs"]
mod input;

use flatray::camera::Lens;
use flatray::capi::*;
use flatray::{Ray, Vec3};
use input::{defined, is_nan3, is_unit, Input};
use libfuzzer_sys::fuzz_target;

const OK: i32 = 0;
const INTERNAL: i32 = 9;
const SENTINEL: f64 = -7.25;

/// A value in `[lo, hi]` most of the time (cameras fail fast on absurd
/// intrinsics, so plain fuzz values rarely reach the projections), any f64 of
/// `Input::f64` otherwise.
fn around(inp: &mut Input, lo: f64, hi: f64) -> f64 {
    if inp.u8() < 200 {
        let unit = f64::from(inp.u32()) / f64::from(u32::MAX);
        lo + (hi - lo) * unit
    } else {
        inp.f64()
    }
}

fn lens(inp: &mut Input) -> Lens {
    Lens {
        fx: around(inp, 50.0, 3000.0),
        fy: around(inp, 50.0, 3000.0),
        cx: around(inp, -100.0, 2000.0),
        cy: around(inp, -100.0, 2000.0),
        k1: around(inp, -0.5, 0.5),
        k2: around(inp, -0.2, 0.2),
        k3: around(inp, -0.05, 0.05),
        p1: around(inp, -0.01, 0.01),
        p2: around(inp, -0.01, 0.01),
    }
}

/// A port in front of the camera most of the time, any stack otherwise.
fn port(inp: &mut Input) -> FlatrayStack {
    let mut s = inp.stack();
    if inp.u8() < 200 {
        s.origin = Vec3::new(
            around(inp, -0.05, 0.05),
            around(inp, -0.05, 0.05),
            around(inp, -0.01, 0.1),
        );
        s.normal = Vec3::new(
            around(inp, -0.5, 0.5),
            around(inp, -0.5, 0.5),
            around(inp, 0.2, 1.0),
        );
        s.n_observer = around(inp, 1.0, 1.4);
        s.layer_count = u32::from(inp.u8() % 3);
        for i in 0..8 {
            s.thickness[i] = around(inp, 1e-4, 0.03);
            s.n_layer[i] = around(inp, 1.3, 1.9);
        }
        s.n_object = around(inp, 1.0, 1.4);
    }
    s
}

fn status(r: FlatrayStatus) -> i32 {
    let s = r as i32;
    assert!(defined(s) && s != INTERNAL, "status {s}");
    s
}

fn check_pair(s: i32, a: f64, b: f64) {
    if s == OK {
        assert!(a.is_finite() && b.is_finite(), "OK with ({a}, {b})");
    } else {
        assert!(a.is_nan() && b.is_nan(), "status {s} left ({a}, {b})");
    }
}

fn check_ray(s: i32, r: &Ray) {
    if s == OK {
        assert!(
            r.origin.is_finite() && is_unit(r.direction),
            "OK with {r:?}"
        );
    } else {
        assert!(
            is_nan3(r.origin) && is_nan3(r.direction),
            "status {s} left {r:?}"
        );
    }
}

fuzz_target!(|bytes: &[u8]| {
    let mut inp = Input::new(bytes);
    let lens_a = lens(&mut inp);
    let port_a = port(&mut inp);
    let flags = inp.u8();
    let lens_ptr: *const Lens = if flags & 0x01 != 0 && flags & 0x80 != 0 {
        std::ptr::null()
    } else {
        &lens_a
    };
    let port_ptr: *const FlatrayStack = if flags & 0x02 != 0 && flags & 0x80 != 0 {
        std::ptr::null()
    } else {
        &port_a
    };
    let lens_fields = [
        lens_a.fx, lens_a.fy, lens_a.cx, lens_a.cy, lens_a.k1, lens_a.k2, lens_a.k3, lens_a.p1,
        lens_a.p2,
    ];
    let lens_finite = lens_fields.iter().all(|v| v.is_finite());

    // Single pixel and point.
    let (u, v) = (
        around(&mut inp, -200.0, 2200.0),
        around(&mut inp, -200.0, 2200.0),
    );
    let mut ray = Ray::new(Vec3::new(SENTINEL, 0.0, 0.0), Vec3::ZERO);
    let s = status(unsafe { flatray_pixel_to_ray(lens_ptr, port_ptr, u, v, &mut ray) });
    check_ray(s, &ray);
    if !(u.is_finite() && v.is_finite() && lens_finite) {
        assert_ne!(s, OK);
    }
    let point = if s == OK && flags & 0x04 != 0 {
        ray.at(around(&mut inp, 0.0, 50.0))
    } else {
        Vec3::new(
            around(&mut inp, -5.0, 5.0),
            around(&mut inp, -5.0, 5.0),
            around(&mut inp, -1.0, 20.0),
        )
    };
    let (mut pu, mut pv) = (SENTINEL, SENTINEL);
    let s = status(unsafe { flatray_point_to_pixel(lens_ptr, port_ptr, point, &mut pu, &mut pv) });
    check_pair(s, pu, pv);
    if !point.is_finite() {
        assert_ne!(s, OK);
    }

    // Batches.
    let count = usize::from(inp.u8() % 6);
    let uv: Vec<f64> = (0..2 * count)
        .map(|_| around(&mut inp, -200.0, 2200.0))
        .collect();
    let pts: Vec<Vec3> = (0..count)
        .map(|_| Vec3::new(inp.f64(), inp.f64(), around(&mut inp, 0.0, 10.0)))
        .collect();
    let mut rays = vec![Ray::new(Vec3::new(SENTINEL, 0.0, 0.0), Vec3::ZERO); count];
    let mut st = vec![-99i32; count];
    let r = status(unsafe {
        flatray_pixels_to_rays(
            lens_ptr,
            port_ptr,
            uv.as_ptr(),
            count,
            rays.as_mut_ptr(),
            st.as_mut_ptr(),
        )
    });
    let untouched = st.iter().all(|&s| s == -99) && rays.iter().all(|r| r.origin.x == SENTINEL);
    if lens_ptr.is_null() || port_ptr.is_null() {
        assert_ne!(r, OK);
    }
    if !(r != OK && untouched) {
        // Not a whole-call error: every element attempted, the first failure returned.
        assert_eq!(r, st.iter().copied().find(|&s| s != OK).unwrap_or(OK));
        for (ray, &s) in rays.iter().zip(&st) {
            assert!(defined(s) && s != INTERNAL);
            check_ray(s, ray);
        }
    }
    let mut out = vec![SENTINEL; 2 * count];
    let r = status(unsafe {
        flatray_points_to_pixels(
            lens_ptr,
            port_ptr,
            pts.as_ptr(),
            count,
            out.as_mut_ptr(),
            std::ptr::null_mut(),
        )
    });
    if r == OK {
        assert!(out.iter().all(|v| v.is_finite()));
    } else if out.iter().any(|&v| v != SENTINEL) {
        // Element failures: each pixel is a pixel or NaN, and one is NaN.
        assert!(out
            .chunks(2)
            .all(|p| (p[0].is_finite() && p[1].is_finite()) || (p[0].is_nan() && p[1].is_nan())));
        assert!(out.iter().any(|v| v.is_nan()));
    }

    // Remap table and its error, small images.
    let target = lens(&mut inp);
    let (w, h) = (u32::from(inp.u8() % 7), u32::from(inp.u8() % 7));
    let map_len = usize::from(inp.u8() % 50);
    let distance = around(&mut inp, 0.0, 20.0);
    let mut mu = vec![SENTINEL as f32; map_len];
    let mut mv = vec![SENTINEL as f32; map_len];
    let mu_ptr = if flags & 0x08 != 0 && flags & 0x40 != 0 {
        std::ptr::null_mut()
    } else {
        mu.as_mut_ptr()
    };
    let s = status(unsafe {
        flatray_remap_table(
            lens_ptr,
            port_ptr,
            &target,
            distance,
            w,
            h,
            mu_ptr,
            mv.as_mut_ptr(),
            map_len,
        )
    });
    let n = (w * h) as usize;
    if s == OK {
        assert!(n >= 1 && map_len >= n && distance.is_finite() && distance > 0.0);
        for (a, b) in mu.iter().zip(&mv).take(n) {
            assert!(
                a.is_finite() == b.is_finite() && (a.is_finite() || (a.is_nan() && b.is_nan()))
            );
        }
        assert!(mu.iter().skip(n).all(|&x| x == SENTINEL as f32));
    } else {
        assert!(
            mu.iter().chain(&mv).all(|&x| x == SENTINEL as f32),
            "error {s} wrote the maps"
        );
    }
    let other = around(&mut inp, 0.0, 30.0);
    let (mut max, mut rms) = (SENTINEL, SENTINEL);
    let s = status(unsafe {
        flatray_remap_error(
            lens_ptr, port_ptr, &target, distance, other, w, h, &mut max, &mut rms,
        )
    });
    check_pair(s, max, rms);
    if s == OK {
        assert!(max >= rms && rms >= 0.0, "max {max} rms {rms}");
    }

    // Field of view and the camera view.
    let (fw, fh) = (inp.u32() % 5000, inp.u32() % 5000);
    let (mut fov_h, mut fov_v) = (SENTINEL, SENTINEL);
    let s = status(unsafe {
        flatray_field_of_view(lens_ptr, port_ptr, fw, fh, &mut fov_h, &mut fov_v)
    });
    check_pair(s, fov_h, fov_v);
    if s == OK {
        assert!(
            (0.0..=std::f64::consts::PI).contains(&fov_h)
                && (0.0..=std::f64::consts::PI).contains(&fov_v)
        );
    }
    if flags & 0x10 != 0 {
        let mut view = FlatrayCameraView {
            horizontal: SENTINEL,
            vertical: SENTINEL,
            diagonal: SENTINEL,
            horizontal_air: SENTINEL,
            vertical_air: SENTINEL,
            diagonal_air: SENTINEL,
            focal_x_water: SENTINEL,
            focal_y_water: SENTINEL,
            tir_radius_px: SENTINEL,
        };
        let s = status(unsafe { flatray_camera_view(lens_ptr, port_ptr, fw, fh, &mut view) });
        let all = [
            view.horizontal,
            view.vertical,
            view.diagonal,
            view.horizontal_air,
            view.vertical_air,
            view.diagonal_air,
            view.focal_x_water,
            view.focal_y_water,
            view.tir_radius_px,
        ];
        if s == OK {
            assert!(all.iter().all(|v| v.is_finite()), "{all:?}");
            assert!(view.focal_x_water > 0.0 && view.focal_y_water > 0.0);
            assert!(view.tir_radius_px == -1.0 || view.tir_radius_px >= 0.0);
        } else {
            assert!(all.iter().all(|v| v.is_nan()), "status {s} left {all:?}");
        }
    }

    // Stereo with a pose that is a rotation about z most of the time.
    let lens_b = lens(&mut inp);
    let port_b = port(&mut inp);
    let a = around(&mut inp, -0.5, 0.5);
    let mut pose = [
        a.cos(),
        -a.sin(),
        0.0,
        a.sin(),
        a.cos(),
        0.0,
        0.0,
        0.0,
        1.0,
        around(&mut inp, -0.5, 0.5),
        around(&mut inp, -0.5, 0.5),
        around(&mut inp, -0.1, 0.1),
    ];
    if flags & 0x20 != 0 {
        let k = usize::from(inp.u8() % 12);
        pose[k] = inp.f64();
    }
    let pose_ptr = if flags & 0x08 != 0 && flags & 0x80 != 0 {
        std::ptr::null()
    } else {
        pose.as_ptr()
    };
    let (ub, vb) = (
        around(&mut inp, -200.0, 2200.0),
        around(&mut inp, -200.0, 2200.0),
    );
    let mut p = Vec3::new(SENTINEL, SENTINEL, SENTINEL);
    let mut miss = SENTINEL;
    let s = status(unsafe {
        flatray_stereo_triangulate(
            lens_ptr, port_ptr, &lens_b, &port_b, pose_ptr, u, v, ub, vb, &mut p, &mut miss,
        )
    });
    if s == OK {
        assert!(p.is_finite() && miss.is_finite() && miss >= 0.0);
    } else {
        assert!(is_nan3(p) && miss.is_nan(), "status {s} left {p:?} {miss}");
    }
});
