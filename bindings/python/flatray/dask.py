"""Scale-out: flatray's batch corrections over Dask arrays and dataframes.

Optional: needs ``dask[array,dataframe]`` (and ``distributed`` for a cluster),
``pip install "flatray[dask]"``. ``import flatray`` never imports this module
or Dask; import it explicitly::

    import flatray.dask as fdask

Each function builds a lazy Dask graph in which every block (an ``(n, 3)``
chunk of an array, or a partition of a dataframe) is corrected by one call of
the matching flatray batch function through ctypes, in whichever worker runs
the block. Each element is computed by the same code as in a single-process
call, so the results are bit for bit those of :func:`flatray.true_positions`
and friends on the same points, whatever the chunking and the cluster.

Arrays (``dask.array``, ``map_blocks`` over ``(n, 3)`` chunks):
:func:`true_positions`, :func:`apparent_positions`, :func:`correct_ranges`,
:func:`lines_of_sight`, :func:`trace_rays`. They return the same named tuples as
the in-memory functions, holding Dask arrays that share one graph: compute
them together, ``dask.compute(*result)``, so each block runs once.

Dataframes (``dask.dataframe``, ``map_partitions``): :func:`correct_frame` adds
corrected ``x, y, z`` columns and a status column to a frame of points (the
same function corrects a pandas DataFrame in memory).

Workers: every worker process imports :mod:`flatray` and loads the shared
library the usual way (``FLATRAY_LIBRARY``, else the repository's ``target/``,
else the system loader), so the package and the library must be installed on
every worker, and ``FLATRAY_LIBRARY`` set in the workers' environment when the
library is not where the package finds it. :func:`worker_libraries` reports
what each worker loaded. On a local cluster the workers inherit the client's
environment and ``sys.path``.

Example, on a real cluster (a scheduler started with ``dask scheduler`` and
workers with ``FLATRAY_LIBRARY=/opt/flatray/libflatray.so dask worker
tcp://scheduler:8786``)::

    import dask, dask.array as da
    from distributed import Client
    import flatray, flatray.dask as fdask

    client = Client("tcp://scheduler:8786")
    print(fdask.worker_libraries(client))          # every worker found the library
    lake = flatray.Stack.single_interface((0, 0, 0), (0, 0, -1), 1.00028, 1.339)
    seen = da.from_zarr("survey.zarr")            # (N, 3) apparent points, any chunks
    truth, status = dask.compute(*fdask.true_positions(lake, (0, 0, 60), seen))
"""

from __future__ import annotations

from typing import Sequence

import numpy as np

import dask.array as da

from . import _lib
from ._convert import image_code
from ._types import FlatrayStack, Image
from .batch import (
    PathBatch,
    PointBatch,
    RayBatch,
    apparent_positions as _apparent_positions,
    lines_of_sight as _lines_of_sight,
    trace_rays as _trace_rays,
    true_positions as _true_positions,
)
from .stack import Stack
from .survey import correct_ranges as _correct_ranges

__all__ = [
    "true_positions", "apparent_positions", "correct_ranges", "lines_of_sight", "trace_rays",
    "correct_frame", "correct_partition", "worker_libraries",
]


# --- what travels to the workers -------------------------------------------------

def _stack_bytes(stack) -> bytes:
    """The stack as the 200 bytes of its ``FlatrayStack`` (small, picklable)."""
    if isinstance(stack, Stack):
        return bytes(stack.to_c())
    if isinstance(stack, FlatrayStack):
        return bytes(stack)
    raise TypeError(f"stack must be a flatray.Stack or FlatrayStack, got {type(stack).__name__}")


def _stack(raw: bytes) -> FlatrayStack:
    return FlatrayStack.from_buffer_copy(raw)


_POINT_FUNCTIONS = {
    "true_positions": lambda s, o, p, opt: _true_positions(s, o, p, opt["image"]),
    "apparent_positions": lambda s, o, p, opt: _apparent_positions(s, o, p, opt["image"]),
    "correct_ranges": lambda s, o, p, opt: _correct_ranges(s, o, p, opt["group_index"]),
}


