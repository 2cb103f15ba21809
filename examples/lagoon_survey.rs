//! Demo: an invented drone survey of a lagoon, corrected for refraction.
//!
//! A drone photographs a shallow lagoon from twelve stations on two flight
//! lines; photogrammetry software that ignores refraction triangulates about
//! three thousand sea-floor points as if light travelled straight. A green
//! laser then flies a profile across the lagoon. flatray puts every point where
//! it really is, compares the shortcut and the single constant factor that is
//! often used, prints the error budget, and plots the correction factor
//! against viewing angle.
//!
//! Everything here is invented (stations, floor, conditions). Indices come from
//! the media models (Ciddor air, Quan-Fry seawater) at 532 nm.
//!
//! Run: `cargo run --release --example lagoon_survey`

use std::path::PathBuf;
use std::time::Instant;

use flatray::media::{Medium, StackBuilder};
use flatray::survey::{
    correct_multiviews, correct_ranges, correction_factors, true_position_sensitivity,
    GroupIndices, Multiview, Uncertainty, Views, CLEAR_WATER_NADIR_FACTOR,
};
use flatray::{line_of_sight, lines, Image, NoStatus, Ray, Stack, Status, Vec3};
use plotters::prelude::*;

const WAVELENGTH_NM: f64 = 532.0;

/// The invented lagoon floor: a sandy slope from 0.4 m to 5 m deep with two
/// coral heads, z up, surface at z = 0.
fn floor_depth(x: f64, y: f64) -> f64 {
    let slope = 0.4 + 4.6 * (x + 60.0) / 120.0;
    let head = |cx: f64, cy: f64, h: f64, r: f64| {
        h * (-((x - cx).powi(2) + (y - cy).powi(2)) / (r * r)).exp()
    };
    let ripples = 0.08 * (0.7 * x).sin() * (0.5 * y).cos();
    (slope - head(-20.0, 10.0, 1.2, 6.0) - head(25.0, -15.0, 2.0, 8.0) + ripples).max(0.15)
}

struct Stats {
    n: usize,
    mean: f64,
    max: f64,
}

fn stats(values: impl Iterator<Item = f64>) -> Stats {
    let (mut n, mut sum, mut max) = (0usize, 0.0, f64::NEG_INFINITY);
    for v in values {
        n += 1;
        sum += v;
        max = max.max(v);
    }
    Stats {
        n,
        mean: sum / n.max(1) as f64,
        max,
    }
}

