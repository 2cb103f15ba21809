"""Bad input through the Python API and through the raw ctypes functions
(rules: DESIGN.md, "C ABI contract" and "Rules every function follows")."""

from __future__ import annotations

import ctypes
import math

import numpy as np
import pytest

import flatray
from flatray import Image, Status

NAN, INF = float("nan"), float("inf")
BAD_FLOATS = [NAN, INF, -INF]
LIB = flatray.lib

P = ctypes.POINTER
VEC = flatray.FlatrayVec3


def _stack(**changes):
    """A valid camera-port stack (invented) with some arguments replaced."""
    args = dict(origin=(0.0, 0.0, 0.05), normal=(0.0, 0.0, 1.0), n_observer=1.00029,
                layers=[(0.010, 1.52), (0.002, 1.45)], n_object=1.34)
    args.update(changes)
    return flatray.Stack(**args)


def _with(vector, i, value):
    v = list(vector)
    v[i] = value
    return v


# --- the stack ------------------------------------------------------------------

@pytest.mark.parametrize("bad", BAD_FLOATS)
@pytest.mark.parametrize("i", range(3))
def test_non_finite_origin_or_normal(bad, i):
    with pytest.raises(flatray.InvalidArgumentError):
        _stack(origin=_with((0.0, 0.0, 0.05), i, bad))
    with pytest.raises(flatray.InvalidArgumentError):
        _stack(normal=_with((0.0, 0.0, 1.0), i, bad))


@pytest.mark.parametrize("normal", [(0, 0, 0), (0.0, -0.0, 0.0), (1e-320, 0, 0)])
def test_zero_or_subnormal_normal(normal):
    with pytest.raises(flatray.InvalidArgumentError, match="INVALID_ARGUMENT") as info:
        _stack(normal=normal)
    # The stack is validated by the library: its own message and status.
    assert info.value.status is Status.INVALID_ARGUMENT
    assert info.value.message == flatray.status_message(Status.INVALID_ARGUMENT)


@pytest.mark.parametrize("bad", BAD_FLOATS + [0.0, -1.0])
def test_bad_indices(bad):
    for key in ("n_observer", "n_object"):
        with pytest.raises(flatray.InvalidArgumentError):
            _stack(**{key: bad})
    with pytest.raises(flatray.InvalidArgumentError):
        _stack(layers=[(0.010, 1.52), (0.002, bad)])


@pytest.mark.parametrize("bad", BAD_FLOATS + [0.0, -0.01])
def test_bad_thickness(bad):
    with pytest.raises(flatray.InvalidArgumentError):
        _stack(layers=[(0.010, 1.52), (bad, 1.45)])


def test_layer_counts():
    assert _stack(layers=[(0.01, 1.5)] * 8).layer_count == 8
    with pytest.raises(flatray.InvalidArgumentError):
        _stack(layers=[(0.01, 1.5)] * 9)
    raw = _stack().to_c()
    raw.layer_count = 9
    assert LIB.flatray_trace(ctypes.byref(raw), flatray.FlatrayRay(VEC(0, 0, 0), VEC(0, 0, 1)),
                             ctypes.byref(flatray.FlatrayRay()), None) == Status.INVALID_ARGUMENT


@pytest.mark.parametrize("changes", [
    dict(origin=(0.0, 0.0)), dict(normal=[[0, 0, 1]]), dict(origin="abc"),
    dict(layers=[(0.01,)]), dict(layers=[(0.01, 1.5, 3)]), dict(layers=5),
    dict(layers=[(0.01, "glass")]), dict(n_object="water"), dict(n_observer=None),
])
def test_malformed_stack_arguments_are_value_errors(changes):
    with pytest.raises(ValueError):
        _stack(**changes)


# --- one interface --------------------------------------------------------------

@pytest.mark.parametrize("bad", BAD_FLOATS)
def test_refract_non_finite(bad):
    for i in range(3):
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.refract(_with((0.3, 0, 1), i, bad), (0, 0, 1), 1.0, 1.5)
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.refract((0.3, 0, 1), _with((0, 0, 1), i, bad), 1.0, 1.5)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.refract((0.3, 0, 1), (0, 0, 1), bad, 1.5)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.refract((0.3, 0, 1), (0, 0, 1), 1.0, bad)


