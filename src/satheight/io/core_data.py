"""Readers for core capillary-pressure tables (our own documented CSV layouts).

Three layouts, comma-separated, UTF-8, one header row; lines starting with ``#``
are comments (in the single-plug layout they also carry the plug's properties).
A column header is a name with an optional unit in square brackets, e.g.
``pc [psi]``; names are case-insensitive.

**Pressure steps** (one row per drainage step)::

    plug,system,pc [psi],snw [%]
    P01,mercury_air,1.5,0.4
    P01,mercury_air,2.0,0.9

- ``plug``: plug id; ``system`` (optional, default given by the caller): lab
  fluid system (``mercury_air``, ``air_brine``, ``oil_brine``, ``gas_brine``,
  ``air_oil`` or a name the dataset defines);
- ``pc [unit]``: capillary pressure, unit required (psi, kPa, Pa, bar, MPa, atm);
- exactly one of ``sw`` (wetting-phase saturation) or ``snw`` (non-wetting, e.g.
  mercury, saturation), unit ``frac`` (default) or ``%``.

Rows of one plug and system form one curve, in increasing pressure.

**Plug table** (one row per plug)::

    plug,well,depth [m],porosity [frac],permeability [mD],grain_density [g/cm3],rock_type
    P01,VANTREL-1,2051.3,0.231,87.5,2.65,Upper Sand

``plug``, ``well``, ``depth [unit]`` (unit required), ``porosity`` (frac or %),
``permeability`` (mD default, or D, m2) are required; ``grain_density``,
``rock_type`` and ``sw`` (water saturation measured on the plug, e.g. by
Dean-Stark extraction; frac or %, a blank cell for none) are optional; any other
column is kept as text for grouping. ``depth`` is the plug's measured depth (MD)
in the well, below the log depth reference.

**Single plug** (two columns, plug properties in ``# key = value`` lines)::

    # plug = P13
    # well = VANTREL-2
    # depth = 2251.4 m
    # porosity = 0.19
    # permeability = 12 mD
    # system = air_brine
    # rock_type = Lower Sand
    pc [psi],sw [frac]
    1.0,1.0

Every error names the file and the row (file line, counting from 1).
"""

from __future__ import annotations

import re
from pathlib import Path

import numpy as np

from .. import units as U
from ..coreplugs import LAB_SYSTEMS, CoreDataset, Plug, make_curve, sha256_of
from ..errors import InputFileError, SatHeightError, UnitError
from .table import csv_cells, parse_number, read_csv_text

__all__ = ["read_pressure_steps", "read_plug_table", "read_single_plug", "read_core_files",
           "file_kind"]

_HEADER = re.compile(r"^\s*([^\[\]]+?)\s*(?:\[\s*([^\]]*)\s*\])?\s*$")
_ALIASES = {
    "plug": ("plug", "plug_id", "sample", "sample_id"),
    "system": ("system", "fluid_system"),
    "pc": ("pc", "pressure", "pc_lab"),
    "sw": ("sw", "s_w", "swet"),
    "snw": ("snw", "s_nw", "shg", "s_hg", "hg_saturation"),
    "well": ("well",),
    "depth": ("depth", "md"),
    "porosity": ("porosity", "phi", "por"),
    "permeability": ("permeability", "k", "perm"),
    "grain_density": ("grain_density", "rhog", "grain density"),
    "rock_type": ("rock_type", "rocktype", "rock type"),
}


