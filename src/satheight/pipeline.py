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
}


#: Decimals written for each new curve in the output LAS.
OUTPUT_DECIMALS = {"TVDSS": 4, "HAFWL": 4, "PC_RES": 4, "J": 6, "SW_SHM": 5, "SW_LOG": 5,
                   "SHM_FLAG": 0, "ZONE_ID": 0}


@dataclass
class WellOutcome:
    """What happened to one well in a run."""

    name: str
    ok: bool
    files: list[Path] = field(default_factory=list)
    error: str | None = None
    warnings: list[str] = field(default_factory=list)
    result: WellResult | None = None
    summary: dict | None = None        # the well's summary (kept when ``result`` is dropped)


@dataclass
class RunReport:
    """What a project run did: per-well outcomes and the summary file."""

    project: Project
    out_dir: Path
    wells: list[WellOutcome]
    summary_file: Path | None = None

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


def zones_for_well(project: Project, spec: WellSpec, md: np.ndarray, tvdss: np.ndarray) -> list[ZoneModel]:
    """Engine zones for one well: the well's own tops (MD, turned into TVDSS) or the field-wide window."""
    out = []
    for zs in project.zones:
        if zs.name in spec.tops:
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
    return ZoneModel(name=zs.name, top=top, base=base, fwl=zs.fwl,
                     water_density=zs.water_density, hydrocarbon_density=zs.hydrocarbon_density,
                     hydrocarbon=zs.hydrocarbon, sigma_cos_theta=zs.sigma_cos_theta, function=fn)


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
    tvdss = well.md - elev  # vertical well
    zones = zones_for_well(project, spec, well.md, tvdss)
    if not zones:
        msgs.append("no zone of the project lies in this well")
    shm = compute_shm(tvdss, phi, k, zones)
    sw_log, source, w4 = log_saturation(project, well, roles, phi)
    msgs += w4
    result = WellResult(well=well, tvdss=tvdss, zones=zones, shm=shm, phi=phi, k=k, rt=rt,
                        sw_log=sw_log, sw_log_source=source, roles=roles, datum_elevation=elev)
    msgs += value_warnings(result)
    return result, msgs


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
        Curve("HAFWL", dz, NEW_CURVES["HAFWL"], U.from_si(shm.hafwl, dz, "length")),
        Curve("PC_RES", u["pressure"], NEW_CURVES["PC_RES"], U.from_si(shm.pc, u["pressure"], "pressure")),
        Curve("J", "", NEW_CURVES["J"], shm.j.copy()),
        Curve("SW_SHM", "v/v", NEW_CURVES["SW_SHM"], shm.sw.copy()),
    ]
    if result.sw_log_source == "archie":
        curves.append(Curve("SW_LOG", "v/v", NEW_CURVES["SW_LOG"], result.sw_log.copy()))
    curves.append(Curve("SHM_FLAG", "", NEW_CURVES["SHM_FLAG"], shm.flag.astype(float)))
    curves.append(Curve("ZONE_ID", "", NEW_CURVES["ZONE_ID"], (shm.zone + 1).astype(float)))
    return curves


def run_parameters(result: WellResult, project: Project) -> list[HeaderItem]:
    """~Parameter items recording how the new curves were made."""
    u = _output_units(project, result.well)
    items = [HeaderItem("SHM_VERSION", "", f"satheight {__version__}", "Program that wrote the new curves"),
             HeaderItem("SHM_PROJECT", "", project.path.name, "Project file"),
             HeaderItem("SHM_DATUM", u["depth"], round(U.from_si(result.datum_elevation, u["depth"], "length"), 4),
                        "Depth reference elevation above TVDSS datum"),
             HeaderItem("SHM_SWSRC", "", result.sw_log_source, "Source of log Sw")]
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
        for pname, pval in zn.function.params_.items():
            items.append(HeaderItem(f"{p}{pname.upper()}", "", pval, f"Zone {i} function parameter {pname}"))
        if zn.function.j_range_ is not None:
            items += [HeaderItem(p + "JMIN", "", zn.function.j_range_[0], f"Zone {i} calibrated J minimum"),
                      HeaderItem(p + "JMAX", "", zn.function.j_range_[1], f"Zone {i} calibrated J maximum")]
    return items


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
    frame = pd.DataFrame(cols)
    # written straight into the temporary file (pandas writes in blocks): no whole-file string
    with atomic_open(path, "w", encoding="utf-8", newline="") as f:
        frame.to_csv(f, index=False, float_format="%.10g", lineterminator="\n")


