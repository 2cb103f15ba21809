//! The line-of-sight solve in the hard cases the core issue names: grazing
//! paths, objects 10 km to the side, objects 1 mm behind the last interface,
//! and every error it can report.

mod common;
use common::{assert_close, distance_to_ray};
use flatray::{line_of_sight, trace, Error, Layer, Ray, Stack, Vec3};

/// Trace the solved line of sight and return how far it passes from the object.
fn miss(stack: &Stack, observer: Vec3, object: Vec3) -> f64 {
    let path = line_of_sight(stack, observer, object).unwrap();
    let out = trace(stack, Ray::new(observer, path.direction)).unwrap();
    distance_to_ray(object, out.ray.origin, out.ray.direction)
}

fn housing() -> Stack {
    // Invented: a camera port, air 1.0003 inside, 12 mm glass 1.52, water 1.34.
    Stack::new(
        Vec3::new(0.0, 0.0, 0.03),
        Vec3::new(0.0, 0.0, 1.0),
        1.0003,
        &[Layer::new(0.012, 1.52)],
        1.34,
    )
    .unwrap()
}

#[test]
fn object_ten_kilometres_to_the_side() {
    let lake =
        Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.0003, 1.333).unwrap();
    for h in [0.5, 30.0, 120.0] {
        let m = miss(
            &lake,
            Vec3::new(0.0, 0.0, h),
            Vec3::new(10_000.0, 0.0, -5.0),
        );
        assert!(m < 1e-9, "height {h}: miss {m:e} m");
    }
    let m = miss(&housing(), Vec3::ZERO, Vec3::new(7_000.0, 7_000.0, 3.0));
    assert!(m < 1e-9, "housing: miss {m:e} m");
}

#[test]
fn object_one_millimetre_behind_the_last_interface() {
    let s = housing();
    let t = s.total_thickness() + 0.03;
    for lateral in [0.0, 0.001, 0.05, 2.0, 50.0] {
        let m = miss(&s, Vec3::ZERO, Vec3::new(lateral, 0.0, t + 0.001));
        assert!(m < 1e-12, "lateral {lateral}: miss {m:e} m");
    }
}

#[test]
fn grazing_paths_converge() {
    // Observer just above the surface, object far off: the air ray is within
    // a hair of grazing.
    let lake =
        Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.0003, 1.333).unwrap();
    let eye = Vec3::new(0.0, 0.0, 1e-3);
    let path = line_of_sight(&lake, eye, Vec3::new(500.0, 0.0, -0.5)).unwrap();
    assert!(
        path.direction.z.abs() < 1e-5,
        "grazing: {:?}",
        path.direction
    );
    let m = miss(&lake, eye, Vec3::new(500.0, 0.0, -0.5));
    assert!(m < 1e-9, "miss {m:e}");
    // Observer under water looking up toward an object in the air, close to the
    // critical angle: the lowest-index medium is the object's.
    let up = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, 1.0), 1.333, 1.0003).unwrap();
    let diver = Vec3::new(0.0, 0.0, -2.0);
    let bird = Vec3::new(1000.0, 0.0, 0.5);
    let path = line_of_sight(&up, diver, bird).unwrap();
    let sin_t = path.direction.x;
    let critical = (1.0003f64 / 1.333).asin();
    assert!(sin_t < critical.sin() && sin_t > (critical - 0.01).sin());
    let out = trace(&up, Ray::new(diver, path.direction)).unwrap();
    assert!(distance_to_ray(bird, out.ray.origin, out.ray.direction) < 1e-9);
}

#[test]
fn observer_on_the_interface() {
    // The observer's medium then has zero path length. Within reach the solve works;
    // beyond the largest lateral offset any ray can make it reports total internal
    // reflection (a ray would have to leave along the interface).
    let up = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, 1.0), 1.0, 1.333).unwrap();
    let eye = Vec3::ZERO;
    let near = Vec3::new(0.5, 0.0, 1.0);
    assert!(miss(&up, eye, near) < 1e-12);
    // Largest reach at depth 1 m: tan of the critical angle in water, 1/√(1.333² − 1).
    let reach = 1.0 / (1.333f64 * 1.333 - 1.0).sqrt();
    let far = Vec3::new(reach * 1.01, 0.0, 1.0);
    assert!(matches!(
        line_of_sight(&up, eye, far),
        Err(Error::TotalInternalReflection(_))
    ));
}

