"""Batch functions: numpy in and out, per-element statuses, whole-call errors
(rules: DESIGN.md, "Rules every function follows", Batches)."""

from __future__ import annotations

import ctypes

import numpy as np
import pytest

import flatray
from flatray import Image, Status
from flatray._convert import observers as as_observers, points as as_points

NAN = float("nan")
VEC_P = ctypes.POINTER(flatray.FlatrayVec3)
INT32_P = ctypes.POINTER(ctypes.c_int32)
EYE = np.array([0.2, -0.1, 1.5])

# Objects under the lake: good, NaN row, good, above the water (wrong side), good.
OBJECTS = np.array([
    [1.0, 0.0, -1.0],
    [NAN, 0.0, -1.0],
    [-2.0, 0.5, -0.3],
    [0.0, 0.0, 2.0],
    [0.1, 3.0, -4.0],
])
EXPECTED_STATUS = [Status.OK, Status.INVALID_ARGUMENT, Status.OK, Status.WRONG_SIDE, Status.OK]
GOOD = [0, 2, 4]
BAD = [1, 3]


@pytest.mark.parametrize("image", list(Image))
def test_apparent_positions_fill_every_good_element(lake, image):
    points, status = flatray.apparent_positions(lake, EYE, OBJECTS, image)
    assert points.shape == (5, 3) and points.dtype == np.float64
    assert status.shape == (5,) and status.dtype == np.int32
    assert status.tolist() == [int(s) for s in EXPECTED_STATUS]
    assert np.isnan(points[BAD]).all()
    for i in GOOD:
        single = flatray.apparent_position(lake, EYE, OBJECTS[i], image)
        assert np.array_equal(points[i], single)


@pytest.mark.parametrize("image", list(Image))
def test_true_positions_fill_every_good_element(lake, image):
    seen, _ = flatray.apparent_positions(lake, EYE, OBJECTS, image)
    seen[3] = [0.0, 0.0, 0.5]  # apparent point above the water: wrong side
    truth, status = flatray.true_positions(lake, EYE, seen, image)
    assert status.tolist() == [int(s) for s in EXPECTED_STATUS]
    assert np.isnan(truth[BAD]).all()
    assert np.allclose(truth[GOOD], OBJECTS[GOOD], rtol=0, atol=1e-12)
    for i in GOOD:
        assert np.array_equal(truth[i], flatray.true_position(lake, EYE, seen[i], image))


def test_raise_on_error_raises_the_lowest_index_failure(lake):
    with pytest.raises(flatray.InvalidArgumentError) as info:
        flatray.apparent_positions(lake, EYE, OBJECTS, raise_on_error=True)
    assert info.value.index == 1
    assert info.value.function == "flatray_apparent_positions"
    reordered = OBJECTS[[0, 3, 1, 2]]
    with pytest.raises(flatray.WrongSideError) as info:
        flatray.apparent_positions(lake, EYE, reordered, raise_on_error=True)
    assert info.value.index == 1
    with pytest.raises(flatray.WrongSideError) as info:
        flatray.true_positions(lake, EYE, [[0, 0, -1], [0, 0, 1]], raise_on_error=True)
    assert info.value.index == 1
    # Nothing failed: no exception, all OK.
    pts, st = flatray.apparent_positions(lake, EYE, OBJECTS[GOOD], raise_on_error=True)
    assert (st == 0).all() and np.isfinite(pts).all()


def test_shared_and_per_point_observers(lake):
    good = OBJECTS[GOOD]
    shared, _ = flatray.apparent_positions(lake, EYE, good)
    for observers in (EYE.tolist(), EYE.reshape(1, 3), np.tile(EYE, (3, 1))):
        again, status = flatray.apparent_positions(lake, observers, good)
        assert np.array_equal(again, shared)
        assert (status == 0).all()
    eyes = np.array([[0.0, 0.0, 1.0], [1.0, 1.0, 2.0], [-3.0, 0.0, 0.5]])
    per_point, status = flatray.apparent_positions(lake, eyes, good, Image.TANGENTIAL)
    assert (status == 0).all()
    for i in range(3):
        single = flatray.apparent_position(lake, eyes[i], good[i], Image.TANGENTIAL)
        assert np.array_equal(per_point[i], single)
    truth, status = flatray.true_positions(lake, eyes, per_point, Image.TANGENTIAL)
    assert (status == 0).all()
    assert np.allclose(truth, good, rtol=0, atol=1e-12)


