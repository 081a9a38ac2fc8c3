"""Run the contact jobs and write their files: FWL from logs, FWL from pressures.

The command line calls :func:`run_fwl` and :func:`run_pressures`; they return
plain dicts (what was found, which files were written) and never print.
:func:`fwl_from_project` gathers each zone's samples over the project's wells and
runs the search of :mod:`satheight.fwlsearch`.
"""

from __future__ import annotations

import json
import math
import warnings
from pathlib import Path
from typing import Sequence

import numpy as np

from .. import units as U
from ..fwljoint import fit_fwl_with_parameters
from ..fwlmisfit import zone_samples
from ..fwlsearch import FwlSearch, search_fwl
from ..errors import SatHeightError
from ..io.atomic import atomic_write_text
from ..io.pressures import read_pressure_points, resolve_tvdss
from ..plots.contacts import misfit_plot, pressure_plot
from .figures import save_figure
from ..pressures import DEFAULT_QUALITIES, analyse_pressures, compare_levels
from ..project.types import Project
from ..results import WellResult
from ..roles import find_curve
from .output_folder import InputFiles, OutputSession
from .console import SCHEMA_VERSION, Progress
from .outputs import check_wells, open_project, project_inputs, safe_name
from .handover import fwl_search_rows, pressure_rows, write_contacts
from .well import compute_well, depth_maps

__all__ = ["run_fwl", "run_pressures", "fwl_from_project", "parse_exclude", "parse_fit_bounds"]


def _safe(name: str) -> str:
    """A zone name as a file-name part (:func:`satheight.workflows.outputs.safe_name`)."""
    return safe_name(name, "zone")


#: Command-line option of each search setting (for the messages of :func:`check_fwl_options`).
FWL_OPTIONS = {"window": "--window", "step": "--step", "delta": "--delta", "n_boot": "--resamples",
               "block_length": "--block", "seed": "--seed", "tolerance": "--tolerance",
               "max_shale": "--max-shale", "shale_curve": "--shale-curve", "exclude": "--exclude",
               "fit_parameters": "--fit"}


def _refuse(key: str, what: str, hint: str) -> SatHeightError:
    opt = FWL_OPTIONS.get(key, key)
    return SatHeightError(f"{opt} {what}", hint=hint)


def _finite(v) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)


def check_fwl_options(options: dict) -> None:
    """Refuse zero, negative, reversed or lone values of the FWL search settings.

    Each error names the command-line option (:data:`FWL_OPTIONS`). A step of zero or
    a reversed window would otherwise be replaced or searched silently.
    """
    o = {k: v for k, v in options.items() if v is not None}
    if "window" in o and not (len(o["window"]) == 2 and all(map(_finite, o["window"]))
                              and o["window"][0] < o["window"][1]):
        raise _refuse("window", f"{list(o['window'])} must be SHALLOW DEEP with SHALLOW < DEEP",
                      "e.g. --window 2000 2100 (TVDSS, positive down)")
    for key, example in (("step", "--step 0.25"), ("delta", "--delta 0.05")):
        if key in o and not (_finite(o[key]) and o[key] > 0):
            raise _refuse(key, f"must be a number > 0, got {o[key]}", f"e.g. {example}")
    if "tolerance" in o and not (_finite(o["tolerance"]) and o["tolerance"] >= 0):
        raise _refuse("tolerance", f"must be a number >= 0, got {o['tolerance']}",
                      "e.g. --tolerance 0.5")
    if "n_boot" in o and not (isinstance(o["n_boot"], int) and 10 <= o["n_boot"] <= 5000):
        raise _refuse("n_boot", f"must be a whole number from 10 to 5000, got {o['n_boot']}",
                      "e.g. --resamples 200")
    if "block_length" in o and not (isinstance(o["block_length"], int) and o["block_length"] >= 1):
        raise _refuse("block_length", f"must be a whole number >= 1, got {o['block_length']}",
                      "or leave it out to take it from the residual correlation")
    if "seed" in o and not (isinstance(o["seed"], int) and o["seed"] >= 0):
        raise _refuse("seed", f"must be a whole number >= 0, got {o['seed']}", "e.g. --seed 1")
    if ("shale_curve" in o) != ("max_shale" in o):
        raise _refuse("shale_curve" if "shale_curve" in o else "max_shale",
                      "needs --max-shale" if "shale_curve" in o else "needs --shale-curve",
                      "give both --shale-curve CURVE and --max-shale VALUE, or neither")
    if "max_shale" in o and not _finite(o["max_shale"]):
        raise _refuse("max_shale", f"must be a finite number, got {o['max_shale']}",
                      "e.g. --max-shale 90")
    for w, top, base in o.get("exclude", ()):
        if not (_finite(top) and _finite(base) and top < base):
            raise _refuse("exclude", f"interval {top}:{base} must be TOP:BASE with TOP < BASE",
                          "e.g. --exclude 2060:2062 (TVDSS, positive down)")
    for name, (lo, hi) in (o.get("fit_parameters") or {}).items():
        if not (_finite(lo) and _finite(hi) and lo < hi):
            raise _refuse("fit_parameters", f"bounds of {name!r} must be LOW < HIGH, got "
                          f"{lo}:{hi}", "e.g. --fit swirr:0:0.3")


