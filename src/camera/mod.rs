//! Cameras behind a flat port: the exact model of a lens in a housing with a
//! flat window, for back-projection (pixel to ray), forward projection (point
//! to pixel), remap tables to an in-water pinhole camera, field of view and
//! stereo triangulation.
//!
//! Conventions: camera frame x right, y down, z forward, origin at the centre
//! of projection; the port is a [`crate::Stack`] in that frame whose observer's
//! medium is inside the housing. Pixel (0, 0) is the centre of the top-left
//! pixel, u grows to the right and v downward; `(u, v)` are coordinates in the
//! real (distorted) image. Metres, radians and pixels.
//!
//! * [`lens`]: pinhole intrinsics with Brown–Conrady distortion ([`Lens`]).
//! * [`port`]: [`PortCamera`], pixel ↔ ray through the port, single and batch.
//! * [`remap`]: remap tables and their error away from the table's distance.
//! * [`fov`]: field of view, in-water focal length, total internal reflection.
//! * [`stereo`]: two cameras with a relative [`Pose`]; triangulation.
//!
//! # Example
//! ```
//! use flatray::camera::{Lens, PortCamera};
//! use flatray::{Layer, Stack, Vec3};
//! // A 10 mm acrylic port 25 mm in front of the lens, fresh water outside.
//! let port = Stack::new(Vec3::new(0.0, 0.0, 0.025), Vec3::new(0.0, 0.0, 1.0),
//!                       1.000_28, &[Layer::new(0.010, 1.49)], 1.333)?;
//! let lens = Lens::pinhole(1000.0, 1000.0, 639.5, 359.5).with_distortion(-0.1, 0.02, 0.0, 0.0, 0.0);
//! let cam = PortCamera::new(lens, port)?;
//! let (fx_w, _) = cam.focal_length_in_water()?;
//! assert!((fx_w / 1000.0 - 1.333 / 1.000_28).abs() < 1e-9); // magnified by n_w / n_a
//! # Ok::<(), flatray::Error>(())
//! ```

pub mod fov;
pub mod lens;
pub mod port;
pub mod remap;
pub mod stereo;

pub use fov::FieldOfView;
pub use lens::{Distortion, Lens};
pub use port::PortCamera;
pub use remap::RemapResidual;
pub use stereo::{Pose, StereoPair, StereoPoint};
