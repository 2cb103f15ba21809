"""Refractive indices of the media flatray looks through, and a stack builder.

Models (the library's, reached through its C functions):

========================  ==============================================  ===========================
medium                    model                                           validity
========================  ==============================================  ===========================
pure water                IAPWS R9-97 with the IAPWS-IF97 density         0–350 °C, p_s(T)–100 MPa,
                                                                          200–1100 nm
seawater                  Quan and Fry (1995) + the IAPWS pressure term   0–30 °C, 0–35 PSU,
                                                                          400–700 nm, p_s(T)–100 MPa
air                       Ciddor (1996), 450 ppm CO₂                      −40–100 °C, 10–140 kPa,
                                                                          RH 0–1, 300–1700 nm
window materials          published dispersion formulas (:class:`Material`)  per material
user formulas             3-term Sellmeier, Cauchy                        200 nm and up (see below)
========================  ==============================================  ===========================

Every index is **absolute** (relative to vacuum) and every ``wavelength_nm`` is
a **vacuum** wavelength in nm. Temperatures in °C, pressures absolute in Pa
(:data:`STANDARD_PRESSURE_PA` = 101 325 Pa at sea level), salinity practical
(PSU), relative humidity a fraction 0…1. ``group_index_*`` functions give the
group index ``n − λ dn/dλ``.

User Sellmeier and Cauchy coefficients are read, by default, the way glass and
window makers publish them: relative to air at wavelengths in air
(:attr:`Footing.STANDARD_AIR`); pass ``footing=Footing.VACUUM`` for formulas
that give absolute indices at vacuum wavelengths, and ``wavelength_range_nm``
to have the library enforce the range the coefficients were fitted over.

Scalars and arrays
------------------
Every index function takes numbers or numpy arrays for its condition and
wavelength arguments; arrays broadcast against each other (numpy rules).

* All arguments scalar: a ``float`` is returned; a failure raises its
  :class:`~flatray.FlatrayError` subclass (``InvalidArgumentError`` for NaN or
  infinity, ``OutOfRangeError`` for a finite value outside the model's range).
* Any argument an array: a float64 array of the broadcast shape is returned,
  NaN where the model failed. ``raise_on_error=True`` raises the failure with
  the lowest (flat, C-order) index instead, its ``.index`` set.
* ``return_status=True`` (scalars or arrays): return ``(values, status)``, the
  status a :class:`~flatray.Status` (scalar) or an int32 array of codes, and
  never raise for a model failure.

Malformed arguments (not numbers, shapes that do not broadcast, a material
name that does not exist) raise ``ValueError``.

Example:
    The camera of a survey housing, at 532 nm::

        >>> round(index_seawater(4.0, 35.0, 532.0), 5)
        1.34317
        >>> index_pure_water([0.0, 20.0, 40.0], STANDARD_PRESSURE_PA, 532.0).round(5).tolist()
        [1.33638, 1.33538, 1.33296]
        >>> n, status = index_seawater(4.0, 35.0, [532.0, 900.0], return_status=True)
        >>> status.tolist()                  # 900 nm is outside Quan and Fry's data
        [0, 7]
        >>> s = build_stack(observer=air(20.0), layers=[(0.008, Material.SAPPHIRE_ORDINARY)],
        ...                 object=seawater(4.0, 35.0), wavelength_nm=532)
        >>> round(s.layers[0][1], 4), round(s.n_object, 4)
        (1.7722, 1.3432)
"""

from __future__ import annotations

import ctypes
import enum
import math
import operator
from dataclasses import dataclass
from typing import NamedTuple, Sequence

import numpy as np

from . import _lib
from ._types import Status
from .errors import FlatrayError
from .stack import Stack

#: One standard atmosphere, Pa: the absolute pressure at sea level.
STANDARD_PRESSURE_PA = 101325.0

_INT32_MIN = -(2**31)
_INT32_MAX = 2**31 - 1


