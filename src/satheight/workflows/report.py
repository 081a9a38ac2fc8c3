"""HTML report of a project run: one self-contained page that can be mailed or printed.

The page is built from a jinja2 template with autoescaping, so every text that
comes from an input file (well, zone and file names, messages) is escaped and
nothing from an input ever becomes markup. Every figure is embedded as a
base64 data URI: the page needs no file beside it. It carries the run date and
tool version, the inputs with their SHA-256 checksums, the project parameters in
the project's units, one table per zone (model, FWL and its source, SHM versus log
Sw statistics, hydrocarbon pore thickness from SHM and from logs), the plots, the
notes and warnings, and the cautions.

PDF: the page has a print style sheet (A4, figures kept whole); a browser's Print,
then "Save as PDF", gives the PDF. No PDF is written by the tool itself: the
pure-Python HTML-to-PDF libraries support only part of CSS and would need a
second layout, and the well-kept full renderers need system libraries or a browser.
"""

from __future__ import annotations

import base64
import functools
import datetime as _dt
import hashlib
import json
from pathlib import Path


from .. import __version__
from .. import units as U
from ..io.atomic import atomic_write_text
from ..project.types import Project

#: File name of the report in the output folder.
REPORT_NAME = "report.html"

#: Cautions printed on every report.
CAUTIONS = (
    "Results are estimates for review by a qualified professional.",
    "Local regulations and reserves-reporting rules govern their use.",
    "The saturation-height model is only as good as its free-water levels, fluid properties and "
    "capillary-pressure data: check each against the sources listed in this report.",
)

#: How to make a PDF of the page (said on the page and in the README).
PRINT_HINT = ("To print or save as PDF: open this file in a web browser, choose Print "
              "(Ctrl+P, or Cmd+P on a Mac) and pick \"Save as PDF\" as the printer. The page is "
              "laid out for A4 paper; figures are not split across pages.")

#: Readable words for where the log Sw came from (the run summary keeps short codes).
_SW_SOURCES = {"archie": "Archie equation from the resistivity curve",
               "simandoux": "Simandoux equation from the resistivity and shale-volume curves",
               "indonesia": "Indonesia equation from the resistivity and shale-volume curves",
               "none": "none (no Sw curve and no resistivity with Rw)"}



def sw_source_text(code: str | None) -> str:
    """Readable description of a log-Sw source code (``"curve:SW"`` -> the curve's name)."""
    if not code:
        return ""
    if code.startswith("curve:"):
        return f"Sw curve {code[len('curve:'):]} of the LAS file"
    return _SW_SOURCES.get(code, code)


def _num(value, decimals: int = 3, sign: bool = False) -> str:
    """A number as the page shows it (empty for None or not a number)."""
    if value is None or isinstance(value, bool):
        return ""
    try:
        v = float(value)
    except (TypeError, ValueError):
        return str(value)
    if v != v:  # NaN
        return ""
    return format(v, f"{'+' if sign else ''}.{decimals}f")


def _sig(value) -> str:
    """A parameter value with 4 significant digits."""
    try:
        return format(float(value), ".4g")
    except (TypeError, ValueError):
        return str(value)


@functools.cache
def _env():
    """The jinja2 environment of the report page (jinja2 imported on first use: ~0.1 s)."""
    import jinja2

    env = jinja2.Environment(loader=jinja2.PackageLoader("satheight", "templates"),
                             autoescape=True, undefined=jinja2.StrictUndefined,
                             trim_blocks=True, lstrip_blocks=True)
    env.filters["num"] = _num
    env.filters["sig"] = _sig
    return env


# --------------------------------------------------------------------------------------
# inputs and their checksums

def file_sha256(path: Path) -> str | None:
    """SHA-256 of a file's bytes, or None if it cannot be read."""
    h = hashlib.sha256()
    try:
        with open(path, "rb") as fh:
            for block in iter(lambda: fh.read(1 << 20), b""):
                h.update(block)
    except OSError:
        return None
    return h.hexdigest()


def _model_core_files(model_file: Path) -> list[dict]:
    """Core-data files named in a model file's provenance, with the checksums it recorded."""
    try:
        data = json.loads(Path(model_file).read_text(encoding="utf-8"))
        files = data["provenance"]["files"]
    except (OSError, ValueError, KeyError, TypeError):
        return []
    if not isinstance(files, dict):
        return []
    return [{"kind": "core data (recorded in the model file)",
             "path": str(Path(model_file).parent / str(name)), "sha256": str(sha)}
            for name, sha in files.items()]


