"""Run a project: for every well load, compute, compare and write the outputs.

This is the public entry point that the command line calls. It does I/O through
:mod:`satheight.io` and leaves the numbers to :mod:`satheight.engine`.
"""

from __future__ import annotations

import json
import math
import warnings
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from . import __version__
from . import units as U
from .compare import summarise
from .engine import ZoneModel, compute_shm
from .errors import ProjectFileError, SatHeightError
from .io.atomic import atomic_open, atomic_write_text
from .io.las import read_las, write_las
from .logsw import archie_sw
from .models import build_function
from .project import load_project
from .project_types import Project, WellSpec, ZoneSpec
from .results import FLAG_MEANINGS, WellResult
from .roles import detect_roles, require_role, role_values
from .well import Curve, HeaderItem, Well
from .. import plots
from ..plots.crossplot import crossplot_data
from .figures import save_crossplots, save_figure

#: ~Well mnemonics that may carry the elevation of the log depth reference above
#: the TVDSS datum, in order of preference: kelly bushing, drill floor, depth
#: reference, permanent-datum elevation, ground level (LAS 2.0 practice).
DATUM_MNEMONICS = ("EKB", "EDF", "EREF", "ELEV", "KB", "EGL")

#: Output curve mnemonics and descriptions.
NEW_CURVES = {
    "TVDSS": "True vertical depth below datum, positive down",
    "HAFWL": "Height above free-water level",
    "PC_RES": "Reservoir capillary pressure from height",
    "J": "Leverett J-function",
    "SW_SHM": "Water saturation from the saturation-height model",
    "SW_LOG": "Water saturation from resistivity (Archie)",
    "SHM_FLAG": "Quality flag bits: " + "; ".join(f"{b}={t}" for b, t in FLAG_MEANINGS.items()),
    "ZONE_ID": "Zone number (1-based order of the project file), 0 outside zones",
    "ROCK_ID": "Rock type number within its zone (see Zn_RTk parameters), 0 none",
    "TVD": "True vertical depth below the log depth reference, positive down",
    "NORTH": "Offset north of the well head (survey azimuth reference)",
    "EAST": "Offset east of the well head (survey azimuth reference)",
}


#: Caution carried by every summary file.
CAUTION = ("Results are estimates for review by a qualified professional; local regulations "
           "and reserves-reporting rules govern their use.")

#: Decimals written for each new curve in the output LAS.
OUTPUT_DECIMALS = {"ROCK_ID": 0, "TVDSS": 4, "HAFWL": 4, "PC_RES": 4, "J": 6, "SW_SHM": 5, "SW_LOG": 5,
                   "SHM_FLAG": 0, "ZONE_ID": 0, "TVD": 4, "NORTH": 4, "EAST": 4}


@dataclass
class WellOutcome:
    """What happened to one well in a run."""

    name: str
    ok: bool
    files: list[Path] = field(default_factory=list)
    error: str | None = None
    warnings: list[str] = field(default_factory=list)
    result: WellResult | None = None
    #: The well's comparison summary (also in ``result.summary`` when the result is kept).
    summary: dict | None = None
    #: What the field section needs of a well computed in a worker process (see
    #: :func:`_section_view`); None when ``result`` is kept.
    section: object | None = None


@dataclass
class RunReport:
    """What a project run did: per-well outcomes and the summary file."""

    project: Project
    out_dir: Path
    wells: list[WellOutcome]
    summary_file: Path | None = None
    notes: list[str] = field(default_factory=list)
    section_file: Path | None = None

    @property
    def failed(self) -> list[WellOutcome]:
        return [w for w in self.wells if not w.ok]


# --------------------------------------------------------------------------------------
# per-well steps

def datum_elevation(well: Well, spec: WellSpec) -> float:
    """Elevation of the log depth reference above the TVDSS datum [m].

    The project file wins; otherwise the first of :data:`DATUM_MNEMONICS` in the
    LAS ``~Well`` section with a numeric value (unit from the item, or the depth
    unit of the file if blank).
    """
    if spec.datum_elevation is not None:
        return float(spec.datum_elevation)
    header = {k.upper(): v for k, v in well.well_header.items()}
    for mn in DATUM_MNEMONICS:
        item = header.get(mn)
        if item is None:
            continue
        try:
            value = float(item.value)
        except (TypeError, ValueError):
            continue
        if not math.isfinite(value):
            continue
        unit = item.unit or well.depth_unit
        try:
            return float(U.to_si(value, unit, "length"))
        except SatHeightError as exc:
            raise SatHeightError(f"datum elevation item {mn} has unit {item.unit!r}: {exc.what}",
                                 where=str(well.source),
                                 hint="give datum_elevation for this well in the project file") from None
    raise SatHeightError(
        "no datum elevation: the ~Well section has none of " + ", ".join(DATUM_MNEMONICS),
        where=str(well.source),
        hint='add datum_elevation = "<KB elevation> m" to this well in the project file')


