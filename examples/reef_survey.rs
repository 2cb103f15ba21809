//! The main demo: an invented shallow-reef survey and an inspection camera.
//!
//! Scenario (invented data, typical indices from memory): a survey drone hovers
//! 25 m above a calm lagoon and photographs marker plates lying on a sand floor
//! 3 m deep; then an inspection camera in a housing with an 8 mm glass port
//! looks at a target 1.5 m away. flatray tells where things appear and where
//! they really are. Part 3 takes its indices from the media models instead
//! (`flatray::media`) and shows how much the water's temperature and salt move
//! a corrected depth.
//!
//! Run: `cargo run --release --example reef_survey`

use flatray::media::STANDARD_PRESSURE_PA;
use flatray::{
    apparent_position, line_of_sight, trace, true_position, Image, Layer, Material, Medium, Ray,
    Stack, StackBuilder, Vec3,
};

/// Typical refractive indices near 532 nm (green survey light), from memory;
/// the media module computes them from temperature, salinity and wavelength.
const N_AIR: f64 = 1.000_28;
const N_SEAWATER: f64 = 1.339;
const N_GLASS: f64 = 1.52;

fn main() -> Result<(), flatray::Error> {
    println!(
        "flatray {} demo: invented data\n",
        env!("CARGO_PKG_VERSION")
    );
    drone_over_lagoon()?;
    println!();
    camera_in_housing()?;
    println!();
    water_conditions()?;
    println!();
    println!("CAUTION: water always looks shallower than it is. Never judge the depth of water");
    println!("for diving, jumping or wading by eye or from uncorrected images, and treat these");
    println!("numbers as a model, not a measurement. Survey work near water follows local safety");
    println!("rules and, for charting or engineering use, licensed hydrographic practice.");
    Ok(())
}

fn drone_over_lagoon() -> Result<(), flatray::Error> {
    // z up, water surface at z = 0; the normal points from the drone into the water.
    let lagoon = Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), N_AIR, N_SEAWATER)?;
    let drone = Vec3::new(0.0, 0.0, 25.0);
    let floor_depth_m = 3.0;
    println!("1. Survey drone 25 m above a lagoon, sand floor 3.00 m deep (n = {N_SEAWATER})");
    println!(
        "{:>6} {:>10} {:>9} {:>10} {:>11} {:>11} {:>9} {:>10}",
        "view", "marker", "true", "apparent", "apparent", "tangential", "factor", "recovered"
    );
    println!(
        "{:>6} {:>10} {:>9} {:>10} {:>11} {:>11} {:>9} {:>10}",
        "angle",
        "x (m)",
        "depth (m)",
        "sagittal",
        "tangential",
        "image x (m)",
        "true/app",
        "depth (m)"
    );
    for view_deg in [0.0f64, 10.0, 20.0, 30.0, 40.0, 50.0, 60.0] {
        // Where a ray leaving the drone at this angle from the vertical reaches the floor.
        let a = view_deg.to_radians();
        let ray = Ray::new(drone, Vec3::new(a.sin(), 0.0, -a.cos()));
        let in_water = trace(&lagoon, ray)?.ray;
        let marker = in_water.at(floor_depth_m / -in_water.direction.z);
        let sagittal = apparent_position(&lagoon, drone, marker, Image::Sagittal)?;
        let tangential = apparent_position(&lagoon, drone, marker, Image::Tangential)?;
        // A photogrammetric survey reports the apparent point; flatray corrects it.
        let recovered = true_position(&lagoon, drone, sagittal, Image::Sagittal)?;
        println!(
            "{:>5.0}° {:>10.3} {:>9.3} {:>10.3} {:>11.3} {:>11.3} {:>9.3} {:>10.3}",
            view_deg,
            marker.x,
            -marker.z,
            -sagittal.z,
            -tangential.z,
            tangential.x,
            marker.z / sagittal.z,
            -recovered.z,
        );
    }
    println!(
        "   The nadir factor is n_water/n_air = {:.3}; it grows with the viewing angle,",
        N_SEAWATER / N_AIR
    );
    println!("   so a single constant factor under-corrects oblique views.");
    Ok(())
}

fn camera_in_housing() -> Result<(), flatray::Error> {
    // Camera frame: z forward. The port's inner face is 40 mm in front of the centre
    // of projection; 8 mm of glass, then seawater.
    let port = Stack::new(
        Vec3::new(0.0, 0.0, 0.040),
        Vec3::new(0.0, 0.0, 1.0),
        N_AIR,
        &[Layer::new(0.008, N_GLASS)],
        N_SEAWATER,
    )?;
    let centre = Vec3::ZERO;
    println!("2. Inspection camera behind an 8 mm glass flat port, target 1.50 m away");
    println!(
        "{:>12} {:>14} {:>14} {:>13} {:>14}",
        "field angle", "pinhole angle", "seen at angle", "apparent", "light through"
    );
    println!(
        "{:>12} {:>14} {:>14} {:>13} {:>14}",
        "in water", "to target", "(in housing)", "range (m)", "the port"
    );
    for field_deg in [0.0f64, 10.0, 20.0, 30.0, 40.0] {
        let f = field_deg.to_radians();
        let target = Vec3::new(1.5 * f.sin(), 0.0, 1.5 * f.cos() + 0.048);
        let path = line_of_sight(&port, centre, target)?;
        let pinhole = target.x.atan2(target.z).to_degrees();
        let seen = path.direction.x.atan2(path.direction.z).to_degrees();
        let apparent = apparent_position(&port, centre, target, Image::Sagittal)?;
        println!(
            "{:>11.0}° {:>13.2}° {:>13.2}° {:>13.3} {:>13.1}%",
            field_deg,
            pinhole,
            seen,
            apparent.length(),
            100.0 * path.transmittance,
        );
    }
    println!(
        "   Behind a flat port objects look about {:.2}x closer and the view is narrower:",
        N_SEAWATER / N_AIR
    );
    println!("   an in-air calibration does not hold in water.");
    Ok(())
}

