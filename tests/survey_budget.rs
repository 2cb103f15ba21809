//! The error budget (`survey::sensitivity`) against finite differences of
//! `true_position`, and the propagated covariance against the derivatives.
//!
//! Geometry invented; indices typical values from memory (any work).

#![allow(clippy::needless_range_loop)] // matrices read clearer with indices

mod common;

use common::assert_close;
use flatray::survey::{
    true_position_covariance, true_position_covariances, true_position_sensitivity, Uncertainty,
};
use flatray::{apparent_position, true_position, Image, Layer, Stack, Status, Vec3};

/// Central-difference step: the true point is smooth on a 1 m scale here, so the
/// truncation error is about h² = 1e-10 relative, and rounding about
/// 1e-16 × 10 m / h = 1e-9.
const H: f64 = 1e-5;
/// Tolerance on a derivative of order 1: both errors above with a factor 100 to
/// spare for the larger third derivatives of the tangential image near 60°.
const TOL: f64 = 1e-6;

fn scenes() -> Vec<(Stack, Vec3, Vec3)> {
    let lake = Stack::single_interface(
        Vec3::new(0.0, 0.0, 0.3),
        Vec3::new(0.0, 0.0, -1.0),
        1.000_28,
        1.339,
    )
    .unwrap();
    let port = Stack::new(
        Vec3::new(0.02, -0.01, 0.05),
        Vec3::new(0.1, -0.2, 1.0),
        1.000_28,
        &[Layer::new(0.010, 1.52), Layer::new(0.004, 1.40)],
        1.334,
    )
    .unwrap();
    vec![
        (lake, Vec3::new(0.0, 0.0, 20.0), Vec3::new(0.0, 0.0, -1.0)),
        (lake, Vec3::new(1.0, -2.0, 20.0), Vec3::new(9.0, 4.0, -2.5)),
        (lake, Vec3::new(-3.0, 0.5, 6.0), Vec3::new(5.0, 2.0, -0.8)),
        (port, Vec3::ZERO, Vec3::new(0.3, 0.1, 1.2)),
        (port, Vec3::new(0.01, 0.0, -0.02), Vec3::new(-0.6, 0.4, 2.0)),
    ]
}

fn with_n_object(stack: &Stack, n: f64) -> Stack {
    let layers: Vec<f64> = stack.layers().iter().map(|l| l.index).collect();
    stack.with_indices(stack.n_observer(), &layers, n).unwrap()
}

#[test]
fn derivatives_agree_with_finite_differences() {
    for image in [Image::Sagittal, Image::Tangential] {
        for (k, (stack, obs, app)) in scenes().into_iter().enumerate() {
            let s = true_position_sensitivity(&stack, obs, app, image).unwrap();
            let f = |st: &Stack, o: Vec3, a: Vec3| true_position(st, o, a, image).unwrap();
            let central = |plus: Vec3, minus: Vec3| (plus - minus) * (0.5 / H);
            let what = format!("{image:?} scene {k}");
            let fd = central(
                f(&stack.shifted(H).unwrap(), obs, app),
                f(&stack.shifted(-H).unwrap(), obs, app),
            );
            assert!(
                (fd - s.d_offset).length() < TOL,
                "{what} offset: {fd:?} vs {:?}",
                s.d_offset
            );
            let n = stack.n_object();
            let fd = central(
                f(&with_n_object(&stack, n + H), obs, app),
                f(&with_n_object(&stack, n - H), obs, app),
            );
            assert!(
                (fd - s.d_n_object).length() < TOL,
                "{what} n_object: {fd:?} vs {:?}",
                s.d_n_object
            );
            for j in 0..3 {
                let mut e = [0.0; 3];
                e[j] = H;
                let e = Vec3::new(e[0], e[1], e[2]);
                let fd_o = central(f(&stack, obs + e, app), f(&stack, obs - e, app));
                let fd_a = central(f(&stack, obs, app + e), f(&stack, obs, app - e));
                for (i, (fo, fa)) in [(fd_o.x, fd_a.x), (fd_o.y, fd_a.y), (fd_o.z, fd_a.z)]
                    .into_iter()
                    .enumerate()
                {
                    assert_close(s.d_observer[i][j], fo, TOL, &format!("{what} dP{i}/dO{j}"));
                    assert_close(s.d_apparent[i][j], fa, TOL, &format!("{what} dP{i}/dA{j}"));
                }
            }
        }
    }
}