def _point_block(points, observers=None, *, stack, function, shared_observer, options):
    """One block of a point correction: an (n, 4) array of x, y, z, status."""
    obs = shared_observer if observers is None else observers
    res = _POINT_FUNCTIONS[function](_stack(stack), obs, points, options)
    out = np.empty((len(points), 4), dtype=np.float64)
    out[:, :3] = res.points
    out[:, 3] = res.status
    return out


def _path_block(points, observers=None, *, stack, shared_observer):
    """One block of lines of sight: (n, 13), the 12 path fields then the status."""
    obs = shared_observer if observers is None else observers
    res = _lines_of_sight(_stack(stack), obs, points)
    out = np.empty((len(points), 13), dtype=np.float64)
    out[:, 0:3] = res.direction
    out[:, 3:6] = res.entry
    out[:, 6:9] = res.exit
    out[:, 9] = res.geometric_length
    out[:, 10] = res.optical_length
    out[:, 11] = res.transmittance
    out[:, 12] = res.status
    return out


def _ray_block(directions, origins=None, *, stack, shared_origin):
    """One block of traces: (n, 8), origin, direction, transmittance, status."""
    orig = shared_origin if origins is None else origins
    res = _trace_rays(_stack(stack), orig, directions)
    out = np.empty((len(directions), 8), dtype=np.float64)
    out[:, 0:3] = res.origins
    out[:, 3:6] = res.directions
    out[:, 6] = res.transmittance
    out[:, 7] = res.status
    return out


# --- arrays ----------------------------------------------------------------------

def _points(value, name: str) -> da.Array:
    """An (N, 3) float64 Dask array whose chunks hold whole rows."""
    a = value if isinstance(value, da.Array) else da.asarray(np.asarray(value))
    if a.ndim != 2 or a.shape[1] != 3:
        raise ValueError(f"{name} must be an array of shape (N, 3), got shape {a.shape}")
    if a.dtype != np.float64:
        a = a.astype(np.float64)
    if len(a.chunks[1]) != 1:
        a = a.rechunk({1: 3})
    return a


def _per_point(value, points: da.Array, name: str):
    """(shared, per_point): a shared (3,) numpy vector, or a Dask array chunked
    like ``points``."""
    if not isinstance(value, da.Array) or value.shape in ((3,), (1, 3)):
        v = np.asarray(value, dtype=np.float64)  # a small Dask array is computed here
        if v.shape in ((3,), (1, 3)):
            return v.reshape(3), None
    v = _points(value, name)
    if v.shape[0] != points.shape[0]:
        raise ValueError(f"{name} must have shape (3,), (1, 3) or ({points.shape[0]}, 3) "
                         f"to match the points, got {v.shape}")
    return None, v.rechunk((points.chunks[0], (3,)))


def _check_whole_call(function, stack, *args):
    """Run the function on an empty batch here, so that whole-call errors (an
    invalid stack, an unknown image) raise now rather than in a worker."""
    function(stack, *args)


def _map(block, points, per_point, width, **kwargs):
    arrays = [points] if per_point is None else [points, per_point]
    return da.map_blocks(block, *arrays, dtype=np.float64,
                         chunks=(points.chunks[0], (width,)), **kwargs)


def _point_correction(function, stack, observers, points, name, observer_name, **options):
    pts = _points(points, name)
    shared, per_point = _per_point(observers, pts, observer_name)
    empty = np.empty((0, 3))
    _check_whole_call(lambda s, o, p: _POINT_FUNCTIONS[function](s, o, p, options), stack,
                      shared if shared is not None else empty, empty)
    out = _map(_point_block, pts, per_point, 4, stack=_stack_bytes(stack), function=function,
               shared_observer=shared, options=options)
    return PointBatch(out[:, :3], out[:, 3].astype(np.int32))


