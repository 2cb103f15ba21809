"""Bad input to the camera functions, through the Python API and the raw ctypes
functions (rules: DESIGN.md, "Rules every function follows", and the camera
issue: zero focal length, NaN, a point behind the camera or inside the
housing, buffers too small, a 0 x 0 image)."""

from __future__ import annotations

import ctypes
import math

import numpy as np
import pytest

import flatray
from flatray import FlatrayLens, Lens, Status

LIB = flatray.lib
NAN, INF = float("nan"), float("inf")
P = ctypes.POINTER
FIELDS = [f for f, _ in FlatrayLens._fields_]


def port():
    """An 8 mm glass port 30 mm in front of the lens (invented)."""
    return flatray.Stack((0.0, 0.0, 0.03), (0.0, 0.0, 1.0), 1.00028, [(0.008, 1.52)], 1.339)


LENS = Lens(800.0, 800.0, 320.0, 240.0, k1=-0.1, k2=0.02)


@pytest.mark.parametrize("focal", [(0.0, 800.0), (800.0, 0.0), (-800.0, 800.0)])
def test_zero_or_negative_focal_length(focal):
    lens = Lens(*focal, 320.0, 240.0)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.pixel_to_ray(lens, port(), 1.0, 2.0)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.point_to_pixel(lens, port(), (0, 0, 1))
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.field_of_view(lens, port(), 640, 480)


@pytest.mark.parametrize("field", FIELDS)
@pytest.mark.parametrize("bad", [NAN, INF, -INF])
def test_non_finite_lens_fields(field, bad):
    values = {f: getattr(LENS, f) for f in FIELDS}
    values[field] = bad
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.point_to_pixel(Lens(**values), port(), (0, 0, 1))


@pytest.mark.parametrize("bad", [NAN, INF, -INF])
def test_non_finite_pixels_and_points(bad):
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.pixel_to_ray(LENS, port(), bad, 2.0)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.pixel_to_ray(LENS, port(), 2.0, bad)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.point_to_pixel(LENS, port(), (0.0, bad, 1.0))


@pytest.mark.parametrize("point", [(0, 0, -1.0),    # behind the camera
                                   (0, 0.01, 0.02),  # inside the housing
                                   (0, 0, 0.034)])   # inside the window
def test_points_not_in_the_water(point):
    with pytest.raises(flatray.WrongSideError):
        flatray.point_to_pixel(LENS, port(), point)


def test_pixels_outside_the_lens_model():
    # k1 = -0.1, k2 = 0: the radial map r (1 + k1 r^2) turns round at
    # r^2 = -1/(3 k1); no direction maps 30 focal lengths out.
    lens = Lens(800.0, 800.0, 320.0, 240.0, k1=-0.1)
    with pytest.raises(flatray.NotConvergedError):
        flatray.pixel_to_ray(lens, port(), 320.0 + 30 * 800.0, 240.0)
    with pytest.raises(flatray.OutOfRangeError):
        flatray.point_to_pixel(lens, port(), (3.0, 0.0, 1.0))


def test_centre_outside_the_housing():
    outside = flatray.Stack((0, 0, -0.01), (0, 0, 1), 1.00028, [(0.008, 1.52)], 1.339)
    with pytest.raises(flatray.WrongSideError):
        flatray.pixel_to_ray(LENS, outside, 1.0, 2.0)


@pytest.mark.parametrize("size", [(0, 0), (0, 10), (10, 0)])
def test_empty_images(size):
    target = Lens(100.0, 100.0, 50.0, 50.0)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.remap_table(LENS, port(), target, 1.0, *size)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.remap_error(LENS, port(), target, 1.0, 2.0, *size)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.field_of_view(LENS, port(), *size)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.camera_view(LENS, port(), *size)


@pytest.mark.parametrize("distance", [0.0, -1.0, NAN, INF])
def test_bad_distances(distance):
    target = Lens(100.0, 100.0, 50.0, 50.0)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.remap_table(LENS, port(), target, distance, 10, 10)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.remap_error(LENS, port(), target, 1.0, distance, 10, 10)


def test_python_side_argument_checks():
    with pytest.raises(ValueError, match="width"):
        flatray.remap_table(LENS, port(), LENS, 1.0, -1, 10)
    with pytest.raises(ValueError, match="height"):
        flatray.remap_table(LENS, port(), LENS, 1.0, 10, 2.5)
    with pytest.raises(ValueError, match="float32"):
        flatray.remap_table(LENS, port(), LENS, 1.0, 4, 4,
                            out=(np.zeros((4, 4)), np.zeros((4, 4), np.float32)))
    with pytest.raises(ValueError, match=r"\(N, 2\)"):
        flatray.pixels_to_rays(LENS, port(), np.zeros((3, 3)))
    with pytest.raises(TypeError, match="Lens"):
        flatray.pixel_to_ray((800, 800, 320, 240), port(), 1.0, 2.0)


