"""Run the contact jobs and write their files: FWL from logs, FWL from pressures.

The command line calls :func:`run_fwl` and :func:`run_pressures`; they return
plain dicts (what was found, which files were written) and never print.
"""

from __future__ import annotations

import json
import warnings
from pathlib import Path

from . import units as U
from .contacts import fwl_from_project
from .errors import SatHeightError
from .io.atomic import atomic_write_text
from .io.pressures import read_pressure_points, resolve_tvdss
from .pressures import DEFAULT_QUALITIES, analyse_pressures, compare_levels
from .project import load_project
from ..plots import misfit_plot, pressure_plot
from .figures import save_figure

__all__ = ["run_fwl", "run_pressures"]


def _safe(name: str) -> str:
    keep = "".join(ch if (ch.isalnum() or ch in "-_.") else "_" for ch in name.strip())
    return keep.strip(".") or "zone"


def _out_dir(out) -> Path:
    p = Path(out)
    if p.exists() and not p.is_dir():
        raise SatHeightError("output path exists and is not a folder", where=str(p),
                             hint="choose another --out")
    p.mkdir(parents=True, exist_ok=True)
    return p


def run_fwl(project_path, out_dir, zones=None, wells=None, plot: bool = True, **options) -> dict:
    """FWL search per zone from log Sw; writes ``fwl_<zone>.json`` and ``fwl_<zone>_misfit.png``.

    Parameters
    ----------
    project_path : str or pathlib.Path
    out_dir : str or pathlib.Path
        Created if missing.
    zones, wells : list of str, optional
        Restrict the zones searched and the wells used.
    plot : bool
        Write the misfit plots.
    **options
        Passed to :func:`satheight.contacts.fwl_from_project` (window, step,
        misfit, delta, n_boot, seed, shale_curve, max_shale, exclude, fit_parameters...).

    Returns
    -------
    dict
        ``{"project", "units", "zones": {name: summary}, "notes", "files"}``.
    """
    project = load_project(project_path)
    out = _out_dir(out_dir)
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
        results, notes = fwl_from_project(project, zones=zones, wells=wells, **options)
    notes += [str(w.message) for w in caught]
    files = []
    summary = {}
    for name, res in results.items():
        d = res.to_dict(lf, lu)
        summary[name] = d
        path = out / f"fwl_{_safe(name)}.json"
        atomic_write_text(path, json.dumps(d, indent=2, allow_nan=False) + "\n")
        files.append(path)
        if plot:
            files += save_figure(misfit_plot(res, units=project.unit_system),
                                 out / f"fwl_{_safe(name)}_misfit.png")
    return {"project": str(project.path), "units": lu, "zones": summary, "notes": notes,
            "files": files, "results": results}


