//! Large batches run on every core with the `parallel` feature and give
//! bit-for-bit the same results as a one-thread run (each element is computed
//! by the same code whatever the split).
#![cfg(feature = "parallel")]

use flatray::survey::{
    correct_multiviews, correct_ranges, true_depths, true_position_covariances, Covariance,
    Multiview, Uncertainty, Views,
};
use flatray::{batch, Image, Path, Ray, Stack, Status, Vec3};

const N: usize = 20_000;

fn lake() -> Stack {
    Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.000_28, 1.339).unwrap()
}

/// Deterministic pseudo-random numbers in [0, 1) (a 64-bit LCG, Knuth's MMIX
/// constants), so the test needs no extra crate.
struct Lcg(u64);
impl Lcg {
    fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

fn bits(v: &[Vec3]) -> Vec<[u64; 3]> {
    v.iter()
        .map(|p| [p.x.to_bits(), p.y.to_bits(), p.z.to_bits()])
        .collect()
}

/// Run `f` on one thread and on the default pool; return both results.
fn both<T: Send>(f: impl Fn() -> T + Sync) -> (T, T) {
    let one = rayon::ThreadPoolBuilder::new()
        .num_threads(1)
        .build()
        .unwrap();
    let serial = one.install(&f);
    (serial, f())
}

#[test]
fn every_batch_is_identical_on_one_thread_and_on_all() {
    let stack = lake();
    let mut rng = Lcg(42);
    let points: Vec<Vec3> = (0..N)
        .map(|i| {
            if i % 997 == 0 {
                Vec3::new(f64::NAN, 0.0, -1.0) // some failures too
            } else {
                Vec3::new(
                    rng.next() * 60.0 - 30.0,
                    rng.next() * 60.0 - 30.0,
                    -rng.next() * 5.0,
                )
            }
        })
        .collect();
    let observers = [Vec3::new(0.0, 0.0, 50.0)];

    let (a, b) = both(|| {
        let mut out = vec![Vec3::ZERO; N];
        let mut st = vec![Status::Ok; N];
        let r = batch::true_positions(
            &stack,
            &observers,
            &points,
            Image::Sagittal,
            &mut out,
            &mut st[..],
        )
        .unwrap();
        (bits(&out), st, r)
    });
    assert_eq!(a, b);
    assert!(a.2.failed > 0);

    let (a, b) = both(|| {
        let mut out = vec![Vec3::ZERO; N];
        let mut st = vec![0i32; N];
        let r = batch::apparent_positions(
            &stack,
            &observers,
            &points,
            Image::Tangential,
            &mut out,
            &mut st[..],
        )
        .unwrap();
        (bits(&out), st, r)
    });
    assert_eq!(a, b);

    let (a, b) = both(|| {
        let mut out = vec![Path::NAN; N];
        let mut st = vec![Status::Ok; N];
        let r = batch::lines_of_sight(&stack, &observers, &points, &mut out, &mut st[..]).unwrap();
        let v: Vec<Vec3> = out
            .iter()
            .flat_map(|p| {
                [
                    p.direction,
                    p.entry,
                    p.exit,
                    Vec3::new(p.geometric_length, p.optical_length, p.transmittance),
                ]
            })
            .collect();
        (bits(&v), st, r)
    });
    assert_eq!(a, b);
    assert!(a.2.failed > 0);

    let rays: Vec<Ray> = points
        .iter()
        .map(|&p| Ray::new(observers[0], p - observers[0]))
        .collect();
    let (a, b) = both(|| {
        let mut out = vec![Ray::default(); N];
        let mut t = vec![0.0; N];
        let mut st = vec![Status::Ok; N];
        let r = batch::trace_rays(&stack, &rays, &mut out, Some(&mut t), &mut st[..]).unwrap();
        let o: Vec<Vec3> = out.iter().flat_map(|r| [r.origin, r.direction]).collect();
        (
            bits(&o),
            t.iter().map(|x| x.to_bits()).collect::<Vec<_>>(),
            st,
            r,
        )
    });
    assert_eq!(a, b);

    let (a, b) = both(|| {
        let mut out = vec![Vec3::ZERO; N];
        let mut st = vec![Status::Ok; N];
        let r = correct_ranges(&stack, &observers, &points, None, &mut out, &mut st[..]).unwrap();
        (bits(&out), st, r)
    });
    assert_eq!(a, b);

    let depths: Vec<f64> = points.iter().map(|p| -p.z).collect();
    let angles: Vec<f64> = (0..N).map(|i| (i % 80) as f64 * 0.017).collect();
    let (a, b) = both(|| {
        let mut out = vec![0.0; N];
        let mut st = vec![Status::Ok; N];
        let r = true_depths(
            &depths,
            &angles,
            1.000_28,
            1.339,
            Image::Sagittal,
            &mut out,
            &mut st[..],
        )
        .unwrap();
        (out.iter().map(|x| x.to_bits()).collect::<Vec<_>>(), st, r)
    });
    assert_eq!(a, b);

    let u = Uncertainty {
        offset_m: 0.02,
        n_object: 0.002,
        observer_m: 0.05,
        apparent_m: 0.03,
    };
    let (a, b) = both(|| {
        let mut out: Vec<Covariance> = vec![[[0.0; 3]; 3]; N];
        let mut st = vec![Status::Ok; N];
        let r = true_position_covariances(
            &stack,
            &observers,
            &points,
            Image::Sagittal,
            &u,
            &mut out,
            &mut st[..],
        )
        .unwrap();
        let flat: Vec<u64> = out
            .iter()
            .flatten()
            .flatten()
            .map(|x| x.to_bits())
            .collect();
        (flat, st, r)
    });
    assert_eq!(a, b);

    // Multi-view on a smaller set (each solve costs a few hundred line-of-sight solves).
    let cameras = [
        Vec3::new(-10.0, -5.0, 40.0),
        Vec3::new(12.0, 3.0, 44.0),
        Vec3::new(0.0, 15.0, 50.0),
    ];
    let m = 6_000;
    let ids: Vec<u32> = (0..m).flat_map(|i| [0, 1 + (i % 2) as u32]).collect();
    let offsets: Vec<usize> = (0..=m).map(|i| 2 * i).collect();
    let views = Views {
        cameras: &cameras,
        offsets: &offsets,
        ids: &ids,
    };
    let seen = &points[..m];
    let (a, b) = both(|| {
        let mut out = vec![Vec3::ZERO; m];
        let mut rms = vec![0.0; m];
        let mut st = vec![Status::Ok; m];
        let r = correct_multiviews(
            &stack,
            &views,
            seen,
            Multiview::Exact,
            &mut out,
            Some(&mut rms),
            &mut st[..],
        )
        .unwrap();
        (
            bits(&out),
            rms.iter().map(|x| x.to_bits()).collect::<Vec<_>>(),
            st,
            r,
        )
    });
    assert_eq!(a, b);
}