def run_fwl(project_path, out_dir, zones=None, wells=None, plot: bool = True,
            overwrite: bool = False, progress: bool = False, **options) -> dict:
    """FWL search per zone from log Sw; writes ``fwl_<zone>.json``, ``fwl_<zone>_misfit.png``
    and ``contacts.csv`` (the hand-over columns of :mod:`satheight.workflows.handover`).

    Parameters
    ----------
    project_path : str or pathlib.Path
    out_dir : str or pathlib.Path
        Created if missing; written through
        :class:`satheight.workflows.output_folder.OutputSession` (command ``fwl``).
    zones, wells : list of str, optional
        Restrict the zones searched and the wells used (a name that matches no zone
        or well of the project is an error).
    plot : bool
        Write the misfit plots.
    overwrite : bool
        Replace the files of an earlier ``fwl`` into the same folder.
    progress : bool
        Show wells read and zones searched on stderr when it takes more than a second.
    **options
        Checked (:func:`check_fwl_options`), then passed to :func:`fwl_from_project`
        (window, step, misfit, delta, n_boot, seed, shale_curve, max_shale, exclude,
        fit_parameters...).

    Returns
    -------
    dict
        ``{"project", "units", "zones": {name: summary}, "notes", "files"}``.
    """
    check_fwl_options(options)
    project = open_project(project_path)
    check_wells(project)
    inputs = project_inputs(project)
    lu = U.UNIT_SYSTEMS[project.unit_system]["length"]
    lf = U.factor(lu, "length")
    if "window" in options and options["window"] is not None:
        options["window"] = tuple(v * lf for v in options["window"])
    if "exclude" in options:
        options["exclude"] = [(w, a * lf, b * lf) for w, a, b in options["exclude"]]
    if "step" in options and options["step"] is not None:
        options["step"] = options["step"] * lf
    options = {k: v for k, v in options.items() if v is not None}
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        with Progress(len(project.wells) + len(zones or project.zones), unit="fwl steps",
                      enabled=progress, slow=True) as bar:
            results, notes = fwl_from_project(project, zones=zones, wells=wells, bar=bar,
                                              **options)
    notes += [str(w.message) for w in caught]
    summary = {}
    with OutputSession(Path(out_dir), "fwl", overwrite, inputs) as session:
        files = []
        for name, res in results.items():
            d = res.to_dict(lf, lu)
            summary[name] = d
            path = session.work / f"fwl_{_safe(name)}.json"
            atomic_write_text(path, json.dumps({"schema_version": SCHEMA_VERSION, **d}, indent=2,
                                               allow_nan=False) + "\n")
            files.append(path)
            if plot:
                files += save_figure(misfit_plot(res, units=project.unit_system),
                                     session.work / f"fwl_{_safe(name)}_misfit.png")
        files.append(write_contacts(fwl_search_rows(summary), session.work / "contacts.csv", lu))
        files = session.commit(files)
    return {"project": str(project.path), "units": lu, "zones": summary, "notes": notes,
            "files": files, "results": results}