def run_pressures(pressure_file, out_dir, project_path=None, zone: str | None = None,
                  units: str | None = None, qualities=DEFAULT_QUALITIES,
                  with_logs: bool = True, plot: bool = True, n_boot: int = 200) -> dict:
    """Gradients, FWL and free-oil level from a pressure file; compare with the project.

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
        Project zone the points belong to when the file has no zone column.
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

    Returns
    -------
    dict
        ``{"file", "units", "zones": {name: summary}, "files", "notes"}``.
    """
    points = read_pressure_points(pressure_file)
    project = load_project(project_path) if project_path is not None else None
    system = units or (project.unit_system if project else "metric")
    if system not in U.UNIT_SYSTEMS:
        raise SatHeightError(f"unknown unit system {system!r}", hint="use metric or field")
    lu, pu = U.UNIT_SYSTEMS[system]["length"], U.UNIT_SYSTEMS[system]["pressure"]
    lf, pf = U.factor(lu, "length"), U.factor(pu, "pressure")
    notes: list[str] = []
    if zone is not None:
        blank = points.zone == ""
        points.zone[blank] = zone            # our own copy, read from the file
    if project is not None and (points.tvdss != points.tvdss).any():
        points = resolve_tvdss(points, _datums(project, set(points.well)))
    elif (points.tvdss != points.tvdss).any():
        points = resolve_tvdss(points, {})
    analysis = analyse_pressures(points, qualities=qualities)
    out = _out_dir(out_dir)

    log = {}
    if project is not None and with_logs:
        names = [z.name for z in project.zones]
        wanted = [z for z in analysis if z in names and analysis[z].fwl is not None]
        for z in analysis:
            if z not in names:
                notes.append(f"zone {z or '(none)'!r} of the pressure file is not a project zone"
                             + ("; give --zone" if z == "" else ""))
        if wanted:
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                log, more = fwl_from_project(project, zones=wanted, n_boot=n_boot)
            notes += more
    files = []
    summary = {}
    for name, zp in analysis.items():
        d = {"points": len(zp.points),
             "lines": {f: _line(lf_, lf, pf, lu, pu) for f, lf_ in zp.lines.items()},
             "fwl": _level(zp.fwl, lf), "free_oil_level": _level(zp.free_oil_level, lf),
             "rejected_points_lines": sorted(int(zp.points.line[i]) for l_ in zp.lines.values()
                                             for i in l_.rejected),
             "unknown_points": [{"line": int(zp.points.line[i]), "nearest_line": f,
                                 "residual": r / pf} for i, f, r in zp.unknown_nearest],
             "notes": list(zp.notes)}
        if project is not None:
            zs = next((z for z in project.zones if z.name == name), None)
            if zs is not None and zp.fwl is not None:
                d["project_fwl"] = zs.fwl / lf
                c = compare_levels(zp.fwl.depth, zp.fwl.low, zp.fwl.high, zs.fwl, None, None)
                d["versus_project_fwl"] = _cmp(c, lf)
        if name in log and zp.fwl is not None:
            r = log[name]
            c = compare_levels(zp.fwl.depth, zp.fwl.low, zp.fwl.high, r.best, r.low, r.high)
            d["log_fwl"] = {"best": r.best / lf, "interval": [r.low / lf, r.high / lf]}
            d["versus_log_fwl"] = _cmp(c, lf)
            if not c["consistent"]:
                notes.append(f"zone {name}: FWL from pressures {zp.fwl.depth / lf:.2f} {lu} and "
                             f"from log Sw {r.best / lf:.2f} {lu} disagree beyond both intervals "
                             f"(gap {c['gap_m'] / lf:.2f} {lu})")
        summary[name] = d
        if plot:
            lg = (log[name].best, log[name].low, log[name].high) if name in log else None
            files += save_figure(pressure_plot(zp, units=system, log_fwl=lg),
                                 out / f"pressures_{_safe(name or 'all')}.png")
    doc = {"file": str(points.source), "units": {"depth": lu, "pressure": pu,
                                                  "density": "g/cm3", "gradient": f"{pu}/{lu}"},
           "qualities_fitted": list(qualities), "zones": summary, "notes": notes}
    path = out / "pressures_summary.json"
    atomic_write_text(path, json.dumps(doc, indent=2, allow_nan=False) + "\n")
    files.insert(0, path)
    return {"file": str(points.source), "units": doc["units"], "zones": summary,
            "files": files, "notes": notes, "analysis": analysis}


def _datums(project, wells: set) -> dict:
    """Per well of the points: its datum elevation [m], or MD -> TVDSS [m] for a surveyed well."""
    from .io.las import read_las
    from .pipeline import datum_elevation, well_path

    out = {}
    for spec in project.wells:
        if spec.name is not None and spec.name not in wells:
            continue
        well = read_las(spec.las)
        name = spec.name or well.name
        if name in wells:
            elev = datum_elevation(well, spec)
            md_to_tvdss = well_path(spec, well, elev)[3]
            out[name] = elev if md_to_tvdss is None else md_to_tvdss
    return out


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
            "lines": list(lv.lines)}


def _cmp(c, lf):
    return {"difference": c["difference_m"] / lf, "gap": c["gap_m"] / lf,
            "consistent": c["consistent"]}
