"""Cameras behind a flat port: pixel to ray, point to pixel, remap tables,
field of view and stereo triangulation.

Camera frame: x right, y down, z forward, origin at the centre of projection;
the port is a :class:`~flatray.Stack` in that frame whose observer's medium is
inside the housing (air) and whose object's medium is outside (water). Pixel
(0, 0) is the centre of the top-left pixel, u grows to the right and v
downward; ``(u, v)`` are coordinates in the real (distorted) image. Metres,
radians (degrees only in helpers ending in ``_deg``) and pixels.

The lens is a pinhole with Brown-Conrady distortion (:class:`Lens`). A
flat-port camera has no single viewpoint, so a remap table to an in-water
pinhole camera is exact only at one distance; :func:`remap_error` tells how
far off it is elsewhere.
"""

from __future__ import annotations

import ctypes
import math
from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from . import _lib
from ._convert import array3, points as _points, real, vec3
from ._types import FlatrayCameraView, FlatrayLens, FlatrayRay, FlatrayVec3
from .batch import _UNSET, _finish
from .stack import c_stack

_DOUBLE_P = ctypes.POINTER(ctypes.c_double)
_FLOAT_P = ctypes.POINTER(ctypes.c_float)
_INT32_P = ctypes.POINTER(ctypes.c_int32)
_RAY_P = ctypes.POINTER(FlatrayRay)
_VEC_P = ctypes.POINTER(FlatrayVec3)
_UINT32_MAX = 2**32 - 1


@dataclass(frozen=True)
class Lens:
    """Pinhole intrinsics and Brown-Conrady distortion of a lens in air.

    Normalised coordinates ``(x, y) = (X/Z, Y/Z)`` of a direction are distorted,
    with ``r² = x² + y²``, to
    ``x_d = x (1 + k1 r² + k2 r⁴ + k3 r⁶) + 2 p1 x y + p2 (r² + 2 x²)`` and
    ``y_d = y (1 + k1 r² + k2 r⁴ + k3 r⁶) + p1 (r² + 2 y²) + 2 p2 x y``
    (Brown 1966, Conrady 1919), and the pixel is ``(fx x_d + cx, fy y_d + cy)``.

    Attributes:
        fx, fy: focal lengths, pixels (> 0).
        cx, cy: principal point, pixels.
        k1, k2, k3: radial distortion; p1, p2: tangential distortion.

    The library validates the values on every call (a zero focal length raises
    :class:`~flatray.InvalidArgumentError`).

    Example:
        >>> lens = Lens(1400.0, 1400.0, 959.5, 539.5, k1=-0.1)
        >>> lens.without_distortion().k1
        0.0
    """

    fx: float
    fy: float
    cx: float
    cy: float
    k1: float = 0.0
    k2: float = 0.0
    k3: float = 0.0
    p1: float = 0.0
    p2: float = 0.0

    def to_c(self) -> FlatrayLens:
        """A new ``FlatrayLens`` struct with these values."""
        return FlatrayLens(*(real(getattr(self, f), f) for f, _ in FlatrayLens._fields_))

    def without_distortion(self) -> "Lens":
        """The same intrinsics with every distortion term 0."""
        return Lens(self.fx, self.fy, self.cx, self.cy)


def _c_lens(lens, name: str = "lens"):
    if isinstance(lens, Lens):
        return ctypes.byref(lens.to_c())
    if isinstance(lens, FlatrayLens):
        return ctypes.byref(lens)
    raise TypeError(f"{name} must be a flatray.Lens or FlatrayLens, got {type(lens).__name__}")


def _size(value, name: str) -> int:
    try:
        n = int(value)
    except (TypeError, ValueError):
        raise ValueError(f"{name} must be an integer, got {value!r}") from None
    if n != value or not 0 <= n <= _UINT32_MAX:
        raise ValueError(f"{name} must be an integer in [0, 2**32 - 1], got {value!r}")
    return n


class Ray(NamedTuple):
    """A ray in the object's medium."""

    #: Origin on the port's outer face, metres, shape (3,).
    origin: np.ndarray
    #: Unit direction, shape (3,).
    direction: np.ndarray


