//! Camera C functions: a lens (`FlatrayLens`) behind a flat port (a
//! `FlatrayStack` in the camera frame): pixel to ray, point to pixel, their
//! batches, remap tables and their error, field of view and stereo
//! triangulation.
//!
//! Camera frame: x right, y down, z forward, origin at the centre of
//! projection. Pixel (0, 0) is the centre of the top-left pixel, u to the
//! right, v down; `(u, v)` are real (distorted) image coordinates. Metres,
//! radians, pixels.

use super::types::{stack_from, FlatrayStack};
use super::{
    deliver, guard, optional_out, optional_slice_out, required, required_out, slice_in, slice_out,
    FlatrayStatus,
};
use crate::batch::{BatchReport, NoStatus};
use crate::camera::{FieldOfView, Lens, PortCamera, Pose, StereoPair};
use crate::vector::{Ray, Vec3};

/// What a flat-port camera sees (`flatray_camera_view`). Angles in radians,
/// focal lengths and radius in pixels.
#[derive(Debug, Clone, Copy, PartialEq)]
#[repr(C)]
pub struct FlatrayCameraView {
    /// Horizontal angle of view in the object's medium (the water).
    pub horizontal: f64,
    /// Vertical angle of view in the object's medium.
    pub vertical: f64,
    /// Diagonal angle of view (outer corners) in the object's medium.
    pub diagonal: f64,
    /// Horizontal angle of view of the bare lens in the housing's medium (air).
    pub horizontal_air: f64,
    /// Vertical angle of view in the housing's medium.
    pub vertical_air: f64,
    /// Diagonal angle of view in the housing's medium.
    pub diagonal_air: f64,
    /// Effective focal length along u in the water at the principal point.
    pub focal_x_water: f64,
    /// Effective focal length along v in the water at the principal point.
    pub focal_y_water: f64,
    /// Distance from the principal point to the nearest pixel whose ray would
    /// need total internal reflection; -1 when no pixel's ray needs it.
    pub tir_radius_px: f64,
}

impl FlatrayCameraView {
    /// Every field NaN: what the call writes on error.
    /// cbindgen:ignore
    pub const NAN: FlatrayCameraView = FlatrayCameraView {
        horizontal: f64::NAN,
        vertical: f64::NAN,
        diagonal: f64::NAN,
        horizontal_air: f64::NAN,
        vertical_air: f64::NAN,
        diagonal_air: f64::NAN,
        focal_x_water: f64::NAN,
        focal_y_water: f64::NAN,
        tir_radius_px: f64::NAN,
    };
}

/// A camera from its two required pointers.
unsafe fn camera_from(
    lens: *const Lens,
    port: *const FlatrayStack,
) -> Result<PortCamera, FlatrayStatus> {
    // SAFETY: forwarded caller contract (NULL or valid).
    let lens = unsafe { required(lens) }?;
    let port = unsafe { stack_from(port) }?;
    PortCamera::new(*lens, port).map_err(FlatrayStatus::from)
}

/// Write two scalar outputs, both required: the values, or NaN in every
/// non-NULL one and the error status.
unsafe fn deliver_pair(
    out_a: *mut f64,
    out_b: *mut f64,
    result: impl FnOnce() -> Result<(f64, f64), FlatrayStatus>,
) -> Result<(), FlatrayStatus> {
    // SAFETY: forwarded caller contract (NULL or writable).
    let a = unsafe { optional_out(out_a) };
    let b = unsafe { optional_out(out_b) };
    let result = match (&a, &b) {
        (Some(_), Some(_)) => result(),
        _ => Err(FlatrayStatus::FLATRAY_ERR_NULL_POINTER),
    };
    let (va, vb, status) = match result {
        Ok((x, y)) => (x, y, Ok(())),
        Err(s) => (f64::NAN, f64::NAN, Err(s)),
    };
    if let Some(a) = a {
        *a = va;
    }
    if let Some(b) = b {
        *b = vb;
    }
    status
}

fn finish(report: crate::Result<BatchReport>) -> Result<(), FlatrayStatus> {
    let report = report.map_err(FlatrayStatus::from)?;
    match FlatrayStatus::from(report.status()) {
        FlatrayStatus::FLATRAY_OK => Ok(()),
        status => Err(status),
    }
}

