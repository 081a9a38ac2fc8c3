"""Plausible ranges of every physical quantity a project gives, and the checks that use them.

A value outside its range is refused (by the project reader, or by the run for the
checks that need the wells) unless the project file allows it explicitly with the key
``allow_unusual = ["<key>", ...]`` in the table that holds the value. The ranges are
wide on purpose: they catch a value read in the wrong unit (1.08 read as kg/m3, 0.026
read as mN/m, porosity in percent, permeability in darcy), not an unusual reservoir.

:data:`RANGES` is the one table; the README reproduces it. Values are SI; ``unit`` is the
unit the range is shown in. Sources are a ``docs/references.md`` key or "common practice".
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from . import constants as C
from .errors import SatHeightError, UnitError
from .units import GRADIENT_UNITS, from_si, normalise_unit, to_si


@dataclass(frozen=True)
class Plausible:
    """The plausible range of one quantity.

    Attributes
    ----------
    what : str
        The quantity, in words.
    kind : str
        Unit kind (:data:`satheight.units.KINDS` or ``"temperature"``).
    low, high : float
        Range in SI, both ends included.
    unit : str
        Unit the range is shown in.
    source : str
        Where the range comes from.
    """

    what: str
    kind: str
    low: float
    high: float
    unit: str
    source: str

    def contains(self, value_si: float) -> bool:
        """True when ``value_si`` lies in [low, high]."""
        return bool(self.low <= value_si <= self.high)

    def show(self, value_si: float) -> float:
        """``value_si`` in the range's display unit."""
        return _from_si(value_si, self.unit, self.kind)

    def text(self, unit: str | None = None) -> str:
        """``"950 to 1250 kg/m3"``, in the range's display unit (or ``unit``)."""
        u = self.unit if unit is None else unit
        lo, hi = (_from_si(v, u, self.kind) for v in (self.low, self.high))
        return f"{lo:g} to {hi:g} {u}".rstrip()

    def unit_for(self, unit: str | None) -> str:
        """``unit`` if the range can be shown in it (the user's unit), else :attr:`unit`.

        A fraction keeps the range's own unit unless ``unit`` is written (``%``).
        """
        if not unit or (self.kind == "fraction" and normalise_unit(unit) in ("", "frac")):
            return self.unit
        try:
            _from_si(1.0, unit, self.kind)
        except UnitError:
            return self.unit
        return unit


_CP = "common practice"
_MD = C.MILLIDARCY

#: Plausible range of each quantity, by name (project-file key or derived quantity).
RANGES: dict[str, Plausible] = {
    "water_density": Plausible("formation water (brine) density at reservoir conditions",
                               "density", 950.0, 1250.0, "kg/m3",
                               _CP + ": fresh water near 1000, NaCl-saturated brine near 1200"),
    "oil_density": Plausible("oil density at reservoir conditions", "density", 500.0, 1000.0,
                             "kg/m3", _CP + ": volatile to heavy oil"),
    "gas_density": Plausible("gas density at reservoir conditions", "density", 50.0, 400.0,
                             "kg/m3", _CP + ": natural gas from shallow to deep, high pressure"),
    "air_density": Plausible("air density (air-water column)", "density", 0.5, 400.0,
                             "kg/m3", "ideal gas, dry air from 0.4 to 30 MPa (common practice)"),
    "sigma_cos_theta": Plausible("reservoir sigma*cos(theta)", "tension", 1e-3, 0.1, "mN/m",
                                 _CP + ": oil-water 10-35, gas-water 30-70 mN/m"),
    "lab_sigma_cos_theta": Plausible("lab sigma*cos(theta) (mercury up to about 370)", "tension",
                                     1e-3, 0.5, "mN/m", _CP + "; purcell1949 for mercury-air"),
    "delta_rho": Plausible("water minus hydrocarbon density", "density", 20.0, 1200.0, "kg/m3",
                           _CP + ": heavy oil against brine to gas against brine"),
    "fwl": Plausible("free-water level, TVDSS", "length", 0.0, 10000.0, "m",
                     _CP + ": below sea level and above the deepest reservoirs; checked again "
                           "against the wells' logged TVDSS"),
    "fwl_margin": Plausible("distance of the FWL outside the wells' logged TVDSS range",
                            "length", 0.0, 1000.0, "m", _CP + ": hydrocarbon columns and "
                            "water legs reaching that far beyond the logs are rare"),
    "porosity": Plausible("porosity (cutoff or log sample)", "fraction", 0.0, 0.6, "frac",
                          _CP + ": unconsolidated sands and chalks stay below 0.5"),
    "permeability": Plausible("permeability (cutoff)", "permeability", 1e-4 * _MD, 1e5 * _MD,
                              "mD", _CP + ": tight rock to unconsolidated sand"),
    "log_permeability": Plausible("permeability (log sample)", "permeability", 0.0, 1e5 * _MD,
                                  "mD", _CP + ": negative or above 1e5 mD is a unit or data "
                                  "error; 0 is tight rock"),
    "archie_a": Plausible("Archie tortuosity factor a", "fraction", 0.3, 3.0, "",
                          _CP + "; archie1942 uses 1"),
    "archie_m": Plausible("Archie cementation exponent m", "fraction", 1.0, 4.0, "",
                          _CP + "; archie1942 gives 1.8-2.0 for consolidated sands"),
    "archie_n": Plausible("Archie saturation exponent n", "fraction", 1.0, 5.0, "",
                          _CP + "; archie1942 gives about 2"),
    "rw": Plausible("formation-water resistivity at formation temperature", "resistivity",
                    0.005, 20.0, "ohm.m", _CP + ": saturated brine when hot to fresh water"),
    "rsh": Plausible("shale resistivity", "resistivity", 0.1, 200.0, "ohm.m",
                     _CP + ": wet shales read about 0.5 to 20 ohm.m"),
    "pressure": Plausible("reservoir pressure", "pressure", 0.1e6, 250e6, "MPa", _CP),
    "temperature": Plausible("reservoir temperature", "temperature", 273.15, 573.15, "degC",
                             _CP + ": 0 to 300 degC"),
    "pressure_gradient": Plausible("pressure gradient", "density", 5e3 / C.STANDARD_GRAVITY,
                                   25e3 / C.STANDARD_GRAVITY, "kPa/m",
                                   _CP + ": 5-25 kPa/m (hydrostatic about 10, overburden 23)"),
    "salinity": Plausible("NaCl mass fraction of the water", "fraction", 0.0, 0.3, "frac",
                          _CP + ": NaCl saturates near 0.26"),
    "datum_elevation": Plausible("elevation of the log depth reference", "length", -500.0,
                                 6000.0, "m", _CP),
}

