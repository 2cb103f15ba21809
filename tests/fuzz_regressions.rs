//! Inputs found by the fuzzers (fuzz/), kept as regression tests.
//!
//! Each case is the decoded form of a crash artifact; the comment says what
//! went wrong before the fix.

use flatray::capi::*;
use flatray::{refract, Error, Ray, Vec3};

/// Equal tiny indices (1e-300): the squared indices underflowed to zero and the
/// refracted direction came out wrong with an OK status. Fixed by computing
/// with index ratios (`interface::projected_ratio`).
#[test]
fn tiny_equal_indices_leave_the_direction_unchanged() {
    let d = Vec3::new(0.023_430_606_618_057_93, 1e-300, f64::MAX);
    let n = Vec3::new(1e-300, 1e-300, 1e-300);
    let t = refract(d, n, 1e-300, 1e-300).unwrap();
    let expected = d.try_normalize().unwrap();
    assert!((t - expected).length() < 1e-15, "{t:?}");
}

/// An observer's index of 1e-300 against layers of about 2: the index ratio
/// 2e300 overflowed the Fresnel products and the transmittance was NaN with an
/// OK status. Now the ratio is checked (at most 1e100): OUT_OF_RANGE.
#[test]
fn absurd_index_ratios_are_out_of_range_not_nan() {
    let stack = FlatrayStack {
        origin: Vec3::new(1.169_921_874_999_999_8, 2.200_000_000_000_245_3, 2.2),
        normal: Vec3::new(
            1e-300,
            7.117_503_049_684_752e-38,
            4.483_094_640_249_105e-120,
        ),
        n_observer: 1e-300,
        layer_count: 2,
        thickness: [
            2.011_764_705_882_353,
            2.011_764_705_882_353,
            1.0,
            2.0,
            2.0,
            2.0,
            2.2,
            2.0,
        ],
        n_layer: [
            2.011_754_602_895_063_5,
            2.011_764_705_882_321,
            f64::NAN,
            2.0,
            2.0,
            2.2,
            2.2,
            2.0,
        ],
        n_object: 2.011_764_705_882_354,
    };
    let ray = Ray::new(
        Vec3::new(
            2.011_764_705_882_353,
            2.011_764_705_882_353,
            2.011_764_705_882_353,
        ),
        Vec3::new(2.011_764_705_995_585, 2.011_764_705_882_353, 2.2),
    );
    let mut out = Ray::NAN;
    let mut t = 0.0;
    let status = unsafe { flatray_trace(&stack, ray, &mut out, &mut t) };
    assert_eq!(status, FlatrayStatus::FLATRAY_ERR_OUT_OF_RANGE);
    assert!(t.is_nan() && out.origin.x.is_nan());
    assert!(matches!(
        flatray::trace(&stack.to_stack().unwrap(), ray),
        Err(Error::OutOfRange(_))
    ));
}

/// A ray 4e-9 rad from the normal going from index 0.05 into 4.5e-14 (η ≈ 1e-12):
/// sin θ_t would be about 5000, so this is total internal reflection. The
/// cosine rounded to 1 and `η² − 1 + cos²` came out non-negative; the sine is
/// now computed directly for η < 1.
#[test]
fn near_normal_ray_into_a_far_thinner_medium_is_reflected() {
    let d = Vec3::new(
        0.049_999_999_999_999_996,
        0.049_999_999_999_999_996,
        0.049_999_999_627_470_97,
    );
    let n = Vec3::new(
        0.049_999_999_999_999_996,
        0.049_999_999_999_999_996,
        0.049_999_999_999_999_996,
    );
    assert!(matches!(
        refract(d, n, 0.05, 4.546_918_397_352_329e-14),
        Err(Error::TotalInternalReflection(_))
    ));
}

/// Nearly equal indices through seven layers: 4uv/(u + v)² rounded to
/// 1 + 2.2e-16 and the transmittance exceeded 1. Now clamped.
#[test]
fn transmittance_never_exceeds_one() {
    let n = 0.701_960_784_313_725_4;
    let mut layers = [flatray::Layer::new(0.7, n); 7];
    layers[1].index = 0.701_960_784_313_722_3;
    let stack = flatray::Stack::new(
        Vec3::new(20.78, 20.78, 70.19),
        Vec3::new(1.0, 1.0, 1.0),
        n,
        &layers,
        n,
    )
    .unwrap();
    let ray = Ray::new(
        Vec3::new(0.70, 0.21, 20.78),
        Vec3::new(20.78, 5.56e-309, 99.999),
    );
    let t = flatray::trace(&stack, ray).unwrap().transmittance;
    assert!(t <= 1.0, "transmittance {t}");
}

