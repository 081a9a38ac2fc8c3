"""Read and validate a project file into plain typed objects.

A project file is TOML (data only: nothing in it is evaluated). Every quantity
may be a bare number, taken in the unit system named by ``[project] units``
(see :data:`satheight.units.UNIT_SYSTEMS`), or text with a unit such as
``"2060 m"``, ``"6758 ft"``, ``"1.08 g/cm3"``, ``"0.468 psi/ft"`` or ``"26 mN/m"``.
Everything is converted to SI on reading.

File format
-----------

.. code-block:: toml

    [project]
    name = "Example field"          # optional, default file stem
    units = "metric"                # "metric" or "field": unit system of bare numbers (units.UNIT_SYSTEMS)
    tops_file = "tops.csv"          # optional: formation tops per well (io/tops.py layout), relative to this file; merged into the wells' tops

    [log_sw]                        # optional table; defaults method="auto", a=1, m=2, n=2
    method = "auto"                 # "curve" (use the well's Sw curve), "archie" (from Rt and porosity), "auto" (curve if present else archie)
    a = 1.0                         # Archie tortuosity factor [-] > 0
    m = 2.0                         # cementation exponent [-] > 0
    n = 2.0                         # saturation exponent [-] > 0
    rw = "0.045 ohm.m"              # formation-water resistivity at formation temperature, > 0. Required when method = "archie"; optional for auto

    [comparison]                    # optional: net-reservoir cutoffs for SHM vs log Sw statistics and HCPT
    min_porosity = 0.08             # fraction (or "8 %"); default 0
    min_permeability = "0.1 mD"     # bare number in mD; default 0

    [[wells]]
    las = "wells/A-1.las"           # required, relative to the project file; must exist (error names the resolved path)
    name = "A-1"                    # optional, default: the LAS file's well name
    datum_elevation = "25 m"        # optional: elevation of the log depth reference (KB, drill floor) above the TVDSS datum (sea level); bare number in project length unit; may be negative (ground below sea level) -> float SI metres; default None (take from LAS header)
    curves = { porosity = "PHIE", permeability = "PERM", resistivity = "RT", sw = "SW" }   # optional role -> mnemonic overrides; roles allowed: porosity, permeability, resistivity, sw
    survey = "A-1_survey.csv"       # optional: deviation survey (CSV or LAS, io/survey.py layout), relative to this file; without it the well is vertical
    survey_format = "csv"           # optional: "csv" or "las"; default from the file ending
    location = { east = 1200, north = 800 }   # optional: well-head map position (project length unit), used by the field cross-section
    [wells.tops]                    # optional: zone name = [top, base] in this well's measured depth (project length unit for bare numbers)
    Upper = ["2010 m", "2120 m"]

    [[zones]]
    name = "Upper"                  # required, unique
    top = "1980 m"                  # TVDSS, positive down; optional if wells give tops for this zone
    base = "2100 m"                 # TVDSS; top < base
    fwl = "2060 m"                  # free-water level TVDSS, required
    hydrocarbon = "oil"             # "oil", "gas" or "air"
    water_density = "1.08 g/cm3"    # reservoir conditions; a density OR a pressure gradient ("0.468 psi/ft", "10.6 kPa/m") -> kg/m3
    hydrocarbon_density = "0.75 g/cm3"
    sigma_cos_theta = "26 mN/m"     # or dyn/cm, N/m; > 0
    # instead of the densities: correlation inputs (see satheight.project_fluids):
    # water = { salinity = "80000 ppm" }, oil = { api, solution_gor, gas_gravity },
    # gas = { gravity, z_method }, conditions = { pressure, temperature } or gradients;
    # three-phase column: gas_oil_level, gas_density (or gas), gas_sigma_cos_theta
    [zones.function]
    family = "power_law"            # a key of models.FAMILIES
    swirr = 0.1                     # family parameters (plain numbers)
    a = 0.2
    b = 1.5
    j_min = 0.02                    # optional calibrated J range (both or neither), 0 <= j_min < j_max
    j_max = 12
    # or, instead of family + parameters, a function fitted by `satheight fit`:
    # [zones.function]
    # file = "core_models.json"     # model file (models/store.py), relative to the project file
    # rock_type = "Upper Sand"      # optional if the file holds one rock type; without it and with
    #                               # several rock types, rock typing is applied per depth (the
    #                               # file's permeability/FZI class rule on log phi and k)
    # family = "power_law"          # optional, default the file's selected family
    # j_min / j_max                 # optional override of the J range covered by the core data

Rules
-----

* ``[project]`` and its ``units`` are required; ``[[wells]]`` and ``[[zones]]``
  are required and must not be empty. Every other key is optional unless
  marked "required" above. Keys not listed above are errors (typo guard).
* ``top`` and ``base`` of a zone are given both or neither. A zone without them
  must get ``[wells.tops]`` from at least one well. Field-wide zone windows may
  touch but not overlap; nor may the tops windows of one well.
* The FWL may lie anywhere, also outside the zone window (a zone may sit wholly
  above or below its FWL).
* ``water_density`` must be greater than ``hydrocarbon_density``.
* Explicit well names must be unique. A well without a name takes the LAS
  file's well name when the LAS file is read (not here); the loader must check
  those for clashes.
* Text choices (``units``, ``method``, ``hydrocarbon``) are case-insensitive;
  mnemonics, zone names and ``family`` are taken as written.

Errors
------

A missing or unreadable file raises :class:`~satheight.errors.InputFileError`.
Everything else raises :class:`~satheight.errors.ProjectFileError` whose message
names the file and the full key, e.g. ``project.toml, key zones[Upper].fwl``,
says what was found and what was expected, and gives a hint. Zones and wells are
named in keys by their ``name`` (wells without one by their ``las`` text), or by
position counting from 1 (``zones[#2]``) when that is missing. TOML syntax errors
name the line and column.
"""