class Material(enum.IntEnum):
    """``FlatrayMaterial``: a window or wall material with a built-in formula.

    Each member is also a medium for :func:`build_stack` and has
    :meth:`refractive_index` and :meth:`group_index`.

    * ``FUSED_SILICA``: Malitson (1965), 210–3710 nm.
    * ``SAPPHIRE_ORDINARY``: sapphire, ordinary ray, Malitson and Dodge (1972),
      200–5000 nm (a port cut with the optic axis along its normal shows this
      index at normal incidence).
    * ``PMMA``: acrylic, fitted to Sultanova et al. (2009), 400–1060 nm.
    * ``POLYCARBONATE``: fitted to Sultanova et al. (2009), 400–1060 nm.
    * ``SODA_LIME_GLASS``: window glass, Rubin (1985), 320–4600 nm.
    """

    FUSED_SILICA = 0
    SAPPHIRE_ORDINARY = 1
    PMMA = 2
    POLYCARBONATE = 3
    SODA_LIME_GLASS = 4

    @property
    def wavelength_range_nm(self) -> tuple[float, float]:
        """Valid vacuum wavelengths ``(min, max)``, nm."""
        return material_wavelength_range(self)

    def refractive_index(self, wavelength_nm, **options):
        """Absolute phase index (see :func:`index_material`)."""
        return index_material(self, wavelength_nm, **options)

    def group_index(self, wavelength_nm, **options):
        """Group index (see :func:`group_index_material`)."""
        return group_index_material(self, wavelength_nm, **options)


class Footing(enum.IntEnum):
    """``FlatrayFooting``: what a user formula's index and wavelength are relative to.

    * ``VACUUM``: absolute index at vacuum wavelengths.
    * ``STANDARD_AIR``: relative to standard air (dry, 15 °C, 101 325 Pa, 450 ppm
      CO₂) at wavelengths in that air, as catalogues print them (the default).
    """

    VACUUM = 0
    STANDARD_AIR = 1


class IndexResult(NamedTuple):
    """``(values, status)`` of an index function called with ``return_status=True``."""

    #: float (scalar call) or float64 array, NaN where the model failed.
    values: object
    #: :class:`~flatray.Status` (scalar call) or int32 array of status codes.
    status: object


# --- the evaluation engine ----------------------------------------------------------

def _floats(value, name: str) -> np.ndarray:
    try:
        a = np.asarray(value, dtype=np.float64)
    except (TypeError, ValueError) as exc:
        raise ValueError(f"{name} must be a number or an array of numbers: {exc}") from None
    return a


def _codes(value, name: str, enum_type) -> np.ndarray:
    """int32-ready codes: members, names (case-insensitive) or integers."""
    def one(v):
        if isinstance(v, str):
            try:
                return int(enum_type[v.upper()])
            except KeyError:
                names = ", ".join(m.name.lower() for m in enum_type)
                raise ValueError(f"unknown {name} {v!r}: use one of {names}") from None
        try:
            code = operator.index(v)
        except TypeError:
            raise ValueError(
                f"{name} must be a {enum_type.__name__}, its name or an int, got {v!r}") from None
        if not _INT32_MIN <= code <= _INT32_MAX:
            raise ValueError(f"{name} code {code} does not fit in int32")
        return code

    if isinstance(value, (str, int, np.integer)):
        return np.asarray(one(value), dtype=np.int64)
    a = np.asarray(value, dtype=object)
    return np.vectorize(one, otypes=[np.int64])(a) if a.size else a.astype(np.int64)


def _evaluate(function: str, args: Sequence[np.ndarray], *, prefix=(), call=None,
              return_status: bool = False, raise_on_error: bool = False):
    """Call ``lib.<function>(*prefix, *element args, &out)`` (or ``call`` with the
    same arguments) over the broadcast of ``args`` (0-d arrays for scalars);
    ``function`` names the C function in errors."""
    fn = getattr(_lib.lib, function) if call is None else call
    out = ctypes.c_double()
    ref = ctypes.byref(out)
    if all(a.ndim == 0 for a in args):
        status = fn(*prefix, *(a.item() for a in args), ref)
        value = out.value
        if return_status:
            return IndexResult(value, _status(status))
        _lib.check(status, function)
        return value
    try:
        arrays = np.broadcast_arrays(*args)
    except ValueError as exc:
        raise ValueError(f"{function}: arguments do not broadcast together: {exc}") from None
    shape = arrays[0].shape
    columns = [a.ravel().tolist() for a in arrays]
    values = np.empty(len(columns[0]), dtype=np.float64)
    status = np.empty(len(columns[0]), dtype=np.int32)
    for i, row in enumerate(zip(*columns)):
        status[i] = fn(*prefix, *row, ref)
        values[i] = out.value  # NaN on failure, by the C contract
    values = values.reshape(shape)
    status = status.reshape(shape)
    if raise_on_error and not return_status:
        failed = np.flatnonzero(status != Status.OK)
        if failed.size:
            index = int(failed[0])
            _lib.check(int(status.flat[index]), function, index=index)
    if return_status:
        return IndexResult(values, status)
    return values


