"""Batch functions over numpy arrays: one C call for N points, rays or lines of
sight.

Each takes (N, 3) arrays (converted to C-contiguous float64 only when they are
not already), passes the numpy buffers to the library directly, and returns
numpy results plus a per-element ``int32`` status array (:class:`Status`
codes). A failed element has NaN outputs and does not stop the others.

With ``raise_on_error=False`` (default) element failures are reported only in
the status array; with ``True`` the lowest-index failure is raised as its
:class:`~flatray.FlatrayError` subclass, with ``.index`` set. Whole-call errors
(an invalid stack, an observer count neither 1 nor N, an unknown image) are
always raised: nothing was computed.
"""

from __future__ import annotations

import ctypes
from typing import NamedTuple

import numpy as np

from . import _lib
from ._convert import image_code, observers as _observers, points as _points
from ._types import FlatrayPath, FlatrayRay, FlatrayVec3, Image, Status
from .stack import c_stack

_VEC_P = ctypes.POINTER(FlatrayVec3)
_RAY_P = ctypes.POINTER(FlatrayRay)
_PATH_P = ctypes.POINTER(FlatrayPath)
_DOUBLE_P = ctypes.POINTER(ctypes.c_double)
_INT32_P = ctypes.POINTER(ctypes.c_int32)

#: Written into the status array before the call; a whole-call error leaves it.
_UNSET = -1


class PointBatch(NamedTuple):
    """Result of :func:`true_positions` / :func:`apparent_positions`."""

    #: (N, 3) float64, metres; NaN rows for failed elements.
    points: np.ndarray
    #: (N,) int32 :class:`Status` codes.
    status: np.ndarray


class RayBatch(NamedTuple):
    """Result of :func:`trace_rays`."""

    #: (N, 3) ray origins on the last interface, metres.
    origins: np.ndarray
    #: (N, 3) unit directions in the object's medium.
    directions: np.ndarray
    #: (N,) transmittance of unpolarised light.
    transmittance: np.ndarray
    #: (N,) int32 :class:`Status` codes.
    status: np.ndarray


class PathBatch(NamedTuple):
    """Result of :func:`lines_of_sight`: the fields of N paths, each a view into
    one (N, 12) float64 buffer laid out as N ``FlatrayPath`` structs. Failed
    elements are NaN in every field."""

    #: (N, 3) unit directions at the observer, toward the stack (the lines of sight).
    direction: np.ndarray
    #: (N, 3) where each path meets the first interface, metres.
    entry: np.ndarray
    #: (N, 3) where each path meets the last interface, metres.
    exit: np.ndarray
    #: (N,) path lengths from observer to object, metres.
    geometric_length: np.ndarray
    #: (N,) optical path lengths, sum of n times segment length, metres.
    optical_length: np.ndarray
    #: (N,) transmittance of unpolarised light, (prod Ts + prod Tp) / 2.
    transmittance: np.ndarray
    #: (N,) int32 :class:`Status` codes.
    status: np.ndarray


def _finish(rc: int, status: np.ndarray, function: str, raise_on_error: bool) -> None:
    if rc == Status.OK:
        return
    if status.size == 0 or bool((status == _UNSET).any()):
        _lib.check(rc, function)  # whole-call error: nothing was written
    if raise_on_error:
        failed = np.flatnonzero(status != Status.OK)
        if failed.size == 0:  # cannot happen by the contract; still raise what was returned
            _lib.check(rc, function)
        index = int(failed[0])
        _lib.check(int(status[index]), function, index=index)


def _point_batch(function_name, stack, observers, points, points_name, image, raise_on_error):
    pts = _points(points, points_name)
    obs = _observers(observers, len(pts))
    code = image_code(image)
    n = len(pts)
    out = np.empty((n, 3), dtype=np.float64)
    status = np.full(n, _UNSET, dtype=np.int32)
    rc = getattr(_lib.lib, function_name)(
        c_stack(stack),
        obs.ctypes.data_as(_VEC_P), len(obs),
        pts.ctypes.data_as(_VEC_P), n,
        code,
        out.ctypes.data_as(_VEC_P), status.ctypes.data_as(_INT32_P))
    _finish(rc, status, function_name, raise_on_error)
    return PointBatch(out, status)


def true_positions(stack, observers, apparent, image=Image.SAGITTAL, *,
                   raise_on_error: bool = False) -> PointBatch:
    """True positions of N apparent points (metres) in one library call.

    Args:
        stack: a :class:`~flatray.Stack`.
        observers: shape (3,) or (1, 3) for one shared observer, or (N, 3).
        apparent: (N, 3) apparent points.
        image: :class:`Image`, its name or code.
        raise_on_error: raise the lowest-index element failure instead of only
            reporting it in ``status``.

    Returns:
        ``(points, status)``: (N, 3) float64 true points (NaN where failed) and
        (N,) int32 status codes.

    Example:
        >>> pool = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> pts, st = true_positions(pool, (0, 0, 1.5), [[1, 0, -1], [0, 0, 2]])
        >>> st.tolist()                       # the second point is above the water
        [0, 5]
        >>> bool(np.isnan(pts[1]).all())
        True
    """
    return _point_batch("flatray_true_positions", stack, observers, apparent, "apparent",
                        image, raise_on_error)


