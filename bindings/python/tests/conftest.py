"""Shared helpers of the flatray Python test suite.

The package is imported from bindings/python (the parent of this folder), so
the suite runs without installing it; the library is found as the package
finds it (FLATRAY_LIBRARY, else the repository's target/).
"""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pytest

PACKAGE_ROOT = Path(__file__).resolve().parents[1]
if str(PACKAGE_ROOT) not in sys.path:
    sys.path.insert(0, str(PACKAGE_ROOT))

import flatray  # noqa: E402

#: The repository root (bindings/python/tests -> repository).
REPO_ROOT = PACKAGE_ROOT.parent.parent
HEADER = REPO_ROOT / "include" / "flatray.h"


@pytest.fixture
def lake():
    """A water surface at z = 0 seen from the air above (normal points down).
    Invented scene; 1.333 for water is common practice."""
    return flatray.Stack.single_interface((0.0, 0.0, 0.0), (0.0, 0.0, -1.0), 1.0, 1.333)


@pytest.fixture
def port():
    """A camera housing: air, a 10 mm glass port (1.52), water (1.34); normal +z,
    first interface at z = 0.05 m. Invented scene with common-practice indices."""
    return flatray.Stack((0.0, 0.0, 0.05), (0.0, 0.0, 1.0), 1.00029, [(0.010, 1.52)], 1.34)


def unit(v):
    v = np.asarray(v, dtype=float)
    return v / np.linalg.norm(v)


def perpendicular_basis(normal):
    """Two unit vectors perpendicular to ``normal`` and to each other."""
    n = unit(normal)
    helper = np.array([1.0, 0.0, 0.0]) if abs(n[0]) < 0.9 else np.array([0.0, 1.0, 0.0])
    e1 = unit(np.cross(n, helper))
    e2 = np.cross(n, e1)
    return e1, e2


def random_scene(rng, layer_count):
    """A random stack of ``layer_count`` layers with an observer before it and an
    object past it (invented geometry).

    Returns (stack, observer, object).
    """
    normal = rng.normal(size=3)
    normal *= rng.uniform(0.2, 5.0) / np.linalg.norm(normal)  # any non-zero length
    origin = rng.uniform(-3.0, 3.0, size=3)
    layers = [(float(rng.uniform(1e-3, 0.2)), float(rng.uniform(1.0, 2.0)))
              for _ in range(layer_count)]
    stack = flatray.Stack(origin, normal, float(rng.uniform(1.0, 1.6)), layers,
                          float(rng.uniform(1.0, 1.6)))
    n = unit(normal)
    e1, e2 = perpendicular_basis(n)
    total = stack.total_thickness
    observer = (origin - rng.uniform(0.01, 5.0) * n
                + rng.uniform(-3, 3) * e1 + rng.uniform(-3, 3) * e2)
    obj = (origin + (total + rng.uniform(0.01, 10.0)) * n
           + rng.uniform(-6, 6) * e1 + rng.uniform(-6, 6) * e2)
    return stack, observer, obj
