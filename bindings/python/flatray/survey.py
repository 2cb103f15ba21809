"""Through-water survey corrections: refracted-ray triangulation, multi-view and
laser-range corrections of point clouds, depth tables and error budgets.

Every function calls the flatray C library; batches pass numpy buffers straight
to it (one call for N points, on every core for large N) and return a status
array beside the results. Units: metres and radians (``*_deg`` helpers take
degrees).
"""

from __future__ import annotations

import ctypes
import math
from typing import NamedTuple, Sequence

import numpy as np

from . import _lib
from ._convert import array3, image_code, observers as _observers, points as _points, real, vec3
from ._types import FlatrayRay, FlatrayVec3, Image
from .batch import PointBatch, _finish, _UNSET
from .stack import c_stack

_VEC_P = ctypes.POINTER(FlatrayVec3)
_RAY_P = ctypes.POINTER(FlatrayRay)
_DOUBLE_P = ctypes.POINTER(ctypes.c_double)
_INT32_P = ctypes.POINTER(ctypes.c_int32)
_SIZE_P = ctypes.POINTER(ctypes.c_size_t)
_U32_P = ctypes.POINTER(ctypes.c_uint32)

#: The single constant correction factor (true / apparent depth) practitioners
#: apply to clear water seen from air: 1.34 (Westaway, Lane and Hicks, 2001,
#: Photogrammetric Engineering & Remote Sensing 67(11)). Exact only at nadir.
CLEAR_WATER_NADIR_FACTOR = 1.34


class SurveyPoint(NamedTuple):
    """A corrected or triangulated point and its quality figure."""

    #: (3,) float64, metres.
    point: np.ndarray
    #: RMS miss, metres (see each function).
    rms_miss: float


class MultiviewBatch(NamedTuple):
    """Result of :func:`correct_multiviews`."""

    #: (N, 3) true points, NaN rows where failed.
    points: np.ndarray
    #: (N,) straight-line RMS misses (metres), NaN where failed.
    rms_miss: np.ndarray
    #: (N,) int32 :class:`~flatray.Status` codes.
    status: np.ndarray


class ValueBatch(NamedTuple):
    """Result of :func:`true_depths` and :func:`correction_factors`."""

    #: (N,) float64 results, NaN where failed.
    values: np.ndarray
    #: (N,) int32 :class:`~flatray.Status` codes.
    status: np.ndarray


class Sensitivity(NamedTuple):
    """Partial derivatives of a true point (metres), see :func:`true_position_sensitivity`."""

    #: (3,) d true / d stack offset along the unit normal.
    d_offset: np.ndarray
    #: (3,) d true / d n_object.
    d_n_object: np.ndarray
    #: (3, 3) d true_i / d observer_j.
    d_observer: np.ndarray
    #: (3, 3) d true_i / d apparent_j.
    d_apparent: np.ndarray


def _point_result(function, *args) -> SurveyPoint:
    out = FlatrayVec3()
    rms = ctypes.c_double()
    status = getattr(_lib.lib, function)(*args, ctypes.byref(out), ctypes.byref(rms))
    _lib.check(status, function)
    return SurveyPoint(array3(out), rms.value)


def triangulate(stack, origins, directions) -> SurveyPoint:
    """The true point seen along lines of sight from cameras (refracted-ray
    triangulation): each line is traced through the stack and the refracted rays
    are intersected by least squares.

    Args:
        origins: (N, 3) camera centres on the observer's side, or (3,) shared.
        directions: (N, 3) directions toward the object in the observer's medium.

    Returns:
        ``(point, rms_miss)``: the point (metres) and the RMS perpendicular
        distance from it to the refracted lines.

    Raises:
        DegenerateError: fewer than two lines, or parallel lines.

    Example:
        >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> cams = np.array([[0, 0, 30.0], [10, 0, 30.0]])
        >>> dirs = [line_of_sight(lake, c, (4, 0, -2)).direction for c in cams]
        >>> p, rms = triangulate(lake, cams, dirs)
        >>> [round(float(v), 9) for v in p]
        [4.0, 0.0, -2.0]
    """
    dirs = _points(directions, "directions")
    n = len(dirs)
    orig = np.asarray(origins, dtype=np.float64)
    if orig.shape == (3,):
        orig = np.broadcast_to(orig, (n, 3))
    if orig.shape != (n, 3):
        raise ValueError(f"origins must have shape (3,) or ({n}, 3), got {orig.shape}")
    rays = np.empty((n, 2, 3), dtype=np.float64)
    rays[:, 0, :] = orig
    rays[:, 1, :] = dirs
    return _point_result("flatray_triangulate", c_stack(stack), rays.ctypes.data_as(_RAY_P), n)