def pixel_to_ray(lens, port, u: float, v: float) -> Ray:
    """Back-projection: the ray in the water of pixel ``(u, v)`` of the real image.

    Raises:
        InvalidArgumentError: a bad lens, port or pixel.
        WrongSideError: the centre of projection is not inside the housing.
        NotConvergedError: the pixel lies outside the image of the region where
            the lens distortion model is one-to-one.
        TotalInternalReflectionError, MissesInterfaceError: the ray cannot leave.

    Example:
        >>> port = Stack((0, 0, 0.03), (0, 0, 1), 1.00028, [(0.008, 1.52)], 1.339)
        >>> lens = Lens(1400.0, 1400.0, 959.5, 539.5)
        >>> o, d = pixel_to_ray(lens, port, 959.5, 539.5)
        >>> o.round(6).tolist(), d.tolist()
        ([0.0, 0.0, 0.038], [0.0, 0.0, 1.0])
    """
    out = FlatrayRay()
    status = _lib.lib.flatray_pixel_to_ray(
        _c_lens(lens), c_stack(port), real(u, "u"), real(v, "v"), ctypes.byref(out))
    _lib.check(status, "flatray_pixel_to_ray")
    return Ray(array3(out.origin), array3(out.direction))


def point_to_pixel(lens, port, point) -> tuple[float, float]:
    """Forward projection: the pixel ``(u, v)`` of the real image where ``point``
    (metres, camera frame, in the water) appears.

    Raises:
        WrongSideError: the point is inside the housing or the window, or
            behind the camera.
        OutOfRangeError: outside the region where the lens model is one-to-one.

    Example:
        >>> port = Stack((0, 0, 0.03), (0, 0, 1), 1.00028, [(0.008, 1.52)], 1.339)
        >>> lens = Lens(1400.0, 1400.0, 959.5, 539.5)
        >>> [round(c, 6) for c in point_to_pixel(lens, port, (0, 0, 2.0))]
        [959.5, 539.5]
    """
    u = ctypes.c_double()
    v = ctypes.c_double()
    status = _lib.lib.flatray_point_to_pixel(
        _c_lens(lens), c_stack(port), vec3(point, "point"), ctypes.byref(u), ctypes.byref(v))
    _lib.check(status, "flatray_point_to_pixel")
    return u.value, v.value


class RayBatch(NamedTuple):
    """Result of :func:`pixels_to_rays`."""

    #: (N, 3) ray origins on the port's outer face, metres.
    origins: np.ndarray
    #: (N, 3) unit directions in the water.
    directions: np.ndarray
    #: (N,) int32 :class:`~flatray.Status` codes.
    status: np.ndarray


class PixelBatch(NamedTuple):
    """Result of :func:`points_to_pixels`."""

    #: (N, 2) pixels ``(u, v)``; NaN rows for failed points.
    uv: np.ndarray
    #: (N,) int32 :class:`~flatray.Status` codes.
    status: np.ndarray


def pixels_to_rays(lens, port, uv, *, raise_on_error: bool = False) -> RayBatch:
    """:func:`pixel_to_ray` of N pixels in one library call.

    Args:
        uv: (N, 2) pixels ``(u, v)``.
        raise_on_error: raise the lowest-index failure instead of only reporting
            it in ``status``.

    Example:
        >>> port = Stack((0, 0, 0.03), (0, 0, 1), 1.00028, [(0.008, 1.52)], 1.339)
        >>> o, d, st = pixels_to_rays(Lens(1400.0, 1400.0, 959.5, 539.5), port,
        ...                           [[0, 0], [float("nan"), 1]])
        >>> st.tolist()
        [0, 2]
    """
    pixels = np.asarray(uv)
    if pixels.ndim != 2 or pixels.shape[1] != 2:
        raise ValueError(f"uv must be an array of shape (N, 2), got shape {pixels.shape}")
    try:
        pixels = np.ascontiguousarray(pixels, dtype=np.float64)
    except (TypeError, ValueError) as exc:
        raise ValueError(f"uv must hold real numbers: {exc}") from None
    n = len(pixels)
    out = np.empty((n, 2, 3), dtype=np.float64)
    status = np.full(n, _UNSET, dtype=np.int32)
    rc = _lib.lib.flatray_pixels_to_rays(
        _c_lens(lens), c_stack(port), pixels.ctypes.data_as(_DOUBLE_P), n,
        out.ctypes.data_as(_RAY_P), status.ctypes.data_as(_INT32_P))
    _finish(rc, status, "flatray_pixels_to_rays", raise_on_error)
    return RayBatch(out[:, 0, :], out[:, 1, :], status)


