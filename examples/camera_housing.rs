//! Demo: an inspection camera in a flat-port housing, and what the usual
//! pinhole-in-water shortcut costs.
//!
//! Scenario (invented camera, housing and data; indices typical values from
//! memory): a full-HD tank-inspection camera with a mildly wide lens sits in
//! an acrylic housing behind a 12 mm flat acrylic port whose inner face is
//! 35 mm in front of the lens, looking into fresh water. flatray gives its
//! field of view in air and in water, then compares the exact flat-port model
//! with two pinhole approximations:
//!
//! * the "1.33x rule": the in-air calibration with its focal lengths scaled to
//!   the in-water values at the axis (common practice for flat ports);
//! * a remap table to an in-water pinhole camera, exact at 2 m.
//!
//! It prints how far each misplaces points at 0.5 m, 2 m and 10 m, and writes
//! an SVG picture of the first one's error across the image.
//!
//! Run: `cargo run --release --example camera_housing`

use std::path::PathBuf;
use std::time::Instant;

use flatray::camera::{Lens, PortCamera};
use flatray::{Layer, Stack, Vec3};
use plotters::prelude::*;

const WIDTH: u32 = 1920;
const HEIGHT: u32 = 1080;
/// Indices near 550 nm at about 15 °C, from memory.
const N_AIR: f64 = 1.000_28;
const N_ACRYLIC: f64 = 1.492;
const N_FRESH_WATER: f64 = 1.334;
/// Object ranges of the comparison, metres from the centre of projection.
const RANGES_M: [f64; 3] = [0.5, 2.0, 10.0];
/// Pixels between samples of the error maps.
const STEP_PX: u32 = 24;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    println!(
        "flatray {} demo: invented camera and housing\n",
        env!("CARGO_PKG_VERSION")
    );
    // The lens: focal length 1350 px (about 3.6 mm on 2.7 µm pixels), slight
    // barrel distortion, a little decentring.
    let lens = Lens::pinhole(1350.0, 1351.5, 962.4, 537.8)
        .with_distortion(-0.115, 0.062, -0.011, 1.8e-4, -2.4e-4);
    let port = Stack::new(
        Vec3::new(0.0, 0.0, 0.035),
        Vec3::new(0.0, 0.0, 1.0),
        N_AIR,
        &[Layer::new(0.012, N_ACRYLIC)],
        N_FRESH_WATER,
    )?;
    let camera = PortCamera::new(lens, port)?;

    println!(
        "Inspection camera, {WIDTH} x {HEIGHT} px, behind a 12 mm acrylic port 35 mm from the lens"
    );
    let air = camera.field_of_view_in_air(WIDTH, HEIGHT)?;
    let water = camera.field_of_view(WIDTH, HEIGHT)?;
    println!(
        "{:>22} {:>10} {:>10} {:>10}",
        "field of view (deg)", "horizontal", "vertical", "diagonal"
    );
    for (name, f) in [("in air (no port)", air), ("in water", water)] {
        println!(
            "{name:>22} {:>10.2} {:>10.2} {:>10.2}",
            f.horizontal.to_degrees(),
            f.vertical.to_degrees(),
            f.diagonal.to_degrees()
        );
    }
    let (fxw, fyw) = camera.focal_length_in_water()?;
    println!(
        "in-water focal length at the axis: {fxw:.1} x {fyw:.1} px ({:.3}x the in-air {:.1} px; n_water/n_air = {:.3})",
        fxw / lens.fx,
        lens.fx,
        N_FRESH_WATER / N_AIR
    );
    println!(
        "the view is {:.1} % narrower in water; no pixel needs total internal reflection: {}",
        100.0 * (1.0 - water.horizontal / air.horizontal),
        camera.tir_radius()?.is_none()
    );

    // Approximation 1: the in-air camera with focal lengths scaled by the axial
    // magnification, ignoring the port otherwise.
    let scaled = ScaledPinhole::new(&camera)?;
    // Approximation 2: a remap table to an in-water pinhole camera, exact at 2 m.
    let target = Lens::pinhole(fxw, fyw, lens.cx, lens.cy);
    let table_m = 2.0;
    let n = (WIDTH * HEIGHT) as usize;
    let (mut map_u, mut map_v) = (vec![0.0f32; n], vec![0.0f32; n]);
    let started = Instant::now();
    let visible = camera.remap_table(&target, table_m, WIDTH, HEIGHT, &mut map_u, &mut map_v)?;
    let build_s = started.elapsed().as_secs_f64();

    println!(
        "\nHow far pinhole-in-water shortcuts misplace points, pixels (exact flat-port model = 0):"
    );
    println!(
        "{:>10} {:>14} {:>14} {:>18} {:>18}",
        "range (m)", "1.33x rule max", "1.33x rule rms", "2 m table max", "2 m table rms"
    );
    let mut maps = Vec::new();
    for range_m in RANGES_M {
        let map = scaled.error_map(&camera, range_m)?;
        let (max, rms) = map.summary();
        let table = camera.remap_error(&target, table_m, range_m, WIDTH, HEIGHT)?;
        println!(
            "{range_m:>10.1} {max:>14.2} {rms:>14.2} {:>18.3} {:>18.3}",
            table.max_px, table.rms_px
        );
        maps.push((range_m, map));
    }
    println!(
        "\nThe 2 m remap table ({visible} of {n} entries visible) took {:.0} ms to build on one thread.",
        build_s * 1e3
    );
    println!(
        "A flat-port camera has no single viewpoint: no pinhole model is right at every range."
    );

    let path = plot(&maps)?;
    println!(
        "\nError map of the 1.33x rule written to {}",
        path.display()
    );
    Ok(())
}