def zones_for_well(project: Project, spec: WellSpec, md: np.ndarray, tvdss: np.ndarray,
                   md_to_tvdss=None) -> list[ZoneModel]:
    """Engine zones for one well: the well's own tops (MD, turned into TVDSS; or TVDSS
    from the tops file) or the field-wide window.

    ``md_to_tvdss``, if given, maps MD [m] to TVDSS [m] (positive down) along the
    well's trajectory and is used for MD tops instead of interpolating between samples.
    """
    out = []
    for zs in project.zones:
        if zs.name in getattr(spec, "tops_tvdss", {}):
            top, base = spec.tops_tvdss[zs.name]
        elif zs.name in spec.tops and md_to_tvdss is not None:
            top, base = (float(v) for v in md_to_tvdss(np.asarray(spec.tops[zs.name], dtype=float)))
        elif zs.name in spec.tops:
            top_md, base_md = spec.tops[zs.name]
            top, base = np.interp([top_md, base_md], md, tvdss, left=np.nan, right=np.nan)
            # tops outside the logged interval: extend linearly with the end offsets
            if np.isnan(top):
                top = top_md - (md[0] - tvdss[0])
            if np.isnan(base):
                base = base_md - (md[-1] - tvdss[-1])
        elif zs.top is not None and zs.base is not None:
            top, base = zs.top, zs.base
        else:
            continue
        out.append(_zone_model(zs, float(top), float(base), project.path))
    return out


def _zone_model(zs: ZoneSpec, top: float, base: float, path: Path) -> ZoneModel:
    fn = build_function(zs.function.family, zs.function.params, zs.function.j_range,
                        where=f"{path}, key zones[{zs.name}].function")
    rock_functions = classifier = None
    if zs.function.by_rock_type:  # per-depth rock typing from a model file
        rock_functions = {rt: build_function(f.family, f.params, f.j_range,
                                             where=f"{path}, key zones[{zs.name}].function")
                          for rt, f in zs.function.by_rock_type.items()}
        classifier = zs.function.rock_rule.classify
    return ZoneModel(name=zs.name, top=top, base=base, fwl=zs.fwl,
                     water_density=zs.water_density, hydrocarbon_density=zs.hydrocarbon_density,
                     hydrocarbon=zs.hydrocarbon, sigma_cos_theta=zs.sigma_cos_theta, function=fn,
                     rock_functions=rock_functions, rock_classifier=classifier,
                     gas_oil_level=zs.gas_oil_level, gas_density=zs.gas_density,
                     gas_sigma_cos_theta=zs.gas_sigma_cos_theta)


def log_saturation(project: Project, well: Well, roles: dict, phi: np.ndarray):
    """Log water saturation and where it came from: the well's Sw curve or Archie from Rt."""
    cfg = project.log_sw
    msgs: list[str] = []
    if cfg.method in ("curve", "auto") and roles.get("sw"):
        sw, w = role_values(well, "sw", roles["sw"])
        msgs += w
        return sw, f"curve:{roles['sw']}", msgs
    if cfg.method == "curve":
        require_role(well, "sw", None)
    if roles.get("resistivity") is None:
        if cfg.method == "archie":
            require_role(well, "resistivity", None)
        msgs.append("no Sw curve and no resistivity curve: no log Sw to compare with")
        return None, "none", msgs
    if cfg.rw is None:
        msgs.append("no Sw curve and no rw in [log_sw]: Archie Sw not computed")
        return None, "none", msgs
    rt, w = role_values(well, "resistivity", roles["resistivity"])
    msgs += w
    return archie_sw(rt, phi, cfg.rw, cfg.a, cfg.m, cfg.n), "archie", msgs


