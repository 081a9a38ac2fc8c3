"""Project-file keys for computed fluid densities and three-phase columns.

Used by :mod:`satheight.project` when it reads a ``[[zones]]`` entry. A zone's
densities may be given directly (``water_density``, ``hydrocarbon_density``,
``gas_density``: a density or a gradient, as before) or computed at reservoir
conditions from published correlations (:mod:`satheight.fluids`):

.. code-block:: toml

    [[zones]]
    name = "Upper"
    hydrocarbon = "oil"
    water = { salinity = "80000 ppm" }                  # Batzle & Wang (1992) brine
    oil = { api = 35, solution_gor = "500 scf/stb", gas_gravity = 0.75 }   # Standing
    conditions = { pressure = "30 MPa", temperature = "80 degC" }
    # or from gradients, evaluated at the zone's FWL (or at conditions.depth):
    # conditions = { pressure_gradient = "0.45 psi/ft", temperature_gradient = "30 degC/km",
    #                surface_pressure = "14.7 psi", surface_temperature = "15 degC" }
    # three-phase column: gas cap over oil over water
    gas_oil_level = "2050 m"                            # free-oil level, TVDSS, above the FWL
    gas = { gravity = 0.65, z_method = "dak" }          # or gas_density = "0.2 g/cm3"
    gas_sigma_cos_theta = "50 mN/m"                     # gas-water sigma*cos(theta)

For ``hydrocarbon = "gas"`` the ``gas`` table gives the hydrocarbon density; for
``hydrocarbon = "air"`` (a water table) the air density is the ideal-gas value
at the zone's conditions unless ``hydrocarbon_density`` is given.
"""

from __future__ import annotations

import math
from typing import Any

from .. import fluids
from ..constants import FOOT, STANDARD_GRAVITY
from ..errors import SatHeightError, UnitError
from ..units import parse_quantity, split_quantity, normalise_unit

#: Zone keys this module reads (added to the project reader's allowed keys).
FLUID_ZONE_KEYS = ("water", "oil", "gas", "conditions", "gas_oil_level", "gas_density",
                   "gas_sigma_cos_theta")

_WATER_KEYS = ("salinity",)
_OIL_KEYS = ("api", "solution_gor", "gas_gravity")
_GAS_KEYS = ("gravity", "z_method")
#: Values of the conditions and water tables that a zone's allow_unusual may list.
CONDITION_ALLOW = ("pressure", "temperature", "pressure_gradient", "salinity")

_CONDITION_KEYS = ("pressure", "temperature", "pressure_gradient", "temperature_gradient",
                   "surface_pressure", "surface_temperature", "depth")

_GOR_UNITS = {"m3/m3": 1.0, "sm3/sm3": 1.0, "scf/stb": FOOT**3 / 0.158987294928,
              "scf/bbl": FOOT**3 / 0.158987294928, "ft3/bbl": FOOT**3 / 0.158987294928}
_TEMP_DIFF = {"degc": 1.0, "c": 1.0, "°c": 1.0, "k": 1.0, "degf": 5 / 9, "f": 5 / 9, "°f": 5 / 9}
_DEFAULTS = {"metric": {"gor": "m3/m3", "tgrad": "degC/km", "pgrad": "kPa/m"},
             "field": {"gor": "scf/stb", "tgrad": "degF/100ft", "pgrad": "psi/ft"}}


# ----------------------------------------------------------------------------------
# unit helpers for quantities units.py does not know
# ----------------------------------------------------------------------------------
def parse_salinity(value: Any) -> float:
    """NaCl mass fraction [fraction] from ``0.08``, ``"8 %"``, ``"80000 ppm"`` or ``"0.08 frac"``.

    Raises
    ------
    UnitError
        On an unknown unit or a bare number of 1 or more (it looks like ppm).
    """
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise UnitError(f"expected a salinity, found {value!r}",
                        hint='write e.g. "80000 ppm", "8 %" or 0.08')
    if isinstance(value, str):
        number, unit = split_quantity(value)
    else:
        number, unit = float(value), ""
    u = normalise_unit(unit)
    scale = {"": 1.0, "frac": 1.0, "fraction": 1.0, "%": 0.01, "percent": 0.01, "pct": 0.01,
             "wt%": 0.01, "ppm": 1e-6, "mg/kg": 1e-6, "g/kg": 1e-3}.get(u)
    if scale is None:
        raise UnitError(f"unit {unit!r} is not a salinity unit",
                        hint='use a mass fraction: "ppm", "%", "g/kg" or a plain fraction')
    s = number * scale
    if not (math.isfinite(s) and 0 <= s < 1):
        raise UnitError(f"salinity {value!r} is not a mass fraction in [0, 1)",
                        hint='a bare number is a fraction (0.08); write ppm as "80000 ppm"')
    return s