/// The length of a vector with subnormal components was NaN (1/m overflowed).
#[test]
fn subnormal_vectors_have_a_length() {
    assert_eq!(
        Vec3::new(3.435_361_644_027e-311, 0.0, 0.0).length(),
        3.435_361_644_027e-311
    );
    assert!(Vec3::new(5e-324, 5e-324, 0.0).length() > 0.0);
}

/// A NaN temperature beside a finite, out-of-range wavelength (media target):
/// the wavelength was range-checked first and the call returned OUT_OF_RANGE,
/// against the rule that a NaN or infinite argument is INVALID_ARGUMENT. Now
/// every model checks all its inputs for finiteness before any range.
#[test]
fn nan_beside_an_out_of_range_value_is_invalid() {
    let mut n = 0.0;
    let status = unsafe { flatray_index_pure_water(f64::NAN, -1.1e7, -15.0, &mut n) };
    assert_eq!(status, FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT);
    assert!(n.is_nan());
}

/// A ray along the normal into a layer of index 5.6e-309 below an observer's
/// 1e-300 (η ≈ 6e-9): the rounding residue of the tangential part along the
/// normal, multiplied by 1/q ≈ 4e6 per metre, put the traced ray 6.5e-10 m off
/// the last interface. The tangential part is now projected twice.
#[test]
fn traced_rays_stay_on_the_last_interface_through_a_much_thinner_layer() {
    let tiny = 5.562_684_646_268_003e-309;
    let stack = FlatrayStack {
        origin: Vec3::new(0.017_059_326_167_720_63, 1e-300, 1e-300),
        normal: Vec3::new(1e-300, -0.0, 1e-300),
        n_observer: 1e-300,
        layer_count: 7,
        thickness: [
            1e-300,
            1e-300,
            1e-300,
            0.022_941_176_470_612_84,
            tiny,
            tiny,
            tiny,
            tiny,
        ],
        n_layer: [1e-300, 1e-300, 1e-300, tiny, tiny, tiny, tiny, tiny],
        n_object: 1e-300,
    };
    let ray = Ray::new(Vec3::new(tiny, tiny, tiny), Vec3::new(1e-300, 0.0, 1e-300));
    let s = stack.to_stack().unwrap();
    let out = flatray::trace(&s, ray).unwrap();
    let off = s.height(out.ray.origin) - s.total_thickness();
    assert!(off.abs() < 1e-12, "{off:e} m off the last interface");
}

/// Nearly equal indices along a solved line of sight: the rounding of the
/// scaled projections made 4(us)(vs) exceed 1 by an ulp, and the path's
/// transmittance was 1.0000000000000002. Transmittances are clamped to 1.
#[test]
fn line_of_sight_transmittance_never_exceeds_one() {
    let stack = FlatrayStack {
        origin: Vec3::new(59.999_425_457_973_096, 2.2, 2.499_999_999_999_999),
        normal: Vec3::new(
            0.049_999_999_999_999_996,
            0.045_686_274_509_803_934,
            0.600_888_480_392_156_8,
        ),
        n_observer: 2.011_764_705_882_353,
        layer_count: 2,
        thickness: [
            2.011_764_705_882_353,
            2.011_764_710_073_304_5,
            0.0,
            0.0,
            0.0,
            0.0,
            0.0,
            0.0,
        ],
        n_layer: [
            2.011_764_705_882_353,
            2.011_764_705_881_750_7,
            0.0,
            0.0,
            0.0,
            0.0,
            0.0,
            0.0,
        ],
        n_object: 2.011_764_705_882_350_2,
    };
    let path = flatray::line_of_sight(
        &stack.to_stack().unwrap(),
        Vec3::new(2.2, 2.205_859_375, 2.011_764_705_882_353),
        Vec3::new(
            2.011_764_672_703_986,
            20.784_313_725_490_19,
            20.785_522_460_888_185,
        ),
    )
    .unwrap();
    assert!(path.transmittance <= 1.0, "{}", path.transmittance);
}