def points_to_pixels(lens, port, points, *, raise_on_error: bool = False) -> PixelBatch:
    """:func:`point_to_pixel` of N points (an (N, 3) array, metres) in one call.

    Example:
        >>> port = Stack((0, 0, 0.03), (0, 0, 1), 1.00028, [(0.008, 1.52)], 1.339)
        >>> uv, st = points_to_pixels(Lens(1400.0, 1400.0, 959.5, 539.5), port,
        ...                           [[0, 0, 2.0], [0, 0, -1.0]])
        >>> uv[0].round(6).tolist(), st.tolist()
        ([959.5, 539.5], [0, 5])
    """
    pts = _points(points, "points")
    n = len(pts)
    out = np.empty((n, 2), dtype=np.float64)
    status = np.full(n, _UNSET, dtype=np.int32)
    rc = _lib.lib.flatray_points_to_pixels(
        _c_lens(lens), c_stack(port), pts.ctypes.data_as(_VEC_P), n,
        out.ctypes.data_as(_DOUBLE_P), status.ctypes.data_as(_INT32_P))
    _finish(rc, status, "flatray_points_to_pixels", raise_on_error)
    return PixelBatch(out, status)


def remap_table(lens, port, target, object_distance: float, width: int, height: int,
                *, out: tuple[np.ndarray, np.ndarray] | None = None
                ) -> tuple[np.ndarray, np.ndarray]:
    """A remap table from the real image to the ideal pinhole camera ``target``
    in the water (same centre of projection; its distortion is ignored).

    Entry ``[j, i]`` holds the real-image pixel ``(map_u, map_v)`` where the
    point at range ``object_distance`` metres from the centre of projection, on
    the ray of target pixel ``(i, j)``, appears; NaN where that point is not
    visible. The arrays suit the usual image-resampling routines
    (``dst[j, i] = src[map_v[j, i], map_u[j, i]]``).

    Args:
        target: a :class:`Lens` (or ``FlatrayLens``); only fx, fy, cx, cy count.
        width, height: size of the target image, pixels.
        out: optional ``(map_u, map_v)`` float32 C-contiguous arrays of shape
            (height, width) to fill instead of new ones.

    Returns:
        ``(map_u, map_v)``, float32 arrays of shape (height, width).

    Example:
        >>> port = Stack((0, 0, 0.03), (0, 0, 1), 1.00028, [(0.008, 1.52)], 1.339)
        >>> lens = Lens(1400.0, 1400.0, 959.5, 539.5)
        >>> mu, mv = remap_table(lens, port, Lens(1870, 1870, 959.5, 539.5), 2.0, 1920, 1080)
        >>> mu.shape, mu.dtype.name
        ((1080, 1920), 'float32')
    """
    w = _size(width, "width")
    h = _size(height, "height")
    if out is None:
        map_u = np.empty((h, w), dtype=np.float32)
        map_v = np.empty((h, w), dtype=np.float32)
    else:
        map_u, map_v = out
        for name, a in (("map_u", map_u), ("map_v", map_v)):
            if (not isinstance(a, np.ndarray) or a.dtype != np.float32
                    or not a.flags.c_contiguous or not a.flags.writeable):
                raise ValueError(f"out {name} must be a writeable C-contiguous float32 array")
    n = min(map_u.size, map_v.size)
    status = _lib.lib.flatray_remap_table(
        _c_lens(lens), c_stack(port), _c_lens(target, "target"),
        real(object_distance, "object_distance"), w, h,
        map_u.ctypes.data_as(_FLOAT_P), map_v.ctypes.data_as(_FLOAT_P), n)
    _lib.check(status, "flatray_remap_table")
    return map_u, map_v


