"""Project-file keys of the Monte Carlo: ``[uncertainty]`` and each zone's ``[zones.uncertainty]``.

Called by the project reader with the whole TOML document once the zones are read
(:func:`read_uncertainty`). Quantities take the project's unit system for bare numbers,
or text with a unit, as everywhere in the project file.

.. code-block:: toml

    [uncertainty]                   # optional: how the Monte Carlo runs (defaults shown)
    realisations = 1000             # 1 to 1,000,000
    seed = 0                        # whole number >= 0: same seed, same numbers
    memory_mb = 256                 # bound on the working arrays [MB] (about 0.04 MB per realisation at least)
    tornado = true                  # one input at a time from its P10 to its P90 value
    accept_implausible = false      # true: allow spreads outside the plausible ranges below

    [[zones]]
    name = "Upper"
    # ... the zone's keys as usual ...
    [zones.uncertainty]             # optional: this zone's uncertain inputs
    fwl = { distribution = "normal", sd = "5 m" }              # mean: the zone's fwl
    water_density = { distribution = "uniform", low = "1.06 g/cm3", high = "1.10 g/cm3" }
    hydrocarbon_density = { distribution = "triangular", low = "0.72 g/cm3", high = "0.79 g/cm3" }
    sigma_cos_theta = { distribution = "truncated_normal", sd = "3 mN/m", low = "18 mN/m", high = "34 mN/m" }
    porosity_error = { distribution = "normal", sd = 0.01, correlation_length = "3 m" }      # added [fraction]
    permeability_error = { distribution = "normal", sd = 0.2, correlation_length = "3 m" }   # decades: k x 10^e
    [zones.uncertainty.function]    # J-Sw parameters by the family's names (plain numbers)
    swirr = { distribution = "uniform", low = 0.05, high = 0.15 }

    # or all J-Sw parameters drawn together around their fitted values:
    [zones.uncertainty.function]
    distribution = "joint_normal"
    covariance = "model file"       # the covariance the fit recorded (function from a model file)
    # covariance = [[1e-6, 0.0], [0.0, 4e-4]]   # or the matrix itself, parameter units squared,
    # parameters = ["swirr", "b"]               # rows in this order (default: all, the family's order)

Each distribution is a table with ``distribution`` (``normal``, ``truncated_normal``,
``triangular`` or ``uniform``) and its values: normal ``mean``, ``sd``; truncated
normal ``mean``, ``sd``, ``low``, ``high``; triangular ``low``, ``mode``, ``high``;
uniform ``low``, ``high``. A missing ``mean`` (``mode``) is the zone's own value (0
for the log errors). ``correlation_length`` (default 0: independent samples) is the
length along TVDSS over which a log error's correlation falls to 1/e. ``joint_normal``
draws the J-Sw parameters together from a multivariate normal centred on the zone's
parameters, with the covariance the model file's fit recorded or one given as rows;
a covariance of the wrong size, not symmetric or not positive semi-definite is refused.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from ..distributions import KINDS, Distribution, JointNormal
from ..errors import ModelError, ProjectFileError, SatHeightError, UnitError
from ..io.model_file import load_models
from ..models import get_family
from ..uncertainty import LOG_ERRORS, LogError, MonteCarloSettings, ZoneUncertainty
from ..units import UNIT_SYSTEMS, in_unit, parse_quantity

#: The zone key this module reads (added to the project reader's allowed zone keys).
UNCERTAINTY_ZONE_KEY = "uncertainty"
#: The top-level table this module reads (added to the reader's allowed top-level keys).
UNCERTAINTY_TOP_KEY = "uncertainty"

_SETTINGS_KEYS = ("realisations", "seed", "memory_mb", "tornado", "accept_implausible")
_ZONE_KEYS = ("fwl", "water_density", "hydrocarbon_density", "sigma_cos_theta", "function",
              "porosity_error", "permeability_error")
_DIST_KEYS = ("distribution", "mean", "sd", "low", "mode", "high")
#: The distribution of the J-Sw parameters drawn together, and its keys.
JOINT = "joint_normal"
_JOINT_KEYS = ("distribution", "covariance", "parameters")
#: ``covariance = MODEL_FILE``: the covariance the zone's model file records for its fit.
MODEL_FILE = "model file"
_KIND_OF = {"fwl": "length", "water_density": "density", "hydrocarbon_density": "density",
            "sigma_cos_theta": "tension", "porosity_error": "fraction"}
#: Plausible largest spread (sd, or high - low) of each input, in SI; wider needs
#: ``accept_implausible = true``. Common practice: a FWL known to a few tens of metres,
#: densities to a few hundred kg/m3, porosity to a few porosity units, permeability
#: to a few decades.
PLAUSIBLE_SPREAD = {"fwl": 500.0, "water_density": 300.0, "hydrocarbon_density": 500.0,
                    "sigma_cos_theta": 0.1, "porosity_error": 0.15, "permeability_error": 3.0,
                    "function": 100.0}
PLAUSIBLE_CORRELATION_LENGTH = 5000.0     # [m]
MAX_REALISATIONS = 1_000_000


@dataclass(frozen=True)
class UncertaintySpec:
    """The Monte Carlo of a project: its settings and each zone's uncertain inputs (SI)."""

    settings: MonteCarloSettings = field(default_factory=MonteCarloSettings)
    zones: dict = field(default_factory=dict)        # zone name -> ZoneUncertainty
    tornado: bool = True