/// Camera target: `flatray_remap_error` returned OK with an infinite RMS for a
/// lens with an absurd focal length (pixel errors near 1e200 px, whose squares
/// overflowed). The case below has the same cause (focal lengths of 1e300 px).
/// Now the RMS is accumulated scaled by the running maximum (finite whenever
/// the maximum is), and a maximum too large to represent is OUT_OF_RANGE.
#[test]
fn huge_remap_errors_are_finite_or_out_of_range() {
    let lens = flatray::camera::Lens::pinhole(1e300, 1e300, 0.0, 0.0);
    let target = flatray::camera::Lens::pinhole(1000.0, 1000.0, 3.5, 3.5);
    let port = FlatrayStack {
        origin: Vec3::new(0.0, 0.0, 0.03),
        normal: Vec3::new(0.0, 0.0, 1.0),
        n_observer: 1.0,
        layer_count: 1,
        thickness: [0.008, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0],
        n_layer: [1.52, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0],
        n_object: 1.333,
    };
    let (mut max, mut rms) = (0.0, 0.0);
    let status =
        unsafe { flatray_remap_error(&lens, &port, &target, 1.0, 10.0, 8, 8, &mut max, &mut rms) };
    match status {
        FlatrayStatus::FLATRAY_OK => {
            assert!(
                max.is_finite() && rms.is_finite() && rms <= max,
                "{max} {rms}"
            )
        }
        FlatrayStatus::FLATRAY_ERR_OUT_OF_RANGE => assert!(max.is_nan() && rms.is_nan()),
        other => panic!("{other:?}"),
    }
}

/// Camera target: `flatray_remap_table` wrote an entry with a finite u and an
/// infinite v: the exact pixel (about 1e300 with absurd focal lengths) is
/// finite as a double but not as a float. Such an entry is now NaN in both maps,
/// like an invisible point. (Constructed case with the same cause.)
#[test]
fn remap_entries_beyond_float_range_are_nan_in_both_maps() {
    let lens = flatray::camera::Lens::pinhole(1e300, 1e300, 0.0, 0.0);
    // Column 3 looks straight ahead in x: its u is finite, its v is not.
    let target = flatray::camera::Lens::pinhole(1000.0, 1000.0, 3.0, 3.5);
    let port = FlatrayStack {
        origin: Vec3::new(0.0, 0.0, 0.03),
        normal: Vec3::new(0.0, 0.0, 1.0),
        n_observer: 1.0,
        layer_count: 0,
        thickness: [0.0; 8],
        n_layer: [0.0; 8],
        n_object: 1.333,
    };
    let (mut mu, mut mv) = ([0f32; 64], [0f32; 64]);
    let status = unsafe {
        flatray_remap_table(
            &lens,
            &port,
            &target,
            2.0,
            8,
            8,
            mu.as_mut_ptr(),
            mv.as_mut_ptr(),
            64,
        )
    };
    assert_eq!(status, FlatrayStatus::FLATRAY_OK);
    for (u, v) in mu.iter().zip(&mv) {
        assert!(
            (u.is_finite() && v.is_finite()) || (u.is_nan() && v.is_nan()),
            "{u} {v}"
        );
    }
}

/// Finite but enormous standard deviations (1.8e308 m for the observer) made
/// the propagated covariance infinite with an OK status. Now OUT_OF_RANGE.
#[test]
fn covariance_overflow_is_out_of_range() {
    let stack =
        flatray::Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, 1.0), 1.0, 1.33).unwrap();
    let c_stack = FlatrayStack::from_stack(&stack);
    let mut cov = [0.0; 9];
    let status = unsafe {
        flatray_true_position_covariance(
            &c_stack,
            Vec3::new(0.0, 0.0, -1.0),
            Vec3::new(0.5, 0.0, 1.0),
            0,
            0.01,
            0.001,
            f64::MAX,
            0.01,
            cov.as_mut_ptr(),
        )
    };
    assert_eq!(status, FlatrayStatus::FLATRAY_ERR_OUT_OF_RANGE);
    assert!(cov.iter().all(|v| v.is_nan()));
}

/// Lines around 1e272 m: the squared miss distances overflowed and the RMS miss
/// came back infinite with an OK status. The sum is now scaled; an RMS beyond
/// f64 is OUT_OF_RANGE.
#[test]
fn rms_miss_of_far_lines_is_finite() {
    let big = 2.068_428_470_140_581e272;
    let a = Ray::new(Vec3::new(big, 0.99 * big, 0.0), Vec3::new(1.0, 1.0, 1.0));
    let b = Ray::new(Vec3::new(0.0, 0.0, big), Vec3::new(0.0, 1.0, -0.004));
    match flatray::lines::intersect(&[a, b]) {
        Ok(hit) => assert!(hit.rms_miss.is_finite() && hit.point.is_finite(), "{hit:?}"),
        Err(e) => assert!(
            matches!(e, Error::OutOfRange(_) | Error::Degenerate(_)),
            "{e}"
        ),
    }
}
