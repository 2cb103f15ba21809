//! Synthetic surveys built from known true points.
//!
//! The data are invented: cameras at several heights and asymmetric positions,
//! true points on a sloping bed, exact lines of sight from the core solver
//! (`line_of_sight`, itself tested to 1e-9 m in tests/line_of_sight.rs) and a
//! straight-line least-squares triangulation (`lines::intersect`) to make the
//! uncorrected point a refraction-blind survey reports. The corrections must give
//! the true points back; the shortcut's error is printed beside them (run with
//! `--nocapture` to see it).
//!
//! Indices: air 1.000 28 and seawater 1.339 near 532 nm are typical values, from
//! memory; the tests hold for any indices.

mod common;

use common::{assert_close, assert_near};
use flatray::survey::{
    correct_multiview, correct_multiview_shortcut, correct_multiviews, correct_range,
    correct_ranges, triangulate, triangulations, GroupIndices, Multiview, Views,
};
use flatray::{line_of_sight, lines, trace, Layer, NoStatus, Ray, Stack, Status, Vec3};

const N_AIR: f64 = 1.000_28;
const N_SEA: f64 = 1.339;

/// Recovery tolerance the issue asks for: 1e-9 m. The solves reach a few 1e-12 m
/// (their tolerance is 1e-13 of a ~50 m scale); 1e-9 leaves room for the line of
/// sight solver's 1e-14 relative accuracy times the conditioning of the
/// triangulation (cameras within ±0.5 rad of each other: a factor below 100).
const RECOVERY_M: f64 = 1e-9;

fn lagoon() -> Stack {
    Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), N_AIR, N_SEA).unwrap()
}

/// Six drone stations at different heights, unevenly spread (invented).
fn stations() -> [Vec3; 6] {
    [
        Vec3::new(-12.0, -3.0, 38.0),
        Vec3::new(4.0, -9.5, 41.5),
        Vec3::new(17.0, 2.0, 44.0),
        Vec3::new(9.0, 15.0, 52.0),
        Vec3::new(-6.0, 11.0, 47.0),
        Vec3::new(1.5, 0.5, 60.0),
    ]
}

/// True points on a sloping bed, 0.2 m to 6 m deep (invented).
fn bed_points() -> Vec<Vec3> {
    let mut pts = Vec::new();
    for i in 0..8 {
        for j in 0..6 {
            let x = -10.0 + 3.1 * i as f64;
            let y = -7.0 + 3.7 * j as f64;
            let depth = 0.2 + 0.45 * i as f64 + 0.12 * j as f64 + 0.05 * ((i * j) % 3) as f64;
            pts.push(Vec3::new(x, y, -depth));
        }
    }
    pts
}

/// The cameras that see point `k`: a different subset of 2 to 6 stations per
/// point, so most layouts are asymmetric.
fn cameras_of(k: usize) -> Vec<Vec3> {
    let all = stations();
    let count = 2 + k % 5;
    (0..count).map(|m| all[(k + 2 * m) % all.len()]).collect()
}

fn exact_sight(stack: &Stack, camera: Vec3, object: Vec3) -> Ray {
    Ray::new(
        camera,
        line_of_sight(stack, camera, object).unwrap().direction,
    )
}

/// What a refraction-blind triangulation reports for `object`.
fn straight_point(stack: &Stack, cameras: &[Vec3], object: Vec3) -> Vec3 {
    let sights: Vec<Ray> = cameras
        .iter()
        .map(|&c| exact_sight(stack, c, object))
        .collect();
    lines::intersect(&sights).unwrap().point
}

