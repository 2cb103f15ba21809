//! Criterion benchmarks of the survey batches: sagittal true positions and laser
//! range corrections at 1e3, 1e5 and 1e6 points, on one thread and on all
//! threads (rayon's global pool), plus exact and shortcut multi-view
//! corrections at 1e3 points.
//!
//! Run: `cargo bench --bench survey`. Invented data.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, Throughput};
use flatray::survey::{correct_multiviews, correct_ranges, GroupIndices, Multiview, Views};
use flatray::{batch, Image, NoStatus, Stack, Status, Vec3};
use std::hint::black_box;
use std::time::Duration;

fn lake() -> Stack {
    Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.000_28, 1.339).unwrap()
}

/// Points on a 0.3 to 6.3 m deep floor under a 60 m flight line.
fn points(n: usize) -> (Vec<Vec3>, Vec<Vec3>) {
    let mut pts = Vec::with_capacity(n);
    let mut sensors = Vec::with_capacity(n);
    for i in 0..n {
        let along = (i % 10_000) as f64 * 0.2;
        let line = (i / 10_000) as f64 * 20.0;
        let across = ((i * 7919) % 3001) as f64 / 100.0 - 15.0;
        let depth = 0.3 + ((i * 104_729) % 6000) as f64 / 1000.0;
        pts.push(Vec3::new(along + 0.5, line + across, -depth));
        sensors.push(Vec3::new(along, line, 60.0));
    }
    (pts, sensors)
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

fn batches(c: &mut Criterion) {
    let stack = lake();
    let groups = GroupIndices::new(&[1.000_29, 1.3758]).unwrap();
    let mut g = c.benchmark_group("survey_batches");
    g.sample_size(10).measurement_time(Duration::from_secs(4));
    for n in [1_000usize, 100_000, 1_000_000] {
        let (pts, sensors) = points(n);
        let mut out = vec![Vec3::ZERO; n];
        let mut status = vec![Status::Ok; n];
        g.throughput(Throughput::Elements(n as u64));
        for (threads, pool) in pools() {
            g.bench_with_input(
                BenchmarkId::new(format!("true_positions_sagittal/{threads}"), n),
                &n,
                |b, _| {
                    b.iter(|| {
                        pool.install(|| {
                            batch::true_positions(
                                &stack,
                                black_box(&sensors),
                                black_box(&pts),
                                Image::Sagittal,
                                &mut out,
                                &mut status[..],
                            )
                            .unwrap()
                        })
                    })
                },
            );
            g.bench_with_input(
                BenchmarkId::new(format!("correct_ranges/{threads}"), n),
                &n,
                |b, _| {
                    b.iter(|| {
                        pool.install(|| {
                            correct_ranges(
                                &stack,
                                black_box(&sensors),
                                black_box(&pts),
                                Some(&groups),
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
    g.finish();
}

fn multiview(c: &mut Criterion) {
    let stack = lake();
    let cameras = [
        Vec3::new(-12.0, -3.0, 38.0),
        Vec3::new(4.0, -9.5, 41.5),
        Vec3::new(17.0, 2.0, 44.0),
        Vec3::new(9.0, 15.0, 52.0),
    ];
    let n = 1_000;
    let (pts, _) = points(n);
    let seen: Vec<Vec3> = pts
        .iter()
        .map(|p| Vec3::new(p.x * 0.05, p.y * 0.05, p.z * 0.75))
        .collect();
    let ids: Vec<u32> = (0..n).flat_map(|i| [0, 1, 2 + (i % 2) as u32]).collect();
    let offsets: Vec<usize> = (0..=n).map(|i| 3 * i).collect();
    let views = Views {
        cameras: &cameras,
        offsets: &offsets,
        ids: &ids,
    };
    let mut out = vec![Vec3::ZERO; n];
    let mut g = c.benchmark_group("multiview_3_views");
    g.sample_size(10).throughput(Throughput::Elements(n as u64));
    for (threads, pool) in pools() {
        for (name, method) in [
            ("exact", Multiview::Exact),
            ("shortcut", Multiview::Shortcut),
        ] {
            g.bench_function(BenchmarkId::new(format!("{name}/{threads}"), n), |b| {
                b.iter(|| {
                    pool.install(|| {
                        correct_multiviews(
                            &stack,
                            &views,
                            black_box(&seen),
                            method,
                            &mut out,
                            None,
                            &mut NoStatus,
                        )
                        .unwrap()
                    })
                })
            });
        }
    }
    g.finish();
}

criterion_group!(benches, batches, multiview);
criterion_main!(benches);