from __future__ import annotations

import dataclasses as _dc
import datetime as _dt
import difflib
import math
import re
import tomllib
from pathlib import Path
from typing import Any, Iterable

from .errors import InputFileError, ModelError, ProjectFileError, UnitError
from .models import FAMILIES, build_function, get_family
from .project_types import (ComparisonSpec, FunctionSpec, LogSwSpec, Project, WellSpec,
                            ZoneSpec)
from .project_fluids import FLUID_ZONE_KEYS, read_zone_fluids
from .uncertainty_keys import UNCERTAINTY_TOP_KEY, UNCERTAINTY_ZONE_KEY, read_uncertainty
from .units import UNIT_SYSTEMS, from_si, parse_quantity

__all__ = ["load_project", "parse_project"]

_TOP_KEYS = ("project", "log_sw", "comparison", "wells", "zones", UNCERTAINTY_TOP_KEY)
_PROJECT_KEYS = ("name", "units", "tops_file")
_LOG_SW_KEYS = ("method", "a", "m", "n", "rw")
_COMPARISON_KEYS = ("min_porosity", "min_permeability")
_LOG_SW_METHODS = ("curve", "archie", "auto")
_WELL_KEYS = ("las", "name", "datum_elevation", "curves", "tops", "survey", "survey_format",
              "location")
_SURVEY_FORMATS = ("csv", "las")
_CURVE_ROLES = ("porosity", "permeability", "resistivity", "sw")
_ZONE_KEYS = ("name", "top", "base", "fwl", "hydrocarbon", "water_density",
              "hydrocarbon_density", "sigma_cos_theta", "function") + FLUID_ZONE_KEYS + (UNCERTAINTY_ZONE_KEY,)
_HYDROCARBONS = ("oil", "gas", "air")
_FUNCTION_FIXED_KEYS = ("family", "j_min", "j_max")
_FUNCTION_FILE_KEYS = ("file", "rock_type", "family", "j_min", "j_max")

_EXAMPLES = {
    "length": '"2060 m" or "6758 ft"',
    "density": '"1.08 g/cm3", "1080 kg/m3" or a gradient "0.468 psi/ft"',
    "tension": '"26 mN/m", "26 dyn/cm" or "0.026 N/m"',
    "resistivity": '"0.045 ohm.m"',
}


# ----------------------------------------------------------------------------------
# public API
# ----------------------------------------------------------------------------------
def load_project(path) -> Project:
    """Read a project file (TOML) and validate it.

    Parameters
    ----------
    path : str or pathlib.Path
        The project file. Relative paths inside it are resolved against its folder.

    Returns
    -------
    Project
        All quantities in SI ([m], [kg/m^3], [N/m], [ohm.m]); paths absolute.

    Raises
    ------
    InputFileError
        If the file is missing, unreadable or not UTF-8 text.
    ProjectFileError
        On a TOML syntax error (with line and column) or any invalid content
        (with the full key); see the module docstring.
    """
    p = Path(path)
    try:
        raw = p.read_bytes()
    except FileNotFoundError:
        raise InputFileError("project file not found", where=str(p),
                             hint="check the path and the current folder") from None
    except OSError as exc:
        raise InputFileError(f"cannot read the project file: {exc.strerror or exc}",
                             where=str(p), hint="check that it is a readable file") from None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise InputFileError(f"the project file is not UTF-8 text (bad byte at offset {exc.start})",
                             where=str(p), hint="save it as UTF-8 text (TOML requires UTF-8)") from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        msg = str(exc)
        m = re.search(r"\(at line (\d+), column (\d+)\)\s*$", msg)
        if m:
            where = f"{p}, line {m.group(1)}, column {m.group(2)}"
            what = msg[: m.start()].strip()
        elif msg.endswith("(at end of document)"):
            lines = text.count("\n") + 1
            where = f"{p}, line {lines} (end of file)"
            what = msg[: -len("(at end of document)")].strip()
        else:
            where, what = str(p), msg
        raise ProjectFileError(f"TOML syntax error: {what}", where=where,
                               hint="fix the syntax there; text values need quotes, "
                                    'e.g. fwl = "2060 m"') from None
    return parse_project(data, p)


