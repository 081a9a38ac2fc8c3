"""Units at the boundary: parse quantities written as text and convert to SI.

Inside the engine everything is SI (m, Pa, kg/m^3, N/m, m^2, ohm.m) and porosity
and saturation are fractions. This module is the only place that knows unit
names. A quantity may be a bare number (it then takes a default unit, usually the
project's declared unit system) or text such as ``"1990 m"``, ``"6529 ft"``,
``"1.08 g/cm3"``, ``"0.45 psi/ft"`` or ``"26 mN/m"``.

Density may also be given as a pressure gradient (``psi/ft``, ``kPa/m``,
``bar/m``, ``Pa/m``); it is turned into a density by dividing by standard gravity
(common practice: a gradient of fluid at rest is rho * g).
"""

from __future__ import annotations

import math
import re
from typing import Mapping

from . import constants as C
from .errors import UnitError

# Each kind maps normalised unit names to (factor, offset): SI = value * factor + offset.
_LENGTH = {"m": 1.0, "meter": 1.0, "meters": 1.0, "metre": 1.0, "metres": 1.0,
           "ft": C.FOOT, "feet": C.FOOT, "foot": C.FOOT, "f": C.FOOT,
           "cm": 0.01, "mm": 0.001, "km": 1000.0, "in": 0.0254,
           # US survey foot (1200/3937 m): never taken for the international foot
           "usft": C.US_SURVEY_FOOT, "us ft": C.US_SURVEY_FOOT, "ftus": C.US_SURVEY_FOOT,
           "us-ft": C.US_SURVEY_FOOT, "survey ft": C.US_SURVEY_FOOT,
           "us survey ft": C.US_SURVEY_FOOT, "us survey foot": C.US_SURVEY_FOOT,
           ".1in": 0.00254}                # tenths of an inch: depth unit of older LAS files
# Absolute pressures. "psi" and "bar" without a suffix are taken as absolute.
_PRESSURE = {"pa": 1.0, "kpa": 1e3, "mpa": 1e6, "bar": 1e5, "bara": 1e5, "psi": C.PSI,
             "psia": C.PSI, "atm": C.STANDARD_ATMOSPHERE, "kgf/cm2": C.KGF_PER_CM2,
             "kgf/cm^2": C.KGF_PER_CM2}
#: Gauge pressures: (factor, offset) with SI absolute = value * factor + 1 atm (101 325 Pa,
#: NIST SP 811). Only :func:`to_si`, :func:`from_si` and :func:`parse_quantity` apply them;
#: :func:`factor` refuses them, so a gauge value is never taken as absolute.
GAUGE_PRESSURE = {"barg": (1e5, C.STANDARD_ATMOSPHERE), "psig": (C.PSI, C.STANDARD_ATMOSPHERE),
                  "kpag": (1e3, C.STANDARD_ATMOSPHERE), "mpag": (1e6, C.STANDARD_ATMOSPHERE)}
_DENSITY = {"kg/m3": 1.0, "kg/m^3": 1.0, "g/cm3": C.G_PER_CM3, "g/cc": C.G_PER_CM3,
            "g/cm^3": C.G_PER_CM3, "gcc": C.G_PER_CM3, "g/ml": C.G_PER_CM3,
            "lb/ft3": C.LB_PER_FT3, "lbm/ft3": C.LB_PER_FT3, "lb/ft^3": C.LB_PER_FT3,
            "sg": C.G_PER_CM3,
            # mud weight: pound per US gallon (a density; as a gradient 0.051948 psi/ft per ppg)
            "ppg": C.LB_PER_GALLON, "lb/gal": C.LB_PER_GALLON, "lbm/gal": C.LB_PER_GALLON}
# gradients: pressure per length, converted to density by / g
_GRADIENT = {"psi/ft": C.PSI / C.FOOT, "kpa/m": 1e3, "pa/m": 1.0, "bar/m": 1e5,
             "mpa/m": 1e6, "psi/m": C.PSI}
#: Pressure-gradient units (per metre of depth, SI Pa/m) accepted where a density is asked.
GRADIENT_UNITS = _GRADIENT
_TENSION = {"n/m": 1.0, "mn/m": 1e-3, "dyn/cm": C.DYNE_PER_CM, "dyne/cm": C.DYNE_PER_CM,
            "dynes/cm": C.DYNE_PER_CM}
