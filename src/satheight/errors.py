"""One error family for the whole tool.

Every error is a :class:`ValueError` subclass whose message says *what* is wrong,
*where* (file, line, key or curve) and *what to do*. Library code raises; only the
command line turns an error into one printed line and an exit code.
"""

from __future__ import annotations


class SatHeightError(ValueError):
    """Base class of every error the tool raises on purpose.

    Parameters
    ----------
    what : str
        What is wrong, in one sentence.
    where : str, optional
        File, line, key or curve the problem was found at.
    hint : str, optional
        What the user can do about it.
    """

    exit_code = 2

    def __init__(self, what: str, where: str | None = None, hint: str | None = None):
        self.what = what
        self.where = where
        self.hint = hint
        parts = []
        if where:
            parts.append(f"{where}: ")
        parts.append(what)
        if hint:
            parts.append(f" ({hint})")
        super().__init__("".join(parts))


class InputFileError(SatHeightError):
    """A file cannot be found, read or parsed."""


class ProjectFileError(SatHeightError):
    """A project-file key is missing or holds a value that cannot be used."""


class UnitError(SatHeightError):
    """A unit is unknown or does not fit the quantity asked for."""


class MissingCurveError(SatHeightError):
    """A LAS file lacks a curve the job needs."""


class DepthError(SatHeightError):
    """Depths are not usable (non-monotonic, duplicated, out of range)."""


class ModelError(SatHeightError):
    """A J-Sw function is unknown, badly parametrised, or used before fitting."""


class NotFittedError(ModelError):
    """``predict`` was called on a model before ``fit``."""


class WellFailedError(SatHeightError):
    """One or more wells of a project could not be computed."""

    exit_code = 3


class OutputExistsError(SatHeightError):
    """The output folder already holds the results of an earlier run."""


class OutputWriteError(SatHeightError):
    """An output folder or file cannot be written (permissions, full disk, file-size limit)."""
