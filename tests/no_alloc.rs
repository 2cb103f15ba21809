//! No heap allocation per point: a counting global allocator shows that the
//! per-point functions allocate nothing and that the allocations of a batch
//! (thread-pool bookkeeping at most) do not grow with the number of points.
//!
//! One test function, alone in this binary, so no other test allocates while it
//! counts.

use flatray::survey::{correct_range, correct_ranges, GroupIndices};
use flatray::{
    apparent_depth, apparent_position, batch, fresnel, line_of_sight, refract, trace,
    true_position, Image, Layer, NoStatus, Path, Ray, Stack, Status, Vec3,
};
use std::alloc::{GlobalAlloc, Layout, System};
use std::sync::atomic::{AtomicUsize, Ordering};

struct Counting;

static ALLOCATIONS: AtomicUsize = AtomicUsize::new(0);

unsafe impl GlobalAlloc for Counting {
    unsafe fn alloc(&self, layout: Layout) -> *mut u8 {
        ALLOCATIONS.fetch_add(1, Ordering::SeqCst);
        unsafe { System.alloc(layout) }
    }
    unsafe fn dealloc(&self, ptr: *mut u8, layout: Layout) {
        unsafe { System.dealloc(ptr, layout) }
    }
    unsafe fn realloc(&self, ptr: *mut u8, layout: Layout, new_size: usize) -> *mut u8 {
        ALLOCATIONS.fetch_add(1, Ordering::SeqCst);
        unsafe { System.realloc(ptr, layout, new_size) }
    }
}

#[global_allocator]
static GLOBAL: Counting = Counting;

fn allocations_during(f: impl FnOnce()) -> usize {
    let before = ALLOCATIONS.load(Ordering::SeqCst);
    f();
    ALLOCATIONS.load(Ordering::SeqCst) - before
}

fn port() -> Stack {
    Stack::new(
        Vec3::new(0.0, 0.0, 0.04),
        Vec3::new(0.0, 0.0, 1.0),
        1.0003,
        &[Layer::new(0.01, 1.52), Layer::new(0.002, 1.4)],
        1.34,
    )
    .unwrap()
}

#[test]
fn per_point_work_does_not_allocate() {
    let stack = port();
    let eye = Vec3::ZERO;
    let group = GroupIndices::new(&[1.0003, 1.53, 1.41, 1.37]).unwrap();
    let per_point = allocations_during(|| {
        for i in 0..2000 {
            let x = i as f64 * 1e-3;
            let object = Vec3::new(x, 0.3 - x, 1.0 + x);
            let _ = refract(Vec3::new(x, 0.1, 1.0), Vec3::new(0.0, 0.0, 1.0), 1.0, 1.5);
            let _ = fresnel(0.5, 1.0, 1.5);
            let _ = trace(&stack, Ray::new(eye, Vec3::new(x, 0.2, 1.0)));
            let _ = line_of_sight(&stack, eye, object);
            for image in [Image::Sagittal, Image::Tangential] {
                if let Ok(a) = apparent_position(&stack, eye, object, image) {
                    let _ = true_position(&stack, eye, a, image);
                }
            }
            let _ = apparent_depth(2.0, x, 1.0, 1.333, Image::Sagittal);
            let _ = correct_range(&stack, eye, object, Some(&group));
        }
    });
    assert_eq!(
        per_point, 0,
        "per-point functions allocated {per_point} times"
    );

    // Batches: allocations (the thread pool's, if any) must not grow with the
    // number of points. Warm the pool up first.
    let run = |n: usize| {
        let points: Vec<Vec3> = (0..n)
            .map(|i| Vec3::new(i as f64 * 1e-4, 0.1, 2.0))
            .collect();
        let mut out = vec![Vec3::ZERO; n];
        let mut status = vec![Status::Ok; n];
        let mut paths = vec![Path::NAN; n];
        let observers = [eye];
        allocations_during(|| {
            batch::true_positions(
                &stack,
                &observers,
                &points,
                Image::Sagittal,
                &mut out,
                &mut status[..],
            )
            .unwrap();
            batch::apparent_positions(
                &stack,
                &observers,
                &points,
                Image::Tangential,
                &mut out,
                &mut NoStatus,
            )
            .unwrap();
            correct_ranges(
                &stack,
                &observers,
                &points,
                Some(&group),
                &mut out,
                &mut status[..],
            )
            .unwrap();
            batch::lines_of_sight(&stack, &observers, &points, &mut paths, &mut status[..])
                .unwrap();
        })
    };
    run(50_000);
    let small = run(10_000);
    let large = run(200_000);
    // 190 000 more points per batch; a per-point allocation would add that many.
    assert!(
        large <= small + 64,
        "batch allocations grow with size: {small} for 10k points, {large} for 200k"
    );
}
