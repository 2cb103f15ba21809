//! One interface against published values and independent textbook formulas.

mod common;
use common::assert_close;
use flatray::{critical_angle, fresnel, refract, Error, Vec3};

/// Identity-level tolerance: a few ulps of quantities of order 1.
const TIGHT: f64 = 1e-14;

#[test]
fn normal_incidence_reflectance_of_glass_is_four_percent() {
    // R = ((n2 − n1)/(n2 + n1))² = 0.04 for n = 1.5 in air: Hecht, Optics, 5th ed.,
    // §4.6.2 (normal incidence), "about 4 %" for glass.
    let f = fresnel(1.0, 1.0, 1.5).unwrap();
    assert_close(f.r, 0.04, TIGHT, "R");
    assert_close(f.rs, 0.04, TIGHT, "Rs");
    assert_close(f.rp, 0.04, TIGHT, "Rp");
    assert_close(f.t, 0.96, TIGHT, "T");
}

#[test]
fn p_reflectance_vanishes_at_brewsters_angle() {
    // Brewster's law tan θ_B = n2/n1 (Hecht, Optics, §4.6.3).
    for &(n1, n2) in &[(1.0f64, 1.5f64), (1.0, 1.333), (1.333, 1.0), (1.5, 1.333)] {
        let theta_b: f64 = (n2 / n1).atan();
        let f = fresnel(theta_b.cos(), n1, n2).unwrap();
        assert!(f.rp < 1e-28, "Rp at Brewster for {n1}->{n2} is {:e}", f.rp);
        assert!(f.rs > 0.0);
    }
}

#[test]
fn fresnel_matches_the_sine_and_tangent_laws() {
    // Fresnel's laws in angle form, Hecht, Optics, §4.6 (eqs. 4.42–4.43 rewritten
    // with Snell's law): r_s = −sin(θi − θt)/sin(θi + θt),
    // r_p = tan(θi − θt)/tan(θi + θt). flatray computes the n cos θ form instead, so
    // this is an independent check. Tolerance: the angle form loses a few ulps in
    // the differences of angles; 1e-13 absolute on R in [0, 1].
    for &(n1, n2) in &[(1.0f64, 1.5f64), (1.0, 1.333), (1.333, 1.0), (1.52, 1.333)] {
        for deg in [1.0f64, 10.0, 25.0, 40.0, 45.0, 48.0] {
            let ti = deg.to_radians();
            let sin_t = n1 * ti.sin() / n2;
            if sin_t >= 1.0 {
                continue;
            }
            let tt = sin_t.asin();
            let rs = ((ti - tt).sin() / (ti + tt).sin()).powi(2);
            let rp = ((ti - tt).tan() / (ti + tt).tan()).powi(2);
            let f = fresnel(ti.cos(), n1, n2).unwrap();
            assert_close(f.rs, rs, 1e-13, "Rs");
            assert_close(f.rp, rp, 1e-13, "Rp");
            assert_close(f.r, 0.5 * (rs + rp), 1e-13, "R");
        }
    }
}

#[test]
fn total_reflection_past_the_critical_angle() {
    // DESIGN.md: beyond the critical angle r = rs = rp = 1, t = ts = tp = 0, status OK.
    let c = critical_angle(1.333, 1.0).unwrap();
    let f = fresnel((c + 1e-6).cos(), 1.333, 1.0).unwrap();
    assert_eq!(
        (f.r, f.rs, f.rp, f.t, f.ts, f.tp),
        (1.0, 1.0, 1.0, 0.0, 0.0, 0.0)
    );
    let below = fresnel((c - 1e-3).cos(), 1.333, 1.0).unwrap();
    assert!(below.t > 0.0 && below.t < 1.0);
}

#[test]
fn critical_angle_of_water_and_snells_window() {
    // Water (n = 1.333) to air: about 48.6 degrees, and Snell's window (the cone
    // through which a diver sees the whole sky) about 97 degrees: common practice.
    let c = critical_angle(1.333, 1.0).unwrap().to_degrees();
    assert_close(
        c,
        48.6,
        0.05,
        "critical angle, degrees (±half a unit in 48.6)",
    );
    assert_close(
        2.0 * c,
        97.0,
        0.5,
        "Snell's window, degrees (±half a unit in 97)",
    );
    // And exactly asin(1/1.333) (definition, Hecht §4.7).
    assert_close(
        critical_angle(1.333, 1.0).unwrap(),
        (1.0f64 / 1.333).asin(),
        TIGHT,
        "asin(n2/n1)",
    );
}

#[test]
fn refraction_across_the_critical_angle() {
    let n = Vec3::new(0.0, 0.0, 1.0);
    let c = critical_angle(1.333, 1.0).unwrap();
    let just_below = Vec3::new((c - 1e-9).sin(), 0.0, (c - 1e-9).cos());
    let t = refract(just_below, n, 1.333, 1.0).unwrap();
    // Nearly grazing on exit: sin θt = 1.333 sin θi ≈ 1.
    assert!(t.x > 0.999_99 && t.z > 0.0);
    let just_above = Vec3::new((c + 1e-9).sin(), 0.0, (c + 1e-9).cos());
    assert!(matches!(
        refract(just_above, n, 1.333, 1.0),
        Err(Error::TotalInternalReflection(_))
    ));
}

#[test]
fn refraction_is_reversible() {
    // Reversibility of light paths (Hecht §4.3): refracting the reversed
    // refracted ray back gives the reversed incident ray.
    let n = Vec3::new(0.2, -0.1, 1.0);
    let d = Vec3::new(0.4, 0.3, 0.8).try_normalize().unwrap();
    let t = refract(d, n, 1.0, 1.52).unwrap();
    let back = refract(-t, n, 1.52, 1.0).unwrap();
    common::assert_near(back, -d, 1e-15, "reversed ray");
}
