"""Finding and loading the flatray shared library, and its ctypes prototypes.

Search order:

1. the environment variable ``FLATRAY_LIBRARY`` (full path to the library file);
2. the repository's ``target/release`` then ``target/debug`` (this package lives
   in ``bindings/python/flatray`` of the repository);
3. the system loader (``ctypes.util.find_library("flatray")``).

At load, ``flatray_version()`` must equal this package's ``__version__``.
"""

from __future__ import annotations

import ctypes
import ctypes.util
import os
import sys
from pathlib import Path
from typing import Iterator, Mapping

from ._types import (
    FlatrayCameraView,
    FlatrayFresnel,
    FlatrayLens,
    FlatrayPath,
    FlatrayRay,
    FlatrayStack,
    FlatrayVec3,
)
from ._version import __version__
from .errors import LibraryLoadError, error_for

#: Environment variable naming the library file; overrides every other place.
ENV_VAR = "FLATRAY_LIBRARY"

_P = ctypes.POINTER
_STATUS = ctypes.c_int32  # FlatrayStatus, a C enum of int size
_VEC = FlatrayVec3
_STACK_P = _P(FlatrayStack)

#: (restype, argtypes) of every function in include/flatray.h, in header order.
#: Enumerated inputs travel as int32_t.
PROTOTYPES: dict[str, tuple[object, list[object]]] = {
    "flatray_true_positions": (
        _STATUS,
        [_STACK_P, _P(_VEC), ctypes.c_size_t, _P(_VEC), ctypes.c_size_t, ctypes.c_int32,
         _P(_VEC), _P(ctypes.c_int32)],
    ),
    "flatray_apparent_positions": (
        _STATUS,
        [_STACK_P, _P(_VEC), ctypes.c_size_t, _P(_VEC), ctypes.c_size_t, ctypes.c_int32,
         _P(_VEC), _P(ctypes.c_int32)],
    ),
    "flatray_lines_of_sight": (
        _STATUS,
        [_STACK_P, _P(_VEC), ctypes.c_size_t, _P(_VEC), ctypes.c_size_t, _P(FlatrayPath),
         _P(ctypes.c_int32)],
    ),
    "flatray_trace_rays": (
        _STATUS,
        [_STACK_P, _P(FlatrayRay), ctypes.c_size_t, _P(FlatrayRay), _P(ctypes.c_double),
         _P(ctypes.c_int32)],
    ),
    "flatray_refract": (
        _STATUS, [_VEC, _VEC, ctypes.c_double, ctypes.c_double, _P(_VEC)],
    ),
    "flatray_fresnel": (
        _STATUS, [ctypes.c_double, ctypes.c_double, ctypes.c_double, _P(FlatrayFresnel)],
    ),
    "flatray_critical_angle": (
        _STATUS, [ctypes.c_double, ctypes.c_double, _P(ctypes.c_double)],
    ),
    "flatray_trace": (
        _STATUS, [_STACK_P, FlatrayRay, _P(FlatrayRay), _P(ctypes.c_double)],
    ),
    "flatray_line_of_sight": (
        _STATUS, [_STACK_P, _VEC, _VEC, _P(FlatrayPath)],
    ),
    "flatray_apparent_position": (
        _STATUS, [_STACK_P, _VEC, _VEC, ctypes.c_int32, _P(_VEC)],
    ),
    "flatray_true_position": (
        _STATUS, [_STACK_P, _VEC, _VEC, ctypes.c_int32, _P(_VEC)],
    ),
    "flatray_apparent_depth": (
        _STATUS,
        [ctypes.c_double, ctypes.c_double, ctypes.c_double, ctypes.c_double, ctypes.c_int32,
         _P(ctypes.c_double)],
    ),
    "flatray_true_depth": (
        _STATUS,
        [ctypes.c_double, ctypes.c_double, ctypes.c_double, ctypes.c_double, ctypes.c_int32,
         _P(ctypes.c_double)],
    ),
    # Refractive indices (issue 3). `const double b[3]` is `double *` to ctypes.
    **{name: (_STATUS, [ctypes.c_double] * 3 + [_P(ctypes.c_double)]) for name in (
        "flatray_index_pure_water", "flatray_group_index_pure_water",
        "flatray_index_water_at_density",
        "flatray_index_seawater", "flatray_group_index_seawater",
    )},
    **{name: (_STATUS, [ctypes.c_double] * 4 + [_P(ctypes.c_double)]) for name in (
        "flatray_index_seawater_at_pressure", "flatray_group_index_seawater_at_pressure",
        "flatray_index_cauchy", "flatray_group_index_cauchy",
        "flatray_index_air", "flatray_group_index_air",
    )},
    "flatray_index_material": (
        _STATUS, [ctypes.c_int32, ctypes.c_double, _P(ctypes.c_double)],
    ),
    "flatray_group_index_material": (
        _STATUS, [ctypes.c_int32, ctypes.c_double, _P(ctypes.c_double)],
    ),
    "flatray_material_wavelength_range": (
        _STATUS, [ctypes.c_int32, _P(ctypes.c_double), _P(ctypes.c_double)],
    ),
    "flatray_index_sellmeier": (
        _STATUS, [_P(ctypes.c_double), _P(ctypes.c_double), ctypes.c_double,
                  _P(ctypes.c_double)],
    ),
    "flatray_group_index_sellmeier": (
        _STATUS, [_P(ctypes.c_double), _P(ctypes.c_double), ctypes.c_double,
                  _P(ctypes.c_double)],
    ),
    "flatray_sample_sellmeier": (
        _STATUS,
        [_P(ctypes.c_double), _P(ctypes.c_double), ctypes.c_int32, ctypes.c_double,
         ctypes.c_double, ctypes.c_double, _P(ctypes.c_double), _P(ctypes.c_double)],
    ),
    "flatray_sample_cauchy": (
        _STATUS,
        [ctypes.c_double, ctypes.c_double, ctypes.c_double, ctypes.c_int32, ctypes.c_double,
         ctypes.c_double, ctypes.c_double, _P(ctypes.c_double), _P(ctypes.c_double)],
    ),
    # Survey functions (triangulation, multi-view and range corrections, depth
    # tables, error budget).
    "flatray_triangulate": (
        _STATUS, [_STACK_P, _P(FlatrayRay), ctypes.c_size_t, _P(_VEC), _P(ctypes.c_double)],
    ),
    "flatray_correct_multiview": (
        _STATUS,
        [_STACK_P, _P(_VEC), ctypes.c_size_t, _VEC, _P(_VEC), _P(ctypes.c_double)],
    ),
    "flatray_correct_multiview_shortcut": (
        _STATUS,
        [_STACK_P, _P(_VEC), ctypes.c_size_t, _VEC, _P(_VEC), _P(ctypes.c_double)],
    ),
    "flatray_correct_range": (
        _STATUS,
        [_STACK_P, _VEC, _VEC, _P(ctypes.c_double), ctypes.c_size_t, _P(_VEC)],
    ),
    "flatray_correct_ranges": (
        _STATUS,
        [_STACK_P, _P(_VEC), ctypes.c_size_t, _P(_VEC), ctypes.c_size_t, _P(ctypes.c_double),
         ctypes.c_size_t, _P(_VEC), _P(ctypes.c_int32)],
    ),
    "flatray_correct_multiviews": (
        _STATUS,
        [_STACK_P, _P(_VEC), ctypes.c_size_t, _P(ctypes.c_size_t), _P(ctypes.c_uint32),
         ctypes.c_size_t, _P(_VEC), ctypes.c_size_t, _P(_VEC), _P(ctypes.c_double),
         _P(ctypes.c_int32)],
    ),
    "flatray_correct_multiviews_shortcut": (
        _STATUS,
        [_STACK_P, _P(_VEC), ctypes.c_size_t, _P(ctypes.c_size_t), _P(ctypes.c_uint32),
         ctypes.c_size_t, _P(_VEC), ctypes.c_size_t, _P(_VEC), _P(ctypes.c_double),
         _P(ctypes.c_int32)],
    ),
    "flatray_true_depths": (
        _STATUS,
        [_P(ctypes.c_double), _P(ctypes.c_double), ctypes.c_size_t, ctypes.c_double,
         ctypes.c_double, ctypes.c_int32, _P(ctypes.c_double), _P(ctypes.c_int32)],
    ),
    "flatray_correction_factors": (
        _STATUS,
        [_P(ctypes.c_double), ctypes.c_size_t, ctypes.c_double, ctypes.c_double,
         ctypes.c_int32, _P(ctypes.c_double), _P(ctypes.c_int32)],
    ),
    "flatray_true_position_sensitivity": (
        _STATUS,
        [_STACK_P, _VEC, _VEC, ctypes.c_int32, _P(ctypes.c_double), _P(ctypes.c_double),
         _P(ctypes.c_double), _P(ctypes.c_double)],
    ),
    "flatray_true_position_covariance": (
        _STATUS,
        [_STACK_P, _VEC, _VEC, ctypes.c_int32, ctypes.c_double, ctypes.c_double,
         ctypes.c_double, ctypes.c_double, _P(ctypes.c_double)],
    ),
    "flatray_pixel_to_ray": (
        _STATUS,
        [_P(FlatrayLens), _STACK_P, ctypes.c_double, ctypes.c_double, _P(FlatrayRay)],
    ),
    "flatray_point_to_pixel": (
        _STATUS,
        [_P(FlatrayLens), _STACK_P, _VEC, _P(ctypes.c_double), _P(ctypes.c_double)],
    ),
    "flatray_pixels_to_rays": (
        _STATUS,
        [_P(FlatrayLens), _STACK_P, _P(ctypes.c_double), ctypes.c_size_t, _P(FlatrayRay),
         _P(ctypes.c_int32)],
    ),
    "flatray_points_to_pixels": (
        _STATUS,
        [_P(FlatrayLens), _STACK_P, _P(_VEC), ctypes.c_size_t, _P(ctypes.c_double),
         _P(ctypes.c_int32)],
    ),
    "flatray_remap_table": (
        _STATUS,
        [_P(FlatrayLens), _STACK_P, _P(FlatrayLens), ctypes.c_double, ctypes.c_uint32,
         ctypes.c_uint32, _P(ctypes.c_float), _P(ctypes.c_float), ctypes.c_size_t],
    ),
    "flatray_remap_error": (
        _STATUS,
        [_P(FlatrayLens), _STACK_P, _P(FlatrayLens), ctypes.c_double, ctypes.c_double,
         ctypes.c_uint32, ctypes.c_uint32, _P(ctypes.c_double), _P(ctypes.c_double)],
    ),
    "flatray_field_of_view": (
        _STATUS,
        [_P(FlatrayLens), _STACK_P, ctypes.c_uint32, ctypes.c_uint32, _P(ctypes.c_double),
         _P(ctypes.c_double)],
    ),
    "flatray_camera_view": (
        _STATUS,
        [_P(FlatrayLens), _STACK_P, ctypes.c_uint32, ctypes.c_uint32, _P(FlatrayCameraView)],
    ),
    "flatray_stereo_triangulate": (
        _STATUS,
        [_P(FlatrayLens), _STACK_P, _P(FlatrayLens), _STACK_P, _P(ctypes.c_double),
         ctypes.c_double, ctypes.c_double, ctypes.c_double, ctypes.c_double, _P(_VEC),
         _P(ctypes.c_double)],
    ),
    "flatray_version": (ctypes.c_char_p, []),
    "flatray_status_message": (ctypes.c_char_p, [ctypes.c_int32]),
}


