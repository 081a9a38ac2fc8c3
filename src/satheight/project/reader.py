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
    core_files = ["plugs.csv"]      # optional: core plug tables (io/core_data.py layouts); plugs drawn on their wells' track plots
    pressure_file = "pressures.csv" # optional: formation-pressure points (io/pressures.py layout), drawn on their wells' track plots

    [log_sw]                        # optional table; defaults method="auto", a=1, m=2, n=2
    method = "auto"                 # "curve" (use the well's Sw curve), "archie" (from Rt and porosity), "auto" (curve if present else archie),
                                    # "simandoux" or "indonesia" (shaly sand: from Rt, porosity and the shale-volume curve, role shale)
    a = 1.0                         # Archie tortuosity factor [-] > 0
    m = 2.0                         # cementation exponent [-] > 0
    n = 2.0                         # saturation exponent [-] > 0
    rw = "0.045 ohm.m"              # formation-water resistivity at formation temperature, > 0. Required when method = "archie"; optional for auto
    rsh = "2.5 ohm.m"               # shale resistivity, > 0; required by (and only allowed with) simandoux and indonesia

    [comparison]                    # optional: net-reservoir cutoffs for SHM vs log Sw statistics and HCPT
    min_porosity = 0.08             # fraction (or "8 %"); default 0
    min_permeability = "0.1 mD"     # bare number in mD; default 0
    max_shale = 0.4                 # optional: shale volume (curve role shale) above this fraction is not net; needs a shale curve in every well

    [[wells]]
    las = "wells/A-1.las"           # required, relative to the project file; must exist (error names the resolved path)
    name = "A-1"                    # optional, default: the LAS file's well name
    datum_elevation = "25 m"        # optional: elevation of the log depth reference (KB, drill floor) above the TVDSS datum (sea level); bare number in project length unit; may be negative (ground below sea level) -> float SI metres; default None (take from LAS header)
    curves = { porosity = "PHIE", permeability = "PERM", resistivity = "RT", sw = "SW", shale = "VSH" }   # optional role -> mnemonic overrides; roles allowed: porosity, permeability, resistivity, sw, shale
    survey = "A-1_survey.csv"       # optional: deviation survey (CSV or LAS, io/survey.py layout), relative to this file; without it the well is vertical
    survey_format = "csv"           # optional: "csv" or "las"; default from the file ending
    location = { east = 1200, north = 800 }   # optional: well-head map position (project length unit), used by the field cross-section
    [wells.tops]                    # optional: zone name = [top, base] in this well's measured depth (project length unit for bare numbers)
    Upper = ["2010 m", "2120 m"]
    [wells.fwl]                     # optional: zone name = this well's own FWL TVDSS (a compartment or stepped contact); wins over the zone's fwl and fwl_plane
    Upper = "2065 m"

    [[zones]]
    name = "Upper"                  # required, unique
    top = "1980 m"                  # TVDSS, positive down; optional if wells give tops for this zone
    base = "2100 m"                 # TVDSS; top < base
    fwl = "2060 m"                  # free-water level TVDSS; needed by run (fwl and pressures find it without);
                                    # at the plane's reference point when fwl_plane is given
    fwl_plane = { east = 1200, north = 800, gradient_east = 0.004, gradient_north = 0 }   # optional tilted FWL: plane through fwl at map point (east, north) (project length unit),
                                    # deepening by gradient_east / gradient_north metres per metre (plain numbers, positive deeper); evaluated at each well's location (required then);
                                    # |gradient| above 0.05 needs "fwl_plane" in allow_unusual
    hydrocarbon = "oil"             # "oil", "gas" or "air"
    water_density = "1.08 g/cm3"    # reservoir conditions; a density OR a pressure gradient ("0.468 psi/ft", "10.6 kPa/m") -> kg/m3
    hydrocarbon_density = "0.75 g/cm3"
    sigma_cos_theta = "26 mN/m"     # or dyn/cm, N/m; > 0
    allow_unusual = []              # optional: names of this zone's values allowed outside their plausible range
    # instead of the densities: correlation inputs (see satheight.project.fluid_keys):
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
    # file = "core_models.json"     # model file (io/model_file.py), relative to the project file
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
* The FWL may lie outside the zone window (a zone may sit wholly above or below
  its FWL), but not more than 1000 m outside a well's logged TVDSS nor above its
  depth reference (checked when the well is read).