def _status(code: int):
    try:
        return Status(code)
    except ValueError:
        return code


# --- pure water ----------------------------------------------------------------------

def index_pure_water(temperature_c, pressure_pa, wavelength_nm, *, return_status=False,
                     raise_on_error=False):
    """Absolute phase index of pure water: IAPWS R9-97 with the IAPWS-IF97 density
    (``flatray_index_pure_water``).

    Args:
        temperature_c: 0–350 °C.
        pressure_pa: absolute pressure, Pa, from the boiling pressure to 100 MPa
            (:data:`STANDARD_PRESSURE_PA` at the surface, plus about 9.8 kPa per
            metre of fresh water).
        wavelength_nm: vacuum wavelength, 200–1100 nm.

    Example:
        >>> round(index_pure_water(20.0, STANDARD_PRESSURE_PA, 589.3), 5)
        1.33335
    """
    return _evaluate("flatray_index_pure_water",
                     [_floats(temperature_c, "temperature_c"), _floats(pressure_pa, "pressure_pa"),
                      _floats(wavelength_nm, "wavelength_nm")],
                     return_status=return_status, raise_on_error=raise_on_error)


def group_index_pure_water(temperature_c, pressure_pa, wavelength_nm, *, return_status=False,
                           raise_on_error=False):
    """Group index ``n − λ dn/dλ`` of pure water (as :func:`index_pure_water`).

    Example:
        >>> round(group_index_pure_water(20.0, STANDARD_PRESSURE_PA, 532.0), 4)
        1.357
    """
    return _evaluate("flatray_group_index_pure_water",
                     [_floats(temperature_c, "temperature_c"), _floats(pressure_pa, "pressure_pa"),
                      _floats(wavelength_nm, "wavelength_nm")],
                     return_status=return_status, raise_on_error=raise_on_error)


def index_water_at_density(temperature_c, density_kg_per_m3, wavelength_nm, *,
                           return_status=False, raise_on_error=False):
    """IAPWS R9-97 at a given density (``flatray_index_water_at_density``):
    −12–500 °C, 0–1060 kg m⁻³, 200–1100 nm (supercooled water included).

    Example:
        >>> round(index_water_at_density(25.0, 997.047435, 226.5), 8)   # R9-97 check value
        1.39277824
    """
    return _evaluate("flatray_index_water_at_density",
                     [_floats(temperature_c, "temperature_c"),
                      _floats(density_kg_per_m3, "density_kg_per_m3"),
                      _floats(wavelength_nm, "wavelength_nm")],
                     return_status=return_status, raise_on_error=raise_on_error)


# --- seawater --------------------------------------------------------------------------

def _seawater(kind: str, temperature_c, salinity_psu, wavelength_nm, pressure_pa,
              return_status, raise_on_error):
    t = _floats(temperature_c, "temperature_c")
    s = _floats(salinity_psu, "salinity_psu")
    lam = _floats(wavelength_nm, "wavelength_nm")
    if pressure_pa is None:
        return _evaluate(f"flatray_{kind}_seawater", [t, s, lam],
                         return_status=return_status, raise_on_error=raise_on_error)
    return _evaluate(f"flatray_{kind}_seawater_at_pressure",
                     [t, s, _floats(pressure_pa, "pressure_pa"), lam],
                     return_status=return_status, raise_on_error=raise_on_error)


def index_seawater(temperature_c, salinity_psu, wavelength_nm, pressure_pa=None, *,
                   return_status=False, raise_on_error=False):
    """Absolute phase index of seawater: Quan and Fry (1995) on the standard-air
    footing, plus the IAPWS pure-water pressure term when ``pressure_pa`` is given.

    Args:
        temperature_c: 0–30 °C.
        salinity_psu: practical salinity, 0–35.
        wavelength_nm: vacuum wavelength, 400–700 nm.
        pressure_pa: absolute pressure, Pa (about ``101325 + 10070 * depth_m`` in
            the open ocean), up to 100 MPa; ``None`` (default) is the surface,
            101 325 Pa (``flatray_index_seawater``); otherwise
            ``flatray_index_seawater_at_pressure``:
            ``n_sea(T, S, λ) + n_water(T, p, λ) − n_water(T, 101 325 Pa, λ)``.

    Example:
        >>> round(index_seawater(4.0, 35.0, 532.0, pressure_pa=101325 + 10070 * 200), 5)
        1.34349
    """
    return _seawater("index", temperature_c, salinity_psu, wavelength_nm, pressure_pa,
                     return_status, raise_on_error)