/// Back-projection: the ray in the object's medium (the water) of pixel
/// `(u, v)` of the real image; origin on the port's outer face, unit direction.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `lens`, `port` or `out_ray` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: `fx` or `fy` not finite and > 0, another
///   lens field or `u`, `v` not finite, an invalid port.
/// * `FLATRAY_ERR_WRONG_SIDE`: the centre of projection is not inside the
///   housing (before the port).
/// * `FLATRAY_ERR_NOT_CONVERGED`: the pixel lies outside the image of the region
///   where the lens distortion model is one-to-one.
/// * `FLATRAY_ERR_MISSES_INTERFACE`: the pixel's ray does not reach the port.
/// * `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION`: it cannot cross the port.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: not representable.
///
/// # Safety
/// `lens`, `port`: NULL or valid; `out_ray`: NULL or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_pixel_to_ray(
    lens: *const Lens,
    port: *const FlatrayStack,
    u: f64,
    v: f64,
    out_ray: *mut Ray,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        let out = unsafe { required_out(out_ray) }?;
        let result = unsafe { camera_from(lens, port) }
            .and_then(|cam| cam.pixel_to_ray(u, v).map_err(FlatrayStatus::from));
        deliver(out, Ray::NAN, result)
    })
}

/// Forward projection: the pixel `(u, v)` of the real image at which `point`
/// (metres, camera frame, in the object's medium) appears.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `lens`, `port`, `out_u` or `out_v` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: an invalid lens or port, a non-finite point.
/// * `FLATRAY_ERR_WRONG_SIDE`: the point is not past the port (inside the
///   housing or the window, or behind the camera), its line of sight leaves the
///   centre backwards, or the centre is not inside the housing.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: the direction lies outside the region where the
///   lens distortion model is one-to-one, or the pixel is not representable.
/// * `FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION`, `FLATRAY_ERR_NOT_CONVERGED`: as
///   `flatray_line_of_sight`.
///
/// # Safety
/// `lens`, `port`: NULL or valid; `out_u`, `out_v`: NULL or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_point_to_pixel(
    lens: *const Lens,
    port: *const FlatrayStack,
    point: Vec3,
    out_u: *mut f64,
    out_v: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        unsafe {
            deliver_pair(out_u, out_v, || {
                let cam = camera_from(lens, port)?;
                cam.point_to_pixel(point).map_err(FlatrayStatus::from)
            })
        }
    })
}

/// `flatray_pixel_to_ray` of `count` pixels; `uv` holds `2*count` values
/// `u0, v0, u1, v1, ...`. `out_rays` has room for `count` rays, `out_status`
/// is NULL or has room for `count` codes.
///
/// # Returns
/// `FLATRAY_OK` when every pixel succeeded, else the status of the lowest-index
/// failing pixel (its ray is NaN, the others are computed). Whole-call errors
/// write nothing: `FLATRAY_ERR_NULL_POINTER` (NULL `lens`, `port`, or an array
/// with `count > 0`), `FLATRAY_ERR_INVALID_ARGUMENT` (invalid lens or port),
/// `FLATRAY_ERR_WRONG_SIDE` (centre of projection outside the housing).
///
/// # Safety
/// `lens`, `port`: NULL or valid; each array NULL (only with `count == 0`, or
/// for `out_status`) or valid for its length; outputs must not overlap inputs.
#[no_mangle]
pub unsafe extern "C" fn flatray_pixels_to_rays(
    lens: *const Lens,
    port: *const FlatrayStack,
    uv: *const f64,
    count: usize,
    out_rays: *mut Ray,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer; [f64; 2] has the layout
        // and alignment of two consecutive doubles.
        let cam = unsafe { camera_from(lens, port) }?;
        let uv = unsafe { slice_in(uv.cast::<[f64; 2]>(), count) }?;
        let out = unsafe { slice_out(out_rays, count) }?;
        match unsafe { optional_slice_out(out_status, count) }? {
            Some(status) => finish(cam.pixels_to_rays(uv, out, status)),
            None => finish(cam.pixels_to_rays(uv, out, &mut NoStatus)),
        }
    })
}

/// `flatray_point_to_pixel` of `count` points; `out_uv` receives `2*count`
/// values `u0, v0, u1, v1, ...` (NaN for a failed point). `out_status` is NULL
/// or has room for `count` codes.
///
/// # Returns
/// As `flatray_pixels_to_rays`.
///
/// # Safety
/// As `flatray_pixels_to_rays`.
#[no_mangle]
pub unsafe extern "C" fn flatray_points_to_pixels(
    lens: *const Lens,
    port: *const FlatrayStack,
    points: *const Vec3,
    count: usize,
    out_uv: *mut f64,
    out_status: *mut i32,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer; [f64; 2] has the layout
        // and alignment of two consecutive doubles.
        let cam = unsafe { camera_from(lens, port) }?;
        let points = unsafe { slice_in(points, count) }?;
        let out = unsafe { slice_out(out_uv.cast::<[f64; 2]>(), count) }?;
        match unsafe { optional_slice_out(out_status, count) }? {
            Some(status) => finish(cam.points_to_pixels(points, out, status)),
            None => finish(cam.points_to_pixels(points, out, &mut NoStatus)),
        }
    })
}

