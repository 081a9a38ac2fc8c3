"""Deviation surveys: read from CSV or LAS, validate, and tie in to the log depths.

CSV layout (our own; see :mod:`satheight.io.table` for comments and units rows)::

    # survey of A-2 (MD below the log depth reference)
    MD [m],INC [deg],AZI [deg]
    0,0,0
    500,0.5,120
    ...

* Columns, matched by name case-insensitively: measured depth ``MD`` (or ``DEPTH``,
  ``DEPT``), inclination ``INC`` (or ``INCL``, ``INCLINATION``, ``DEVI``), azimuth
  ``AZI`` (or ``AZIM``, ``AZIMUTH``, ``HAZI``). Other columns are ignored.
* Optional tie-in columns ``TVD``, ``NORTH`` (or ``N``) and ``EAST`` (or ``E``): only
  their value on the **first** row is used, as the position of the first station
  (TVD below the log depth reference, positive down; offsets from the well head).
  Later rows are not read (they may hold your own computed values).
* Units: MD needs a length unit (``m`` or ``ft``) in the header (``MD [ft]``) or a
  units row; angles default to degrees (``deg``; ``rad`` accepted); tie-in columns
  default to the MD unit.
* MD is measured from the same depth reference as the logs (KB, drill floor or
  ground level), positive down.

A LAS file may hold a survey instead: depth index = MD, and curves found by the
same names (``INC``/``INCL``/``DEVI``, ``AZI``/``AZIM``/``HAZI``, optional ``TVD``,
``NORTH``, ``EAST``); angle units from the curve units (blank = degrees).

Validation (every error names the file and the line or depth):
strictly increasing MD >= 0, inclination in [0, 180] degrees, azimuth in [0, 360]
degrees, no missing values.

Tie-in rule (:func:`survey_trajectory`): the first station must be at or above
the first log sample. Its position is the given tie-in (TVD, NORTH, EAST columns)
if any; else (0, 0, 0) when it is at MD 0; else a vertical station at MD 0 is
added above it (the hole is assumed to start vertical at the depth reference and
bend by minimum curvature to the first station) and a warning says so.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from .. import units as U
from ..errors import DepthError, InputFileError, UnitError
from ..trajectory import Trajectory, minimum_curvature
from .las import read_las
from .table import read_table

__all__ = ["Survey", "read_survey", "survey_trajectory", "SURVEY_FORMATS"]

MD_NAMES = ("MD", "DEPTH", "DEPT", "MEASURED DEPTH")
INC_NAMES = ("INC", "INCL", "INCLINATION", "DEVI")
AZI_NAMES = ("AZI", "AZIM", "AZIMUTH", "HAZI")
TVD_NAMES = ("TVD",)
NORTH_NAMES = ("NORTH", "N")
EAST_NAMES = ("EAST", "E")

#: Survey file formats and the file endings that select them.
SURVEY_FORMATS = {"csv": (".csv", ".txt"), "las": (".las",)}


@dataclass
class Survey:
    """A validated deviation survey, SI.

    Attributes
    ----------
    md : numpy.ndarray
        Station measured depths [m], strictly increasing, >= 0.
    inc, azi : numpy.ndarray
        Inclination [rad] in [0, pi] and azimuth [rad] in [0, 2 pi].
    tie_in : tuple[float, float, float] or None
        ``(tvd, north, east)`` [m] of the first station if the file gives it.
    source : pathlib.Path
    labels : list[str]
        Where each station is in the file (``"line 7"``, ``"MD 1200 m"``), for messages.
    warnings : list[str]
    md_unit : str
        The file's MD unit (``"m"``, ``"ft"``...): messages show MDs in it, as read.
    """

    md: np.ndarray
    inc: np.ndarray
    azi: np.ndarray
    tie_in: tuple[float, float, float] | None
    source: Path
    labels: list[str]
    warnings: list[str] = field(default_factory=list)
    md_unit: str = "m"


def _format_of(path: Path, fmt: str | None) -> str:
    if fmt is not None:
        f = fmt.strip().lower()
        if f not in SURVEY_FORMATS:
            raise InputFileError(f"unknown survey format {fmt!r}", where=str(path),
                                 hint="use " + " or ".join(repr(k) for k in SURVEY_FORMATS))
        return f
    suffix = path.suffix.lower()
    for f, endings in SURVEY_FORMATS.items():
        if suffix in endings:
            return f
    raise InputFileError(f"cannot tell the survey format from the file ending {suffix!r}",
                         where=str(path), hint='name it .csv or .las, or give survey_format = "csv"')


def _unit_factor(unit: str, kind: str, where: str, column: str, default: str | None) -> float:
    u = unit.strip()
    if not u:
        if default is None:
            raise InputFileError(f"column {column!r} has no unit", where=where,
                                 hint=f"write it as '{column} [m]' or '{column} [ft]' in the header")
        u = default
    try:
        return U.factor(u, kind)
    except UnitError as exc:
        raise InputFileError(f"column {column!r}: {exc.what}", where=where, hint=exc.hint) from None


def _validate(md, inc, azi, source: Path, labels: list[str], md_unit: str = "m") -> None:
    """Refuse missing, negative, unordered or out-of-range stations; MDs shown in ``md_unit``."""
    def at(mask):
        return labels[int(np.argmax(mask))]

    for arr, name in ((md, "MD"), (inc, "inclination"), (azi, "azimuth")):
        bad = ~np.isfinite(arr)
        if np.any(bad):
            raise InputFileError(f"survey {name} is missing", where=f"{source}, {at(bad)}",
                                 hint="every station needs MD, inclination and azimuth")
    if np.any(md < 0):
        raise DepthError("survey MD is negative", where=f"{source}, {at(md < 0)}",
                         hint="MD is measured down from the log depth reference and is >= 0")
    if md.size >= 2:
        bad = np.r_[False, ~(np.diff(md) > 0)]
        if np.any(bad):
            k = int(np.argmax(bad))
            a, b = (_shown_md(v, md_unit) for v in (md[k - 1], md[k]))
            raise DepthError(f"survey MD does not increase ({a} at {labels[k - 1]} "
                             f"then {b})", where=f"{source}, {labels[k]}",
                             hint="stations must be in order of strictly increasing MD, without repeats")
    tol = 1e-9
    bad = (inc < -tol) | (inc > math.pi + tol)
    if np.any(bad):
        k = int(np.argmax(bad))
        raise InputFileError(f"inclination {math.degrees(inc[k]):g} deg is outside 0 to 180 deg",
                             where=f"{source}, {labels[k]}",
                             hint="inclination is measured from vertical: 0 down, 90 horizontal")
    bad = (azi < -tol) | (azi > 2 * math.pi + tol)
    if np.any(bad):
        k = int(np.argmax(bad))
        raise InputFileError(f"azimuth {math.degrees(azi[k]):g} deg is outside 0 to 360 deg",
                             where=f"{source}, {labels[k]}",
                             hint="azimuth is measured clockwise from north, 0 to 360 deg")


def _shown_md(md_si: float, unit: str) -> str:
    """An MD [m] as text in the file's unit ``unit``, as read (``"6600 ft"``)."""
    return f"{float(U.from_si(md_si, unit, 'length')):g} {unit}"