def group_index_seawater(temperature_c, salinity_psu, wavelength_nm, pressure_pa=None, *,
                         return_status=False, raise_on_error=False):
    """Group index of seawater (as :func:`index_seawater`).

    Example:
        >>> round(group_index_seawater(4.0, 35.0, 532.0), 4)
        1.3656
    """
    return _seawater("group_index", temperature_c, salinity_psu, wavelength_nm, pressure_pa,
                     return_status, raise_on_error)


# --- air ----------------------------------------------------------------------------------

def index_air(temperature_c, pressure_pa, relative_humidity, wavelength_nm, *,
              return_status=False, raise_on_error=False):
    """Absolute phase index of moist air, Ciddor (1996), 450 ppm CO₂
    (``flatray_index_air``).

    Args:
        temperature_c: −40 to 100 °C.
        pressure_pa: absolute, 10–140 kPa.
        relative_humidity: 0 (dry) to 1 (saturated, over liquid water).
        wavelength_nm: vacuum wavelength, 300–1700 nm.

    Example:
        >>> round((index_air(15.0, STANDARD_PRESSURE_PA, 0.0, 589.0) - 1) * 1e4, 2)
        2.77
    """
    return _evaluate("flatray_index_air",
                     [_floats(temperature_c, "temperature_c"), _floats(pressure_pa, "pressure_pa"),
                      _floats(relative_humidity, "relative_humidity"),
                      _floats(wavelength_nm, "wavelength_nm")],
                     return_status=return_status, raise_on_error=raise_on_error)


def group_index_air(temperature_c, pressure_pa, relative_humidity, wavelength_nm, *,
                    return_status=False, raise_on_error=False):
    """Group index of moist air (as :func:`index_air`), e.g. for laser ranging
    in air."""
    return _evaluate("flatray_group_index_air",
                     [_floats(temperature_c, "temperature_c"), _floats(pressure_pa, "pressure_pa"),
                      _floats(relative_humidity, "relative_humidity"),
                      _floats(wavelength_nm, "wavelength_nm")],
                     return_status=return_status, raise_on_error=raise_on_error)


# --- materials -----------------------------------------------------------------------------

def index_material(material, wavelength_nm, *, return_status=False, raise_on_error=False):
    """Absolute phase index of a built-in :class:`Material` (``flatray_index_material``).

    Args:
        material: a :class:`Material`, its name (``"pmma"``) or its int code;
            arrays of them broadcast like the wavelength. An unknown integer
            code is the library's ``InvalidArgumentError``.
        wavelength_nm: vacuum wavelength, within the material's range.

    Example:
        >>> round(index_material(Material.PMMA, 532.0), 4)
        1.4941
    """
    return _evaluate("flatray_index_material",
                     [_codes(material, "material", Material), _floats(wavelength_nm, "wavelength_nm")],
                     return_status=return_status, raise_on_error=raise_on_error)


def group_index_material(material, wavelength_nm, *, return_status=False, raise_on_error=False):
    """Group index of a built-in :class:`Material` (as :func:`index_material`)."""
    return _evaluate("flatray_group_index_material",
                     [_codes(material, "material", Material), _floats(wavelength_nm, "wavelength_nm")],
                     return_status=return_status, raise_on_error=raise_on_error)


def material_wavelength_range(material) -> tuple[float, float]:
    """Valid vacuum wavelengths ``(min, max)`` of a built-in material, nm.

    Example:
        >>> material_wavelength_range("sapphire_ordinary")
        (200.0, 5000.0)
    """
    code = int(_codes(material, "material", Material))
    lo, hi = ctypes.c_double(), ctypes.c_double()
    status = _lib.lib.flatray_material_wavelength_range(code, ctypes.byref(lo), ctypes.byref(hi))
    _lib.check(status, "flatray_material_wavelength_range")
    return lo.value, hi.value


# --- user formulas ---------------------------------------------------------------------------