def test_refract_errors():
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.refract((0, 0, 0), (0, 0, 1), 1.0, 1.5)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.refract((0, 0, 1), (0, 0, 0), 1.0, 1.5)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.refract((0, 0, 1), (0, 0, 1), 0.0, 1.5)
    with pytest.raises(flatray.MissesInterfaceError):
        flatray.refract((1, 0, 0), (0, 0, 1), 1.0, 1.5)
    sixty = (math.sin(math.radians(60)), 0, math.cos(math.radians(60)))
    with pytest.raises(flatray.TotalInternalReflectionError):
        flatray.refract(sixty, (0, 0, 1), 1.333, 1.0)
    with pytest.raises(ValueError):
        flatray.refract((1, 0), (0, 0, 1), 1.0, 1.5)


@pytest.mark.parametrize("bad", BAD_FLOATS)
def test_fresnel_and_critical_angle_non_finite(bad):
    for args in ((bad, 1.0, 1.5), (0.5, bad, 1.5), (0.5, 1.0, bad)):
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.fresnel(*args)
    for args in ((bad, 1.0), (1.5, bad)):
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.critical_angle(*args)


def test_fresnel_and_critical_angle_domains():
    for cos in (-0.1, 1.0 + 1e-12, 2.0):
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.fresnel(cos, 1.0, 1.5)
    for n in (0.0, -1.5):
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.fresnel(0.5, n, 1.5)
    for n_from, n_to in ((1.0, 1.333), (1.2, 1.2), (-1.5, 1.0), (1.5, 0.0)):
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.critical_angle(n_from, n_to)
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.critical_angle_deg(n_from, n_to)


# --- trace and line of sight ----------------------------------------------------

@pytest.mark.parametrize("bad", BAD_FLOATS)
@pytest.mark.parametrize("i", range(3))
def test_trace_non_finite(bad, i):
    stack = _stack()
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.trace(stack, _with((0, 0, 0), i, bad), (0.1, 0, 1))
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.trace(stack, (0, 0, 0), _with((0.1, 0, 1), i, bad))


def test_trace_errors():
    stack = _stack()
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.trace(stack, (0, 0, 0), (0, 0, 0))
    with pytest.raises(flatray.MissesInterfaceError):  # pointing away
        flatray.trace(stack, (0, 0, 0), (0.2, 0, -1))
    with pytest.raises(flatray.MissesInterfaceError):  # parallel
        flatray.trace(stack, (0, 0, 0), (1, 1, 0))
    with pytest.raises(flatray.WrongSideError):  # starts inside the port glass
        flatray.trace(stack, (0, 0, 0.055), (0, 0, 1))
    with pytest.raises(flatray.WrongSideError):  # starts in the water
        flatray.trace(stack, (0, 0, 1.0), (0, 0, 1))
    # Glass observer, air gap, water: steep rays cannot enter the air.
    glass = flatray.Stack((0, 0, 0), (0, 0, 1), 1.5, [(0.001, 1.0)], 1.333)
    with pytest.raises(flatray.TotalInternalReflectionError):
        flatray.trace(glass, (0, 0, -0.1), (1, 0, 1))
    flatray.trace(glass, (0, 0, -0.1), (0.1, 0, 1))  # a shallow one can


@pytest.mark.parametrize("bad", BAD_FLOATS)
@pytest.mark.parametrize("i", range(3))
def test_point_functions_non_finite(bad, i):
    stack = _stack()
    observer, obj, apparent = (0.01, 0.0, 0.0), (0.2, 0.1, 1.5), (0.2, 0.1, 1.2)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.line_of_sight(stack, _with(observer, i, bad), obj)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.line_of_sight(stack, observer, _with(obj, i, bad))
    for image in Image:
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.apparent_position(stack, _with(observer, i, bad), obj, image)
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.apparent_position(stack, observer, _with(obj, i, bad), image)
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.true_position(stack, _with(observer, i, bad), apparent, image)
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.true_position(stack, observer, _with(apparent, i, bad), image)