def input_files(project: Project) -> list[dict]:
    """Every file a run of ``project`` reads, once each, with its SHA-256 checksum.

    Kinds: project file, LAS, survey, tops, core data and pressures (``[project]
    core_files``, ``pressure_file``), model file, and the core-data files a model file
    was fitted to (their checksums as the model file recorded them).
    """
    rows: list[dict] = []
    seen: set[tuple[str, str]] = set()

    def add(kind: str, path) -> None:
        p = Path(path).resolve()
        if (kind, str(p)) not in seen:
            seen.add((kind, str(p)))
            rows.append({"kind": kind, "path": str(p), "sha256": file_sha256(p)})

    add("project file", project.path)
    for spec in project.wells:
        add("LAS", spec.las)
        if spec.survey is not None:
            add("survey", spec.survey)
    if project.tops_file is not None:
        add("tops", project.tops_file)
    measured = project.measured
    for path in () if measured is None else measured.core_files:
        add("core data", path)
        seen.add(("core", str(Path(path).resolve())))     # listed once, with today's checksum
    if measured is not None and measured.pressure_file is not None:
        add("pressures", measured.pressure_file)
    models = []
    for z in project.zones:
        if z.function.file is not None and Path(z.function.file).resolve() not in models:
            models.append(Path(z.function.file).resolve())
            add("model file", z.function.file)
    for m in models:
        for row in _model_core_files(m):
            if ("core", row["path"]) not in seen:
                seen.add(("core", row["path"]))
                rows.append(row)
    return rows


def _inputs_rows(summary: dict, project: Project | None) -> list[dict]:
    """Input rows of the page: the summary's list, else from the project, else the LAS record."""
    rec = summary.get("inputs") or {}
    if isinstance(rec.get("files"), list):
        return rec["files"]
    if project is not None:
        return input_files(project)
    rows = []
    if rec.get("project_file"):
        rows.append({"kind": "project file", **rec["project_file"]})
    rows += [{"kind": "LAS", "path": w.get("las"), "sha256": w.get("sha256")}
             for w in rec.get("wells", [])]
    return rows


# --------------------------------------------------------------------------------------
# project parameters in the project's units

def _q(value, kind: str, system: str, decimals: int | None = None) -> str:
    """An SI value shown in the unit system's unit of ``kind`` ("2105.00 m")."""
    if value is None:
        return ""
    unit = U.UNIT_SYSTEMS[system][kind]
    v = float(U.from_si(value, unit, kind))
    text = _sig(v) if decimals is None else format(v, f".{decimals}f")
    return f"{text} {unit}"


def _zone_parameters(z, system: str) -> list[tuple[str, str]]:
    f = z.function
    rows = [("Top TVDSS", _q(z.top, "length", system, 2) if z.top is not None else "per well"),
            ("Base TVDSS", _q(z.base, "length", system, 2) if z.base is not None else "per well"),
            ("FWL TVDSS", _q(z.fwl, "length", system, 2)),
            *([("FWL plane", f"through the FWL at east {_q(z.fwl_plane[0], 'length', system, 2)}, "
                             f"north {_q(z.fwl_plane[1], 'length', system, 2)}; deepening "
                             f"{_sig(z.fwl_plane[2])} per unit east, {_sig(z.fwl_plane[3])} per "
                             "unit north; evaluated at each well head")] if z.fwl_plane else []),
            ("Hydrocarbon", z.hydrocarbon),
            ("Water density", _q(z.water_density, "density", system)),
            ("Hydrocarbon density", _q(z.hydrocarbon_density, "density", system)),
            ("σ·cosθ (reservoir)", _q(z.sigma_cos_theta, "tension", system))]
    if z.gas_oil_level is not None:
        rows += [("Gas-oil level TVDSS", _q(z.gas_oil_level, "length", system, 2)),
                 ("Gas density", _q(z.gas_density, "density", system)),
                 ("Gas σ·cosθ", _q(z.gas_sigma_cos_theta, "tension", system))]
    rows.append(("J–Sw function", f.family + ": " + ", ".join(
        f"{k} = {_sig(v)}" for k, v in f.params.items())))
    if f.j_range is not None:
        rows.append(("J range of calibration", f"{_sig(f.j_range[0])} to {_sig(f.j_range[1])}"))
    if f.file is not None:
        rows.append(("Model file", Path(f.file).name
                     + (f", rock type {f.rock_type}" if f.rock_type else "")))
    if f.by_rock_type:
        rows.append(("Rock types", ", ".join(str(k) for k in f.by_rock_type)))
    return rows