* ``water_density`` must be greater than ``hydrocarbon_density``.
* Every physical value must lie in its plausible range
  (:data:`satheight.plausible.RANGES`, reproduced in the README): brine 950-1250,
  oil 500-1000, gas 50-400 kg/m3 (a hydrocarbon density is checked against the
  range of ``hydrocarbon``), sigma*cos(theta) 1-100 mN/m, FWL 0-10000 m TVDSS,
  Archie a 0.3-3, m 1-4, n 1-5, rw 0.005-20 ohm.m, porosity cutoff 0-0.6,
  permeability cutoff 1e-4-1e5 mD, conditions and salinity likewise. A value
  outside is refused with the key, the value as read and, where one fits, the
  unit probably meant ("did you mean 1.08 g/cm3?"). A deliberate unusual value is
  let through by naming it in the list ``allow_unusual`` of the same table, e.g.
  ``allow_unusual = ["hydrocarbon_density", "fwl"]`` in a ``[[zones]]`` entry,
  ``allow_unusual = ["m"]`` in ``[log_sw]`` (also ``"rsh"``, shale resistivity
  0.1-200 ohm.m), ``["min_porosity"]`` in ``[comparison]``, ``["datum_elevation"]`` or
  ``["fwl"]`` (the ``[wells.fwl]`` values) in a ``[[wells]]`` entry. A zone's list
  may also name ``fwl_plane`` (a tilt above 0.05 m/m), ``gas_oil_level``, ``gas_density``, ``sigma_cos_theta``,
  ``gas_sigma_cos_theta``, ``pressure``, ``temperature``, ``pressure_gradient`` and
  ``salinity``; other names are refused.
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

import re
import tomllib
from pathlib import Path
from typing import Any

from ..engine import Zone
from ..errors import InputFileError, ProjectFileError
from ..units import UNIT_SYSTEMS
from ..plausible import PHASE_DENSITY, RANGES
from .fluid_keys import CONDITION_ALLOW, FLUID_ZONE_KEYS, read_zone_fluids
from .functions import read_function
from .measured import MEASURED_KEYS, read_measured
from .types import ComparisonSpec, LogSwSpec, Project, WellSpec
from .uncertainty_keys import UNCERTAINTY_TOP_KEY, UNCERTAINTY_ZONE_KEY, read_uncertainty
from .values import ALLOW_KEY, ValueReader, _label, _show
from .wells import merge_tops_file, read_well

__all__ = ["load_project", "parse_project"]

_TOP_KEYS = ("project", "log_sw", "comparison", "wells", "zones", UNCERTAINTY_TOP_KEY)
_PROJECT_KEYS = ("name", "units", "tops_file") + MEASURED_KEYS
_LOG_SW_KEYS = ("method", "a", "m", "n", "rw", "rsh", ALLOW_KEY)
_COMPARISON_KEYS = ("min_porosity", "min_permeability", "max_shale", ALLOW_KEY)
_LOG_SW_METHODS = ("curve", "archie", "auto", "simandoux", "indonesia")
_ZONE_KEYS = ("name", "top", "base", "fwl", "fwl_plane", "hydrocarbon", "water_density",
              "hydrocarbon_density", "sigma_cos_theta", "function", ALLOW_KEY) + FLUID_ZONE_KEYS \
              + (UNCERTAINTY_ZONE_KEY,)
#: Values of a [[zones]] entry that may be listed in its allow_unusual.
ZONE_ALLOW = ("fwl", "fwl_plane", "gas_oil_level", "water_density", "hydrocarbon_density", "gas_density",
              "sigma_cos_theta", "gas_sigma_cos_theta") + CONDITION_ALLOW
