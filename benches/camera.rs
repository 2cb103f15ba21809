//! Criterion benchmarks of the flat-port camera: back-projection, forward
//! projection and a full-HD remap table on one thread.
//!
//! Run: `cargo bench --bench camera`.

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use flatray::camera::{Lens, PortCamera};
use flatray::{Layer, Stack, Vec3};
use std::hint::black_box;

const W: u32 = 1920;
const H: u32 = 1080;

/// An invented inspection camera: a wide lens with barrel distortion behind an
/// 8 mm glass port 30 mm in front of it; one perpendicular and one tilted port.
fn cameras() -> [(&'static str, PortCamera); 2] {
    let lens = Lens::pinhole(1450.0, 1450.0, 959.5, 539.5)
        .with_distortion(-0.18, 0.045, -0.004, 3e-4, -2e-4);
    let glass = [Layer::new(0.008, 1.52)];
    let straight = Stack::new(
        Vec3::new(0.0, 0.0, 0.03),
        Vec3::new(0.0, 0.0, 1.0),
        1.000_28,
        &glass,
        1.339,
    )
    .unwrap();
    let tilted = Stack::new(
        Vec3::new(0.004, -0.002, 0.03),
        Vec3::new(0.05, -0.03, 1.0),
        1.000_28,
        &glass,
        1.339,
    )
    .unwrap();
    [
        ("straight port", PortCamera::new(lens, straight).unwrap()),
        ("tilted port", PortCamera::new(lens, tilted).unwrap()),
    ]
}

fn projections(c: &mut Criterion) {
    let mut g = c.benchmark_group("camera");
    for (name, cam) in cameras() {
        g.bench_function(format!("pixel_to_ray/{name}"), |b| {
            b.iter(|| cam.pixel_to_ray(black_box(1700.0), black_box(230.0)))
        });
        let p = Vec3::new(0.6, -0.3, 2.5);
        g.bench_function(format!("point_to_pixel/{name}"), |b| {
            b.iter(|| cam.point_to_pixel(black_box(p)))
        });
    }
    g.finish();
}

fn remap(c: &mut Criterion) {
    let mut g = c.benchmark_group("remap_table_1920x1080");
    g.sample_size(10);
    g.throughput(Throughput::Elements(u64::from(W) * u64::from(H)));
    let n = (W * H) as usize;
    let mut mu = vec![0.0f32; n];
    let mut mv = vec![0.0f32; n];
    for (name, cam) in cameras() {
        let (fxw, fyw) = cam.focal_length_in_water().unwrap();
        let target = Lens::pinhole(fxw, fyw, 959.5, 539.5);
        g.bench_function(name, |b| {
            b.iter(|| {
                cam.remap_table(&target, black_box(2.0), W, H, &mut mu, &mut mv)
                    .unwrap()
            })
        });
    }
    g.finish();
}

criterion_group!(benches, projections, remap);
criterion_main!(benches);