#: The range that a hydrocarbon density is checked against, by ``hydrocarbon``.
PHASE_DENSITY = {"oil": "oil_density", "gas": "gas_density", "air": "air_density"}

#: Units tried when a value is outside its range, to name the unit probably meant.
SUGGESTED_UNITS = {
    "density": ("kg/m3", "g/cm3", "lb/ft3", "ppg", "psi/ft", "kPa/m", "bar/m"),
    "tension": ("mN/m", "N/m"),
    "length": ("m", "ft"),
    "fraction": ("frac", "%"),
    "permeability": ("mD", "D", "uD", "nD"),
    "pressure": ("kPa", "MPa", "bar", "psi"),
    "resistivity": ("ohm.m",),
    "temperature": ("degC", "degF", "K"),
}


def _si(number: float, unit: str, kind: str) -> float:
    """SI value of ``number`` in ``unit``; for a density, a pressure gradient counts (rho g)."""
    if kind == "density" and normalise_unit(unit) in GRADIENT_UNITS:
        return number * GRADIENT_UNITS[normalise_unit(unit)] / C.STANDARD_GRAVITY
    return float(to_si(number, unit, kind))


def _from_si(value: float, unit: str, kind: str) -> float:
    if kind == "density" and normalise_unit(unit) in GRADIENT_UNITS:
        return value * C.STANDARD_GRAVITY / GRADIENT_UNITS[normalise_unit(unit)]
    return float(from_si(value, unit, kind))


def likely_units(number: float, read_unit: str, rng: Plausible, written: bool = False) -> list[str]:
    """Units other than ``read_unit`` in which ``number`` falls inside ``rng``.

    With ``written`` (the unit was written, not taken by default) a density written as
    a gradient is only offered gradient units, and a density only densities.
    """
    out = []
    gradient = normalise_unit(read_unit) in GRADIENT_UNITS
    for u in SUGGESTED_UNITS.get(rng.kind, ()):
        if normalise_unit(u) == normalise_unit(read_unit):
            continue
        if written and rng.kind == "density" and (normalise_unit(u) in GRADIENT_UNITS) != gradient:
            continue
        v = _si(number, u, rng.kind)
        if math.isfinite(v) and rng.contains(v):
            out.append(u)
    return out


def outside_message(name: str, value_si: float, shown: str, number: float | None,
                    read_unit: str | None, written: bool = False,
                    display_unit: str | None = None) -> tuple[str, str] | None:
    """``(what, hint)`` when ``value_si`` is outside ``RANGES[name]``; ``None`` inside.

    Parameters
    ----------
    name : str
        Key of :data:`RANGES`.
    value_si : float
        The value in SI.
    shown : str
        The value as read, e.g. ``"1.08 (a bare number, taken in kg/m3)"``.
    number, read_unit : float and str, or None
        The number and unit as read, to name a unit that fits (``None``: derived value).
    written : bool
        True when the unit was written with the number (see :func:`likely_units`).
    display_unit : str, optional
        The user's unit (as read, or the project's): the value and the range are shown in
        it when it is a unit of the quantity (:meth:`Plausible.unit_for`); default the
        range's own unit.
    """
    rng = RANGES[name]
    if rng.contains(value_si):
        return None
    unit = rng.unit_for(display_unit)
    now = _from_si(value_si, unit, rng.kind)
    what = (f"{shown} is {now:.6g} {unit}".rstrip() + f", outside the plausible range "
            f"{rng.text(unit)} of the {rng.what} ({rng.source})")
    fits = likely_units(number, read_unit or "", rng, written) if number is not None else []
    hint = (f"did you mean {number:g} {fits[0]}? " if fits else "check the value and its unit; ")
    return what, hint