def correct_multiview(stack, observers, apparent) -> SurveyPoint:
    """The true point whose exact lines of sight from the camera centres
    ``observers``, triangulated as straight lines by least squares, give the
    uncorrected point ``apparent`` (Newton's method, to ~1e-13 of the
    camera-to-point distance).

    Returns:
        ``(point, rms_miss)``: the true point and the straight-line RMS miss of
        the exact lines of sight at ``apparent`` (metres).

    Raises:
        DegenerateError: fewer than two cameras or parallel lines of sight.
        WrongSideError: a camera under water or ``apparent`` above the surface.

    Example:
        >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> p, rms = correct_multiview(lake, [[0, 0, 30], [12, 3, 35]], (4, 0, -1.5))
        >>> bool(p[2] < -1.9)            # deeper than it looked
        True
    """
    obs = _points(observers, "observers")
    return _point_result("flatray_correct_multiview", c_stack(stack),
                         obs.ctypes.data_as(_VEC_P), len(obs), vec3(apparent, "apparent"))


def correct_multiview_shortcut(stack, observers, apparent) -> SurveyPoint:
    """An approximation of :func:`correct_multiview`, for comparison: each
    camera's straight line to ``apparent`` traced through the stack, the
    refracted rays intersected by least squares. Exact only for cameras placed
    symmetrically about the point.

    Example:
        >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> p, rms = correct_multiview_shortcut(lake, [[-5, 0, 30], [5, 0, 30]], (0, 0, -1.5))
        >>> round(float(p[2]), 3)          # from 30 m, a 1.5 m apparent depth is ~2.01 m
        -2.01
    """
    obs = _points(observers, "observers")
    return _point_result("flatray_correct_multiview_shortcut", c_stack(stack),
                         obs.ctypes.data_as(_VEC_P), len(obs), vec3(apparent, "apparent"))


def _csr(views: Sequence[Sequence[int]]):
    offsets = np.zeros(len(views) + 1, dtype=np.uintp)
    ids = []
    for i, v in enumerate(views):
        row = [int(x) for x in v]
        if any(x < 0 or x > 0xFFFFFFFF for x in row):
            raise ValueError(f"camera ids of point {i} must be in 0..2**32-1, got {row}")
        ids.extend(row)
        offsets[i + 1] = len(ids)
    return offsets, np.asarray(ids, dtype=np.uint32)


def correct_multiviews(stack, cameras, views, apparent, *, shortcut: bool = False,
                       raise_on_error: bool = False) -> MultiviewBatch:
    """:func:`correct_multiview` (or the shortcut) of N points in one library
    call.

    Args:
        cameras: (M, 3) camera centres.
        views: N sequences of camera ids (indices into ``cameras``): the cameras
            that saw each point.
        apparent: (N, 3) uncorrected points.
        shortcut: apply :func:`correct_multiview_shortcut` instead.

    Returns:
        ``(points, rms_miss, status)``; a point with fewer than two views, an
        unknown camera id, a NaN row... fails alone with its status.

    Example:
        >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> cams = [[0, 0, 30], [12, 3, 35], [-6, 9, 33]]
        >>> r = correct_multiviews(lake, cams, [[0, 1], [2], [0, 1, 2]], [[4, 0, -1.5]] * 3)
        >>> r.status.tolist()                  # the second point has one view only
        [0, 10, 0]
    """
    cams = _points(cameras, "cameras")
    pts = _points(apparent, "apparent")
    n = len(pts)
    if len(views) != n:
        raise ValueError(f"views must hold one id list per point ({n}), got {len(views)}")
    offsets, ids = _csr(views)
    out = np.empty((n, 3), dtype=np.float64)
    rms = np.empty(n, dtype=np.float64)
    status = np.full(n, _UNSET, dtype=np.int32)
    name = "flatray_correct_multiviews_shortcut" if shortcut else "flatray_correct_multiviews"
    rc = getattr(_lib.lib, name)(
        c_stack(stack), cams.ctypes.data_as(_VEC_P), len(cams),
        offsets.ctypes.data_as(_SIZE_P), ids.ctypes.data_as(_U32_P), len(ids),
        pts.ctypes.data_as(_VEC_P), n, out.ctypes.data_as(_VEC_P),
        rms.ctypes.data_as(_DOUBLE_P), status.ctypes.data_as(_INT32_P))
    _finish(rc, status, name, raise_on_error)
    return MultiviewBatch(out, rms, status)