def test_points_on_the_wrong_side():
    stack = _stack()  # interfaces at z = 0.05, 0.06, 0.062
    obj = (0.2, 0.1, 1.5)
    inside_layer = (0.0, 0.0, 0.055)
    with pytest.raises(flatray.WrongSideError):  # observer inside a layer
        flatray.line_of_sight(stack, inside_layer, obj)
    with pytest.raises(flatray.WrongSideError):  # observer in the object medium
        flatray.line_of_sight(stack, (0, 0, 0.5), obj)
    with pytest.raises(flatray.WrongSideError):  # object on the observer's side
        flatray.line_of_sight(stack, (0, 0, 0), (0.2, 0.1, -1.0))
    with pytest.raises(flatray.WrongSideError):  # object inside a layer
        flatray.line_of_sight(stack, (0, 0, 0), (0.2, 0.1, 0.061))
    for image in Image:
        with pytest.raises(flatray.WrongSideError):
            flatray.apparent_position(stack, inside_layer, obj, image)
        with pytest.raises(flatray.WrongSideError):
            flatray.apparent_position(stack, (0, 0, 0), (0.2, 0.1, -1.0), image)
        with pytest.raises(flatray.WrongSideError):
            flatray.true_position(stack, inside_layer, (0.1, 0.0, 1.0), image)
        with pytest.raises(flatray.WrongSideError):  # apparent point before the stack
            flatray.true_position(stack, (0, 0, 0), (0.1, 0.0, 0.01), image)
        with pytest.raises(flatray.WrongSideError):  # too shallow to image the water
            flatray.true_position(stack, (0, 0, 0), (0.0, 0.0, 0.0501), image)


def test_true_position_total_internal_reflection():
    # Observer in water looking up into air: apparent points beyond the critical
    # angle cannot be seen through the surface.
    from_below = flatray.Stack.single_interface((0, 0, 0), (0, 0, 1), 1.333, 1.0)
    with pytest.raises(flatray.TotalInternalReflectionError):
        flatray.true_position(from_below, (0, 0, -1), (5.0, 0, 1.0))
    flatray.true_position(from_below, (0, 0, -1), (0.5, 0, 1.0))


# --- the scalar depth helpers ---------------------------------------------------

@pytest.mark.parametrize("bad", BAD_FLOATS)
@pytest.mark.parametrize("function", [flatray.apparent_depth, flatray.true_depth])
def test_depth_helpers_non_finite(function, bad):
    good = [2.0, 0.3, 1.0, 1.333]
    for i in range(4):
        with pytest.raises(flatray.InvalidArgumentError):
            function(*_with(good, i, bad))


@pytest.mark.parametrize("function", [flatray.apparent_depth, flatray.true_depth])
def test_depth_helpers_domains(function):
    for args in ((-1.0, 0.3, 1.0, 1.333), (2.0, -0.1, 1.0, 1.333),
                 (2.0, math.pi / 2, 1.0, 1.333), (2.0, 2.0, 1.0, 1.333),
                 (2.0, 0.3, 0.0, 1.333), (2.0, 0.3, 1.0, -1.333)):
        with pytest.raises(flatray.InvalidArgumentError):
            function(*args)
    assert function(0.0, 0.3, 1.0, 1.333) == 0.0
    with pytest.raises(flatray.TotalInternalReflectionError):  # water to air at 60 deg
        function(2.0, math.radians(60), 1.333, 1.0)
    with pytest.raises(flatray.InvalidArgumentError):
        function(2.0, 0.3, 1.0, 1.333, 7)


def test_degree_helpers_reject_ninety_degrees():
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.apparent_depth_deg(1.0, 90.0, 1.0, 1.333)
    with pytest.raises(flatray.TotalInternalReflectionError):
        flatray.true_depth_deg(1.0, 50.0, 1.333, 1.0)


def test_image_arguments():
    stack = _stack()
    a = flatray.apparent_position(stack, (0, 0, 0), (0.2, 0.1, 1.5), "tangential")
    b = flatray.apparent_position(stack, (0, 0, 0), (0.2, 0.1, 1.5), Image.TANGENTIAL)
    c = flatray.apparent_position(stack, (0, 0, 0), (0.2, 0.1, 1.5), np.int64(1))
    assert np.array_equal(a, b) and np.array_equal(a, c)
    for code in (2, 7, -1):  # passed on; the library rejects them
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.apparent_position(stack, (0, 0, 0), (0.2, 0.1, 1.5), code)
    for bad in ("meridional", 2**40, None, 1.5j, 1.0):
        with pytest.raises(ValueError):
            flatray.apparent_position(stack, (0, 0, 0), (0.2, 0.1, 1.5), bad)


# --- the raw C functions --------------------------------------------------------