class _Keys:
    def __init__(self, path: Path, unit_system: str, accept: bool):
        self.path, self.units, self.accept = path, UNIT_SYSTEMS[unit_system], accept

    def error(self, key: str, what: str, hint: str | None = None) -> ProjectFileError:
        return ProjectFileError(what, where=f"{self.path}, key {key}", hint=hint)

    def table(self, raw: Any, key: str, allowed: tuple) -> dict:
        if not isinstance(raw, dict):
            raise self.error(key, f"expected a table, found {raw!r}",
                             hint="write it as { distribution = \"normal\", sd = ... } or a [table]")
        for k in raw:
            if k not in allowed:
                raise self.error(f"{key}.{k}", f"unknown key {k!r}",
                                 hint="allowed keys: " + ", ".join(allowed))
        return raw

    def shown(self, value_si: float, kind: str | None) -> str:
        """An SI value (or a spread of values) in the project's unit of ``kind``."""
        if kind is None:
            return f"{value_si:.6g}"
        return in_unit(value_si, self.units[kind], kind).rstrip()

    def value(self, raw: Any, key: str, kind: str | None) -> float:
        if kind is None:
            if isinstance(raw, bool) or not isinstance(raw, (int, float)) or not math.isfinite(raw):
                raise self.error(key, f"expected a plain finite number, found {raw!r}",
                                 hint="write a number without quotes, e.g. 0.1")
            return float(raw)
        try:
            return parse_quantity(raw, kind, self.units[kind])
        except UnitError as exc:
            raise self.error(key, f"expected a {kind} (a number or text with a unit), found "
                                  f"{raw!r}: {exc.what}",
                             hint=f"a bare number is taken in {self.units[kind]}") from None

    def distribution(self, raw: Any, key: str, kind: str | None, spread_limit: float,
                     extra: tuple = ()) -> Distribution:
        t = self.table(raw, key, _DIST_KEYS + extra)
        if "distribution" not in t:
            raise self.error(f"{key}.distribution", "required key 'distribution' is missing",
                             hint="one of " + ", ".join(KINDS))
        name = t["distribution"]
        if not isinstance(name, str) or name.strip().lower() not in KINDS:
            raise self.error(f"{key}.distribution", f"unknown distribution {name!r}",
                             hint="use one of " + ", ".join(KINDS))
        name = name.strip().lower()
        vals = {k: self.value(t[k], f"{key}.{k}", kind) for k in _DIST_KEYS[1:] if k in t}
        need = {"normal": ("sd",), "truncated_normal": ("sd", "low", "high"),
                "triangular": ("low", "high"), "uniform": ("low", "high")}[name]
        for k in need:
            if k not in vals:
                raise self.error(f"{key}.{k}", f"a {name} distribution needs {k!r}",
                                 hint="give " + ", ".join(need))
        optional = {"normal": {"mean"}, "truncated_normal": {"mean"}, "triangular": {"mode"},
                    "uniform": set()}[name]
        unused = sorted(set(vals) - set(need) - optional)
        if unused:
            raise self.error(f"{key}.{unused[0]}", f"{unused[0]!r} is not a value of a {name} "
                             "distribution", hint="give " + ", ".join(need))
        if vals.get("sd", 0.0) < 0:
            raise self.error(f"{key}.sd", f"sd must be >= 0, found {t['sd']!r}")
        if "low" in vals and not vals["low"] <= vals["high"]:
            raise self.error(f"{key}.low", f"low {t['low']!r} is above high {t['high']!r}")
        spread = vals["sd"] if "sd" in vals else vals["high"] - vals["low"]
        if spread > spread_limit and not self.accept:
            raise self.error(key, f"a spread of {self.shown(spread, kind)} is wider than the "
                                  f"plausible {self.shown(spread_limit, kind)}",
                             hint="check the value and its unit, or set "
                                  "accept_implausible = true under [uncertainty]")
        return Distribution(kind=name, **vals)


