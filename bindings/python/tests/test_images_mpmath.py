"""Oblique apparent positions and depths against an independent high-precision
computation written here with mpmath (50 digits).

Formulas checked: DESIGN.md, "Apparent position" (single interface
d_s = d (n1/n2) cos t1/cos t2, d_t = d (n1/n2) cos^3 t1/cos^3 t2, and the
multi-layer sums); derivation in the docs of src/image.rs. The reference here
does not use those formulas: it finds the light path from Fermat's principle
(root of the derivative of the optical path length), then

* sagittal: intersects the observer's straight line of sight with the line
  through the object parallel to the normal;
* tangential: the envelope (caustic) of the family of observer-side rays, each
  extended back past the interface, found by differentiating the family with
  respect to its parameter (mpmath.diff).
"""

from __future__ import annotations

import math

import mpmath as mp
import numpy as np
import pytest

import flatray
from flatray import Image
from conftest import perpendicular_basis, unit

mp.mp.dps = 50
REL = 1e-9


def single_interface_reference(n1, n2, height, lateral, depth):
    """Observer at (0, height) in medium n1 above the interface z = 0, object at
    (lateral, -depth) in medium n2 (2-D, metres).

    Returns (view angle t1, sagittal point, tangential point) as mpf / (x, z) pairs.
    """
    n1, n2, H, X, D = (mp.mpf(v) for v in (n1, n2, height, lateral, depth))

    def optical_path_slope(x):
        # d/dx of n1 |O - E| + n2 |E - P| for an entry point E = (x, 0): zero on the
        # Fermat path.
        return n1 * x / mp.sqrt(x**2 + H**2) - n2 * (X - x) / mp.sqrt((X - x) ** 2 + D**2)

    x = mp.findroot(optical_path_slope, (mp.mpf(0), X), solver="anderson")
    x = mp.findroot(optical_path_slope, x)  # polish with the secant method
    assert abs(optical_path_slope(x)) < mp.mpf(10) ** -40
    t1 = mp.atan2(x, H)

    # Sagittal: the observer's straight line through E meets the vertical x = X.
    sagittal = (X, -(H * X / x - H))

    # Tangential: rays leave the object toward entry points s; in medium n1 the
    # unit direction's x-component is (n2/n1) (s - X)/|...| (Snell). Extended back
    # below the interface, the ray through E(s) reaches x = s - z tan_a(s) at depth
    # z; the envelope has 1 - z tan_a'(s) = 0.
    def tan_a(s):
        sx = n2 / n1 * (s - X) / mp.sqrt((s - X) ** 2 + D**2)
        return sx / mp.sqrt(1 - sx**2)

    z_t = 1 / mp.diff(tan_a, x)
    tangential = (x - z_t * tan_a(x), -z_t)
    return t1, sagittal, tangential


CASES = [
    # n_observer, n_object, observer height, lateral offset, object depth (invented)
    (1.0, 1.333, 10.0, 3.0, 2.0),
    (1.0, 1.333, 1.7, 5.0, 1.2),
    (1.00029, 1.343, 0.5, 0.2, 3.0),
    (1.0, 1.5, 1.0, 8.0, 0.5),
    (1.333, 1.0, 2.0, 1.0, 5.0),  # observer in water, object in air
    (1.52, 1.34, 0.03, 0.4, 2.0),
]


@pytest.mark.parametrize("n1, n2, height, lateral, depth", CASES)
def test_single_interface_images_match_mpmath(n1, n2, height, lateral, depth):
    t1, sag, tan = single_interface_reference(n1, n2, height, lateral, depth)
    stack = flatray.Stack.single_interface((0, 0, 0), (0, 0, -1), n1, n2)
    observer, obj = (0.0, 0.0, height), (lateral, 0.0, -depth)

    s = flatray.apparent_position(stack, observer, obj, Image.SAGITTAL)
    t = flatray.apparent_position(stack, observer, obj, Image.TANGENTIAL)
    scale = max(lateral, depth)
    assert s[0] == pytest.approx(float(sag[0]), rel=REL, abs=REL * scale)
    assert s[2] == pytest.approx(float(sag[1]), rel=REL)
    assert t[0] == pytest.approx(float(tan[0]), rel=REL, abs=REL * scale)
    assert t[2] == pytest.approx(float(tan[1]), rel=REL)
    assert s[1] == 0 and t[1] == 0

    # The scalar helpers (the DESIGN.md closed forms) at the same view angle.
    view = float(t1)
    assert flatray.apparent_depth(depth, view, n1, n2, Image.SAGITTAL) == \
        pytest.approx(float(-sag[1]), rel=REL)
    assert flatray.apparent_depth(depth, view, n1, n2, Image.TANGENTIAL) == \
        pytest.approx(float(-tan[1]), rel=REL)
    assert flatray.true_depth(float(-sag[1]), view, n1, n2, Image.SAGITTAL) == \
        pytest.approx(depth, rel=REL)
    assert flatray.true_depth(float(-tan[1]), view, n1, n2, Image.TANGENTIAL) == \
        pytest.approx(depth, rel=REL)

    # And the line of sight points at the observer's entry point.
    path = flatray.line_of_sight(stack, observer, obj)
    assert math.atan2(path.direction[0], -path.direction[2]) == pytest.approx(view, rel=REL)


