//! The refractive-index C functions with arbitrary arguments: every phase and
//! group index, seawater at pressure, water at a density, materials, user
//! Sellmeier/Cauchy formulas (NULL coefficient pointers included).
//!
//! Invariants: every status is defined; an OK index is finite and > 0 (a group
//! index finite); every error leaves NaN; a NaN or infinite argument is
//! `FLATRAY_ERR_INVALID_ARGUMENT` and a finite one never is (issue 3's rule),
//! except for unknown enum codes and malformed user ranges.
#![no_main]

#[path = "input.rs"]
mod input;

use flatray::capi::*;
use input::{defined, Input};
use libfuzzer_sys::fuzz_target;

const OK: i32 = 0;
const NULL: i32 = 1;
const INVALID: i32 = 2;

/// A value around `[lo, hi]` (a tenth of the span beyond each end) half the
/// time, any f64 of `Input::f64` otherwise: models fail quickly outside their
/// range, so plain fuzz values rarely reach the formulas.
fn around(inp: &mut Input, lo: f64, hi: f64) -> f64 {
    if inp.u8() < 128 {
        let unit = f64::from(inp.u32()) / f64::from(u32::MAX);
        lo + (hi - lo) * (1.2 * unit - 0.1)
    } else {
        inp.f64()
    }
}

fn check(name: &str, args: &[f64], status: FlatrayStatus, out: f64, phase: bool) {
    let s = status as i32;
    assert!(defined(s), "{name}{args:?}: status {s}");
    if s == OK {
        assert!(out.is_finite(), "{name}{args:?}: OK with {out}");
        if phase {
            assert!(out > 0.0, "{name}{args:?}: OK with index {out}");
        }
    } else {
        assert!(out.is_nan(), "{name}{args:?}: status {s} left {out}");
    }
    let finite = args.iter().all(|a| a.is_finite());
    assert_eq!(s == INVALID, !finite, "{name}{args:?}: status {s}");
}

type Three = unsafe extern "C" fn(f64, f64, f64, *mut f64) -> FlatrayStatus;
type Four = unsafe extern "C" fn(f64, f64, f64, f64, *mut f64) -> FlatrayStatus;