def _settings(keys: _Keys, raw: Any) -> tuple[MonteCarloSettings, bool]:
    t = keys.table(raw, "uncertainty", _SETTINGS_KEYS)
    out = {}
    for name, lo, hi in (("realisations", 1, MAX_REALISATIONS), ("seed", 0, 2**63 - 1)):
        if name in t:
            v = t[name]
            if isinstance(v, bool) or not isinstance(v, int) or not lo <= v <= hi:
                raise keys.error(f"uncertainty.{name}", f"expected a whole number from {lo} to "
                                 f"{hi}, found {v!r}")
            out[name] = v
    if "memory_mb" in t:
        mb = keys.value(t["memory_mb"], "uncertainty.memory_mb", None)
        if not 1.0 <= mb <= 1e6:
            raise keys.error("uncertainty.memory_mb", f"expected 1 to 1e6 MB, found {mb!r}")
        out["memory_mb"] = mb
    for flag in ("tornado", "accept_implausible"):
        if flag in t and not isinstance(t[flag], bool):
            raise keys.error(f"uncertainty.{flag}", f"expected true or false, found {t[flag]!r}")
    return MonteCarloSettings(**out), bool(t.get("tornado", True))


def _joint(keys: _Keys, t: dict, key: str, function) -> JointNormal:
    """``[zones.uncertainty.function] distribution = "joint_normal"``: the J-Sw parameters
    together, with the model file's covariance or the rows given."""
    keys.table(t, key, _JOINT_KEYS)
    if str(t["distribution"]).strip().lower() != JOINT:
        raise keys.error(f"{key}.distribution", f"unknown distribution {t['distribution']!r} "
                         "for the parameters together", hint=f"use {JOINT!r}, or give each "
                         "parameter its own table")
    if "covariance" not in t:
        raise keys.error(f"{key}.covariance", "required key 'covariance' is missing",
                         hint=f"covariance = {MODEL_FILE!r} or rows of numbers")
    cov = t["covariance"]
    if isinstance(cov, str) and cov.strip().lower() == MODEL_FILE:
        if "parameters" in t:
            raise keys.error(f"{key}.parameters", "the model file's covariance covers all the "
                             "fitted parameters", hint="remove parameters")
        if function is None or function.file is None or function.rock_type is None:
            raise keys.error(f"{key}.covariance", f"covariance = {MODEL_FILE!r} needs the zone's "
                             "function from a model file with one rock type",
                             hint="use [zones.function] file = ..., rock_type = ..., or give "
                                  "the covariance as rows of numbers")
        try:
            names, rows, where = load_models(function.file).covariance(function.rock_type,
                                                                       function.family)
        except (ModelError, SatHeightError) as exc:
            raise keys.error(f"{key}.covariance", f"model file {function.file}: {exc}",
                             hint=exc.hint) from None
        return JointNormal(names=names, covariance=tuple(tuple(r) for r in rows), source=where)
    if not isinstance(cov, list) or not all(isinstance(r, list) for r in cov):
        raise keys.error(f"{key}.covariance", f"expected {MODEL_FILE!r} or rows of numbers, "
                         f"found {str(cov)[:80]!r}", hint="e.g. [[1e-6, 0.0], [0.0, 4e-4]]")
    rows = tuple(tuple(keys.value(x, f"{key}.covariance[{i + 1}][{j + 1}]", None)
                       for j, x in enumerate(r)) for i, r in enumerate(cov))
    if "parameters" in t:
        ps = t["parameters"]
        if not isinstance(ps, list) or not ps or not all(isinstance(p, str) for p in ps) \
                or len(set(ps)) != len(ps):
            raise keys.error(f"{key}.parameters", f"expected a list of different parameter "
                             f"names, found {ps!r}", hint='e.g. ["swirr", "b"]')
        names = tuple(ps)
    elif function is not None:
        names = tuple(get_family(function.family).param_names)
    else:
        raise keys.error(f"{key}.parameters", "required key 'parameters' is missing")
    return JointNormal(names=names, covariance=rows, source=f"{keys.path}, key {key}.covariance")