def parse_project(data: dict, path: Path) -> Project:
    """Validate an already-parsed project file (a dict as :func:`tomllib.loads` gives).

    Parameters
    ----------
    data : dict
        Parsed TOML content; not modified.
    path : pathlib.Path
        Where the data came from: named in error messages, and its folder is the
        base of relative LAS paths.

    Returns
    -------
    Project

    Raises
    ------
    ProjectFileError
        On any invalid content; the message names the file and the full key.
    """
    return _Reader(Path(path)).read(data)


# ----------------------------------------------------------------------------------
# helpers
# ----------------------------------------------------------------------------------
def _type_name(value: Any) -> str:
    if isinstance(value, bool):
        return "a true/false value"
    if isinstance(value, (int, float)):
        return "a number"
    if isinstance(value, str):
        return "text"
    if isinstance(value, dict):
        return "a table"
    if isinstance(value, list):
        return "a list"
    if isinstance(value, (_dt.date, _dt.time, _dt.datetime)):
        return "a date/time"
    return type(value).__name__


def _show(value: Any) -> str:
    """Short description of a found value: ``'abc' (text)``."""
    r = repr(value)
    if len(r) > 60:
        r = r[:57] + "..."
    return f"{r} ({_type_name(value)})"


def _join(prefix: str, key: str) -> str:
    return f"{prefix}.{key}" if prefix else key


def _label(raw: Any, keys: Iterable[str], index: int) -> str:
    """How an array-of-tables entry is named in keys: first usable text key, else #position."""
    if isinstance(raw, dict):
        for k in keys:
            v = raw.get(k)
            if isinstance(v, str) and v.strip():
                return v
    return f"#{index + 1}"