def test_unknown_image_code_at_the_c_level():
    stack = _stack().to_c()
    out = VEC(1.0, 2.0, 3.0)
    for fn in (LIB.flatray_apparent_position, LIB.flatray_true_position):
        out = VEC(1.0, 2.0, 3.0)
        assert fn(ctypes.byref(stack), VEC(0, 0, 0), VEC(0.2, 0.1, 1.5), 7,
                  ctypes.byref(out)) == Status.INVALID_ARGUMENT
        assert all(math.isnan(v) for v in out)  # out-values NaN on error
    for fn in (LIB.flatray_apparent_depth, LIB.flatray_true_depth):
        depth = ctypes.c_double(5.0)
        assert fn(2.0, 0.3, 1.0, 1.333, 7, ctypes.byref(depth)) == Status.INVALID_ARGUMENT
        assert math.isnan(depth.value)
    points = np.array([[0.2, 0.1, 1.5]])
    for fn in (LIB.flatray_apparent_positions, LIB.flatray_true_positions):
        result = np.full((1, 3), 9.0)
        status = np.full(1, -1, dtype=np.int32)
        rc = fn(ctypes.byref(stack), points.ctypes.data_as(P(VEC)), 1,
                points.ctypes.data_as(P(VEC)), 1, 7, result.ctypes.data_as(P(VEC)),
                status.ctypes.data_as(P(ctypes.c_int32)))
        assert rc == Status.INVALID_ARGUMENT
        assert (result == 9.0).all() and status[0] == -1  # whole-call: nothing written


def _raise(status):
    flatray.check(status, "raw call")


def test_null_pointers_raise_null_pointer_error():
    stack = ctypes.byref(_stack().to_c())
    ray = flatray.FlatrayRay(VEC(0, 0, 0), VEC(0.1, 0, 1))
    a, b = VEC(0, 0, 0), VEC(0.2, 0.1, 1.5)
    ray_out, d, vec_out = flatray.FlatrayRay(), ctypes.c_double(), VEC()
    one = np.array([[0.2, 0.1, 1.5]])
    one_p = one.ctypes.data_as(P(VEC))
    res = np.empty((1, 3))
    res_p = res.ctypes.data_as(P(VEC))
    rays = np.array([[[0, 0, 0], [0.1, 0, 1]]], dtype=float)
    rays_p = rays.ctypes.data_as(P(flatray.FlatrayRay))
    rays_out = np.empty((1, 2, 3))
    rays_out_p = rays_out.ctypes.data_as(P(flatray.FlatrayRay))
    calls = {
        "refract out": lambda: LIB.flatray_refract(a, b, 1.0, 1.5, None),
        "fresnel out": lambda: LIB.flatray_fresnel(0.5, 1.0, 1.5, None),
        "critical angle out": lambda: LIB.flatray_critical_angle(1.5, 1.0, None),
        "trace stack": lambda: LIB.flatray_trace(None, ray, ctypes.byref(ray_out), None),
        "trace out": lambda: LIB.flatray_trace(stack, ray, None, ctypes.byref(d)),
        "line of sight stack": lambda: LIB.flatray_line_of_sight(
            None, a, b, ctypes.byref(flatray.FlatrayPath())),
        "line of sight out": lambda: LIB.flatray_line_of_sight(stack, a, b, None),
        "apparent stack": lambda: LIB.flatray_apparent_position(
            None, a, b, 0, ctypes.byref(vec_out)),
        "apparent out": lambda: LIB.flatray_apparent_position(stack, a, b, 0, None),
        "true stack": lambda: LIB.flatray_true_position(None, a, b, 0, ctypes.byref(vec_out)),
        "true out": lambda: LIB.flatray_true_position(stack, a, b, 0, None),
        "apparent depth out": lambda: LIB.flatray_apparent_depth(2.0, 0.3, 1.0, 1.333, 0, None),
        "true depth out": lambda: LIB.flatray_true_depth(2.0, 0.3, 1.0, 1.333, 0, None),
        "true positions stack": lambda: LIB.flatray_true_positions(
            None, one_p, 1, one_p, 1, 0, res_p, None),
        "true positions observers": lambda: LIB.flatray_true_positions(
            stack, None, 1, one_p, 1, 0, res_p, None),
        "true positions points": lambda: LIB.flatray_true_positions(
            stack, one_p, 1, None, 1, 0, res_p, None),
        "true positions out": lambda: LIB.flatray_true_positions(
            stack, one_p, 1, one_p, 1, 0, None, None),
        "apparent positions stack": lambda: LIB.flatray_apparent_positions(
            None, one_p, 1, one_p, 1, 0, res_p, None),
        "apparent positions points": lambda: LIB.flatray_apparent_positions(
            stack, one_p, 1, None, 1, 0, res_p, None),
        "apparent positions out": lambda: LIB.flatray_apparent_positions(
            stack, one_p, 1, one_p, 1, 0, None, None),
        "trace rays stack": lambda: LIB.flatray_trace_rays(None, rays_p, 1, rays_out_p, None, None),
        "trace rays input": lambda: LIB.flatray_trace_rays(stack, None, 1, rays_out_p, None, None),
        "trace rays out": lambda: LIB.flatray_trace_rays(stack, rays_p, 1, None, None, None),
    }
    for what, call in calls.items():
        status = call()
        assert status == Status.NULL_POINTER, what
        with pytest.raises(flatray.NullPointerError):
            _raise(status)