def parse_gor(value: Any, default_unit: str) -> float:
    """Solution gas-oil ratio [m^3/m^3] from ``"500 scf/stb"``, ``"89 m3/m3"`` or a bare number."""
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise UnitError(f"expected a gas-oil ratio, found {value!r}",
                        hint='write e.g. "500 scf/stb" or "89 m3/m3"')
    number, unit = split_quantity(value) if isinstance(value, str) else (float(value), "")
    u = normalise_unit(unit or default_unit)
    if u not in _GOR_UNITS:
        raise UnitError(f"unit {unit!r} is not a gas-oil ratio unit",
                        hint="use one of " + ", ".join(_GOR_UNITS))
    if not (math.isfinite(number) and number >= 0):
        raise UnitError(f"gas-oil ratio {value!r} must be zero or more")
    return number * _GOR_UNITS[u]


def parse_temperature_gradient(value: Any, default_unit: str) -> float:
    """Geothermal gradient [K/m] from ``"30 degC/km"``, ``"1.6 degF/100ft"``, ``"0.03 K/m"``."""
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise UnitError(f"expected a temperature gradient, found {value!r}",
                        hint='write e.g. "30 degC/km" or "1.6 degF/100ft"')
    number, unit = split_quantity(value) if isinstance(value, str) else (float(value), "")
    u = normalise_unit(unit or default_unit).replace(" ", "")
    if "/" not in u:
        raise UnitError(f"unit {unit!r} is not a temperature gradient unit",
                        hint='write it as temperature per length, e.g. "degC/km"')
    num, den = u.split("/", 1)
    if num not in _TEMP_DIFF:
        raise UnitError(f"unit {unit!r}: {num!r} is not a temperature unit",
                        hint="use degC, K or degF per length")
    i = 0
    while i < len(den) and (den[i].isdigit() or den[i] == "."):
        i += 1
    count = float(den[:i]) if i else 1.0
    try:
        length = parse_quantity(f"{count} {den[i:]}", "length")
    except UnitError:
        raise UnitError(f"unit {unit!r}: {den!r} is not a length",
                        hint='use e.g. "degC/km", "degC/100m" or "degF/100ft"') from None
    return number * _TEMP_DIFF[num] / length


# ----------------------------------------------------------------------------------
# the zone reader
# ----------------------------------------------------------------------------------
class _Conditions:
    """Reservoir pressure [Pa] and temperature [K] of a zone, read once when first needed."""

    def __init__(self, reader, t: dict, key: str, fwl: float, notes: dict, allowed: frozenset):
        self.reader, self.t, self.key, self.fwl, self.notes = reader, t, key, fwl, notes
        self.allowed = allowed
        self.value: tuple[float, float] | None = None

    def __call__(self) -> tuple[float, float]:
        if self.value is None:
            p, temp, info = _read_conditions(self.reader, self.t, self.key, self.fwl,
                                             self.reader.unit_system)
            _check_conditions(self.reader, self.t, self.key, p, temp, info, self.allowed)
            self.value = (p, temp)
            self.notes["conditions"] = info
        return self.value


def read_zone_fluids(reader, t: dict, key: str, hydrocarbon: str, fwl: float,
                     allowed: frozenset = frozenset()) -> dict:
    """Densities and three-phase keys of one ``[[zones]]`` entry (see module docstring).

    Parameters
    ----------
    reader : satheight.project.reader._Reader
        Gives ``quantity``, ``number``, ``text``, ``table``, ``error`` and the unit system.
    t : dict
        The zone's table (not modified).
    key : str
        The zone's key prefix in messages, e.g. ``zones[Upper]``.
    hydrocarbon : str
        ``"oil"``, ``"gas"`` or ``"air"``.
    fwl : float
        The zone's FWL TVDSS [m]: the default depth at which conditions are evaluated.
    allowed : frozenset of str
        The zone's ``allow_unusual`` names (conditions and salinity are range-checked here;
        the densities by the reader).

    Returns
    -------
    dict
        The fluid fields of :class:`satheight.engine.Zone`: ``water_density``,
        ``hydrocarbon_density`` [kg/m^3], ``gas_oil_level`` [m], ``gas_density``
        [kg/m^3], ``gas_sigma_cos_theta`` [N/m] (the last three ``None`` without a gas
        cap) and ``fluids`` (how each density was obtained).

    Raises
    ------
    ProjectFileError
        Naming the file and key on every missing, conflicting or bad value.
    """
    notes: dict[str, dict] = {}
    conditions = _Conditions(reader, t, key, fwl, notes, allowed)
    rho_w = _water_density(reader, t, key, conditions, notes, allowed)
    rho_h = _hydrocarbon_density(reader, t, key, hydrocarbon, conditions, notes)
    out = {"water_density": rho_w, "hydrocarbon_density": rho_h, "gas_oil_level": None,
           "gas_density": None, "gas_sigma_cos_theta": None, "fluids": notes}
    gas_keys = [k for k in ("gas_density", "gas_sigma_cos_theta") if k in t]
    if "gas_oil_level" not in t:
        if gas_keys:
            raise reader.error(f"{key}.{gas_keys[0]}", f"{gas_keys[0]} is given without "
                               "gas_oil_level", hint="add gas_oil_level (the free-oil level, "
                               "TVDSS) for a gas cap, or remove the key")
        return out
    out.update(_gas_cap(reader, t, key, hydrocarbon, fwl, rho_h, conditions, notes))
    reader.plausible("fwl", out["gas_oil_level"], f"{key}.gas_oil_level", t["gas_oil_level"],
                     allowed=allowed)
    return out