/// Fill a remap table from the real image to the ideal pinhole camera
/// `target` in the object's medium (same centre of projection; its distortion
/// terms are ignored). For each target pixel `(i, j)`, row-major
/// (`k = j*width + i`), `map_u[k]`, `map_v[k]` receive the real-image pixel of
/// the point at range `object_distance` metres from the centre of projection
/// on that target pixel's ray, NaN where that point is not visible (inside the
/// housing, behind the camera, outside the lens model's valid region, or a
/// pixel beyond the range of float). Source pixels are not clipped to any image
/// size. Entries are the exact model's
/// pixels rounded to float.
///
/// # Returns
/// * `FLATRAY_OK` (also when no entry is visible: then every entry is NaN).
/// * `FLATRAY_ERR_NULL_POINTER`: `lens`, `port` or `target` is NULL, or `map_u`
///   or `map_v` is NULL with `map_len > 0`.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: `width` or `height` is 0, an invalid lens,
///   port or target (`fx`, `fy` not finite and > 0), `object_distance` not
///   finite and > 0.
/// * `FLATRAY_ERR_WRONG_SIDE`: the centre of projection is not inside the housing.
/// * `FLATRAY_ERR_BUFFER_TOO_SMALL`: `map_len < width*height` (NULL maps with
///   `map_len == 0` are empty arrays, so this too).
///
/// Nothing is written on error.
///
/// # Safety
/// `lens`, `port`, `target`: NULL or valid; `map_u`, `map_v`: NULL or valid
/// for `map_len` floats each, not overlapping.
#[no_mangle]
pub unsafe extern "C" fn flatray_remap_table(
    lens: *const Lens,
    port: *const FlatrayStack,
    target: *const Lens,
    object_distance: f64,
    width: u32,
    height: u32,
    map_u: *mut f32,
    map_v: *mut f32,
    map_len: usize,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        let cam = unsafe { camera_from(lens, port) }?;
        let target = unsafe { required(target) }?;
        if width == 0 || height == 0 {
            return Err(FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT);
        }
        let map_u = unsafe { slice_out(map_u, map_len) }?;
        let map_v = unsafe { slice_out(map_v, map_len) }?;
        cam.remap_table(target, object_distance, width, height, map_u, map_v)
            .map(|_| ())
            .map_err(FlatrayStatus::from)
    })
}

/// How far a remap table built for `table_distance` misplaces points at
/// `object_distance` (metres of range from the centre of projection): for
/// every target pixel, the distance in real-image pixels between the table's
/// entry and the real pixel of the point at `object_distance` on the same
/// target ray; the maximum and the root mean square over the pixels visible at
/// both distances.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `lens`, `port`, `target`, `out_max_px` or
///   `out_rms_px` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: as `flatray_remap_table`, and for either
///   distance.
/// * `FLATRAY_ERR_WRONG_SIDE`: no target pixel sees a point past the port at
///   both distances, or the centre of projection is not inside the housing.
/// * `FLATRAY_ERR_OUT_OF_RANGE`: the error is too large to represent (absurd
///   focal lengths).
///
/// # Safety
/// `lens`, `port`, `target`: NULL or valid; `out_max_px`, `out_rms_px`: NULL
/// or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_remap_error(
    lens: *const Lens,
    port: *const FlatrayStack,
    target: *const Lens,
    table_distance: f64,
    object_distance: f64,
    width: u32,
    height: u32,
    out_max_px: *mut f64,
    out_rms_px: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        unsafe {
            deliver_pair(out_max_px, out_rms_px, || {
                let cam = camera_from(lens, port)?;
                let target = required(target)?;
                let r = cam
                    .remap_error(target, table_distance, object_distance, width, height)
                    .map_err(FlatrayStatus::from)?;
                Ok((r.max_px, r.rms_px))
            })
        }
    })
}

/// Field of view in the object's medium (radians): the angle between the
/// refracted rays of the left and right image edges (`u = -0.5` and
/// `u = width - 0.5`) on the row `v = cy`, and between the top and bottom edges
/// (`v = -0.5`, `v = height - 0.5`) on the column `u = cx`.
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `lens`, `port`, `out_horizontal` or
///   `out_vertical` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: `width` or `height` is 0, an invalid lens
///   or port.
/// * otherwise as `flatray_pixel_to_ray` for an edge pixel.
///
/// # Safety
/// `lens`, `port`: NULL or valid; `out_horizontal`, `out_vertical`: NULL or
/// writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_field_of_view(
    lens: *const Lens,
    port: *const FlatrayStack,
    width: u32,
    height: u32,
    out_horizontal: *mut f64,
    out_vertical: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        unsafe {
            deliver_pair(out_horizontal, out_vertical, || {
                let cam = camera_from(lens, port)?;
                let fov = cam
                    .field_of_view(width, height)
                    .map_err(FlatrayStatus::from)?;
                Ok((fov.horizontal, fov.vertical))
            })
        }
    })
}