def _three(value, name: str):
    a = _floats(value, name)
    if a.shape != (3,):
        raise ValueError(f"{name} must be 3 numbers, got shape {a.shape}")
    return (ctypes.c_double * 3)(*a.tolist())


def _options(footing, wavelength_range_nm):
    """``None`` for the issue's fixed-footing C functions, else the
    ``(footing, min, max)`` arguments of ``flatray_sample_*``."""
    code = int(_codes(footing, "footing", Footing))
    if wavelength_range_nm is None:
        if code == Footing.STANDARD_AIR:
            return None
        lo, hi = 0.0, math.inf
    else:
        try:
            lo, hi = (float(x) for x in wavelength_range_nm)
        except (TypeError, ValueError):
            raise ValueError("wavelength_range_nm must be (min_nm, max_nm) or None") from None
    return code, lo, hi


def _user(formula: str, coefficients, wavelength_nm, footing, wavelength_range_nm, group,
          return_status, raise_on_error):
    lam = _floats(wavelength_nm, "wavelength_nm")
    options = _options(footing, wavelength_range_nm)
    if options is None:
        name = f"flatray_{'group_index' if group else 'index'}_{formula}"
        return _evaluate(name, [lam], prefix=coefficients, return_status=return_status,
                         raise_on_error=raise_on_error)
    # flatray_sample_*(..., footing, min, max, wavelength, out_n, out_group_n): the
    # engine's single output goes to out_n, or to out_group_n with a scratch out_n.
    name = f"flatray_sample_{formula}"
    sample = getattr(_lib.lib, name)
    if group:
        scratch = ctypes.c_double()

        def call(*arguments):
            return sample(*arguments[:-1], ctypes.byref(scratch), arguments[-1])
    else:
        def call(*arguments):
            return sample(*arguments, None)
    return _evaluate(name, [lam], prefix=(*coefficients, *options), call=call,
                     return_status=return_status, raise_on_error=raise_on_error)


def index_sellmeier(b, c_um2, wavelength_nm, *, footing=Footing.STANDARD_AIR,
                    wavelength_range_nm=None, return_status=False, raise_on_error=False):
    """Absolute phase index of a user three-term Sellmeier formula
    ``n² = 1 + Σ bᵢ λ²/(λ² − cᵢ)`` (λ in µm, ``c_um2`` in µm²; unused terms ``bᵢ = 0``).

    Args:
        b, c_um2: three numbers each.
        wavelength_nm: vacuum wavelength(s), nm.
        footing: :attr:`Footing.STANDARD_AIR` (default: coefficients relative to
            air at wavelengths in air, as catalogues print them; flatray converts
            with standard air and accepts 200 nm and up) or :attr:`Footing.VACUUM`.
        wavelength_range_nm: ``(min, max)`` vacuum wavelengths the library
            enforces (``max`` may be ``math.inf``); ``None``: no range beyond the
            footing's (the caller keeps to the fitted range).

    Uses ``flatray_index_sellmeier`` for the default footing without a range,
    ``flatray_sample_sellmeier`` otherwise.

    Example:
        Malitson's fused silica at the helium d line, on the formula's own footing::

            >>> b = (0.6961663, 0.4079426, 0.8974794)
            >>> c = (0.0684043**2, 0.1162414**2, 9.896161**2)
            >>> round(index_sellmeier(b, c, 587.5618, footing=Footing.VACUUM), 9)
            1.458463687
    """
    return _user("sellmeier", (_three(b, "b"), _three(c_um2, "c_um2")), wavelength_nm, footing,
                 wavelength_range_nm, False, return_status, raise_on_error)


def group_index_sellmeier(b, c_um2, wavelength_nm, *, footing=Footing.STANDARD_AIR,
                          wavelength_range_nm=None, return_status=False, raise_on_error=False):
    """Group index of a user Sellmeier formula (as :func:`index_sellmeier`)."""
    return _user("sellmeier", (_three(b, "b"), _three(c_um2, "c_um2")), wavelength_nm, footing,
                 wavelength_range_nm, True, return_status, raise_on_error)


def _cauchy_coefficients(a, b_um2, c_um4):
    out = []
    for value, name in ((a, "a"), (b_um2, "b_um2"), (c_um4, "c_um4")):
        array = _floats(value, name)
        if array.ndim != 0:
            raise ValueError(f"{name} must be a single number")
        out.append(float(array))
    return tuple(out)