fuzz_target!(|bytes: &[u8]| {
    let mut inp = Input::new(bytes);
    let t = around(&mut inp, -40.0, 350.0);
    let p = around(&mut inp, 0.0, 1.1e8);
    let s = around(&mut inp, 0.0, 40.0);
    let h = around(&mut inp, 0.0, 1.0);
    let rho = around(&mut inp, 0.0, 1100.0);
    let l = around(&mut inp, 150.0, 1800.0);

    let three: [(&str, Three, [f64; 3], bool); 5] = [
        (
            "index_pure_water",
            flatray_index_pure_water,
            [t, p, l],
            true,
        ),
        (
            "group_index_pure_water",
            flatray_group_index_pure_water,
            [t, p, l],
            false,
        ),
        (
            "index_water_at_density",
            flatray_index_water_at_density,
            [t, rho, l],
            true,
        ),
        ("index_seawater", flatray_index_seawater, [t, s, l], true),
        (
            "group_index_seawater",
            flatray_group_index_seawater,
            [t, s, l],
            false,
        ),
    ];
    for (name, f, a, phase) in three {
        let mut out = -1.0;
        let status = unsafe { f(a[0], a[1], a[2], &mut out) };
        check(name, &a, status, out, phase);
        assert_eq!(
            unsafe { f(a[0], a[1], a[2], std::ptr::null_mut()) } as i32,
            NULL
        );
    }
    let four: [(&str, Four, [f64; 4], bool); 4] = [
        (
            "index_seawater_at_pressure",
            flatray_index_seawater_at_pressure,
            [t, s, p, l],
            true,
        ),
        (
            "group_index_seawater_at_pressure",
            flatray_group_index_seawater_at_pressure,
            [t, s, p, l],
            false,
        ),
        ("index_air", flatray_index_air, [t, p * 1e-3, h, l], true),
        (
            "group_index_air",
            flatray_group_index_air,
            [t, p * 1e-3, h, l],
            false,
        ),
    ];
    for (name, f, a, phase) in four {
        let mut out = -1.0;
        let status = unsafe { f(a[0], a[1], a[2], a[3], &mut out) };
        check(name, &a, status, out, phase);
    }

    // Materials: any code; unknown codes are INVALID whatever the wavelength.
    let code = if inp.u8() < 200 {
        i32::from(inp.u8() % 7) - 1
    } else {
        inp.i32()
    };
    let known = (0..=4).contains(&code);
    for (phase, f) in [
        (
            true,
            flatray_index_material as unsafe extern "C" fn(i32, f64, *mut f64) -> FlatrayStatus,
        ),
        (false, flatray_group_index_material),
    ] {
        let mut out = -1.0;
        let status = unsafe { f(code, l, &mut out) };
        if known {
            check("material", &[l], status, out, phase);
        } else {
            assert_eq!(status as i32, INVALID);
            assert!(out.is_nan());
        }
    }

    // User formulas: coefficients from the fuzzer, sometimes NULL pointers.
    let b = [
        around(&mut inp, 0.0, 3.0),
        around(&mut inp, 0.0, 3.0),
        around(&mut inp, 0.0, 6.0),
    ];
    let c = [
        around(&mut inp, 0.0, 0.02),
        around(&mut inp, 0.0, 0.05),
        around(&mut inp, 0.0, 400.0),
    ];
    let nulls = inp.u8();
    let bp = if nulls & 1 == 1 {
        std::ptr::null()
    } else {
        b.as_ptr()
    };
    let cp = if nulls & 2 == 2 {
        std::ptr::null()
    } else {
        c.as_ptr()
    };
    let all: Vec<f64> = b.iter().chain(&c).copied().chain([l]).collect();
    for (phase, f) in [
        (
            true,
            flatray_index_sellmeier
                as unsafe extern "C" fn(*const f64, *const f64, f64, *mut f64) -> FlatrayStatus,
        ),
        (false, flatray_group_index_sellmeier),
    ] {
        let mut out = -1.0;
        let status = unsafe { f(bp, cp, l, &mut out) };
        if nulls & 3 != 0 {
            assert_eq!(status as i32, NULL);
            assert!(out.is_nan());
        } else {
            check("sellmeier", &all, status, out, phase);
        }
    }
    let (a0, b2, c4) = (
        around(&mut inp, 1.0, 2.0),
        around(&mut inp, -0.01, 0.02),
        inp.f64(),
    );
    let mut out = -1.0;
    let status = unsafe { flatray_index_cauchy(a0, b2, c4, l, &mut out) };
    check("cauchy", &[a0, b2, c4, l], status, out, true);

    // The full-option forms: any footing code and range; both outputs.
    let footing = i32::from(inp.u8() % 4) - 1;
    let (lo, hi) = (
        around(&mut inp, 0.0, 500.0),
        around(&mut inp, 300.0, 5000.0),
    );
    let (mut n, mut g) = (-1.0, -1.0);
    let status = unsafe {
        flatray_sample_sellmeier(b.as_ptr(), c.as_ptr(), footing, lo, hi, l, &mut n, &mut g)
    } as i32;
    assert!(defined(status));
    if status == OK {
        assert!(n.is_finite() && n > 0.0 && g.is_finite());
        assert!((0..=1).contains(&footing) && lo <= l && l <= hi);
    } else {
        assert!(n.is_nan() && g.is_nan());
    }
    let (mut n, mut g) = (-1.0, -1.0);
    let status =
        unsafe { flatray_sample_cauchy(a0, b2, c4, footing, lo, hi, l, &mut n, &mut g) } as i32;
    assert!(defined(status));
    assert_eq!(status == OK, n.is_finite() && g.is_finite());
    if status != OK {
        assert!(n.is_nan() && g.is_nan());
    }
});