/// The "1.33x rule": the in-air camera with focal lengths multiplied by the
/// in-water axial magnification, its in-air distortion kept, the port
/// otherwise ignored.
struct ScaledPinhole {
    lens: Lens,
    scale_x: f64,
    scale_y: f64,
}

impl ScaledPinhole {
    fn new(camera: &PortCamera) -> flatray::Result<Self> {
        let lens = *camera.lens();
        let (fxw, fyw) = camera.focal_length_in_water()?;
        Ok(ScaledPinhole {
            lens,
            scale_x: fxw / lens.fx,
            scale_y: fyw / lens.fy,
        })
    }

    fn pixel(&self, p: Vec3) -> flatray::Result<(f64, f64)> {
        self.lens
            .project(self.scale_x * p.x / p.z, self.scale_y * p.y / p.z)
    }

    /// Misplacement in pixels across the image, for points at `range_m` from
    /// the centre of projection on each pixel's exact ray.
    fn error_map(&self, camera: &PortCamera, range_m: f64) -> flatray::Result<ErrorMap> {
        let cols = WIDTH / STEP_PX;
        let rows = HEIGHT / STEP_PX;
        let mut values = Vec::with_capacity((cols * rows) as usize);
        for r in 0..rows {
            for c in 0..cols {
                let u = f64::from(c * STEP_PX) + f64::from(STEP_PX) / 2.0 - 0.5;
                let v = f64::from(r * STEP_PX) + f64::from(STEP_PX) / 2.0 - 0.5;
                let ray = camera.pixel_to_ray(u, v)?;
                let p = ray.at(range_along(ray.origin, ray.direction, range_m));
                let (ua, va) = self.pixel(p)?;
                values.push((ua - u).hypot(va - v));
            }
        }
        Ok(ErrorMap { cols, values })
    }
}

/// The parameter `s >= 0` at which `origin + s·direction` is `range` metres
/// from the camera's centre: `|o + s d|² = range²` (unit `d`).
fn range_along(origin: Vec3, direction: Vec3, range: f64) -> f64 {
    let b = origin.dot(direction);
    let c = origin.dot(origin) - range * range;
    -b + (b * b - c).sqrt()
}

struct ErrorMap {
    cols: u32,
    values: Vec<f64>,
}

impl ErrorMap {
    fn summary(&self) -> (f64, f64) {
        let max = self.values.iter().copied().fold(0.0, f64::max);
        let rms =
            (self.values.iter().map(|e| e * e).sum::<f64>() / self.values.len() as f64).sqrt();
        (max, rms)
    }
}

fn output_dir() -> PathBuf {
    std::env::var_os("CARGO_TARGET_DIR")
        .map(PathBuf::from)
        .unwrap_or_else(|| PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("target"))
        .join("flatray-demo")
}

