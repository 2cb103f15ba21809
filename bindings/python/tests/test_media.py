"""flatray.media: values, group indices, scalars and arrays, bad input, the raw C
functions and the stack builder.

Reference values name their source beside them; the pure-water comparison with
the iapws package is in test_media_iapws.py.
"""

from __future__ import annotations

import ctypes
import math

import numpy as np
import pytest

import flatray
from flatray import Footing, Material, Status

NAN, INF = float("nan"), float("inf")
BAD_FLOATS = [NAN, INF, -INF]
P0 = flatray.STANDARD_PRESSURE_PA
LIB = flatray.lib

SILICA_B = (0.6961663, 0.4079426, 0.8974794)           # Malitson (1965)
SILICA_C = (0.0684043**2, 0.1162414**2, 9.896161**2)   # um^2

# (function, valid arguments, index of the wavelength, finite out-of-range values
# per argument) for every scalar-argument index function; ranges as documented
# in flatray.media.
MODELS = [
    (flatray.index_pure_water, flatray.group_index_pure_water, (20.0, P0, 532.0), 2,
     [(-1.0, 351.0), (1000.0, 100.1e6), (199.0, 1101.0)]),
    (flatray.index_seawater, flatray.group_index_seawater, (4.0, 35.0, 532.0), 2,
     [(-0.5, 30.5), (-1.0, 35.5), (399.0, 701.0)]),
    (lambda t, s, lam, p, **k: flatray.index_seawater(t, s, lam, p, **k),
     lambda t, s, lam, p, **k: flatray.group_index_seawater(t, s, lam, p, **k),
     (4.0, 35.0, 532.0, 20e6), 2, [(-0.5, 30.5), (-1.0, 35.5), (0.0, 800.0), (-1.0, 101e6)]),
    (flatray.index_air, flatray.group_index_air, (20.0, P0, 0.5, 633.0), 3,
     [(-41.0, 101.0), (9e3, 141e3), (-0.01, 1.01), (299.0, 1701.0)]),
    (flatray.index_water_at_density, None, (20.0, 998.2, 532.0), 2,
     [(-12.5, 500.5), (-1.0, 1060.5), (199.0, 1101.0)]),
    (lambda lam, **k: flatray.index_material("sapphire_ordinary", lam, **k),
     lambda lam, **k: flatray.group_index_material("sapphire_ordinary", lam, **k),
     (532.0,), 0, [(199.0, 5001.0)]),
    (lambda lam, **k: flatray.index_sellmeier(SILICA_B, SILICA_C, lam, **k),
     lambda lam, **k: flatray.group_index_sellmeier(SILICA_B, SILICA_C, lam, **k),
     (532.0,), 0, [(199.0, -532.0)]),
    (lambda a, b, c, lam, **k: flatray.index_cauchy(a, b, c, lam, **k),
     lambda a, b, c, lam, **k: flatray.group_index_cauchy(a, b, c, lam, **k),
     (1.5, 0.004, 1e-4, 532.0), 3, [(-2.0,), (-1.0,), (-1.0,), (150.0, 0.0)]),
]
IDS = ["pure water", "seawater", "seawater at pressure", "air", "water at density",
       "sapphire", "user Sellmeier", "user Cauchy"]


def _with(args, i, value):
    a = list(args)
    a[i] = value
    return a


# --- bad input ----------------------------------------------------------------------------

@pytest.mark.parametrize("model", MODELS, ids=IDS)
def test_non_finite_arguments_raise_invalid_argument(model):
    phase, group, args, _, _ = model
    for fn in filter(None, (phase, group)):
        for i in range(len(args)):
            for bad in BAD_FLOATS:
                with pytest.raises(flatray.InvalidArgumentError):
                    fn(*_with(args, i, bad))


@pytest.mark.parametrize("model", MODELS, ids=IDS)
def test_nan_beside_an_out_of_range_value_is_invalid(model):
    # Non-finite arguments are checked before any range (src/media/mod.rs).
    phase, _, args, _, ranges = model
    for i in range(len(args)):
        for j, values in enumerate(ranges):
            if j != i:
                with pytest.raises(flatray.InvalidArgumentError):
                    phase(*_with(_with(args, j, values[0]), i, NAN))