#[test]
fn nadir_sensitivities_match_the_paraxial_formula() {
    // At nadir through one interface, true depth = (n₂/n₁) × apparent depth
    // (paraxial, e.g. Smith, Modern Optical Engineering, §2.6), so
    // ∂z/∂n₂ = z_apparent / n₁ below the surface and ∂z/∂z_a = n₂/n₁.
    let lake = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.0, 1.34).unwrap();
    let s = true_position_sensitivity(
        &lake,
        Vec3::new(0.0, 0.0, 12.0),
        Vec3::new(0.0, 0.0, -2.0),
        Image::Sagittal,
    )
    .unwrap();
    // z = −1.34 × 2: dz/dn₂ = −2 (rounding-level tolerance: a few operations).
    assert_close(s.d_n_object.z, -2.0, 1e-12, "dz/dn");
    assert_close(s.d_apparent[2][2], 1.34, 1e-12, "dz/dz_a");
    assert_close(s.d_offset.z, 0.34, 1e-12, "dz/doffset");
    // Moving the camera sideways by a little changes nothing to first order at nadir.
    assert_close(s.d_observer[2][0], 0.0, 1e-12, "dz/dx_obs");
}

#[test]
fn covariance_is_the_propagation_of_the_derivatives() {
    let u = Uncertainty {
        offset_m: 0.02,
        n_object: 0.002,
        observer_m: 0.05,
        apparent_m: 0.03,
    };
    for (stack, obs, app) in scenes() {
        let s = true_position_sensitivity(&stack, obs, app, Image::Sagittal).unwrap();
        let c = true_position_covariance(&stack, obs, app, Image::Sagittal, &u).unwrap();
        // Symmetric, and the budget along the normal is √(n̂ᵀ C n̂).
        for i in 0..3 {
            for j in 0..3 {
                assert_close(c[i][j], c[j][i], 1e-18, "symmetry");
            }
        }
        let n = stack.normal();
        let nv = [n.x, n.y, n.z];
        let mut var = 0.0;
        for i in 0..3 {
            for j in 0..3 {
                var += nv[i] * c[i][j] * nv[j];
            }
        }
        let b = s.budget(&u, n).unwrap();
        // Two ways of summing the same terms: rounding only.
        assert_close(b.total_m, var.sqrt(), 1e-12, "budget total");
        assert_close(
            b.offset_m,
            0.02 * n.dot(s.d_offset).abs(),
            1e-15,
            "offset part",
        );
    }
    let bad = Uncertainty {
        offset_m: -1.0,
        ..u
    };
    let (stack, obs, app) = scenes()[0];
    assert!(true_position_covariance(&stack, obs, app, Image::Sagittal, &bad).is_err());
    // The batch: one good point, one above the surface.
    let mut out = [[[0.0; 3]; 3]; 2];
    let mut status = [Status::Ok; 2];
    let report = true_position_covariances(
        &stack,
        &[obs],
        &[app, Vec3::new(0.0, 0.0, 5.0)],
        Image::Sagittal,
        &u,
        &mut out,
        &mut status[..],
    )
    .unwrap();
    assert_eq!(report.failed, 1);
    assert_eq!(status, [Status::Ok, Status::WrongSide]);
    assert_eq!(
        out[0],
        true_position_covariance(&stack, obs, app, Image::Sagittal, &u).unwrap()
    );
    assert!(out[1][0][0].is_nan());
}

#[test]
fn sensitivity_follows_true_position_errors() {
    let (stack, obs, _) = scenes()[0];
    // An apparent point above the surface.
    assert_eq!(
        true_position_sensitivity(&stack, obs, Vec3::new(0.0, 0.0, 1.0), Image::Sagittal)
            .unwrap_err()
            .status(),
        Status::WrongSide
    );
    let seen = apparent_position(&stack, obs, Vec3::new(1.0, 1.0, -2.0), Image::Sagittal).unwrap();
    assert!(true_position_sensitivity(&stack, obs, seen, Image::Sagittal).is_ok());
}