def library_file_names() -> list[str]:
    """File names the shared library has on this platform."""
    if sys.platform == "win32":
        return ["flatray.dll"]
    if sys.platform == "darwin":
        return ["libflatray.dylib"]
    return ["libflatray.so"]


def repository_candidates(package_dir: Path | None = None) -> Iterator[Path]:
    """The repository build outputs, release before debug."""
    package_dir = Path(__file__).resolve().parent if package_dir is None else Path(package_dir)
    root = package_dir.parent.parent.parent  # bindings/python/flatray -> repository
    for profile in ("release", "debug"):
        for name in library_file_names():
            yield root / "target" / profile / name


def find_library(environ: Mapping[str, str] | None = None,
                 package_dir: Path | None = None) -> str:
    """Path (or loader name) of the flatray shared library.

    Raises:
        LibraryLoadError: ``FLATRAY_LIBRARY`` names no file, or nothing was found.
    """
    environ = os.environ if environ is None else environ
    override = environ.get(ENV_VAR, "")
    if override:
        if not Path(override).is_file():
            raise LibraryLoadError(
                f"{ENV_VAR}={override!r} is not an existing file; set {ENV_VAR} to the "
                f"full path of the flatray shared library (e.g. .../target/release/"
                f"{library_file_names()[0]}), or unset it to search the repository's target/"
            )
        return str(Path(override).resolve())
    tried = []
    for candidate in repository_candidates(package_dir):
        tried.append(str(candidate))
        if candidate.is_file():
            return str(candidate)
    found = ctypes.util.find_library("flatray")
    if found:
        return found
    raise LibraryLoadError(
        "cannot find the flatray shared library. Build it with `cargo build --release` in "
        f"the repository, or set {ENV_VAR} to the library's full path. Looked in: "
        + ", ".join(tried) + ", and the system loader (find_library('flatray'))."
    )