class _Table:
    """A parsed CSV: columns by canonical name (with unit) and rows with file lines."""

    def __init__(self, path: Path, text: str | None = None):
        self.path = path
        if text is None:
            text = read_csv_text(path, "core-data")
        self.meta: dict[str, tuple[str, int]] = {}
        rows: list[tuple[int, list[str]]] = []
        header = None
        for line, raw in enumerate(text.splitlines(), start=1):   # any line ends; one row per line
            fields = csv_cells(raw, f"{path}, row {line}")
            if not fields or all(not f.strip() for f in fields):
                continue
            first = fields[0].lstrip()
            if first.startswith("#"):
                body = ",".join(fields).lstrip()[1:]
                if "=" in body:
                    key, value = body.split("=", 1)
                    self.meta[key.strip().lower()] = (value.strip(), line)
                continue
            if header is None:
                header = (line, [f.strip() for f in fields])
                continue
            rows.append((line, [f.strip() for f in fields]))
        if header is None:
            raise InputFileError("the file has no header row", where=str(path),
                                 hint="the first non-comment line must name the columns, "
                                      "e.g. plug,pc [psi],snw [%]")
        self.header_line = header[0]
        if not rows:
            raise InputFileError("the file has a header but no data rows",
                                 where=f"{path}, row {self.header_line}",
                                 hint="add one row per pressure step or plug below the header")
        self.columns: dict[str, tuple[int, str]] = {}   # canonical -> (index, unit)
        self.other: dict[str, int] = {}
        for i, h in enumerate(header[1]):
            m = _HEADER.match(h)
            if not m:
                raise InputFileError(f"cannot read column header {h!r}",
                                     where=f"{path}, row {self.header_line}",
                                     hint="write a name with an optional unit, e.g. pc [psi]")
            name, unit = m.group(1).strip().lower(), (m.group(2) or "").strip()
            canon = next((c for c, al in _ALIASES.items() if name in al), None)
            if canon is None:
                self.other[m.group(1).strip()] = i
                continue
            if canon in self.columns:
                raise InputFileError(f"two columns mean {canon!r}",
                                     where=f"{path}, row {self.header_line}",
                                     hint="keep one of them")
            self.columns[canon] = (i, unit)
        self.rows = rows
        self.width = len(header[1])

    def where(self, line: int) -> str:
        return f"{self.path}, row {line}"

    def need(self, *names: str, what: str):
        missing = [n for n in names if n not in self.columns]
        if missing:
            raise InputFileError(f"the {what} has no column {', '.join(missing)}",
                                 where=f"{self.path}, row {self.header_line}",
                                 hint=f"columns found: {', '.join(self._found())}; see the "
                                      "core-data layouts in the README")

    def _found(self):
        return list(self.columns) + list(self.other)

    def cell(self, row: tuple[int, list[str]], name: str) -> str:
        line, fields = row
        if len(fields) != self.width:
            raise InputFileError(f"row has {len(fields)} fields, the header has {self.width}",
                                 where=self.where(line), hint="check for missing or extra commas")
        return fields[self.columns[name][0]]

    def unit(self, name: str) -> str:
        return self.columns[name][1]


def _number(text: str, where: str, what: str) -> float:
    return parse_number(text, what, where)


def _in_si(value: float, factor: float, where: str, what: str, text: str) -> float:
    """``value * factor``; a result too large for a float is an error naming ``where``."""
    v = value * factor
    if not np.isfinite(v):
        raise InputFileError(f"{what} {text!r} is too large after unit conversion", where=where,
                             hint="check the number and the unit in the column header")
    return v


def _factor(unit: str, kind: str, where: str, what: str, default: str | None = None) -> float:
    if not unit:
        if default is None:
            raise UnitError(f"the {what} column has no unit", where=where,
                            hint=f"write the unit in the header, e.g. {what} [psi]"
                            if kind == "pressure" else f"write the unit in the header, e.g. {what} [m]")
        unit = default
    try:
        return U.factor(unit, kind)
    except UnitError as exc:
        raise UnitError(f"unknown unit {unit!r} for {what}", where=where, hint=exc.hint) from None


def _saturation(value: float, where: str, what: str) -> float:
    if not 0.0 <= value <= 1.0:
        raise SatHeightError(f"{what} {value:g} is outside [0, 1] after unit conversion",
                             where=where, hint="write a fraction, or mark the column as percent, "
                                               f"e.g. {what} [%]")
    return value


def file_kind(path) -> str:
    """``"steps"``, ``"plugs"`` or ``"single"``: which layout a file has (by its header)."""
    t = _Table(Path(path))
    return _kind(t)


def _kind(t: _Table) -> str:
    if "pc" in t.columns and "plug" in t.columns:
        return "steps"
    if "plug" in t.columns and ("porosity" in t.columns or "permeability" in t.columns):
        return "plugs"
    if "pc" in t.columns and ("sw" in t.columns or "snw" in t.columns):
        return "single"
    raise InputFileError("cannot tell which core-data layout this file has",
                         where=f"{t.path}, row {t.header_line}",
                         hint="a pressure-steps table needs plug and pc columns, a plug table "
                              "plug and porosity, a single plug pc and sw (or snw)")


