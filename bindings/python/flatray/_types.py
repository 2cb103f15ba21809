"""ctypes mirrors of the C ABI's structs and enums (include/flatray.h, ABI version 1).

Field order, types and sizes match the header exactly; ``FlatrayVec3`` is three
packed doubles, so a C-contiguous float64 numpy array of shape (N, 3) has the
memory layout of ``FlatrayVec3[N]`` and one of shape (N, 2, 3) that of
``FlatrayRay[N]``.
"""

from __future__ import annotations

import ctypes
import enum

#: Most layers a stack can hold (``FLATRAY_MAX_LAYERS``).
MAX_LAYERS = 8


class Status(enum.IntEnum):
    """``FlatrayStatus``: the outcome of every fallible C function."""

    OK = 0
    NULL_POINTER = 1
    INVALID_ARGUMENT = 2
    TOTAL_INTERNAL_REFLECTION = 3
    MISSES_INTERFACE = 4
    WRONG_SIDE = 5
    NOT_CONVERGED = 6
    OUT_OF_RANGE = 7
    BUFFER_TOO_SMALL = 8
    INTERNAL = 9
    DEGENERATE = 10

    @property
    def c_name(self) -> str:
        """The constant's name in the C header, e.g. ``FLATRAY_ERR_WRONG_SIDE``."""
        if self is Status.OK:
            return "FLATRAY_OK"
        return "FLATRAY_ERR_" + self.name


class Image(enum.IntEnum):
    """``FlatrayImage``: which image of an object point.

    * ``SAGITTAL``: where the line of sight crosses the line through the object
      parallel to the normal (the survey "apparent depth").
    * ``TANGENTIAL``: where neighbouring rays in the plane of incidence meet when
      extended back (the caustic).
    """

    SAGITTAL = 0
    TANGENTIAL = 1


class FlatrayVec3(ctypes.Structure):
    """A point (metres) or a direction."""

    _fields_ = [("x", ctypes.c_double), ("y", ctypes.c_double), ("z", ctypes.c_double)]

    def __iter__(self):
        return iter((self.x, self.y, self.z))

    def __repr__(self) -> str:
        return f"FlatrayVec3({self.x!r}, {self.y!r}, {self.z!r})"


class FlatrayRay(ctypes.Structure):
    """A ray: origin (metres) and propagation direction."""

    _fields_ = [("origin", FlatrayVec3), ("direction", FlatrayVec3)]


class FlatrayStack(ctypes.Structure):
    """Parallel flat layers between the observer's and the object's media."""

    _fields_ = [
        ("origin", FlatrayVec3),
        ("normal", FlatrayVec3),
        ("n_observer", ctypes.c_double),
        ("layer_count", ctypes.c_uint32),
        ("thickness", ctypes.c_double * MAX_LAYERS),
        ("n_layer", ctypes.c_double * MAX_LAYERS),
        ("n_object", ctypes.c_double),
    ]


class FlatrayFresnel(ctypes.Structure):
    """Fresnel power coefficients (s, p and unpolarised)."""

    _fields_ = [
        ("rs", ctypes.c_double),
        ("rp", ctypes.c_double),
        ("ts", ctypes.c_double),
        ("tp", ctypes.c_double),
        ("r", ctypes.c_double),
        ("t", ctypes.c_double),
    ]


class FlatrayPath(ctypes.Structure):
    """The light path between an observer and an object."""

    _fields_ = [
        ("direction", FlatrayVec3),
        ("entry", FlatrayVec3),
        ("exit", FlatrayVec3),
        ("geometric_length", ctypes.c_double),
        ("optical_length", ctypes.c_double),
        ("transmittance", ctypes.c_double),
    ]


class FlatrayLens(ctypes.Structure):
    """Pinhole intrinsics (pixels) and Brown-Conrady distortion of a lens in air."""

    _fields_ = [
        ("fx", ctypes.c_double),
        ("fy", ctypes.c_double),
        ("cx", ctypes.c_double),
        ("cy", ctypes.c_double),
        ("k1", ctypes.c_double),
        ("k2", ctypes.c_double),
        ("k3", ctypes.c_double),
        ("p1", ctypes.c_double),
        ("p2", ctypes.c_double),
    ]


class FlatrayCameraView(ctypes.Structure):
    """What a flat-port camera sees (``flatray_camera_view``)."""

    _fields_ = [
        ("horizontal", ctypes.c_double),
        ("vertical", ctypes.c_double),
        ("diagonal", ctypes.c_double),
        ("horizontal_air", ctypes.c_double),
        ("vertical_air", ctypes.c_double),
        ("diagonal_air", ctypes.c_double),
        ("focal_x_water", ctypes.c_double),
        ("focal_y_water", ctypes.c_double),
        ("tir_radius_px", ctypes.c_double),
    ]