/// Everything about what the camera sees at once: field of view (horizontal,
/// vertical, diagonal) in the water and of the bare lens in air, the in-water
/// focal lengths at the principal point, and the pixel radius where total
/// internal reflection starts (-1 when no pixel needs it).
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: `lens`, `port` or `out_view` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: `width` or `height` is 0, an invalid lens
///   or port.
/// * otherwise as `flatray_pixel_to_ray` for an edge pixel or near the
///   principal point.
///
/// # Safety
/// `lens`, `port`: NULL or valid; `out_view`: NULL or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_camera_view(
    lens: *const Lens,
    port: *const FlatrayStack,
    width: u32,
    height: u32,
    out_view: *mut FlatrayCameraView,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        let out = unsafe { required_out(out_view) }?;
        let result = unsafe { camera_from(lens, port) }.and_then(|cam| {
            let view = || -> crate::Result<FlatrayCameraView> {
                let water: FieldOfView = cam.field_of_view(width, height)?;
                let air = cam.field_of_view_in_air(width, height)?;
                let (fx, fy) = cam.focal_length_in_water()?;
                let tir = cam.tir_radius()?;
                Ok(FlatrayCameraView {
                    horizontal: water.horizontal,
                    vertical: water.vertical,
                    diagonal: water.diagonal,
                    horizontal_air: air.horizontal,
                    vertical_air: air.vertical,
                    diagonal_air: air.diagonal,
                    focal_x_water: fx,
                    focal_y_water: fy,
                    tir_radius_px: tir.unwrap_or(-1.0),
                })
            };
            view().map_err(FlatrayStatus::from)
        });
        deliver(out, FlatrayCameraView::NAN, result)
    })
}

/// Triangulate a point from pixel `(u_a, v_a)` of camera A and `(u_b, v_b)` of
/// camera B, each behind its own port: the least-squares intersection of the
/// two refracted rays. `b_to_a` holds 12 values, the rotation R row-major (9)
/// then the translation t (3, metres), with `x_a = R x_b + t`. Writes the point
/// in A's frame and, when `out_rms_miss` is not NULL, the root mean square
/// distance from it to the two rays (metres).
///
/// # Returns
/// * `FLATRAY_OK`
/// * `FLATRAY_ERR_NULL_POINTER`: a lens, a port, `b_to_a` or `out_point_a` is NULL.
/// * `FLATRAY_ERR_INVALID_ARGUMENT`: an invalid lens or port, a non-finite
///   pixel, an R that is not a rotation (R^T R = I within 1e-6, det R > 0) or a
///   non-finite pose.
/// * `FLATRAY_ERR_DEGENERATE`: the rays are parallel.
/// * `FLATRAY_ERR_WRONG_SIDE`: the rays come closest behind a port, or a
///   centre of projection is not inside its housing.
/// * otherwise as `flatray_pixel_to_ray` for either pixel.
///
/// # Safety
/// Lenses and ports: NULL or valid; `b_to_a`: NULL or valid for 12 doubles;
/// `out_point_a`: NULL or writable; `out_rms_miss`: NULL or writable.
#[no_mangle]
pub unsafe extern "C" fn flatray_stereo_triangulate(
    lens_a: *const Lens,
    port_a: *const FlatrayStack,
    lens_b: *const Lens,
    port_b: *const FlatrayStack,
    b_to_a: *const f64,
    u_a: f64,
    v_a: f64,
    u_b: f64,
    v_b: f64,
    out_point_a: *mut Vec3,
    out_rms_miss: *mut f64,
) -> FlatrayStatus {
    guard(|| {
        // SAFETY: caller contract for every pointer.
        let rms = unsafe { optional_out(out_rms_miss) };
        let out = match unsafe { required_out(out_point_a) } {
            Ok(out) => out,
            Err(status) => {
                if let Some(r) = rms {
                    *r = f64::NAN;
                }
                return Err(status);
            }
        };
        let result = (|| {
            let a = unsafe { camera_from(lens_a, port_a) }?;
            let b = unsafe { camera_from(lens_b, port_b) }?;
            let values = unsafe { slice_in(b_to_a, 12) }?;
            let values: &[f64; 12] = values
                .try_into()
                .map_err(|_| FlatrayStatus::FLATRAY_ERR_INVALID_ARGUMENT)?;
            let pose = Pose::from_array(values).map_err(FlatrayStatus::from)?;
            StereoPair::new(a, b, pose)
                .triangulate(u_a, v_a, u_b, v_b)
                .map_err(FlatrayStatus::from)
        })();
        if let Some(r) = rms {
            *r = result.as_ref().map_or(f64::NAN, |p| p.rms_miss);
        }
        deliver(out, Vec3::NAN, result.map(|p| p.point))
    })
}
