//! Criterion benchmarks of the hot paths: refraction, Fresnel, trace and line of
//! sight by layer count, images, and the batch true positions.
//!
//! Run: `cargo bench --bench geometry`.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, Throughput};
use flatray::{
    apparent_position, batch, fresnel, line_of_sight, refract, trace, true_position, Image, Layer,
    NoStatus, Ray, Stack, Vec3,
};
use std::hint::black_box;

/// Invented stacks with 0, 1 and 3 layers (water surface, camera port, tank wall).
fn stacks() -> [(usize, Stack); 3] {
    let n = Vec3::new(0.0, 0.0, 1.0);
    [
        (0, Stack::new(Vec3::ZERO, n, 1.0003, &[], 1.334).unwrap()),
        (
            1,
            Stack::new(Vec3::ZERO, n, 1.0003, &[Layer::new(0.01, 1.52)], 1.334).unwrap(),
        ),
        (
            3,
            Stack::new(
                Vec3::ZERO,
                n,
                1.0003,
                &[
                    Layer::new(0.01, 1.49),
                    Layer::new(0.002, 1.40),
                    Layer::new(0.01, 1.52),
                ],
                1.334,
            )
            .unwrap(),
        ),
    ]
}

fn interface(c: &mut Criterion) {
    let n = Vec3::new(0.0, 0.0, 1.0);
    c.bench_function("refract", |b| {
        b.iter(|| {
            refract(
                black_box(Vec3::new(0.3, 0.2, 0.9)),
                black_box(n),
                1.0,
                1.333,
            )
        })
    });
    c.bench_function("fresnel", |b| {
        b.iter(|| fresnel(black_box(0.8), 1.0, black_box(1.333)))
    });
}

fn tracing(c: &mut Criterion) {
    let mut g = c.benchmark_group("trace");
    for (layers, stack) in stacks() {
        let ray = Ray::new(Vec3::new(0.0, 0.0, -1.0), Vec3::new(0.3, 0.1, 1.0));
        g.bench_with_input(BenchmarkId::from_parameter(layers), &stack, |b, s| {
            b.iter(|| trace(s, black_box(ray)))
        });
    }
    g.finish();
}

fn sight(c: &mut Criterion) {
    let mut g = c.benchmark_group("line_of_sight");
    let observer = Vec3::new(0.0, 0.0, -2.0);
    for (layers, stack) in stacks() {
        for (name, object) in [
            ("near_normal", Vec3::new(0.2, 0.1, 3.0)),
            ("grazing", Vec3::new(300.0, 0.0, 3.0)),
        ] {
            g.bench_with_input(BenchmarkId::new(name, layers), &stack, |b, s| {
                b.iter(|| line_of_sight(s, black_box(observer), black_box(object)))
            });
        }
    }
    g.finish();
}

fn images(c: &mut Criterion) {
    let (_, stack) = stacks()[1];
    let observer = Vec3::new(0.0, 0.0, -2.0);
    let object = Vec3::new(1.2, 0.4, 3.0);
    let mut g = c.benchmark_group("image");
    for image in [Image::Sagittal, Image::Tangential] {
        let a = apparent_position(&stack, observer, object, image).unwrap();
        g.bench_function(
            BenchmarkId::new("apparent_position", format!("{image:?}")),
            |b| b.iter(|| apparent_position(&stack, black_box(observer), black_box(object), image)),
        );
        g.bench_function(
            BenchmarkId::new("true_position", format!("{image:?}")),
            |b| b.iter(|| true_position(&stack, black_box(observer), black_box(a), image)),
        );
    }
    g.finish();
}

fn batches(c: &mut Criterion) {
    let (_, stack) = stacks()[0];
    let observer = [Vec3::new(0.0, 0.0, -30.0)];
    let mut g = c.benchmark_group("batch_true_positions_sagittal");
    for n in [1_000usize, 100_000] {
        let apparent: Vec<Vec3> = (0..n)
            .map(|i| {
                Vec3::new(
                    (i % 100) as f64 * 0.3,
                    (i / 100 % 100) as f64 * 0.3,
                    1.0 + (i % 7) as f64,
                )
            })
            .collect();
        let mut out = vec![Vec3::ZERO; n];
        g.throughput(Throughput::Elements(n as u64));
        g.bench_with_input(BenchmarkId::from_parameter(n), &apparent, |b, a| {
            b.iter(|| {
                batch::true_positions(
                    &stack,
                    &observer,
                    a,
                    Image::Sagittal,
                    &mut out,
                    &mut NoStatus,
                )
            })
        });
    }
    g.finish();
}

criterion_group!(benches, interface, tracing, sight, images, batches);
criterion_main!(benches);