fn main() -> Result<(), Box<dyn std::error::Error>> {
    println!(
        "flatray {} lagoon survey demo (invented data)\n",
        env!("CARGO_PKG_VERSION")
    );
    let media = StackBuilder::new(
        Medium::air(28.0, 101_325.0, 0.75),
        Medium::seawater(27.0, 35.0),
    )
    .normal(Vec3::new(0.0, 0.0, -1.0));
    let lagoon = media.build(WAVELENGTH_NM)?;
    let groups = GroupIndices::of_media(&media, WAVELENGTH_NM)?;
    let g = groups.as_slice();
    println!(
        "Media at {WAVELENGTH_NM} nm: air n = {:.6} (group {:.6}), seawater 27 °C 35 PSU n = {:.5} (group {:.5})",
        lagoon.n_observer(),
        g[0],
        lagoon.n_object(),
        g[1]
    );

    // --- Photogrammetry --------------------------------------------------------
    let mut stations = Vec::new();
    for (line, y) in [(0, -18.0), (1, 22.0)] {
        for k in 0..6 {
            let x = -55.0 + 22.0 * k as f64 + 4.0 * line as f64;
            let z = 62.0 + 3.0 * ((k * 7 + line * 3) % 5) as f64; // uneven heights
            stations.push(Vec3::new(x, y + 1.5 * (k % 3) as f64, z));
        }
    }
    let mut truths = Vec::new();
    for i in 0..60 {
        for j in 0..50 {
            let x = -59.0 + 2.0 * i as f64;
            let y = -40.0 + 1.6 * j as f64 + 0.3 * (i % 3) as f64;
            truths.push(Vec3::new(x, y, -floor_depth(x, y)));
        }
    }
    // Each point is seen by the stations within 40° of nadir (a camera's field).
    let mut offsets = vec![0usize];
    let mut ids = Vec::new();
    let mut apparent = Vec::new();
    let mut kept = Vec::new();
    for &p in &truths {
        let seen_by: Vec<u32> = stations
            .iter()
            .enumerate()
            .filter(|(_, c)| {
                let d = p - **c;
                (-d.z / d.length()) > 40f64.to_radians().cos()
            })
            .map(|(k, _)| k as u32)
            .collect();
        if seen_by.len() < 2 {
            continue;
        }
        // What refraction-blind photogrammetry reports: the straight-line
        // least-squares intersection of the true lines of sight.
        let sights: Vec<Ray> = seen_by
            .iter()
            .map(|&k| {
                let c = stations[k as usize];
                Ray::new(
                    c,
                    line_of_sight(&lagoon, c, p)
                        .map(|l| l.direction)
                        .unwrap_or(Vec3::NAN),
                )
            })
            .collect();
        let a = lines::intersect(&sights)?.point;
        ids.extend(seen_by);
        offsets.push(ids.len());
        apparent.push(a);
        kept.push(p);
    }
    let n = kept.len();
    let views = Views {
        cameras: &stations,
        offsets: &offsets,
        ids: &ids,
    };
    let started = Instant::now();
    let mut exact = vec![Vec3::ZERO; n];
    let mut rms = vec![0.0; n];
    let mut status = vec![Status::Ok; n];
    let report = correct_multiviews(
        &lagoon,
        &views,
        &apparent,
        Multiview::Exact,
        &mut exact,
        Some(&mut rms),
        &mut status[..],
    )?;
    let exact_time = started.elapsed().as_secs_f64();
    let mut shortcut = vec![Vec3::ZERO; n];
    correct_multiviews(
        &lagoon,
        &views,
        &apparent,
        Multiview::Shortcut,
        &mut shortcut,
        None,
        &mut NoStatus,
    )?;
    println!(
        "\n1. Photogrammetry: {} stations at 62-74 m, {n} floor points seen by 2 to {} cameras each",
        stations.len(),
        (1..offsets.len())
            .map(|i| offsets[i] - offsets[i - 1])
            .max()
            .unwrap_or(0)
    );
    println!(
        "   corrected {} points in {:.3} s ({} failed)",
        n - report.failed,
        exact_time,
        report.failed
    );
    let depth = |p: &Vec3| -p.z;
    let s_app = stats(apparent.iter().map(depth));
    let s_true = stats(kept.iter().map(depth));
    let s_fix = stats(exact.iter().map(depth));
    println!("   {:<34} {:>9} {:>9}", "", "mean (m)", "max (m)");
    println!(
        "   {:<34} {:>9.3} {:>9.3}",
        "apparent depth (uncorrected)", s_app.mean, s_app.max
    );
    println!(
        "   {:<34} {:>9.3} {:>9.3}",
        "true depth (invented floor)", s_true.mean, s_true.max
    );
    println!(
        "   {:<34} {:>9.3} {:>9.3}",
        "corrected depth (exact)", s_fix.mean, s_fix.max
    );
    let err = |v: &[Vec3]| stats(v.iter().zip(&kept).map(|(a, b)| (*a - *b).length()));
    let factor: Vec<Vec3> = apparent
        .iter()
        .map(|a| Vec3::new(a.x, a.y, a.z * CLEAR_WATER_NADIR_FACTOR))
        .collect();
    println!("   position error against the truth   mean (m)   max (m)");
    for (name, s) in [
        ("uncorrected", err(&apparent)),
        ("constant factor 1.34 on depth", err(&factor)),
        ("shortcut (refract to the point)", err(&shortcut)),
        ("exact multi-view correction", err(&exact)),
    ] {
        println!("   {name:<34} {:>9.2e} {:>9.2e}", s.mean, s.max);
    }
    let s_rms = stats(rms.iter().copied());
    println!(
        "   straight-line rms miss of the exact solutions: mean {:.3} m, max {:.3} m (n = {})",
        s_rms.mean, s_rms.max, s_rms.n
    );

    // --- Laser profile ----------------------------------------------------------
    let mut sensors = Vec::new();
    let mut reported = Vec::new();
    let mut profile = Vec::new();
    for k in 0..400 {
        let sensor = Vec3::new(-60.0 + 0.3 * k as f64, 2.0, 80.0 + 0.5 * (k % 4) as f64);
        let across = 12.0 * ((k as f64) * 0.37).sin(); // a scanning mirror
        let (x, y) = (sensor.x + 3.0, 2.0 + across);
        let p = Vec3::new(x, y, -floor_depth(x, y));
        let path = line_of_sight(&lagoon, sensor, p)?;
        let group_path = g[0] * (path.entry - sensor).length() + g[1] * (p - path.exit).length();
        sensors.push(sensor);
        reported.push(sensor + path.direction * (group_path / g[0]));
        profile.push(p);
    }
    let mut fixed = vec![Vec3::ZERO; profile.len()];
    let r = correct_ranges(
        &lagoon,
        &sensors,
        &reported,
        Some(&groups),
        &mut fixed,
        &mut NoStatus,
    )?;
    let mut phase_only = vec![Vec3::ZERO; profile.len()];
    correct_ranges(
        &lagoon,
        &sensors,
        &reported,
        None,
        &mut phase_only,
        &mut NoStatus,
    )?;
    let perr = |v: &[Vec3]| stats(v.iter().zip(&profile).map(|(a, b)| (*a - *b).length()));
    println!(
        "\n2. Laser profile: {} ranges from 80 m along y = 2 m ({} failed)",
        profile.len(),
        r.failed
    );
    println!(
        "   reported depth mean {:.3} m, true {:.3} m, corrected {:.3} m",
        stats(reported.iter().map(depth)).mean,
        stats(profile.iter().map(depth)).mean,
        stats(fixed.iter().map(depth)).mean
    );
    for (name, s) in [
        ("uncorrected", perr(&reported)),
        ("phase indices (no group index)", perr(&phase_only)),
        ("refraction + group indices", perr(&fixed)),
    ] {
        println!(
            "   error, {name:<31} mean {:.2e} m, max {:.2e} m",
            s.mean, s.max
        );
    }

    // --- Error budget -------------------------------------------------------------
    let u = Uncertainty {
        offset_m: 0.03,   // water level (tide, waves) known to 3 cm
        n_object: 0.002,  // seawater index: temperature and salinity unknown
        observer_m: 0.05, // camera positions from GNSS
        apparent_m: 0.02, // photogrammetric point noise
    };
    println!("\n3. Error budget of a single-view correction (standard uncertainty of depth, mm):");
    println!(
        "   inputs: water level {:.0} mm, seawater index {}, camera position {:.0} mm, apparent point {:.0} mm (each axis)",
        u.offset_m * 1e3,
        u.n_object,
        u.observer_m * 1e3,
        u.apparent_m * 1e3
    );
    println!(
        "   {:>9} {:>9} {:>10} {:>8} {:>8} {:>8} {:>8} {:>8}",
        "view", "app. (m)", "true (m)", "level", "index", "camera", "point", "total"
    );
    let camera = stations[2];
    for (dx, d) in [
        (0.0, 1.0),
        (0.0, 4.0),
        (25.0, 1.0),
        (25.0, 4.0),
        (50.0, 4.0),
    ] {
        let p = Vec3::new(camera.x + dx, camera.y, -d);
        let a = flatray::apparent_position(&lagoon, camera, p, Image::Sagittal)?;
        let s = true_position_sensitivity(&lagoon, camera, a, Image::Sagittal)?;
        let b = s.budget(&u, lagoon.normal())?;
        let view = ((p - camera).x / (camera.z)).atan().to_degrees();
        println!(
            "   {:>8.1}° {:>9.3} {:>10.3} {:>8.1} {:>8.1} {:>8.1} {:>8.1} {:>8.1}",
            view,
            -a.z,
            d,
            b.offset_m * 1e3,
            b.n_object_m * 1e3,
            b.observer_m * 1e3,
            b.apparent_m * 1e3,
            b.total_m * 1e3
        );
    }

    // --- Correction factor against viewing angle ------------------------------------
    let angles_deg: Vec<f64> = (0..=60).map(f64::from).collect();
    let angles: Vec<f64> = angles_deg.iter().map(|d| d.to_radians()).collect();
    let mut sag = vec![0.0; angles.len()];
    let mut tan = vec![0.0; angles.len()];
    let (n1, n2) = (lagoon.n_observer(), lagoon.n_object());
    correction_factors(&angles, n1, n2, Image::Sagittal, &mut sag, &mut NoStatus)?;
    correction_factors(&angles, n1, n2, Image::Tangential, &mut tan, &mut NoStatus)?;
    println!("\n4. Correction factor true / apparent depth (constant used in practice: {CLEAR_WATER_NADIR_FACTOR}):");
    for d in [0usize, 10, 20, 30, 40, 50, 60] {
        println!(
            "   {:>3}°  sagittal {:.4}  tangential {:.4}",
            d, sag[d], tan[d]
        );
    }
    let path = plot(&angles_deg, &sag, &tan, &lagoon)?;
    println!("\n   plot written to {}", path.display());
    println!(
        "\nCAUTION: water always looks shallower than it is. These numbers are a model of invented"
    );
    println!("data, not a measurement; depths for navigation or engineering come from licensed");
    println!("hydrographic practice.");
    Ok(())
}