def test_optional_outputs_and_empty_arrays_may_be_null():
    stack = ctypes.byref(_stack().to_c())
    ray = flatray.FlatrayRay(VEC(0, 0, 0), VEC(0.1, 0, 1))
    assert LIB.flatray_trace(stack, ray, ctypes.byref(flatray.FlatrayRay()), None) == Status.OK
    one = np.array([[0.2, 0.1, 1.5]])
    origin = np.zeros((1, 3))
    res = np.empty((1, 3))
    assert LIB.flatray_apparent_positions(
        stack, origin.ctypes.data_as(P(VEC)), 1, one.ctypes.data_as(P(VEC)), 1, 0,
        res.ctypes.data_as(P(VEC)), None) == Status.OK
    assert np.isfinite(res).all()
    rays = np.array([[[0, 0, 0], [0.1, 0, 1]]], dtype=float)
    out = np.empty((1, 2, 3))
    assert LIB.flatray_trace_rays(stack, rays.ctypes.data_as(P(flatray.FlatrayRay)), 1,
                                  out.ctypes.data_as(P(flatray.FlatrayRay)), None,
                                  None) == Status.OK
    for fn in (LIB.flatray_true_positions, LIB.flatray_apparent_positions):
        assert fn(stack, None, 0, None, 0, 0, None, None) == Status.OK
        # One shared observer and no points is fine too.
        assert fn(stack, origin.ctypes.data_as(P(VEC)), 1, None, 0, 0, None, None) == Status.OK
    assert LIB.flatray_trace_rays(stack, None, 0, None, None, None) == Status.OK


def test_errors_write_nan_not_garbage():
    out = VEC(1.0, 2.0, 3.0)
    sixty = VEC(math.sin(math.radians(60)), 0, math.cos(math.radians(60)))
    status = LIB.flatray_refract(sixty, VEC(0, 0, 1), 1.333, 1.0, ctypes.byref(out))
    assert status == Status.TOTAL_INTERNAL_REFLECTION
    assert all(math.isnan(v) for v in out)
    f = flatray.FlatrayFresnel(0, 0, 0, 0, 0, 0)
    assert LIB.flatray_fresnel(2.0, 1.0, 1.5, ctypes.byref(f)) == Status.INVALID_ARGUMENT
    assert all(math.isnan(getattr(f, name)) for name, _ in f._fields_)
    angle = ctypes.c_double(1.0)
    assert LIB.flatray_critical_angle(1.0, 1.5, ctypes.byref(angle)) == Status.INVALID_ARGUMENT
    assert math.isnan(angle.value)
    path = flatray.FlatrayPath()
    stack = ctypes.byref(_stack().to_c())
    assert LIB.flatray_line_of_sight(stack, VEC(0, 0, 1), VEC(0, 0, 2),
                                     ctypes.byref(path)) == Status.WRONG_SIDE
    assert math.isnan(path.geometric_length) and math.isnan(path.direction.x)
    ray_out, t = flatray.FlatrayRay(), ctypes.c_double(0.5)
    assert LIB.flatray_trace(stack, flatray.FlatrayRay(VEC(0, 0, 0), VEC(0, 0, -1)),
                             ctypes.byref(ray_out), ctypes.byref(t)) == Status.MISSES_INTERFACE
    assert math.isnan(ray_out.origin.x) and math.isnan(t.value)