def _read_csv(path: Path) -> Survey:
    t = read_table(path, "survey")
    idx = {}
    for key, names in (("md", MD_NAMES), ("inc", INC_NAMES), ("azi", AZI_NAMES)):
        i = t.find(names)
        if i is None:
            raise InputFileError(f"the survey has no {key.upper()} column (looked for "
                                 + ", ".join(names) + f"; found {', '.join(t.original)})",
                                 where=f"{path}, line {t.header_line}",
                                 hint="name the columns e.g. 'MD [m],INC [deg],AZI [deg]'")
        idx[key] = i
    where_h = f"{path}, line {t.header_line}"
    md_unit = t.units[idx["md"]].strip()
    f_md = _unit_factor(md_unit, "length", where_h, t.original[idx["md"]], None)
    f_inc = _unit_factor(t.units[idx["inc"]], "angle", where_h, t.original[idx["inc"]], "deg")
    f_azi = _unit_factor(t.units[idx["azi"]], "angle", where_h, t.original[idx["azi"]], "deg")
    md = t.numbers(idx["md"]) * f_md
    inc = t.numbers(idx["inc"]) * f_inc
    azi = t.numbers(idx["azi"]) * f_azi
    labels = [f"line {n}" for n in t.lines]
    tie = None
    cols = [t.find(n) for n in (TVD_NAMES, NORTH_NAMES, EAST_NAMES)]
    if any(c is not None for c in cols):
        vals = []
        for c in cols:
            if c is None:
                vals.append(0.0)
                continue
            f = _unit_factor(t.units[c], "length", where_h, t.original[c], md_unit)
            cell = t.rows[0][c].strip()
            if not cell:
                raise InputFileError(f"tie-in column {t.original[c]!r} is empty on the first station",
                                     where=f"{path}, line {int(t.lines[0])}",
                                     hint="give the first station's TVD (and NORTH, EAST), or remove the column")
            vals.append(t.first_number(c) * f)          # later rows are not read
        tie = (vals[0], vals[1], vals[2])
    _validate(md, inc, azi, path, labels, md_unit)
    return Survey(md=md, inc=inc, azi=azi, tie_in=tie, source=path, labels=labels, md_unit=md_unit)