def project_parameters(project: Project) -> dict:
    """The project's parameters as (label, text) rows, values in the project's units."""
    system = project.unit_system
    ls, cmp_ = project.log_sw, project.comparison
    general = [("Project file", Path(project.path).name), ("Unit system", system),
               ("Log Sw method", ls.method),
               ("Archie a, m, n", f"{_sig(ls.a)}, {_sig(ls.m)}, {_sig(ls.n)}"),
               ("Rw at formation temperature", "" if ls.rw is None else f"{_sig(ls.rw)} ohm.m"),
               *([("Shale resistivity Rsh", f"{_sig(ls.rsh)} ohm.m")] if ls.rsh is not None else []),
               *([("Net-reservoir shale-volume cutoff", f"{_sig(cmp_.max_shale)} (fraction)")]
                 if cmp_.max_shale is not None else []),
               ("Net-reservoir porosity cutoff", f"{_sig(cmp_.min_porosity)} (fraction)"),
               ("Net-reservoir permeability cutoff",
                f"{_sig(U.from_si(cmp_.min_permeability, 'mD', 'permeability'))} mD")]
    wells = []
    for spec in project.wells:
        wells.append({"name": spec.name or spec.las.stem, "las": spec.las.name,
                      "datum": ("from the LAS header" if spec.datum_elevation is None
                                else _q(spec.datum_elevation, "length", system, 2)),
                      "survey": spec.survey.name if spec.survey is not None else "vertical",
                      "curves": ", ".join(f"{r} = {m}" for r, m in spec.curves.items())
                      + "".join(f"; FWL {zn} = {_q(v, 'length', system, 2)}"
                                for zn, v in spec.fwl.items())})
    zones = [{"name": z.name, "rows": _zone_parameters(z, system)} for z in project.zones]
    return {"general": general, "wells": wells, "zones": zones}


# --------------------------------------------------------------------------------------
# figures and the page

def _png_data_uri(path: Path) -> str | None:
    """A PNG file as a ``data:`` URI, or None if it cannot be read or is no PNG."""
    try:
        data = Path(path).read_bytes()
    except OSError:
        return None
    if not data.startswith(b"\x89PNG\r\n\x1a\n"):
        return None
    return "data:image/png;base64," + base64.b64encode(data).decode("ascii")


def _caption(well: str, name: str, band: bool = False) -> str:
    """Caption of a well's figure from its file name ("W_tracks.png" -> "Track plot of W");
    ``band``: the well has a Monte Carlo, whose SW_P10-SW_P90 band the track plot shows."""
    stem = Path(name).stem
    if stem.endswith("_tracks"):
        return f"Track plot of {well}" + (
            "; grey band on the Sw track: SHM Sw from SW_P10 (low Sw) to SW_P90 (high Sw), "
            "P90 being the volume exceeded with 90 % probability" if band else "")
    if stem.endswith("_tornado"):
        return f"Tornado chart of {well}: HCPT swing per uncertain input"
    return f"{well}: {stem.replace('_', ' ')}"


def _figures(summary: dict, out_dir: Path | None) -> tuple[list[dict], dict[str, list[dict]]]:
    """Embedded figures: (field-level, per well); figures that cannot be read are left out."""
    def fig(name, caption):
        uri = _png_data_uri(out_dir / Path(name).name) if out_dir is not None else None
        return {"src": uri, "caption": caption, "file": Path(name).name} if uri else None

    field = [fig(n, "Field section, TVDSS") for n in [summary.get("field_section")] if n]
    field += [fig(n, Path(n).stem.replace("_", " ")) for n in summary.get("figures", [])]
    field += [fig(n, "Log Sw against height above the FWL and against J, every well, zone "
                  + Path(n).stem[len("crossplot_"):]) for n in summary.get("crossplots", [])]
    per_well = {}
    for w in summary.get("wells", []):
        band = bool((w.get("summary") or {}).get("uncertainty"))
        per_well[w.get("name")] = [f for f in (fig(n, _caption(w.get("name"), n, band))
                                               for n in w.get("files", [])
                                               if str(n).lower().endswith(".png")) if f]
    return [f for f in field if f], per_well


def _units(u: dict | None) -> dict:
    """Thickness and depth unit names of a summary (metres when it names none)."""
    u = u or {}
    thick = u.get("thickness") or u.get("depth") or "m"
    return {"thickness": thick, "depth": u.get("depth") or thick}