def index_cauchy(a, b_um2, c_um4, wavelength_nm, *, footing=Footing.STANDARD_AIR,
                 wavelength_range_nm=None, return_status=False, raise_on_error=False):
    """Absolute phase index of a user Cauchy formula ``n = a + b/λ² + c/λ⁴``
    (λ in µm, ``b_um2`` in µm², ``c_um4`` in µm⁴); footing and range as
    :func:`index_sellmeier`.

    Example:
        >>> round(index_cauchy(1.5, 0.004, 1e-4, 500.0, footing=Footing.VACUUM), 12)
        1.5176
    """
    return _user("cauchy", _cauchy_coefficients(a, b_um2, c_um4), wavelength_nm, footing,
                 wavelength_range_nm, False, return_status, raise_on_error)


def group_index_cauchy(a, b_um2, c_um4, wavelength_nm, *, footing=Footing.STANDARD_AIR,
                       wavelength_range_nm=None, return_status=False, raise_on_error=False):
    """Group index of a user Cauchy formula (as :func:`index_cauchy`)."""
    return _user("cauchy", _cauchy_coefficients(a, b_um2, c_um4), wavelength_nm, footing,
                 wavelength_range_nm, True, return_status, raise_on_error)


# --- media and the stack builder -----------------------------------------------------------

class Medium:
    """A medium with its conditions: what :func:`build_stack` takes for the
    observer's side, each layer and the object's side. Made by :func:`air`,
    :func:`pure_water`, :func:`seawater`, :func:`sellmeier`, :func:`cauchy`,
    :func:`fixed_index`; a :class:`Material` member and a plain number (a
    fixed index) are media too."""

    __slots__ = ()

    def refractive_index(self, wavelength_nm, **options):  # pragma: no cover - abstract
        """Absolute phase index at vacuum ``wavelength_nm`` (scalar or array)."""
        raise NotImplementedError

    def group_index(self, wavelength_nm, **options):  # pragma: no cover - abstract
        """Group index at vacuum ``wavelength_nm`` (scalar or array)."""
        raise NotImplementedError


@dataclass(frozen=True)
class Air(Medium):
    """Moist air, Ciddor (1996): see :func:`index_air`."""

    temperature_c: float
    pressure_pa: float = STANDARD_PRESSURE_PA
    relative_humidity: float = 0.0

    def refractive_index(self, wavelength_nm, **options):
        return index_air(self.temperature_c, self.pressure_pa, self.relative_humidity,
                         wavelength_nm, **options)

    def group_index(self, wavelength_nm, **options):
        return group_index_air(self.temperature_c, self.pressure_pa, self.relative_humidity,
                               wavelength_nm, **options)


@dataclass(frozen=True)
class PureWater(Medium):
    """Pure water, IAPWS R9-97 with IF97 density: see :func:`index_pure_water`."""

    temperature_c: float
    pressure_pa: float = STANDARD_PRESSURE_PA

    def refractive_index(self, wavelength_nm, **options):
        return index_pure_water(self.temperature_c, self.pressure_pa, wavelength_nm, **options)

    def group_index(self, wavelength_nm, **options):
        return group_index_pure_water(self.temperature_c, self.pressure_pa, wavelength_nm,
                                      **options)


@dataclass(frozen=True)
class Seawater(Medium):
    """Seawater, Quan and Fry (1995) plus the pressure term: see :func:`index_seawater`
    (``pressure_pa=None`` is the surface)."""

    temperature_c: float
    salinity_psu: float
    pressure_pa: float | None = None

    def refractive_index(self, wavelength_nm, **options):
        return index_seawater(self.temperature_c, self.salinity_psu, wavelength_nm,
                              self.pressure_pa, **options)

    def group_index(self, wavelength_nm, **options):
        return group_index_seawater(self.temperature_c, self.salinity_psu, wavelength_nm,
                                    self.pressure_pa, **options)


@dataclass(frozen=True)
class Sellmeier(Medium):
    """A user Sellmeier formula: see :func:`index_sellmeier`."""

    b: tuple
    c_um2: tuple
    footing: Footing = Footing.STANDARD_AIR
    wavelength_range_nm: tuple | None = None

    def refractive_index(self, wavelength_nm, **options):
        return index_sellmeier(self.b, self.c_um2, wavelength_nm, footing=self.footing,
                               wavelength_range_nm=self.wavelength_range_nm, **options)

    def group_index(self, wavelength_nm, **options):
        return group_index_sellmeier(self.b, self.c_um2, wavelength_nm, footing=self.footing,
                                     wavelength_range_nm=self.wavelength_range_nm, **options)