_HYDROCARBONS = ("oil", "gas", "air")
_PLANE_KEYS = ("east", "north", "gradient_east", "gradient_north")
#: Largest FWL tilt taken without allow_unusual [m/m]: hydrodynamic tilts are commonly
#: a few metres per kilometre, rarely above a few tens (common practice).
_MAX_FWL_TILT = 0.05


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
# the sections
# ----------------------------------------------------------------------------------
class _Reader(ValueReader):
    """Reads the sections of one project file (values through :class:`ValueReader`)."""

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

        zones: list[Zone] = []
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
            w = read_well(self, raw, i, zone_names)
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
            wells, pending = merge_tops_file(self, tops_file, wells, zone_names)
        self.check_zone_windows(zones, wells, pending)
        return Project(path=self.path.resolve(), name=name, unit_system=self.unit_system,
                       wells=wells, zones=zones, log_sw=log_sw, comparison=comparison,
                       tops_file=tops_file, tops_pending=pending,
                       uncertainty=read_uncertainty(data, self.path, self.unit_system,
                                                    {z.name: z.function for z in zones}),
                       measured=read_measured(self, data["project"]))

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
        rsh = self.quantity(t["rsh"], "log_sw.rsh", "resistivity", positive=True) if "rsh" in t else None
        allowed = self.allow_list(t, "log_sw", ("a", "m", "n", "rw", "rsh"))
        for name, v in (("a", a), ("m", m), ("n", n), ("rw", rw), ("rsh", rsh)):
            if name in t:
                self.plausible(name if name in ("rw", "rsh") else f"archie_{name}", v,
                               f"log_sw.{name}", t[name], allowed=allowed)
        if method not in ("curve", "auto") and rw is None:
            raise self.error("log_sw.rw", f'method = "{method}" needs rw, and rw is missing',
                             hint='add rw = "0.045 ohm.m", the water resistivity at formation '
                                  'temperature, or use method = "curve"')
        if method in ("simandoux", "indonesia") and rsh is None:
            raise self.error("log_sw.rsh", f'method = "{method}" needs rsh, and rsh is missing',
                             hint='add rsh = "2.5 ohm.m", the resistivity of the shale (read in '
                                  'a thick shale), and a shale-volume curve (role shale)')
        if rsh is not None and method not in ("simandoux", "indonesia"):
            raise self.error("log_sw.rsh", f'rsh is given but method = "{method}" does not use it',
                             hint='use method = "simandoux" or "indonesia", or remove rsh')
        return LogSwSpec(method=method, a=a, m=m, n=n, rw=rw, rsh=rsh)

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
        vsh = None
        if "max_shale" in t:
            vsh = self.quantity(t["max_shale"], "comparison.max_shale", "fraction")
            if not 0.0 < vsh <= 1.0:
                raise self.error("comparison.max_shale",
                                 f"expected a shale-volume cutoff in (0, 1], found {t['max_shale']!r}",
                                 hint='write a fraction such as 0.4 or text such as "40 %"')
        allowed = self.allow_list(t, "comparison", ("min_porosity", "min_permeability"))
        if "min_porosity" in t:
            self.plausible("porosity", phi, "comparison.min_porosity", t["min_porosity"],
                           allowed=allowed)
        if k > 0.0:
            self.plausible("permeability", k, "comparison.min_permeability",
                           t["min_permeability"], allowed=allowed)
        return ComparisonSpec(min_porosity=phi, min_permeability=k, max_shale=vsh)

    def read_zone(self, raw: dict, index: int) -> Zone:
        key = f"zones[{_label(raw, ('name',), index)}]"
        t = self.table(raw, key, _ZONE_KEYS,
                       required=("name", "hydrocarbon", "sigma_cos_theta", "function"))
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

        # no fwl: the fwl and pressures commands look for it; run refuses the zone
        fwl = self.quantity(t["fwl"], f"{key}.fwl", "length") if "fwl" in t else None
        hydrocarbon = self.text(t["hydrocarbon"], f"{key}.hydrocarbon", _HYDROCARBONS)
        allowed = self.allow_list(t, key, ZONE_ALLOW)
        if fwl is not None:
            self.plausible("fwl", fwl, f"{key}.fwl", t["fwl"], allowed=allowed)
        # densities: given, or from correlations; optional three-phase keys (fluid_keys)
        zf = read_zone_fluids(self, t, key, hydrocarbon, fwl, allowed)
        self.check_densities(t, key, hydrocarbon, zf, allowed)
        rho_w, rho_h = zf["water_density"], zf["hydrocarbon_density"]
        if not rho_w > rho_h:
            raise self.error(f"{key}.water_density",
                             f"water_density {t.get('water_density', 'from water')!r} "
                             f"({self.unit_text(rho_w, 'density')}) is not greater than "
                             f"hydrocarbon_density {t.get('hydrocarbon_density', 'from a correlation')!r} "
                             f"({self.unit_text(rho_h, 'density')}): water must be denser than "
                             "the hydrocarbon",
                             hint="check the two values and their units")
        sigma = self.quantity(t["sigma_cos_theta"], f"{key}.sigma_cos_theta", "tension",
                              positive=True)
        self.plausible("sigma_cos_theta", sigma, f"{key}.sigma_cos_theta", t["sigma_cos_theta"],
                       allowed=allowed)
        if zf["gas_sigma_cos_theta"] is not None:
            self.plausible("sigma_cos_theta", zf["gas_sigma_cos_theta"],
                           f"{key}.gas_sigma_cos_theta", t["gas_sigma_cos_theta"], allowed=allowed)
        function = read_function(self, t["function"], f"{key}.function")
        plane = self.read_fwl_plane(t, key, allowed)
        return Zone(name=name, top=top, base=base, fwl=fwl, hydrocarbon=hydrocarbon,
                    sigma_cos_theta=sigma, function=function, allow_unusual=allowed,
                    fwl_plane=plane, **zf)

    def read_fwl_plane(self, t: dict, key: str, allowed: frozenset) -> tuple | None:
        """``fwl_plane = { east, north, gradient_east, gradient_north }``: a tilted FWL
        through ``fwl`` at map point (east, north) [m], gradients in m/m (positive deeper)."""
        if "fwl_plane" not in t:
            return None
        k = f"{key}.fwl_plane"
        p = self.table(t["fwl_plane"], k, _PLANE_KEYS, required=_PLANE_KEYS,
                       what="a table { east, north, gradient_east, gradient_north }")
        east = self.quantity(p["east"], f"{k}.east", "length")
        north = self.quantity(p["north"], f"{k}.north", "length")
        ge = self.number(p["gradient_east"], f"{k}.gradient_east")
        gn = self.number(p["gradient_north"], f"{k}.gradient_north")
        if "fwl_plane" not in allowed and (ge * ge + gn * gn) ** 0.5 > _MAX_FWL_TILT:
            lu = self.units["length"]
            raise self.error(k, f"the FWL plane dips {(ge * ge + gn * gn) ** 0.5:g} {lu} per {lu} "
                             f"(more than {_MAX_FWL_TILT:g}, about 3 degrees)",
                             hint="gradients are depth change per horizontal distance (m/m or "
                                  'ft/ft); if the tilt is deliberate, add "fwl_plane" to '
                                  "allow_unusual = [...] of the zone")
        return (east, north, ge, gn)

    def check_densities(self, t: dict, key: str, hydrocarbon: str, zf: dict,
                        allowed: frozenset) -> None:
        """Each density of a zone inside the range of its phase (given or computed)."""
        given = {"water": "water_density", "hydrocarbon": "hydrocarbon_density",
                 "gas": "gas_density"}
        rows = [("water", "water_density", zf["water_density"]),
                ("hydrocarbon", PHASE_DENSITY[hydrocarbon], zf["hydrocarbon_density"])]
        if zf["gas_density"] is not None:
            rows.append(("gas", "gas_density", zf["gas_density"]))
        for phase, name, rho in rows:
            k = given[phase]
            source = {"oil": "oil", "gas": "gas", "air": "conditions"}.get(
                hydrocarbon if phase == "hydrocarbon" else phase, phase)
            derived = "" if k in t else f"computed from {source} = {{...}}"
            hint = ""
            if phase == "hydrocarbon":
                fits = [ph for ph, n in PHASE_DENSITY.items()
                        if ph not in (hydrocarbon, "air") and RANGES[n].contains(rho)]
                du = self.units["density"]
                hint = "".join(f"{self.unit_text(rho, 'density')} fits {ph} "
                               f"({RANGES[PHASE_DENSITY[ph]].text(du)}): "
                               f'is hydrocarbon = "{ph}" meant? ' for ph in fits)
            where = f"{key}.{k}" if k in t else f"{key}.{source}"
            self.plausible(name, rho, where, t.get(k), allowed=allowed, allow_as=k,
                           derived=derived, hint=hint)

    def check_zone_windows(self, zones: list[Zone], wells: list[WellSpec],
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