def write_outputs(result: WellResult, project: Project, out_dir: Path, pdf: bool = False,
                  plot: bool = True) -> list[Path]:
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
    json_path = out_dir / f"{stem}_summary.json"
    atomic_write_text(json_path, json.dumps(result.summary, indent=2, allow_nan=False) + "\n")
    files.append(json_path)
    if plot:
        from .plots import track_plot

        files += track_plot(result, out_dir / f"{stem}_tracks.png",
                            pdf_path=(out_dir / f"{stem}_tracks.pdf") if pdf else None,
                            units=project.unit_system)
    return files


CAUTION = ("Results are estimates for review by a qualified professional; local regulations "
           "and reserves-reporting rules govern their use.")


def run_project(project: Project | str | Path, out_dir: str | Path, pdf: bool = False,
                plot: bool = True, keep_results: bool = True) -> RunReport:
    """Run every well of a project and write its outputs into ``out_dir``.

    A well that fails (missing curve, bad file) is reported and the others still
    run. With ``keep_results=False`` the per-sample arrays of each well are released
    once its files are written (``WellOutcome.result`` is None, ``summary`` stays), so
    memory does not grow with the number of wells. The run summary
    ``run_summary.json`` lists every well, its files and errors.
    """
    if not isinstance(project, Project):
        project = load_project(project)
    out_dir = Path(out_dir)
    if out_dir.exists() and not out_dir.is_dir():
        raise SatHeightError("output path exists and is not a folder", where=str(out_dir),
                             hint="choose another --out")
    out_dir.mkdir(parents=True, exist_ok=True)
    outcomes = []
    names_seen: set[str] = set()
    for spec in project.wells:
        label = spec.name or spec.las.stem
        try:
            with warnings.catch_warnings(record=True) as caught:
                warnings.simplefilter("always")
                result, msgs = compute_well(project, spec)
                if _safe_name(result.well.name) in names_seen:
                    raise ProjectFileError(f"two wells are named {result.well.name!r}; outputs would collide",
                                           where=str(project.path),
                                           hint="give each well a distinct name in the project file")
                names_seen.add(_safe_name(result.well.name))
                files = write_outputs(result, project, out_dir, pdf=pdf, plot=plot)
            msgs += [str(c.message) for c in caught]
            # keep_results=False drops each well's arrays once written (big projects)
            outcomes.append(WellOutcome(result.well.name, True, files, None, msgs,
                                        result if keep_results else None, result.summary))
        except SatHeightError as exc:
            outcomes.append(WellOutcome(label, False, [], str(exc)))
        except (MemoryError, RecursionError, ArithmeticError, LookupError, TypeError,
                ValueError, OSError) as exc:
            # a program error on one well's data must not cost the other wells their results
            outcomes.append(WellOutcome(label, False, [], f"{spec.las}: internal error "
                                        f"{type(exc).__name__}: {exc} (please report it)"))
    summary = {
        "program": f"satheight {__version__}",
        "project": str(project.path),
        "caution": CAUTION,
        "wells": [{"name": o.name, "ok": o.ok, "error": o.error, "warnings": o.warnings,
                   "files": [p.name for p in o.files],
                   "summary": o.summary}
                  for o in outcomes],
    }
    summary["inputs"] = input_record(project)
    summary_path = out_dir / "run_summary.json"
    atomic_write_text(summary_path, json.dumps(summary, indent=2, allow_nan=False) + "\n")
    return RunReport(project=project, out_dir=out_dir, wells=outcomes, summary_file=summary_path)


# --------------------------------------------------------------------------------------
# reliability (issue 6): what was read, and not overwriting earlier results by accident

#: Files whose presence marks a folder as holding the results of an earlier run.
OUTPUT_MARKERS = ("run_summary.json",)


def _sha256(path: Path) -> str | None:
    """SHA-256 of a file's bytes (read-only, in blocks), or None if it cannot be read."""
    import hashlib

    h = hashlib.sha256()
    try:
        with open(path, "rb") as f:
            for block in iter(lambda: f.read(1 << 20), b""):
                h.update(block)
    except OSError:
        return None
    return h.hexdigest()


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
