"""flatray: where objects really are when seen through flat refracting layers.

A ctypes binding of the flatray C library (ABI version 1). Units: metres and
radians everywhere; degrees only in helpers whose names end in ``_deg``.
Refractive indices are absolute (relative to vacuum).

Example:
    A stone seen from a drone 10 m above a lake::

        >>> import flatray
        >>> lake = flatray.Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
        >>> seen = flatray.apparent_position(lake, (0, 0, 10), (3, 0, -2))
        >>> back = flatray.true_position(lake, (0, 0, 10), seen)
        >>> [round(float(v), 9) for v in back]
        [3.0, 0.0, -2.0]

The raw C functions, with ``argtypes``/``restype`` declared, are attributes of
:data:`flatray.lib` (a ``ctypes.CDLL``).
"""

from ._version import __version__
from ._types import (
    MAX_LAYERS,
    FlatrayCameraView,
    FlatrayFresnel,
    FlatrayLens,
    FlatrayPath,
    FlatrayRay,
    FlatrayStack,
    FlatrayVec3,
    Image,
    Status,
)
from .errors import (
    BufferTooSmallError,
    DegenerateError,
    FlatrayError,
    InternalError,
    InvalidArgumentError,
    LibraryLoadError,
    MissesInterfaceError,
    NotConvergedError,
    NullPointerError,
    OutOfRangeError,
    TotalInternalReflectionError,
    WrongSideError,
)
from ._lib import ENV_VAR, check, lib, library_path, status_message
from .stack import Stack
from .interface import Fresnel, critical_angle, critical_angle_deg, fresnel, refract
from .path import Path, Traced, line_of_sight, trace
from .image import (
    apparent_depth,
    apparent_depth_deg,
    apparent_position,
    true_depth,
    true_depth_deg,
    true_position,
)
from .batch import (
    PathBatch,
    PointBatch,
    RayBatch,
    apparent_positions,
    lines_of_sight,
    trace_rays,
    true_positions,
)
from .media import (
    STANDARD_PRESSURE_PA,
    Air,
    Cauchy,
    FixedIndex,
    Footing,
    IndexResult,
    Material,
    Medium,
    PureWater,
    Seawater,
    Sellmeier,
    StackBuilder,
    air,
    as_medium,
    build_stack,
    cauchy,
    fixed_index,
    group_index_air,
    group_index_cauchy,
    group_index_material,
    group_index_pure_water,
    group_index_seawater,
    group_index_sellmeier,
    index_air,
    index_cauchy,
    index_material,
    index_pure_water,
    index_seawater,
    index_sellmeier,
    index_water_at_density,
    material_wavelength_range,
    pure_water,
    seawater,
    sellmeier,
)
from .survey import (
    CLEAR_WATER_NADIR_FACTOR,
    MultiviewBatch,
    Sensitivity,
    SurveyPoint,
    ValueBatch,
    correct_multiview,
    correct_multiview_shortcut,
    correct_multiviews,
    correct_range,
    correct_ranges,
    correction_factors,
    correction_factors_deg,
    triangulate,
    true_depths,
    true_position_covariance,
    true_position_sensitivity,
)
from . import camera
from .camera import (
    CameraView,
    Lens,
    PixelBatch,
    RemapError,
    StereoPoint,
    camera_view,
    field_of_view,
    field_of_view_deg,
    pixel_to_ray,
    pixels_to_rays,
    point_to_pixel,
    points_to_pixels,
    remap_error,
    remap_table,
    stereo_triangulate,
)


def library_version() -> str:
    """The loaded C library's version string (``flatray_version()``)."""
    return lib.flatray_version().decode("ascii")


__all__ = [
    "__version__", "MAX_LAYERS", "ENV_VAR", "lib", "library_path", "library_version",
    "check", "status_message",
    "FlatrayVec3", "FlatrayRay", "FlatrayStack", "FlatrayFresnel", "FlatrayPath",
    "Status", "Image",
    "FlatrayError", "NullPointerError", "InvalidArgumentError",
    "TotalInternalReflectionError", "MissesInterfaceError", "WrongSideError",
    "NotConvergedError", "OutOfRangeError", "BufferTooSmallError", "InternalError",
    "DegenerateError",
    "LibraryLoadError",
    "Stack", "Fresnel", "refract", "fresnel", "critical_angle", "critical_angle_deg",
    "Traced", "Path", "trace", "line_of_sight",
    "apparent_position", "true_position", "apparent_depth", "true_depth",
    "apparent_depth_deg", "true_depth_deg",
    "PointBatch", "RayBatch", "PathBatch", "true_positions", "apparent_positions",
    "lines_of_sight", "trace_rays",
    # Refractive indices and the stack builder (flatray.media).
    "STANDARD_PRESSURE_PA", "Material", "Footing", "IndexResult",
    "index_pure_water", "group_index_pure_water", "index_water_at_density",
    "index_seawater", "group_index_seawater", "index_air", "group_index_air",
    "index_material", "group_index_material", "material_wavelength_range",
    "index_sellmeier", "group_index_sellmeier", "index_cauchy", "group_index_cauchy",
    "Medium", "Air", "PureWater", "Seawater", "Sellmeier", "Cauchy", "FixedIndex",
    "air", "pure_water", "seawater", "sellmeier", "cauchy", "fixed_index", "as_medium",
    "StackBuilder", "build_stack",
    "CLEAR_WATER_NADIR_FACTOR", "SurveyPoint", "MultiviewBatch", "ValueBatch", "Sensitivity",
    "triangulate", "correct_multiview", "correct_multiview_shortcut", "correct_multiviews",
    "correct_range", "correct_ranges", "true_depths", "correction_factors",
    "correction_factors_deg", "true_position_sensitivity", "true_position_covariance",
    # Cameras behind a flat port (flatray.camera).
    "FlatrayLens", "FlatrayCameraView", "camera",
    "Lens", "CameraView", "PixelBatch", "RemapError", "StereoPoint",
    "pixel_to_ray", "point_to_pixel", "pixels_to_rays", "points_to_pixels",
    "remap_table", "remap_error", "field_of_view", "field_of_view_deg", "camera_view",
    "stereo_triangulate",
]