def compute_well(project: Project, spec: WellSpec) -> tuple[WellResult, list[str]]:
    """Load one well and compute everything (no files written)."""
    well = read_las(spec.las)
    if spec.name:
        well.name = spec.name
    else:
        spec = pending_tops(project, spec, well.name)
    msgs = list(well.warnings)
    roles = detect_roles(well, spec.curves)
    phi_mn = require_role(well, "porosity", roles.get("porosity"))
    k_mn = require_role(well, "permeability", roles.get("permeability"))
    phi, w1 = role_values(well, "porosity", phi_mn)
    k, w2 = role_values(well, "permeability", k_mn)
    msgs += w1 + w2
    rt = None
    if roles.get("resistivity"):
        rt, w3 = role_values(well, "resistivity", roles["resistivity"])
        msgs += w3
    elev = datum_elevation(well, spec)
    tvd, north, east, md_to_tvdss, w5 = well_path(spec, well, elev)
    msgs += w5
    tvdss = tvd - elev  # TVDSS = TVD - datum elevation, positive down
    clash = sorted({"TVD", "NORTH", "EAST"} & {k.upper() for k in well.curves})
    if clash:
        msgs.append("the LAS file already has curve(s) " + ", ".join(clash) + ": kept as read; "
                    "the computed ones are not written (TVDSS is)")
    zones = zones_for_well(project, spec, well.md, tvdss, md_to_tvdss)
    if not zones:
        msgs.append("no zone of the project lies in this well")
    shm = compute_shm(tvdss, phi, k, zones)
    sw_log, source, w4 = log_saturation(project, well, roles, phi)
    msgs += w4
    result = WellResult(well=well, tvdss=tvdss, zones=zones, shm=shm, phi=phi, k=k, rt=rt,
                        sw_log=sw_log, sw_log_source=source, roles=roles, datum_elevation=elev,
                        tvd=tvd, north=north, east=east, survey=getattr(spec, "survey", None))
    msgs += value_warnings(result)
    return result, msgs


def pending_tops(project: Project, spec: WellSpec, well_name: str) -> WellSpec:
    """``spec`` with the tops-file rows of ``well_name`` (the LAS file's well name) added.

    Raises
    ------
    ProjectFileError
        If a zone of those rows is also given under ``[wells.tops]`` of this well.
    """
    rows = getattr(project, "tops_pending", {}).get(well_name)
    if not rows:
        return spec
    md_tops, tv_tops = dict(spec.tops), dict(spec.tops_tvdss)
    for r in rows:
        if r.zone in md_tops or r.zone in tv_tops:
            raise ProjectFileError(f"zone {r.zone!r} of well {well_name!r} is given both under "
                                   f"[wells.tops] and in the tops file ({project.tops_file}, line {r.line})",
                                   where=f"{project.path}, key wells[{spec.las.name}].tops.{r.zone}",
                                   hint="give each well's zone window in one place only")
        (md_tops if r.depth_type == "MD" else tv_tops)[r.zone] = (r.top, r.base)
    import dataclasses

    return dataclasses.replace(spec, tops=md_tops, tops_tvdss=tv_tops)


def well_path(spec: WellSpec, well: Well, elev: float):
    """Trajectory of one well at its log samples.

    Returns
    -------
    tvd, north, east : numpy.ndarray
        TVD below the log depth reference [m] (positive down) and offsets from the
        well head [m] at every sample: minimum curvature through the survey if the
        well has one, else a vertical well (TVD = MD, no offset).
    md_to_tvdss : callable or None
        MD [m] -> TVDSS [m] along the trajectory (None for a vertical well).
    warnings : list[str]
        Survey notes (added tie-in station, samples below the last station).
    """
    from .trajectory import vertical

    survey_path = getattr(spec, "survey", None)
    if survey_path is None:
        tvd, north, east = vertical(well.md)
        return tvd, north, east, None, []
    from .io.survey import read_survey, survey_trajectory

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        survey = read_survey(survey_path, getattr(spec, "survey_format", None))
        md0 = float(np.nanmin(well.md)) if well.md.size else None
        traj = survey_trajectory(survey, md0, str(well.source))
        tvd, north, east = traj.at(well.md)
    msgs = list(survey.warnings) + [str(c.message) for c in caught]

    def md_to_tvdss(md):
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            return traj.at(md)[0] - elev

    return tvd, north, east, md_to_tvdss, msgs


# --------------------------------------------------------------------------------------
# outputs

def _output_units(project: Project, well: Well) -> dict[str, str]:
    sysu = U.UNIT_SYSTEMS[project.unit_system]
    return {"depth": well.depth_unit, "pressure": sysu["pressure"],
            "length": sysu["length"], "density": sysu["density"], "tension": sysu["tension"]}


def output_curves(result: WellResult, project: Project) -> list[Curve]:
    """The new curves written beside the input curves, in output units."""
    u = _output_units(project, result.well)
    shm = result.shm
    dz = u["depth"]
    curves = [
        Curve("TVDSS", dz, NEW_CURVES["TVDSS"], U.from_si(result.tvdss, dz, "length")),
    ]
    if result.tvd is not None:
        # an input curve of the same name (a TVD curve in the LAS file) is kept and ours left out
        have = {k.upper() for k in result.well.curves}
        curves += [Curve(mn, dz, NEW_CURVES[mn], U.from_si(v, dz, "length"))
                   for mn, v in (("TVD", result.tvd), ("NORTH", result.north), ("EAST", result.east))
                   if mn not in have]
    curves += [
        Curve("HAFWL", dz, NEW_CURVES["HAFWL"], U.from_si(shm.hafwl, dz, "length")),
        Curve("PC_RES", u["pressure"], NEW_CURVES["PC_RES"], U.from_si(shm.pc, u["pressure"], "pressure")),
        Curve("J", "", NEW_CURVES["J"], shm.j.copy()),
        Curve("SW_SHM", "v/v", NEW_CURVES["SW_SHM"], shm.sw.copy()),
    ]
    if result.sw_log_source == "archie":
        curves.append(Curve("SW_LOG", "v/v", NEW_CURVES["SW_LOG"], result.sw_log.copy()))
    curves.append(Curve("SHM_FLAG", "", NEW_CURVES["SHM_FLAG"], shm.flag.astype(float)))
    curves.append(Curve("ZONE_ID", "", NEW_CURVES["ZONE_ID"], (shm.zone + 1).astype(float)))
    rock = rock_type_ids(result)
    if rock is not None:
        curves.append(Curve("ROCK_ID", "", NEW_CURVES["ROCK_ID"], rock))
    return curves


