"""Read formation-pressure points from a CSV file of our own layout.

Layout (comma separated, UTF-8, one header row; lines starting with ``#`` are
comments; column names are case-insensitive and carry their unit in brackets):

.. code-block:: text

    # pressure points of the demo field (invented)
    well,tvdss [m],pressure [bar],fluid,quality,zone
    VANTREL-1,2050.0,214.3,oil,good,Upper Sand
    VANTREL-2,,221.9,water,fair,Upper Sand        <- needs an md column instead

| column | required | meaning |
|---|---|---|
| ``well`` | yes | well name |
| ``tvdss [unit]`` | one of the two | true vertical depth below the datum, positive down (m or ft) |
| ``md [unit]`` | one of the two | measured depth; turned into TVDSS with the well's datum elevation (vertical wells) or survey when TVDSS is blank; a point whose well has neither is skipped with a note |
| ``pressure [unit]`` | yes | formation pressure (psi, psia, bar, kPa, MPa, Pa); gauge and absolute are not told apart: use one kind in a file |
| ``fluid`` | yes | ``water``, ``oil``, ``gas`` or ``unknown`` (the mobile fluid of the sample or gradient) |
| ``quality`` | no | ``good``, ``fair``, ``poor`` or ``bad``; by default good and fair points are fitted; without the column every point is taken as good (a note says so) |
| ``zone`` | no | zone (pressure compartment) name; points are fitted per zone |

Every value is checked; errors name the file, the line and the column.
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import numpy as np

from ..errors import InputFileError, UnitError
from ..pressures import PressurePoints
from ..units import factor
from .table import csv_cells, parse_number, read_csv_text

FLUIDS = ("water", "oil", "gas", "unknown")
QUALITIES = ("good", "fair", "poor", "bad")

_HEADER = re.compile(r"^\s*([A-Za-z_]+)\s*(?:\[\s*([^\]]*)\s*\])?\s*$")


def read_pressure_points(path) -> PressurePoints:
    """Read a pressure-points CSV (layout in the module docstring).

    Parameters
    ----------
    path : str or pathlib.Path

    Returns
    -------
    PressurePoints
        Depths [m], pressures [Pa]; the file is only read.

    Raises
    ------
    InputFileError
        Missing or unreadable file, missing column, unknown unit, bad number,
        unknown fluid or quality word: the message names file, line and column.
    """
    p = Path(path)
    text = read_csv_text(p, "pressure")
    rows = [(lineno, raw) for lineno, raw in enumerate(text.splitlines(), start=1)
            if raw.strip() and not raw.lstrip().startswith("#")]
    if not rows:
        raise InputFileError("the pressure file has no header row", where=str(p),
                             hint="the first non-comment line names the columns: "
                                  "well,tvdss [m],pressure [psi],fluid[,quality][,zone]")
    header_line, header_text = rows[0]
    where = f"{p}, line {header_line}"
    header = csv_cells(header_text, where)
    cols = _columns(header, where)
    factors = {"pressure": _unit_factor(cols, "pressure", "pressure", where)}
    for col in ("tvdss", "md"):
        factors[col] = _unit_factor(cols, col, "length", where) if col in cols else None

    out = {k: [] for k in ("well", "tvdss", "md", "pressure", "fluid", "quality", "zone", "line")}
    for lineno, raw in rows[1:]:
        values = _read_row(csv_cells(raw, f"{p}, line {lineno}"), len(header), cols, factors,
                           f"{p}, line {lineno}")
        for k, v in zip(out, (*values, lineno)):
            out[k].append(v)
    if not out["line"]:
        raise InputFileError("the pressure file has a header but no data rows", where=str(p))
    notes = [] if "quality" in cols else [f"{p.name}: no quality column: every point is "
                                          "taken as good and fitted"]
    return PressurePoints(source=p, well=np.array(out["well"], dtype=object),
                          tvdss=np.array(out["tvdss"], float), md=np.array(out["md"], float),
                          pressure=np.array(out["pressure"], float),
                          fluid=np.array(out["fluid"], dtype=object),
                          quality=np.array(out["quality"], dtype=object),
                          zone=np.array(out["zone"], dtype=object),
                          line=np.array(out["line"], dtype=np.int64), notes=notes)


def _columns(header: list[str], where: str) -> dict[str, tuple[int, str]]:
    """Column name -> (position, unit text) from the header cells; checks the required ones."""
    cols: dict[str, tuple[int, str]] = {}
    for i, h in enumerate(header):
        m = _HEADER.match(h)
        if not m:
            raise InputFileError(f"column title {h!r} is not 'name' or 'name [unit]'",
                                 where=where, hint="e.g. tvdss [m] or pressure [psi]")
        name = m.group(1).lower()
        if name in cols:
            raise InputFileError(f"column {name!r} appears twice", where=where)
        cols[name] = (i, (m.group(2) or "").strip())
    for need in ("well", "pressure", "fluid"):
        if need not in cols:
            raise InputFileError(f"column {need!r} is missing (found: {', '.join(cols)})",
                                 where=where,
                                 hint="columns: well, tvdss [unit] or md [unit], "
                                      "pressure [unit], fluid, optional quality and zone")
    if "tvdss" not in cols and "md" not in cols:
        raise InputFileError("no depth column: give tvdss [unit] or md [unit]", where=where)
    return cols


def _unit_factor(cols, col: str, kind: str, where: str) -> float:
    """SI factor of a column's unit (``kind``: "pressure" or "length")."""
    unit = cols[col][1]
    if not unit:
        raise InputFileError(f"column {col!r} has no unit", where=where,
                             hint=f"write it as {col} [unit], e.g. "
                                  + ("pressure [psi]" if kind == "pressure" else f"{col} [m]"))
    try:
        return factor(unit, kind)
    except UnitError as exc:
        raise InputFileError(f"column {col!r}: {exc.what}", where=where, hint=exc.hint) from None


