"""Textbook values: normal reflectance, Brewster angle, critical angle, Snell's
window, paraxial apparent depth."""

from __future__ import annotations

import math

import pytest

import flatray
from flatray import Image


def test_normal_incidence_reflectance_of_glass_is_four_percent():
    # R = ((n - 1)/(n + 1))^2 = 0.04 for n = 1.5 (Hecht, Optics, eq. 4.67).
    f = flatray.fresnel(1.0, 1.0, 1.5)
    assert f.r == pytest.approx(0.04, abs=1e-15)
    assert f.rs == pytest.approx(0.04, abs=1e-15) and f.rp == pytest.approx(0.04, abs=1e-15)
    assert f.t == pytest.approx(0.96, abs=1e-15)


@pytest.mark.parametrize("n1, n2", [(1.0, 1.5), (1.0, 1.333), (1.333, 1.0), (1.5, 1.0)])
def test_brewster_angle_has_no_p_reflection(n1, n2):
    # Brewster angle tan(theta_B) = n2/n1: rp = 0 (Hecht, Optics, section 4.6).
    theta_b = math.atan2(n2, n1)
    f = flatray.fresnel(math.cos(theta_b), n1, n2)
    assert f.rp == pytest.approx(0.0, abs=1e-15)
    assert f.tp == pytest.approx(1.0, abs=1e-15)
    assert f.rs > 0.01


def test_critical_angle_water_to_air():
    # arcsin(n2/n1), about 48.6 degrees for n = 1.333 (Hecht, Optics, section 4.7 on
    # total internal reflection; section number taken from memory).
    assert flatray.critical_angle_deg(1.333, 1.0) == pytest.approx(48.6, abs=0.05)
    assert flatray.critical_angle(1.333, 1.0) == pytest.approx(math.asin(1 / 1.333), rel=1e-15)


def test_snells_window_is_about_97_degrees():
    # Snell's window: the cone of 2 x the critical angle, about 97 degrees
    # (common practice).
    assert 2 * flatray.critical_angle_deg(1.333, 1.0) == pytest.approx(97.2, abs=0.1)


def test_beyond_the_critical_angle_fresnel_is_total_reflection():
    # DESIGN.md: beyond the critical angle r = rs = rp = 1, t = ts = tp = 0, OK.
    f = flatray.fresnel(math.cos(math.radians(60)), 1.333, 1.0)
    assert (f.rs, f.rp, f.ts, f.tp, f.r, f.t) == (1.0, 1.0, 0.0, 0.0, 1.0, 0.0)


def test_refraction_obeys_snells_law():
    # n1 sin t1 = n2 sin t2 (Hecht, Optics, section 4.4); 45 degrees from air into water.
    t = flatray.refract((1, 0, 1), (0, 0, -3), 1.0, 1.333)
    assert math.hypot(*t) == pytest.approx(1.0, abs=1e-15)
    assert 1.333 * t[0] == pytest.approx(math.sin(math.pi / 4), rel=1e-15)
    assert t[2] > 0  # keeps going the same way: the normal's orientation does not matter


@pytest.mark.parametrize("image", list(Image))
@pytest.mark.parametrize("n1, n2", [(1.0, 1.333), (1.00029, 1.343), (1.333, 1.0)])
def test_apparent_depth_along_the_normal_is_d_n1_over_n2(image, n1, n2):
    # Paraxial apparent depth d n1/n2 (Hecht, Optics, ch. 5: a spherical refracting
    # surface with R -> infinity; chapter taken from memory); both images agree
    # along the normal (DESIGN.md).
    d = 2.5
    assert flatray.apparent_depth(d, 0.0, n1, n2, image) == pytest.approx(d * n1 / n2, rel=1e-15)
    assert flatray.true_depth(d * n1 / n2, 0.0, n1, n2, image) == pytest.approx(d, rel=1e-15)
    stack = flatray.Stack.single_interface((1, 2, 0), (0, 0, -1), n1, n2)
    seen = flatray.apparent_position(stack, (1, 2, 1.7), (1, 2, -d), image)
    assert seen[0] == 1 and seen[1] == 2
    assert seen[2] == pytest.approx(-d * n1 / n2, rel=1e-15)


def test_degree_helpers_match_the_radian_functions():
    for deg in (0.0, 10.0, 35.0, 70.0):
        for image in Image:
            assert flatray.apparent_depth_deg(2.0, deg, 1.0, 1.333, image) == \
                flatray.apparent_depth(2.0, math.radians(deg), 1.0, 1.333, image)
            assert flatray.true_depth_deg(2.0, deg, 1.0, 1.333, image) == \
                flatray.true_depth(2.0, math.radians(deg), 1.0, 1.333, image)
