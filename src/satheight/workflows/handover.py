"""The hand-over files of a run, for the tools that come next.

* ``contacts.csv``: every contact the run used or found, one row each, as markers
  (well, zone, kind, MD, TVDSS, interval and what it means, source) in the project's
  length unit; the ``fwl`` and ``pressures`` commands write the same columns
  (:data:`CONTACT_COLUMNS`) for the levels they find;
* ``shf_models.json``: per zone and rock type, the J-Sw function with its parameters,
  standard errors and covariance, the fluids and the FWL;
* ``shf_table.csv``: Sw against height above the FWL for a grid of permeabilities at the
  zone's porosity, so a 3D model can use the function without this program.
"""

from __future__ import annotations

import json
from dataclasses import replace
from pathlib import Path

import numpy as np

from .. import __version__
from .. import units as U
from ..errors import SatHeightError
from ..handover import (covariance, entry_heights, height_grid, permeability_grid, shf_grid,
                        significant)
from ..io.atomic import atomic_write_text
from ..io.model_file import load_models
from ..io.tables import write_table
from ..engine import zone_for_well
from ..project.types import Project
from .console import SCHEMA_VERSION

#: Files of the hand-over (written once per run).
HANDOVER_FILES = ("contacts.csv", "shf_models.json", "shf_table.csv")

#: Contact kinds by the hydrocarbon of the zone (the contact one entry height above the FWL).
_CONTACT_KIND = {"oil": "OWC", "gas": "GWC", "air": "entry level"}

#: Where the typical porosity of a zone's table comes from (stated in both files).
POROSITY_RULE = ("median over the computed wells of each well's median porosity of the "
                 "zone's net-reservoir samples (the comparison cutoffs)")


#: Columns of every ``contacts.csv`` (``run``, ``fwl`` and ``pressures`` write the same
#: schema); ``{u}`` is the length unit. Depths are TVDSS, positive down; low is the
#: shallow end of the interval, high the deep end.
CONTACT_COLUMNS = ("well", "marker", "zone", "kind", "MD [{u}]", "TVDSS [{u}]",
                   "TVDSS low [{u}]", "TVDSS high [{u}]", "interval level [frac]",
                   "interval meaning", "source")

#: What each row's interval means (the ``interval meaning`` column).
MEANING_MONTE_CARLO = "P10 to P90 of the project's Monte Carlo FWL distribution ({kind})"
MEANING_BOOTSTRAP = "confidence interval: moving-block bootstrap of the log samples"
MEANING_PRESSURE = "confidence interval: Student t, propagated from the two pressure-line fits"
#: Probabilities of the Monte Carlo FWL interval (10th and 90th percentiles of depth).
MONTE_CARLO_QUANTILES = (0.1, 0.9)


def _row(well, zone, kind, tvdss, source, *, md=None, low=None, high=None, level=None,
         meaning="") -> dict:
    """One contact row (depths in the file's length unit); without ``low``/``high`` no interval."""
    if low is None or high is None:
        low = high = level = None
        meaning = ""
    return {"well": well, "zone": zone, "kind": kind, "md": md, "tvdss": tvdss, "low": low,
            "high": high, "level": level, "meaning": meaning, "source": source}


def _fwl_spread(project: Project | None, zone: str):
    """The zone's Monte Carlo FWL distribution (SI), or None when the project gives none."""
    spec = project.uncertainty if project is not None else None
    zu = spec.zones.get(zone) if spec is not None else None
    return zu.inputs.get("fwl") if zu is not None else None


