"""flatray.dask: the batch corrections over Dask arrays and dataframes, on a
local cluster of several worker processes, give bit for bit the single-process
results on the same points; importing flatray never imports Dask."""

from __future__ import annotations

import os
import subprocess
import sys

import numpy as np
import pytest

import flatray
from conftest import PACKAGE_ROOT

N = 30_000  # above the library's parallel threshold in every block of 7_500


def test_importing_flatray_never_imports_dask():
    code = ("import sys, flatray; "
            "loaded = sorted(m for m in sys.modules if m.split('.')[0] in "
            "('dask', 'distributed', 'pandas', 'flatray.dask')); "
            "assert not loaded and 'flatray.dask' not in sys.modules, loaded; print('clean')")
    env = dict(os.environ, PYTHONPATH=str(PACKAGE_ROOT))
    done = subprocess.run([sys.executable, "-c", code], env=env, capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    assert done.stdout.strip() == "clean"


try:  # the optional dependencies (bindings/python/requirements-test.txt installs them)
    import dask
    import dask.array as da
    import dask.dataframe as dd
    import distributed
    import pandas as pd

    import flatray.dask as fdask
except ImportError as exc:  # pragma: no cover - CI installs them
    MISSING = str(exc)
else:
    MISSING = ""

needs_dask = pytest.mark.skipif(bool(MISSING), reason=f"dask not installed: {MISSING}")


@pytest.fixture(scope="module")
def client():
    """Two worker processes, one thread each: blocks really run in other
    processes, each loading the library itself (FLATRAY_LIBRARY is inherited)."""
    cluster = distributed.LocalCluster(n_workers=2, processes=True, threads_per_worker=1,
                                       dashboard_address=None, scheduler_port=0,
                                       host="127.0.0.1")
    c = distributed.Client(cluster)
    try:
        yield c
    finally:
        c.close()
        cluster.close()


def scene():
    """A lake surveyed from 40 m flight lines (invented); every 1000th point is
    above the water (a per-point failure) and one is NaN."""
    rng = np.random.default_rng(5)
    sensors = np.column_stack([rng.uniform(0, 300, N), rng.uniform(-50, 50, N), np.full(N, 40.0)])
    floor = sensors + np.column_stack([rng.uniform(-4, 4, N), rng.uniform(-30, 30, N),
                                       np.zeros(N)])
    floor[:, 2] = -rng.uniform(0.1, 7.0, N)
    floor[::1000, 2] = 1.0
    floor[17, 0] = np.nan
    lake = flatray.Stack.single_interface((0, 0, 0), (0, 0, -1), 1.00028, 1.339)
    return lake, sensors, floor


def same(a, b):
    """Bit for bit, NaNs included."""
    a, b = np.asarray(a), np.asarray(b)
    return a.dtype == b.dtype and a.shape == b.shape and a.tobytes() == b.tobytes()


@needs_dask
def test_the_workers_are_other_processes_with_the_library(client):
    found = fdask.worker_libraries(client)
    assert len(found) == 2
    for report in found.values():
        assert report["version"] == flatray.__version__
        assert os.path.samefile(report["library"], flatray.library_path)
    pids = set(client.run(os.getpid).values())
    assert len(pids) == 2 and os.getpid() not in pids


@needs_dask
@pytest.mark.parametrize("image", list(flatray.Image))
def test_arrays_equal_the_single_process_results(client, image):
    lake, sensors, floor = scene()
    objects = da.from_array(floor, chunks=(7_500, 3))
    for observers in (sensors, da.from_array(sensors, chunks=(5_000, 3)), (0.0, 0.0, 40.0),
                      da.from_array(np.array([[0.0, 0.0, 40.0]]))):
        local = np.asarray(observers)  # the same observers, in memory
        want = flatray.apparent_positions(lake, local, floor, image)
        got = dask.compute(*fdask.apparent_positions(lake, observers, objects, image))
        assert same(got[0], want.points) and same(got[1], want.status)
    seen = want.points
    seen[np.isnan(seen[:, 0])] = (0.0, 0.0, 1.0)  # failed rows: above the water, wrong side
    want = flatray.true_positions(lake, (0.0, 0.0, 40.0), seen, image)
    got = dask.compute(*fdask.true_positions(lake, (0.0, 0.0, 40.0),
                                             da.from_array(seen, chunks=6_000), image))
    assert same(got[0], want.points) and same(got[1], want.status)
    assert (want.status != 0).sum() > 0 and (want.status == 0).sum() > 0.9 * N


@needs_dask
def test_ranges_lines_of_sight_and_traces(client):
    lake, sensors, floor = scene()
    groups = (1.00029, 1.3758)  # group indices of air and water near 532 nm, from memory
    want = flatray.correct_ranges(lake, sensors, floor, groups)
    got = dask.compute(*fdask.correct_ranges(lake, sensors, da.from_array(floor, chunks=4_000),
                                             groups))
    assert same(got[0], want.points) and same(got[1], want.status)

    want = flatray.lines_of_sight(lake, sensors, floor)
    got = dask.compute(*fdask.lines_of_sight(lake, sensors, da.from_array(floor, chunks=9_000)))
    for g, w in zip(got, want):
        assert same(g, w)

    directions = want.direction.copy()
    directions[np.isnan(directions)] = 0.0  # zero directions: per-ray failures
    want = flatray.trace_rays(lake, sensors, directions)
    got = dask.compute(*fdask.trace_rays(lake, sensors, da.from_array(directions, chunks=7_000)))
    for g, w in zip(got, want):
        assert same(g, w)


@needs_dask
def test_dataframes_equal_the_single_process_results(client):
    lake, sensors, floor = scene()
    frame = pd.DataFrame({"x": floor[:, 0], "y": floor[:, 1], "z": floor[:, 2],
                          "sx": sensors[:, 0], "sy": sensors[:, 1], "sz": sensors[:, 2],
                          "line": np.arange(N) // 1000})
    ddf = dd.from_pandas(frame, npartitions=5)
    lazy = fdask.correct_frame(ddf, lake, "apparent_positions", observer_columns=("sx", "sy", "sz"),
                               image="tangential")
    got = lazy.compute()
    want = flatray.apparent_positions(lake, sensors, floor, "tangential")
    assert same(got[["apparent_x", "apparent_y", "apparent_z"]].to_numpy(), want.points)
    assert same(got["status"].to_numpy(), want.status)
    assert same(got["line"].to_numpy(), frame["line"].to_numpy())  # other columns kept
    # The same partition function on the pandas frame in memory.
    local = fdask.correct_partition(frame, lake, "apparent_positions",
                                    observer_columns=("sx", "sy", "sz"), image="tangential")
    pd.testing.assert_frame_equal(got, local)

    seen = got.rename(columns={"apparent_x": "ax", "apparent_y": "ay", "apparent_z": "az"})
    lazy = fdask.correct_frame(dd.from_pandas(seen, npartitions=3), lake, observer=(0, 0, 40),
                               columns=("ax", "ay", "az"), status_column="fix")
    got = lazy.compute()
    want = flatray.true_positions(lake, (0, 0, 40), seen[["ax", "ay", "az"]].to_numpy())
    assert same(got[["true_x", "true_y", "true_z"]].to_numpy(), want.points)
    assert same(got["fix"].to_numpy(), want.status)

    lazy = fdask.correct_frame(ddf, lake, "correct_ranges", observer_columns=("sx", "sy", "sz"),
                               output_columns=("cx", "cy", "cz"))
    got = lazy.compute()
    want = flatray.correct_ranges(lake, sensors, floor)
    assert same(got[["cx", "cy", "cz"]].to_numpy(), want.points)


@needs_dask
def test_whole_call_errors_raise_when_the_graph_is_built():
    lake, sensors, floor = scene()
    bad = lake.to_c()
    bad.n_object = -1.0
    with pytest.raises(flatray.InvalidArgumentError):
        fdask.true_positions(bad, sensors, floor)
    with pytest.raises(flatray.InvalidArgumentError):
        fdask.apparent_positions(lake, sensors, floor, 7)
    with pytest.raises(ValueError, match="image"):
        fdask.apparent_positions(lake, sensors, floor, "meridional")
    with pytest.raises(ValueError, match="observers"):
        fdask.lines_of_sight(lake, sensors[:10], floor)
    with pytest.raises(ValueError, match="objects"):
        fdask.apparent_positions(lake, sensors, floor[:, :2])
    with pytest.raises(TypeError, match="stack"):
        fdask.trace_rays("lake", sensors, floor)
    frame = dd.from_pandas(pd.DataFrame({"x": [1.0], "y": [0.0], "z": [-1.0]}), npartitions=1)
    with pytest.raises(ValueError, match="observer"):
        fdask.correct_frame(frame, lake)
    with pytest.raises(ValueError, match="how"):
        fdask.correct_frame(frame, lake, "triangulate", observer=(0, 0, 1))