class RemapError(NamedTuple):
    """Result of :func:`remap_error`, pixels of the real image."""

    #: Largest misplacement.
    max_px: float
    #: Root mean square misplacement over the pixels visible at both distances.
    rms_px: float


def remap_error(lens, port, target, table_distance: float, object_distance: float,
                width: int, height: int) -> RemapError:
    """How far a remap table built for ``table_distance`` misplaces points at
    ``object_distance`` (metres of range from the centre of projection): for
    each target pixel, the distance between the table's entry and the real
    pixel of the point at ``object_distance`` on the same target ray.

    Zero at the table's distance, growing away from it (a flat-port camera has
    no single viewpoint).

    Example:
        >>> port = Stack((0, 0, 0.03), (0, 0, 1), 1.00028, [(0.008, 1.52)], 1.339)
        >>> lens, target = Lens(700.0, 700.0, 319.5, 239.5), Lens(935, 935, 319.5, 239.5)
        >>> remap_error(lens, port, target, 2.0, 2.0, 640, 480)
        RemapError(max_px=0.0, rms_px=0.0)
        >>> remap_error(lens, port, target, 2.0, 0.5, 640, 480).max_px > 0.5
        True
    """
    max_px = ctypes.c_double()
    rms_px = ctypes.c_double()
    status = _lib.lib.flatray_remap_error(
        _c_lens(lens), c_stack(port), _c_lens(target, "target"),
        real(table_distance, "table_distance"), real(object_distance, "object_distance"),
        _size(width, "width"), _size(height, "height"), ctypes.byref(max_px),
        ctypes.byref(rms_px))
    _lib.check(status, "flatray_remap_error")
    return RemapError(max_px.value, rms_px.value)


def field_of_view(lens, port, width: int, height: int) -> tuple[float, float]:
    """Horizontal and vertical angles of view in the water, radians: between
    the refracted rays of the image edges (u = -0.5 and width - 0.5 on the row
    v = cy; v = -0.5 and height - 0.5 on the column u = cx).

    Example:
        >>> port = Stack((0, 0, 0.03), (0, 0, 1), 1.0, [(0.008, 1.52)], 1.333)
        >>> h, v = field_of_view(Lens(500, 500, 319.5, 239.5), port, 640, 480)
        >>> round(math.degrees(h), 3)   # 2 asin(sin(32.62 deg) / 1.333)
        47.706
    """
    h = ctypes.c_double()
    v = ctypes.c_double()
    status = _lib.lib.flatray_field_of_view(
        _c_lens(lens), c_stack(port), _size(width, "width"), _size(height, "height"),
        ctypes.byref(h), ctypes.byref(v))
    _lib.check(status, "flatray_field_of_view")
    return h.value, v.value


def field_of_view_deg(lens, port, width: int, height: int) -> tuple[float, float]:
    """:func:`field_of_view` in degrees."""
    h, v = field_of_view(lens, port, width, height)
    return math.degrees(h), math.degrees(v)


@dataclass(frozen=True)
class CameraView:
    """What a flat-port camera sees (:func:`camera_view`).

    Angles in radians, focal lengths and radius in pixels.
    """

    #: Angles of view in the water: horizontal, vertical, diagonal (corners).
    horizontal: float
    vertical: float
    diagonal: float
    #: Angles of view of the bare lens in air (without the port).
    horizontal_air: float
    vertical_air: float
    diagonal_air: float
    #: Effective focal lengths in the water along the axis (at the principal
    #: point); about f n_water / n_air for a perpendicular port.
    focal_x_water: float
    focal_y_water: float
    #: Distance from the principal point to the nearest pixel whose ray would
    #: need total internal reflection; None when no pixel needs it.
    tir_radius_px: float | None