@dataclass(frozen=True)
class Cauchy(Medium):
    """A user Cauchy formula: see :func:`index_cauchy`."""

    a: float
    b_um2: float
    c_um4: float = 0.0
    footing: Footing = Footing.STANDARD_AIR
    wavelength_range_nm: tuple | None = None

    def refractive_index(self, wavelength_nm, **options):
        return index_cauchy(self.a, self.b_um2, self.c_um4, wavelength_nm, footing=self.footing,
                            wavelength_range_nm=self.wavelength_range_nm, **options)

    def group_index(self, wavelength_nm, **options):
        return group_index_cauchy(self.a, self.b_um2, self.c_um4, wavelength_nm,
                                  footing=self.footing,
                                  wavelength_range_nm=self.wavelength_range_nm, **options)


@dataclass(frozen=True)
class FixedIndex(Medium):
    """A non-dispersive medium of fixed absolute index ``n`` (its group index is
    ``n``). The index is checked when a stack is built."""

    n: float

    def refractive_index(self, wavelength_nm, **options):
        lam = _floats(wavelength_nm, "wavelength_nm")
        return np.full(lam.shape, float(self.n)) if lam.ndim else float(self.n)

    group_index = refractive_index


def air(temperature_c, pressure_pa=STANDARD_PRESSURE_PA, relative_humidity=0.0) -> Air:
    """Moist air at ``temperature_c`` (°C), absolute ``pressure_pa`` (Pa, default
    one atmosphere) and ``relative_humidity`` (0…1, default dry)."""
    return Air(float(temperature_c), float(pressure_pa), float(relative_humidity))


def pure_water(temperature_c, pressure_pa=STANDARD_PRESSURE_PA) -> PureWater:
    """Pure water at ``temperature_c`` (°C) and absolute ``pressure_pa`` (Pa)."""
    return PureWater(float(temperature_c), float(pressure_pa))


def seawater(temperature_c, salinity_psu, pressure_pa=None) -> Seawater:
    """Seawater at ``temperature_c`` (°C), ``salinity_psu`` and absolute
    ``pressure_pa`` (Pa; ``None``: the surface)."""
    return Seawater(float(temperature_c), float(salinity_psu),
                    None if pressure_pa is None else float(pressure_pa))


def sellmeier(b, c_um2, footing=Footing.STANDARD_AIR, wavelength_range_nm=None) -> Sellmeier:
    """A user Sellmeier medium (see :func:`index_sellmeier`)."""
    return Sellmeier(tuple(float(x) for x in b), tuple(float(x) for x in c_um2), Footing(footing),
                     None if wavelength_range_nm is None else tuple(wavelength_range_nm))


def cauchy(a, b_um2, c_um4=0.0, footing=Footing.STANDARD_AIR, wavelength_range_nm=None) -> Cauchy:
    """A user Cauchy medium (see :func:`index_cauchy`)."""
    return Cauchy(float(a), float(b_um2), float(c_um4), Footing(footing),
                  None if wavelength_range_nm is None else tuple(wavelength_range_nm))


def fixed_index(n) -> FixedIndex:
    """A medium of fixed index ``n`` at every wavelength."""
    return FixedIndex(float(n))


def as_medium(value, what: str = "medium"):
    """A medium from a :class:`Medium`, a :class:`Material` (or its name) or a
    number (a fixed index)."""
    if isinstance(value, (Medium, Material)):
        return value
    if isinstance(value, str):
        return Material(int(_codes(value, what, Material)))
    if isinstance(value, (int, float, np.integer, np.floating)) and not isinstance(value, bool):
        return FixedIndex(float(value))
    raise ValueError(
        f"{what} must be a flatray medium (air(), pure_water(), seawater(), sellmeier(), "
        f"cauchy(), fixed_index()), a Material or a number, got {value!r}")