#[test]
fn path_lengths_and_transmittance_are_consistent() {
    let s = housing();
    let object = Vec3::new(0.4, 0.3, 1.5);
    let path = line_of_sight(&s, Vec3::ZERO, object).unwrap();
    // Geometric length = sum of the straight segments.
    let direct =
        path.entry.length() + (path.exit - path.entry).length() + (object - path.exit).length();
    assert_close(path.geometric_length, direct, 1e-14, "geometric length");
    let optical = 1.0003 * path.entry.length()
        + 1.52 * (path.exit - path.entry).length()
        + 1.34 * (object - path.exit).length();
    assert_close(path.optical_length, optical, 1e-14, "optical length");
    let traced = trace(&s, Ray::new(Vec3::ZERO, path.direction)).unwrap();
    assert_close(
        path.transmittance,
        traced.transmittance,
        1e-15,
        "transmittance",
    );
    assert_close(path.entry.z, 0.03, 1e-16, "entry on the first interface");
    assert_close(path.exit.z, 0.042, 1e-16, "exit on the last interface");
}

#[test]
fn fermat_the_path_is_stationary() {
    // Fermat's principle (Hecht §4.5): moving the crossing points changes the optical
    // length only to second order. Perturb the entry point by ε and compare.
    let lake =
        Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.0003, 1.333).unwrap();
    let eye = Vec3::new(0.0, 0.0, 8.0);
    let rock = Vec3::new(6.0, 2.0, -3.0);
    let path = line_of_sight(&lake, eye, rock).unwrap();
    let opl = |e: Vec3| 1.0003 * (e - eye).length() + 1.333 * (rock - e).length();
    let base = opl(path.entry);
    for dir in [Vec3::new(1.0, 0.0, 0.0), Vec3::new(0.0, 1.0, 0.0)] {
        let eps = 1e-4;
        let plus = opl(path.entry + dir * eps) - base;
        let minus = opl(path.entry - dir * eps) - base;
        // First order would give |plus − minus| ≈ 2 ε |∇| ; stationarity leaves O(ε²).
        assert!(
            (plus - minus).abs() < 1e-11,
            "gradient along {dir:?}: {}",
            (plus - minus) / (2.0 * eps)
        );
        assert!(plus > 0.0 && minus > 0.0, "a minimum");
    }
    assert_close(path.optical_length, base, 1e-13, "optical length");
}

#[test]
fn bad_points_are_errors() {
    let s = housing();
    let inside_layer = Vec3::new(0.0, 0.0, 0.035);
    assert!(matches!(
        line_of_sight(&s, inside_layer, Vec3::new(0.0, 0.0, 1.0)),
        Err(Error::WrongSide(_))
    ));
    assert!(matches!(
        line_of_sight(&s, Vec3::ZERO, inside_layer),
        Err(Error::WrongSide(_))
    ));
    assert!(matches!(
        line_of_sight(&s, Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0)),
        Err(Error::WrongSide(_))
    ));
    assert!(matches!(
        line_of_sight(&s, Vec3::new(0.0, 0.0, 2.0), Vec3::new(0.0, 0.0, 3.0)),
        Err(Error::WrongSide(_))
    ));
    assert!(matches!(
        line_of_sight(&s, Vec3::new(f64::NAN, 0.0, 0.0), Vec3::new(0.0, 0.0, 1.0)),
        Err(Error::InvalidArgument(_))
    ));
    assert!(matches!(
        line_of_sight(&s, Vec3::ZERO, Vec3::new(0.0, f64::INFINITY, 1.0)),
        Err(Error::InvalidArgument(_))
    ));
    // Points so far apart that their distance overflows.
    assert!(matches!(
        line_of_sight(&s, Vec3::new(-1e308, 0.0, 0.0), Vec3::new(1e308, 0.0, 1.0)),
        Err(Error::OutOfRange(_))
    ));
}