@pytest.mark.parametrize("model", MODELS, ids=IDS)
def test_finite_values_outside_validity_raise_out_of_range(model):
    phase, group, args, _, ranges = model
    for fn in filter(None, (phase, group)):
        for i, values in enumerate(ranges):
            for bad in values:
                with pytest.raises(flatray.OutOfRangeError):
                    fn(*_with(args, i, bad))
                value, status = fn(*_with(args, i, bad), return_status=True)
                assert math.isnan(value) and status is Status.OUT_OF_RANGE


def test_arrays_give_nan_and_status_where_invalid():
    lam = np.array([[532.0, 900.0], [NAN, 450.0]])
    n = flatray.index_seawater(4.0, 35.0, lam)
    assert n.shape == (2, 2)
    assert np.isfinite(n[0, 0]) and np.isnan(n[0, 1]) and np.isnan(n[1, 0])
    assert n[1, 1] == flatray.index_seawater(4.0, 35.0, 450.0)
    values, status = flatray.index_seawater(4.0, 35.0, lam, return_status=True)
    assert status.dtype == np.int32
    assert status.tolist() == [[0, 7], [2, 0]]
    np.testing.assert_array_equal(values, n)
    with pytest.raises(flatray.OutOfRangeError) as info:
        flatray.index_seawater(4.0, 35.0, lam, raise_on_error=True)
    assert info.value.index == 1  # flat C-order index of the first failure
    assert info.value.function == "flatray_index_seawater"


def test_broadcasting():
    t = np.array([[0.0], [10.0], [20.0]])
    lam = np.array([450.0, 532.0, 600.0, 650.0])
    n = flatray.index_pure_water(t, P0, lam)
    assert n.shape == (3, 4)
    for i in range(3):
        for j in range(4):
            assert n[i, j] == flatray.index_pure_water(float(t[i, 0]), P0, float(lam[j]))
    assert flatray.index_air(20.0, P0, 0.0, []).shape == (0,)
    with pytest.raises(ValueError, match="broadcast"):
        flatray.index_pure_water([1.0, 2.0], P0, [500.0, 600.0, 700.0])
    with pytest.raises(ValueError):
        flatray.index_pure_water("warm", P0, 532.0)
    # numpy scalars are scalars.
    assert isinstance(flatray.index_pure_water(np.float32(20.0), P0, np.int64(532)), float)


def test_material_codes():
    by_member = flatray.index_material(Material.PMMA, 532.0)
    assert flatray.index_material("pmma", 532.0) == by_member
    assert flatray.index_material("PMMA", 532.0) == by_member
    assert flatray.index_material(2, 532.0) == by_member
    assert Material.PMMA.refractive_index(532.0) == by_member
    many = flatray.index_material([0, 1, 2, 3, 4], 532.0)
    assert many.tolist() == [flatray.index_material(m, 532.0) for m in Material]
    for code in (5, -1, 2**31 - 1, -(2**31)):
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.index_material(code, 532.0)
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.group_index_material(code, 532.0)
        with pytest.raises(flatray.InvalidArgumentError):
            flatray.material_wavelength_range(code)
    values, status = flatray.index_material([1, 9], 532.0, return_status=True)
    assert status.tolist() == [0, 2] and np.isnan(values[1])
    for bad in ("unobtainium", 1.5, None, 2**40):
        with pytest.raises(ValueError):
            flatray.index_material(bad, 532.0)


def test_material_ranges():
    # The sources' ranges, as src/media/materials.rs states them.
    assert {m.name: m.wavelength_range_nm for m in Material} == {
        "FUSED_SILICA": (210.0, 3710.0), "SAPPHIRE_ORDINARY": (200.0, 5000.0),
        "PMMA": (400.0, 1060.0), "POLYCARBONATE": (400.0, 1060.0),
        "SODA_LIME_GLASS": (320.0, 4600.0)}
    for m in Material:
        lo, hi = m.wavelength_range_nm
        assert np.isfinite(m.refractive_index([lo, hi])).all()
        _, status = m.refractive_index([lo - 0.5, hi + 0.5], return_status=True)
        assert status.tolist() == [Status.OUT_OF_RANGE] * 2


