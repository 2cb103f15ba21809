//! Fixed test vectors, compared with `tests/data/test_vectors.csv`.
//!
//! The file was written by the default build (std maths). The test suite also
//! runs with the `libm` feature (`cargo test --features libm`, as
//! `scripts/test.sh` does), so this shows that the firmware maths gives the same
//! results as the host's. Regenerate with `FLATRAY_BLESS=1 cargo test --test
//! test_vectors` after a deliberate change of results.
//!
//! Tolerance: std and libm each round sqrt correctly and their sin, cos, asin
//! and atan2 are within 1 ulp; a result passes through a few dozen operations,
//! so 64 ε relative (or absolute for values below 1) bounds the difference.

use flatray::{
    apparent_depth, apparent_position, critical_angle, fresnel, line_of_sight, refract, trace,
    true_position, Air, Image, Layer, Material, PureWater, Ray, Seawater, Stack, Vec3,
};
use std::fmt::Write;
use std::path::Path;

fn vectors() -> Vec<(String, f64)> {
    let mut v = Vec::new();
    let mut push = |name: String, x: f64| v.push((name, x));
    let n = Vec3::new(0.1, -0.2, 1.0);
    for (i, d) in [
        Vec3::new(0.3, 0.1, 0.9),
        Vec3::new(-0.7, 0.2, 0.4),
        Vec3::new(0.0, 0.0, 1.0),
    ]
    .iter()
    .enumerate()
    {
        let t = refract(*d, n, 1.0003, 1.333).unwrap();
        push(format!("refract{i}.x"), t.x);
        push(format!("refract{i}.y"), t.y);
        push(format!("refract{i}.z"), t.z);
    }
    for (i, c) in [0.05, 0.4, 0.77, 1.0].iter().enumerate() {
        let f = fresnel(*c, 1.0, 1.52).unwrap();
        push(format!("fresnel{i}.rs"), f.rs);
        push(format!("fresnel{i}.rp"), f.rp);
    }
    push("critical".into(), critical_angle(1.52, 1.333).unwrap());
    let stack = Stack::new(
        Vec3::new(0.0, 0.0, 0.05),
        Vec3::new(0.05, 0.0, 1.0),
        1.0003,
        &[Layer::new(0.01, 1.77), Layer::new(0.002, 1.49)],
        1.34,
    )
    .unwrap();
    for (i, object) in [
        Vec3::new(0.3, 0.2, 1.0),
        Vec3::new(-4.0, 1.0, 2.5),
        Vec3::new(90.0, 0.0, 3.0),
    ]
    .iter()
    .enumerate()
    {
        let p = line_of_sight(&stack, Vec3::ZERO, *object).unwrap();
        push(format!("los{i}.dx"), p.direction.x);
        push(format!("los{i}.dy"), p.direction.y);
        push(format!("los{i}.optical"), p.optical_length);
        push(format!("los{i}.t"), p.transmittance);
        for image in [Image::Sagittal, Image::Tangential] {
            let a = apparent_position(&stack, Vec3::ZERO, *object, image).unwrap();
            push(format!("apparent{i}.{image:?}.x"), a.x);
            push(format!("apparent{i}.{image:?}.z"), a.z);
            let b = true_position(&stack, Vec3::ZERO, a, image).unwrap();
            push(format!("true{i}.{image:?}.z"), b.z);
        }
        let out = trace(&stack, Ray::new(Vec3::ZERO, p.direction)).unwrap();
        push(format!("trace{i}.dx"), out.ray.direction.x);
    }
    for (i, deg) in [0.0f64, 33.0, 71.0, 89.5].iter().enumerate() {
        let a = deg.to_radians();
        push(
            format!("depth{i}.s"),
            apparent_depth(2.0, a, 1.0003, 1.333, Image::Sagittal).unwrap(),
        );
        push(
            format!("depth{i}.t"),
            apparent_depth(2.0, a, 1.0003, 1.333, Image::Tangential).unwrap(),
        );
    }
    push(
        "water".into(),
        PureWater::new(12.0, 2.0e5).refractive_index(532.0).unwrap(),
    );
    push(
        "seawater".into(),
        Seawater::new(4.0, 35.0).refractive_index(532.0).unwrap(),
    );
    push(
        "air".into(),
        Air::new(15.0, 101_325.0, 0.5)
            .refractive_index(532.0)
            .unwrap(),
    );
    push(
        "sapphire".into(),
        Material::SapphireOrdinary.refractive_index(532.0).unwrap(),
    );
    push(
        "water_group".into(),
        PureWater::new(12.0, 2.0e5).group_index(532.0).unwrap(),
    );
    v
}

#[test]
fn results_match_the_committed_vectors() {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/test_vectors.csv");
    let fresh = vectors();
    if std::env::var_os("FLATRAY_BLESS").is_some() {
        let mut text =
            String::from("# name, value (default build, std maths); see tests/test_vectors.rs\n");
        for (name, x) in &fresh {
            writeln!(text, "{name}, {x:e}").unwrap();
        }
        std::fs::write(&path, text).unwrap();
        return;
    }
    let text = std::fs::read_to_string(&path).expect("tests/data/test_vectors.csv");
    let committed: Vec<(String, f64)> = text
        .lines()
        .filter(|l| !l.starts_with('#'))
        .map(|l| {
            let (name, x) = l.split_once(", ").unwrap();
            (name.to_string(), x.parse().unwrap())
        })
        .collect();
    assert_eq!(
        committed.len(),
        fresh.len(),
        "vector count changed: regenerate"
    );
    for ((name, want), (fresh_name, got)) in committed.iter().zip(&fresh) {
        assert_eq!(name, fresh_name);
        let tol = 64.0 * f64::EPSILON * want.abs().max(1.0);
        assert!(
            (got - want).abs() <= tol,
            "{name}: committed {want:e}, now {got:e}"
        );
    }
}