def rock_type_ids(result: WellResult) -> np.ndarray | None:
    """Per sample, the 1-based number of its rock type in its zone's rock-type table.

    Only for wells with a zone whose J-Sw function is chosen per depth by rock type
    (numbers as listed by the ``Zn_RTk`` items of ~Parameter); 0 where a sample has
    no rock type with a function (or lies in a zone without per-depth rock typing),
    NaN outside every zone. None when no zone of the well uses rock typing.
    """
    zones = [(i, zn) for i, zn in enumerate(result.zones) if zn.rock_functions]
    if not zones:
        return None
    ids = np.where(result.shm.zone >= 0, 0.0, np.nan)
    for i, zn in zones:  # one pass per zone and rock type, not per sample
        m = result.shm.zone == i
        labels = np.asarray(zn.rock_classifier(result.phi[m], result.k[m]), dtype=object)
        out = np.zeros(labels.shape)
        for number, name in enumerate(zn.rock_functions, start=1):
            out[labels == name] = number
        ids[m] = out
    return ids


def run_parameters(result: WellResult, project: Project) -> list[HeaderItem]:
    """~Parameter items recording how the new curves were made."""
    u = _output_units(project, result.well)
    items = [HeaderItem("SHM_VERSION", "", f"satheight {__version__}", "Program that wrote the new curves"),
             HeaderItem("SHM_PROJECT", "", project.path.name, "Project file"),
             HeaderItem("SHM_DATUM", u["depth"], round(U.from_si(result.datum_elevation, u["depth"], "length"), 4),
                        "Depth reference elevation above TVDSS datum"),
             HeaderItem("SHM_SWSRC", "", result.sw_log_source, "Source of log Sw")]
    if getattr(result, "survey", None) is not None:
        items.append(HeaderItem("SHM_SURVEY", "", Path(result.survey).name,
                                "Deviation survey (minimum curvature)"))
    if result.sw_log_source == "archie":
        c = project.log_sw
        items += [HeaderItem("ARCHIE_A", "", c.a, "Archie tortuosity factor a"),
                  HeaderItem("ARCHIE_M", "", c.m, "Archie cementation exponent m"),
                  HeaderItem("ARCHIE_N", "", c.n, "Archie saturation exponent n"),
                  HeaderItem("RW", "ohm.m", c.rw, "Formation-water resistivity at formation temperature")]
    for i, zn in enumerate(result.zones, start=1):
        p = f"Z{i}_"
        items += [
            HeaderItem(p + "NAME", "", zn.name, f"Zone {i} name"),
            HeaderItem(p + "TOP", u["depth"], round(U.from_si(zn.top, u["depth"], "length"), 4), f"Zone {i} top TVDSS"),
            HeaderItem(p + "BASE", u["depth"], round(U.from_si(zn.base, u["depth"], "length"), 4), f"Zone {i} base TVDSS"),
            HeaderItem(p + "FWL", u["depth"], round(U.from_si(zn.fwl, u["depth"], "length"), 4), f"Zone {i} free-water level TVDSS"),
            HeaderItem(p + "RHOW", u["density"], round(U.from_si(zn.water_density, u["density"], "density"), 6), f"Zone {i} water density"),
            HeaderItem(p + "RHOH", u["density"], round(U.from_si(zn.hydrocarbon_density, u["density"], "density"), 6), f"Zone {i} {zn.hydrocarbon} density"),
            HeaderItem(p + "SIGCOS", u["tension"], round(U.from_si(zn.sigma_cos_theta, u["tension"], "tension"), 6), f"Zone {i} sigma*cos(theta)"),
            HeaderItem(p + "FUNC", "", zn.function.name, f"Zone {i} J-Sw function: {zn.function.description}"),
        ]
        if getattr(zn, "gas_oil_level", None) is not None:   # three-phase column
            items += [
                HeaderItem(p + "GOL", u["depth"], round(U.from_si(zn.gas_oil_level, u["depth"], "length"), 4), f"Zone {i} free-oil (gas-oil) level TVDSS"),
                HeaderItem(p + "RHOG", u["density"], round(U.from_si(zn.gas_density, u["density"], "density"), 6), f"Zone {i} gas density"),
                HeaderItem(p + "SIGCOSG", u["tension"], round(U.from_si(zn.gas_sigma_cos_theta, u["tension"], "tension"), 6), f"Zone {i} gas-water sigma*cos(theta)"),
            ]
        for pname, pval in zn.function.params_.items():
            items.append(HeaderItem(f"{p}{pname.upper()}", "", pval, f"Zone {i} function parameter {pname}"))
        if zn.function.j_range_ is not None:
            items += [HeaderItem(p + "JMIN", "", zn.function.j_range_[0], f"Zone {i} calibrated J minimum"),
                      HeaderItem(p + "JMAX", "", zn.function.j_range_[1], f"Zone {i} calibrated J maximum")]
        items += _model_file_parameters(project, zn, p, i)
        for number, (name, fn) in enumerate((zn.rock_functions or {}).items(), start=1):
            q = f"{p}RT{number}"
            items += [HeaderItem(q, "", name, f"Zone {i} rock type {number} (ROCK_ID = {number})"),
                      HeaderItem(q + "_FUNC", "", fn.name, f"Zone {i} rock type {number} J-Sw function")]
            items += [HeaderItem(f"{q}_{pn.upper()}", "", pv,
                                 f"Zone {i} rock type {number} function parameter {pn}")
                      for pn, pv in fn.params_.items()]
    return items