def apparent_positions(stack, observers, objects, image=Image.SAGITTAL, *,
                       raise_on_error: bool = False) -> PointBatch:
    """Apparent positions of N object points (metres) in one library call;
    arguments and result as :func:`true_positions`.

    Example:
        >>> pool = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> pts, st = apparent_positions(pool, [0, 0, 1.5], np.array([[0.0, 0, -2]]))
        >>> round(float(pts[0, 2]), 4), st.tolist()
        (-1.5004, [0])
    """
    return _point_batch("flatray_apparent_positions", stack, observers, objects, "objects",
                        image, raise_on_error)


def lines_of_sight(stack, observers, objects, *, raise_on_error: bool = False) -> PathBatch:
    """Lines of sight (light paths, Fermat's principle) from observers to N
    object points in one library call, on every core for large N.

    Args:
        stack: a :class:`~flatray.Stack`.
        observers: shape (3,) or (1, 3) for one shared observer, or (N, 3).
        objects: (N, 3) object points past the last interface, metres.
        raise_on_error: raise the lowest-index element failure instead of only
            reporting it in ``status``.

    Returns:
        :class:`PathBatch` ``(direction, entry, exit, geometric_length,
        optical_length, transmittance, status)``, each element equal to
        :func:`~flatray.line_of_sight` of the same points.

    Example:
        >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> p = lines_of_sight(lake, (0, 0, 10), [[3, 0, -2], [0, 0, 1]])
        >>> p.status.tolist()                 # the second point is above the water
        [0, 5]
        >>> bool(0 < p.entry[0, 0] < 3), bool(np.isnan(p.direction[1]).all())
        (True, True)
    """
    pts = _points(objects, "objects")
    obs = _observers(observers, len(pts))
    n = len(pts)
    out = np.empty((n, 12), dtype=np.float64)
    status = np.full(n, _UNSET, dtype=np.int32)
    rc = _lib.lib.flatray_lines_of_sight(
        c_stack(stack), obs.ctypes.data_as(_VEC_P), len(obs), pts.ctypes.data_as(_VEC_P), n,
        out.ctypes.data_as(_PATH_P), status.ctypes.data_as(_INT32_P))
    _finish(rc, status, "flatray_lines_of_sight", raise_on_error)
    return PathBatch(out[:, 0:3], out[:, 3:6], out[:, 6:9], out[:, 9], out[:, 10], out[:, 11],
                     status)


def trace_rays(stack, origins, directions, *, raise_on_error: bool = False) -> RayBatch:
    """Trace N observer rays through ``stack`` in one library call.

    Args:
        origins: (N, 3) ray origins (metres) on the observer's side, or (3,) /
            (1, 3) for one origin shared by every ray.
        directions: (N, 3) propagation directions, any non-zero length.

    Returns:
        ``(origins, directions, transmittance, status)``: (N, 3) origins on the
        last interface, (N, 3) unit directions in the object's medium, (N,)
        transmittances and (N,) int32 status codes; NaN where failed. The two
        (N, 3) arrays are views into one (N, 2, 3) buffer.

    Example:
        >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> o, d, t, st = trace_rays(lake, (0, 0, 2), [[0, 0, -1], [0, 0, 1]])
        >>> st.tolist()                       # the second ray points away
        [0, 4]
    """
    dirs = _points(directions, "directions")
    n = len(dirs)
    orig = np.asarray(origins)
    if orig.shape == (3,):
        orig = orig.reshape(1, 3)
    if orig.ndim != 2 or orig.shape[1] != 3 or orig.shape[0] not in (1, n):
        raise ValueError(
            f"origins must have shape (3,), (1, 3) or ({n}, 3) to match directions, "
            f"got {np.shape(origins)}")
    rays = np.empty((n, 2, 3), dtype=np.float64)
    try:
        rays[:, 0, :] = orig
        rays[:, 1, :] = dirs
    except (TypeError, ValueError) as exc:
        raise ValueError(f"origins must hold real numbers: {exc}") from None
    out = np.empty((n, 2, 3), dtype=np.float64)
    transmittance = np.empty(n, dtype=np.float64)
    status = np.full(n, _UNSET, dtype=np.int32)
    rc = _lib.lib.flatray_trace_rays(
        c_stack(stack), rays.ctypes.data_as(_RAY_P), n, out.ctypes.data_as(_RAY_P),
        transmittance.ctypes.data_as(_DOUBLE_P), status.ctypes.data_as(_INT32_P))
    _finish(rc, status, "flatray_trace_rays", raise_on_error)
    return RayBatch(out[:, 0, :], out[:, 1, :], transmittance, status)