class StackBuilder:
    """Builds :class:`~flatray.Stack` objects from media at any wavelength,
    mirroring the Rust ``StackBuilder``.

    Args:
        observer: the observer's medium.
        object: the object's medium.
        origin: a point on the first interface, metres (default the origin).
        normal: from the observer into the stack (default ``+z``).

    :meth:`layer` returns a new builder with one more layer (the builder is
    immutable), so one builder serves many wavelengths.

    Example:
        >>> port = (StackBuilder(air(20.0, relative_humidity=0.5), seawater(4.0, 35.0))
        ...         .layer(0.008, Material.SAPPHIRE_ORDINARY))
        >>> green, red = port.build(532.0), port.build(650.0)
        >>> green.n_object > red.n_object
        True
    """

    __slots__ = ("observer", "object", "layers", "origin", "normal")

    def __init__(self, observer, object, *, origin=(0.0, 0.0, 0.0),  # noqa: A002
                 normal=(0.0, 0.0, 1.0), layers=()):
        self.observer = as_medium(observer, "observer")
        self.object = as_medium(object, "object")
        self.origin = tuple(origin)
        self.normal = tuple(normal)
        parsed = []
        for i, item in enumerate(layers):
            try:
                thickness, medium = item
            except (TypeError, ValueError):
                raise ValueError(
                    f"layer {i} must be a (thickness_m, medium) pair, got {item!r}") from None
            parsed.append((thickness, as_medium(medium, f"layer {i}")))
        self.layers = tuple(parsed)

    def layer(self, thickness_m, medium) -> "StackBuilder":
        """A new builder with a layer of ``thickness_m`` metres of ``medium`` added
        after the others (from the observer's side)."""
        return StackBuilder(self.observer, self.object, origin=self.origin, normal=self.normal,
                            layers=(*self.layers, (thickness_m, medium)))

    def indices(self, wavelength_nm: float) -> tuple[float, list[float], float]:
        """``(n_observer, [n_layer, ...], n_object)`` at vacuum ``wavelength_nm``.

        Raises:
            FlatrayError: the first medium (observer, layers in order, object)
                whose model fails, with ``.function`` naming it.
        """
        def one(medium, what):
            try:
                return float(medium.refractive_index(float(wavelength_nm)))
            except FlatrayError as exc:
                raise type(exc)(exc.status, exc.message,
                                function=f"build_stack: {what} ({medium!r})") from None

        n_observer = one(self.observer, "observer")
        n_layers = [one(m, f"layer {i}") for i, (_, m) in enumerate(self.layers)]
        return n_observer, n_layers, one(self.object, "object")

    def build(self, wavelength_nm: float) -> Stack:
        """The :class:`~flatray.Stack` at vacuum ``wavelength_nm``: every medium's
        absolute phase index, then the stack (validated by the library)."""
        n_observer, n_layers, n_object = self.indices(wavelength_nm)
        layers = [(t, n) for (t, _), n in zip(self.layers, n_layers)]
        return Stack(self.origin, self.normal, n_observer, layers, n_object)

    def __repr__(self) -> str:
        return (f"StackBuilder(observer={self.observer!r}, object={self.object!r}, "
                f"layers={list(self.layers)!r}, origin={self.origin}, normal={self.normal})")


def build_stack(observer, layers, object, wavelength_nm, *,  # noqa: A002
                origin=(0.0, 0.0, 0.0), normal=(0.0, 0.0, 1.0)) -> Stack:
    """A :class:`~flatray.Stack` from media at one vacuum wavelength.

    Args:
        observer: the observer's medium (see :class:`Medium`).
        layers: ``(thickness_m, medium)`` pairs from the observer's side (0 to 8).
        object: the object's medium.
        wavelength_nm: vacuum wavelength, nm.
        origin, normal: the geometry, as for :class:`~flatray.Stack` (defaults:
            first interface through the origin, normal ``+z``).

    Raises:
        FlatrayError: a medium's model failed (``.function`` names which one), or
            the stack is invalid (a thickness ≤ 0, more than 8 layers).

    Example:
        A camera in air at 1 atm behind an 8 mm sapphire port, looking into
        seawater at 4 °C and 35 PSU, at 532 nm::

            >>> port = build_stack(observer=air(20.0), layers=[(0.008, Material.SAPPHIRE_ORDINARY)],
            ...                    object=seawater(4.0, 35.0), wavelength_nm=532)
            >>> port.layers[0][1] > port.n_object > port.n_observer
            True
    """
    return StackBuilder(observer, object, origin=origin, normal=normal,
                        layers=layers).build(wavelength_nm)
