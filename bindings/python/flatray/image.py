"""Apparent and true positions and depths (sagittal and tangential images)."""

from __future__ import annotations

import ctypes
import math

import numpy as np

from . import _lib
from ._convert import array3, image_code, real, vec3
from ._types import FlatrayVec3, Image
from .stack import c_stack


def apparent_position(stack, observer, obj, image=Image.SAGITTAL) -> np.ndarray:
    """Where the object point ``obj`` appears to ``observer`` through ``stack``.

    Args:
        image: :class:`Image` (``SAGITTAL``: on the normal through the object, the
            survey "apparent depth"; ``TANGENTIAL``: on the caustic), its name, or
            its int code.

    Returns:
        The apparent point, metres, shape (3,).

    Example:
        Looking straight down into 2 m of water::

            >>> pool = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
            >>> round(float(apparent_position(pool, (0, 0, 1.7), (0, 0, -2))[2]), 4)
            -1.5004
    """
    out = FlatrayVec3()
    status = _lib.lib.flatray_apparent_position(
        c_stack(stack), vec3(observer, "observer"), vec3(obj, "obj"), image_code(image),
        ctypes.byref(out))
    _lib.check(status, "flatray_apparent_position")
    return array3(out)


def true_position(stack, observer, apparent, image=Image.SAGITTAL) -> np.ndarray:
    """Where an object really is, given its ``apparent`` position seen from
    ``observer`` (the inverse of :func:`apparent_position`), metres.

    Raises:
        WrongSideError: the apparent point is on the observer's side or too
            shallow to image any point of the object's medium.

    Example:
        >>> pool = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> round(float(true_position(pool, (0, 0, 1.7), (0, 0, -1.5))[2]), 4)
        -1.9995
    """
    out = FlatrayVec3()
    status = _lib.lib.flatray_true_position(
        c_stack(stack), vec3(observer, "observer"), vec3(apparent, "apparent"),
        image_code(image), ctypes.byref(out))
    _lib.check(status, "flatray_true_position")
    return array3(out)


def _depth(function, name, depth, view_angle, n_observer, n_object, image) -> float:
    out = ctypes.c_double()
    status = function(real(depth, "depth"), real(view_angle, "view_angle"),
                      real(n_observer, "n_observer"), real(n_object, "n_object"),
                      image_code(image), ctypes.byref(out))
    _lib.check(status, name)
    return out.value


def apparent_depth(depth: float, view_angle: float, n_observer: float, n_object: float,
                   image=Image.SAGITTAL) -> float:
    """Apparent depth (metres) of a point ``depth`` metres (>= 0) below one flat
    interface, seen at ``view_angle`` radians in [0, pi/2) from the normal in the
    observer's medium.

    Sagittal ``d (n1/n2) cos t1 / cos t2``; tangential ``d (n1/n2) cos^3 t1 / cos^3 t2``.

    Example:
        3 m of water seen from the air along the normal::

            >>> round(apparent_depth(3.0, 0.0, 1.0, 1.333), 4)
            2.2506
    """
    return _depth(_lib.lib.flatray_apparent_depth, "flatray_apparent_depth",
                  depth, view_angle, n_observer, n_object, image)


def true_depth(depth: float, view_angle: float, n_observer: float, n_object: float,
               image=Image.SAGITTAL) -> float:
    """True depth (metres) below one flat interface from an apparent ``depth``
    seen at ``view_angle`` radians; the inverse of :func:`apparent_depth`.

    Example:
        >>> round(true_depth(2.2506, 0.0, 1.0, 1.333), 4)
        3.0
    """
    return _depth(_lib.lib.flatray_true_depth, "flatray_true_depth",
                  depth, view_angle, n_observer, n_object, image)


def apparent_depth_deg(depth: float, view_angle_deg: float, n_observer: float,
                       n_object: float, image=Image.SAGITTAL) -> float:
    """:func:`apparent_depth` with the view angle in degrees."""
    return apparent_depth(depth, math.radians(real(view_angle_deg, "view_angle_deg")),
                          n_observer, n_object, image)


def true_depth_deg(depth: float, view_angle_deg: float, n_observer: float,
                   n_object: float, image=Image.SAGITTAL) -> float:
    """:func:`true_depth` with the view angle in degrees."""
    return true_depth(depth, math.radians(real(view_angle_deg, "view_angle_deg")),
                      n_observer, n_object, image)