def contact_rows(summaries: list[dict], project: Project | None = None) -> list[dict]:
    """One row per contact of each well's summary (``zones[*].contact``), in summary units.

    Kinds: ``FWL`` (given in the project file), ``FOL`` (free-oil level of a gas cap over
    an oil leg, given), and ``OWC``/``GWC``/``entry level`` (one entry height above the FWL
    for the well's typical rock: from the model and the well's logs). A FWL whose zone
    has a Monte Carlo FWL distribution in ``project`` gets its P10 to P90 as the
    interval (the distribution centred on the well's FWL, as the Monte Carlo draws it);
    the other rows have no stated uncertainty and no interval.
    """
    lf = U.factor(U.UNIT_SYSTEMS[project.unit_system]["length"], "length") if project else 1.0
    rows = []
    for s in summaries:
        for zone, block in s.get("zones", {}).items():
            c = block.get("contact")
            if not c:
                continue
            levels = [("FWL", "fwl", "project file"),
                      ("FOL", "gas_oil_level", "project file"),
                      (_CONTACT_KIND.get(block.get("hydrocarbon"), "contact"), "contact",
                       "model entry height at the well's typical rock (logs)")]
            for kind, key, source in levels:
                tvdss = c.get(f"{key}_tvdss")
                if tvdss is None:
                    continue
                spread = _fwl_spread(project, zone) if key == "fwl" else None
                low = high = None
                if spread is not None:
                    q = spread.centred(tvdss * lf).ppf(np.array(MONTE_CARLO_QUANTILES))
                    low, high = float(q[0]) / lf, float(q[1]) / lf
                rows.append(_row(s["well"], zone, kind, tvdss, source, md=c.get(f"{key}_md"),
                                 low=low, high=high,
                                 level=MONTE_CARLO_QUANTILES[1] - MONTE_CARLO_QUANTILES[0],
                                 meaning=MEANING_MONTE_CARLO.format(
                                     kind=spread.kind if spread else "")))
    return rows


def fwl_search_rows(zones: dict) -> list[dict]:
    """Rows of the ``fwl`` command: each zone's joint best FWL and its interval.

    ``zones``: zone name -> the zone's JSON summary (``fwl_<zone>.json``), whose units the
    rows keep. The FWL is one level for the zone (no well, no MD).
    """
    rows = []
    for name, d in zones.items():
        low, high = d["interval"]
        n = len(d.get("wells", []))
        rows.append(_row("", name, "FWL", d["best_fwl"],
                         f"FWL search from log Sw, joint over {n} well{'s' if n != 1 else ''}",
                         low=low, high=high, level=d["confidence_level"],
                         meaning=MEANING_BOOTSTRAP))
    return rows


def pressure_rows(zones: dict) -> list[dict]:
    """Rows of the ``pressures`` command: per zone the FWL and free-oil level from the
    pressure lines, and the FWL from log Sw when it was searched.

    ``zones``: zone name -> the zone's block of ``pressures_summary.json`` (its units).
    """
    rows = []
    for name, d in zones.items():
        for kind, key in (("FWL", "fwl"), ("FOL", "free_oil_level")):
            lv = d.get(key)
            if lv is None:
                continue
            low, high = lv["interval"]
            rows.append(_row("", name, kind, lv["depth"],
                             f"pressure gradients: the {' and '.join(lv['lines'])} lines meet",
                             low=low, high=high, level=lv.get("confidence_level"),
                             meaning=MEANING_PRESSURE))
        lg = d.get("log_fwl")
        if lg is not None:
            rows.append(_row("", name, "FWL", lg["best"], "FWL search from log Sw",
                             low=lg["interval"][0], high=lg["interval"][1],
                             level=lg.get("confidence_level"), meaning=MEANING_BOOTSTRAP))
    return rows


def write_contacts(rows: list[dict], path: Path, length_unit: str) -> Path:
    """``contacts.csv`` of ``rows`` (:func:`contact_rows`, :func:`fwl_search_rows`,
    :func:`pressure_rows`) in the columns :data:`CONTACT_COLUMNS`, written atomically.

    Text from inputs (well and zone names) is made safe for a spreadsheet cell by the
    table writer (:func:`satheight.io.tables.safe_cell`).
    """
    def col(key):
        return [r[key] for r in rows]

    def num(key):
        return np.array([np.nan if r[key] is None else r[key] for r in rows], dtype=float)

    names = [c.format(u=length_unit) for c in CONTACT_COLUMNS]
    values = [col("well"), [f"{r['zone']} {r['kind']}" for r in rows], col("zone"),
              col("kind"), num("md"), num("tvdss"), num("low"), num("high"), num("level"),
              col("meaning"), col("source")]
    return write_table(dict(zip(names, values)), csv_path=path)[0]


