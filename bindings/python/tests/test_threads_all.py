"""Every part of the binding called from many Python threads at once gives
exactly the results of a single-threaded run (issue 7: no global mutable state
in the library; ctypes releases the GIL during each call, so the calls really
overlap). Covers the scalar functions, the batches, the refractive-index
models, the camera and the survey functions."""

from __future__ import annotations

import threading

import numpy as np

import flatray
from flatray import Image

THREADS = 8
ROUNDS = 4


def _stack():
    return flatray.Stack(origin=(0, 0, 0.04), normal=(0, 0.05, 1), n_observer=1.0003,
                         layers=[(0.012, 1.52), (0.002, 1.4)], n_object=1.34)


def _everything() -> list[np.ndarray]:
    stack = _stack()
    eye = np.zeros(3)
    out: list = []
    for k in range(12):
        x = 0.37 * k - 2.0
        obj = np.array([x, 0.5 * x, 1.0 + 0.1 * k])
        out.append(flatray.refract((0.1 * x, 0.2, 1.0), (0, 0, 1), 1.0, 1.5))
        out.append(flatray.fresnel(0.05 * k, 1.0, 1.5).t)
        out.append(flatray.critical_angle(1.5 + 0.01 * k, 1.0))
        out.append(flatray.line_of_sight(stack, eye, obj).optical_length)
        out.append(flatray.trace(stack, eye, (0.1 * x, 0.2, 1.0)).transmittance)
        for image in Image:
            seen = flatray.apparent_position(stack, eye, obj, image)
            out.append(seen)
            out.append(flatray.true_position(stack, eye, seen, image))
            out.append(flatray.apparent_depth(1.0 + abs(x), 0.04 * k, 1.0, 1.333, image))
    objects = np.column_stack([np.linspace(-3, 3, 500), np.linspace(0, 1, 500), np.full(500, 2.0)])
    objects[::50] = np.nan
    seen, status = flatray.apparent_positions(stack, eye, objects, Image.TANGENTIAL)
    out += [seen, status]
    truth, status = flatray.true_positions(stack, eye, seen, Image.TANGENTIAL)
    out += [truth, status]
    temperatures = np.linspace(0.0, 30.0, 40)
    out.append(flatray.index_pure_water(temperatures, 101325.0, 532.0))
    out.append(flatray.group_index_seawater(temperatures, 35.0, 532.0))
    out.append(flatray.index_air(temperatures, 101325.0, 0.5, 532.0))
    lens = flatray.Lens(1400, 1400, 960, 540, k1=-0.1, k2=0.02, p1=1e-4, p2=-2e-4)
    uv = np.column_stack([np.linspace(0, 1919, 60), np.linspace(0, 1079, 60)])
    rays = flatray.pixels_to_rays(lens, stack, uv)
    out += [np.asarray(r) for r in rays]
    out.append(flatray.remap_table(lens, stack, lens.without_distortion(), 2.0, 64, 36)[0])
    cameras = np.array([[-3.0, 0.0, -20.0], [4.0, 1.0, -25.0], [0.5, -6.0, -18.0]])
    out.append(flatray.correct_multiview(stack, cameras, (0.3, 1.0, 1.5)).point)
    out.append(flatray.correct_range(stack, cameras[0], (0.3, 1.0, 1.5)))
    out.append(flatray.true_position_covariance(stack, eye, (0.3, 0.2, 1.2), sigma_offset=0.01,
                                                sigma_n_object=0.001, sigma_observer=0.02,
                                                sigma_apparent=0.01))
    return [np.asarray(v, dtype=float) if not isinstance(v, np.ndarray) else v for v in out]


def _same(a: list[np.ndarray], b: list[np.ndarray]) -> bool:
    return len(a) == len(b) and all(
        x.shape == y.shape and np.array_equal(x, y, equal_nan=True) for x, y in zip(a, b))


def test_every_function_gives_the_same_results_from_many_threads():
    expected = _everything()
    failures: list[str] = []

    def worker():
        for _ in range(ROUNDS):
            if not _same(_everything(), expected):
                failures.append("a thread saw different results")

    threads = [threading.Thread(target=worker) for _ in range(THREADS)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    assert not failures, failures
