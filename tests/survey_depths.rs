//! Depth tables and the correction factor against viewing angle.

mod common;

use common::assert_close;
use flatray::survey::{
    apparent_depths, correction_factor, correction_factors, nadir_correction_factor, true_depths,
    CLEAR_WATER_NADIR_FACTOR,
};
use flatray::{apparent_depth, true_depth, Image, NoStatus, Status};

/// Air and clear fresh water near 550 nm: 1.000 28 and 1.335 (typical values,
/// from memory).
const N_AIR: f64 = 1.000_28;
const N_WATER: f64 = 1.335;

#[test]
fn nadir_factor_is_the_index_ratio_practitioners_use() {
    // Westaway, Lane and Hicks (2001, Photogramm. Eng. Remote Sens. 67(11)) correct
    // apparent depths by the single factor 1.34 for clear water seen from air.
    for image in [Image::Sagittal, Image::Tangential] {
        let k0 = correction_factor(0.0, N_AIR, N_WATER, image).unwrap();
        // At nadir the factor is n_water/n_air exactly (paraxial limit), up to the
        // rounding of one division and one square root.
        assert_close(k0, N_WATER / N_AIR, 4e-16 * k0, "nadir factor");
        // 1.335/1.000 28 = 1.3346. The constant 1.34 is a rounded index of water;
        // fresh water across the visible band and 0 to 30 °C spans about 1.331 to
        // 1.344 (IAPWS R9-97, from memory), so the two agree within 0.01.
        assert_close(k0, CLEAR_WATER_NADIR_FACTOR, 0.01, "Westaway et al. 2001");
        // Tending to it: just off nadir the factor is within (angle)² of it.
        let k_small = correction_factor(1e-4, N_AIR, N_WATER, image).unwrap();
        assert!((k_small - k0).abs() < 1e-7 && k_small > k0);
    }
    assert_close(
        nadir_correction_factor(N_AIR, N_WATER).unwrap(),
        N_WATER / N_AIR,
        0.0,
        "nadir helper",
    );
}

#[test]
fn factor_grows_with_viewing_angle_and_the_tangential_faster() {
    let angles: Vec<f64> = (0..=80).map(|d| (d as f64).to_radians()).collect();
    let mut sag = vec![0.0; angles.len()];
    let mut tan = vec![0.0; angles.len()];
    correction_factors(
        &angles,
        N_AIR,
        N_WATER,
        Image::Sagittal,
        &mut sag,
        &mut NoStatus,
    )
    .unwrap();
    correction_factors(
        &angles,
        N_AIR,
        N_WATER,
        Image::Tangential,
        &mut tan,
        &mut NoStatus,
    )
    .unwrap();
    for w in sag.windows(2).chain(tan.windows(2)) {
        assert!(w[1] > w[0], "not increasing: {w:?}");
    }
    for i in 1..angles.len() {
        assert!(tan[i] > sag[i]);
    }
    // Closed form at 40° (Snell's law; sagittal (n₂/n₁) cos θ₂ / cos θ₁,
    // tangential its cube, DESIGN.md): checked independently here.
    let t1 = 40f64.to_radians();
    let t2 = (N_AIR * t1.sin() / N_WATER).asin();
    let r = (N_WATER / N_AIR) * t2.cos() / t1.cos();
    let r3 = (N_WATER / N_AIR) * (t2.cos() / t1.cos()).powi(3);
    // A few roundings through sin, asin and cos: 1e-14 relative.
    assert_close(sag[40], r, 1e-14 * r, "sagittal at 40 deg");
    assert_close(tan[40], r3, 1e-14 * r3, "tangential at 40 deg");
    // At 30° the sagittal factor already exceeds the nadir value by 7 % (1.4289
    // against 1.3346, from the closed form above evaluated in Python), at 50° by
    // 27 %: the "more at oblique angles" of the issue.
    assert!(sag[30] / sag[0] > 1.07 && sag[50] / sag[0] > 1.27);
}

#[test]
fn vector_forms_match_the_scalar_helpers() {
    let depths = [0.0, 0.5, 1.0, 2.5, 7.0, -1.0, f64::NAN, 3.0];
    let angles = [0.0, 0.1, 0.5, 1.0, 1.4, 0.2, 0.2, 2.0];
    let mut out = [0.0; 8];
    let mut status = [Status::Ok; 8];
    let report = true_depths(
        &depths,
        &angles,
        N_AIR,
        N_WATER,
        Image::Sagittal,
        &mut out,
        &mut status[..],
    )
    .unwrap();
    assert_eq!(report.failed, 3);
    assert_eq!(report.first_failure.unwrap().0, 5);
    for i in 0..8 {
        match true_depth(depths[i], angles[i], N_AIR, N_WATER, Image::Sagittal) {
            Ok(d) => {
                assert_eq!(out[i], d);
                assert_eq!(status[i], Status::Ok);
            }
            Err(e) => {
                assert!(out[i].is_nan());
                assert_eq!(status[i], e.status());
            }
        }
    }
    let mut back = [0.0; 8];
    apparent_depths(
        &out,
        &angles,
        N_AIR,
        N_WATER,
        Image::Sagittal,
        &mut back,
        &mut NoStatus,
    )
    .unwrap();
    for i in 0..5 {
        assert_eq!(
            back[i],
            apparent_depth(out[i], angles[i], N_AIR, N_WATER, Image::Sagittal).unwrap()
        );
        // A round trip: two roundings of the same factor.
        assert_close(back[i], depths[i], 4e-16 * depths[i].max(1.0), "round trip");
    }
    // Whole-call errors: lengths, indices.
    let mut short = [0.0; 2];
    assert_eq!(
        true_depths(
            &depths,
            &angles[..3],
            N_AIR,
            N_WATER,
            Image::Sagittal,
            &mut out,
            &mut NoStatus
        )
        .unwrap_err()
        .status(),
        Status::InvalidArgument
    );
    assert_eq!(
        true_depths(
            &depths,
            &angles,
            N_AIR,
            N_WATER,
            Image::Sagittal,
            &mut short,
            &mut NoStatus
        )
        .unwrap_err()
        .status(),
        Status::BufferTooSmall
    );
    assert_eq!(
        true_depths(
            &depths,
            &angles,
            0.0,
            N_WATER,
            Image::Sagittal,
            &mut out,
            &mut NoStatus
        )
        .unwrap_err()
        .status(),
        Status::InvalidArgument
    );
}