@pytest.mark.parametrize("raise_on_error", [False, True])
def test_observer_count_mismatch_is_a_whole_call_error(lake, raise_on_error):
    # observer_count neither 1 nor count: FLATRAY_ERR_INVALID_ARGUMENT for the
    # whole call, raised whatever raise_on_error says (nothing was computed).
    two = np.array([[0, 0, 1.0], [0, 0, 2.0]])
    for function in (flatray.apparent_positions, flatray.true_positions):
        with pytest.raises(flatray.InvalidArgumentError) as info:
            function(lake, two, OBJECTS[GOOD], raise_on_error=raise_on_error)
        assert info.value.index is None
    # The same through the raw C function: nothing written.
    out = np.full((3, 3), 7.0)
    status = np.full(3, -1, dtype=np.int32)
    rc = flatray.lib.flatray_apparent_positions(
        ctypes.byref(lake.to_c()), two.ctypes.data_as(VEC_P), 2,
        np.ascontiguousarray(OBJECTS[GOOD]).ctypes.data_as(VEC_P), 3, 0,
        out.ctypes.data_as(VEC_P), status.ctypes.data_as(INT32_P))
    assert rc == Status.INVALID_ARGUMENT
    assert (out == 7.0).all() and (status == -1).all()


@pytest.mark.parametrize("raise_on_error", [False, True])
def test_other_whole_call_errors_always_raise(lake, raise_on_error):
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.true_positions(lake, EYE, OBJECTS, 7, raise_on_error=raise_on_error)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.apparent_positions(lake, EYE, OBJECTS, -1, raise_on_error=raise_on_error)
    bad = lake.to_c()
    bad.normal = flatray.FlatrayVec3(0, 0, 0)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.apparent_positions(bad, EYE, OBJECTS, raise_on_error=raise_on_error)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.trace_rays(bad, EYE, [[0, 0, -1]], raise_on_error=raise_on_error)


def test_empty_batches(lake):
    pts, st = flatray.apparent_positions(lake, EYE, np.empty((0, 3)))
    assert pts.shape == (0, 3) and st.shape == (0,)
    pts, st = flatray.true_positions(lake, EYE, np.empty((0, 3)), raise_on_error=True)
    assert pts.shape == (0, 3)
    o, d, t, st = flatray.trace_rays(lake, EYE, np.empty((0, 3)))
    assert o.shape == d.shape == (0, 3) and t.shape == st.shape == (0,)


def test_wrong_shapes_are_value_errors(lake):
    for points in ([1.0, 2.0, 3.0], np.zeros((4, 2)), np.zeros((2, 3, 1)), [[1, 2, "x"]]):
        with pytest.raises(ValueError, match="objects"):
            flatray.apparent_positions(lake, EYE, points)
    for observers in (np.zeros(4), np.zeros((2, 4)), np.zeros((1, 1, 3)), 5.0):
        with pytest.raises(ValueError, match="observers"):
            flatray.true_positions(lake, observers, OBJECTS)
    with pytest.raises(ValueError, match="directions"):
        flatray.trace_rays(lake, EYE, np.zeros((3, 2)))
    with pytest.raises(ValueError, match="origins"):
        flatray.trace_rays(lake, np.zeros((2, 3)), np.zeros((3, 3)))
    with pytest.raises(ValueError, match="image"):
        flatray.true_positions(lake, EYE, OBJECTS, "meridional")


def test_inputs_are_not_copied_needlessly_and_other_layouts_work(lake):
    a = np.ascontiguousarray(OBJECTS[GOOD])
    assert as_points(a, "objects") is a
    obs = np.tile(EYE, (3, 1))
    assert as_observers(obs, 3) is obs
    reference, _ = flatray.apparent_positions(lake, EYE, a)
    fortran = np.asfortranarray(a)
    strided = np.zeros((3, 6))
    strided[:, ::2] = a
    for layout in (fortran, strided[:, ::2], a.tolist()):
        again, status = flatray.apparent_positions(lake, EYE, layout)
        assert np.array_equal(again, reference) and (status == 0).all()
    single = a.astype(np.float32)
    again, status = flatray.apparent_positions(lake, EYE, single)
    assert np.array_equal(again, flatray.apparent_positions(lake, EYE, single.astype(float))[0])
    integers = np.array([[1, 0, -1], [2, 2, -3]])
    pts, status = flatray.apparent_positions(lake, EYE, integers)
    assert (status == 0).all()
    assert np.array_equal(pts[1], flatray.apparent_position(lake, EYE, (2.0, 2.0, -3.0)))