def multilayer_reference(indices, heights, lateral):
    """Media 0..K (observer, layers, object) of ``indices`` with normal extents
    ``heights`` (observer's height before the first interface, the layer
    thicknesses, the object's depth past the last one) and the lateral distance
    from observer to object.

    Returns (sagittal depth, tangential depth, tan t0): depths past the first
    interface, along the normal.
    """
    n = [mp.mpf(v) for v in indices]
    h = [mp.mpf(v) for v in heights]
    L = mp.mpf(lateral)

    def tan_in(k, p):  # tan of the angle in medium k for ray parameter p = n sin(t)
        return p / mp.sqrt(n[k] ** 2 - p**2)

    def offset(p):  # lateral distance travelled observer -> object (Fermat path)
        return sum(h[k] * tan_in(k, p) for k in range(len(n)))

    p_max = min(n) * (1 - mp.mpf(10) ** -30)
    p = mp.findroot(lambda q: offset(q) - L, (mp.mpf(0), p_max), solver="anderson")
    p = mp.findroot(lambda q: offset(q) - L, p)
    tan0 = tan_in(0, p)
    sagittal = L / tan0 - h[0]

    # Observer-side ray of parameter q, extended past the first interface: it enters
    # at E(q) = L - sum_{k>=1} h_k tan_k(q) and is at E(q) + z tan_0(q) at depth z;
    # the envelope solves E'(q) + z tan_0'(q) = 0.
    def entry(q):
        return L - sum(h[k] * tan_in(k, q) for k in range(1, len(n)))

    tangential = -mp.diff(entry, p) / mp.diff(lambda q: tan_in(0, q), p)
    return sagittal, tangential, tan0


@pytest.mark.parametrize("seed", range(6))
def test_multilayer_images_match_mpmath(seed):
    rng = np.random.default_rng(1000 + seed)
    count = int(rng.integers(1, 9))
    normal = unit(rng.normal(size=3))
    origin = rng.uniform(-1, 1, size=3)
    layers = [(float(rng.uniform(0.002, 0.1)), float(rng.uniform(1.0, 2.0)))
              for _ in range(count)]
    n_obs, n_obj = float(rng.uniform(1.0, 1.5)), float(rng.uniform(1.0, 1.5))
    stack = flatray.Stack(origin, normal * 2.0, n_obs, layers, n_obj)
    e1, e2 = perpendicular_basis(normal)
    h0, depth, lateral = rng.uniform(0.05, 2.0), rng.uniform(0.1, 3.0), rng.uniform(0.0, 3.0)
    direction = math.cos(1.0 + seed) * e1 + math.sin(1.0 + seed) * e2
    observer = origin - h0 * normal + 0.3 * e1
    obj = observer + (h0 + stack.total_thickness + depth) * normal + lateral * direction

    indices = [n_obs] + [n for _, n in layers] + [n_obj]
    heights = [h0] + [t for t, _ in layers] + [depth]
    sag, tan, tan0 = multilayer_reference(indices, heights, lateral)

    s = flatray.apparent_position(stack, observer, obj, Image.SAGITTAL)
    t = flatray.apparent_position(stack, observer, obj, Image.TANGENTIAL)
    assert stack.height(s) == pytest.approx(float(sag), rel=REL)
    assert stack.height(t) == pytest.approx(float(tan), rel=REL)
    # Sagittal: on the normal through the object; tangential: on the line of sight
    # at (h0 + z_t) tan t0 from the observer, sideways.
    assert np.linalg.norm(np.cross(s - obj, normal)) < REL * 10
    side = t - observer - np.dot(t - observer, normal) * normal
    assert np.linalg.norm(side) == pytest.approx(float((h0 + tan) * tan0), rel=REL, abs=REL)
