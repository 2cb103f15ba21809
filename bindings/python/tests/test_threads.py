"""Batch functions called from several Python threads at once give the same
results as one thread (the library keeps no shared mutable state; ctypes
releases the GIL during each call)."""

from __future__ import annotations

import threading

import numpy as np

import flatray
from flatray import Image
from conftest import random_scene

THREADS = 4
ROUNDS = 5
N = 4000


def _workload():
    rng = np.random.default_rng(7)
    stack, observer, _ = random_scene(rng, 3)
    n = stack.unit_normal
    e1 = np.cross(n, [1.0, 0.0, 0.0] if abs(n[0]) < 0.9 else [0.0, 1.0, 0.0])
    e1 /= np.linalg.norm(e1)
    e2 = np.cross(n, e1)
    depth = stack.total_thickness + rng.uniform(0.01, 5.0, N)
    objects = (stack.origin + depth[:, None] * n
               + rng.uniform(-5, 5, N)[:, None] * e1 + rng.uniform(-5, 5, N)[:, None] * e2)
    objects[::97] = np.nan  # some failing elements too
    observers = observer + rng.uniform(-0.01, 0.01, (N, 3)) - 0.02 * n
    directions = rng.normal(size=(N, 3))  # about half point away from the stack
    return stack, observers, objects, directions


def _run(stack, observers, objects, directions):
    results = []
    for image in Image:
        seen, s1 = flatray.apparent_positions(stack, observers, objects, image)
        truth, s2 = flatray.true_positions(stack, observers, seen, image)
        results += [seen, s1, truth, s2]
    results += list(flatray.trace_rays(stack, observers, directions))
    return results


def _same(a, b):
    return len(a) == len(b) and all(
        x.dtype == y.dtype and np.array_equal(x, y, equal_nan=x.dtype.kind == "f")
        for x, y in zip(a, b))


def test_concurrent_batches_match_a_single_thread():
    work = _workload()
    expected = _run(*work)
    statuses = expected[1]
    assert (statuses == 0).sum() > N // 2 and (statuses != 0).any()

    outcomes = [[] for _ in range(THREADS)]
    errors = []
    barrier = threading.Barrier(THREADS)

    def worker(k):
        try:
            barrier.wait()
            for _ in range(ROUNDS):
                outcomes[k].append(_run(*work))
        except BaseException as exc:  # reported below
            errors.append(exc)

    threads = [threading.Thread(target=worker, args=(k,)) for k in range(THREADS)]
    for t in threads:
        t.start()
    for t in threads:
        t.join(timeout=120)
    assert not errors
    assert all(len(o) == ROUNDS for o in outcomes)
    for per_thread in outcomes:
        for result in per_thread:
            assert _same(result, expected)
