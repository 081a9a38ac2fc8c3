"""Fitted J-Sw models saved as readable JSON (never pickle), with their provenance.

File layout (``format`` = ``"satheight-models"``, ``version`` = 1)::

    {
      "format": "satheight-models", "version": 1,
      "program": "satheight 0.1.0",
      "provenance": {"files": {"core_pc_steps.csv": "<sha256>", ...},
                     "lab_systems": {...}, "closure": ..., "stress": {...},
                     "reservoir": {...}},
      "rock_typing": {"method": "column", "column": "rock_type"},
      "rock_types": {
        "Upper Sand": {
          "plugs": ["P01", ...], "n_points": 180, "selected": "power_law",
          "fits": {"power_law": {"family": "power_law", "variable": "j",
                                 "params": {...}, "stderr": {...}, "correlation": [[...]],
                                 "covariance": [[...]], "n_points": 180, "rmse": 0.012, "r2": 0.99, "aic": -1500,
                                 "j_range": [0.004, 380.0], "residuals_by_plug": {...}}, ...}
        }, ...
      }
    }

``selected`` is the family a project file gets when it names no ``family``.
Parameters are dimensionless (J families) or in metres (height functions).
``covariance`` (six significant digits, rows in the order of ``params``) is the fit's
parameter covariance; files written before it was stored give it back from ``stderr``
and ``correlation`` (:meth:`ModelFile.covariance`).
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass, field
from pathlib import Path

from .. import __version__
from ..errors import InputFileError, ModelError, SatHeightError
from .atomic import atomic_write_text
from ..rocktypes import RockTypeRule
from ..models import build_function, get_family
from ..models.base import FitReport, JSwFunction

FORMAT = "satheight-models"
VERSION = 1


@dataclass
class ModelFile:
    """Contents of a model file.

    Attributes
    ----------
    rock_types : dict[str, dict]
        Rock-type name -> ``{"plugs", "n_points", "selected", "fits": {family: dict}}``.
    rule : RockTypeRule
        How plugs were grouped; applied to logs when the file is used per depth.
    provenance : dict
    path : pathlib.Path or None
    """

    rock_types: dict
    rule: RockTypeRule
    provenance: dict = field(default_factory=dict)
    path: Path | None = None

    def function(self, rock_type: str, family: str | None = None, where: str = "") -> JSwFunction:
        """Ready-to-predict function of a rock type (its selected family by default).

        Raises
        ------
        ModelError
            Unknown rock type or family not fitted; the message lists what exists.
        """
        if rock_type not in self.rock_types:
            raise ModelError(f"the model file has no rock type {rock_type!r}", where=where or None,
                             hint="it has: " + ", ".join(repr(r) for r in self.rock_types))
        entry = self.rock_types[rock_type]
        fam = family or entry.get("selected")
        fits = entry.get("fits", {})
        if fam not in fits:
            raise ModelError(f"rock type {rock_type!r} has no fitted {fam!r} function",
                             where=where or None,
                             hint="fitted families: " + ", ".join(fits))
        rec = fits[fam]
        return build_function(fam, rec["params"], j_range=rec.get("j_range"), where=where)

    def covariance(self, rock_type: str, family: str | None = None) -> tuple[tuple, list, str]:
        """The parameter covariance of a fit: ``(names, rows, where)``.

        ``names`` are the parameters in the order of the rows; ``where`` names the file
        and the fit. A file without ``covariance`` (written before it was stored) gives
        ``stderr_i * correlation_ij * stderr_j`` (standard errors to two digits).

        Raises
        ------
        ModelError
            The fit has no usable covariance (e.g. its standard errors are missing).
        """
        self.function(rock_type, family)            # the rock type and family exist
        fam = family or self.rock_types[rock_type].get("selected")
        rec = self.rock_types[rock_type]["fits"][fam]
        where = f"{self.path}, rock_types[{rock_type}].fits[{fam}]"
        names = tuple(rec["params"])
        if "covariance" in rec:
            rows = rec["covariance"]
        else:
            se, corr = rec.get("stderr") or {}, rec.get("correlation")
            try:
                rows = [[se[a] * corr[i][j] * se[b] for j, b in enumerate(names)]
                        for i, a in enumerate(names)]
            except (KeyError, IndexError, TypeError):
                raise ModelError("the fit records no usable standard errors and correlation "
                                 "(an estimate could not be made)", where=where + ".stderr",
                                 hint="refit with 'satheight fit', or give the covariance "
                                      "in the project file") from None
        if not isinstance(rows, list) or not all(isinstance(r, list) and
                                                 all(isinstance(x, (int, float)) and
                                                     not isinstance(x, bool) for x in r)
                                                 for r in rows):
            raise ModelError(f"the covariance is not a table of numbers: {str(rows)[:80]}",
                             where=where + ".covariance",
                             hint="refit with 'satheight fit' (a missing value means the fit "
                                  "could not estimate it)")
        return names, rows, where


def _clean(v):
    if isinstance(v, float):
        return v if math.isfinite(v) else None
    if isinstance(v, dict):
        return {str(k): _clean(x) for k, x in v.items()}
    if isinstance(v, (list, tuple)):
        return [_clean(x) for x in v]
    if isinstance(v, FitReport):
        return _clean(v.to_dict())
    return v


def round_to_error(value: float, stderr: float | None, bounds=None) -> float:
    """``value`` rounded to the precision its standard error supports.

    Kept to the decimal place two below the standard error's leading digit
    (``SE = 2.8`` -> 2 decimals, ``SE = 0.0029`` -> 5 decimals): the rounding moves
    a parameter by at most SE/200, well inside its uncertainty, and drops the
    digits that differ between machines (a rule of our own). Without a usable standard error, six
    significant digits. The result stays within ``bounds`` (low, high).
    """
    v = float(value)
    if not math.isfinite(v) or v == 0.0:
        return v
    if stderr is not None and math.isfinite(stderr) and stderr > 0:
        decimals = 2 - math.floor(math.log10(stderr))
    else:
        decimals = 5 - math.floor(math.log10(abs(v)))
    r = round(v, decimals)
    if bounds is not None:
        r = min(max(r, float(bounds[0])), float(bounds[1]))
    return r


def _fit_record(report) -> dict:
    """JSON record of one fit, parameters to the precision their standard errors support."""
    rec = _clean(report)
    cls = get_family(report.family)
    se = report.stderr or {}
    rec["params"] = {p: round_to_error(v, se.get(p), cls.bounds.get(p))
                     for p, v in report.params.items()}
    rec["stderr"] = {p: (float(f"{s:.2g}") if s is not None and math.isfinite(s) else None)
                     for p, s in se.items()}
    if rec.get("covariance"):
        rec["covariance"] = [[float(f"{x:.6g}") if x is not None else None for x in row]
                             for row in rec["covariance"]]
    else:
        rec.pop("covariance", None)
    return rec


def models_to_dict(fits: dict, rule: RockTypeRule, provenance: dict) -> dict:
    """JSON-ready dict from :func:`satheight.coreplugs.fit_rock_types` output.

    Fitted parameters are written to the precision their standard errors support
    (:func:`round_to_error`), standard errors to two significant digits; each rock
    type carries ``delta_aic`` (AIC minus the lowest, per J family) beside ``selected``.
    """
    rts = {}
    for name, e in fits.items():
        rts[name] = {"plugs": list(e["plugs"]), "n_points": e["n_points"],
                     "selected": e["selected"], "delta_aic": _clean(e.get("delta_aic", {})),
                     "fits": {f: _fit_record(r) for f, r in e["fits"].items()},
                     "fit_errors": dict(e.get("errors", {}))}
    return {"format": FORMAT, "version": VERSION, "program": f"satheight {__version__}",
            "note": "J-Sw functions fitted to core capillary-pressure data; J is "
                    "Pc*sqrt(k/phi)/(sigma cos theta) in SI; height-function parameters in m",
            "provenance": _clean(provenance), "rock_typing": rule.to_dict(), "rock_types": rts}


def save_models(path, data: dict) -> Path:
    """Write a model dict (:func:`models_to_dict`) as indented JSON, atomically."""
    path = Path(path)
    text = json.dumps(data, indent=2, allow_nan=False, sort_keys=False) + "\n"
    atomic_write_text(path, text)
    return path


def load_models(path) -> ModelFile:
    """Read and check a model file.

    Raises
    ------
    InputFileError
        Missing, unreadable, not JSON, or not a satheight model file.
    ModelError
        A fit record with an unknown family or parameters out of range (names the
        file and the rock type).
    """
    p = Path(path)
    try:
        text = p.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise InputFileError("model file not found", where=str(p),
                             hint="run 'satheight fit' to make one, or fix the path") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputFileError(f"cannot read the model file: {exc}", where=str(p)) from None
    try:
        data = json.loads(text)
    except json.JSONDecodeError as exc:
        raise InputFileError(f"not valid JSON: {exc.msg}", where=f"{p}, line {exc.lineno}",
                             hint="the model file is written by 'satheight fit'") from None
    if not isinstance(data, dict) or data.get("format") != FORMAT:
        raise InputFileError("not a satheight model file (format key missing or different)",
                             where=str(p), hint="the model file is written by 'satheight fit'")
    if data.get("version") != VERSION:
        raise InputFileError(f"model file version {data.get('version')!r} is not supported",
                             where=str(p), hint=f"this program reads version {VERSION}")
    rts = data.get("rock_types")
    if not isinstance(rts, dict) or not rts:
        raise InputFileError("the model file holds no rock types", where=str(p))
    try:
        rule = RockTypeRule.from_dict(data.get("rock_typing") or {}, where=f"{p}, key rock_typing")
    except SatHeightError as exc:
        raise InputFileError(exc.what, where=exc.where, hint=exc.hint) from None
    for name, e in rts.items():
        fits = e.get("fits") if isinstance(e, dict) else None
        if not isinstance(fits, dict):
            raise InputFileError(f"rock type {name!r} has no fits table", where=str(p))
        for fam, rec in fits.items():
            where = f"{p}, rock_types[{name}].fits[{fam}]"
            get_family(fam, where=where)
            if not isinstance(rec, dict) or not isinstance(rec.get("params"), dict):
                raise InputFileError("fit record has no params table", where=where)
            build_function(fam, rec["params"], j_range=rec.get("j_range"), where=where)
    return ModelFile(rock_types=rts, rule=rule, provenance=data.get("provenance", {}), path=p)