def run_pressures(pressure_file, out_dir, project_path=None, zone: str | None = None,
                  units: str | None = None, qualities=DEFAULT_QUALITIES,
                  with_logs: bool = True, plot: bool = True, n_boot: int = 200,
                  overwrite: bool = False, progress: bool = False) -> dict:
    """Gradients, FWL and free-oil level from a pressure file; compare with the project.

    Writes ``pressures_summary.json``, ``contacts.csv`` (the hand-over columns of
    :mod:`satheight.workflows.handover`) and the pressure-depth plot(s).

    Parameters
    ----------
    pressure_file : str or pathlib.Path
        Pressure-points CSV (:mod:`satheight.io.pressures`).
    out_dir : str or pathlib.Path
    project_path : str or pathlib.Path, optional
        Turns MD-only points into TVDSS (datum elevation; minimum curvature through
        the survey of a deviated well), gives the project's
        FWL of each zone and the wells for the FWL from log Sw.
    zone : str, optional
        Project zone the points belong to when the file has no zone column (default:
        the project's zone when it has only one).
    units : str, optional
        ``"metric"`` or ``"field"`` for the summary and plot (default: the
        project's, else metric).
    qualities : tuple of str
        Quality words fitted.
    with_logs : bool
        Also search the FWL from log Sw (needs the project) and compare.
    plot : bool
        Write the pressure-depth plot(s).
    n_boot : int
        Bootstrap resamples of the log search.
    overwrite : bool
        Replace the files of an earlier ``pressures`` into the same folder (written
        through :class:`satheight.workflows.output_folder.OutputSession`).
    progress : bool
        Show the steps on stderr when they take more than a second.

    Returns
    -------
    dict
        ``{"file", "units", "zones": {name: summary}, "files", "notes"}``.
    """
    with Progress(4, unit="pressures steps", enabled=progress, slow=True) as bar:
        return _run_pressures(pressure_file, out_dir, project_path, zone, units, qualities,
                              with_logs, plot, n_boot, overwrite, bar)


def _run_pressures(pressure_file, out_dir, project_path, zone, units, qualities, with_logs,
                   plot, n_boot, overwrite, bar: Progress) -> dict:
    """:func:`run_pressures` with its progress bar."""
    bar.step("reading pressure points")
    inputs = InputFiles()
    inputs.add(pressure_file, "pressure file")
    project = open_project(project_path) if project_path is not None else None
    if project is not None:
        project_inputs(project, inputs)
    points = read_pressure_points(pressure_file)
    system = units or (project.unit_system if project else "metric")
    if system not in U.UNIT_SYSTEMS:
        raise SatHeightError(f"unknown unit system {system!r}", hint="use metric or field")
    lu, pu = U.UNIT_SYSTEMS[system]["length"], U.UNIT_SYSTEMS[system]["pressure"]
    lf, pf = U.factor(lu, "length"), U.factor(pu, "pressure")
    notes: list[str] = []
    _fill_zone(zone, points, project, notes)
    if project is not None and (points.tvdss != points.tvdss).any():
        points = resolve_tvdss(points, depth_maps(project, set(points.well), notes))
    elif (points.tvdss != points.tvdss).any():
        points = resolve_tvdss(points, {})
    notes += points.notes
    bar.step("fitting gradients")
    analysis = analyse_pressures(points, qualities=qualities,
                                 density_unit=U.UNIT_SYSTEMS[system]["density"])
    bar.step("FWL from log Sw")
    log = _log_fwls(project, analysis, n_boot, notes) if project is not None and with_logs else {}
    summary = {name: _zone_pressures_summary(name, zp, project, log, (lf, pf, lu, pu), notes)
               for name, zp in analysis.items()}
    doc = {"schema_version": SCHEMA_VERSION,
           "file": str(points.source), "units": {"depth": lu, "pressure": pu,
                                                  "density": "g/cm3", "gradient": f"{pu}/{lu}"},
           "qualities_fitted": list(qualities), "zones": summary, "notes": notes}
    bar.step("writing")
    with OutputSession(Path(out_dir), "pressures", overwrite, inputs) as session:
        path = session.work / "pressures_summary.json"
        atomic_write_text(path, json.dumps(doc, indent=2, allow_nan=False) + "\n")
        files = [path, write_contacts(pressure_rows(summary), session.work / "contacts.csv", lu)]
        for name, zp in analysis.items() if plot else ():
            lg = (log[name].best, log[name].low, log[name].high) if name in log else None
            files += save_figure(pressure_plot(zp, units=system, log_fwl=lg),
                                 session.work / f"pressures_{_safe(name or 'all')}.png")
        files = session.commit(files[1:] + files[:1])
    files = files[-1:] + files[:-1]
    return {"file": str(points.source), "units": doc["units"], "zones": summary,
            "files": files, "notes": notes, "analysis": analysis}