def camera_view(lens, port, width: int, height: int) -> CameraView:
    """Field of view in water and in air (horizontal, vertical, diagonal), the
    in-water focal lengths and the total-internal-reflection radius.

    Example:
        >>> port = Stack((0, 0, 0.03), (0, 0, 1), 1.0, [(0.008, 1.52)], 1.333)
        >>> view = camera_view(Lens(500, 500, 319.5, 239.5), port, 640, 480)
        >>> round(view.focal_x_water / 500, 6), view.tir_radius_px
        (1.333, None)
    """
    out = FlatrayCameraView()
    status = _lib.lib.flatray_camera_view(
        _c_lens(lens), c_stack(port), _size(width, "width"), _size(height, "height"),
        ctypes.byref(out))
    _lib.check(status, "flatray_camera_view")
    tir = out.tir_radius_px
    return CameraView(out.horizontal, out.vertical, out.diagonal, out.horizontal_air,
                      out.vertical_air, out.diagonal_air, out.focal_x_water,
                      out.focal_y_water, None if tir < 0 else tir)


class StereoPoint(NamedTuple):
    """Result of :func:`stereo_triangulate`."""

    #: The point in camera A's frame, metres, shape (3,).
    point: np.ndarray
    #: Root mean square distance from the point to the two refracted rays, metres.
    rms_miss: float


def stereo_triangulate(lens_a, port_a, lens_b, port_b, rotation, translation, uv_a,
                       uv_b) -> StereoPoint:
    """Triangulate a point from pixel ``uv_a`` of camera A and ``uv_b`` of camera
    B, each behind its own port: the least-squares intersection of the two
    refracted rays.

    Args:
        rotation: 3x3 rotation R and ``translation``: 3 values t (metres) of the
            pose of B in A's frame, ``x_a = R x_b + t``.
        uv_a, uv_b: ``(u, v)`` pixels in the real images.

    Raises:
        DegenerateError: parallel rays. WrongSideError: the rays come closest
        behind a port. InvalidArgumentError: R is not a rotation.

    Example:
        >>> port = Stack((0, 0, 0.03), (0, 0, 1), 1.00028, [(0.008, 1.52)], 1.339)
        >>> lens = Lens(1400.0, 1400.0, 959.5, 539.5)
        >>> p = (0.1, 0.0, 2.0)
        >>> uv_a = point_to_pixel(lens, port, p)
        >>> uv_b = point_to_pixel(lens, port, (p[0] - 0.2, p[1], p[2]))
        >>> hit = stereo_triangulate(lens, port, lens, port, np.eye(3), (0.2, 0, 0), uv_a, uv_b)
        >>> hit.point.round(9).tolist()
        [0.1, 0.0, 2.0]
    """
    r = np.asarray(rotation, dtype=np.float64)
    if r.shape != (3, 3):
        raise ValueError(f"rotation must have shape (3, 3), got {r.shape}")
    t = np.asarray(translation, dtype=np.float64)
    if t.shape != (3,):
        raise ValueError(f"translation must have shape (3,), got {t.shape}")
    pose = np.ascontiguousarray(np.concatenate([r.reshape(9), t]))
    ua, va = (real(c, "uv_a") for c in _pair(uv_a, "uv_a"))
    ub, vb = (real(c, "uv_b") for c in _pair(uv_b, "uv_b"))
    out = FlatrayVec3()
    rms = ctypes.c_double()
    status = _lib.lib.flatray_stereo_triangulate(
        _c_lens(lens_a, "lens_a"), c_stack(port_a), _c_lens(lens_b, "lens_b"), c_stack(port_b),
        pose.ctypes.data_as(_DOUBLE_P), ua, va, ub, vb, ctypes.byref(out), ctypes.byref(rms))
    _lib.check(status, "flatray_stereo_triangulate")
    return StereoPoint(array3(out), rms.value)


def _pair(value, name: str):
    try:
        a, b = value
    except (TypeError, ValueError):
        raise ValueError(f"{name} must be a pair (u, v), got {value!r}") from None
    return a, b
