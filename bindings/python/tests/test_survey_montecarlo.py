"""The propagated uncertainty of a corrected point (flatray_true_position_covariance)
against a Monte Carlo run: perturb the water level, the water index, the camera
position and the apparent point with independent normal errors, correct each
sample with flatray.true_position, and compare the sample covariance of the true
points with the first-order covariance.

Scene invented; standard deviations typical of a drone survey (from memory): water
level 2 cm, index 0.002, camera position 5 cm, apparent point 3 cm.
"""

from __future__ import annotations

import numpy as np
import pytest

import flatray

N = 20_000
SIGMA = dict(sigma_offset=0.02, sigma_n_object=0.002, sigma_observer=0.05, sigma_apparent=0.03)
N_AIR, N_SEA = 1.00028, 1.339


def lake(offset=0.0, n_object=N_SEA):
    # The stack moved by `offset` along its unit normal (0, 0, -1).
    return flatray.Stack.single_interface((0, 0, -offset), (0, 0, -1), N_AIR, n_object)


@pytest.mark.parametrize("image", ["sagittal", "tangential"])
@pytest.mark.parametrize("observer, apparent", [
    ((1.0, -2.0, 20.0), (9.0, 4.0, -2.5)),     # about 27 degrees off nadir
    ((0.0, 0.0, 30.0), (0.5, -0.3, -4.0)),     # near nadir
])
def test_first_order_covariance_matches_monte_carlo(image, observer, apparent):
    rng = np.random.default_rng(20240611)
    observer = np.asarray(observer)
    apparent = np.asarray(apparent)
    cov = flatray.true_position_covariance(lake(), observer, apparent, image, **SIGMA)
    offsets = rng.normal(0.0, SIGMA["sigma_offset"], N)
    indices = N_SEA + rng.normal(0.0, SIGMA["sigma_n_object"], N)
    observers = observer + rng.normal(0.0, SIGMA["sigma_observer"], (N, 3))
    apparents = apparent + rng.normal(0.0, SIGMA["sigma_apparent"], (N, 3))
    samples = np.empty((N, 3))
    for i in range(N):
        samples[i] = flatray.true_position(lake(offsets[i], indices[i]), observers[i],
                                           apparents[i], image)
    mc = np.cov(samples, rowvar=False)
    # Sampling error of a covariance entry: se(c_ij) = sqrt((c_ii c_jj + c_ij^2) / N)
    # for normal data; allow 5 standard errors (the first-order bias at these small
    # standard deviations is far smaller: curvature x sigma^2 ~ 1e-5 relative).
    d = np.sqrt(np.diag(cov))
    se = np.sqrt((np.outer(d, d) ** 2 + cov ** 2) / N)
    assert np.all(np.abs(mc - cov) <= 5 * se), (mc, cov, se)
    # The standard uncertainties per axis agree within 4 % (5 x sqrt(1/(2N)) = 2.5 %).
    np.testing.assert_allclose(np.sqrt(np.diag(mc)), d, rtol=0.04)
    print(f"{image}: first-order sd {d}, Monte Carlo sd {np.sqrt(np.diag(mc))}")