fn output_dir() -> PathBuf {
    let target = std::env::var_os("CARGO_TARGET_DIR")
        .map(PathBuf::from)
        .unwrap_or_else(|| PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("target"));
    target.join("flatray-demo")
}

fn plot(
    angles_deg: &[f64],
    sag: &[f64],
    tan: &[f64],
    stack: &Stack,
) -> Result<PathBuf, Box<dyn std::error::Error>> {
    let dir = output_dir();
    std::fs::create_dir_all(&dir)?;
    let path = dir.join("correction_factor.svg");
    let root = SVGBackend::new(&path, (900, 560)).into_drawing_area();
    root.fill(&WHITE)?;
    let y_max = tan.iter().copied().fold(0.0f64, f64::max).min(3.2) + 0.1;
    let mut chart = ChartBuilder::on(&root)
        .caption(
            format!(
                "Lagoon at 532 nm: true / apparent depth (air {:.5}, seawater {:.4})",
                stack.n_observer(),
                stack.n_object()
            ),
            ("sans-serif", 20),
        )
        .margin(20)
        .x_label_area_size(45)
        .y_label_area_size(60)
        .build_cartesian_2d(0.0..60.0, 1.2..y_max)?;
    chart
        .configure_mesh()
        .x_desc("viewing angle from the vertical, in air (degrees)")
        .y_desc("correction factor")
        .draw()?;
    chart
        .draw_series(LineSeries::new(
            angles_deg.iter().copied().zip(sag.iter().copied()),
            BLUE.stroke_width(2),
        ))?
        .label("sagittal image (survey apparent depth)")
        .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], BLUE.stroke_width(2)));
    chart
        .draw_series(LineSeries::new(
            angles_deg
                .iter()
                .copied()
                .zip(tan.iter().copied())
                .filter(|(_, k)| *k <= y_max),
            RED.stroke_width(2),
        ))?
        .label("tangential image")
        .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], RED.stroke_width(2)));
    chart
        .draw_series(LineSeries::new(
            [
                (0.0, CLEAR_WATER_NADIR_FACTOR),
                (60.0, CLEAR_WATER_NADIR_FACTOR),
            ],
            BLACK.stroke_width(1),
        ))?
        .label("constant factor 1.34 (nadir value)")
        .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], BLACK));
    chart
        .configure_series_labels()
        .position(SeriesLabelPosition::UpperLeft)
        .background_style(WHITE.mix(0.8))
        .border_style(BLACK)
        .draw()?;
    root.present()?;
    drop(chart);
    drop(root);
    Ok(path)
}
