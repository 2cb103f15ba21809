"""Pure water against the ``iapws`` package (PyPI, an independent implementation
of the IAPWS formulations; 1.5.5 when this was written), through the Python
binding.

Which density each side uses:

* ``flatray.index_water_at_density`` and ``iapws._iapws._Refractive`` are both
  IAPWS R9-97 and are fed the same density (IAPWS-95, ``iapws.IAPWS95``): they
  must agree to 1e-8 (the issue's bound; both evaluate one closed formula in
  double precision, so the real difference is ~1e-15).
* ``flatray.index_pure_water(T, p, λ)`` takes its density from its own
  IAPWS-IF97 region-1 code. Against R9-97 at the IF97 density of
  ``iapws.IAPWS97`` (the same formulation): 1e-8. Against R9-97 at the IAPWS-95
  density (the scientific formulation): 1e-5, because IF97 and IAPWS-95
  densities differ by up to 1.8e-5 relative over 0–60 °C and 0.1–100 MPa
  (measured in the test below) and ρ dn/dρ ≈ 0.34 moves n by up to ~7e-6.

Grid: 0–60 °C, 0.101325–100 MPa absolute, 250–1000 nm (vacuum), evaluated with
one broadcast call per quantity.
"""

from __future__ import annotations

import numpy as np
import pytest

import flatray

iapws = pytest.importorskip("iapws")
from iapws._iapws import _Refractive  # noqa: E402  (the package's R9-97 function)

T_C = np.array([0.0, 4.0, 10.0, 20.0, 30.0, 45.0, 60.0])
P_MPA = np.array([0.101325, 1.0, 10.0, 50.0, 100.0])
L_NM = np.array([250.0, 404.7, 532.0, 589.3, 800.0, 1000.0])
K = 273.15


@pytest.fixture(scope="module")
def densities():
    """(rho_iapws95, rho_if97) per (T, p), kg/m3, from the iapws package."""
    rho95 = np.empty((len(T_C), len(P_MPA)))
    rho97 = np.empty_like(rho95)
    for i, t in enumerate(T_C):
        for j, p in enumerate(P_MPA):
            rho95[i, j] = iapws.IAPWS95(T=t + K, P=p).rho
            water97 = iapws.IAPWS97(T=t + K, P=p)
            assert water97.region == 1
            rho97[i, j] = water97.rho
    return rho95, rho97


def _iapws_index(rho):
    """R9-97 from the iapws package on the (T, p, λ) grid at densities ``rho`` (T, p)."""
    out = np.empty((len(T_C), len(P_MPA), len(L_NM)))
    for i, t in enumerate(T_C):
        for j in range(len(P_MPA)):
            for k, lam in enumerate(L_NM):
                out[i, j, k] = _Refractive(rho[i, j], t + K, lam / 1000.0)
    return out


def test_same_density_agrees_to_1e_8(densities):
    rho95, _ = densities
    want = _iapws_index(rho95)
    got = flatray.index_water_at_density(T_C[:, None, None], rho95[:, :, None],
                                         L_NM[None, None, :])
    assert got.shape == want.shape
    assert np.max(np.abs(got - want)) < 1e-8


def test_index_pure_water_against_iapws_if97_density(densities):
    _, rho97 = densities
    want = _iapws_index(rho97)
    got = flatray.index_pure_water(T_C[:, None, None], P_MPA[None, :, None] * 1e6,
                                   L_NM[None, None, :])
    assert np.max(np.abs(got - want)) < 1e-8


def test_index_pure_water_against_iapws95_density_within_1e_5(densities):
    rho95, rho97 = densities
    # The size of the density difference that the 1e-5 bound rests on.
    assert np.max(np.abs(rho97 - rho95) / rho95) < 2e-5
    want = _iapws_index(rho95)
    got, status = flatray.index_pure_water(T_C[:, None, None], P_MPA[None, :, None] * 1e6,
                                           L_NM[None, None, :], return_status=True)
    assert (status == flatray.Status.OK).all()
    assert np.max(np.abs(got - want)) < 1e-5


def test_supercooled_water_at_density():
    # R9-97 covers supercooled liquid down to -12 °C when the density is given
    # (iapws accepts T >= 261.15 K). Same formula: 1e-8.
    for t, rho in [(-10.0, 998.1), (-5.0, 999.3)]:
        want = _Refractive(rho, t + K, 0.532)
        assert abs(flatray.index_water_at_density(t, rho, 532.0) - want) < 1e-8
    with pytest.raises(flatray.OutOfRangeError):
        flatray.index_pure_water(-5.0, flatray.STANDARD_PRESSURE_PA, 532.0)  # IF97 starts at 0 °C