def _function(keys: _Keys, f: Any, key: str, function) -> tuple[dict, JointNormal | None]:
    if not isinstance(f, dict):
        raise keys.error(key, f"expected a table of parameters, found {f!r}",
                         hint="write it as [zones.uncertainty.function] with parameter = { distribution = ... }")
    if "distribution" in f:
        joint = _joint(keys, f, key, function)
        try:
            joint.check(f"{keys.path}, key {key}.covariance")
        except SatHeightError as exc:
            raise ProjectFileError(exc.what, where=exc.where, hint=exc.hint) from None
        return {}, joint
    return {str(p): keys.distribution(d, f"{key}.{p}", None, PLAUSIBLE_SPREAD["function"])
            for p, d in f.items()}, None


def _zone(keys: _Keys, raw: Any, key: str, function=None) -> ZoneUncertainty:
    t = keys.table(raw, key, _ZONE_KEYS)
    inputs = {}
    for name in ("fwl", "water_density", "hydrocarbon_density", "sigma_cos_theta"):
        if name in t:
            inputs[name] = keys.distribution(t[name], f"{key}.{name}", _KIND_OF[name],
                                             PLAUSIBLE_SPREAD[name])
    joint = None
    if "function" in t:
        params, joint = _function(keys, t["function"], f"{key}.function", function)
        inputs.update(params)
    errors = {}
    for name in LOG_ERRORS:
        if name in t:
            k = f"{key}.{name}"
            d = keys.distribution(t[name], k, _KIND_OF.get(name), PLAUSIBLE_SPREAD[name],
                                  extra=("correlation_length",))
            length = 0.0
            if "correlation_length" in t[name]:
                length = keys.value(t[name]["correlation_length"], f"{k}.correlation_length", "length")
                if not 0 <= length <= PLAUSIBLE_CORRELATION_LENGTH and not (keys.accept and length >= 0):
                    raise keys.error(f"{k}.correlation_length", f"expected 0 to "
                                     f"{keys.shown(PLAUSIBLE_CORRELATION_LENGTH, 'length')}, "
                                     f"found {t[name]['correlation_length']!r}")
            errors[name] = LogError(distribution=d, correlation_length=length)
    return ZoneUncertainty(inputs=inputs, joint=joint, **errors)


def read_uncertainty(data: dict, path: Path, unit_system: str,
                     functions: dict | None = None) -> UncertaintySpec | None:
    """The Monte Carlo keys of a project document, or None when it has none.

    Parameters
    ----------
    data : dict
        The whole TOML document (its ``[[zones]]`` already checked by the reader).
    path : pathlib.Path
        The project file (named in errors).
    unit_system : str
        ``"metric"`` or ``"field"``: unit of bare numbers.
    functions : dict, optional
        Zone name -> its :class:`satheight.project.types.FunctionSpec` (the model file
        of ``covariance = "model file"``, the parameter order of a joint normal).

    Raises
    ------
    ProjectFileError
        Naming the key, e.g. ``zones[Upper].uncertainty.fwl.sd``, the value as read and a hint.
    """
    raw_settings = data.get(UNCERTAINTY_TOP_KEY)
    zones_raw = [z for z in data.get("zones", []) if isinstance(z, dict)]
    if raw_settings is None and not any(UNCERTAINTY_ZONE_KEY in z for z in zones_raw):
        return None
    accept = isinstance(raw_settings, dict) and raw_settings.get("accept_implausible") is True
    keys = _Keys(path, unit_system, accept)
    settings, tornado = (_settings(keys, raw_settings) if raw_settings is not None
                         else (MonteCarloSettings(), True))
    zones = {}
    for z in zones_raw:
        if UNCERTAINTY_ZONE_KEY in z:
            name = str(z.get("name"))
            zones[name] = _zone(keys, z[UNCERTAINTY_ZONE_KEY], f"zones[{name}].uncertainty",
                                (functions or {}).get(name))
    return UncertaintySpec(settings=settings, zones=zones, tornado=tornado)