_PERMEABILITY = {"md": C.MILLIDARCY, "mdarcy": C.MILLIDARCY, "millidarcy": C.MILLIDARCY,
                 "d": C.DARCY, "darcy": C.DARCY, "m2": 1.0, "m^2": 1.0, "um2": 1e-12,
                 "µm2": 1e-12, "ud": C.MILLIDARCY * 1e-3, "µd": C.MILLIDARCY * 1e-3,
                 "μd": C.MILLIDARCY * 1e-3, "microdarcy": C.MILLIDARCY * 1e-3,
                 "nd": C.MILLIDARCY * 1e-6, "nanodarcy": C.MILLIDARCY * 1e-6}
_RESISTIVITY = {"ohm.m": 1.0, "ohmm": 1.0, "ohm-m": 1.0, "ohm m": 1.0, "ohm*m": 1.0,
                "ohm·m": 1.0, "ohms": 1.0, "ohm": 1.0, "Ω.m": 1.0, "Ωm": 1.0}
_FRACTION = {"": 1.0, "frac": 1.0, "fraction": 1.0, "v/v": 1.0, "dec": 1.0, "decimal": 1.0,
             "m3/m3": 1.0, "ft3/ft3": 1.0, "%": 0.01, "pct": 0.01, "percent": 0.01,
             "pu": 0.01, "p.u.": 0.01, "pu.": 0.01}
_TEMPERATURE = {"degc": (1.0, 273.15), "c": (1.0, 273.15), "°c": (1.0, 273.15),
                "k": (1.0, 0.0), "degf": (5 / 9, 273.15 - 32 * 5 / 9),
                "f": (5 / 9, 273.15 - 32 * 5 / 9), "°f": (5 / 9, 273.15 - 32 * 5 / 9)}
_ANGLE = {"deg": math.pi / 180, "degree": math.pi / 180, "degrees": math.pi / 180,
          "°": math.pi / 180, "rad": 1.0}

#: Unit tables by quantity kind. Values are SI factors.
KINDS: dict[str, Mapping[str, float]] = {
    "length": _LENGTH,
    "pressure": _PRESSURE,
    "density": _DENSITY,
    "tension": _TENSION,
    "permeability": _PERMEABILITY,
    "resistivity": _RESISTIVITY,
    "fraction": _FRACTION,
    "angle": _ANGLE,
}

#: Default unit of each kind in each declared unit system of a project file.
UNIT_SYSTEMS: dict[str, dict[str, str]] = {
    "metric": {"length": "m", "pressure": "kPa", "density": "kg/m3", "tension": "mN/m",
               "permeability": "mD", "resistivity": "ohm.m", "fraction": "frac",
               "angle": "deg", "temperature": "degC"},
    "field": {"length": "ft", "pressure": "psi", "density": "g/cm3", "tension": "dyn/cm",
              "permeability": "mD", "resistivity": "ohm.m", "fraction": "frac",
              "angle": "deg", "temperature": "degF"},
}

#: Decimals shown for a quantity in each display unit, by what the number means (common
#: practice): depths and heights to 0.01 m or 0.1 ft, pressures to 0.1 kPa or 0.01 psi,
#: densities to 1 kg/m3 or 0.001 g/cm3, interfacial tension to 0.1 mN/m or dyn/cm.
SHOWN_DECIMALS = {"m": 2, "ft": 1, "kpa": 1, "psi": 2, "kg/m3": 0, "g/cm3": 3, "mn/m": 1,
                  "dyn/cm": 1, "frac": 3}


def shown(value_si: float, kind: str, system: str = "metric") -> str:
    """An SI value as text in the unit system's unit of ``kind``: ``"2105.00 m"``, ``"6906.2 ft"``.

    Rounded to :data:`SHOWN_DECIMALS` of the unit; a plain number (no thousands separator),
    so it can be pasted back into a project file.
    """
    unit = UNIT_SYSTEMS[system][kind]
    value = float(from_si(value_si, unit, kind))
    return f"{value:.{SHOWN_DECIMALS.get(unit.lower(), 3)}f} {unit}"


def in_unit(value_si: float, unit: str, kind: str) -> str:
    """An SI value as text in ``unit`` (a unit of ``kind``), to 6 significant digits: the
    form messages use for a value the user gave or a limit it is held to."""
    return f"{float(from_si(value_si, unit, kind)):.6g} {unit}"


_NUMBER = r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?"
_QUANTITY = re.compile(rf"^\s*({_NUMBER})\s*(.*?)\s*$")