def _model_file_parameters(project: Project, zn: ZoneModel, p: str, i: int) -> list[HeaderItem]:
    """~Parameter items naming the model file and rock type a zone's function came from."""
    spec = next((z for z in project.zones if z.name == zn.name), None)
    if spec is None or spec.function.file is None:
        return []
    fs = spec.function
    if fs.by_rock_type:
        rock = f"per depth by {fs.rock_rule.method} classes: " + ", ".join(fs.by_rock_type)
    else:
        rock = fs.rock_type or ""
    return [HeaderItem(p + "MFILE", "", fs.file.name, f"Zone {i} J-Sw model file"),
            HeaderItem(p + "ROCK", "", rock, f"Zone {i} rock type of the model file")]


def _safe_name(name: str) -> str:
    keep = "".join(ch if (ch.isalnum() or ch in "-_.") else "_" for ch in name.strip())
    return keep.strip(".") or "well"


def write_csv(path: Path, well: Well, new_curves: list[Curve]) -> None:
    """CSV of every input curve and the new curves; header ``MNEMONIC [unit]``; blanks for NaN."""
    import pandas as pd

    cols = {}
    for c in list(well.curves.values()) + new_curves:
        label = f"{c.mnemonic} [{c.unit}]" if c.unit else c.mnemonic
        cols[label] = c.data
    data = [np.asarray(v) for v in cols.values()]
    if len(cols) != len(well.curves) + len(new_curves) or any(d.dtype != np.float64 for d in data):
        frame = pd.DataFrame(cols)
        atomic_write_text(path, frame.to_csv(index=False, float_format="%.10g", lineterminator="\n"))
        return
    # the same text as pandas' to_csv(float_format="%.10g"), numbers formatted vectorised
    from .io.atomic import atomic_open
    from .io.las_fast import csv_rows

    header = pd.DataFrame(columns=list(cols)).to_csv(index=False, lineterminator="\n")
    with atomic_open(path, "w", encoding="utf-8", newline="") as f:
        f.write(header)
        for block in csv_rows(data, precision=10):
            f.write(block)


def write_outputs(result: WellResult, project: Project, out_dir: Path, pdf: bool = False,
                  plot: bool = True, depth_axis: str = "md",
                  plot_interval: str = "zones") -> list[Path]:
    """Write LAS, CSV, JSON summary and track plot(s) of one well; return the paths."""
    out_dir.mkdir(parents=True, exist_ok=True)
    stem = _safe_name(result.well.name)
    new = output_curves(result, project)
    files = []
    las_path = out_dir / f"{stem}.las"
    write_las(las_path, result.well, new_curves=new, parameters=run_parameters(result, project),
              decimals={c.mnemonic: OUTPUT_DECIMALS[c.mnemonic] for c in new})
    files.append(las_path)
    csv_path = out_dir / f"{stem}.csv"
    write_csv(csv_path, result.well, new)
    files.append(csv_path)
    length_unit = U.UNIT_SYSTEMS[project.unit_system]["length"]
    result.summary = summarise(result, length_unit, U.factor(length_unit, "length"),
                               project.comparison.min_porosity, project.comparison.min_permeability)
    _add_contacts(result, project, U.factor(length_unit, "length"))
    json_path = out_dir / f"{stem}_summary.json"
    atomic_write_text(json_path, json.dumps({**result.summary, "program": f"satheight {__version__}",
                                             "caution": CAUTION}, indent=2, allow_nan=False) + "\n")
    files.append(json_path)
    if plot:
        fig = plots.track_plot(result, units=project.unit_system, depth_axis=depth_axis,
                               interval=plot_interval)
        files += save_figure(fig,
                             out_dir / f"{stem}_tracks.png",
                             (out_dir / f"{stem}_tracks.pdf") if pdf else None)
    return files


