//! Apparent and true positions against independent computations.
//!
//! The single-interface cases are solved here by plain bisection on Snell's law
//! (not the library's Newton solve) and the images found by intersecting
//! straight lines, so they check both the line-of-sight solver and the image
//! formulas of DESIGN.md.

mod common;
use common::{assert_close, assert_near};
use flatray::{
    apparent_depth, apparent_position, line_of_sight, true_depth, true_position, Image, Layer,
    Stack, Vec3,
};

/// Air over water, z up, surface z = 0. Indices from memory (air 1.000 29,
/// water 1.333 near 589 nm); any values would do for these identities.
const N_AIR: f64 = 1.000_29;
const N_WATER: f64 = 1.333;

fn lake() -> Stack {
    Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), N_AIR, N_WATER).unwrap()
}

/// Where the light path from an object at (x_obj, 0, −depth) to an eye at (0, 0, h)
/// crosses the surface: bisection on n1 sin θ1 − n2 sin θ2, increasing in x.
fn crossing_by_bisection(h: f64, x_obj: f64, depth: f64) -> f64 {
    let g = |x: f64| {
        let s1 = x / x.hypot(h);
        let s2 = (x_obj - x) / (x_obj - x).hypot(depth);
        N_AIR * s1 - N_WATER * s2
    };
    let (mut lo, mut hi) = (0.0, x_obj);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if g(mid) < 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

#[test]
fn normal_view_gives_the_paraxial_depth() {
    // Apparent depth d n1/n2 along the normal: Hecht, Optics, 5th ed., §5.2.3
    // (refraction at a plane surface, from memory for the section number).
    for d in [0.001, 0.5, 3.0, 40.0] {
        for image in [Image::Sagittal, Image::Tangential] {
            let a = apparent_position(
                &lake(),
                Vec3::new(0.0, 0.0, 2.0),
                Vec3::new(0.0, 0.0, -d),
                image,
            )
            .unwrap();
            assert_close(-a.z, d * N_AIR / N_WATER, 1e-15 * d, "paraxial depth");
            let s = apparent_depth(d, 0.0, N_AIR, N_WATER, image).unwrap();
            assert_close(s, d * N_AIR / N_WATER, 1e-15 * d, "scalar paraxial depth");
        }
    }
}

#[test]
fn oblique_sagittal_image_matches_bisection() {
    for &(h, x, d) in &[
        (2.0, 1.0, 1.5),
        (10.0, 30.0, 4.0),
        (0.3, 5.0, 0.2),
        (50.0, 1.0, 12.0),
    ] {
        let xs = crossing_by_bisection(h, x, d);
        // The straight line from the eye through (xs, 0, 0) meets the vertical x = x_obj at
        // z = h (1 − x/xs): the sagittal image.
        let expected_depth = -(h * (1.0 - x / xs));
        let a = apparent_position(
            &lake(),
            Vec3::new(0.0, 0.0, h),
            Vec3::new(x, 0.0, -d),
            Image::Sagittal,
        )
        .unwrap();
        // Bisection resolves xs to about 1 ulp of x; the image depth scales it by
        // about h x/xs² ≤ 1e3 here: 1e-11 relative is ample.
        assert_close(
            -a.z,
            expected_depth,
            1e-11 * expected_depth.max(1.0),
            "sagittal depth",
        );
        assert_close(a.x, x, 1e-12 * x, "on the vertical through the object");
        // DESIGN.md's single-interface formula d (n1/n2) cos t1 / cos t2 via the scalar helper.
        let view = (xs / h).atan();
        let scalar = apparent_depth(d, view, N_AIR, N_WATER, Image::Sagittal).unwrap();
        assert_close(
            scalar,
            expected_depth,
            1e-11 * expected_depth.max(1.0),
            "scalar sagittal",
        );
    }
}

#[test]
fn oblique_tangential_image_matches_the_caustic_of_neighbouring_rays() {
    for &(h, x, d) in &[(2.0, 1.0, 1.5), (10.0, 30.0, 4.0), (0.3, 5.0, 0.2)] {
        // Two rays from the object crossing the surface at xs ± δ, each refracted
        // into air and extended back below the surface; their intersection tends to
        // the tangential image as δ → 0 (error O(δ²)).
        let xs = crossing_by_bisection(h, x, d);
        // δ small against both legs of the path (the relevant curvature scales).
        let delta = 1e-4 * xs.min(x - xs);
        let line = |xc: f64| {
            // Direction in air of the ray that crossed at xc, travelling up-left toward
            // the eye side: sin θ1 = n2 sin θ2 / n1.
            let s2 = (x - xc) / (x - xc).hypot(d);
            let s1 = N_WATER * s2 / N_AIR;
            let c1 = (1.0 - s1 * s1).sqrt();
            (xc, s1 / c1) // crossing point and tan θ1: below the surface x = xc + z' tan θ1 (z' depth)
        };
        // x1 + z t1 = x2 + z t2  →  z = (x2 − x1)/(t1 − t2), a central difference
        // with O(δ²) error; one Richardson step (4 z(δ/2) − z(δ))/3 removes it.
        let pair = |dl: f64| {
            let (x1, t1) = line(xs - dl);
            let (x2, t2) = line(xs + dl);
            (x2 - x1) / (t1 - t2)
        };
        let z = (4.0 * pair(0.5 * delta) - pair(delta)) / 3.0;
        let a = apparent_position(
            &lake(),
            Vec3::new(0.0, 0.0, h),
            Vec3::new(x, 0.0, -d),
            Image::Tangential,
        )
        .unwrap();
        // O(δ⁴) truncation plus cancellation in t1 − t2 (~1e-16/1e-4 per difference,
        // amplified where the air ray is nearly grazing): 1e-8 relative. The
        // 40-digit test below pins the same values to 1e-14.
        assert_close(-a.z, z, 1e-8 * z, "tangential depth");
        let view = (xs / h).atan();
        let scalar = apparent_depth(d, view, N_AIR, N_WATER, Image::Tangential).unwrap();
        assert_close(scalar, z, 1e-8 * z, "scalar tangential");
    }
}

#[test]
fn water_always_looks_shallower_and_more_so_obliquely() {
    // Common practice: the correction factor true/apparent is n2/n1 at nadir and
    // grows with the viewing angle; the tangential image is shallower than the sagittal.
    let mut last = 0.0;
    for deg in [0.0f64, 10.0, 20.0, 30.0, 40.0, 50.0, 60.0, 70.0, 80.0, 89.0] {
        let s = apparent_depth(1.0, deg.to_radians(), N_AIR, N_WATER, Image::Sagittal).unwrap();
        let t = apparent_depth(1.0, deg.to_radians(), N_AIR, N_WATER, Image::Tangential).unwrap();
        assert!(s < 1.0 && t <= s, "at {deg} degrees: s = {s}, t = {t}");
        let factor = 1.0 / s;
        assert!(factor >= last, "factor grows with angle");
        last = factor;
    }
    assert_close(
        1.0 / apparent_depth(1.0, 0.0, N_AIR, N_WATER, Image::Sagittal).unwrap(),
        N_WATER / N_AIR,
        1e-15,
        "nadir factor",
    );
}

#[test]
fn scalar_helpers_invert_each_other() {
    for deg in [0.0f64, 15.0, 45.0, 75.0, 89.9] {
        for image in [Image::Sagittal, Image::Tangential] {
            let a = apparent_depth(3.7, deg.to_radians(), N_AIR, N_WATER, image).unwrap();
            let t = true_depth(a, deg.to_radians(), N_AIR, N_WATER, image).unwrap();
            assert_close(t, 3.7, 1e-14 * 3.7, "round trip");
        }
    }
}

#[test]
fn layers_add_their_reduced_thicknesses_at_normal_view() {
    // Paraxial image through parallel plates: each plate of thickness t and index n
    // looks t n0/n thick ("reduced thickness"; W. J. Smith, Modern Optical
    // Engineering, §2.6, from memory for the section number).
    let layers = [
        Layer::new(0.012, 1.49),
        Layer::new(0.004, 1.52),
        Layer::new(0.02, 1.0),
    ];
    let tank = Stack::new(Vec3::ZERO, Vec3::new(1.0, 0.0, 0.0), 1.0, &layers, 1.333).unwrap();
    let eye = Vec3::new(-0.8, 0.0, 0.0);
    let fish = Vec3::new(0.036 + 0.5, 0.0, 0.0);
    let expected = 0.012 / 1.49 + 0.004 / 1.52 + 0.02 / 1.0 + 0.5 / 1.333;
    for image in [Image::Sagittal, Image::Tangential] {
        let a = apparent_position(&tank, eye, fish, image).unwrap();
        assert_close(a.x, expected, 1e-15, "reduced thickness sum");
    }
}

#[test]
fn sagittal_image_lies_on_the_line_of_sight() {
    let layers = [Layer::new(0.01, 1.77), Layer::new(0.003, 1.2)];
    let port = Stack::new(
        Vec3::new(0.0, 0.0, 0.04),
        Vec3::new(0.1, 0.0, 1.0),
        1.0003,
        &layers,
        1.343,
    )
    .unwrap();
    let eye = Vec3::ZERO;
    let object = Vec3::new(0.9, -0.4, 2.0);
    let path = line_of_sight(&port, eye, object).unwrap();
    for image in [Image::Sagittal, Image::Tangential] {
        let a = apparent_position(&port, eye, object, image).unwrap();
        let miss = common::distance_to_ray(a, eye, path.direction);
        assert!(
            miss < 1e-13,
            "{image:?} image is {miss:e} m off the line of sight"
        );
        let back = true_position(&port, eye, a, image).unwrap();
        assert_near(back, object, 1e-12, "round trip");
    }
}

#[test]
// The reference values are copied as the script printed them (25 digits).
#[allow(clippy::excessive_precision)]
fn single_interface_images_match_40_digit_references() {
    // (h, x, d, sagittal depth, tangential depth), metres, computed with mpmath 1.4.1
    // at 40 digits by tests/data/single_interface_images.py (independent of flatray).
    let cases = [
        (
            2.0,
            1.0,
            1.5,
            1.100875460247094186433029,
            1.053029406236494087229078,
        ),
        (
            10.0,
            30.0,
            4.0,
            1.506504462642984542517346,
            0.3794894697465715627921506,
        ),
        (
            0.3,
            5.0,
            0.2,
            0.01420453934426070655446956,
            0.000127241832580172928286735,
        ),
    ];
    for (h, x, d, sagittal, tangential) in cases {
        let eye = Vec3::new(0.0, 0.0, h);
        let object = Vec3::new(x, 0.0, -d);
        let s = apparent_position(&lake(), eye, object, Image::Sagittal).unwrap();
        let t = apparent_position(&lake(), eye, object, Image::Tangential).unwrap();
        // A few ulps of each step (solve, cosines, cubes): 1e-14 relative.
        assert_close(-s.z, sagittal, 1e-14 * sagittal, "sagittal depth");
        assert_close(-t.z, tangential, 1e-14 * tangential, "tangential depth");
    }
}
