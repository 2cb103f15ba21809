//! The `flatray-correct` command-line tool, run as a program on small files
//! (range, single-view and multi-view corrections, malformed rows, fatal
//! errors) and, in an ignored test, on a generated one-million-point file.
//!
//! Data are invented; the corrected points are checked against the library
//! (itself tested against published references) and against the true points
//! the files were made from.
#![cfg(feature = "cli")]

use std::path::{Path, PathBuf};
use std::process::{Command, Output};
use std::time::Instant;

use flatray::survey::{correct_range, GroupIndices};
use flatray::{line_of_sight, lines, Ray, Stack, Vec3};

const BIN: &str = env!("CARGO_BIN_EXE_flatray-correct");
/// The recovery tolerance; the library reaches ~1e-12 m, and the CSV
/// round trip is exact (Rust prints the shortest decimal that parses back to
/// the same double).
const RECOVERY_M: f64 = 1e-9;
/// Fixed indices so the tests do not depend on the media models.
const N_AIR: f64 = 1.000_28;
const N_WATER: f64 = 1.339;
const NG_AIR: f64 = 1.000_29;
const NG_WATER: f64 = 1.3758;

fn scratch(name: &str) -> PathBuf {
    let dir = Path::new(env!("CARGO_TARGET_TMPDIR")).join(format!("cli-{name}"));
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

fn run(args: &[&str]) -> Output {
    Command::new(BIN)
        .args(args)
        .output()
        .expect("run flatray-correct")
}

fn index_args() -> Vec<String> {
    [
        "--air-index",
        &N_AIR.to_string(),
        "--water-index",
        &N_WATER.to_string(),
        "--air-group-index",
        &NG_AIR.to_string(),
        "--water-group-index",
        &NG_WATER.to_string(),
    ]
    .iter()
    .map(|s| s.to_string())
    .collect()
}

fn lake() -> Stack {
    Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), N_AIR, N_WATER).unwrap()
}

/// Rows of a CSV file as maps from header name to field.
fn read_rows(path: &Path) -> Vec<std::collections::HashMap<String, String>> {
    let mut r = csv::Reader::from_path(path).unwrap();
    let header: Vec<String> = r.headers().unwrap().iter().map(String::from).collect();
    r.records()
        .map(|rec| {
            let rec = rec.unwrap();
            assert_eq!(
                rec.len(),
                header.len(),
                "every output row has the header's width"
            );
            header
                .iter()
                .cloned()
                .zip(rec.iter().map(String::from))
                .collect()
        })
        .collect()
}

fn point_of(row: &std::collections::HashMap<String, String>) -> Vec3 {
    let f = |k: &str| row[k].parse::<f64>().unwrap();
    Vec3::new(f("true_x"), f("true_y"), f("true_z"))
}

/// A reported laser point for a true point (exact beam path, group indices).
fn reported(stack: &Stack, sensor: Vec3, truth: Vec3) -> Vec3 {
    let path = line_of_sight(stack, sensor, truth).unwrap();
    let g = NG_AIR * (path.entry - sensor).length() + NG_WATER * (truth - path.exit).length();
    sensor + path.direction * (g / NG_AIR)
}

#[test]
fn range_file_is_corrected_row_by_row() {
    let dir = scratch("range");
    let stack = lake();
    let sensor = Vec3::new(2.0, -1.0, 55.0);
    let truths = [
        Vec3::new(0.0, 0.0, -1.0),
        Vec3::new(8.0, 3.0, -2.5),
        Vec3::new(-6.0, 9.0, -4.2),
    ];
    let mut text = String::from("id,x,y,z,sensor_x,sensor_y,sensor_z,note\n");
    for (i, t) in truths.iter().enumerate() {
        let u = reported(&stack, sensor, *t);
        text += &format!(
            "p{i},{},{},{},{},{},{},keep me\n",
            u.x, u.y, u.z, sensor.x, sensor.y, sensor.z
        );
    }
    let input = dir.join("points.csv");
    let output = dir.join("out.csv");
    std::fs::write(&input, text).unwrap();
    let mut args = vec![
        "--points",
        input.to_str().unwrap(),
        "--output",
        output.to_str().unwrap(),
        "--method",
        "range",
    ];
    let idx = index_args();
    args.extend(idx.iter().map(String::as_str));
    let out = run(&args);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let summary = String::from_utf8_lossy(&out.stdout);
    assert!(
        summary.contains("rows             3") && summary.contains("corrected        3"),
        "{summary}"
    );
    let rows = read_rows(&output);
    assert_eq!(rows.len(), 3);
    let groups = GroupIndices::new(&[NG_AIR, NG_WATER]).unwrap();
    for (row, t) in rows.iter().zip(truths) {
        assert_eq!(row["status"], "ok");
        assert_eq!(row["note"], "keep me");
        let p = point_of(row);
        assert!((p - t).length() < RECOVERY_M, "{p:?} vs {t:?}");
        let f = |k: &str| row[k].parse::<f64>().unwrap();
        let lib = correct_range(
            &stack,
            sensor,
            Vec3::new(f("x"), f("y"), f("z")),
            Some(&groups),
        )
        .unwrap();
        assert_eq!(p, lib, "the tool writes exactly what the library computes");
    }
}