def normalise_unit(unit: str | None) -> str:
    """Lower-case a unit name and drop blanks around it (``" G/CC "`` -> ``"g/cc"``)."""
    if unit is None:
        return ""
    u = unit.strip().lower().replace("³", "3").replace("²", "2")
    return u


def factor(unit: str | None, kind: str) -> float:
    """SI factor of ``unit`` for a quantity of ``kind``.

    Parameters
    ----------
    unit : str
        Unit name, case-insensitive (``"ft"``, ``"psi"``, ``"g/cm3"``).
    kind : str
        One of :data:`KINDS`.

    Returns
    -------
    float
        Multiply a value in ``unit`` by this to get SI.

    Raises
    ------
    UnitError
        If the unit is unknown for that kind; the message lists the known units.
    """
    table = KINDS.get(kind)
    if table is None:
        raise UnitError(f"unknown quantity kind {kind!r}", hint=f"use one of {sorted(KINDS)}")
    u = normalise_unit(unit)
    if u in table:
        return table[u]
    if kind == "pressure" and u in GAUGE_PRESSURE:
        raise UnitError(f"unit {unit!r} is a gauge pressure: it needs the offset of 1 atm "
                        "(101.325 kPa), not only a factor",
                        hint="give absolute pressure (bara, psia, kPa) here, or convert with "
                             "units.to_si, which adds the atmosphere")
    raise UnitError(f"unit {unit!r} is not a {kind} unit",
                    hint="use one of " + ", ".join(repr(k) for k in table if k))


def to_si(value, unit: str | None, kind: str):
    """Convert ``value`` (scalar or array) from ``unit`` to SI for ``kind``."""
    if kind == "temperature":
        scale, offset = _temperature(unit)
        return value * scale + offset
    if kind == "pressure" and normalise_unit(unit) in GAUGE_PRESSURE:
        scale, offset = GAUGE_PRESSURE[normalise_unit(unit)]
        return value * scale + offset
    return value * factor(unit, kind)


def from_si(value, unit: str | None, kind: str):
    """Convert ``value`` (scalar or array) from SI to ``unit`` for ``kind``."""
    if kind == "temperature":
        scale, offset = _temperature(unit)
        return (value - offset) / scale
    if kind == "pressure" and normalise_unit(unit) in GAUGE_PRESSURE:
        scale, offset = GAUGE_PRESSURE[normalise_unit(unit)]
        return (value - offset) / scale
    return value / factor(unit, kind)


def _temperature(unit):
    u = normalise_unit(unit)
    if u in _TEMPERATURE:
        return _TEMPERATURE[u]
    raise UnitError(f"unit {unit!r} is not a temperature unit", hint="use degC, degF or K")


def split_quantity(text: str) -> tuple[float, str]:
    """Split ``"1990 m"`` into ``(1990.0, "m")``; a bare number gives unit ``""``.

    Raises
    ------
    UnitError
        If the text does not start with a number.
    """
    m = _QUANTITY.match(text)
    if not m:
        raise UnitError(f"{text!r} is not a number with an optional unit",
                        hint='write it like "1990 m" or "1.08 g/cm3"')
    return float(m.group(1)), m.group(2)


def parse_quantity(value, kind: str, default_unit: str | None = None) -> float:
    """Parse a number or a text quantity into SI.

    Parameters
    ----------
    value : float, int or str
        ``2000``, ``"2000"``, ``"6529 ft"``, ``"0.45 psi/ft"``...
    kind : str
        Quantity kind (see :data:`KINDS`, plus ``"temperature"``). For ``"density"``,
        a pressure-gradient unit is also accepted and converted with standard gravity.
    default_unit : str, optional
        Unit of a bare number. If ``None``, a bare number is taken as SI already.

    Returns
    -------
    float
        The value in SI: m, Pa, kg/m^3, N/m, m^2, ohm.m, fraction, rad or K.
    """
    if isinstance(value, bool):
        raise UnitError(f"expected a {kind} value, got a true/false value {value!r}")
    if isinstance(value, (int, float)):
        number, unit = float(value), ""
    elif isinstance(value, str):
        number, unit = split_quantity(value)
    else:
        raise UnitError(f"expected a {kind} value as a number or text like '10 m', got {value!r}")
    if not math.isfinite(number):
        raise UnitError(f"{value!r} is not a finite number")
    if unit == "":
        if default_unit is None:
            return number
        unit = default_unit
    if kind == "density":
        u = normalise_unit(unit)
        if u in _GRADIENT:
            return number * _GRADIENT[u] / C.STANDARD_GRAVITY
    return float(to_si(number, unit, kind))