def _add_contacts(result: WellResult, project: Project, length_factor: float) -> None:
    """Entry height and contact depth per zone into the well's JSON summary (key ``contact``)."""
    from .contacts import contacts_summary

    zones = result.summary.get("zones", {})
    for name, block in contacts_summary(result, length_factor, project.comparison.min_porosity,
                                        project.comparison.min_permeability).items():
        if name in zones:
            zones[name]["contact"] = block




def run_project(project: Project | str | Path, out_dir: str | Path, pdf: bool = False,
                plot: bool = True, depth_axis: str = "md", workers: int = 1,
                keep_results: bool = True, plot_interval: str = "zones") -> RunReport:
    """Run every well of a project and write its outputs into ``out_dir``.

    ``depth_axis`` (``"md"`` or ``"tvdss"``) is the main depth scale of the track
    plots. With plots on, the field cross-section of all computed wells is written
    as ``field_section.png`` (a failure there is a note, not a failed run).

    A well that fails (missing curve, bad file) is reported and the others still
    run. With ``keep_results=False`` the per-sample arrays of each well are released
    once its files are written (``WellOutcome.result`` is None, ``summary`` stays), so
    memory does not grow with the number of wells. The run summary
    ``run_summary.json`` lists every well, its files and errors.

    Parameters
    ----------
    workers : int
        Number of processes that run wells at the same time (default 1: all wells
        in this process). With more than one, each well is loaded, computed and
        written in a worker process into a private folder inside ``out_dir``, and
        its files are moved into place here, in project order, so the outputs,
        the failures reported and ``run_summary.json`` are those of a run with one
        worker. The wells' arrays then stay in the workers: ``WellOutcome.result``
        is None and ``WellOutcome.summary`` holds the summary.
    """
    if isinstance(workers, bool) or not isinstance(workers, int) or workers < 1:
        raise SatHeightError(f"workers must be a whole number >= 1, got {workers!r}",
                             hint="give --workers 1 or more")
    if not isinstance(project, Project):
        project = load_project(project)
    out_dir = Path(out_dir)
    if out_dir.exists() and not out_dir.is_dir():
        raise SatHeightError("output path exists and is not a folder", where=str(out_dir),
                             hint="choose another --out")
    out_dir.mkdir(parents=True, exist_ok=True)
    outcomes = []
    names_seen: set[str] = set()
    locations: dict = {}
    if workers > 1 and len(project.wells) > 1:
        outcomes = _run_wells_parallel(project, out_dir, pdf, plot, workers, depth_axis,
                                       plot_interval)
        locations = {o.name: getattr(spec, "location", None)
                     for spec, o in zip(project.wells, outcomes) if o.ok}
    for spec in (project.wells if not outcomes else ()):
        outcome, _ = _one_well(project, spec, out_dir, pdf, plot, depth_axis, names_seen,
                               plot_interval)
        if outcome.ok:
            locations[outcome.name] = getattr(spec, "location", None)
            if not keep_results:
                # keep_results=False drops each well's arrays once written (big projects); the
                # field section then gets a thinned view of the few arrays it draws
                outcome.section = _section_view(outcome.result) if plot else None
                outcome.result = None
        outcomes.append(outcome)
    notes = []
    section_file = None
    cross_files = []
    ok_results = [o.result if o.result is not None else o.section for o in outcomes
                  if o.ok and (o.result is not None or o.section is not None)]
    if plot and ok_results:
        try:
            section_file = save_figure(plots.section_plot(ok_results, units=project.unit_system,
                                                    locations=locations,
                                                    title=f"{project.name}: field section, TVDSS"),
                                       out_dir / "field_section.png")[0]
        except SatHeightError as exc:
            notes.append(f"field section not drawn: {exc}")
        cross = [crossplot_data(r) if isinstance(r, WellResult) else r.cross for r in ok_results]
        try:
            cross_files = save_crossplots(cross, out_dir, project.unit_system)
        except SatHeightError as exc:
            notes.append(f"crossplots not drawn: {exc}")
    unused = sorted(set(getattr(project, "tops_pending", {})) - {o.name for o in outcomes})
    if unused:
        notes.append(f"tops file {project.tops_file}: rows of well(s) " + ", ".join(map(repr, unused))
                     + " match no well of the project (by name, LAS file name or LAS WELL item) "
                       "and were not used")
    summary = {
        "program": f"satheight {__version__}",
        "project": str(project.path),
        "caution": CAUTION,
        "wells": [{"name": o.name, "ok": o.ok, "error": o.error, "warnings": o.warnings,
                   "files": [p.name for p in o.files],
                   "summary": o.summary}
                  for o in outcomes],
    }
    if section_file is not None:
        summary["field_section"] = section_file.name
    if cross_files:
        summary["crossplots"] = [p.name for p in cross_files]
    if notes:
        summary["notes"] = notes
    summary["inputs"] = input_record(project)
    from .report import write_report

    summary["report"] = write_report(summary, out_dir, project.name).name
    summary_path = out_dir / "run_summary.json"
    atomic_write_text(summary_path, json.dumps(summary, indent=2, allow_nan=False) + "\n")
    return RunReport(project=project, out_dir=out_dir, wells=outcomes, summary_file=summary_path,
                     notes=notes, section_file=section_file)