def _both(reader, t: dict, key: str, direct: str, table: str) -> None:
    if direct in t and table in t:
        raise reader.error(f"{key}.{table}", f"both {direct} and {table} are given",
                           hint=f"give the density directly ({direct}) or the correlation "
                                f"inputs ({table} = {{...}}), not both")


def _water_density(reader, t, key, conditions, notes, allowed) -> float:
    _both(reader, t, key, "water_density", "water")
    if "water_density" in t:
        notes["water"] = {"method": "given"}
        return reader.quantity(t["water_density"], f"{key}.water_density", "density",
                               positive=True)
    if "water" in t:
        wt = reader.table(t["water"], f"{key}.water", _WATER_KEYS, required=("salinity",))
        try:
            s = parse_salinity(wt["salinity"])
        except UnitError as exc:
            raise reader.error(f"{key}.water.salinity", exc.what, hint=exc.hint) from None
        reader.plausible("salinity", s, f"{key}.water.salinity", wt["salinity"], allowed=allowed)
        p, temp = conditions()
        rho_w = float(_guard(reader, f"{key}.water", fluids.brine_density_batzle_wang, p, temp, s))
        notes["water"] = {"method": "Batzle & Wang 1992 eq. 27b", "salinity": s}
        return rho_w
    raise reader.error(f"{key}.water_density", "required key 'water_density' is missing",
                       hint='add water_density = "1.08 g/cm3" (or a gradient), or the '
                            'correlation inputs water = { salinity = "80000 ppm" } with '
                            "conditions = {...}")


def _hydrocarbon_density(reader, t, key, hydrocarbon, conditions, notes) -> float:
    """Density of the hydrocarbon of the (lower) column [kg/m^3]."""
    table_for = {"oil": "oil", "gas": "gas", "air": None}[hydrocarbon]
    three_phase = "gas_oil_level" in t
    for name in ("oil", "gas"):
        if name in t and name != table_for and not (name == "gas" and three_phase):
            raise reader.error(f"{key}.{name}", f"a {name} table is given but hydrocarbon is "
                               f"{hydrocarbon!r}" + ("" if name == "oil" else
                                                     " and there is no gas_oil_level"),
                               hint=f"remove {name} = {{...}} or change hydrocarbon")
    if table_for is not None:
        _both(reader, t, key, "hydrocarbon_density", table_for)
    if "hydrocarbon_density" in t:
        notes["hydrocarbon"] = {"method": "given"}
        return reader.quantity(t["hydrocarbon_density"], f"{key}.hydrocarbon_density",
                               "density", positive=True)
    if table_for == "oil" and "oil" in t:
        rho_h, notes["hydrocarbon"] = _oil_density(reader, t["oil"], f"{key}.oil", conditions,
                                                   reader.unit_system)
        return rho_h
    if table_for == "gas" and "gas" in t:
        rho_h, notes["hydrocarbon"] = _gas_density(reader, t["gas"], f"{key}.gas", conditions)
        return rho_h
    if hydrocarbon == "air" and "conditions" in t:
        p, temp = conditions()
        rho_h = float(_guard(reader, f"{key}.conditions", fluids.air_density, p, temp))
        notes["hydrocarbon"] = {"method": "ideal gas (dry air)"}
        return rho_h
    alt = {"oil": "oil = { api = 35, solution_gor = \"500 scf/stb\", gas_gravity = 0.75 }",
           "gas": "gas = { gravity = 0.65 }",
           "air": "conditions = {...} (air as an ideal gas)"}[hydrocarbon]
    raise reader.error(f"{key}.hydrocarbon_density",
                       "required key 'hydrocarbon_density' is missing",
                       hint=f'add hydrocarbon_density = "0.75 g/cm3", or {alt}')