/// Three error maps side by side on one colour scale, with a colour bar.
fn plot(maps: &[(f64, ErrorMap)]) -> Result<PathBuf, Box<dyn std::error::Error>> {
    let dir = output_dir();
    std::fs::create_dir_all(&dir)?;
    let path = dir.join("camera_housing_pinhole_error.svg");
    let top = maps
        .iter()
        .flat_map(|(_, m)| m.values.iter().copied())
        .fold(0.0, f64::max);
    draw(&path, maps, top)?;
    Ok(path)
}

// A reversed range is how plotters draws an axis growing downward, as image
// rows do (v = 0 at the top).
#[allow(clippy::reversed_empty_ranges)]
fn draw(
    path: &std::path::Path,
    maps: &[(f64, ErrorMap)],
    top: f64,
) -> Result<(), Box<dyn std::error::Error>> {
    let root = SVGBackend::new(path, (1500, 420)).into_drawing_area();
    root.fill(&WHITE)?;
    let root = root.titled(
        "Inspection camera behind a flat port: error of the 1.33x pinhole rule (pixels)",
        ("sans-serif", 22),
    )?;
    let (panels, bar) = root.split_horizontally(1370);
    for ((range_m, map), area) in maps.iter().zip(panels.split_evenly((1, maps.len()))) {
        let mut chart = ChartBuilder::on(&area)
            .caption(format!("objects at {range_m} m"), ("sans-serif", 18))
            .margin(8)
            .x_label_area_size(30)
            .y_label_area_size(44)
            .build_cartesian_2d(0u32..WIDTH, HEIGHT..0u32)?;
        chart
            .configure_mesh()
            .disable_mesh()
            .x_desc("u (px)")
            .y_desc("v (px)")
            .x_labels(5)
            .y_labels(5)
            .label_style(("sans-serif", 13))
            .axis_desc_style(("sans-serif", 14))
            .draw()?;
        chart.draw_series(map.values.iter().enumerate().map(|(k, &e)| {
            let c = k as u32 % map.cols * STEP_PX;
            let r = k as u32 / map.cols * STEP_PX;
            let colour = ramp(e / top);
            Rectangle::new([(c, r), (c + STEP_PX, r + STEP_PX)], colour.filled())
        }))?;
    }
    // Colour bar.
    let mut legend = ChartBuilder::on(&bar)
        .margin_top(40)
        .margin_bottom(38)
        .margin_right(10)
        .y_label_area_size(0)
        .right_y_label_area_size(60)
        .build_cartesian_2d(0.0..1.0, 0.0..top)?;
    legend
        .configure_mesh()
        .disable_mesh()
        .disable_x_axis()
        .y_labels(6)
        .y_desc("error (px)")
        .label_style(("sans-serif", 14))
        .axis_desc_style(("sans-serif", 14))
        .draw()?;
    let steps = 100;
    legend.draw_series((0..steps).map(|i| {
        let a = top * f64::from(i) / f64::from(steps);
        let b = top * f64::from(i + 1) / f64::from(steps);
        Rectangle::new([(0.0, a), (1.0, b)], ramp(a / top).filled())
    }))?;
    root.present()?;
    Ok(())
}

/// A sequential colour ramp, dark blue (0) through teal and green to pale
/// yellow (1), linear between five anchors (chosen for this demo).
fn ramp(t: f64) -> RGBColor {
    const ANCHORS: [(f64, f64, f64); 5] = [
        (24.0, 28.0, 84.0),
        (33.0, 102.0, 150.0),
        (52.0, 160.0, 130.0),
        (180.0, 206.0, 70.0),
        (250.0, 238.0, 170.0),
    ];
    let t = if t.is_finite() {
        t.clamp(0.0, 1.0)
    } else {
        0.0
    };
    let x = t * (ANCHORS.len() - 1) as f64;
    let i = (x.floor() as usize).min(ANCHORS.len() - 2);
    let f = x - i as f64;
    let (a, b) = (ANCHORS[i], ANCHORS[i + 1]);
    let mix = |p: f64, q: f64| (p + (q - p) * f).round() as u8;
    RGBColor(mix(a.0, b.0), mix(a.1, b.1), mix(a.2, b.2))
}