class _Reader:
    """Carries the file path and unit system through the validation of one file."""

    def __init__(self, path: Path):
        self.path = path
        self.units: dict[str, str] = UNIT_SYSTEMS["metric"]
        self.unit_system = "metric"

    # --- error construction ------------------------------------------------------
    def error(self, key: str, what: str, hint: str | None = None) -> ProjectFileError:
        return ProjectFileError(what, where=f"{self.path}, key {key}", hint=hint)

    # --- generic value readers ---------------------------------------------------
    def table(self, value: Any, key: str, allowed: Iterable[str],
              required: Iterable[str] = (), what: str = "a table") -> dict:
        """Check ``value`` is a table with only ``allowed`` keys and all ``required`` ones."""
        allowed = tuple(allowed)
        if not isinstance(value, dict):
            raise self.error(key, f"expected {what}, found {_show(value)}",
                             hint=f"write it as a TOML table [{key}] with keys "
                                  + ", ".join(allowed))
        for k in value:
            if k not in allowed:
                close = difflib.get_close_matches(str(k), allowed, n=1)
                hint = (f"did you mean {close[0]!r}? " if close else "") + \
                    "allowed keys: " + ", ".join(allowed)
                raise self.error(_join(key, str(k)), f"unknown key {k!r}", hint=hint)
        for k in required:
            if k not in value:
                raise self.error(_join(key, k), f"required key {k!r} is missing",
                                 hint=f"add {k} = ... to this table")
        return value

    def text(self, value: Any, key: str, choices: tuple[str, ...] | None = None) -> str:
        """Non-empty text; with ``choices``, one of them (case-insensitive, returned lower-case)."""
        if not isinstance(value, str) or not value.strip():
            expected = ("one of " + ", ".join(repr(c) for c in choices)) if choices else "non-empty text"
            raise self.error(key, f"expected {expected}, found {_show(value)}",
                             hint='put text in double quotes, e.g. name = "A-1"')
        if choices is not None:
            v = value.strip().lower()
            if v not in choices:
                raise self.error(key, f"{value!r} is not a known choice",
                                 hint="use one of " + ", ".join(repr(c) for c in choices))
            return v
        return value

    def number(self, value: Any, key: str, *, positive: bool = False) -> float:
        """A plain (unit-less) finite number, optionally > 0."""
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise self.error(key, f"expected a plain number, found {_show(value)}",
                             hint="write a number without quotes or units, e.g. 2.0")
        v = float(value)
        if not math.isfinite(v):
            raise self.error(key, f"expected a finite number, found {value!r}",
                             hint="nan and inf are not allowed")
        if positive and not v > 0:
            raise self.error(key, f"must be greater than zero, found {value!r}",
                             hint="give a positive number")
        return v

    def quantity(self, value: Any, key: str, kind: str, *, positive: bool = False) -> float:
        """A number in the project unit system or text with a unit, converted to SI."""
        unit = self.units[kind]
        try:
            v = parse_quantity(value, kind, unit)
        except UnitError as exc:
            hint = exc.hint or ""
            hint = (hint + "; " if hint else "") + \
                f"write a number (taken in {unit}) or text like {_EXAMPLES.get(kind, repr('1 ' + unit))}"
            raise self.error(key, f"expected a {kind} (a number or text with a unit), found "
                             f"{_show(value)}: {exc.what}",
                             hint=hint) from None
        if positive and not v > 0:
            raise self.error(key, f"{kind} must be greater than zero, found {value!r}",
                             hint="give a positive value")
        return v

    def length_text(self, metres: float) -> str:
        """A length [m] shown in the project's length unit, for messages."""
        unit = self.units["length"]
        return f"{from_si(metres, unit, 'length'):g} {unit}"

    # --- sections ----------------------------------------------------------------
    def read(self, data: dict) -> Project:
        if not isinstance(data, dict):
            raise self.error("(top level)", f"expected a TOML document of tables, found {_show(data)}",
                             hint="see the file format in the README")
        self.table(data, "", _TOP_KEYS)
        for k in ("project", "wells", "zones"):
            if k not in data:
                form = f"[{k}]" if k == "project" else f"[[{k}]]"
                raise self.error(k, f"required table {form} is missing",
                                 hint=f"add a {form} section (see the file format in the README)")
        name = self.read_project(data["project"])
        log_sw = self.read_log_sw(data.get("log_sw", {}))
        comparison = self.read_comparison(data.get("comparison", {}))
        zone_raw = self.array_of_tables(data["zones"], "zones")
        wells_raw = self.array_of_tables(data["wells"], "wells")

        zones: list[ZoneSpec] = []
        seen: dict[str, str] = {}
        for i, raw in enumerate(zone_raw):
            z = self.read_zone(raw, i)
            if z.name in seen:
                raise self.error(f"zones[{z.name}].name",
                                 f"zone name {z.name!r} is used by more than one zone",
                                 hint="give each [[zones]] entry its own name")
            seen[z.name] = z.name
            zones.append(z)
        zone_names = [z.name for z in zones]

        wells: list[WellSpec] = []
        well_names: set[str] = set()
        for i, raw in enumerate(wells_raw):
            w = self.read_well(raw, i, zone_names)
            if w.name is not None:
                if w.name in well_names:
                    raise self.error(f"wells[{w.name}].name",
                                     f"well name {w.name!r} is used by more than one well",
                                     hint="give each [[wells]] entry its own name")
                well_names.add(w.name)
            wells.append(w)

        tops_file = None
        pending: dict = {}
        if isinstance(data["project"], dict) and "tops_file" in data["project"]:
            tops_file = self.existing_file(data["project"]["tops_file"], "project.tops_file", "tops")
            wells, pending = self.merge_tops_file(tops_file, wells, zone_names)
        self.check_zone_windows(zones, wells, pending)
        return Project(path=self.path.resolve(), name=name, unit_system=self.unit_system,
                       wells=wells, zones=zones, log_sw=log_sw, comparison=comparison,
                       tops_file=tops_file, tops_pending=pending,
                       uncertainty=read_uncertainty(data, self.path, self.unit_system))

    def array_of_tables(self, value: Any, key: str) -> list:
        if not isinstance(value, list) or not all(isinstance(v, dict) for v in value):
            raise self.error(key, f"expected a list of tables, found {_show(value)}",
                             hint=f"write each entry as a [[{key}]] section")
        if not value:
            raise self.error(key, f"the {key} list is empty",
                             hint=f"add at least one [[{key}]] section")
        return value

    def read_project(self, raw: Any) -> str:
        t = self.table(raw, "project", _PROJECT_KEYS, required=("units",))
        systems = tuple(UNIT_SYSTEMS)
        units = t["units"]
        if not isinstance(units, str) or units.strip().lower() not in systems:
            raise self.error("project.units", f"unknown unit system, found {_show(units)}",
                             hint="use one of " + ", ".join(repr(s) for s in systems)
                                  + "; it sets the unit of bare numbers")
        self.unit_system = units.strip().lower()
        self.units = UNIT_SYSTEMS[self.unit_system]
        if "name" in t:
            return self.text(t["name"], "project.name")
        return self.path.stem

    def read_log_sw(self, raw: Any) -> LogSwSpec:
        t = self.table(raw, "log_sw", _LOG_SW_KEYS)
        method = self.text(t["method"], "log_sw.method", _LOG_SW_METHODS) if "method" in t else "auto"
        defaults = LogSwSpec()
        a = self.number(t["a"], "log_sw.a", positive=True) if "a" in t else defaults.a
        m = self.number(t["m"], "log_sw.m", positive=True) if "m" in t else defaults.m
        n = self.number(t["n"], "log_sw.n", positive=True) if "n" in t else defaults.n
        rw = self.quantity(t["rw"], "log_sw.rw", "resistivity", positive=True) if "rw" in t else None
        if method == "archie" and rw is None:
            raise self.error("log_sw.rw", 'method = "archie" needs rw, and rw is missing',
                             hint='add rw = "0.045 ohm.m", the water resistivity at formation '
                                  'temperature, or use method = "curve"')
        return LogSwSpec(method=method, a=a, m=m, n=n, rw=rw)

    def read_comparison(self, raw: Any) -> ComparisonSpec:
        t = self.table(raw, "comparison", _COMPARISON_KEYS)
        phi = 0.0
        if "min_porosity" in t:
            phi = self.quantity(t["min_porosity"], "comparison.min_porosity", "fraction")
            if not 0.0 <= phi < 1.0:
                raise self.error("comparison.min_porosity",
                                 f"expected a porosity cutoff in [0, 1), found {t['min_porosity']!r}",
                                 hint='write a fraction such as 0.08 or text such as "8 %"')
        k = 0.0
        if "min_permeability" in t:
            k = self.quantity(t["min_permeability"], "comparison.min_permeability", "permeability")
            if k < 0.0:
                raise self.error("comparison.min_permeability",
                                 f"expected a permeability cutoff >= 0, found {t['min_permeability']!r}",
                                 hint='write a value such as "1 mD"')
        return ComparisonSpec(min_porosity=phi, min_permeability=k)

    def read_zone(self, raw: dict, index: int) -> ZoneSpec:
        key = f"zones[{_label(raw, ('name',), index)}]"
        t = self.table(raw, key, _ZONE_KEYS,
                       required=("name", "fwl", "hydrocarbon", "sigma_cos_theta", "function"))
        name = self.text(t["name"], f"{key}.name")

        has_top, has_base = "top" in t, "base" in t
        if has_top != has_base:
            missing, given = ("base", "top") if has_top else ("top", "base")
            raise self.error(f"{key}.{missing}", f"{missing!r} is missing while {given!r} is given",
                             hint="give both top and base, or neither (then wells give "
                                  "this zone's tops under [wells.tops])")
        top = base = None
        if has_top:
            top = self.quantity(t["top"], f"{key}.top", "length")
            base = self.quantity(t["base"], f"{key}.base", "length")
            if not top < base:
                raise self.error(f"{key}.top", f"top {t['top']!r} is not above base "
                                 f"{t['base']!r} (TVDSS, positive down)",
                                 hint="top must be shallower (smaller) than base")

        fwl = self.quantity(t["fwl"], f"{key}.fwl", "length")
        hydrocarbon = self.text(t["hydrocarbon"], f"{key}.hydrocarbon", _HYDROCARBONS)
        # densities: given, or from correlations; optional three-phase keys (project_fluids)
        zf = read_zone_fluids(self, t, key, hydrocarbon, fwl)
        rho_w, rho_h = zf.water_density, zf.hydrocarbon_density
        if not rho_w > rho_h:
            raise self.error(f"{key}.water_density",
                             f"water_density {t.get('water_density', 'from water')!r} ({rho_w:.6g} kg/m3) is not "
                             f"greater than hydrocarbon_density {t.get('hydrocarbon_density', 'from a correlation')!r} "
                             f"({rho_h:.6g} kg/m3): water must be denser than the hydrocarbon",
                             hint="check the two values and their units")
        sigma = self.quantity(t["sigma_cos_theta"], f"{key}.sigma_cos_theta", "tension",
                              positive=True)
        function = self.read_function(t["function"], f"{key}.function")
        return ZoneSpec(name=name, top=top, base=base, fwl=fwl, water_density=rho_w,
                        hydrocarbon_density=rho_h, hydrocarbon=hydrocarbon,
                        sigma_cos_theta=sigma, function=function,
                        gas_oil_level=zf.gas_oil_level, gas_density=zf.gas_density,
                        gas_sigma_cos_theta=zf.gas_sigma_cos_theta, fluids=zf.fluids)

    def read_function(self, raw: Any, key: str) -> FunctionSpec:
        if not isinstance(raw, dict):
            raise self.error(key, f"expected a table, found {_show(raw)}",
                             hint=f"write it as a [{key.split('[')[0]}.function] section")
        if "file" in raw:
            return self.read_function_file(raw, key)
        if "family" not in raw:
            raise self.error(f"{key}.family", "required key 'family' is missing",
                             hint="use one of " + ", ".join(sorted(FAMILIES)))
        family = self.text(raw["family"], f"{key}.family")
        try:
            cls = get_family(family, where=f"{key}.family")
        except ModelError as exc:
            raise self.error(f"{key}.family", exc.what, hint=exc.hint) from None
        self.table(raw, key, _FUNCTION_FIXED_KEYS + tuple(cls.param_names))

        j_range = None
        if ("j_min" in raw) != ("j_max" in raw):
            missing = "j_max" if "j_min" in raw else "j_min"
            raise self.error(f"{key}.{missing}", f"{missing!r} is missing while the other "
                             "end of the calibrated J range is given",
                             hint="give both j_min and j_max, or neither")
        if "j_min" in raw:
            j_min = self.number(raw["j_min"], f"{key}.j_min")
            j_max = self.number(raw["j_max"], f"{key}.j_max")
            if not 0 <= j_min < j_max:
                raise self.error(f"{key}.j_min", f"calibrated J range j_min = {raw['j_min']!r}, "
                                 f"j_max = {raw['j_max']!r} does not satisfy 0 <= j_min < j_max",
                                 hint="check the two values")
            j_range = (j_min, j_max)

        params = {}
        for p in cls.param_names:
            if p in raw:
                params[p] = self.number(raw[p], f"{key}.{p}")
        try:
            fn = build_function(family, params, j_range=j_range, where=key)
        except ModelError as exc:
            hint = exc.hint or (f"check the {family} parameters "
                                f"({', '.join(cls.param_names)}) against their allowed ranges")
            raise self.error(key, exc.what, hint=hint) from None
        return FunctionSpec(family=family, params=dict(fn.params_), j_range=fn.j_range_)

    def read_function_file(self, raw: dict, key: str) -> FunctionSpec:
        """``[zones.function] file = "models.json"`` (+ optional rock_type, family, j range)."""
        from .models.store import load_models

        self.table(raw, key, _FUNCTION_FILE_KEYS)
        text = self.text(raw["file"], f"{key}.file")
        path = (self.path.parent.resolve() / text).resolve()
        try:
            mf = load_models(path)
        except (ModelError, InputFileError) as exc:
            raise self.error(f"{key}.file", f"model file {text!r}: {exc}",
                             hint="paths are relative to the project file; the file is written "
                                  "by 'satheight fit'") from None
        family = self.text(raw["family"], f"{key}.family") if "family" in raw else None
        j_range = None
        if ("j_min" in raw) != ("j_max" in raw):
            missing = "j_max" if "j_min" in raw else "j_min"
            raise self.error(f"{key}.{missing}", f"{missing!r} is missing while the other end of "
                             "the calibrated J range is given", hint="give both or neither")
        if "j_min" in raw:
            j_range = (self.number(raw["j_min"], f"{key}.j_min"),
                       self.number(raw["j_max"], f"{key}.j_max"))
            if not 0 <= j_range[0] < j_range[1]:
                raise self.error(f"{key}.j_min", "calibrated range does not satisfy "
                                 "0 <= j_min < j_max", hint="check the two values")

        def one(rock_type: str, k: str) -> FunctionSpec:
            try:
                fn = mf.function(rock_type, family, where=k)
            except ModelError as exc:
                raise self.error(k, exc.what, hint=exc.hint) from None
            return FunctionSpec(family=fn.name, params=dict(fn.params_),
                                j_range=j_range or fn.j_range_, file=path, rock_type=rock_type)

        if "rock_type" in raw or len(mf.rock_types) == 1:
            rt = (self.text(raw["rock_type"], f"{key}.rock_type") if "rock_type" in raw
                  else next(iter(mf.rock_types)))
            return one(rt, f"{key}.rock_type")
        if not mf.rule.applies_to_logs:
            raise self.error(f"{key}.rock_type",
                             f"model file {text!r} holds {len(mf.rock_types)} rock types grouped "
                             f"by plug-table column {mf.rule.column!r}, which logs cannot supply",
                             hint="add rock_type = one of "
                                  + ", ".join(repr(r) for r in mf.rock_types))
        specs = {rt: one(rt, f"{key}.file") for rt in mf.rock_types}
        first = next(iter(specs.values()))
        return FunctionSpec(family=first.family, params=first.params, j_range=first.j_range,
                            file=path, rock_type=None, by_rock_type=specs, rock_rule=mf.rule)

    def read_well(self, raw: dict, index: int, zone_names: list[str]) -> WellSpec:
        key = f"wells[{_label(raw, ('name', 'las'), index)}]"
        t = self.table(raw, key, _WELL_KEYS, required=("las",))
        las_text = self.text(t["las"], f"{key}.las")
        base_dir = self.path.parent.resolve()
        las = (base_dir / las_text).resolve()
        if not las.is_file():
            found = "a folder" if las.exists() else "nothing"
            raise self.error(f"{key}.las", f"LAS file {las_text!r} not found: looked for {las} "
                             f"and found {found}",
                             hint=f"paths are relative to the project file's folder {base_dir}")
        name = self.text(t["name"], f"{key}.name") if "name" in t else None
        datum = (self.quantity(t["datum_elevation"], f"{key}.datum_elevation", "length")
                 if "datum_elevation" in t else None)

        curves: dict[str, str] = {}
        if "curves" in t:
            c = self.table(t["curves"], f"{key}.curves", _CURVE_ROLES,
                           what="a table of role = mnemonic")
            for role, mnem in c.items():
                curves[role] = self.text(mnem, f"{key}.curves.{role}")

        tops: dict[str, tuple[float, float]] = {}
        if "tops" in t:
            tt = t["tops"]
            if not isinstance(tt, dict):
                raise self.error(f"{key}.tops", f"expected a table of zone = [top, base], "
                                 f"found {_show(tt)}", hint="write it as a [wells.tops] section")
            for zone, pair in tt.items():
                zkey = f"{key}.tops.{zone}"
                if zone not in zone_names:
                    close = difflib.get_close_matches(zone, zone_names, n=1)
                    raise self.error(zkey, f"tops name zone {zone!r}, which no [[zones]] entry "
                                     "defines",
                                     hint=(f"did you mean {close[0]!r}? " if close else "")
                                     + "known zones: " + ", ".join(zone_names))
                if not isinstance(pair, list) or len(pair) != 2:
                    raise self.error(zkey, f"expected [top, base], found {_show(pair)}",
                                     hint='write e.g. Upper = ["2010 m", "2120 m"] (measured depth)')
                top = self.quantity(pair[0], zkey, "length")
                base = self.quantity(pair[1], zkey, "length")
                if not top < base:
                    raise self.error(zkey, f"top {pair[0]!r} is not above base {pair[1]!r} "
                                     "(measured depth)", hint="write [top, base] with top < base")
                tops[zone] = (top, base)
            self.check_overlaps(tops, lambda z: f"{key}.tops.{z}", "measured depth")
        survey = survey_format = location = None
        if "survey" in t:
            survey = self.existing_file(t["survey"], f"{key}.survey", "survey")
        if "survey_format" in t:
            if survey is None:
                raise self.error(f"{key}.survey_format", "survey_format is given but survey is not",
                                 hint='add survey = "<file>" or remove survey_format')
            survey_format = self.text(t["survey_format"], f"{key}.survey_format", _SURVEY_FORMATS)
        if "location" in t:
            loc = self.table(t["location"], f"{key}.location", ("east", "north"),
                             required=("east", "north"), what="a table { east = ..., north = ... }")
            location = (self.quantity(loc["east"], f"{key}.location.east", "length"),
                        self.quantity(loc["north"], f"{key}.location.north", "length"))
        return WellSpec(name=name, las=las, datum_elevation=datum, curves=curves, tops=tops,
                        survey=survey, survey_format=survey_format, location=location)

    def existing_file(self, value: Any, key: str, what: str) -> Path:
        """A file path relative to the project file that must exist."""
        text = self.text(value, key)
        base_dir = self.path.parent.resolve()
        p = (base_dir / text).resolve()
        if not p.is_file():
            found = "a folder" if p.exists() else "nothing"
            raise self.error(key, f"{what} file {text!r} not found: looked for {p} and found {found}",
                             hint=f"paths are relative to the project file's folder {base_dir}")
        return p

    def merge_tops_file(self, tops_file: Path, wells: list[WellSpec],
                        zone_names: list[str]):
        """Add the tops file's rows to the wells; a zone given twice for a well is an error.

        Rows are matched to a well by its ``name`` or its LAS file stem. Rows of other
        well names are returned as pending (well name -> rows): they may match a well
        whose name comes from its LAS file's WELL item, known only when it is read.
        """
        from .io.tops import read_tops

        try:
            rows = read_tops(tops_file, self.units["length"])
        except InputFileError as exc:
            raise self.error("project.tops_file", f"{exc.where}: {exc.what}", hint=exc.hint) from None
        by_name: dict[str, int] = {}
        for i, w in enumerate(wells):
            for label in {w.name, w.las.stem} - {None}:
                by_name.setdefault(label, i)
        md_tops = [dict(w.tops) for w in wells]
        tv_tops = [dict(w.tops_tvdss) for w in wells]
        pending: dict[str, list] = {}
        unnamed = any(w.name is None for w in wells)
        for r in rows:
            where = f"{tops_file}, line {r.line}"
            if r.well not in by_name and not unnamed:
                close = difflib.get_close_matches(r.well, list(by_name), n=1)
                raise self.error("project.tops_file", f"{where}: well {r.well!r} matches no [[wells]] "
                                 "entry (by name or LAS file name)",
                                 hint=(f"did you mean {close[0]!r}? " if close else "")
                                 + "remove the row or add the well to the project")
            if r.zone not in zone_names:
                close = difflib.get_close_matches(r.zone, zone_names, n=1)
                raise self.error("project.tops_file", f"{where}: zone {r.zone!r} is not a [[zones]] name",
                                 hint=(f"did you mean {close[0]!r}? " if close else "")
                                 + "known zones: " + ", ".join(zone_names))
            if r.well not in by_name:
                pending.setdefault(r.well, []).append(r)
                continue
            i = by_name[r.well]
            if r.zone in md_tops[i] or r.zone in tv_tops[i]:
                raise self.error(f"wells[{wells[i].name or wells[i].las.stem}].tops.{r.zone}",
                                 f"zone {r.zone!r} of well {r.well!r} is given both here and in the "
                                 f"tops file ({where})",
                                 hint="give each well's zone window in one place only")
            (md_tops if r.depth_type == "MD" else tv_tops)[i][r.zone] = (r.top, r.base)
        out = []
        for w, mt, tt in zip(wells, md_tops, tv_tops):
            label = w.name or w.las.stem
            self.check_overlaps(mt, lambda z, lb=label: f"wells[{lb}].tops.{z}", "measured depth")
            self.check_overlaps(tt, lambda z, lb=label: f"wells[{lb}].tops.{z} (tops file)", "TVDSS")
            out.append(_dc.replace(w, tops=mt, tops_tvdss=tt))
        return out, pending

    # --- cross checks ------------------------------------------------------------
    def check_overlaps(self, windows: dict[str, tuple[float, float]], key_of, depth_name: str):
        """Error if two [top, base) windows overlap (touching is fine)."""
        items = sorted(windows.items(), key=lambda kv: kv[1][0])
        for (name_a, (top_a, base_a)), (name_b, (top_b, base_b)) in zip(items, items[1:]):
            if top_b < base_a:
                raise self.error(key_of(name_b),
                                 f"zone {name_b!r} ({self.length_text(top_b)} to "
                                 f"{self.length_text(base_b)}) overlaps zone {name_a!r} "
                                 f"({self.length_text(top_a)} to {self.length_text(base_a)}) "
                                 f"in {depth_name}",
                                 hint="zone windows may touch but not overlap; "
                                      "move one top or base")

    def check_zone_windows(self, zones: list[ZoneSpec], wells: list[WellSpec],
                           pending: dict | None = None) -> None:
        windows = {z.name: (z.top, z.base) for z in zones if z.top is not None}
        self.check_overlaps(windows, lambda z: f"zones[{z}]", "TVDSS")
        with_tops = {name for w in wells for name in list(w.tops) + list(w.tops_tvdss)}
        with_tops |= {r.zone for rows in (pending or {}).values() for r in rows}
        for z in zones:
            if z.top is None and z.name not in with_tops:
                raise self.error(f"zones[{z.name}].top",
                                 f"zone {z.name!r} has no top and base, and no well gives tops "
                                 "for it",
                                 hint=f"give top and base here (TVDSS), or add {z.name} = "
                                      "[top, base] under [wells.tops] of the wells")