#[test]
fn views_file_with_cameras_recovers_true_points() {
    let dir = scratch("views");
    let stack = lake();
    let cams = [
        ("left", Vec3::new(-12.0, -3.0, 38.0)),
        ("mid", Vec3::new(4.0, -9.5, 41.5)),
        ("right", Vec3::new(17.0, 2.0, 44.0)),
        ("high", Vec3::new(9.0, 15.0, 52.0)),
    ];
    let mut cam_text = String::from("id,x,y,z\n");
    for (id, c) in cams {
        cam_text += &format!("{id},{},{},{}\n", c.x, c.y, c.z);
    }
    let truths = [
        (Vec3::new(1.0, 2.0, -1.5), vec![0, 1, 2]),
        (Vec3::new(-4.0, 6.0, -3.0), vec![1, 3]),
        (Vec3::new(7.0, -2.0, -0.6), vec![0, 1, 2, 3]),
    ];
    let mut text = String::from("x,y,z,cameras\n");
    for (t, ids) in &truths {
        let sights: Vec<Ray> = ids
            .iter()
            .map(|&k| {
                Ray::new(
                    cams[k].1,
                    line_of_sight(&stack, cams[k].1, *t).unwrap().direction,
                )
            })
            .collect();
        let seen = lines::intersect(&sights).unwrap().point;
        let names: Vec<&str> = ids.iter().map(|&k| cams[k].0).collect();
        text += &format!("{},{},{},{}\n", seen.x, seen.y, seen.z, names.join(";"));
    }
    // A point with one camera and one naming an unknown camera.
    text += "1,1,-1,left\n1,1,-1,left;nowhere\n";
    let input = dir.join("points.csv");
    let cameras = dir.join("cameras.csv");
    let output = dir.join("out.csv");
    std::fs::write(&input, text).unwrap();
    std::fs::write(&cameras, cam_text).unwrap();
    for method in ["views", "views-shortcut"] {
        let mut args = vec![
            "--points",
            input.to_str().unwrap(),
            "--output",
            output.to_str().unwrap(),
            "--method",
            method,
            "--cameras",
            cameras.to_str().unwrap(),
        ];
        let idx = index_args();
        args.extend(idx.iter().map(String::as_str));
        let out = run(&args);
        assert_eq!(out.status.code(), Some(2), "some rows fail: exit 2");
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert!(
            stderr.contains("line 6: camera `nowhere` is not in the cameras file"),
            "{stderr}"
        );
        let rows = read_rows(&output);
        assert_eq!(rows.len(), 5, "no row dropped");
        assert_eq!(rows[3]["status"], "degenerate");
        assert_eq!(rows[4]["status"], "bad_row");
        for (row, (t, _)) in rows.iter().zip(&truths) {
            assert_eq!(row["status"], "ok");
            let err = (point_of(row) - *t).length();
            if method == "views" {
                assert!(err < RECOVERY_M, "{err}");
                assert!(row["rms_miss_m"].parse::<f64>().unwrap() > 0.0);
            }
        }
    }
}

#[test]
fn malformed_rows_are_reported_with_line_numbers_and_kept() {
    let dir = scratch("malformed");
    let input = dir.join("points.csv");
    let output = dir.join("out.csv");
    std::fs::write(
        &input,
        "x,y,z,sensor_x,sensor_y,sensor_z\n\
         1,2,-1.5,0,0,30\n\
         4,abc,-2.5,0,0,30\n\
         4,2\n\
         4,2,,0,0,30\n\
         NaN,2,-1,0,0,30\n\
         1,1,-1,0,0,-3\n\
         1,1,-1,0,0,30,extra\n\
         2,2,-2,0,0,30\n",
    )
    .unwrap();
    let out = run(&[
        "--points",
        input.to_str().unwrap(),
        "--output",
        output.to_str().unwrap(),
        "--method",
        "single-view",
        "--progress",
        "never",
    ]);
    assert_eq!(out.status.code(), Some(2));
    let stderr = String::from_utf8_lossy(&out.stderr);
    for expected in [
        "line 3: column `y` is not a number: `abc`",
        "line 4: the row has 2 fields but the header has 6",
        "line 5: column `z` is empty",
        "line 8: the row has 7 fields but the header has 6",
    ] {
        assert!(
            stderr.contains(expected),
            "missing `{expected}` in:\n{stderr}"
        );
    }
    let rows = read_rows(&output);
    let statuses: Vec<&str> = rows.iter().map(|r| r["status"].as_str()).collect();
    assert_eq!(
        statuses,
        [
            "ok",
            "bad_row",
            "bad_row",
            "bad_row",
            "invalid_argument",
            "wrong_side",
            "bad_row",
            "ok"
        ]
    );
    assert!(rows[1]["true_x"].is_empty() && !rows[1]["detail"].is_empty());
    let summary = String::from_utf8_lossy(&out.stdout);
    assert!(summary.contains("rows             8"), "{summary}");
    assert!(summary.contains("bad_row          4"), "{summary}");
    assert!(summary.contains("wrong_side       1"), "{summary}");
}