# --------------------------------------------------------------------------------------
# several wells at once (worker processes)

def _name_clash(project: Project, name: str) -> ProjectFileError:
    return ProjectFileError(f"two wells are named {name!r}; outputs would collide",
                            where=str(project.path),
                            hint="give each well a distinct name in the project file")


def _section_view(result: WellResult, max_points: int = 4000):
    """The few arrays of a well that the field section draws, thinned to ``max_points``."""
    from types import SimpleNamespace

    step = max(1, result.tvdss.size // max_points)

    def thin(a):
        return None if a is None else np.asarray(a)[::step].copy()

    return SimpleNamespace(well=SimpleNamespace(name=result.well.name), zones=result.zones,
                           tvdss=thin(result.tvdss), north=thin(getattr(result, "north", None)),
                           east=thin(getattr(result, "east", None)),
                           shm=SimpleNamespace(sw=thin(result.shm.sw)),
                           cross=crossplot_data(result))


def _one_well(project: Project, spec: WellSpec, out_dir: Path, pdf: bool, plot: bool,
              depth_axis: str = "md", names_seen: set | None = None,
              plot_interval: str = "zones"
              ) -> tuple[WellOutcome, str | None]:
    """Load, compute and write one well into ``out_dir``; never raises for that well.

    With ``names_seen`` a well whose output name is already taken fails before
    writing (and its name is added otherwise). A program error on the well's data
    fails that well only. Returns the outcome (with the result) and the well's
    output name (None if it failed before its name was known).
    """
    label = spec.name or spec.las.stem
    safe = None
    try:
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            result, msgs = compute_well(project, spec)
            safe = _safe_name(result.well.name)
            if names_seen is not None:
                if safe in names_seen:
                    raise _name_clash(project, result.well.name)
                names_seen.add(safe)
            out_dir.mkdir(parents=True, exist_ok=True)
            files = write_outputs(result, project, out_dir, pdf=pdf, plot=plot,
                                  depth_axis=depth_axis, plot_interval=plot_interval)
        msgs += [str(c.message) for c in caught]
        return WellOutcome(result.well.name, True, files, None, msgs, result, result.summary), safe
    except SatHeightError as exc:
        return WellOutcome(label, False, [], str(exc)), safe
    except (MemoryError, RecursionError, ArithmeticError, LookupError, TypeError,
            ValueError, OSError) as exc:
        # a program error on one well's data must not cost the other wells their results
        return WellOutcome(label, False, [], f"{spec.las}: internal error "
                           f"{type(exc).__name__}: {exc} (please report it)"), safe


def _well_job(project: Project, spec: WellSpec, work_dir: Path, pdf: bool, plot: bool,
              depth_axis: str = "md", plot_interval: str = "zones"
              ) -> tuple[WellOutcome, str | None]:
    """One well in a worker process (:func:`_one_well` into ``work_dir``).

    Returns the outcome without the arrays (``result`` None; with plots, the thinned
    view the field section needs) and the well's output name.
    """
    outcome, safe = _one_well(project, spec, work_dir, pdf, plot, depth_axis,
                              plot_interval=plot_interval)
    if outcome.result is not None:
        outcome.section = _section_view(outcome.result) if plot else None
        outcome.result = None
    return outcome, safe


def _run_wells_parallel(project: Project, out_dir: Path, pdf: bool, plot: bool,
                        workers: int, depth_axis: str = "md",
                        plot_interval: str = "zones") -> list[WellOutcome]:
    """Run the wells in ``workers`` processes; place their files in project order."""
    import os
    import shutil
    import uuid
    from concurrent.futures import ProcessPoolExecutor

    work = out_dir / f".satheight-work-{uuid.uuid4().hex[:12]}"
    outcomes: list[WellOutcome] = []
    names_seen: set[str] = set()
    try:
        with ProcessPoolExecutor(max_workers=min(workers, len(project.wells))) as pool:
            futures = [pool.submit(_well_job, project, spec, work / str(i), pdf, plot, depth_axis,
                                   plot_interval)
                       for i, spec in enumerate(project.wells)]
            for fut in futures:
                outcome, safe = fut.result()
                if safe is not None and safe in names_seen:
                    if outcome.ok:
                        outcome = WellOutcome(outcome.name, False, [],
                                              str(_name_clash(project, outcome.name)))
                    outcomes.append(outcome)
                    continue
                if safe is not None:
                    names_seen.add(safe)
                if outcome.ok:
                    placed = []
                    for f in outcome.files:
                        target = out_dir / f.name
                        try:
                            os.replace(f, target)
                        except OSError as exc:
                            raise SatHeightError(f"cannot move an output file into place: "
                                                 f"{exc.strerror or exc}", where=str(target),
                                                 hint="check that the output folder is "
                                                      "writable") from exc
                        placed.append(target)
                    outcome.files = placed
                outcomes.append(outcome)
    finally:
        shutil.rmtree(work, ignore_errors=True)
    return outcomes


# --------------------------------------------------------------------------------------
# reliability (issue 6): what was read, and not overwriting earlier results by accident

#: Files whose presence marks a folder as holding the results of an earlier run.
OUTPUT_MARKERS = ("run_summary.json",)


def _sha256(path: Path) -> str | None:
    """SHA-256 of a file's bytes (:func:`satheight.core.sha256_of`), or None if it cannot be read."""
    from .core import sha256_of

    try:
        return sha256_of(path)
    except OSError:
        return None


def input_record(project: Project) -> dict:
    """Resolved paths and SHA-256 checksums of the project file and every LAS file it names.

    Written to ``run_summary.json`` under ``"inputs"`` so a run records exactly what
    it read (paths in the project file are relative to its folder).
    """
    proj = Path(project.path).resolve()
    return {"project_file": {"path": str(proj), "sha256": _sha256(proj)},
            "base_folder": str(proj.parent),
            "wells": [{"name": spec.name, "las": str(Path(spec.las).resolve()),
                       "sha256": _sha256(Path(spec.las))} for spec in project.wells]}


def check_output_folder(out_dir, overwrite: bool) -> None:
    """Refuse to write into a folder that holds an earlier run's results unless ``overwrite``.

    Raises
    ------
    OutputExistsError
        If ``out_dir`` contains any of :data:`OUTPUT_MARKERS` and ``overwrite`` is false
        (exit code 2 on the command line).
    """
    from .errors import OutputExistsError

    out_dir = Path(out_dir)
    if overwrite or not out_dir.is_dir():
        return
    found = [m for m in OUTPUT_MARKERS if (out_dir / m).exists()]
    if found:
        raise OutputExistsError("the output folder already holds the results of an earlier run "
                                f"({found[0]})", where=str(out_dir),
                                hint="add --overwrite to replace them, or choose another --out")


def value_warnings(result: WellResult) -> list[str]:
    """Notes on zones of one well whose values give no or one-sided SHM results.

    One note per zone that: holds no sample of the well; has its FWL at or above its
    shallowest sample (the whole zone is at or below the FWL: Sw = 1 throughout); has
    its FWL below its deepest sample (no sample reaches the FWL: normal for an
    undrilled contact, noted so it is seen); or has no sample with a usable porosity
    and permeability (no SHM Sw at all). Depths in the notes are TVDSS [m].
    """
    out: list[str] = []
    src = result.well.source
    z = np.asarray(result.tvdss, dtype=float)
    shm = result.shm
    for i, zn in enumerate(result.zones):
        m = shm.zone == i
        if not m.any():
            out.append(f"{src}: zone {zn.name!r} ({zn.top:.2f} to {zn.base:.2f} m TVDSS) holds no "
                       "sample of this well")
            continue
        shallow, deep = float(z[m].min()), float(z[m].max())
        if zn.fwl <= shallow:
            out.append(f"{src}: zone {zn.name!r}: the FWL ({zn.fwl:.2f} m TVDSS) lies at or above "
                       f"its shallowest sample ({shallow:.2f} m): Sw = 1 throughout the zone")
        elif zn.fwl > deep:
            out.append(f"{src}: zone {zn.name!r}: the FWL ({zn.fwl:.2f} m TVDSS) lies below its "
                       f"deepest sample ({deep:.2f} m): every sample is above the FWL")
        if not np.isfinite(shm.sw[m]).any():
            out.append(f"{src}: zone {zn.name!r}: no sample has a usable porosity and "
                       "permeability, so no SHM Sw (see SHM_FLAG)")
    return out
