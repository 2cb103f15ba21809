"""The flat-port camera against an independent high-precision model written
here with mpmath (40 digits).

Forward projection: the light path from the centre of projection to a point
in the water lies in the plane of the port normal and the point (Snell's law
keeps rays in the plane of incidence). With the ray parameter p = n sin(theta),
the same in every medium of a flat stack, the path's lateral offset is
sum_k h_k tan(theta_k); the reference finds p by bisection on that sum, builds the direction in the housing from theta_0,
and projects it through the Brown-Conrady model (Brown 1966, Conrady 1919)
evaluated in mpmath. This is the multi-layer flat refractive geometry of
Agrawal et al., CVPR 2012, solved without their quartic.

Back-projection: the pixel is undistorted by a 2-D mpmath.findroot, and the
direction is refracted at each interface by the vector form of Snell's law,
all in 40 digits.

Cameras, housings and indices are invented (typical values from memory).
"""

from __future__ import annotations

import mpmath as mp
import numpy as np
import pytest

import flatray
from flatray import Lens

mp.mp.dps = 40

# The library solves the line of sight to 1e-14 of the geometry's size and the
# undistortion to 1e-12 in normalised coordinates (errors after the last Newton
# step far smaller): about 1e-11 px and 1e-13 rad. The tolerances leave room for
# double rounding over ~10 operations.
PX_TOL = 1e-9
DIR_TOL = 1e-12
POS_TOL = 1e-12  # metres, on points within 0.1 m of the camera

CASES = {
    "perpendicular port": dict(
        lens=Lens(1100.0, 1102.0, 641.3, 357.9, k1=-0.08, k2=0.015, p1=2e-4, p2=-1e-4),
        origin=(0.0, 0.0, 0.03), normal=(0.0, 0.0, 1.0), n_obs=1.00028,
        layers=[(0.008, 1.52)], n_obj=1.339),
    "tilted offset port, strong distortion": dict(
        lens=Lens(780.0, 781.0, 639.5, 359.5, k1=-0.31, k2=0.095, k3=-0.012, p1=9e-4,
                  p2=-7e-4),
        origin=(0.012, -0.007, 0.045), normal=(0.11, -0.06, 1.0), n_obs=1.00028,
        layers=[(0.012, 1.52), (0.0015, 1.49)], n_obj=1.339),
    "water-filled housing into air": dict(
        lens=Lens(900.0, 900.0, 640.0, 360.0, k1=-0.05),
        origin=(0.0, 0.0, 0.02), normal=(0.0, 0.05, 1.0), n_obs=1.333,
        layers=[(0.01, 1.52)], n_obj=1.0),
}


def _setup(case):
    c = CASES[case]
    port = flatray.Stack(c["origin"], c["normal"], c["n_obs"], c["layers"], c["n_obj"])
    return c, port


def _mvec(v):
    return mp.matrix([mp.mpf(float(x)) for x in v])


def _dot(a, b):
    return sum(a[i] * b[i] for i in range(3))


def _unit(a):
    return a / mp.sqrt(_dot(a, a))


def _distort(lens, x, y):
    k1, k2, k3, p1, p2 = (mp.mpf(getattr(lens, f)) for f in ("k1", "k2", "k3", "p1", "p2"))
    r2 = x * x + y * y
    radial = 1 + k1 * r2 + k2 * r2**2 + k3 * r2**3
    xd = x * radial + 2 * p1 * x * y + p2 * (r2 + 2 * x * x)
    yd = y * radial + p1 * (r2 + 2 * y * y) + 2 * p2 * x * y
    return xd, yd


def reference_pixel(c, point):
    """The pixel of ``point`` (camera frame, metres), in 40 digits."""
    n = _unit(_mvec(c["normal"]))
    h0 = _dot(_mvec(c["origin"]), n)  # centre to first interface, along the normal
    thick = [mp.mpf(t) for t, _ in c["layers"]]
    idx = [mp.mpf(k) for _, k in c["layers"]]
    p = _mvec(point)
    along = _dot(p, n)
    hx = along - h0 - sum(thick)
    assert hx > 0
    lateral = p - along * n
    X = mp.sqrt(_dot(lateral, lateral))
    e = lateral / X
    media = [(h0, mp.mpf(c["n_obs"]))] + list(zip(thick, idx)) + [(hx, mp.mpf(c["n_obj"]))]
    n_min = min(k for _, k in media)

    def offset(q):  # lateral offset for ray parameter q, minus the target
        return sum(h * q / mp.sqrt(k * k - q * q) for h, k in media) - X

    # The offset increases with q on [0, n_min): bisection to 2^-200 of n_min,
    # far below the 40 working digits' needs.
    lo, hi = mp.mpf(0), n_min * (1 - mp.mpf(10) ** -30)
    for _ in range(200):
        mid = (lo + hi) / 2
        if offset(mid) < 0:
            lo = mid
        else:
            hi = mid
    q = (lo + hi) / 2
    n0 = mp.mpf(c["n_obs"])
    sin0 = q / n0
    d = mp.sqrt(1 - sin0 * sin0) * n + sin0 * e
    x, y = d[0] / d[2], d[1] / d[2]
    xd, yd = _distort(c["lens"], x, y)
    lens = c["lens"]
    return float(lens.fx * xd + lens.cx), float(lens.fy * yd + lens.cy)