def _gas_cap(reader, t, key, hydrocarbon, fwl, rho_h, conditions, notes) -> dict:
    """``gas_oil_level``, ``gas_density`` and ``gas_sigma_cos_theta`` of a gas cap."""
    if hydrocarbon != "oil":
        raise reader.error(f"{key}.gas_oil_level", "a gas_oil_level needs hydrocarbon = 'oil' "
                           f"(the oil leg under the gas cap), found {hydrocarbon!r}",
                           hint='set hydrocarbon = "oil" and give the gas with gas_density '
                                "or gas = {...}")
    gol = reader.quantity(t["gas_oil_level"], f"{key}.gas_oil_level", "length")
    if fwl is None:
        raise reader.error(f"{key}.gas_oil_level", "a gas_oil_level needs the zone's fwl, and "
                           "'fwl' is missing", hint='give fwl = "<depth> m" below the gas_oil_level')
    if not gol < fwl:
        raise reader.error(f"{key}.gas_oil_level", f"gas_oil_level {t['gas_oil_level']!r} is "
                           f"not above the fwl {reader.length_text(fwl)} (TVDSS, positive down)",
                           hint="the free-oil level must be shallower than the FWL")
    _both(reader, t, key, "gas_density", "gas")
    if "gas_density" in t:
        rho_g = reader.quantity(t["gas_density"], f"{key}.gas_density", "density",
                                positive=True)
        notes["gas"] = {"method": "given"}
    elif "gas" in t:
        rho_g, notes["gas"] = _gas_density(reader, t["gas"], f"{key}.gas", conditions)
    else:
        raise reader.error(f"{key}.gas_density", "a gas_oil_level needs the gas density",
                           hint='add gas_density = "0.2 g/cm3" or gas = { gravity = 0.65 }')
    if not rho_g < rho_h:
        raise reader.error(f"{key}.gas_density", f"gas density "
                           f"{reader.unit_text(rho_g, 'density')} is not less than the oil "
                           f"density {reader.unit_text(rho_h, 'density')}",
                           hint="check the two densities and their units")
    if "gas_sigma_cos_theta" not in t:
        raise reader.error(f"{key}.gas_sigma_cos_theta",
                           "required key 'gas_sigma_cos_theta' is missing for the gas cap",
                           hint='add gas_sigma_cos_theta = "50 mN/m" (gas-water)')
    sgw = reader.quantity(t["gas_sigma_cos_theta"], f"{key}.gas_sigma_cos_theta", "tension",
                          positive=True)
    return {"gas_oil_level": gol, "gas_density": rho_g, "gas_sigma_cos_theta": sgw}


def _guard(reader, key, fn, *args):
    try:
        return fn(*args)
    except SatHeightError as exc:
        raise reader.error(key, exc.what, hint=exc.hint) from None


def _check_conditions(reader, t, key, p, temp, info, allowed) -> None:
    """Pressure, temperature and the pressure gradient inside their plausible ranges."""
    c, ck = t["conditions"], f"{key}.conditions"
    if "pressure" in c:
        reader.plausible("pressure", p, f"{ck}.pressure", c["pressure"], allowed=allowed)
    else:
        grad = info["pressure_from"]["gradient_Pa_per_m"] / STANDARD_GRAVITY
        reader.plausible("pressure_gradient", grad, f"{ck}.pressure_gradient",
                         c["pressure_gradient"], allowed=allowed)
        reader.plausible("pressure", p, f"{ck}.pressure_gradient", None, allowed=allowed,
                         allow_as="pressure",
                         derived=f"at {reader.length_text(info['depth_m'])} from the gradient")
    temp_raw = c["temperature"] if "temperature" in c else None
    reader.plausible("temperature", temp, f"{ck}.temperature", temp_raw, allowed=allowed,
                     derived=f"at {reader.length_text(info['depth_m'])} from the temperature "
                             "gradient")