def true_positions(stack, observers, apparent, image=Image.SAGITTAL) -> PointBatch:
    """:func:`flatray.true_positions` over a Dask array of apparent points.

    Args:
        stack: a :class:`~flatray.Stack` (or ``FlatrayStack``).
        observers: one shared observer, shape (3,) or (1, 3), or an (N, 3) array
            (numpy or Dask; rechunked to match ``apparent``).
        apparent: (N, 3) apparent points, a Dask array (any row chunks) or
            anything :func:`dask.array.asarray` takes.
        image: :class:`~flatray.Image`, its name or code.

    Returns:
        ``PointBatch(points, status)`` of lazy Dask arrays, (N, 3) float64 and
        (N,) int32, sharing one graph (``dask.compute(*result)``).

    Raises:
        ValueError: bad shapes; FlatrayError subclasses for whole-call errors
        (an invalid stack, an unknown image), at once.
    """
    return _point_correction("true_positions", stack, observers, apparent, "apparent",
                             "observers", image=image_code(image))


def apparent_positions(stack, observers, objects, image=Image.SAGITTAL) -> PointBatch:
    """:func:`flatray.apparent_positions` over a Dask array of object points;
    arguments and result as :func:`true_positions`."""
    return _point_correction("apparent_positions", stack, observers, objects, "objects",
                             "observers", image=image_code(image))


def correct_ranges(stack, sensors, uncorrected, group_index=None) -> PointBatch:
    """:func:`flatray.correct_ranges` (laser range corrections) over a Dask
    array of reported points; ``sensors`` shared or per point as the observers
    of :func:`true_positions`, ``group_index`` as in the in-memory function."""
    groups = None if group_index is None else tuple(
        float(g) for g in np.asarray(group_index, dtype=np.float64).reshape(-1))
    return _point_correction("correct_ranges", stack, sensors, uncorrected, "uncorrected",
                             "sensors", group_index=groups)


def lines_of_sight(stack, observers, objects) -> PathBatch:
    """:func:`flatray.lines_of_sight` over a Dask array of object points.

    Returns:
        ``PathBatch`` of lazy Dask arrays sharing one graph.
    """
    pts = _points(objects, "objects")
    shared, per_point = _per_point(observers, pts, "observers")
    empty = np.empty((0, 3))
    _check_whole_call(_lines_of_sight, stack, shared if shared is not None else empty, empty)
    out = _map(_path_block, pts, per_point, 13, stack=_stack_bytes(stack),
               shared_observer=shared)
    return PathBatch(out[:, 0:3], out[:, 3:6], out[:, 6:9], out[:, 9], out[:, 10], out[:, 11],
                     out[:, 12].astype(np.int32))


def trace_rays(stack, origins, directions) -> RayBatch:
    """:func:`flatray.trace_rays` over a Dask array of directions (and of
    origins, or one shared origin).

    Returns:
        ``RayBatch(origins, directions, transmittance, status)`` of lazy Dask
        arrays sharing one graph.
    """
    dirs = _points(directions, "directions")
    shared, per_point = _per_point(origins, dirs, "origins")
    empty = np.empty((0, 3))
    _check_whole_call(_trace_rays, stack, shared if shared is not None else empty, empty)
    out = _map(_ray_block, dirs, per_point, 8, stack=_stack_bytes(stack), shared_origin=shared)
    return RayBatch(out[:, 0:3], out[:, 3:6], out[:, 6], out[:, 7].astype(np.int32))


# --- dataframes ------------------------------------------------------------------

_DEFAULT_OUTPUT = {
    "true_positions": ("true_x", "true_y", "true_z"),
    "apparent_positions": ("apparent_x", "apparent_y", "apparent_z"),
    "correct_ranges": ("true_x", "true_y", "true_z"),
}