def reference_ray(c, u, v):
    """The ray in the water of pixel (u, v), in 40 digits: (origin, direction)."""
    lens = c["lens"]
    xd = (mp.mpf(u) - lens.cx) / mp.mpf(lens.fx)
    yd = (mp.mpf(v) - lens.cy) / mp.mpf(lens.fy)
    x, y = mp.findroot(lambda a, b: [_distort(lens, a, b)[0] - xd, _distort(lens, a, b)[1] - yd],
                       (xd, yd))
    d = _unit(mp.matrix([x, y, mp.mpf(1)]))
    n = _unit(_mvec(c["normal"]))
    pos = mp.matrix([0, 0, 0])
    plane = _dot(_mvec(c["origin"]), n)  # height of the current interface above the centre
    n_prev = mp.mpf(c["n_obs"])
    media = [(mp.mpf(t), mp.mpf(k)) for t, k in c["layers"]] + [(None, mp.mpf(c["n_obj"]))]
    for thickness, n_next in media:
        # Advance to the interface at height `plane`, then refract (vector Snell).
        s = (plane - _dot(pos, n)) / _dot(d, n)
        pos = pos + s * d
        cos_i = _dot(d, n)
        eta = n_prev / n_next
        cos_t = mp.sqrt(1 - eta**2 * (1 - cos_i**2))
        d = _unit(eta * (d - cos_i * n) + cos_t * n)
        n_prev = n_next
        if thickness is not None:
            plane += thickness
    return pos, d


def _sample_pixels(lens):
    for fu in (0.0, 0.23, 0.5, 0.81, 1.0):
        for fv in (0.0, 0.37, 0.5, 1.0):
            yield -0.5 + fu * 2 * lens.cx, -0.5 + fv * 2 * lens.cy


@pytest.mark.parametrize("case", sorted(CASES))
def test_point_to_pixel_against_mpmath(case):
    c, port = _setup(case)
    rng = np.random.default_rng(7)
    checked = 0
    for u, v in _sample_pixels(c["lens"]):
        try:
            o, d = flatray.pixel_to_ray(c["lens"], port, u, v)
        except flatray.TotalInternalReflectionError:
            continue  # the water-filled housing: corners beyond the critical angle
        for s in (0.05, 0.7, 4.0, 30.0):
            point = o + s * d + rng.normal(scale=0.01, size=3)  # near, not on, the ray
            got = flatray.point_to_pixel(c["lens"], port, point)
            want = reference_pixel(c, point)
            assert got == pytest.approx(want, abs=PX_TOL), (u, v, s)
            checked += 1
    assert checked >= 40


@pytest.mark.parametrize("case", sorted(CASES))
def test_pixel_to_ray_against_mpmath(case):
    c, port = _setup(case)
    checked = 0
    for u, v in _sample_pixels(c["lens"]):
        try:
            o, d = flatray.pixel_to_ray(c["lens"], port, u, v)
        except flatray.TotalInternalReflectionError:
            continue
        ro, rd = reference_ray(c, u, v)
        assert np.allclose(o, [float(x) for x in ro], rtol=0, atol=POS_TOL), (u, v)
        assert np.allclose(d, [float(x) for x in rd], rtol=0, atol=DIR_TOL), (u, v)
        checked += 1
    assert checked >= 8


def test_thin_port_field_of_view_is_snell_at_the_edges():
    # Issue reference: in-water field of view = 2 asin(sin(half-angle in air) /
    # n_water) for a thin perpendicular port (Snell's law, air index 1). The
    # half-angle in air of a pinhole is atan((W/2)/f) with the principal point at
    # the image centre; the reference is evaluated in mpmath.
    lens = Lens(1000.0, 1000.0, 959.5, 539.5)
    port = flatray.Stack((0, 0, 0.01), (0, 0, 1), 1.0, [(1e-5, 1.52)], 1.333)
    h, v = flatray.field_of_view(lens, port, 1920, 1080)
    for got, half in ((h, 960), (v, 540)):
        air = mp.atan(mp.mpf(half) / 1000)
        want = 2 * mp.asin(mp.sin(air) / mp.mpf("1.333"))
        assert got == pytest.approx(float(want), abs=1e-13)