def _log_fwls(project: Project, analysis: dict, n_boot: int, notes: list[str]) -> dict:
    """FWL from log Sw of the project zones that have a pressure FWL (zones not in the project noted)."""
    names = [z.name for z in project.zones]
    wanted = [z for z in analysis if z in names and analysis[z].fwl is not None]
    for z in analysis:
        if z not in names:
            notes.append(f"zone {z or '(none)'!r} of the pressure file is not a project zone"
                         + ("; give --zone" if z == "" else ""))
    if not wanted:
        return {}
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        log, more = fwl_from_project(project, zones=wanted, n_boot=n_boot)
    notes += more
    return log


def _zone_pressures_summary(name: str, zp, project: Project | None, log: dict, units: tuple,
                            notes: list[str]) -> dict:
    """One zone's block of ``pressures_summary.json`` in output units ``(lf, pf, lu, pu)``."""
    lf, pf, lu, pu = units
    d = {"points": len(zp.points),
         "lines": {f: _line(lf_, lf, pf, lu, pu) for f, lf_ in zp.lines.items()},
         "fwl": _level(zp.fwl, lf), "free_oil_level": _level(zp.free_oil_level, lf),
         "rejected_points_lines": sorted(int(zp.points.line[i]) for l_ in zp.lines.values()
                                         for i in l_.rejected),
         "unknown_points": [{"line": int(zp.points.line[i]), "nearest_line": f,
                             "residual": r / pf} for i, f, r in zp.unknown_nearest],
         "notes": list(zp.notes),
         # implausible densities from the lines (a unit or fluid-label mistake): shown loudly
         "implausible": list(zp.problems)}
    if project is not None:
        zs = next((z for z in project.zones if z.name == name), None)
        if zs is not None and zs.fwl is not None and zp.fwl is not None:
            d["project_fwl"] = zs.fwl / lf
            c = compare_levels(zp.fwl.depth, zp.fwl.low, zp.fwl.high, zs.fwl, None, None)
            d["versus_project_fwl"] = _cmp(c, lf)
    if name in log and zp.fwl is not None:
        r = log[name]
        c = compare_levels(zp.fwl.depth, zp.fwl.low, zp.fwl.high, r.best, r.low, r.high)
        d["log_fwl"] = {"best": r.best / lf, "interval": [r.low / lf, r.high / lf],
                        "confidence_level": r.level}
        d["versus_log_fwl"] = _cmp(c, lf)
        if not c["consistent"]:
            notes.append(f"zone {name}: FWL from pressures {zp.fwl.depth / lf:.2f} {lu} and "
                         f"from log Sw {r.best / lf:.2f} {lu} disagree beyond both intervals "
                         f"(gap {c['gap_m'] / lf:.2f} {lu})")
    return d


def _fill_zone(zone: str | None, points, project: Project | None, notes: list[str]) -> None:
    """Give points without a zone the zone of ``--zone`` (checked), or the project's zone
    when it has only one (noted)."""
    if zone is None and project is not None and len(project.zones) == 1 \
            and (points.zone == "").any():
        zone = project.zones[0].name     # the project's only zone: --zone is not needed
        notes.append(f"points without a zone are taken as the project's only zone {zone!r}")
    if zone is not None:
        _check_zone_option(zone, points, project)
        points.zone[points.zone == ""] = zone            # our own copy, read from the file


