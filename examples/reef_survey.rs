//! The main demo: an invented shallow-reef survey and an inspection camera.
//!
//! Scenario (invented data, typical indices from memory): a survey drone hovers
//! 25 m above a calm lagoon and photographs marker plates lying on a sand floor
//! 3 m deep; then an inspection camera in a housing with an 8 mm glass port
//! looks at a target 1.5 m away. flatray tells where things appear and where
//! they really are.
//!
//! Run: `cargo run --release --example reef_survey`

use flatray::{
    apparent_position, line_of_sight, trace, true_position, Image, Layer, Ray, Stack, Vec3,
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