def test_user_formula_options():
    # The default (catalogue) footing and flatray_sample_sellmeier's standard-air
    # footing without a range are one computation.
    n = flatray.index_sellmeier(SILICA_B, SILICA_C, 532.0)
    assert n == flatray.index_material(Material.FUSED_SILICA, 532.0)
    assert flatray.index_sellmeier(SILICA_B, SILICA_C, 532.0,
                                   wavelength_range_nm=(0.0, math.inf)) == n
    assert flatray.group_index_sellmeier(SILICA_B, SILICA_C, 532.0,
                                         wavelength_range_nm=(0.0, math.inf)) == \
        flatray.group_index_material(Material.FUSED_SILICA, 532.0)
    # Ranges are enforced when given.
    with pytest.raises(flatray.OutOfRangeError):
        flatray.index_sellmeier(SILICA_B, SILICA_C, 205.0, wavelength_range_nm=(210, 3710))
    assert flatray.index_sellmeier(SILICA_B, SILICA_C, 205.0) > 1.5  # no range: 200 nm and up
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.index_cauchy(1.5, 0.0, 0.0, 532.0, wavelength_range_nm=(700, 400))
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.index_cauchy(1.5, 0.0, 0.0, 532.0, footing=7)  # unknown footing code
    with pytest.raises(ValueError):
        flatray.index_cauchy(1.5, 0.0, 0.0, 532.0, footing="glassy")
    with pytest.raises(ValueError):
        flatray.index_sellmeier((1.0, 0.0), SILICA_C, 532.0)
    with pytest.raises(ValueError):
        flatray.index_cauchy([1.5, 1.6], 0.0, 0.0, 532.0)
    with pytest.raises(ValueError):
        flatray.index_cauchy(1.5, 0.0, 0.0, 532.0, wavelength_range_nm=400)
    for i in range(3):
        for bad in BAD_FLOATS:
            with pytest.raises(flatray.InvalidArgumentError):
                flatray.index_sellmeier(_with(SILICA_B, i, bad), SILICA_C, 532.0)
            with pytest.raises(flatray.InvalidArgumentError):
                flatray.group_index_sellmeier(SILICA_B, _with(SILICA_C, i, bad), 532.0,
                                              footing=Footing.VACUUM)
    # A resonance: no real index just above lambda^2 = c.
    with pytest.raises(flatray.OutOfRangeError):
        flatray.index_sellmeier((1, 0, 0), (0.01, 0, 0), 95.0, footing=Footing.VACUUM)


# --- values -----------------------------------------------------------------------------------

def _air_wavelength_to_vacuum(air_nm):
    """The vacuum wavelength whose wavelength in standard air (dry, 15 °C, 1 atm,
    450 ppm CO2, which flatray.index_air reproduces exactly) is ``air_nm``."""
    v = air_nm
    for _ in range(8):
        v = air_nm * flatray.index_air(15.0, P0, 0.0, v)
    return v


def _relative(material, air_nm):
    v = _air_wavelength_to_vacuum(air_nm)
    return flatray.index_material(material, v) / flatray.index_air(15.0, P0, 0.0, v)


def test_reference_values():
    # Malitson (1965): fused silica n_d, n_F, n_C measured (relative to air);
    # half a unit in the 5th decimal.
    for air_nm, want in [(587.5618, 1.45846), (486.1327, 1.46313), (656.2725, 1.45637)]:
        assert abs(_relative(Material.FUSED_SILICA, air_nm) - want) <= 5e-6
    # Sapphire (ordinary) formula evaluated by hand with mpmath at the d line,
    # 1.768172093 (tests/reference_media.rs); 1e-9.
    assert abs(_relative(Material.SAPPHIRE_ORDINARY, 587.5618) - 1.768172093) < 1e-9
    # Sultanova et al. (2009), measured at the d line: PMMA 1.491, PC 1.585
    # (+-0.001, printed to 3 decimals): 0.0015.
    assert abs(_relative(Material.PMMA, 587.5618) - 1.491) <= 0.0015
    assert abs(_relative(Material.POLYCARBONATE, 587.5618) - 1.585) <= 0.0015
    # Handbook (common practice, from memory): water at 20 °C, 589.3 nm,
    # 1.33335 absolute; 2e-5 (tests/reference_media.rs).
    assert abs(flatray.index_pure_water(20.0, P0, 589.3) - 1.33335) < 2e-5
    # Quan and Fry (1995) eq. 1 at T = 20, S = 0, 589.3 nm in air evaluated by
    # hand with mpmath: 1.33300443427695 (relative to air); the library's
    # absolute value divided by standard air at the matching vacuum wavelength.
    v = _air_wavelength_to_vacuum(589.3)
    rel = flatray.index_seawater(20.0, 0.0, v) / flatray.index_air(15.0, P0, 0.0, v)
    assert abs(rel - 1.33300443427695) < 1e-9
    # Common practice: 35 PSU is ~0.0064 above fresh water at 20 °C; +-0.0002.
    d = flatray.index_seawater(20.0, 35.0, 589.3) - flatray.index_seawater(20.0, 0.0, 589.3)
    assert abs(d - 0.0064) < 0.0002
    # Ciddor (1996) eq. 1 by hand (mpmath): 10^8 (n - 1) = 27820.83179 at 532 nm
    # for standard air; 1e-12.
    assert abs(flatray.index_air(15.0, P0, 0.0, 532.0) - 1 - 2.782083179e-4) < 1e-12
    # Cauchy by hand: 1.5 + 0.004/0.25 + 1e-4/0.0625 = 1.5176 at 0.5 um.
    assert abs(flatray.index_cauchy(1.5, 0.004, 1e-4, 500.0, footing=Footing.VACUUM)
               - 1.5176) < 1e-14