def _steps_from_rows(t: _Table, rows, plug_of, system_of, default_system):
    """Curves from step rows: plug_of(row) -> id, system_of(row) -> system or ''."""
    if "sw" in t.columns and "snw" in t.columns:
        raise InputFileError("the file has both sw and snw columns",
                             where=f"{t.path}, row {t.header_line}",
                             hint="give one saturation column: sw (wetting) or snw (non-wetting)")
    sat = "sw" if "sw" in t.columns else "snw"
    hdr = f"{t.path}, row {t.header_line}"
    pf = _factor(t.unit("pc"), "pressure", hdr, "pc")
    sf = _factor(t.unit(sat), "fraction", hdr, sat, default="frac")
    groups: dict[tuple[str, str], list] = {}
    for row in rows:
        line = row[0]
        where = t.where(line)
        plug = plug_of(row)
        if not plug:
            raise InputFileError("plug id is empty", where=where, hint="fill the plug column")
        system = system_of(row) or default_system
        if not system:
            raise InputFileError("no lab fluid system for this step", where=where,
                                 hint="add a system column (e.g. mercury_air) or give a default")
        pc = _in_si(_number(t.cell(row, "pc"), where, "pc"), pf, where, "pc", t.cell(row, "pc"))
        if not pc > 0:
            raise SatHeightError(f"capillary pressure {t.cell(row, 'pc')} is not positive",
                                 where=where, hint="drainage steps have Pc > 0")
        s = _saturation(_number(t.cell(row, sat), where, sat) * sf, where, sat)
        groups.setdefault((plug, system), []).append((line, pc, s))
    curves = []
    for (plug, system), steps in groups.items():  # loop over curves
        lines = [s[0] for s in steps]
        pc = np.array([s[1] for s in steps])
        s = np.array([s[2] for s in steps])
        if sat == "snw":
            sw = 1.0 - s
        else:
            sw = s
        curves.append(make_curve(plug, system, pc, sw, lines, str(t.path),
                                 unit=(t.unit("pc").strip(), pf)))
    return curves


def read_pressure_steps(path, default_system: str | None = None) -> list:
    """Read a pressure-steps table.

    Parameters
    ----------
    path : str or pathlib.Path
    default_system : str, optional
        Lab system of rows without a ``system`` column or value.

    Returns
    -------
    list of :class:`satheight.core.PcCurve`
        Pressure [Pa], wetting saturation [fraction].

    Raises
    ------
    InputFileError, UnitError, SatHeightError
        Naming the file and row: missing columns, unknown units, non-numbers,
        saturation outside [0, 1], steps not increasing in pressure.
    """
    t = _Table(Path(path))
    t.need("plug", "pc", what="pressure-steps table")
    if "sw" not in t.columns and "snw" not in t.columns:
        t.need("sw", what="pressure-steps table")
    has_sys = "system" in t.columns
    return _steps_from_rows(t, t.rows, lambda r: t.cell(r, "plug"),
                            (lambda r: t.cell(r, "system")) if has_sys else (lambda r: ""),
                            default_system)


def _plug_from(values: dict, where: str, units: dict, extra: dict) -> Plug:
    """values: canonical -> text; units: canonical -> unit text."""
    def num(name, f=1.0):
        return _in_si(_number(values[name], where, name), f, where, name, values[name])
    depth = num("depth", _factor(units.get("depth", ""), "length", where, "depth"))
    phi = num("porosity", _factor(units.get("porosity", ""), "fraction", where, "porosity",
                                  default="frac"))
    if not 0 < phi < 1:
        raise SatHeightError(f"porosity {values['porosity']} is outside (0, 1) after unit "
                             "conversion", where=where,
                             hint="write a fraction, or mark the column as percent: porosity [%]")
    k = num("permeability", _factor(units.get("permeability", ""), "permeability", where,
                                    "permeability", default="mD"))
    if not k > 0:
        raise SatHeightError(f"permeability {values['permeability']} is not positive", where=where,
                             hint="J needs k > 0")
    rho = None
    if values.get("grain_density"):
        rho = num("grain_density", _factor(units.get("grain_density", ""), "density", where,
                                           "grain_density", default="g/cm3"))
        if not rho > 0:
            raise SatHeightError(f"grain density {values['grain_density']} is not positive",
                                 where=where, hint="give the grain density, e.g. 2.65 g/cm3, "
                                                   "or leave the cell blank")
    rt = values.get("rock_type") or None
    sw = None
    if values.get("sw"):    # measured on the plug (Dean-Stark...), not a Pc step
        sw = _saturation(num("sw", _factor(units.get("sw", ""), "fraction", where, "sw",
                                           default="frac")), where, "sw")
    return Plug(values["plug"], values.get("well", ""), depth, phi, k, rho, rt, extra, where, sw)