def _read_las_survey(path: Path) -> Survey:
    well = read_las(path)
    mnems = {m.upper(): m for m in well.curves}

    def find(names):
        for n in names:
            if n in mnems:
                return well.curves[mnems[n]]
        return None

    inc_c, azi_c = find(INC_NAMES), find(AZI_NAMES)
    for c, key, names in ((inc_c, "inclination", INC_NAMES), (azi_c, "azimuth", AZI_NAMES)):
        if c is None:
            raise InputFileError(f"the survey LAS file has no {key} curve (looked for "
                                 + ", ".join(names) + ")", where=str(path),
                                 hint="name the curve " + names[0])
    depth_unit = well.depth_unit
    labels = [f"MD {d:g} {depth_unit}" for d in U.from_si(well.md, depth_unit, "length")]

    def angle(c):
        try:
            return c.data * U.factor(c.unit.strip() or "deg", "angle")
        except UnitError as exc:
            raise InputFileError(f"curve {c.mnemonic}: {exc.what}", where=str(path), hint=exc.hint) from None

    tie = None
    tcs = [find(n) for n in (TVD_NAMES, NORTH_NAMES, EAST_NAMES)]
    if any(c is not None for c in tcs):
        vals = []
        for c in tcs:
            if c is None:
                vals.append(0.0)
                continue
            try:
                v = float(U.to_si(c.data[0], c.unit.strip() or depth_unit, "length"))
            except UnitError as exc:
                raise InputFileError(f"curve {c.mnemonic}: {exc.what}", where=str(path), hint=exc.hint) from None
            if not math.isfinite(v):
                raise InputFileError(f"tie-in curve {c.mnemonic} is missing at the first station",
                                     where=f"{path}, {labels[0]}",
                                     hint="give the first station's TVD (and NORTH, EAST)")
            vals.append(v)
        tie = (vals[0], vals[1], vals[2])
    md, inc, azi = well.md.copy(), angle(inc_c), angle(azi_c)
    _validate(md, inc, azi, path, labels, depth_unit)
    return Survey(md=md, inc=inc, azi=azi, tie_in=tie, source=path, labels=labels,
                  warnings=list(well.warnings), md_unit=depth_unit)


def read_survey(path, fmt: str | None = None) -> Survey:
    """Read and validate a deviation survey (CSV or LAS; layout in the module docstring).

    Parameters
    ----------
    path : str or pathlib.Path
        The survey file; only read.
    fmt : {"csv", "las"}, optional
        File format; by default from the file ending (.csv/.txt or .las).

    Returns
    -------
    Survey
        MD [m], inclination and azimuth [rad], optional tie-in [m].

    Raises
    ------
    InputFileError, DepthError
        Unreadable file, missing columns or units, bad or out-of-range values,
        non-increasing MD; the message names the file and the line (CSV) or MD (LAS).
    """
    p = Path(path)
    f = _format_of(p, fmt)
    return _read_csv(p) if f == "csv" else _read_las_survey(p)


def survey_trajectory(survey: Survey, log_top_md: float | None = None,
                      log_source: str | None = None, log_unit: str = "m") -> Trajectory:
    """Minimum-curvature trajectory of a survey, tied in by the rule of the module docstring.

    Parameters
    ----------
    survey : Survey
    log_top_md : float, optional
        MD of the first log sample [m]; the first station must be at or above it.
    log_source : str, optional
        The log file, named in the error.
    log_unit : str
        The log file's depth unit: the error shows the log's MD in it, the survey's MD in
        the survey's own unit (each as read).

    Returns
    -------
    Trajectory
        With the added vertical station at MD 0 when one was needed.

    Raises
    ------
    DepthError
        If the first station lies below the first log sample.

    Warns
    -----
    UserWarning
        When a vertical station at MD 0 is added.
    """
    md, inc, azi = survey.md, survey.inc, survey.azi
    if log_top_md is not None and math.isfinite(log_top_md) and md[0] > log_top_md + 1e-6:
        raise DepthError(f"the survey starts at MD {_shown_md(md[0], survey.md_unit)}, below the "
                         f"first log sample at MD {_shown_md(log_top_md, log_unit)}"
                         + (f" of {log_source}" if log_source else ""),
                         where=str(survey.source),
                         hint="add survey stations up to the top of the log (or to MD 0)")
    tie = survey.tie_in
    if tie is None:
        tie = (0.0, 0.0, 0.0)
        if md[0] > 0:
            md = np.r_[0.0, md]
            inc = np.r_[0.0, inc]
            azi = np.r_[azi[0], azi]
            warnings.warn(f"{survey.source}: the survey starts at MD "
                          f"{_shown_md(survey.md[0], survey.md_unit)} without a "
                          "tie-in (TVD, NORTH, EAST): a vertical station at MD 0 was added above it",
                          stacklevel=2)
    return minimum_curvature(md, inc, azi, tie_in=tie, source=str(survey.source))