def _zone_tables(summary: dict) -> list[dict]:
    """One table per zone: a row per computed well that holds the zone."""
    zones: dict[str, dict] = {}
    for w in summary.get("wells", []):
        s = w.get("summary") or {}
        for zname, z in (s.get("zones") or {}).items():
            t = zones.setdefault(zname, {"name": zname, "rows": [], "models": [],
                                         "units": _units(s.get("units"))})
            model = z.get("function", "") + ": " + ", ".join(
                f"{k} = {_sig(v)}" for k, v in (z.get("parameters") or {}).items())
            if model not in t["models"]:
                t["models"].append(model)
            contact = z.get("contact") or {}
            t["rows"].append({**z, "well": w.get("name"), "fluid": z.get("hydrocarbon", ""),
                              "fwl": z.get("fwl_tvdss"),
                              "fwl_source": z.get("fwl_source") or "project file",
                              "contact": contact.get("contact_tvdss"),
                              "contact_kind": contact.get("contact_kind", "")})
    return list(zones.values())


def _monte_carlo(wells: list[dict]) -> list[dict]:
    """Per well with a Monte Carlo (``uncertainty`` in its summary): HCPT P90/P50/P10 rows."""
    out = []
    for w in wells:
        mc = (w.get("summary") or {}).get("uncertainty")
        if not mc:
            continue
        hc = mc.get("hcpt") or {}
        rows = [{"what": f"zone {z}", "phase": b.get("phase", ""), **b}
                for z, b in (hc.get("zones") or {}).items()]
        rows += [{"what": f"all {p} zones", "phase": p, **b}
                 for p, b in (hc.get("phases") or {}).items()]
        bars = (mc.get("tornado") or {}).get("bars") or []
        out.append({"well": w.get("name", ""), "rows": rows, "bars": bars,
                    "realisations": mc.get("realisations"), "seed": mc.get("seed"),
                    "unit": (mc.get("units") or {}).get("hcpt", ""),
                    "convention": mc.get("convention", "")})
    return out


def report_context(summary: dict, title: str, out_dir=None, project: Project | None = None,
                   now: _dt.datetime | None = None) -> dict:
    """Everything the template shows, as plain values (numbers still numbers)."""
    out_dir = Path(out_dir) if out_dir is not None else None
    wells = summary.get("wells", [])
    field_figs, well_figs = _figures(summary, out_dir)
    when = (now or _dt.datetime.now(_dt.timezone.utc)).strftime("%Y-%m-%d %H:%M UTC")
    units = _units(next(((w.get("summary") or {}).get("units") for w in wells
                         if w.get("summary")), None))
    return {
        "title": title, "date": when, "version": summary.get("program") or f"satheight {__version__}",
        "project_path": summary.get("project", ""), "cautions": CAUTIONS,
        "print_hint": PRINT_HINT, "units": units,
        "n_ok": sum(1 for w in wells if w.get("ok")), "n_wells": len(wells),
        "wells": [{**w, "name": w.get("name", ""), "error": w.get("error") or "",
                   "warnings": w.get("warnings") or [], "ok": bool(w.get("ok")),
                   "sw_source": sw_source_text((w.get("summary") or {}).get("sw_log_source")),
                   "whole": (w.get("summary") or {}).get("whole_well") or {},
                   "figures": well_figs.get(w.get("name"), [])} for w in wells],
        "inputs": _inputs_rows(summary, project),
        "parameters": project_parameters(project) if project is not None else None,
        "zones": _zone_tables(summary), "field_figures": field_figs,
        "notes": list(summary.get("notes", [])),
        "monte_carlo": _monte_carlo(wells),
    }


def render(run_summary: dict, title: str, out_dir=None, project: Project | None = None,
           now: _dt.datetime | None = None) -> str:
    """The report page as text, from the content of ``run_summary.json``.

    Parameters
    ----------
    run_summary : dict
        What the run writes to ``run_summary.json``.
    title : str
        Page title (the project name; escaped by the template).
    out_dir : path, optional
        Folder of the run's figures (PNG files named in the summary), embedded in the page.
    project : Project, optional
        The project, for its parameters (in its own units) and the input files.
    """
    return _env().get_template("report.html.j2").render(
        **report_context(run_summary, title, out_dir, project, now))


def write_report(run_summary: dict, out_dir, title: str, project: Project | None = None) -> Path:
    """Write ``report.html`` into ``out_dir`` atomically; return its path."""
    path = Path(out_dir) / REPORT_NAME
    atomic_write_text(path, render(run_summary, title, out_dir, project))
    return path
