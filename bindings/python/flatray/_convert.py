"""Conversions between Python/numpy values and the C structs."""

from __future__ import annotations

import operator

import numpy as np

from ._types import FlatrayVec3, Image

_INT32_MIN = -(2**31)
_INT32_MAX = 2**31 - 1


def vec3(value, name: str) -> FlatrayVec3:
    """A ``FlatrayVec3`` from three numbers (NaN and infinity pass through to the
    library, which reports them)."""
    try:
        a = np.asarray(value, dtype=np.float64)
    except (TypeError, ValueError) as exc:
        raise ValueError(f"{name} must be 3 numbers (x, y, z): {exc}") from None
    if a.shape != (3,):
        raise ValueError(f"{name} must be 3 numbers (x, y, z), got shape {a.shape}")
    return FlatrayVec3(float(a[0]), float(a[1]), float(a[2]))


def array3(v: FlatrayVec3) -> np.ndarray:
    """A float64 array of shape (3,) from a ``FlatrayVec3``."""
    return np.array((v.x, v.y, v.z), dtype=np.float64)


def real(value, name: str) -> float:
    """A Python float from a real number."""
    try:
        return float(value)
    except (TypeError, ValueError) as exc:
        raise ValueError(f"{name} must be a real number: {exc}") from None


def image_code(image) -> int:
    """The int32 code of an image: an :class:`Image`, its name (``"tangential"``)
    or an integer. Unknown integers are passed on for the library to reject."""
    if isinstance(image, str):
        try:
            return int(Image[image.upper()])
        except KeyError:
            raise ValueError(
                f"unknown image {image!r}: use 'sagittal' or 'tangential'") from None
    try:
        code = operator.index(image)
    except TypeError:
        raise ValueError(f"image must be an Image, its name or an int, got {image!r}") from None
    if not _INT32_MIN <= code <= _INT32_MAX:
        raise ValueError(f"image code {code} does not fit in int32")
    return code


def points(value, name: str) -> np.ndarray:
    """An (N, 3) C-contiguous float64 array; no copy when ``value`` already is one."""
    a = np.asarray(value)
    if a.ndim != 2 or a.shape[1] != 3:
        raise ValueError(f"{name} must be an array of shape (N, 3), got shape {a.shape}")
    try:
        return np.ascontiguousarray(a, dtype=np.float64)
    except (TypeError, ValueError) as exc:
        raise ValueError(f"{name} must hold real numbers: {exc}") from None


def observers(value, count: int, name: str = "observers") -> np.ndarray:
    """Observers for a batch: shape (3,) or (1, 3) (shared) or (M, 3).

    Returns an (M, 3) C-contiguous float64 array. ``M`` is not compared with the
    point count here: the library checks it (1 or ``count``) and reports a
    mismatch as a whole-call ``FLATRAY_ERR_INVALID_ARGUMENT``.
    """
    a = np.asarray(value)
    if a.ndim == 1:
        if a.shape != (3,):
            raise ValueError(f"{name} must have shape (3,), (1, 3) or (N, 3), got {a.shape}")
        a = a.reshape(1, 3)
    elif a.ndim != 2 or a.shape[1] != 3:
        raise ValueError(f"{name} must have shape (3,), (1, 3) or (N, 3), got {a.shape}")
    try:
        return np.ascontiguousarray(a, dtype=np.float64)
    except (TypeError, ValueError) as exc:
        raise ValueError(f"{name} must hold real numbers: {exc}") from None
