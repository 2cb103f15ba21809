"""One flat interface: Snell's law (vector form), Fresnel coefficients, critical angle."""

from __future__ import annotations

import ctypes
import math
from dataclasses import dataclass

import numpy as np

from . import _lib
from ._convert import array3, real, vec3
from ._types import FlatrayFresnel, FlatrayVec3


@dataclass(frozen=True)
class Fresnel:
    """Fresnel power coefficients of a dielectric interface.

    ``rs``, ``rp`` are reflectances and ``ts``, ``tp`` transmittances for s and p
    polarisation; ``r`` and ``t`` are the means for unpolarised light.
    """

    rs: float
    rp: float
    ts: float
    tp: float
    r: float
    t: float


def refract(direction, normal, n_from: float, n_to: float) -> np.ndarray:
    """Refract a propagation direction at a plane (Snell's law, vector form).

    Args:
        direction: incident propagation direction, any non-zero length.
        normal: the plane's normal, either orientation, any non-zero length.
        n_from, n_to: refractive indices before and after the interface.

    Returns:
        The unit refracted direction, shape (3,).

    Raises:
        InvalidArgumentError, MissesInterfaceError (direction in the plane),
        TotalInternalReflectionError.

    Example:
        >>> t = refract((1, 0, 1), (0, 0, 1), 1.0, 1.333)   # 45 degrees into water
        >>> round(float(t[0]), 6)                          # sin of the refracted angle
        0.530463
    """
    out = FlatrayVec3()
    status = _lib.lib.flatray_refract(
        vec3(direction, "direction"), vec3(normal, "normal"),
        real(n_from, "n_from"), real(n_to, "n_to"), ctypes.byref(out))
    _lib.check(status, "flatray_refract")
    return array3(out)


def fresnel(cos_incidence: float, n_from: float, n_to: float) -> Fresnel:
    """Fresnel power coefficients at incidence ``cos_incidence`` (cosine of the
    angle from the normal, in [0, 1]) from index ``n_from`` into ``n_to``.

    Beyond the critical angle the result is total reflection (r = 1, t = 0), not
    an error.

    Example:
        Normal incidence on glass of index 1.5 reflects 4 %::

            >>> round(fresnel(1.0, 1.0, 1.5).r, 12)
            0.04
    """
    out = FlatrayFresnel()
    status = _lib.lib.flatray_fresnel(
        real(cos_incidence, "cos_incidence"), real(n_from, "n_from"), real(n_to, "n_to"),
        ctypes.byref(out))
    _lib.check(status, "flatray_fresnel")
    return Fresnel(out.rs, out.rp, out.ts, out.tp, out.r, out.t)


def critical_angle(n_from: float, n_to: float) -> float:
    """Critical angle, radians, from ``n_from`` into a less dense ``n_to``.

    Raises:
        InvalidArgumentError: when ``n_from <= n_to`` (no critical angle exists).

    Example:
        >>> round(critical_angle(1.5, 1.0), 6)
        0.729728
    """
    out = ctypes.c_double()
    status = _lib.lib.flatray_critical_angle(
        real(n_from, "n_from"), real(n_to, "n_to"), ctypes.byref(out))
    _lib.check(status, "flatray_critical_angle")
    return out.value


def critical_angle_deg(n_from: float, n_to: float) -> float:
    """:func:`critical_angle` in degrees.

    Example:
        Water (1.333) into air: about 48.6 degrees::

            >>> round(critical_angle_deg(1.333, 1.0), 1)
            48.6
    """
    return math.degrees(critical_angle(n_from, n_to))
