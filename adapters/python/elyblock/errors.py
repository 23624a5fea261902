"""Status values of the C interface and the exceptions that carry them.

Every call into the library that fails raises an ``ElyError`` subclass chosen by the frozen
status value, with the library's message (``ely_last_error``) as its text. Classes that
mean the same as a built-in exception also derive from it (a bad value is a ``ValueError``,
an unknown variable a ``KeyError``, an unreadable file an ``OSError``), so callers may catch
either.
"""
import enum


class Status(enum.IntEnum):
    """The status values of ``elyblock.h`` (frozen: a value never changes its meaning)."""

    OK = 0
    WARNING = 1
    PARTIAL = 2
    INVALID_ARGUMENT = -1
    OUT_OF_RANGE = -2
    CONFIG = -3
    INFEASIBLE = -4
    NO_CONVERGENCE = -5
    UNKNOWN_NAME = -6
    WRONG_STATE = -7
    IO = -8
    BUFFER_TOO_SMALL = -9
    CANCELLED = -10
    OUT_OF_MEMORY = -11
    INTERNAL = -12


class ElyError(Exception):
    """A call into the library failed. ``status`` is the library's status value (< 0) and
    ``message`` its message naming the problem."""

    status = None

    def __init__(self, message, status=None):
        super().__init__(message)
        self.message = message
        if status is not None:
            self.status = status

    def __str__(self):
        return self.message


class InvalidArgumentError(ElyError, ValueError):
    """NaN, infinity, a negative size, a value outside a variable's limits..."""
    status = Status.INVALID_ARGUMENT


class OutOfRangeError(ElyError, ValueError):
    """The operating point is outside a correlation's or the model's envelope."""
    status = Status.OUT_OF_RANGE


class ConfigError(ElyError, ValueError):
    """The plant description does not parse or validate (the message names the JSON path)."""
    status = Status.CONFIG


class InfeasibleError(ElyError):
    """No state within the plant's limits meets the spec (e.g. more power than the stacks take)."""
    status = Status.INFEASIBLE


class NoConvergenceError(ElyError):
    """An iterative solve missed its tolerance."""
    status = Status.NO_CONVERGENCE


class UnknownNameError(ElyError, KeyError):
    """No variable of that name in this block."""
    status = Status.UNKNOWN_NAME


class WrongStateError(ElyError):
    """A call out of the life-cycle order, e.g. reading an output before a solve."""
    status = Status.WRONG_STATE


class FileError(ElyError, OSError):
    """A plant file could not be read."""
    status = Status.IO


class BufferTooSmallError(ElyError):
    status = Status.BUFFER_TOO_SMALL


class CancelledError(ElyError):
    """A progress callback asked to stop a long call. ``result`` holds what was done: the
    points solved before the stop, NaN and status CANCELLED for the others."""
    status = Status.CANCELLED

    def __init__(self, message, status=None, result=None):
        super().__init__(message, status)
        self.result = result


class OutOfMemoryError(ElyError, MemoryError):
    status = Status.OUT_OF_MEMORY


class InternalError(ElyError):
    """A bug in the library: please report it with the message."""
    status = Status.INTERNAL


class ElyWarning(UserWarning):
    """A solve succeeded with an alarm or an extrapolation flag raised (status WARNING), or a
    batch finished with some points failed (status PARTIAL)."""


class AbiMismatchError(ImportError):
    """The library found is of another binary interface than this package."""


_BY_STATUS = {cls.status: cls for cls in (
    InvalidArgumentError, OutOfRangeError, ConfigError, InfeasibleError, NoConvergenceError,
    UnknownNameError, WrongStateError, FileError, BufferTooSmallError, CancelledError,
    OutOfMemoryError, InternalError)}


def error_for(status, message):
    """The exception for a failed call's status (a status unknown to this package gives a
    plain ElyError with that status)."""
    return _BY_STATUS.get(status, ElyError)(message, status)
