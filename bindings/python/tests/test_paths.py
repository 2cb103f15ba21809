"""Line of sight, trace and the apparent/true round trip on random stacks
(invented geometry from a seeded numpy RNG; the checks are self-consistency:
Fermat path then Snell trace, image then inverse)."""

from __future__ import annotations

import numpy as np
import pytest

import flatray
from flatray import Image
from conftest import random_scene, unit

SCENES = [(seed, count) for seed, count in enumerate([1, 2, 3, 5, 8, 8, 4, 1, 6, 7])]


@pytest.mark.parametrize("seed, count", SCENES)
def test_line_of_sight_then_trace_reaches_the_object(seed, count):
    rng = np.random.default_rng(seed)
    stack, observer, obj = random_scene(rng, count)
    path = flatray.line_of_sight(stack, observer, obj)
    assert np.linalg.norm(path.direction) == pytest.approx(1.0, abs=1e-15)
    assert abs(stack.height(path.entry)) < 1e-9
    assert stack.height(path.exit) == pytest.approx(stack.total_thickness, abs=1e-9)
    # The entry point is on the observer's straight line of sight.
    to_entry = path.entry - observer
    assert np.linalg.norm(np.cross(to_entry, path.direction)) < 1e-9

    origin, direction, transmittance = flatray.trace(stack, observer, path.direction)
    miss = np.linalg.norm(np.cross(obj - origin, direction))
    assert miss < 1e-9
    assert np.dot(obj - origin, direction) > 0
    assert np.linalg.norm(origin - path.exit) < 1e-9
    assert transmittance == pytest.approx(path.transmittance, abs=1e-12)
    assert 0.0 < transmittance <= 1.0
    # Lengths: at least the straight distance; optical length between the bounds
    # set by the smallest and largest index.
    indices = [stack.n_observer, stack.n_object] + [n for _, n in stack.layers]
    straight = np.linalg.norm(obj - observer)
    assert path.geometric_length >= straight * (1 - 1e-12)
    assert min(indices) * path.geometric_length * (1 - 1e-12) <= path.optical_length
    assert path.optical_length <= max(indices) * path.geometric_length * (1 + 1e-12)


def test_single_interface_path_lengths(lake):
    observer, obj = np.array([0.0, 0.0, 10.0]), np.array([3.0, 0.0, -2.0])
    path = flatray.line_of_sight(lake, observer, obj)
    assert np.array_equal(path.entry, path.exit)
    above = np.linalg.norm(path.entry - observer)
    below = np.linalg.norm(obj - path.entry)
    assert path.geometric_length == pytest.approx(above + below, rel=1e-14)
    assert path.optical_length == pytest.approx(1.0 * above + 1.333 * below, rel=1e-14)


@pytest.mark.parametrize("image", list(Image))
@pytest.mark.parametrize("seed, count", SCENES)
def test_apparent_then_true_returns_the_object(seed, count, image):
    rng = np.random.default_rng(100 + seed)
    stack, observer, obj = random_scene(rng, count)
    seen = flatray.apparent_position(stack, observer, obj, image)
    assert stack.height(seen) >= 0
    back = flatray.true_position(stack, observer, seen, image)
    scale = np.linalg.norm(obj - observer)
    assert np.linalg.norm(back - obj) < 1e-9 * scale
    # The apparent point lies on the observer's line of sight.
    direction = flatray.line_of_sight(stack, observer, obj).direction
    assert np.linalg.norm(np.cross(seen - observer, direction)) < 1e-9 * scale


def test_true_then_apparent_returns_the_apparent_point(port):
    observer = np.array([0.01, -0.02, 0.0])
    for apparent in ([0.3, 0.1, 1.5], [-0.8, 0.4, 0.9], [0.0, 0.0, 2.0]):
        for image in Image:
            truth = flatray.true_position(port, observer, apparent, image)
            again = flatray.apparent_position(port, observer, truth, image)
            assert np.linalg.norm(again - apparent) < 1e-12 * 10


def test_trace_of_an_unnormalised_direction(port):
    a = flatray.trace(port, (0, 0, 0), (0.2, 0.1, 1.0))
    b = flatray.trace(port, (0, 0, 0), (2.0, 1.0, 10.0))
    assert np.allclose(a.origin, b.origin, rtol=0, atol=1e-15)
    assert np.allclose(a.direction, b.direction, rtol=0, atol=1e-15)
    assert np.linalg.norm(a.direction) == pytest.approx(1.0, abs=1e-15)
    # Snell through the port: n sin t is the same in air and water.
    sin_air = np.linalg.norm(unit((0.2, 0.1, 1.0))[:2])
    sin_water = np.linalg.norm(a.direction[:2])
    assert 1.00029 * sin_air == pytest.approx(1.34 * sin_water, rel=1e-14)


def test_stack_accessors_and_to_c(port):
    c = port.to_c()
    assert isinstance(c, flatray.FlatrayStack)
    assert (c.origin.x, c.origin.y, c.origin.z) == (0.0, 0.0, 0.05)
    assert (c.normal.x, c.normal.y, c.normal.z) == (0.0, 0.0, 1.0)
    assert c.n_observer == 1.00029 and c.n_object == 1.34 and c.layer_count == 1
    assert c.thickness[0] == 0.010 and c.n_layer[0] == 1.52
    c.n_object = 9.0  # a copy: the stack is unchanged
    assert port.n_object == 1.34 and port.to_c().n_object == 1.34
    assert port.layers == ((0.010, 1.52),)
    assert port.total_thickness == 0.010
    assert port == flatray.Stack([0, 0, 0.05], np.array([0, 0, 1.0]), 1.00029,
                                 np.array([[0.010, 1.52]]), 1.34)
    lake = flatray.Stack.single_interface((0, 0, 0), (0, 0, -4), 1.0, 1.333)
    assert lake.layer_count == 0 and lake.layers == ()
    assert list(lake.unit_normal) == [0.0, 0.0, -1.0]
    assert "Stack(" in repr(lake)


def test_raw_struct_is_accepted_and_checked_by_the_library(port):
    # A FlatrayStack passed directly goes to the library unvalidated; the
    # library checks it on every call.
    raw = port.to_c()
    assert np.array_equal(flatray.trace(raw, (0, 0, 0), (0, 0, 1)).origin,
                          flatray.trace(port, (0, 0, 0), (0, 0, 1)).origin)
    raw.layer_count = 9
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.trace(raw, (0, 0, 0), (0, 0, 1))
    with pytest.raises(TypeError):
        flatray.trace("a stack", (0, 0, 0), (0, 0, 1))