def read_plug_table(path) -> dict:
    """Read a plug table.

    Returns
    -------
    dict[str, Plug]
        By plug id; depth [m], porosity [fraction], permeability [m^2], grain
        density [kg/m^3].

    Raises
    ------
    InputFileError, UnitError, SatHeightError
        Naming file and row: missing columns, unknown units, bad numbers,
        porosity outside (0, 1), k <= 0, a plug listed twice.
    """
    t = _Table(Path(path))
    t.need("plug", "well", "depth", "porosity", "permeability", what="plug table")
    plugs: dict[str, Plug] = {}
    units = {c: u for c, (_, u) in t.columns.items()}
    for row in t.rows:
        where = t.where(row[0])
        values = {c: t.cell(row, c) for c in t.columns}
        if not values["plug"]:
            raise InputFileError("plug id is empty", where=where, hint="fill the plug column")
        if values["plug"] in plugs:
            raise SatHeightError(f"plug {values['plug']!r} is listed twice (first at "
                                 f"{plugs[values['plug']].source})", where=where,
                                 hint="give each plug one row")
        extra = {name: row[1][i] for name, i in t.other.items()}
        plugs[values["plug"]] = _plug_from(values, where, units, extra)
    return plugs


def read_single_plug(path, default_system: str | None = None):
    """Read a single plug's two-column table (see the module docstring).

    Returns
    -------
    (Plug or None, PcCurve)
        The plug is None when the ``#`` lines do not give porosity and
        permeability (it must then be in a plug table).
    """
    p = Path(path)
    t = _Table(p)
    meta = t.meta
    t.need("pc", what="single-plug table")
    if "sw" not in t.columns and "snw" not in t.columns:
        t.need("sw", what="single-plug table")
    plug_id = meta["plug"][0] if "plug" in meta else p.stem
    system = meta["system"][0] if "system" in meta else default_system
    curves = _steps_from_rows(t, t.rows, lambda r: plug_id, lambda r: system or "", default_system)
    plug = None
    if "porosity" in meta or "permeability" in meta:
        values, units = {"plug": plug_id}, {}
        first = min(line for _, line in meta.values())
        for key in ("well", "depth", "porosity", "permeability", "grain_density", "rock_type"):
            if key not in meta:
                if key in ("depth", "porosity", "permeability"):
                    raise InputFileError(f"the plug properties lack '# {key} = ...'",
                                         where=f"{p}, row {first}",
                                         hint="give depth, porosity and permeability, or put "
                                              "the plug in a plug table")
                continue
            text, line = meta[key]
            if key in ("depth", "porosity", "permeability", "grain_density"):
                try:
                    num, unit = U.split_quantity(text)
                except UnitError as exc:
                    raise InputFileError(exc.what, where=f"{p}, row {line}", hint=exc.hint) from None
                values[key], units[key] = repr(num), unit
            else:
                values[key] = text
        plug = _plug_from(values, f"{p}, row {meta['porosity'][1] if 'porosity' in meta else first}",
                          units, {})
    return plug, curves[0]


def read_core_files(paths, default_system: str | None = None, systems: dict | None = None
                    ) -> CoreDataset:
    """Read any mix of the three layouts into one validated dataset.

    Parameters
    ----------
    paths : sequence of path
        Pressure-steps tables, plug tables and single-plug tables (told apart by
        their header).
    default_system : str, optional
        Lab system of steps that name none.
    systems : dict, optional
        Lab systems by name (default :data:`satheight.core.LAB_SYSTEMS`), with the
        dataset's overrides.

    Returns
    -------
    CoreDataset
        With the sha256 of every file.

    Raises
    ------
    SatHeightError
        As the readers, plus: a plug defined twice, steps of a plug no table lists.
    """
    plugs: dict = {}
    curves: list = []
    files: dict = {}
    for path in paths:
        p = Path(path)
        t = _Table(p)
        kind = _kind(t)
        files[p.name] = sha256_of(p)
        if kind == "plugs":
            new = read_plug_table(p)
        elif kind == "steps":
            curves += read_pressure_steps(p, default_system)
            new = {}
        else:
            plug, curve = read_single_plug(p, default_system)
            curves.append(curve)
            new = {plug.plug_id: plug} if plug is not None else {}
        for pid, plug in new.items():
            if pid in plugs:
                raise SatHeightError(f"plug {pid!r} is defined twice (also at {plugs[pid].source})",
                                     where=plug.source, hint="define each plug once")
            plugs[pid] = plug
    ds = CoreDataset(plugs=plugs, curves=curves, files=files,
                     systems=dict(systems) if systems is not None else dict(LAB_SYSTEMS))
    ds.validate()
    seen: dict = {}
    for c in curves:
        key = (c.plug_id, c.system)
        if key in seen:
            raise SatHeightError(f"plug {c.plug_id!r} has two {c.system} curves (also in "
                                 f"{seen[key]})", where=f"{c.source}, row {c.rows[0]}",
                                 hint="keep one curve per plug and lab system")
        seen[key] = c.source
    return ds