#[test]
fn fatal_errors_name_what_is_missing() {
    let dir = scratch("fatal");
    let input = dir.join("points.csv");
    let output = dir.join("out.csv");
    std::fs::write(&input, "x,y,depth\n1,2,3\n").unwrap();
    let out = run(&[
        "--points",
        input.to_str().unwrap(),
        "--output",
        output.to_str().unwrap(),
        "--method",
        "range",
    ]);
    assert_eq!(out.status.code(), Some(1));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(
        stderr.contains("no column `z`") && stderr.contains("x, y, depth"),
        "{stderr}"
    );
    let out = run(&[
        "--points",
        input.to_str().unwrap(),
        "--output",
        output.to_str().unwrap(),
        "--method",
        "views",
    ]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("--cameras"));
    let out = run(&[
        "--points",
        "/nonexistent/points.csv",
        "--output",
        output.to_str().unwrap(),
        "--method",
        "range",
    ]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("cannot open the point file"));
}

/// The one-million-point run: `cargo test --release --test cli -- --ignored --nocapture`.
#[test]
#[ignore = "writes a 1e6-row file and takes seconds in release builds; run on demand"]
fn one_million_laser_points_end_to_end() {
    let dir = scratch("million");
    let stack = lake();
    let input = dir.join("points.csv");
    let output = dir.join("out.csv");
    let n = 1_000_000usize;
    let t0 = Instant::now();
    let mut truths = Vec::with_capacity(n);
    {
        use std::io::Write;
        let mut w = std::io::BufWriter::new(std::fs::File::create(&input).unwrap());
        writeln!(w, "x,y,z,sensor_x,sensor_y,sensor_z").unwrap();
        for i in 0..n {
            // Flight lines 20 m apart, a lidar 60 m up scanning ±15 m across track.
            let line = (i / 10_000) as f64;
            let along = (i % 10_000) as f64 * 0.2;
            let sensor = Vec3::new(along, line * 20.0, 60.0 + (i % 7) as f64 * 0.3);
            let across = ((i * 7919) % 3001) as f64 / 100.0 - 15.0;
            let depth = 0.3 + ((i * 104_729) % 6000) as f64 / 1000.0;
            let truth = Vec3::new(along + 0.5, line * 20.0 + across, -depth);
            let u = reported(&stack, sensor, truth);
            writeln!(
                w,
                "{},{},{},{},{},{}",
                u.x, u.y, u.z, sensor.x, sensor.y, sensor.z
            )
            .unwrap();
            truths.push(truth);
        }
    }
    eprintln!(
        "generated {n} points in {:.2} s",
        t0.elapsed().as_secs_f64()
    );
    let mut args = vec![
        "--points",
        input.to_str().unwrap(),
        "--output",
        output.to_str().unwrap(),
        "--method",
        "range",
        "--progress",
        "always",
    ];
    let idx = index_args();
    args.extend(idx.iter().map(String::as_str));
    let t1 = Instant::now();
    let out = run(&args);
    let seconds = t1.elapsed().as_secs_f64();
    eprintln!("{}", String::from_utf8_lossy(&out.stderr));
    eprintln!("{}", String::from_utf8_lossy(&out.stdout));
    eprintln!("flatray-correct corrected {n} points in {seconds:.2} s (wall clock, including CSV reading and writing)");
    assert!(out.status.success());
    assert!(String::from_utf8_lossy(&out.stderr).contains("100%"));
    let mut r = csv::Reader::from_path(&output).unwrap();
    let mut count = 0;
    let mut worst: f64 = 0.0;
    for (rec, truth) in r.records().zip(&truths) {
        let rec = rec.unwrap();
        assert_eq!(&rec[9], "ok");
        let p = Vec3::new(
            rec[6].parse().unwrap(),
            rec[7].parse().unwrap(),
            rec[8].parse().unwrap(),
        );
        worst = worst.max((p - *truth).length());
        count += 1;
    }
    assert_eq!(count, n, "every point has an output row");
    eprintln!("worst error against the true points: {worst:.2e} m");
    assert!(worst < RECOVERY_M);
}