def _read_conditions(reader, t, key, fwl, system) -> tuple[float, float, dict]:
    """Reservoir pressure [Pa] and temperature [K] of a zone from ``conditions``."""
    ck = f"{key}.conditions"
    if "conditions" not in t:
        raise reader.error(ck, "correlation densities need the reservoir conditions, and "
                           "'conditions' is missing",
                           hint='add conditions = { pressure = "30 MPa", temperature = '
                                '"80 degC" } or pressure_gradient and temperature_gradient')
    c = reader.table(t["conditions"], ck, _CONDITION_KEYS)
    depth = reader.quantity(c["depth"], f"{ck}.depth", "length") if "depth" in c else fwl
    if depth is None:
        raise reader.error(ck, "the conditions need a depth: neither conditions.depth nor the "
                           "zone's fwl is given", hint='add depth = "<TVDSS> m" to conditions')
    info: dict[str, Any] = {"depth_m": depth}
    if "pressure" in c:
        p = reader.quantity(c["pressure"], f"{ck}.pressure", "pressure", positive=True)
        info["pressure_from"] = "given"
    elif "pressure_gradient" in c:
        try:
            grad = parse_quantity(c["pressure_gradient"], "density",
                                  _DEFAULTS[system]["pgrad"]) * STANDARD_GRAVITY
        except UnitError as exc:
            raise reader.error(f"{ck}.pressure_gradient", exc.what,
                               hint='write a gradient such as "0.45 psi/ft" or "10.2 kPa/m"') from None
        p0 = (reader.quantity(c["surface_pressure"], f"{ck}.surface_pressure", "pressure")
              if "surface_pressure" in c else 101325.0)
        p = float(fluids.pressure_from_gradient(depth, grad, p0))
        info["pressure_from"] = {"gradient_Pa_per_m": grad, "surface_Pa": p0}
    else:
        raise reader.error(f"{ck}.pressure", "neither pressure nor pressure_gradient is given",
                           hint='add pressure = "30 MPa" or pressure_gradient = "0.45 psi/ft"')
    if "temperature" in c:
        temp = reader.quantity(c["temperature"], f"{ck}.temperature", "temperature")
        info["temperature_from"] = "given"
    elif "temperature_gradient" in c:
        try:
            tg = parse_temperature_gradient(c["temperature_gradient"], _DEFAULTS[system]["tgrad"])
        except UnitError as exc:
            raise reader.error(f"{ck}.temperature_gradient", exc.what, hint=exc.hint) from None
        t0 = (reader.quantity(c["surface_temperature"], f"{ck}.surface_temperature",
                              "temperature") if "surface_temperature" in c else 288.15)
        temp = float(fluids.temperature_from_gradient(depth, tg, t0))
        info["temperature_from"] = {"gradient_K_per_m": tg, "surface_K": t0}
    else:
        raise reader.error(f"{ck}.temperature", "neither temperature nor temperature_gradient "
                           "is given", hint='add temperature = "80 degC" or temperature_gradient '
                                            '= "30 degC/km"')
    if not (p > 0 and temp > 0):
        raise reader.error(ck, f"conditions give pressure {reader.unit_text(p, 'pressure')} and "
                           f"temperature {reader.unit_text(temp, 'temperature')} at depth "
                           f"{reader.length_text(depth)}; both must be positive",
                           hint="check the gradients, surface values and depth")
    info.update(pressure_Pa=p, temperature_K=temp)
    return p, temp, info


def _oil_density(reader, raw, key, conditions, system) -> tuple[float, dict]:
    ot = reader.table(raw, key, _OIL_KEYS, required=_OIL_KEYS)
    api = reader.number(ot["api"], f"{key}.api", positive=True)
    try:
        rs = parse_gor(ot["solution_gor"], _DEFAULTS[system]["gor"])
    except UnitError as exc:
        raise reader.error(f"{key}.solution_gor", exc.what, hint=exc.hint) from None
    gg = reader.number(ot["gas_gravity"], f"{key}.gas_gravity", positive=True)
    _, temp = conditions()
    rho, bo = _guard(reader, key, fluids.oil_density_standing, api, rs, gg, temp)
    return float(rho), {"method": "Standing (Bo)", "api": api, "solution_gor_m3_per_m3": rs,
                        "gas_gravity": gg, "bo": float(bo)}


def _gas_density(reader, raw, key, conditions) -> tuple[float, dict]:
    gt = reader.table(raw, key, _GAS_KEYS, required=("gravity",))
    gg = reader.number(gt["gravity"], f"{key}.gravity", positive=True)
    method = (reader.text(gt["z_method"], f"{key}.z_method", tuple(fluids.Z_METHODS))
              if "z_method" in gt else "dak")
    p, temp = conditions()
    rho, z = _guard(reader, key, fluids.gas_density, p, temp, gg, method)
    return float(rho), {"method": f"real gas, Sutton pseudo-criticals, z by {method}",
                        "gravity": gg, "z": float(z)}