def _read_row(cells: list[str], n_columns: int, cols, factors, where: str) -> tuple:
    """(well, tvdss [m], md [m], pressure [Pa], fluid, quality, zone) of one data row."""
    if len(cells) > n_columns:
        raise InputFileError(f"{len(cells)} cells but {n_columns} columns", where=where,
                             hint="check for a stray comma")
    cells = cells + [""] * (n_columns - len(cells))

    def cell(col):
        return cells[cols[col][0]].strip() if col in cols else ""

    def number(col, required):
        t = cell(col)
        if t == "" or factors[col] is None:
            if required:
                raise InputFileError(f"column {col!r} is empty", where=where)
            return math.nan
        v = parse_number(t, f"column {col!r}:", where)
        if not math.isfinite(v * factors[col]):
            raise InputFileError(f"column {col!r}: {t!r} is too large after unit conversion",
                                 where=where, hint="check the number and the column's unit")
        return v * factors[col]

    well = cell("well")
    if not well:
        raise InputFileError("column 'well' is empty", where=where)
    tvd, md = number("tvdss", False), number("md", False)
    if math.isnan(tvd) and math.isnan(md):
        raise InputFileError("no depth: tvdss and md are both empty", where=where,
                             hint="give the point's TVDSS or MD")
    pres = number("pressure", True)
    if not pres > 0:
        raise InputFileError(f"pressure {cell('pressure')!r} is not positive", where=where)
    fluid = cell("fluid").lower()
    if fluid not in FLUIDS:
        raise InputFileError(f"fluid {cell('fluid')!r} is not known", where=where,
                             hint="use one of " + ", ".join(FLUIDS))
    qual = cell("quality").lower() if "quality" in cols else "good"
    if qual not in QUALITIES:
        raise InputFileError(f"quality {cell('quality')!r} is not known", where=where,
                             hint="use one of " + ", ".join(QUALITIES))
    return well, tvd, md, pres, fluid, qual, cell("zone")


def resolve_tvdss(points: PressurePoints, datum_elevation: dict) -> PressurePoints:
    """Fill TVDSS [m] of points given only by MD; skip, with a note, those that cannot be.

    A vertical well: ``TVDSS = MD - datum``; a deviated well: its MD -> TVDSS
    function (minimum curvature through its survey).

    Parameters
    ----------
    points : PressurePoints
        Not modified.
    datum_elevation : dict[str, float or callable]
        Well name -> elevation of the depth reference above the TVDSS datum [m], or
        a function MD [m] -> TVDSS [m] (array in, array out) for a deviated well.

    Returns
    -------
    PressurePoints
        A copy with every TVDSS filled; points of a well with only MD and no datum
        are left out and named (file and lines) in its ``notes``.

    Raises
    ------
    InputFileError
        No point is left (every point has only MD and no datum).
    """
    tvd = points.tvdss.copy()
    need = np.isnan(tvd)
    keep = np.ones(tvd.size, dtype=bool)
    notes = list(points.notes)
    for well in sorted(set(points.well[need])):
        m = need & (points.well == well)
        if well not in datum_elevation:
            keep &= ~m
            lines = ", ".join(str(int(x)) for x in points.line[m])
            notes.append(f"{points.source}, line(s) {lines}: point(s) of well {well!r} have only "
                         "MD and the well's datum elevation is unknown: skipped (give the tvdss "
                         "column, or a project file that has this well)")
            continue
        conv = datum_elevation[well]
        tvd[m] = conv(points.md[m]) if callable(conv) else points.md[m] - conv
    if not keep.any():
        raise InputFileError("every pressure point has only MD and no well datum to turn it "
                             "into TVDSS", where=str(points.source),
                             hint="give the tvdss column, or run with --project naming a "
                                  "project file that has these wells")
    return PressurePoints(points.source, points.well[keep], tvd[keep], points.md[keep],
                          points.pressure[keep], points.fluid[keep], points.quality[keep],
                          points.zone[keep], points.line[keep], notes)
