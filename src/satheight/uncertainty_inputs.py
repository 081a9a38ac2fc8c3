"""The uncertain inputs of a zone and what the Monte Carlo refuses about them.

A zone's scalar inputs (FWL [m], water and hydrocarbon densities [kg/m3],
sigma*cos(theta) [N/m]) and J-Sw parameters may carry a :class:`Distribution`; the
J-Sw parameters may instead be drawn together from a covariance (:class:`JointNormal`);
porosity and permeability may carry a log error correlated along depth. The checks keep
every draw physical before any realisation is made (see :mod:`satheight.uncertainty`
for the draws themselves and their sources).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .distributions import Distribution, JointNormal
from .engine import ZoneModel
from .errors import SatHeightError
from .units import in_unit

__all__ = ["ZONE_INPUTS", "LOG_ERRORS", "LogError", "ZoneUncertainty", "check_zone_uncertainty",
           "deterministic_value"]

#: The scalar inputs of a zone that may carry a distribution (plus the J-Sw parameters).
ZONE_INPUTS = ("fwl", "water_density", "hydrocarbon_density", "sigma_cos_theta")
#: The two log errors.
LOG_ERRORS = ("porosity_error", "permeability_error")


@dataclass(frozen=True)
class LogError:
    """A log error along depth: its marginal distribution and correlation length.

    ``distribution`` is of the error itself: additive porosity error [fraction], or
    permeability error in decades (``k * 10**e``); a missing mean / mode means 0.
    ``correlation_length`` [m] along TVDSS, 0 for errors independent between samples.
    """

    distribution: Distribution
    correlation_length: float = 0.0


@dataclass(frozen=True)
class ZoneUncertainty:
    """The uncertain inputs of one zone.

    ``inputs`` maps a name of :data:`ZONE_INPUTS` or a J-Sw parameter name to its
    :class:`Distribution` (SI); ``joint`` draws the J-Sw parameters it names together
    (none of them may also be in ``inputs``); inputs not named keep their deterministic
    value.
    """

    inputs: dict = field(default_factory=dict)
    porosity_error: LogError | None = None
    permeability_error: LogError | None = None
    joint: JointNormal | None = None



#: Unit kind of each zone input, for messages in the user's units.
_INPUT_KIND = {"fwl": "length", "water_density": "density", "hydrocarbon_density": "density",
               "sigma_cos_theta": "tension"}


def check_zone_uncertainty(zone: ZoneModel, spec: ZoneUncertainty, where: str = "",
                           units: dict | None = None) -> None:
    """Refuse what the Monte Carlo cannot do with this zone, naming ``where`` and the input.

    The zone must be two-phase with one J-Sw function (no gas cap, no per-depth rock
    types); every named input must exist; each distribution's support must stay where
    the input is physical: densities > 0 with water denser than the hydrocarbon,
    sigma*cos(theta) > 0, J-Sw parameters inside the family's bounds. ``units`` (unit
    kind -> unit, e.g. :data:`satheight.units.UNIT_SYSTEMS` ``["field"]``) are the units
    the messages show values in (default SI).
    """
    si = {"length": "m", "density": "kg/m3", "tension": "N/m"}

    def shown(v, name):
        kind = _INPUT_KIND.get(name)
        if kind is None:
            return f"{v:.6g}"
        return in_unit(v, (units or si)[kind], kind)

    where = where or f"zone {zone.name!r}"
    if zone.three_phase or zone.rock_functions:
        raise SatHeightError("Monte Carlo handles two-phase zones with one J-Sw function; this "
                             "zone has a gas cap or per-depth rock types", where=where,
                             hint="remove this zone's uncertainty table")
    fn = zone.function
    for name, dist in spec.inputs.items():
        if name not in ZONE_INPUTS and name not in fn.param_names:
            raise SatHeightError(f"unknown uncertain input {name!r}", where=where,
                                 hint="use " + ", ".join(ZONE_INPUTS + tuple(fn.param_names)))
        d = dist.centred(deterministic_value(zone, name))
        d.check(f"{where}.{name}")
        lo, hi = d.support()
        if name in fn.param_names:
            _check_bounds(fn, name, lo, hi, f"{where}.{name}")
        elif name != "fwl" and lo <= 0:
            raise SatHeightError(f"draws of {name} may reach {shown(lo, name)}, not > 0",
                                 where=f"{where}.{name}", hint="narrow the distribution")
    if spec.joint is not None:
        _check_joint(zone, spec, f"{where}.function")
    w = _support(zone, spec, "water_density")
    h = _support(zone, spec, "hydrocarbon_density")
    if not w[0] > h[1]:
        raise SatHeightError(f"water density draws (down to {shown(w[0], 'water_density')}) may "
                             "fall to the hydrocarbon density draws (up to "
                             f"{shown(h[1], 'hydrocarbon_density')})", where=where,
                             hint="narrow the density distributions")
    for name in LOG_ERRORS:
        err = getattr(spec, name)
        if err is not None:
            err.distribution.centred(0.0).check(f"{where}.{name}")
            if not (np.isfinite(err.correlation_length) and err.correlation_length >= 0):
                raise SatHeightError(f"correlation_length must be >= 0 m, got "
                                     f"{err.correlation_length!r}", where=f"{where}.{name}")


def _check_bounds(fn, name: str, lo: float, hi: float, where: str) -> None:
    blo, bhi = fn.bounds[name]
    if lo < blo or hi > bhi:
        raise SatHeightError(f"draws of {name} may reach [{lo:.6g}, {hi:.6g}], outside the "
                             f"{fn.name} bounds [{blo}, {bhi}]", where=where,
                             hint="use a truncated_normal, triangular or uniform "
                                  "distribution inside the bounds")


def _check_joint(zone: ZoneModel, spec: ZoneUncertainty, where: str) -> None:
    """The jointly drawn parameters: the function's, not drawn twice, a usable covariance,
    and each one's normal (mean +- NORMAL_SUPPORT_SD sd) inside the family's bounds."""
    fn = zone.function
    joint = spec.joint
    for name in joint.names:
        if name not in fn.param_names:
            raise SatHeightError(f"{fn.name} has no parameter {name!r} to draw", where=where,
                                 hint="use " + ", ".join(fn.param_names))
        if name in spec.inputs:
            raise SatHeightError(f"{name} has its own distribution and is also drawn with the "
                                 "others", where=where, hint="give it one way only")
    joint.check(where)
    for i, name in enumerate(joint.names):
        lo, hi = joint.marginal(i, deterministic_value(zone, name)).support()
        _check_bounds(fn, name, lo, hi, f"{where}.{name}")


def deterministic_value(zone: ZoneModel, name: str) -> float:
    """The value a zone input or J-Sw parameter has without uncertainty [SI]."""
    if name in ZONE_INPUTS:
        return float(getattr(zone, name))
    return float(zone.function.params_[name])


def _support(zone: ZoneModel, spec: ZoneUncertainty, name: str) -> tuple[float, float]:
    if name in spec.inputs:
        return spec.inputs[name].centred(deterministic_value(zone, name)).support()
    v = deterministic_value(zone, name)
    return (v, v)