def test_seawater_pressure_term():
    surface = flatray.index_seawater(4.0, 35.0, 532.0)
    assert flatray.index_seawater(4.0, 35.0, 532.0, P0) == surface
    p = P0 + 20e6
    deep = flatray.index_seawater(4.0, 35.0, 532.0, p)
    water = flatray.index_pure_water(4.0, p, 532.0) - flatray.index_pure_water(4.0, P0, 532.0)
    assert deep == surface + water  # the documented sum, same arithmetic
    # About 1.5e-4 per MPa (IAPWS R9-97 with IF97): 20 MPa adds 2.5e-3 to 3.5e-3.
    assert 2.5e-3 < deep - surface < 3.5e-3
    assert flatray.seawater(4.0, 35.0, p).refractive_index(532.0) == deep


@pytest.mark.parametrize("model", [m for m in MODELS if m[1] is not None],
                         ids=[i for i, m in zip(IDS, MODELS) if m[1] is not None])
def test_group_index_against_finite_difference(model):
    # Central difference, h = 0.01 nm; its truncation and rounding errors are
    # below 1e-10 in lambda dn/dlambda here (error budget in src/media/mod.rs):
    # tolerance 1e-8.
    phase, group, args, w, _ = model
    lam = args[w]
    h = 0.01
    up = phase(*_with(args, w, lam + h))
    down = phase(*_with(args, w, lam - h))
    want = phase(*args) - lam * (up - down) / (2 * h)
    assert abs(group(*args) - want) < 1e-8
    assert group(*args) > phase(*args)  # normal dispersion in the visible


def test_water_group_index_near_532():
    # Common practice: ~1.357 (n ~ 1.335 plus lambda |dn/dlambda| ~ 0.02); +-0.01.
    ng = flatray.group_index_pure_water(20.0, P0, [520.0, 532.0, 545.0])
    assert np.all(np.abs(ng - 1.357) < 0.01)


# --- the raw C functions -----------------------------------------------------------------------

def test_raw_c_null_pointers_and_nan_outputs():
    out = ctypes.c_double(-1.0)
    b = (ctypes.c_double * 3)(*SILICA_B)
    c = (ctypes.c_double * 3)(*SILICA_C)
    assert LIB.flatray_index_pure_water(20.0, P0, 532.0, None) == Status.NULL_POINTER
    assert LIB.flatray_index_sellmeier(None, c, 532.0, ctypes.byref(out)) == Status.NULL_POINTER
    assert math.isnan(out.value)
    out.value = -1.0
    assert LIB.flatray_index_sellmeier(b, None, 532.0, ctypes.byref(out)) == Status.NULL_POINTER
    assert math.isnan(out.value)
    assert LIB.flatray_index_sellmeier(b, c, 532.0, ctypes.byref(out)) == Status.OK
    out.value = -1.0
    assert LIB.flatray_index_air(20.0, P0, 0.5, 100.0, ctypes.byref(out)) == Status.OUT_OF_RANGE
    assert math.isnan(out.value)
    out.value = -1.0
    assert LIB.flatray_index_material(77, 532.0, ctypes.byref(out)) == Status.INVALID_ARGUMENT
    assert math.isnan(out.value)
    lo, hi = ctypes.c_double(), ctypes.c_double()
    assert LIB.flatray_material_wavelength_range(0, None, ctypes.byref(hi)) == Status.NULL_POINTER
    assert math.isnan(hi.value)
    group = ctypes.c_double(-1.0)
    assert LIB.flatray_sample_cauchy(1.5, 0.0, 0.0, 1, 0.0, INF, 532.0, None,
                                     ctypes.byref(group)) == Status.NULL_POINTER
    assert math.isnan(group.value)
    assert LIB.flatray_material_wavelength_range(4, ctypes.byref(lo), ctypes.byref(hi)) == 0
    assert (lo.value, hi.value) == (320.0, 4600.0)


