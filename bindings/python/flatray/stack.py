"""``Stack``: parallel flat refracting layers between an observer and an object."""

from __future__ import annotations

import ctypes

import numpy as np

from . import _lib
from ._convert import array3, real, vec3
from ._types import MAX_LAYERS, FlatrayStack


class Stack:
    """Parallel flat layers between the observer's medium and the object's medium.

    Args:
        origin: a point on the first interface (the one nearest the observer), metres.
        normal: from the observer's side into the stack; any non-zero length.
        n_observer: refractive index of the observer's medium (absolute).
        layers: 0 to 8 layers from the observer's side, each ``(thickness_m, index)``
            with thickness in metres (> 0).
        n_object: refractive index of the object's medium.

    The observer's medium is where ``(p - origin)·n̂ <= 0``; the object's medium is
    past the last interface, ``(p - origin)·n̂ >= total_thickness``.

    The values are validated by the library on construction (it is asked to run
    an empty batch with this stack); a bad value raises
    :class:`~flatray.InvalidArgumentError` with the library's message, a
    malformed argument (not numbers, wrong shape) raises ``ValueError``.

    Example:
        A camera housing: air inside, a 10 mm glass port, water outside::

            >>> port = Stack((0, 0, 0.05), (0, 0, 1), 1.00029, [(0.010, 1.52)], 1.34)
            >>> port.layer_count, round(port.total_thickness, 3)
            (1, 0.01)
    """

    __slots__ = ("_origin", "_normal", "_n_observer", "_layers", "_n_object", "_c")

    def __init__(self, origin, normal, n_observer, layers, n_object):
        c_origin = vec3(origin, "origin")
        c_normal = vec3(normal, "normal")
        n_obs = real(n_observer, "n_observer")
        n_obj = real(n_object, "n_object")
        parsed = _parse_layers(layers)
        c = FlatrayStack()
        c.origin = c_origin
        c.normal = c_normal
        c.n_observer = n_obs
        # A count above MAX_LAYERS goes to the library as it is; it reports it.
        c.layer_count = len(parsed)
        for i, (t, n) in enumerate(parsed[:MAX_LAYERS]):
            c.thickness[i] = t
            c.n_layer[i] = n
        c.n_object = n_obj
        status = _lib.lib.flatray_true_positions(
            ctypes.byref(c), None, 0, None, 0, 0, None, None)
        _lib.check(status, "Stack")
        self._origin = tuple(c_origin)
        self._normal = tuple(c_normal)
        self._n_observer = n_obs
        self._layers = tuple(parsed)
        self._n_object = n_obj
        self._c = c

    @classmethod
    def single_interface(cls, origin, normal, n_observer, n_object) -> "Stack":
        """One flat interface (no layers), e.g. a water surface.

        Example:
            A lake surface at z = 0 seen from above (the normal points down)::

                >>> lake = Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        """
        return cls(origin, normal, n_observer, (), n_object)

    @property
    def origin(self) -> np.ndarray:
        """A point on the first interface, metres (a new array)."""
        return np.array(self._origin)

    @property
    def normal(self) -> np.ndarray:
        """The normal as given (not normalised), a new array."""
        return np.array(self._normal)

    @property
    def unit_normal(self) -> np.ndarray:
        """The unit normal, from the observer's side into the stack."""
        v = np.array(self._normal)
        return v / np.linalg.norm(v)

    @property
    def n_observer(self) -> float:
        """Refractive index of the observer's medium."""
        return self._n_observer

    @property
    def layers(self) -> tuple[tuple[float, float], ...]:
        """The layers from the observer's side, ``(thickness_m, index)`` each."""
        return self._layers

    @property
    def layer_count(self) -> int:
        """Number of layers."""
        return len(self._layers)

    @property
    def n_object(self) -> float:
        """Refractive index of the object's medium."""
        return self._n_object

    @property
    def total_thickness(self) -> float:
        """Sum of the layer thicknesses, metres (0 for a single interface)."""
        return float(sum(t for t, _ in self._layers))

    def height(self, point) -> float:
        """Signed distance of ``point`` past the first interface along the unit
        normal, metres (negative on the observer's side)."""
        p = array3(vec3(point, "point"))
        return float(np.dot(p - np.array(self._origin), self.unit_normal))

    def to_c(self) -> FlatrayStack:
        """A new ``FlatrayStack`` struct describing this stack."""
        return FlatrayStack.from_buffer_copy(self._c)

    def __eq__(self, other) -> bool:
        if not isinstance(other, Stack):
            return NotImplemented
        return (self._origin, self._normal, self._n_observer, self._layers, self._n_object) == (
            other._origin, other._normal, other._n_observer, other._layers, other._n_object)

    def __hash__(self) -> int:
        return hash((self._origin, self._normal, self._n_observer, self._layers, self._n_object))

    def __repr__(self) -> str:
        return (f"Stack(origin={self._origin}, normal={self._normal}, "
                f"n_observer={self._n_observer}, layers={list(self._layers)}, "
                f"n_object={self._n_object})")


def _parse_layers(layers) -> list[tuple[float, float]]:
    try:
        items = list(layers)
    except TypeError:
        raise ValueError("layers must be a sequence of (thickness_m, index) pairs") from None
    parsed = []
    for i, item in enumerate(items):
        try:
            pair = tuple(item)
        except TypeError:
            pair = ()
        if len(pair) != 2:
            raise ValueError(f"layer {i} must be a (thickness_m, index) pair, got {item!r}")
        parsed.append((real(pair[0], f"layer {i} thickness"), real(pair[1], f"layer {i} index")))
    return parsed


def c_stack(stack) -> ctypes._CArgObject:
    """A by-reference argument for a :class:`Stack` or a raw ``FlatrayStack``
    (the raw struct is passed unvalidated: the library checks it)."""
    if isinstance(stack, Stack):
        return ctypes.byref(stack._c)
    if isinstance(stack, FlatrayStack):
        return ctypes.byref(stack)
    raise TypeError(f"stack must be a flatray.Stack or FlatrayStack, got {type(stack).__name__}")