def test_trace_rays_statuses_and_values(lake):
    # Good, pointing away, NaN direction, zero direction, parallel, good.
    directions = np.array([
        [0.3, 0.0, -1.0],
        [0.0, 0.0, 1.0],
        [NAN, 0.0, -1.0],
        [0.0, 0.0, 0.0],
        [1.0, 0.0, 0.0],
        [-0.5, 0.7, -0.2],
    ])
    origins, dirs, trans, status = flatray.trace_rays(lake, EYE, directions)
    assert status.tolist() == [0, 4, 2, 2, 4, 0]
    for i in (0, 5):
        single = flatray.trace(lake, EYE, directions[i])
        assert np.array_equal(origins[i], single.origin)
        assert np.array_equal(dirs[i], single.direction)
        assert trans[i] == single.transmittance
    for i in (1, 2, 3, 4):
        assert np.isnan(origins[i]).all() and np.isnan(dirs[i]).all() and np.isnan(trans[i])
    with pytest.raises(flatray.MissesInterfaceError) as info:
        flatray.trace_rays(lake, EYE, directions, raise_on_error=True)
    assert info.value.index == 1
    # Per-ray origins, one of them on the wrong side of the surface.
    starts = np.array([[0, 0, 1.0], [0, 0, -1.0], [5, 5, 0.0]])
    _, _, _, status = flatray.trace_rays(lake, starts, [[0, 0, -1]] * 3)
    assert status.tolist() == [0, 5, 0]


def test_trace_rays_total_internal_reflection():
    # Observer under water looking up: beyond 48.6 degrees no ray leaves the water.
    from_below = flatray.Stack.single_interface((0, 0, 0), (0, 0, 1), 1.333, 1.0)
    angles = np.radians([10.0, 45.0, 50.0, 80.0])
    directions = np.column_stack([np.sin(angles), np.zeros(4), np.cos(angles)])
    _, _, trans, status = flatray.trace_rays(from_below, (0, 0, -1), directions)
    assert status.tolist() == [0, 0, 3, 3]
    assert np.isnan(trans[2:]).all()
    for i in (0, 1):
        # One interface: the transmittance is Fresnel's unpolarised t.
        assert trans[i] == pytest.approx(flatray.fresnel(np.cos(angles[i]), 1.333, 1.0).t,
                                         abs=1e-15)
    with pytest.raises(flatray.TotalInternalReflectionError) as info:
        flatray.trace_rays(from_below, (0, 0, -1), directions, raise_on_error=True)
    assert info.value.index == 2


# --- lines of sight ------------------------------------------------------------

PATH_P = ctypes.POINTER(flatray.FlatrayPath)


def _path_fields(batch, i):
    return np.concatenate([batch.direction[i], batch.entry[i], batch.exit[i],
                           [batch.geometric_length[i], batch.optical_length[i],
                            batch.transmittance[i]]])


def _single_fields(path):
    return np.concatenate([path.direction, path.entry, path.exit,
                           [path.geometric_length, path.optical_length, path.transmittance]])