/// Green survey light, vacuum wavelength in nm.
const GREEN_NM: f64 = 532.0;

fn water_conditions() -> Result<(), flatray::Error> {
    // Indices from the models: air at 1 atm (20 °C, 50 % humidity), cold
    // seawater (4 °C, 35 PSU) and warm fresh water (25 °C).
    let camera_air = Medium::air(20.0, STANDARD_PRESSURE_PA, 0.5);
    let cold_sea = Medium::seawater(4.0, 35.0);
    let warm_fresh = Medium::pure_water(25.0, STANDARD_PRESSURE_PA);
    let sapphire = Medium::Material(Material::SapphireOrdinary);

    // The camera in air at 1 atm behind an 8 mm sapphire port, in seawater at
    // 4 °C and 35 PSU, at 532 nm; the port's inner face 40 mm ahead, z forward.
    let port = |water: Medium| {
        StackBuilder::new(camera_air, water)
            .origin(Vec3::new(0.0, 0.0, 0.040))
            .layer(0.008, sapphire)
            .build(GREEN_NM)
    };
    // The drone 25 m above the water, z up, surface at z = 0.
    let surface = |water: Medium| {
        StackBuilder::new(camera_air, water)
            .normal(Vec3::new(0.0, 0.0, -1.0))
            .build(GREEN_NM)
    };
    let housing = port(cold_sea)?;
    println!("3. Indices from the media models at {GREEN_NM} nm (camera in air at 1 atm,");
    println!("   8 mm sapphire port, seawater at 4 °C and 35 PSU, built with StackBuilder):");
    println!(
        "   air {:.6}, sapphire {:.5}, seawater {:.5}; warm fresh water (25 °C) {:.5}",
        housing.n_observer(),
        housing.layers().first().map_or(f64::NAN, |l| l.index),
        housing.n_object(),
        warm_fresh.index(GREEN_NM)?,
    );
    println!("   An object 5.00 m deep in the cold seawater (for the camera: 5.00 m beyond the");
    println!("   port) appears shallower; here is the true depth recovered from that apparent");
    println!("   point with each water model.");
    println!(
        "{:>34} {:>10} {:>15} {:>15} {:>12}",
        "view", "apparent", "true depth as", "true depth as", "difference"
    );
    println!(
        "{:>34} {:>10} {:>15} {:>15} {:>12}",
        "", "depth (m)", "4 °C sea (m)", "25 °C fresh (m)", "(cm)"
    );

    let drone = Vec3::new(0.0, 0.0, 25.0);
    let (sea, fresh) = (surface(cold_sea)?, surface(warm_fresh)?);
    for view_deg in [0.0f64, 30.0, 50.0] {
        let a = view_deg.to_radians();
        let ray = Ray::new(drone, Vec3::new(a.sin(), 0.0, -a.cos()));
        let down = trace(&sea, ray)?.ray;
        let object = down.at(5.0 / -down.direction.z);
        let seen = apparent_position(&sea, drone, object, Image::Sagittal)?;
        let as_sea = true_position(&sea, drone, seen, Image::Sagittal)?;
        let as_fresh = true_position(&fresh, drone, seen, Image::Sagittal)?;
        print_depths(
            &format!("drone 25 m up, {view_deg:.0}° off nadir"),
            -seen.z,
            -as_sea.z,
            -as_fresh.z,
        );
    }
    let camera = Vec3::ZERO;
    let fresh_housing = port(warm_fresh)?;
    let outer_face = 0.048; // the port's outer face, metres ahead of the camera
    for field_deg in [0.0f64, 30.0] {
        let f = field_deg.to_radians();
        let object = Vec3::new(5.0 * f.tan(), 0.0, outer_face + 5.0);
        let seen = apparent_position(&housing, camera, object, Image::Sagittal)?;
        let as_sea = true_position(&housing, camera, seen, Image::Sagittal)?;
        let as_fresh = true_position(&fresh_housing, camera, seen, Image::Sagittal)?;
        print_depths(
            &format!("sapphire-port camera, {field_deg:.0}° field"),
            seen.z - outer_face,
            as_sea.z - outer_face,
            as_fresh.z - outer_face,
        );
    }
    println!("   Correcting with the wrong water (warm fresh instead of cold salt) leaves a few");
    println!("   centimetres of error at 5 m: measure temperature and salinity, not just depth.");
    Ok(())
}

fn print_depths(view: &str, apparent: f64, as_sea: f64, as_fresh: f64) {
    println!(
        "{view:>34} {apparent:>10.3} {as_sea:>15.3} {as_fresh:>15.3} {:>+12.1}",
        100.0 * (as_fresh - as_sea)
    );
}
