//! Every function called from many threads at once gives exactly the results
//! of a single-threaded run: flatray has no global mutable state.
//!
//! The work list covers the Rust API and the C ABI (through its Rust
//! declarations); each thread runs the whole list many times, interleaved with
//! the others, and compares bit for bit.

use flatray::capi::*;
use flatray::{
    apparent_depth, apparent_position, batch, critical_angle, fresnel, line_of_sight, refract,
    trace, true_depth, true_position, Image, Layer, NoStatus, Ray, Stack, Vec3,
};
use std::sync::Arc;

/// One run of every function over fixed inputs, flattened to bits.
fn run_all(stack: &Stack, c_stack: &FlatrayStack) -> Vec<u64> {
    let mut out: Vec<f64> = Vec::new();
    let n = Vec3::new(0.0, 0.0, 1.0);
    for k in 0..20 {
        let x = k as f64 * 0.37 - 3.0;
        let d = Vec3::new(x * 0.1, 0.2, 1.0);
        out.push(refract(d, n, 1.0, 1.5).map_or(f64::NAN, |v| v.x));
        out.push(fresnel(0.05 * k as f64, 1.0, 1.5).map_or(f64::NAN, |f| f.r));
        out.push(critical_angle(1.5 + 0.01 * k as f64, 1.0).unwrap_or(f64::NAN));
        let object = Vec3::new(x, 0.5 * x, 1.0 + k as f64 * 0.1);
        let observer = Vec3::new(0.1, -0.2, -0.7);
        out.push(line_of_sight(stack, observer, object).map_or(f64::NAN, |p| p.optical_length));
        out.push(trace(stack, Ray::new(observer, d)).map_or(f64::NAN, |t| t.transmittance));
        for image in [Image::Sagittal, Image::Tangential] {
            let a = apparent_position(stack, observer, object, image).unwrap_or(Vec3::NAN);
            out.extend([a.x, a.y, a.z]);
            out.push(true_position(stack, observer, a, image).map_or(f64::NAN, |v| v.z));
            out.push(
                apparent_depth(1.0 + x.abs(), 0.04 * k as f64, 1.0, 1.333, image)
                    .unwrap_or(f64::NAN),
            );
            out.push(
                true_depth(1.0 + x.abs(), 0.04 * k as f64, 1.0, 1.333, image).unwrap_or(f64::NAN),
            );
        }
        // The C ABI, including an error path that writes NaN.
        let mut v = Vec3::ZERO;
        unsafe {
            flatray_apparent_position(c_stack, observer, object, 1, &mut v);
        }
        out.extend([v.x, v.y, v.z]);
        let mut path = flatray::Path::NAN;
        unsafe {
            flatray_line_of_sight(c_stack, observer, Vec3::new(0.0, 0.0, -5.0), &mut path);
        }
        out.push(path.geometric_length);
    }
    // Batches, both Rust and C.
    let points: Vec<Vec3> = (0..200)
        .map(|i| Vec3::new(i as f64 * 0.05, 0.3, 0.2 + i as f64 * 0.01))
        .collect();
    let observers = [Vec3::new(0.0, 0.0, -1.0)];
    let mut res = vec![Vec3::ZERO; points.len()];
    batch::apparent_positions(
        stack,
        &observers,
        &points,
        Image::Tangential,
        &mut res,
        &mut NoStatus,
    )
    .unwrap();
    out.extend(res.iter().flat_map(|v| [v.x, v.y, v.z]));
    let mut status = vec![0i32; points.len()];
    unsafe {
        flatray_true_positions(
            c_stack,
            observers.as_ptr(),
            1,
            points.as_ptr(),
            points.len(),
            0,
            res.as_mut_ptr(),
            status.as_mut_ptr(),
        );
    }
    out.extend(res.iter().flat_map(|v| [v.x, v.y, v.z]));
    out.extend(status.iter().map(|&s| f64::from(s)));
    let mut paths = vec![flatray::Path::NAN; points.len()];
    unsafe {
        flatray_lines_of_sight(
            c_stack,
            observers.as_ptr(),
            1,
            points.as_ptr(),
            points.len(),
            paths.as_mut_ptr(),
            status.as_mut_ptr(),
        );
    }
    out.extend(
        paths
            .iter()
            .flat_map(|p| [p.direction.x, p.exit.y, p.optical_length]),
    );
    out.extend(status.iter().map(|&s| f64::from(s)));
    // Refractive indices, a camera behind the port, survey corrections.
    for k in 0..10 {
        let t = 2.0 + 2.5 * k as f64;
        out.push(
            flatray::PureWater::new(t, 2e5)
                .refractive_index(450.0 + 20.0 * k as f64)
                .unwrap_or(f64::NAN),
        );
        out.push(
            flatray::Seawater::new(t, 35.0)
                .group_index(532.0)
                .unwrap_or(f64::NAN),
        );
        out.push(
            flatray::Air::new(t, 101_325.0, 0.3)
                .refractive_index(532.0)
                .unwrap_or(f64::NAN),
        );
    }
    let camera = flatray::camera::PortCamera::new(
        flatray::camera::Lens::pinhole(1400.0, 1400.0, 960.0, 540.0)
            .with_distortion(-0.1, 0.02, 0.0, 1e-4, -2e-4),
        *stack,
    );
    if let Ok(camera) = camera {
        for k in 0..20 {
            let (u, v) = (100.0 + 80.0 * k as f64, 60.0 + 40.0 * k as f64);
            let ray = camera.pixel_to_ray(u, v).unwrap_or(Ray::NAN);
            out.extend([ray.direction.x, ray.direction.y]);
            let (pu, pv) = camera
                .point_to_pixel(ray.at(2.0))
                .unwrap_or((f64::NAN, f64::NAN));
            out.extend([pu, pv]);
        }
    }
    let cameras = [
        Vec3::new(-3.0, 0.0, -20.0),
        Vec3::new(4.0, 1.0, -25.0),
        Vec3::new(0.5, -6.0, -18.0),
    ];
    for k in 0..10 {
        let apparent = Vec3::new(k as f64 * 0.3, 1.0, 1.5);
        let p = flatray::survey::correct_multiview(stack, &cameras, apparent)
            .map_or(Vec3::NAN, |r| r.point);
        out.extend([p.x, p.y, p.z]);
        let r =
            flatray::survey::correct_range(stack, cameras[0], apparent, None).unwrap_or(Vec3::NAN);
        out.extend([r.x, r.y, r.z]);
    }
    out.into_iter().map(f64::to_bits).collect()
}

#[test]
fn many_threads_give_the_single_threaded_results() {
    let stack = Stack::new(
        Vec3::ZERO,
        Vec3::new(0.0, 0.1, 1.0),
        1.0003,
        &[Layer::new(0.012, 1.52), Layer::new(0.003, 1.33)],
        1.34,
    )
    .unwrap();
    let c_stack = FlatrayStack::from_stack(&stack);
    let expected = Arc::new(run_all(&stack, &c_stack));
    let threads: Vec<_> = (0..8)
        .map(|_| {
            let expected = Arc::clone(&expected);
            std::thread::spawn(move || {
                for _ in 0..25 {
                    assert!(
                        run_all(&stack, &c_stack) == *expected,
                        "a thread saw different results"
                    );
                }
            })
        })
        .collect();
    for t in threads {
        t.join().expect("thread panicked");
    }
}