def correct_partition(frame, stack, how: str = "true_positions", *, observer=None,
                      observer_columns: Sequence[str] | None = None,
                      columns: Sequence[str] = ("x", "y", "z"),
                      output_columns: Sequence[str] | None = None,
                      status_column: str = "status", image=Image.SAGITTAL,
                      group_index=None):
    """Correct the points of a pandas DataFrame in memory (one batch call); the
    per-partition work of :func:`correct_frame`, which documents the arguments.

    Returns a copy of ``frame`` with the output columns (float64, NaN where a
    point failed) and the status column (int32 :class:`~flatray.Status` codes).
    """
    if how not in _POINT_FUNCTIONS:
        raise ValueError(f"how must be one of {sorted(_POINT_FUNCTIONS)}, got {how!r}")
    if (observer is None) == (observer_columns is None):
        raise ValueError("give exactly one of observer (shared) and observer_columns")
    output_columns = _DEFAULT_OUTPUT[how] if output_columns is None else tuple(output_columns)
    if len(output_columns) != 3 or len(tuple(columns)) != 3:
        raise ValueError("columns and output_columns must each name 3 columns (x, y, z)")
    points = frame[list(columns)].to_numpy(dtype=np.float64)
    obs = (np.asarray(observer, dtype=np.float64) if observer_columns is None
           else frame[list(observer_columns)].to_numpy(dtype=np.float64))
    options = {"image": image_code(image), "group_index": group_index}
    res = _POINT_FUNCTIONS[how](stack, obs, points, options)
    out = frame.copy()
    for i, name in enumerate(output_columns):
        out[name] = res.points[:, i]
    out[status_column] = res.status
    return out


def _partition(frame, stack, how, kwargs):
    return correct_partition(frame, _stack(stack), how, **kwargs)


def correct_frame(frame, stack, how: str = "true_positions", *, observer=None,
                  observer_columns: Sequence[str] | None = None,
                  columns: Sequence[str] = ("x", "y", "z"),
                  output_columns: Sequence[str] | None = None,
                  status_column: str = "status", image=Image.SAGITTAL, group_index=None):
    """Correct a Dask dataframe of points, partition by partition
    (``map_partitions``), each partition in one flatray batch call.

    Args:
        frame: a ``dask.dataframe.DataFrame`` with the point columns.
        stack: a :class:`~flatray.Stack` (or ``FlatrayStack``).
        how: ``"true_positions"`` (apparent points in ``columns``),
            ``"apparent_positions"`` (object points) or ``"correct_ranges"``
            (laser points reported as if the beam were straight).
        observer: one shared observer or sensor (3 numbers), or
        observer_columns: three column names holding each row's observer or sensor.
        columns: the x, y, z columns of the points (metres).
        output_columns: names of the three result columns (default
            ``true_x, true_y, true_z``, or ``apparent_x, ...`` for apparent
            positions).
        status_column: name of the int32 status column.
        image: for true and apparent positions: :class:`~flatray.Image`.
        group_index: for range corrections: group indices as in
            :func:`flatray.correct_ranges`.

    Returns:
        A lazy Dask dataframe: the input columns plus the results.
    """
    raw = _stack_bytes(stack)
    kwargs = dict(observer=None if observer is None else tuple(np.asarray(observer, float)),
                  observer_columns=observer_columns, columns=tuple(columns),
                  output_columns=output_columns, status_column=status_column, image=image,
                  group_index=group_index)
    meta = correct_partition(frame._meta, _stack(raw), how, **kwargs)  # also checks arguments
    return frame.map_partitions(_partition, raw, how, kwargs, meta=meta)


# --- the cluster -----------------------------------------------------------------

def _library_report():
    import flatray

    return {"library": _lib.library_path, "version": flatray.library_version()}


def worker_libraries(client) -> dict:
    """``{worker address: {"library": path, "version": version}}`` of every
    worker of a ``distributed.Client``: where each worker's flatray found its
    library. A worker that cannot import flatray raises here, with its error
    (usually ``LibraryLoadError`` naming ``FLATRAY_LIBRARY``)."""
    return client.run(_library_report)