def _check_zone_option(zone: str, points, project: Project | None) -> None:
    """``--zone`` must name a project zone (with a project) and fill at least one point."""
    if project is not None and zone not in [z.name for z in project.zones]:
        raise SatHeightError(f"--zone {zone!r} is not a zone of the project", where="--zone",
                             hint="zones: " + ", ".join(z.name for z in project.zones))
    if not (points.zone == "").any():
        raise SatHeightError(f"--zone {zone!r} matches no point: every point of the file names "
                             "its zone", hint="leave --zone out")


def _line(lf_, lf, pf, lu, pu) -> dict:
    g = lf_.gradient * lf / pf
    return {"gradient": g,
            "gradient_se": None if lf_.gradient_se is None else lf_.gradient_se * lf / pf,
            "density_g_cm3": lf_.density / 1000.0,
            "density_se_g_cm3": None if lf_.density_se is None else lf_.density_se / 1000.0,
            "points_used": int(lf_.used.size), "points_rejected": int(lf_.rejected.size),
            "residual_sd": None if lf_.residual_sd is None else lf_.residual_sd / pf,
            "fixed_gradient": lf_.fixed}


def _level(lv, lf):
    if lv is None:
        return None
    return {"depth": lv.depth / lf, "se": None if lv.se is None else lv.se / lf,
            "interval": [None if lv.low is None else lv.low / lf,
                         None if lv.high is None else lv.high / lf],
            "confidence_level": lv.level, "lines": list(lv.lines)}


def _cmp(c, lf):
    return {"difference": c["difference_m"] / lf, "gap": c["gap_m"] / lf,
            "consistent": c["consistent"]}


# --------------------------------------------------------------------------------------
# the FWL search over a project's wells

def fwl_from_project(project, zones: Sequence[str] | None = None, wells: Sequence[str] | None = None,
                     *, shale_curve: str | None = None, max_shale: float | None = None,
                     exclude: Sequence[tuple[str | None, float, float]] = (),
                     fit_parameters: dict[str, tuple[float, float]] | None = None,
                     bar: Progress | None = None,
                     **search_options) -> tuple[dict[str, FwlSearch], list[str]]:
    """FWL search of each zone of a project from its wells' log Sw.

    Parameters
    ----------
    project : satheight.project.types.Project or path
    zones : list of str, optional
        Zone names (default: every zone).
    wells : list of str, optional
        Well names to use (default: every well).
    shale_curve : str, optional
        Mnemonic of a shale indicator curve (file units) and ``max_shale`` its cutoff.
    exclude : sequence of (well or None, top, base)
        TVDSS intervals [m] left out (the user mask); ``None`` for every well.
    fit_parameters : dict, optional
        J-Sw parameter bounds for :func:`satheight.fwljoint.fit_fwl_with_parameters`.
    bar : Progress, optional
        Advanced by one step per well read and per zone searched.
    **search_options
        Passed to :func:`satheight.fwlsearch.search_fwl` (window, step, misfit, delta,
        n_boot, seed...).

    Returns
    -------
    (dict[str, FwlSearch], list[str])
        Results by zone and notes (wells skipped and why).
    """
    if not isinstance(project, Project):
        project = open_project(project)
    names = [z.name for z in project.zones]
    zones = list(zones) if zones else names
    for z in zones:
        if z not in names:
            raise SatHeightError(f"zone {z!r} is not in the project",
                                 where=str(project.path), hint="zones: " + ", ".join(names))
    notes: list[str] = []
    bar = bar or Progress(0)
    computed, all_names = _wells_with_log_sw(project, wells, notes, bar)
    for w, _, _ in exclude:
        if w is not None and w not in all_names:
            raise SatHeightError(f"--exclude names well {w!r}, which is not a well of the project",
                                 hint="wells: " + ", ".join(all_names))
    out = {}
    for zname in zones:
        bar.step(f"zone {zname}")
        samples = [_well_zone_samples(project, res, zname, exclude, shale_curve, max_shale)
                   for res in computed]
        samples = [s for s in samples if s is not None]
        if not samples:
            notes.append(f"zone {zname}: no well crosses it")
            continue
        result = search_fwl(samples, **search_options)
        if fit_parameters:
            lo, hi = result.candidates[0], result.candidates[-1]
            result.parameters = fit_fwl_with_parameters(
                samples, fit_parameters, fwl_bounds=(lo, hi), fwl_start=result.best,
                misfit=result.misfit, delta=result.delta)
        out[zname] = result
    return out, notes