def declare(lib: ctypes.CDLL) -> ctypes.CDLL:
    """Set ``restype`` and ``argtypes`` of every ABI function on ``lib``."""
    for name, (restype, argtypes) in PROTOTYPES.items():
        try:
            function = getattr(lib, name)
        except AttributeError as exc:
            raise LibraryLoadError(
                f"the library {getattr(lib, '_name', lib)!r} has no function {name}: it is "
                f"not a flatray build of ABI version 1 (check {ENV_VAR})"
            ) from exc
        function.restype = restype
        function.argtypes = argtypes
    return lib


def check_version(found: str, path: str, expected: str = __version__) -> None:
    """Fail clearly when the library's version differs from the package's."""
    if found != expected:
        raise LibraryLoadError(
            f"the flatray library {path!r} is version {found!r} but the Python package "
            f"flatray is {expected!r}; rebuild the library from the same checkout or point "
            f"{ENV_VAR} at a matching build"
        )


def load(path: str | None = None) -> ctypes.CDLL:
    """Load, declare and version-check the library (found by :func:`find_library`)."""
    path = find_library() if path is None else path
    try:
        lib = ctypes.CDLL(path)
    except OSError as exc:
        raise LibraryLoadError(
            f"cannot load the flatray library {path!r}: {exc} (check {ENV_VAR})"
        ) from exc
    declare(lib)
    version = lib.flatray_version()
    check_version(version.decode("ascii", "replace") if version else "", path)
    return lib


#: Where the library was loaded from.
library_path: str = find_library()
#: The loaded library: a ``ctypes.CDLL`` with every prototype declared (the raw C API).
lib: ctypes.CDLL = load(library_path)


def status_message(status: int) -> str:
    """The library's message for a status code (also for unknown codes)."""
    return lib.flatray_status_message(int(status)).decode("utf-8", "replace")


def check(status: int, function: str, index: int | None = None) -> None:
    """Raise the exception of ``status`` unless it is ``FLATRAY_OK``."""
    if status != 0:
        raise error_for(status, status_message(status), function=function, index=index)
