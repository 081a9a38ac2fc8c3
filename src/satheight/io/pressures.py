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
| ``md [unit]`` | one of the two | measured depth; turned into TVDSS with the well's datum elevation (vertical wells) when TVDSS is blank |
| ``pressure [unit]`` | yes | formation pressure (psi, psia, bar, kPa, MPa, Pa); gauge and absolute are not told apart: use one kind in a file |
| ``fluid`` | yes | ``water``, ``oil``, ``gas`` or ``unknown`` (the mobile fluid of the sample or gradient) |
| ``quality`` | yes | ``good``, ``fair``, ``poor`` or ``bad``; by default good and fair points are fitted |
| ``zone`` | no | zone (pressure compartment) name; points are fitted per zone |

Every value is checked; errors name the file, the line and the column.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from ..errors import InputFileError
from ..units import factor
from ..errors import UnitError
from .table import csv_cells, parse_number, read_csv_text

FLUIDS = ("water", "oil", "gas", "unknown")
QUALITIES = ("good", "fair", "poor", "bad")

_HEADER = re.compile(r"^\s*([A-Za-z_]+)\s*(?:\[\s*([^\]]*)\s*\])?\s*$")


@dataclass
class PressurePoints:
    """Pressure points in SI, one entry per data row.

    Attributes
    ----------
    source : pathlib.Path
    well, fluid, quality, zone : numpy.ndarray of str
        ``zone`` is ``""`` where the file has no zone column or a blank cell.
    tvdss : numpy.ndarray
        [m], NaN where only MD was given (see :func:`resolve_tvdss`).
    md : numpy.ndarray
        [m], NaN where not given.
    pressure : numpy.ndarray
        [Pa].
    line : numpy.ndarray of int
        Line number in the file (1-based) of each point, for messages.
    """

    source: Path
    well: np.ndarray
    tvdss: np.ndarray
    md: np.ndarray
    pressure: np.ndarray
    fluid: np.ndarray
    quality: np.ndarray
    zone: np.ndarray
    line: np.ndarray

    def __len__(self) -> int:
        return int(self.pressure.size)

    def subset(self, mask) -> "PressurePoints":
        """A new object with the points where ``mask`` is true."""
        m = np.asarray(mask, dtype=bool)
        return PressurePoints(self.source, self.well[m], self.tvdss[m], self.md[m],
                              self.pressure[m], self.fluid[m], self.quality[m], self.zone[m],
                              self.line[m])


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

    rows = []
    for lineno, raw in enumerate(text.splitlines(), start=1):
        if not raw.strip() or raw.lstrip().startswith("#"):
            continue
        rows.append((lineno, raw))
    if not rows:
        raise InputFileError("the pressure file has no header row", where=str(p),
                             hint="the first non-comment line names the columns: "
                                  "well,tvdss [m],pressure [psi],fluid,quality")
    header_line, header_text = rows[0]
    header = csv_cells(header_text, f"{p}, line {header_line}")
    cols: dict[str, tuple[int, str]] = {}
    for i, h in enumerate(header):
        m = _HEADER.match(h)
        if not m:
            raise InputFileError(f"column title {h!r} is not 'name' or 'name [unit]'",
                                 where=f"{p}, line {header_line}",
                                 hint="e.g. tvdss [m] or pressure [psi]")
        name = m.group(1).lower()
        if name in cols:
            raise InputFileError(f"column {name!r} appears twice", where=f"{p}, line {header_line}")
        cols[name] = (i, (m.group(2) or "").strip())
    for need in ("well", "pressure", "fluid", "quality"):
        if need not in cols:
            raise InputFileError(f"column {need!r} is missing (found: {', '.join(cols)})",
                                 where=f"{p}, line {header_line}",
                                 hint="columns: well, tvdss [unit] or md [unit], "
                                      "pressure [unit], fluid, quality, optional zone")
    if "tvdss" not in cols and "md" not in cols:
        raise InputFileError("no depth column: give tvdss [unit] or md [unit]",
                             where=f"{p}, line {header_line}")

    def unit_factor(col, kind):
        unit = cols[col][1]
        if not unit:
            raise InputFileError(f"column {col!r} has no unit", where=f"{p}, line {header_line}",
                                 hint=f"write it as {col} [unit], e.g. "
                                      + ("pressure [psi]" if kind == "pressure" else f"{col} [m]"))
        try:
            return factor(unit, kind)
        except UnitError as exc:
            raise InputFileError(f"column {col!r}: {exc.what}", where=f"{p}, line {header_line}",
                                 hint=exc.hint) from None

    f_p = unit_factor("pressure", "pressure")
    f_tvd = unit_factor("tvdss", "length") if "tvdss" in cols else None
    f_md = unit_factor("md", "length") if "md" in cols else None

    out = {k: [] for k in ("well", "tvdss", "md", "pressure", "fluid", "quality", "zone", "line")}
    for lineno, raw in rows[1:]:
        where = f"{p}, line {lineno}"
        cells = csv_cells(raw, where)
        if len(cells) > len(header):
            raise InputFileError(f"{len(cells)} cells but {len(header)} columns", where=where,
                                 hint="check for a stray comma")
        cells = cells + [""] * (len(header) - len(cells))

        def cell(col):
            return cells[cols[col][0]].strip() if col in cols else ""

        def number(col, f, required):
            t = cell(col)
            if t == "":
                if required:
                    raise InputFileError(f"column {col!r} is empty", where=where)
                return math.nan
            v = parse_number(t, f"column {col!r}:", where)
            if not math.isfinite(v * f):
                raise InputFileError(f"column {col!r}: {t!r} is too large after unit conversion",
                                     where=where, hint="check the number and the column's unit")
            return v * f

        well = cell("well")
        if not well:
            raise InputFileError("column 'well' is empty", where=where)
        tvd = number("tvdss", f_tvd, False) if f_tvd is not None else math.nan
        md = number("md", f_md, False) if f_md is not None else math.nan
        if math.isnan(tvd) and math.isnan(md):
            raise InputFileError("no depth: tvdss and md are both empty", where=where,
                                 hint="give the point's TVDSS or MD")
        pres = number("pressure", f_p, True)
        if not pres > 0:
            raise InputFileError(f"pressure {cell('pressure')!r} is not positive", where=where)
        fluid = cell("fluid").lower()
        if fluid not in FLUIDS:
            raise InputFileError(f"fluid {cell('fluid')!r} is not known", where=where,
                                 hint="use one of " + ", ".join(FLUIDS))
        qual = cell("quality").lower()
        if qual not in QUALITIES:
            raise InputFileError(f"quality {cell('quality')!r} is not known", where=where,
                                 hint="use one of " + ", ".join(QUALITIES))
        for k, v in (("well", well), ("tvdss", tvd), ("md", md), ("pressure", pres),
                     ("fluid", fluid), ("quality", qual), ("zone", cell("zone")),
                     ("line", lineno)):
            out[k].append(v)
    if not out["line"]:
        raise InputFileError("the pressure file has a header but no data rows", where=str(p))
    return PressurePoints(source=p, well=np.array(out["well"], dtype=object),
                          tvdss=np.array(out["tvdss"], float), md=np.array(out["md"], float),
                          pressure=np.array(out["pressure"], float),
                          fluid=np.array(out["fluid"], dtype=object),
                          quality=np.array(out["quality"], dtype=object),
                          zone=np.array(out["zone"], dtype=object),
                          line=np.array(out["line"], dtype=np.int64))


def resolve_tvdss(points: PressurePoints, datum_elevation: dict) -> PressurePoints:
    """Fill TVDSS [m] of points given only by MD.

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
        A copy with every TVDSS filled.

    Raises
    ------
    InputFileError
        A point has only MD and its well has no datum elevation (names the line).
    """
    tvd = points.tvdss.copy()
    need = np.isnan(tvd)
    for well in sorted(set(points.well[need])):
        m = need & (points.well == well)
        if well not in datum_elevation:
            line = int(points.line[m][0])
            raise InputFileError(f"point of well {well!r} has only MD and the well's datum "
                                 "elevation is unknown", where=f"{points.source}, line {line}",
                                 hint="give the tvdss column, or run with --project naming a "
                                      "project file that has this well")
        conv = datum_elevation[well]
        tvd[m] = conv(points.md[m]) if callable(conv) else points.md[m] - conv
    return PressurePoints(points.source, points.well.copy(), tvd, points.md.copy(),
                          points.pressure.copy(), points.fluid.copy(), points.quality.copy(),
                          points.zone.copy(), points.line.copy())