def _groups(group_index):
    if group_index is None:
        return None, 0
    g = np.ascontiguousarray(np.asarray(group_index, dtype=np.float64).reshape(-1))
    return g, len(g)


def correct_range(stack, sensor, uncorrected, group_index=None) -> np.ndarray:
    """The true point of a laser range from ``sensor`` reported as
    ``uncorrected`` (a straight beam at the observer medium's group velocity):
    the beam refracted at every interface, the travel time rescaled in each
    medium by its group index.

    Args:
        group_index: layer_count + 2 group indices (observer, layers, object),
            or None for the phase indices.

    Example:
        A green laser 20 m above a lake, straight down (group indices 1.00029
        and 1.37)::

            >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.00028, 1.334)
            >>> p = correct_range(lake, (0, 0, 20), (0, 0, -2), [1.00029, 1.37])
            >>> round(float(p[2]), 6)
            -1.460277
    """
    g, count = _groups(group_index)
    out = FlatrayVec3()
    status = _lib.lib.flatray_correct_range(
        c_stack(stack), vec3(sensor, "sensor"), vec3(uncorrected, "uncorrected"),
        None if g is None else g.ctypes.data_as(_DOUBLE_P), count, ctypes.byref(out))
    _lib.check(status, "flatray_correct_range")
    return array3(out)


def correct_ranges(stack, sensors, uncorrected, group_index=None, *,
                   raise_on_error: bool = False) -> PointBatch:
    """:func:`correct_range` of N points in one library call.

    Args:
        sensors: (3,) or (1, 3) for one shared sensor position, or (N, 3).
        uncorrected: (N, 3) reported points.

    Returns:
        ``(points, status)`` as :func:`~flatray.true_positions`.

    Example:
        >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.00028, 1.334)
        >>> pts, st = correct_ranges(lake, (0, 0, 20), [[0, 0, -2], [0, 0, 5], [np.nan, 0, 0]])
        >>> st.tolist()                    # the second beam ended in the air: unchanged
        [0, 0, 2]
    """
    pts = _points(uncorrected, "uncorrected")
    sens = _observers(sensors, len(pts), "sensors")
    g, count = _groups(group_index)
    n = len(pts)
    out = np.empty((n, 3), dtype=np.float64)
    status = np.full(n, _UNSET, dtype=np.int32)
    rc = _lib.lib.flatray_correct_ranges(
        c_stack(stack), sens.ctypes.data_as(_VEC_P), len(sens), pts.ctypes.data_as(_VEC_P), n,
        None if g is None else g.ctypes.data_as(_DOUBLE_P), count,
        out.ctypes.data_as(_VEC_P), status.ctypes.data_as(_INT32_P))
    _finish(rc, status, "flatray_correct_ranges", raise_on_error)
    return PointBatch(out, status)


def _values(value, name: str) -> np.ndarray:
    a = np.ascontiguousarray(np.asarray(value, dtype=np.float64))
    if a.ndim != 1:
        raise ValueError(f"{name} must be a 1-D array, got shape {a.shape}")
    return a


def true_depths(apparent_depths, view_angles, n_observer, n_object, image=Image.SAGITTAL, *,
                raise_on_error: bool = False) -> ValueBatch:
    """True depths below one flat interface from apparent depths, each at its
    own view angle (radians, in the observer's medium, from the normal).

    Example:
        >>> d, st = true_depths([1.0, 1.0, -1.0], [0.0, 0.5, 0.0], 1.00028, 1.335)
        >>> [round(float(x), 4) for x in d[:2]], st.tolist()
        ([1.3346, 1.4193], [0, 0, 2])
    """
    d = _values(apparent_depths, "apparent_depths")
    a = _values(view_angles, "view_angles")
    if a.shape != d.shape:
        raise ValueError(f"view_angles must match apparent_depths ({d.shape}), got {a.shape}")
    n = len(d)
    out = np.empty(n, dtype=np.float64)
    status = np.full(n, _UNSET, dtype=np.int32)
    rc = _lib.lib.flatray_true_depths(
        d.ctypes.data_as(_DOUBLE_P), a.ctypes.data_as(_DOUBLE_P), n,
        real(n_observer, "n_observer"), real(n_object, "n_object"), image_code(image),
        out.ctypes.data_as(_DOUBLE_P), status.ctypes.data_as(_INT32_P))
    _finish(rc, status, "flatray_true_depths", raise_on_error)
    return ValueBatch(out, status)