#[test]
fn multiview_recovers_true_points_and_the_shortcut_does_not() {
    let stack = lagoon();
    let mut worst_exact: f64 = 0.0;
    let mut worst_shortcut: f64 = 0.0;
    let mut sum_shortcut = 0.0;
    let mut worst_uncorrected: f64 = 0.0;
    let points = bed_points();
    for (k, &truth) in points.iter().enumerate() {
        let cams = cameras_of(k);
        let seen = straight_point(&stack, &cams, truth);
        let fixed = correct_multiview(&stack, &cams, seen).unwrap();
        let err = (fixed.point - truth).length();
        assert!(
            err <= RECOVERY_M,
            "point {k} {truth:?} with {} cameras: error {err:.3e} m",
            cams.len()
        );
        // The quality figure is the straight-line miss of the exact lines of sight
        // at the uncorrected point: recompute it independently.
        let mut sum = 0.0;
        for &c in &cams {
            let s = exact_sight(&stack, c, truth);
            let d = s.direction;
            let v = seen - c;
            let perp = v - d * v.dot(d);
            sum += perp.dot(perp);
        }
        let rms = (sum / cams.len() as f64).sqrt();
        assert_close(fixed.rms_miss, rms, 1e-9, "straight-line rms miss");
        let shortcut = correct_multiview_shortcut(&stack, &cams, seen).unwrap();
        let s_err = (shortcut.point - truth).length();
        worst_exact = worst_exact.max(err);
        worst_shortcut = worst_shortcut.max(s_err);
        sum_shortcut += s_err;
        worst_uncorrected = worst_uncorrected.max((seen - truth).length());
    }
    eprintln!(
        "multiview over {} points: exact worst error {worst_exact:.2e} m; shortcut worst {worst_shortcut:.3} m, mean {:.3} m; uncorrected worst {worst_uncorrected:.3} m",
        points.len(),
        sum_shortcut / points.len() as f64
    );
    // The shortcut is an approximation: for these layouts it misses by more than a
    // millimetre somewhere (the issue: "by decimetres" for real layouts).
    assert!(
        worst_shortcut > 1e-3,
        "shortcut worst error {worst_shortcut}"
    );
}

#[test]
fn the_shortcut_is_exact_for_a_symmetric_pair() {
    // Two cameras at equal heights mirrored about the vertical through the point:
    // their exact lines of sight are mirror images and meet on that vertical at the
    // sagittal image, so tracing straight lines to it retraces the true rays
    // (elementary symmetry argument).
    let stack = lagoon();
    let truth = Vec3::new(2.0, 1.0, -3.0);
    let cams = [Vec3::new(-8.0, 1.0, 40.0), Vec3::new(12.0, 1.0, 40.0)];
    let seen = straight_point(&stack, &cams, truth);
    let shortcut = correct_multiview_shortcut(&stack, &cams, seen).unwrap();
    assert_near(shortcut.point, truth, RECOVERY_M, "symmetric shortcut");
    let exact = correct_multiview(&stack, &cams, seen).unwrap();
    assert_near(exact.point, truth, RECOVERY_M, "symmetric exact");
}

#[test]
fn triangulating_exact_lines_of_sight_recovers_true_points() {
    let stack = lagoon();
    let mut worst: f64 = 0.0;
    for (k, &truth) in bed_points().iter().enumerate() {
        let cams = cameras_of(k);
        let sights: Vec<Ray> = cams
            .iter()
            .map(|&c| exact_sight(&stack, c, truth))
            .collect();
        let hit = triangulate(&stack, &sights).unwrap();
        let err = (hit.point - truth).length();
        assert!(err <= RECOVERY_M, "point {k}: error {err:.3e} m");
        // Exact rays all pass through the point: the miss is rounding only
        // (line of sight accurate to 1e-14 relative of a 50 m geometry).
        assert!(hit.rms_miss <= RECOVERY_M, "rms miss {}", hit.rms_miss);
        worst = worst.max(err);
    }
    eprintln!("triangulate from exact lines of sight: worst error {worst:.2e} m");
}

#[test]
fn batches_match_the_single_point_functions() {
    let stack = lagoon();
    let cameras = stations();
    let points = bed_points();
    let mut offsets = vec![0usize];
    let mut ids = Vec::new();
    let mut seen = Vec::new();
    let mut lines_all = Vec::new();
    let mut line_offsets = vec![0usize];
    for (k, &truth) in points.iter().enumerate() {
        let cams = cameras_of(k);
        for c in &cams {
            let id = cameras.iter().position(|s| s == c).unwrap();
            ids.push(id as u32);
            lines_all.push(exact_sight(&stack, *c, truth));
        }
        offsets.push(ids.len());
        line_offsets.push(lines_all.len());
        seen.push(straight_point(&stack, &cams, truth));
    }
    let views = Views {
        cameras: &cameras,
        offsets: &offsets,
        ids: &ids,
    };
    let n = points.len();
    for method in [Multiview::Exact, Multiview::Shortcut] {
        let mut out = vec![Vec3::ZERO; n];
        let mut rms = vec![0.0; n];
        let mut status = vec![Status::Internal; n];
        let report = correct_multiviews(
            &stack,
            &views,
            &seen,
            method,
            &mut out,
            Some(&mut rms),
            &mut status[..],
        )
        .unwrap();
        assert_eq!(report.failed, 0);
        for k in 0..n {
            let cams = cameras_of(k);
            let single = match method {
                Multiview::Exact => correct_multiview(&stack, &cams, seen[k]).unwrap(),
                Multiview::Shortcut => correct_multiview_shortcut(&stack, &cams, seen[k]).unwrap(),
            };
            assert_eq!(out[k], single.point, "{method:?} point {k}");
            assert_eq!(rms[k], single.rms_miss);
            assert_eq!(status[k], Status::Ok);
        }
    }
    let mut out = vec![Vec3::ZERO; n];
    let report = triangulations(
        &stack,
        &lines_all,
        &line_offsets,
        &mut out,
        None,
        &mut NoStatus,
    )
    .unwrap();
    assert_eq!(report.failed, 0);
    for (k, &truth) in points.iter().enumerate() {
        assert_near(out[k], truth, RECOVERY_M, "batch triangulation");
    }
}

