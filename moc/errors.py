"""Specific exceptions of `moc`.

Every error carries one sentence a user can act on: what was wrong and what is
allowed.  The command line prints that sentence and exits with status 2 for
bad input (`InputError` and its subclasses) or 1 for a failure of the
computation (`ComputationError`).
"""


class MocError(Exception):
    """Base class of every error raised on purpose by `moc`."""


class InputError(MocError, ValueError):
    """The user's input is outside what the tool accepts (exit status 2)."""


class GammaError(InputError):
    """The ratio of specific heats is not a finite number above 1."""


class MachError(InputError):
    """A Mach number is outside the range a relation accepts."""


class NonFiniteError(InputError):
    """An input is NaN or infinite."""


class PrandtlMeyerError(InputError):
    """A Prandtl-Meyer angle is negative or beyond nu_max."""


class DetachedShockError(InputError):
    """A deflection exceeds theta_max: no attached oblique shock exists."""


class CaseFileError(InputError):
    """A case file is unreadable, has an unknown key or a bad value."""


class ResultFileError(InputError):
    """A saved result is missing, damaged, or from an incompatible version."""


class ContourError(InputError):
    """A wall contour given for analysis is not usable (names the point at fault)."""


class ExportError(InputError):
    """An export request is not possible (unknown format, unit, tolerance...)."""


class FileExistsRefusal(InputError):
    """A file would be overwritten without --force."""


class ComputationError(MocError, RuntimeError):
    """The computation itself failed (exit status 1): the message says where."""