def correction_factors(view_angles, n_observer, n_object, image=Image.SAGITTAL, *,
                       raise_on_error: bool = False) -> ValueBatch:
    """Correction factors ``true depth / apparent depth`` of one flat interface at
    each view angle (radians): ``n_object / n_observer`` at nadir (about
    :data:`CLEAR_WATER_NADIR_FACTOR` for water under air), growing with the
    angle.

    Example:
        >>> k, st = correction_factors(np.radians([0, 20, 40]), 1.00028, 1.335)
        >>> [round(float(x), 4) for x in k]
        [1.3346, 1.3729, 1.5269]
    """
    a = _values(view_angles, "view_angles")
    n = len(a)
    out = np.empty(n, dtype=np.float64)
    status = np.full(n, _UNSET, dtype=np.int32)
    rc = _lib.lib.flatray_correction_factors(
        a.ctypes.data_as(_DOUBLE_P), n, real(n_observer, "n_observer"),
        real(n_object, "n_object"), image_code(image), out.ctypes.data_as(_DOUBLE_P),
        status.ctypes.data_as(_INT32_P))
    _finish(rc, status, "flatray_correction_factors", raise_on_error)
    return ValueBatch(out, status)


def correction_factors_deg(view_angles_deg, n_observer, n_object, image=Image.SAGITTAL, *,
                           raise_on_error: bool = False) -> ValueBatch:
    """:func:`correction_factors` with the view angles in degrees."""
    return correction_factors(np.radians(_values(view_angles_deg, "view_angles_deg")),
                              n_observer, n_object, image, raise_on_error=raise_on_error)


def true_position_sensitivity(stack, observer, apparent, image=Image.SAGITTAL) -> Sensitivity:
    """Partial derivatives of :func:`~flatray.true_position` (metres) with
    respect to the stack offset along its unit normal, ``n_object``, the
    observer position and the apparent point (exact, by automatic
    differentiation in the library).

    Example:
        At nadir the true depth is n2/n1 times the apparent depth::

            >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.34)
            >>> s = true_position_sensitivity(lake, (0, 0, 10), (0, 0, -1))
            >>> round(float(s.d_apparent[2, 2]), 12), round(float(s.d_n_object[2]), 12)
            (1.34, -1.0)
    """
    bufs = [np.empty(3), np.empty(3), np.empty((3, 3)), np.empty((3, 3))]
    status = _lib.lib.flatray_true_position_sensitivity(
        c_stack(stack), vec3(observer, "observer"), vec3(apparent, "apparent"),
        image_code(image), *[b.ctypes.data_as(_DOUBLE_P) for b in bufs])
    _lib.check(status, "flatray_true_position_sensitivity")
    return Sensitivity(*bufs)


def true_position_covariance(stack, observer, apparent, image=Image.SAGITTAL, *,
                             sigma_offset: float = 0.0, sigma_n_object: float = 0.0,
                             sigma_observer: float = 0.0,
                             sigma_apparent: float = 0.0) -> np.ndarray:
    """First-order propagated covariance (3, 3), m², of the true point from
    independent standard deviations of the stack offset (m), ``n_object``, the
    observer position (m, each axis) and the apparent point (m, each axis).

    Example:
        >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.34)
        >>> c = true_position_covariance(lake, (0, 0, 10), (0, 0, -1), sigma_offset=0.02)
        >>> round(math.sqrt(c[2, 2]), 4)            # 0.34 x 2 cm
        0.0068
    """
    out = np.empty((3, 3))
    status = _lib.lib.flatray_true_position_covariance(
        c_stack(stack), vec3(observer, "observer"), vec3(apparent, "apparent"),
        image_code(image), real(sigma_offset, "sigma_offset"),
        real(sigma_n_object, "sigma_n_object"), real(sigma_observer, "sigma_observer"),
        real(sigma_apparent, "sigma_apparent"), out.ctypes.data_as(_DOUBLE_P))
    _lib.check(status, "flatray_true_position_covariance")
    return out


__all__ = [
    "CLEAR_WATER_NADIR_FACTOR", "SurveyPoint", "MultiviewBatch", "ValueBatch", "Sensitivity",
    "triangulate", "correct_multiview", "correct_multiview_shortcut", "correct_multiviews",
    "correct_range", "correct_ranges", "true_depths", "correction_factors",
    "correction_factors_deg", "true_position_sensitivity", "true_position_covariance",
]
_ = math  # used in the docstring examples