def _zone_porosity(summaries: list[dict], zone: str) -> float | None:
    vals = [s["zones"][zone]["contact"].get("typical_porosity") for s in summaries
            if zone in s.get("zones", {}) and s["zones"][zone].get("contact")]
    vals = [v for v in vals if v is not None]
    return float(np.median(vals)) if vals else None


def _functions(zs) -> dict:
    """Rock type -> FunctionSpec of a project zone (one entry without rock typing)."""
    spec = zs.function
    if spec.by_rock_type:
        return dict(spec.by_rock_type)
    return {spec.rock_type or "all": spec}


def _fit_record(spec, rock: str, files: dict) -> dict:
    """Standard errors and covariance of a function from its model file (None if given).

    The covariance is the one the fit stored; a file written before it was stored gives
    it back from the standard errors (two digits) and the correlation.
    """
    if spec.file is None:
        return {"stderr": None, "covariance": None,
                "note": "parameters given in the project file: no standard errors"}
    path = Path(spec.file)
    if path not in files:
        files[path] = load_models(path)
    entry = files[path].rock_types.get(spec.rock_type or rock, {})
    rec = entry.get("fits", {}).get(spec.family, {})
    se = rec.get("stderr") or {}
    names = list(spec.params)
    out = {"stderr": {n: se.get(n) for n in names}, "covariance": None,
           "source": f"{path.name}, rock type {spec.rock_type or rock!r}, {spec.family}"}
    corr = rec.get("correlation")
    s = [se.get(n) for n in names]
    stored, fitted = rec.get("covariance"), list(rec.get("params") or [])
    if stored is not None and sorted(fitted) == sorted(names) and \
            np.shape(stored) == (len(names), len(names)):
        # the fit's own covariance (six digits), rows put in this function's parameter order
        at = [fitted.index(n) for n in names]
        cov = np.where(np.equal(stored, None), np.nan, stored).astype(float)[np.ix_(at, at)]
        out["covariance"] = [[None if not np.isfinite(x) else float(x) for x in row]
                             for row in cov]
    elif corr is not None and None not in s and np.shape(corr) == (len(names), len(names)):
        cov = covariance(s, np.where(np.equal(corr, None), np.nan, corr).astype(float))
        out["covariance"] = [[None if not np.isfinite(x) else float(x) for x in row]
                             for row in cov]
    return out