#[test]
fn multiview_through_a_layered_window() {
    // An aquarium: cameras in air look through a 19 mm acrylic wall (1.49) into
    // water (1.333); the wall is the plane y = 0, normal +y (invented scene,
    // indices common practice).
    let stack = Stack::new(
        Vec3::ZERO,
        Vec3::new(0.0, 1.0, 0.0),
        N_AIR,
        &[Layer::new(0.019, 1.49)],
        1.333,
    )
    .unwrap();
    let cams = [
        Vec3::new(-0.8, -1.5, 0.2),
        Vec3::new(0.6, -2.1, -0.1),
        Vec3::new(0.1, -1.2, 0.9),
    ];
    for truth in [
        Vec3::new(0.0, 0.5, 0.0),
        Vec3::new(0.4, 1.7, -0.3),
        Vec3::new(-0.9, 0.05, 0.6),
    ] {
        let seen = straight_point(&stack, &cams, truth);
        let fixed = correct_multiview(&stack, &cams, seen).unwrap();
        assert_near(fixed.point, truth, RECOVERY_M, "through the wall");
        let sights: Vec<Ray> = cams
            .iter()
            .map(|&c| exact_sight(&stack, c, truth))
            .collect();
        assert_near(
            triangulate(&stack, &sights).unwrap().point,
            truth,
            RECOVERY_M,
            "triangulate through the wall",
        );
    }
}

/// Segment lengths of the light path from `sensor` to `object` through a single
/// interface: (in the observer's medium, in the object's medium).
fn segments(stack: &Stack, sensor: Vec3, object: Vec3) -> (f64, f64) {
    let path = line_of_sight(stack, sensor, object).unwrap();
    (
        (path.entry - sensor).length(),
        (object - path.exit).length(),
    )
}

#[test]
fn range_correction_recovers_true_points() {
    // A drone lidar 60 m up scanning ±20° (invented); group indices near 532 nm:
    // air 1.000 29, seawater 1.3758 (typical values, from memory; any positive
    // values must work).
    let stack = lagoon();
    let groups = GroupIndices::new(&[1.000_29, 1.3758]).unwrap();
    let sensors = [
        Vec3::new(0.0, 0.0, 60.0),
        Vec3::new(14.0, -6.0, 58.5),
        Vec3::new(-9.0, 12.0, 61.0),
    ];
    let mut worst: f64 = 0.0;
    let mut worst_phase: f64 = 0.0;
    let mut worst_naive: f64 = 0.0;
    let mut uncorrected_all = Vec::new();
    let mut sensors_all = Vec::new();
    let mut truths = Vec::new();
    for (k, &truth) in bed_points().iter().enumerate() {
        let sensor = sensors[k % sensors.len()];
        let (s_air, s_water) = segments(&stack, sensor, truth);
        // The reported range: the measured group path divided by the air group index.
        let g = 1.000_29 * s_air + 1.3758 * s_water;
        let dir = line_of_sight(&stack, sensor, truth).unwrap().direction;
        let uncorrected = sensor + dir * (g / 1.000_29);
        let fixed = correct_range(&stack, sensor, uncorrected, Some(&groups)).unwrap();
        let err = (fixed - truth).length();
        assert!(err <= RECOVERY_M, "range point {k}: error {err:.3e} m");
        worst = worst.max(err);
        // Without group indices (phase indices only) the point is off.
        let phase = correct_range(&stack, sensor, uncorrected, None).unwrap();
        worst_phase = worst_phase.max((phase - truth).length());
        // The naive fix: scale the apparent depth by n_air/n_water along the vertical.
        let naive = Vec3::new(uncorrected.x, uncorrected.y, uncorrected.z * N_AIR / N_SEA);
        worst_naive = worst_naive.max((naive - truth).length());
        uncorrected_all.push(uncorrected);
        sensors_all.push(sensor);
        truths.push(truth);
    }
    eprintln!(
        "ranges: worst error {worst:.2e} m; with phase instead of group indices {worst_phase:.3} m; vertical depth scaling {worst_naive:.3} m"
    );
    assert!(worst_phase > 1e-3);
    // The batch gives the same points.
    let mut out = vec![Vec3::ZERO; truths.len()];
    let mut status = vec![0i32; truths.len()];
    let report = correct_ranges(
        &stack,
        &sensors_all,
        &uncorrected_all,
        Some(&groups),
        &mut out,
        &mut status[..],
    )
    .unwrap();
    assert_eq!(report.failed, 0);
    for (k, &truth) in truths.iter().enumerate() {
        assert_near(out[k], truth, RECOVERY_M, "range batch");
    }
}

