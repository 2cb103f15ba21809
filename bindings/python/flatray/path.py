"""Rays through a stack: the trace of an observer's ray, and the line of sight."""

from __future__ import annotations

import ctypes
from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from . import _lib
from ._convert import array3, vec3
from ._types import FlatrayPath, FlatrayRay
from .stack import c_stack


class Traced(NamedTuple):
    """A ray traced into the object's medium."""

    #: Where the ray leaves the last interface, metres, shape (3,).
    origin: np.ndarray
    #: Unit direction in the object's medium, shape (3,).
    direction: np.ndarray
    #: Transmittance of unpolarised light, (prod Ts + prod Tp) / 2.
    transmittance: float


@dataclass(frozen=True)
class Path:
    """The light path between an observer and an object (Fermat's principle)."""

    #: Unit direction at the observer, toward the stack (the line of sight).
    direction: np.ndarray
    #: Where the path meets the first interface, metres.
    entry: np.ndarray
    #: Where the path meets the last interface, metres (``entry`` for one interface).
    exit: np.ndarray
    #: Path length from observer to object, metres.
    geometric_length: float
    #: Optical path length, sum of n times segment length, metres.
    optical_length: float
    #: Transmittance of unpolarised light, (prod Ts + prod Tp) / 2.
    transmittance: float


def trace(stack, origin, direction) -> Traced:
    """Trace a ray leaving the observer through ``stack`` (back-projection).

    Args:
        stack: a :class:`~flatray.Stack`.
        origin: the ray's start, metres, on the observer's side.
        direction: propagation direction, any non-zero length.

    Returns:
        ``(origin, direction, transmittance)``: the ray in the object's medium
        (origin on the last interface, unit direction) and the transmittance.

    Raises:
        WrongSideError, MissesInterfaceError (parallel or pointing away),
        TotalInternalReflectionError, InvalidArgumentError, OutOfRangeError.

    Example:
        >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> o, d, t = trace(lake, (0, 0, 2), (0, 0, -1))
        >>> o.tolist(), d.tolist(), round(t, 4)
        ([0.0, 0.0, 0.0], [0.0, 0.0, -1.0], 0.9796)
    """
    ray = FlatrayRay(vec3(origin, "origin"), vec3(direction, "direction"))
    out = FlatrayRay()
    transmittance = ctypes.c_double()
    status = _lib.lib.flatray_trace(
        c_stack(stack), ray, ctypes.byref(out), ctypes.byref(transmittance))
    _lib.check(status, "flatray_trace")
    return Traced(array3(out.origin), array3(out.direction), transmittance.value)


def line_of_sight(stack, observer, obj) -> Path:
    """The light path between ``observer`` and the object point ``obj`` (metres).

    Raises:
        WrongSideError (observer past the first interface, or object not past the
        last), TotalInternalReflectionError (no ray connects them),
        NotConvergedError, OutOfRangeError, InvalidArgumentError.

    Example:
        A drone 10 m above a lake, a stone 2 m deep and 3 m to the side::

            >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
            >>> p = line_of_sight(lake, (0, 0, 10), (3, 0, -2))
            >>> bool(0 < p.entry[0] < 3)
            True
    """
    out = FlatrayPath()
    status = _lib.lib.flatray_line_of_sight(
        c_stack(stack), vec3(observer, "observer"), vec3(obj, "obj"), ctypes.byref(out))
    _lib.check(status, "flatray_line_of_sight")
    return Path(array3(out.direction), array3(out.entry), array3(out.exit),
                out.geometric_length, out.optical_length, out.transmittance)