def test_lines_of_sight_equal_the_single_calls(lake, port):
    paths = flatray.lines_of_sight(lake, EYE, OBJECTS)
    assert isinstance(paths, flatray.PathBatch)
    assert paths.direction.shape == paths.entry.shape == paths.exit.shape == (5, 3)
    assert paths.geometric_length.shape == paths.transmittance.shape == (5,)
    assert paths.status.dtype == np.int32
    assert paths.status.tolist() == [int(s) for s in EXPECTED_STATUS]
    for i in GOOD:
        single = flatray.line_of_sight(lake, EYE, OBJECTS[i])
        assert np.array_equal(_path_fields(paths, i), _single_fields(single))
    for i in BAD:
        assert np.isnan(_path_fields(paths, i)).all()
    # Per-point observers through a port (one layer: entry and exit differ).
    rng = np.random.default_rng(7)
    objects = np.column_stack([rng.uniform(-1, 1, 50), rng.uniform(-1, 1, 50),
                               rng.uniform(0.1, 3.0, 50)])
    cameras = rng.uniform(-0.01, 0.01, (50, 3))
    paths = flatray.lines_of_sight(port, cameras, objects, raise_on_error=True)
    assert (paths.status == 0).all()
    for i in range(0, 50, 7):
        single = flatray.line_of_sight(port, cameras[i], objects[i])
        assert np.array_equal(_path_fields(paths, i), _single_fields(single))
    # Physics, independent of the library: each traced line of sight reaches its
    # object (to the solver's accuracy, 1e-14 of the geometry's size; 1e-12 m here).
    o, d, _, st = flatray.trace_rays(port, cameras, paths.direction)
    assert (st == 0).all()
    along = np.einsum("ij,ij->i", objects - o, d)
    miss = np.linalg.norm(objects - o - along[:, None] * d, axis=1)
    assert miss.max() < 1e-12


def test_lines_of_sight_large_batch_on_every_core(lake):
    # Above the parallel threshold: the split over threads changes nothing.
    n = 20_000
    rng = np.random.default_rng(11)
    objects = np.column_stack([rng.uniform(-30, 30, n), rng.uniform(-30, 30, n),
                               -rng.uniform(0.0, 6.0, n)])
    objects[::997, 0] = NAN
    paths = flatray.lines_of_sight(lake, (0, 0, 40), objects)
    assert (paths.status[::997] == Status.INVALID_ARGUMENT).all()
    for i in range(1, n, 1013):
        single = flatray.line_of_sight(lake, (0, 0, 40), objects[i])
        assert np.array_equal(_path_fields(paths, i), _single_fields(single))


def test_lines_of_sight_errors(lake):
    with pytest.raises(flatray.InvalidArgumentError) as info:
        flatray.lines_of_sight(lake, EYE, OBJECTS, raise_on_error=True)
    assert info.value.index == 1 and info.value.function == "flatray_lines_of_sight"
    two = np.array([[0, 0, 1.0], [0, 0, 2.0]])
    with pytest.raises(flatray.InvalidArgumentError) as info:
        flatray.lines_of_sight(lake, two, OBJECTS)
    assert info.value.index is None
    bad = lake.to_c()
    bad.n_object = NAN
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.lines_of_sight(bad, EYE, OBJECTS)
    with pytest.raises(ValueError, match="objects"):
        flatray.lines_of_sight(lake, EYE, np.zeros((3, 2)))
    with pytest.raises(ValueError, match="observers"):
        flatray.lines_of_sight(lake, np.zeros(4), OBJECTS)
    empty = flatray.lines_of_sight(lake, EYE, np.empty((0, 3)))
    assert empty.direction.shape == (0, 3) and empty.status.shape == (0,)
    # The raw C function: a whole-call error writes nothing; NULL out_status is fine.
    good = np.ascontiguousarray(OBJECTS[GOOD])
    out = np.full((3, 12), 7.0)
    status = np.full(3, -1, dtype=np.int32)
    rc = flatray.lib.flatray_lines_of_sight(
        ctypes.byref(lake.to_c()), two.ctypes.data_as(VEC_P), 2, good.ctypes.data_as(VEC_P), 3,
        out.ctypes.data_as(PATH_P), status.ctypes.data_as(INT32_P))
    assert rc == Status.INVALID_ARGUMENT
    assert (out == 7.0).all() and (status == -1).all()
    eye = np.ascontiguousarray(EYE.reshape(1, 3))
    rc = flatray.lib.flatray_lines_of_sight(
        ctypes.byref(lake.to_c()), eye.ctypes.data_as(VEC_P), 1, good.ctypes.data_as(VEC_P), 3,
        out.ctypes.data_as(PATH_P), None)
    assert rc == Status.OK and np.isfinite(out).all()
    rc = flatray.lib.flatray_lines_of_sight(
        ctypes.byref(lake.to_c()), eye.ctypes.data_as(VEC_P), 1, None, 3,
        out.ctypes.data_as(PATH_P), None)
    assert rc == Status.NULL_POINTER