#[test]
fn ranges_ending_in_the_air_or_inside_a_layer() {
    // A sensor behind a 12 mm window (1.52) into water (1.333), normal +z
    // (invented housing, indices common practice); group indices from memory.
    let stack = Stack::new(
        Vec3::new(0.0, 0.0, 0.05),
        Vec3::new(0.0, 0.0, 1.0),
        1.0003,
        &[Layer::new(0.012, 1.52)],
        1.333,
    )
    .unwrap();
    let ng = [1.0003, 1.54, 1.36];
    let groups = GroupIndices::new(&ng).unwrap();
    let sensor = Vec3::new(0.01, -0.02, 0.0);
    let dir = Vec3::new(0.3, 0.1, 1.0);
    // Before the window: unchanged.
    let short = sensor + dir * 0.03;
    assert_eq!(
        correct_range(&stack, sensor, short, Some(&groups)).unwrap(),
        short
    );
    // Pointing away from the window: unchanged.
    let away = sensor - dir;
    assert_eq!(
        correct_range(&stack, sensor, away, Some(&groups)).unwrap(),
        away
    );
    // Inside the window: trace to the window, go 5 mm along the refracted ray.
    let d = dir.direction("dir").unwrap();
    let to_window = 0.05 / d.z;
    let entry = sensor + d * to_window;
    // Direction in glass by Snell's law (flatray::refract, tested elsewhere).
    let in_glass = flatray::refract(d, Vec3::new(0.0, 0.0, 1.0), 1.0003, 1.52).unwrap();
    let s_glass = 0.005;
    let inside = entry + in_glass * s_glass;
    let g = ng[0] * to_window + ng[1] * s_glass;
    let uncorrected = sensor + d * (g / ng[0]);
    let fixed = correct_range(&stack, sensor, uncorrected, Some(&groups)).unwrap();
    assert_near(fixed, inside, RECOVERY_M, "point inside the window");
    // Past the window, in the water: the traced ray, 0.8 m along.
    let out_ray = trace(&stack, Ray::new(sensor, dir)).unwrap().ray;
    let in_glass_len = (out_ray.origin - entry).length();
    let truth = out_ray.at(0.8);
    let g = ng[0] * to_window + ng[1] * in_glass_len + ng[2] * 0.8;
    let uncorrected = sensor + d * (g / ng[0]);
    let fixed = correct_range(&stack, sensor, uncorrected, Some(&groups)).unwrap();
    assert_near(fixed, truth, RECOVERY_M, "point in the water");
    let _ = segments; // single-interface helper, used above
}

#[test]
fn the_shortcut_is_off_for_an_oblique_one_sided_layout() {
    // A point near the edge of a drone block: one camera nearly overhead, two far
    // to one side, 30 to 35 m up (invented layout). Measured here: the shortcut
    // is off by 3 to 9 mm at 1 to 10 m depth while the uncorrected point is off by
    // 0.4 to 3.9 m; the exact solve recovers the point to rounding.
    let stack = lagoon();
    let cams = [
        Vec3::new(3.0, -1.0, 30.0),
        Vec3::new(30.0, 6.0, 32.0),
        Vec3::new(45.0, -10.0, 35.0),
    ];
    let mut worst: f64 = 0.0;
    for depth in [1.0, 3.0, 6.0, 10.0] {
        let truth = Vec3::new(0.0, 0.0, -depth);
        let seen = straight_point(&stack, &cams, truth);
        let exact = correct_multiview(&stack, &cams, seen).unwrap();
        assert_near(exact.point, truth, RECOVERY_M, "one-sided exact");
        let shortcut = correct_multiview_shortcut(&stack, &cams, seen).unwrap();
        let err = (shortcut.point - truth).length();
        eprintln!(
            "one-sided layout, depth {depth} m: uncorrected off by {:.3} m, shortcut by {err:.4} m, exact by {:.1e} m, straight-line rms miss {:.4} m",
            (seen - truth).length(),
            (exact.point - truth).length(),
            exact.rms_miss
        );
        worst = worst.max(err);
    }
    assert!(worst > 5e-3, "shortcut worst error {worst}");
}
