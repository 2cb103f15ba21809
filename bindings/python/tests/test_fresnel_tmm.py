"""Fresnel power coefficients against the `tmm` package.

Reference: tmm (S. J. Byrnes, "Multilayer optical calculations", arXiv:1603.02720;
the PyPI package `tmm`), a general thin-film transfer-matrix code. For a single
interface, n_list = [n1, n2] and d_list = [inf, inf]; its R and T are the power
reflectance and transmittance for s or p light at incidence th_0.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import tmm

import flatray

LAMBDA_NM = 550.0  # irrelevant for a single interface; any vacuum wavelength


def _angles_below_critical(n1, n2):
    angles = np.arange(0, 90)  # 0..89 degrees
    if n1 > n2:
        limit = math.degrees(math.asin(n2 / n1))
        angles = angles[angles < limit]
    return angles


@pytest.mark.parametrize("n1, n2", [(1.0, 1.5), (1.0, 1.333), (1.333, 1.0)])
def test_fresnel_agrees_with_tmm(n1, n2):
    angles = _angles_below_critical(n1, n2)
    assert len(angles) >= 48
    for deg in angles:
        th = math.radians(float(deg))
        ours = flatray.fresnel(math.cos(th), n1, n2)
        s = tmm.coh_tmm("s", [n1, n2], [np.inf, np.inf], th, LAMBDA_NM)
        p = tmm.coh_tmm("p", [n1, n2], [np.inf, np.inf], th, LAMBDA_NM)
        where = f"n1={n1}, n2={n2}, {deg} deg"
        assert ours.rs == pytest.approx(s["R"], abs=1e-12), where
        assert ours.ts == pytest.approx(s["T"], abs=1e-12), where
        assert ours.rp == pytest.approx(p["R"], abs=1e-12), where
        assert ours.tp == pytest.approx(p["T"], abs=1e-12), where
        assert ours.r == pytest.approx((s["R"] + p["R"]) / 2, abs=1e-12), where
        assert ours.t == pytest.approx((s["T"] + p["T"]) / 2, abs=1e-12), where


@pytest.mark.parametrize("n1, n2", [(1.0, 1.5), (1.333, 1.0), (1.52, 1.34)])
def test_trace_transmittance_agrees_with_tmm(n1, n2):
    # One interface: trace's (Ts + Tp)/2 is tmm's unpolarised T at the incidence angle.
    stack = flatray.Stack.single_interface((0, 0, 0), (0, 0, 1), n1, n2)
    for deg in _angles_below_critical(n1, n2)[::7]:
        th = math.radians(float(deg))
        _, _, t = flatray.trace(stack, (0, 0, -1), (math.sin(th), 0, math.cos(th)))
        s = tmm.coh_tmm("s", [n1, n2], [np.inf, np.inf], th, LAMBDA_NM)["T"]
        p = tmm.coh_tmm("p", [n1, n2], [np.inf, np.inf], th, LAMBDA_NM)["T"]
        assert t == pytest.approx((s + p) / 2, abs=1e-12)