def test_buffers_too_small():
    # Through the Python API: caller buffers smaller than the image.
    small = (np.zeros((4, 4), np.float32), np.zeros((4, 3), np.float32))
    with pytest.raises(flatray.BufferTooSmallError):
        flatray.remap_table(LENS, port(), LENS, 1.0, 4, 4, out=small)
    # Through ctypes: map_len one short, and NULL maps with map_len 0.
    lens = LENS.to_c()
    stack = port().to_c()
    mu = (ctypes.c_float * 16)()
    mv = (ctypes.c_float * 16)()
    rc = LIB.flatray_remap_table(ctypes.byref(lens), ctypes.byref(stack), ctypes.byref(lens),
                                 1.0, 4, 4, mu, mv, 15)
    assert rc == Status.BUFFER_TOO_SMALL
    rc = LIB.flatray_remap_table(ctypes.byref(lens), ctypes.byref(stack), ctypes.byref(lens),
                                 1.0, 4, 4, None, None, 0)
    assert rc == Status.BUFFER_TOO_SMALL
    rc = LIB.flatray_remap_table(ctypes.byref(lens), ctypes.byref(stack), ctypes.byref(lens),
                                 1.0, 4, 4, None, mv, 16)
    assert rc == Status.NULL_POINTER


def test_raw_null_pointers_and_nan_outputs():
    lens = LENS.to_c()
    stack = port().to_c()
    u, v = ctypes.c_double(1.0), ctypes.c_double(2.0)
    rc = LIB.flatray_point_to_pixel(None, ctypes.byref(stack), flatray.FlatrayVec3(0, 0, 1),
                                    ctypes.byref(u), ctypes.byref(v))
    assert rc == Status.NULL_POINTER
    assert math.isnan(u.value) and math.isnan(v.value)
    v.value = 2.0
    rc = LIB.flatray_point_to_pixel(ctypes.byref(lens), ctypes.byref(stack),
                                    flatray.FlatrayVec3(0, 0, 1), None, ctypes.byref(v))
    assert rc == Status.NULL_POINTER
    assert math.isnan(v.value)
    ray = flatray.FlatrayRay()
    rc = LIB.flatray_pixel_to_ray(ctypes.byref(lens), None, 1.0, 2.0, ctypes.byref(ray))
    assert rc == Status.NULL_POINTER
    assert math.isnan(ray.origin.x) and math.isnan(ray.direction.z)
    out = flatray.FlatrayVec3()
    rms = ctypes.c_double(5.0)
    rc = LIB.flatray_stereo_triangulate(ctypes.byref(lens), ctypes.byref(stack),
                                        ctypes.byref(lens), ctypes.byref(stack), None,
                                        1.0, 2.0, 3.0, 4.0, ctypes.byref(out), ctypes.byref(rms))
    assert rc == Status.NULL_POINTER
    assert math.isnan(out.x) and math.isnan(rms.value)
    view = flatray.FlatrayCameraView()
    rc = LIB.flatray_camera_view(ctypes.byref(lens), ctypes.byref(stack), 0, 0,
                                 ctypes.byref(view))
    assert rc == Status.INVALID_ARGUMENT
    assert math.isnan(view.horizontal) and math.isnan(view.tir_radius_px)


def test_batches_report_each_failure():
    uv = np.array([[10.0, 20.0], [NAN, 1.0], [600.0, 400.0]])
    origins, directions, status = flatray.pixels_to_rays(LENS, port(), uv)
    assert status.tolist() == [Status.OK, Status.INVALID_ARGUMENT, Status.OK]
    assert np.isnan(origins[1]).all() and np.isnan(directions[1]).all()
    with pytest.raises(flatray.InvalidArgumentError) as info:
        flatray.pixels_to_rays(LENS, port(), uv, raise_on_error=True)
    assert info.value.index == 1
    pts = np.array([[0.0, 0.0, 1.0], [0.0, 0.0, -1.0]])
    out, status = flatray.points_to_pixels(LENS, port(), pts)
    assert status.tolist() == [Status.OK, Status.WRONG_SIDE]
    assert np.isnan(out[1]).all()
    # A whole-call error (bad lens) is raised: nothing was computed.
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.points_to_pixels(Lens(0.0, 1.0, 0.0, 0.0), port(), pts)
    # Empty batches.
    o, d, st = flatray.pixels_to_rays(LENS, port(), np.zeros((0, 2)))
    assert o.shape == (0, 3) and st.shape == (0,)
