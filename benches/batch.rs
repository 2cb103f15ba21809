//! Criterion benchmarks of the geometry batches at 1e3, 1e5 and 1e6 elements,
//! on one thread and on all threads (rayon's global pool): batch lines of sight
//! through 1 and 3 layers, batch traces through 1 layer and batch sagittal
//! apparent positions. (The survey batches, sagittal true positions and range
//! corrections, are in `benches/survey.rs`.)
//!
//! Run: `cargo bench --bench batch`. Invented scenes.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, Throughput};
use flatray::{batch, Image, Layer, Path, Ray, Stack, Status, Vec3};
use std::hint::black_box;
use std::time::Duration;

const SIZES: [usize; 3] = [1_000, 100_000, 1_000_000];

/// A camera port (air, 10 mm glass, water) and a tank seen through a port
/// (8 mm glass, 4 mm air gap, 120 mm acrylic, water).
fn stacks() -> [(&'static str, Stack); 2] {
    let n = Vec3::new(0.0, 0.0, 1.0);
    [
        (
            "1_layer",
            Stack::new(
                Vec3::new(0.0, 0.0, 0.04),
                n,
                1.000_28,
                &[Layer::new(0.010, 1.52)],
                1.339,
            )
            .unwrap(),
        ),
        (
            "3_layers",
            Stack::new(
                Vec3::new(0.0, 0.0, 0.05),
                n,
                1.000_28,
                &[
                    Layer::new(0.008, 1.52),
                    Layer::new(0.004, 1.000_28),
                    Layer::new(0.120, 1.49),
                ],
                1.333,
            )
            .unwrap(),
        ),
    ]
}

/// Deterministic object points 0.25 to 3 m in front of the camera, up to
/// 1.5 m to the side (view angles up to about 80 degrees).
fn objects(n: usize) -> Vec<Vec3> {
    (0..n)
        .map(|i| {
            let a = ((i * 7919) % 3001) as f64 / 1000.0 - 1.5;
            let b = ((i * 104_729) % 2999) as f64 / 1000.0 - 1.5;
            let z = 0.25 + ((i * 15_485_863) % 2750) as f64 / 1000.0;
            Vec3::new(a, b, z)
        })
        .collect()
}

/// Rays from the camera centre over a 90-degree field of view.
fn rays(n: usize) -> Vec<Ray> {
    let side = (n as f64).sqrt().ceil() as usize;
    (0..n)
        .map(|i| {
            let x = (i % side) as f64 / side as f64 * 2.0 - 1.0;
            let y = (i / side) as f64 / side as f64 * 2.0 - 1.0;
            Ray::new(Vec3::ZERO, Vec3::new(x, y, 1.0))
        })
        .collect()
}

fn pools() -> [(&'static str, rayon::ThreadPool); 2] {
    [
        (
            "1_thread",
            rayon::ThreadPoolBuilder::new()
                .num_threads(1)
                .build()
                .unwrap(),
        ),
        (
            "all_threads",
            rayon::ThreadPoolBuilder::new().build().unwrap(),
        ),
    ]
}

fn lines_of_sight(c: &mut Criterion) {
    let mut g = c.benchmark_group("batch_lines_of_sight");
    g.sample_size(10).measurement_time(Duration::from_secs(3));
    let camera = [Vec3::ZERO];
    for (layers, stack) in stacks() {
        for n in SIZES {
            let pts = objects(n);
            let mut out = vec![Path::NAN; n];
            let mut status = vec![Status::Ok; n];
            g.throughput(Throughput::Elements(n as u64));
            for (threads, pool) in pools() {
                g.bench_with_input(
                    BenchmarkId::new(format!("{layers}/{threads}"), n),
                    &n,
                    |b, _| {
                        b.iter(|| {
                            pool.install(|| {
                                batch::lines_of_sight(
                                    &stack,
                                    &camera,
                                    black_box(&pts),
                                    &mut out,
                                    &mut status[..],
                                )
                                .unwrap()
                            })
                        })
                    },
                );
            }
        }
    }
    g.finish();
}

fn traces_and_images(c: &mut Criterion) {
    let (_, port) = &stacks()[0];
    let camera = [Vec3::ZERO];
    let mut g = c.benchmark_group("batch_geometry");
    g.sample_size(10).measurement_time(Duration::from_secs(3));
    for n in SIZES {
        let rs = rays(n);
        let pts = objects(n);
        let mut traced = vec![Ray::default(); n];
        let mut transmittance = vec![0.0; n];
        let mut seen = vec![Vec3::ZERO; n];
        let mut status = vec![Status::Ok; n];
        g.throughput(Throughput::Elements(n as u64));
        for (threads, pool) in pools() {
            g.bench_with_input(
                BenchmarkId::new(format!("trace_rays_1_layer/{threads}"), n),
                &n,
                |b, _| {
                    b.iter(|| {
                        pool.install(|| {
                            batch::trace_rays(
                                port,
                                black_box(&rs),
                                &mut traced,
                                Some(&mut transmittance),
                                &mut status[..],
                            )
                            .unwrap()
                        })
                    })
                },
            );
            g.bench_with_input(
                BenchmarkId::new(format!("apparent_positions_sagittal_1_layer/{threads}"), n),
                &n,
                |b, _| {
                    b.iter(|| {
                        pool.install(|| {
                            batch::apparent_positions(
                                port,
                                &camera,
                                black_box(&pts),
                                Image::Sagittal,
                                &mut seen,
                                &mut status[..],
                            )
                            .unwrap()
                        })
                    })
                },
            );
        }
    }
    g.finish();
}

criterion_group!(benches, lines_of_sight, traces_and_images);
criterion_main!(benches);