def require_plausible(name: str, value_si: float, shown: str, number: float | None = None,
                      read_unit: str | None = None, *, written: bool = False,
                      where: str | None = None, hint: str = "") -> float:
    """``value_si`` if inside ``RANGES[name]``; else a :class:`SatHeightError` saying why.

    For callers outside the project file (e.g. command-line values); the arguments are
    those of :func:`outside_message`, ``hint`` is appended to its hint.
    """
    msg = outside_message(name, value_si, shown, number, read_unit, written)
    if msg is not None:
        raise SatHeightError(msg[0], where=where, hint=(msg[1] + hint).rstrip("; ") or None)
    return value_si


def fwl_outside_logs(fwl: float, tvdss_low: float, tvdss_high: float,
                     surface_tvdss: float | None = None, length_unit: str = "m") -> str | None:
    """Why a free-water level is implausible for the wells it applies to, or ``None``.

    Parameters
    ----------
    fwl : float
        Free-water level TVDSS [m], positive down.
    tvdss_low, tvdss_high : float
        Shallowest and deepest logged TVDSS of the wells of the zone [m].
    surface_tvdss : float, optional
        TVDSS of the shallowest well's depth reference [m] (minus its elevation);
        a FWL above it is above the surface.
    length_unit : str
        Unit the message shows depths in (the project's length unit, e.g. ``"ft"``).
    """
    margin = RANGES["fwl_margin"].high

    def d(v):
        return f"{_from_si(v, length_unit, 'length'):g}"

    if surface_tvdss is not None and fwl < surface_tvdss:
        return (f"the FWL {d(fwl)} {length_unit} TVDSS lies above the surface (the well's depth "
                f"reference is at {d(surface_tvdss)} {length_unit} TVDSS)")
    if fwl < tvdss_low - margin or fwl > tvdss_high + margin:
        return (f"the FWL {d(fwl)} {length_unit} TVDSS lies more than {d(margin)} {length_unit} "
                f"outside the logged TVDSS range {d(tvdss_low)} to {d(tvdss_high)} {length_unit} "
                f"of the wells ({RANGES['fwl_margin'].source})")
    return None


def out_of_range_samples(phi, k) -> np.ndarray:
    """Log samples whose porosity or permeability is outside its plausible range.

    Porosity outside [0, 0.6] or permeability outside [0, 1e5 mD] (:data:`RANGES`);
    NaN is missing, not out of range.

    Parameters
    ----------
    phi : array_like
        Porosity [fraction], after unit handling.
    k : array_like
        Permeability [m^2].
    """
    phi = np.asarray(phi, dtype=float)
    k = np.asarray(k, dtype=float)
    p, q = RANGES["porosity"], RANGES["log_permeability"]
    with np.errstate(invalid="ignore"):
        return (phi < p.low) | (phi > p.high) | (k < q.low) | (k > q.high)


def fluid_line_problems(densities: dict, unit: str = "kg/m3") -> list[str]:
    """What is implausible about densities derived from pressure lines (gradient / g).

    Parameters
    ----------
    densities : dict
        Phase (``"water"``, ``"oil"``, ``"gas"``) -> density [kg/m^3] from the fitted
        pressure gradient of that phase.
    unit : str
        Density unit the sentences show values and ranges in.

    Returns
    -------
    list of str
        One sentence per problem: a density outside the range of its phase (with the
        phase it fits, if any: a "water" line at 0.43 psi/ft in a file read in kPa/m
        falls in none), or lines out of order (water must be denser than oil, oil
        denser than gas). Empty when all is plausible.
    """
    out = []
    names = {"water": "water_density", "oil": "oil_density", "gas": "gas_density"}
    for phase, rho in densities.items():
        rng = RANGES[names[phase]]
        if rng.contains(rho):
            continue
        fits = [p for p, n in names.items() if p != phase and RANGES[n].contains(rho)]
        out.append(f"the {phase} line gives {_from_si(rho, unit, 'density'):.6g} {unit}, "
                   f"outside {rng.text(unit)}"
                   + (f" (it fits {' or '.join(fits)})" if fits else
                      " (no phase fits: is the pressure or depth unit right?)"))
    order = [p for p in ("water", "oil", "gas") if p in densities]
    for heavy, light in zip(order, order[1:]):
        if not densities[heavy] > densities[light]:
            a, b = (_from_si(densities[p], unit, "density") for p in (heavy, light))
            out.append(f"the {heavy} line ({a:.6g} {unit}) is not denser than the "
                       f"{light} line ({b:.6g} {unit})")
    return out