def write_shf(project: Project, summaries: list[dict], out_dir: Path) -> list[Path]:
    """``shf_models.json`` and ``shf_table.csv`` of every zone and rock type."""
    lu = U.UNIT_SYSTEMS[project.unit_system]["length"]
    lf = U.factor(lu, "length")
    du = U.UNIT_SYSTEMS[project.unit_system]["density"]
    heights, k_md = height_grid(lf), permeability_grid()
    zones, cols, files = {}, {k: [] for k in ("zone", "rock_type", "phi", "k", "h", "j", "sw")}, {}
    for zs in project.zones:
        phi = _zone_porosity(summaries, zs.name)
        rocks = {}
        for rock, spec in _functions(zs).items():
            rec = {"family": spec.family, "params": dict(spec.params),
                   "j_range": None if spec.j_range is None else list(spec.j_range)}
            rec.update(_fit_record(spec, rock, files))
            rocks[rock] = rec
            if phi is None:
                continue
            one = _single(zs, spec)
            zone = zone_for_well(one, 0.0, 0.0, where=f"{project.path}, zones[{zs.name}]")
            # each permeability's entry height is a node: the kink of Sw falls on it
            he = np.clip(np.nan_to_num(entry_heights(zone, zone.function, phi, k_md) / lf,
                                       nan=heights[-1]), 0.0, heights[-1])
            h = np.sort(np.vstack([np.broadcast_to(heights[:, None], (heights.size, k_md.size)),
                                   significant(he, 7)[None, :]]), axis=0)
            j, sw = shf_grid(zone, zone.function, phi, h * lf, k_md)
            n = j.size
            cols["zone"] += [zs.name] * n
            cols["rock_type"] += [rock] * n
            cols["phi"].append(np.full(n, phi))
            cols["k"].append(np.broadcast_to(k_md[None, :], j.shape).T.ravel())
            cols["h"].append(h.T.ravel())
            cols["j"].append(significant(j.T.ravel(), 7))
            cols["sw"].append(np.round(sw.T.ravel(), 6))
        zones[zs.name] = _zone_record(zs, rocks, phi, lf, du)
    doc = {"schema_version": SCHEMA_VERSION, "program": f"satheight {__version__}",
           "project": project.path.name,
           "units": {"depth": lu, "density": du, "sigma_cos_theta": "mN/m",
                     "parameters": "dimensionless (J functions) or m (height functions)"},
           "j_definition": "J = Pc * sqrt(k/phi) / (sigma cos theta), SI units",
           "table": {"file": "shf_table.csv", "porosity": POROSITY_RULE,
                     "interpolate": "linear in height, linear in log10(permeability)"},
           "zones": zones}
    out = [out_dir / "shf_models.json"]
    atomic_write_text(out[0], json.dumps(doc, indent=2, allow_nan=False) + "\n")
    if cols["j"]:
        table = {"zone": cols["zone"], "rock_type": cols["rock_type"],
                 "porosity [frac]": np.concatenate(cols["phi"]),
                 "permeability [mD]": np.concatenate(cols["k"]),
                 f"height above FWL [{lu}]": np.concatenate(cols["h"]),
                 "J [-]": np.concatenate(cols["j"]), "SW [frac]": np.concatenate(cols["sw"])}
        out += write_table(table, csv_path=out_dir / "shf_table.csv")
    return out


def _single(zs, spec):
    """The project zone with one function (``spec``) and no per-depth rock typing."""
    one = replace(spec, by_rock_type=None, rock_rule=None)
    return replace(zs, function=one)


def _zone_record(zs, rocks: dict, phi, lf: float, du: str) -> dict:
    rec = {"fwl_tvdss": zs.fwl / lf, "hydrocarbon": zs.hydrocarbon,
           "water_density": U.from_si(zs.water_density, du, "density"),
           "hydrocarbon_density": U.from_si(zs.hydrocarbon_density, du, "density"),
           "sigma_cos_theta_mN_per_m": zs.sigma_cos_theta * 1e3,
           "table_porosity": phi, "rock_types": rocks}
    if zs.gas_oil_level is not None:
        rec.update({"free_oil_level_tvdss": zs.gas_oil_level / lf,
                    "gas_density": U.from_si(zs.gas_density, du, "density"),
                    "gas_sigma_cos_theta_mN_per_m": zs.gas_sigma_cos_theta * 1e3})
    if zs.function.by_rock_type:
        rec["rock_typing"] = "per depth from log porosity and permeability (model file rule)"
    if phi is None:
        rec["note"] = "no computed well has net samples in this zone: no table"
    return rec


def write_handover(project: Project, summaries: list[dict], out_dir: Path,
                   notes: list[str]) -> list[Path]:
    """Write the hand-over files; a failure of the function files is a note, not a failed run."""
    lu = U.UNIT_SYSTEMS[project.unit_system]["length"]
    files = [write_contacts(contact_rows(summaries, project), out_dir / "contacts.csv", lu)]
    try:
        files += write_shf(project, summaries, out_dir)
    except SatHeightError as exc:
        notes.append(f"saturation-height function files not written: {exc}")
    return files