# --- media and the builder ------------------------------------------------------------------------

def test_build_stack_camera_port():
    # The example: camera in air at 1 atm, 8 mm sapphire port, seawater
    # at 4 °C and 35 PSU, 532 nm.
    stack = flatray.build_stack(observer=flatray.air(20.0, P0, 0.5),
                                layers=[(0.008, Material.SAPPHIRE_ORDINARY)],
                                object=flatray.seawater(4.0, 35.0), wavelength_nm=532)
    assert isinstance(stack, flatray.Stack)
    assert stack.n_observer == flatray.index_air(20.0, P0, 0.5, 532.0)
    assert stack.layers == ((0.008, flatray.index_material(Material.SAPPHIRE_ORDINARY, 532.0)),)
    assert stack.n_object == flatray.index_seawater(4.0, 35.0, 532.0)
    assert tuple(stack.origin) == (0.0, 0.0, 0.0) and tuple(stack.normal) == (0.0, 0.0, 1.0)
    # It is a Stack like any other.
    seen = flatray.apparent_position(stack, (0, 0, -0.05), (0.2, 0.0, 1.5))
    assert 1.0 < seen[2] < 1.5


def test_builder_media_kinds_and_geometry():
    media = [flatray.air(10.0, 95e3, 0.2), flatray.pure_water(15.0, 2e6),
             flatray.seawater(10.0, 30.0), Material.PMMA, "polycarbonate",
             flatray.sellmeier((1.0, 0, 0), (0.01, 0, 0), Footing.VACUUM),
             flatray.cauchy(1.5, 0.004), 1.6]
    b = flatray.StackBuilder(flatray.fixed_index(1.0), 1.33, origin=(1, 2, 3), normal=(0, 0, -2))
    for m in media:
        b = b.layer(0.001, m)
    s = b.build(550.0)
    assert s.layer_count == 8
    assert tuple(s.origin) == (1.0, 2.0, 3.0) and tuple(s.unit_normal) == (0.0, 0.0, -1.0)
    for (_, n), m in zip(s.layers, media):
        assert n == flatray.as_medium(m).refractive_index(550.0)
    # The builder is immutable and serves many wavelengths.
    assert len(b.layers) == 8 and b.build(450.0).layers[3][1] > s.layers[3][1]
    with pytest.raises(flatray.InvalidArgumentError):
        b.layer(0.001, 1.5).build(550.0)  # a ninth layer
    assert flatray.fixed_index(1.6).group_index(550.0) == 1.6
    assert flatray.fixed_index(1.6).refractive_index([500.0, 600.0]).tolist() == [1.6, 1.6]


def test_builder_errors_name_the_medium():
    with pytest.raises(flatray.OutOfRangeError, match="object"):
        flatray.build_stack(flatray.air(20.0), [], flatray.seawater(4.0, 35.0), 800.0)
    with pytest.raises(flatray.OutOfRangeError, match="layer 1"):
        flatray.build_stack(flatray.air(20.0), [(0.01, Material.FUSED_SILICA), (0.01, "pmma")],
                            flatray.pure_water(20.0), 1200.0 / 1.1)
    with pytest.raises(flatray.InvalidArgumentError, match="observer"):
        flatray.build_stack(flatray.air(NAN), [], 1.33, 532.0)
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.build_stack(1.0, [(-0.01, Material.PMMA)], 1.33, 532.0)  # thickness
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.build_stack(1.0, [], flatray.fixed_index(0.0), 532.0)  # index <= 0
    for bad in (None, "vapour", object(), True):
        with pytest.raises(ValueError):
            flatray.build_stack(bad, [], 1.33, 532.0)
    with pytest.raises(ValueError):
        flatray.build_stack(1.0, [(0.01,)], 1.33, 532.0)
