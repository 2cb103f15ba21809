"""Exceptions: one class per ``FlatrayStatus`` code, all under ``FlatrayError``."""

from __future__ import annotations

from ._types import Status


class LibraryLoadError(ImportError):
    """The flatray shared library could not be found, loaded, or does not match."""


class FlatrayError(Exception):
    """A flatray C function returned a status other than ``FLATRAY_OK``.

    Attributes:
        status: the :class:`Status` (a plain ``int`` for a code this package does
            not know).
        message: the library's own description (``flatray_status_message``).
        function: the C function that reported it, when known.
        index: for batch functions, the lowest index of a failing element.
    """

    code: Status | None = None

    def __init__(self, status, message: str, *, function: str | None = None,
                 index: int | None = None):
        try:
            self.status = Status(int(status))
        except ValueError:
            self.status = int(status)
        self.message = message
        self.function = function
        self.index = index
        super().__init__(self._describe())

    def _describe(self) -> str:
        name = self.status.c_name if isinstance(self.status, Status) else f"status {self.status}"
        text = f"{self.message} ({name})"
        if self.index is not None:
            text += f" at element {self.index}"
        if self.function:
            text = f"{self.function}: {text}"
        return text

    def __reduce__(self):
        return (_rebuild, (type(self), int(self.status), self.message, self.function, self.index))


def _rebuild(cls, status, message, function, index):
    return cls(status, message, function=function, index=index)


class NullPointerError(FlatrayError):
    """A required pointer was NULL (``FLATRAY_ERR_NULL_POINTER``)."""

    code = Status.NULL_POINTER


class InvalidArgumentError(FlatrayError):
    """NaN/inf, index or thickness <= 0, bad normal, unknown enum, too many layers,
    bad count (``FLATRAY_ERR_INVALID_ARGUMENT``)."""

    code = Status.INVALID_ARGUMENT


class TotalInternalReflectionError(FlatrayError):
    """No ray can cross an interface at this angle (``FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION``)."""

    code = Status.TOTAL_INTERNAL_REFLECTION


class MissesInterfaceError(FlatrayError):
    """A ray is parallel to or points away from the stack (``FLATRAY_ERR_MISSES_INTERFACE``)."""

    code = Status.MISSES_INTERFACE


class WrongSideError(FlatrayError):
    """A point is not where the stack says it must be (``FLATRAY_ERR_WRONG_SIDE``)."""

    code = Status.WRONG_SIDE


class NotConvergedError(FlatrayError):
    """An iterative solve did not reach its accuracy (``FLATRAY_ERR_NOT_CONVERGED``)."""

    code = Status.NOT_CONVERGED


class OutOfRangeError(FlatrayError):
    """Outside a model's range, or a result too large to represent (``FLATRAY_ERR_OUT_OF_RANGE``)."""

    code = Status.OUT_OF_RANGE


class BufferTooSmallError(FlatrayError):
    """An output buffer is too small (``FLATRAY_ERR_BUFFER_TOO_SMALL``)."""

    code = Status.BUFFER_TOO_SMALL


class InternalError(FlatrayError):
    """A caught panic inside the library: a bug (``FLATRAY_ERR_INTERNAL``)."""

    code = Status.INTERNAL


class DegenerateError(FlatrayError):
    """Geometry that fixes no answer: parallel lines of sight, a single view
    (``FLATRAY_ERR_DEGENERATE``)."""

    code = Status.DEGENERATE


#: The exception class raised for each non-OK status.
ERROR_CLASSES: dict[Status, type[FlatrayError]] = {
    cls.code: cls
    for cls in (
        NullPointerError,
        InvalidArgumentError,
        TotalInternalReflectionError,
        MissesInterfaceError,
        WrongSideError,
        NotConvergedError,
        OutOfRangeError,
        BufferTooSmallError,
        InternalError,
        DegenerateError,
    )
}


def error_for(status, message: str, *, function: str | None = None,
              index: int | None = None) -> FlatrayError:
    """The exception for a non-OK status: its subclass, or ``FlatrayError`` for
    a code this package does not know."""
    try:
        cls = ERROR_CLASSES.get(Status(int(status)), FlatrayError)
    except ValueError:
        cls = FlatrayError
    return cls(status, message, function=function, index=index)
