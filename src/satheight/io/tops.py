"""Formation tops per well from a CSV file.

Layout (our own; comments and units rows as in :mod:`satheight.io.table`)::

    # zone tops of the field
    well,zone,top [m],base [m],depth
    A-1,Upper,2010.5,2120.0,MD
    A-2,Upper,2035.0,2118.0,TVDSS

* ``well``: the well's ``name`` in the project file, or its LAS file name without
  the ending (``A-1`` for ``A-1.las``).
* ``zone``: a zone name of the project file (exact spelling).
* ``top``, ``base``: the zone window, top above base. A length unit in the header
  (``top [ft]``) or a units row; a bare column takes the project's length unit.
* ``depth`` (optional column, default ``MD``): ``MD`` (measured depth along the
  hole from the log depth reference) or ``TVDSS`` (true vertical depth below the
  datum, positive down). MD tops are turned into TVDSS through the well's
  trajectory.
* One row per well and zone; repeats are errors.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from .. import units as U
from ..errors import InputFileError, UnitError
from .table import read_table

__all__ = ["TopRow", "read_tops", "DEPTH_TYPES"]

#: Depth references a top may be given in.
DEPTH_TYPES = ("MD", "TVDSS")


@dataclass(frozen=True)
class TopRow:
    """One zone window of one well.

    Attributes
    ----------
    well, zone : str
    top, base : float
        Zone window [m], top < base, in ``depth_type``.
    depth_type : str
        ``"MD"`` or ``"TVDSS"`` (both positive down).
    line : int
        File line of the row.
    """

    well: str
    zone: str
    top: float
    base: float
    depth_type: str
    line: int


def read_tops(path, default_unit: str = "m") -> list[TopRow]:
    """Read a tops CSV (layout in the module docstring).

    Parameters
    ----------
    path : str or pathlib.Path
    default_unit : str
        Length unit of top/base columns without one (the project's length unit).

    Returns
    -------
    list[TopRow]
        Depths in metres.

    Raises
    ------
    InputFileError
        Missing columns, unknown units, empty or non-numeric cells, unknown depth
        type, top not above base, a well and zone given twice; names file and line.
    """
    p = Path(path)
    t = read_table(p, "tops")
    cols = {}
    for key in ("WELL", "ZONE", "TOP", "BASE"):
        i = t.find((key,))
        if i is None:
            raise InputFileError(f"the tops file has no {key.lower()!r} column (found "
                                 f"{', '.join(t.original)})", where=f"{p}, line {t.header_line}",
                                 hint="the header must be: well,zone,top [m],base [m] and optionally depth")
        cols[key] = i
    dcol = t.find(("DEPTH", "DEPTH_TYPE", "REFERENCE"))
    factors = []
    for key in ("TOP", "BASE"):
        i = cols[key]
        try:
            factors.append(U.factor(t.units[i] or default_unit, "length"))
        except UnitError as exc:
            raise InputFileError(f"column {t.original[i]!r}: {exc.what}",
                                 where=f"{p}, line {t.header_line}", hint=exc.hint) from None
    tops = t.numbers(cols["TOP"]) * factors[0]
    bases = t.numbers(cols["BASE"]) * factors[1]
    out: list[TopRow] = []
    seen: dict[tuple[str, str], int] = {}
    for k, row in enumerate(t.rows):       # one row per well and zone: a short table
        line = int(t.lines[k])
        where = f"{p}, line {line}"
        well, zone = row[cols["WELL"]].strip(), row[cols["ZONE"]].strip()
        if not well or not zone:
            raise InputFileError("the well or zone name is empty", where=where,
                                 hint="every row names its well and zone")
        kind = row[dcol].strip().upper() if dcol is not None else ""
        kind = kind or "MD"
        if kind not in DEPTH_TYPES:
            raise InputFileError(f"depth type {row[dcol].strip()!r} is not MD or TVDSS", where=where,
                                 hint="write MD (measured depth) or TVDSS (true vertical depth below datum)")
        if not tops[k] < bases[k]:
            raise InputFileError(f"top {row[cols['TOP']].strip()} is not above base "
                                 f"{row[cols['BASE']].strip()} ({kind}, positive down)", where=where,
                                 hint="top must be the smaller depth")
        if (well, zone) in seen:
            raise InputFileError(f"well {well!r}, zone {zone!r} is given twice (also on line "
                                 f"{seen[(well, zone)]})", where=where, hint="keep one row per well and zone")
        seen[(well, zone)] = line
        out.append(TopRow(well=well, zone=zone, top=float(tops[k]), base=float(bases[k]),
                          depth_type=kind, line=line))
    return out