def _wells_with_log_sw(project: Project, wells: Sequence[str] | None, notes: list[str],
                       bar: Progress) -> tuple[list[WellResult], list[str]]:
    """The computed wells (of ``wells``, if given) that have log Sw, the others noted; and
    the names of every well of the project.

    Raises
    ------
    SatHeightError
        A name of ``wells`` (``--wells``) matches no well of the project.
    """
    computed, all_names = [], []
    for spec in project.wells:
        bar.step(f"reading {spec.name or spec.las.stem}")
        if wells and spec.name is not None and spec.name not in wells:
            all_names.append(spec.name)
            continue
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            res, _ = compute_well(project, spec, need_fwl=False)
        all_names.append(res.well.name)
        if wells and res.well.name not in wells:
            continue
        if res.sw_log is None:
            notes.append(f"{res.well.name}: no log Sw (no Sw curve and no Archie inputs): skipped")
            continue
        computed.append(res)
    unknown = sorted(set(wells or ()) - set(all_names))
    if unknown:
        raise SatHeightError(f"--wells {' '.join(map(repr, unknown))} match(es) no well of the "
                             "project", where=str(project.path),
                             hint="wells: " + ", ".join(all_names))
    return computed, all_names


def _well_zone_samples(project: Project, res: WellResult, zname: str, exclude, shale_curve,
                       max_shale):
    """One well's samples of zone ``zname`` for the search, or None if the well misses it."""
    idx = [i for i, zn in enumerate(res.zones) if zn.name == zname]
    if not idx:
        return None
    zn = res.zones[idx[0]]
    mask = np.ones(res.tvdss.size, bool)
    for w, top, base in exclude:
        if w is None or w == res.well.name:
            mask &= ~((res.tvdss >= top) & (res.tvdss <= base))
    shale = None
    if shale_curve:
        key = find_curve(res.well, shale_curve)
        if key is None:
            raise SatHeightError(f"shale curve {shale_curve!r} is not in well "
                                 f"{res.well.name}", where=str(res.well.source),
                                 hint="name a curve every well has, e.g. GR")
        shale = res.well.curves[key].data
    # unclipped Archie Sw: clipping at 1 biases the misfit in and near the water leg
    sw = res.sw_log if res.sw_log_unclipped is None else res.sw_log_unclipped
    return zone_samples(res.well.name, res.tvdss, res.phi, res.k, sw, zn,
                        min_porosity=project.comparison.min_porosity,
                        min_permeability=project.comparison.min_permeability,
                        shale=shale, max_shale=max_shale, mask=mask)


# --------------------------------------------------------------------------------------
# option texts of the command line

def parse_exclude(items: Sequence[str]) -> list[tuple[str | None, float, float]]:
    """``--exclude [WELL:]TOP:BASE`` texts -> (well or None, top, base) in the project's length unit."""
    out = []
    for it in items:
        parts = it.split(":")
        try:
            if len(parts) == 2:
                out.append((None, float(parts[0]), float(parts[1])))
            elif len(parts) == 3:
                out.append((parts[0], float(parts[1]), float(parts[2])))
            else:
                raise ValueError
        except ValueError:
            raise SatHeightError(f"--exclude {it!r} is not [WELL:]TOP:BASE",
                                 hint="e.g. --exclude VANTREL-2:2060:2062") from None
    return out


def parse_fit_bounds(items: Sequence[str]) -> dict[str, tuple[float, float]]:
    """``--fit PARAM:LOW:HIGH`` texts -> {parameter: (low, high)}."""
    out = {}
    for it in items:
        parts = it.split(":")
        try:
            name, lo, hi = parts[0], float(parts[1]), float(parts[2])
        except (ValueError, IndexError):
            raise SatHeightError(f"--fit {it!r} is not PARAM:LOW:HIGH",
                                 hint="e.g. --fit swirr:0:0.3") from None
        out[name] = (lo, hi)
    return out
