"""A well's output files, their names, and what a run reads.

Every file goes through :mod:`satheight.io.atomic` (a temporary file, then a rename).
"""

from __future__ import annotations

import json
import os
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass
from pathlib import Path

from .. import __version__
from .. import units as U
from ..compare import summarise
from ..contacts import contacts_summary
from ..errors import InputFileError, ProjectFileError
from ..io.atomic import atomic_write_text
from ..io.las import write_las
from ..io.well_csv import write_csv
from .. import plots
from ..project.reader import load_project
from ..project.types import Project
from ..results import WellResult
from .output_folder import InputFiles, check_input_file
from .field_tables import write_well_table
from .existing import new_parameters, suffixed
from .figures import save_figure
from .report import REPORT_NAME
from .console import SCHEMA_VERSION
from .handover import HANDOVER_FILES
from .points import track_points
from ..handover import md_at_tvdss
from .uncertainty import (UNCERTAINTY_DECIMALS, uncertainty_curves, uncertainty_section,
                          well_uncertainty, write_tornado)
from .well import OUTPUT_DECIMALS, output_curves, run_parameters


#: Caution carried by every summary file.
CAUTION = ("Results are estimates for review by a qualified professional; local regulations "
           "and reserves-reporting rules govern their use.")


def safe_name(name: str, empty: str = "well") -> str:
    """``name`` as a file-name stem: letters, digits, ``-_.`` kept, anything else ``_``
    (``empty`` when nothing is left)."""
    keep = "".join(ch if (ch.isalnum() or ch in "-_.") else "_" for ch in name.strip())
    return keep.strip(".") or empty


@dataclass(frozen=True)
class PlotOptions:
    """What a run draws and writes. ``draw`` False: no figure; ``pdf``: track plots also as PDF;
    ``depth_axis``: main depth scale of the track plots (``"tvdss"`` or ``"md"``);
    ``interval``: the depths they show (``"zones"`` with a margin, or ``"all"``);
    ``existing``: input curves named like a computed one are replaced (``"replace"``) or
    the new ones get a suffix (``"suffix"``), see :mod:`satheight.workflows.existing`;
    ``pressure_levels`` and ``rejected_lines``: the FWLs the project's pressure file
    implies and the lines of its points the fit rejected
    (:func:`satheight.workflows.points.pressure_levels`), drawn on the track plots;
    ``csv``: each well's samples also as ``<well>.csv`` (and the run's ``all_wells.csv``)
    beside the Parquet tables, which are always written."""

    draw: bool = True
    pdf: bool = False
    depth_axis: str = "tvdss"
    interval: str = "zones"
    existing: str = "replace"
    pressure_levels: tuple = ()
    rejected_lines: frozenset = frozenset()
    csv: bool = False


NO_PLOTS = PlotOptions(draw=False)


def write_outputs(result: WellResult, project: Project, out_dir: Path,
                  opts: PlotOptions = PlotOptions()) -> list[Path]:
    """Write LAS, Parquet, JSON summary, track plot(s) and, with ``opts.csv``, CSV of one
    well; return the paths."""
    out_dir.mkdir(parents=True, exist_ok=True)
    stem = safe_name(result.well.name)
    new = output_curves(result, project)
    mc = well_uncertainty(project, result)          # Monte Carlo, when the project declares one
    new += uncertainty_curves(mc)
    decimals = {**OUTPUT_DECIMALS, **UNCERTAINTY_DECIMALS}
    decimals = {c.mnemonic: decimals[c.mnemonic] for c in new}
    if opts.existing == "suffix":   # new curves renamed where the input has the name
        new, names, _ = suffixed(new, result.well)
        decimals = {names[k]: v for k, v in decimals.items()}
    files = []
    las_path = out_dir / f"{stem}.las"
    well, params = new_parameters(result.well, run_parameters(result, project), opts.existing)
    # the Parquet table (the well's part of all_wells) is written in a second thread while this
    # one makes the LAS text: pyarrow and numpy's array loops run without Python's lock
    with ThreadPoolExecutor(1) as pool:
        table = pool.submit(write_well_table, result, project, new, out_dir / f"{stem}.parquet")
        write_las(las_path, well, new_curves=new, parameters=params, decimals=decimals)
        files.append(las_path)
        if opts.csv:
            csv_path = out_dir / f"{stem}.csv"
            write_csv(csv_path, result.well, new)
            files.append(csv_path)
        files += table.result()
    length_unit = U.UNIT_SYSTEMS[project.unit_system]["length"]
    result.summary = summarise(result, length_unit, U.factor(length_unit, "length"),
                               project.comparison.min_porosity, project.comparison.min_permeability,
                               project.comparison.max_shale)
    _add_contacts(result, project, U.factor(length_unit, "length"))
    if mc is not None:
        result.summary["uncertainty"] = uncertainty_section(mc, length_unit)
    json_path = out_dir / f"{stem}_summary.json"
    atomic_write_text(json_path, json.dumps({"schema_version": SCHEMA_VERSION, **result.summary,
                                             "program": f"satheight {__version__}",
                                             "caution": CAUTION}, indent=2, allow_nan=False) + "\n")
    files.append(json_path)
    if opts.draw:
        fig = plots.track_plot(result, units=project.unit_system, depth_axis=opts.depth_axis,
                               interval=opts.interval,
                               sw_band=None if mc is None else mc.result.sw_percentiles,
                               **track_points(result, opts.depth_axis, opts.pressure_levels,
                                              opts.rejected_lines))
        files += save_figure(fig, out_dir / f"{stem}_tracks.png",
                             (out_dir / f"{stem}_tracks.pdf") if opts.pdf else None)
        if mc is not None:
            files += write_tornado(mc, out_dir / f"{stem}_tornado.png",
                                   f"{result.well.name}: tornado", length_unit)
    return files


def _add_contacts(result: WellResult, project: Project, length_factor: float) -> None:
    """Entry height and contact depth per zone into the well's JSON summary (key ``contact``)."""
    zones = result.summary.get("zones", {})
    for name, block in contacts_summary(result, length_factor, project.comparison.min_porosity,
                                        project.comparison.min_permeability).items():
        if name in zones:
            zones[name]["contact"] = block
            # MD of each level where the well's path reaches it (hand-over contacts.csv)
            for key in ("fwl", "contact", "gas_oil_level"):
                z = block[f"{key}_tvdss"]
                md = None if z is None else md_at_tvdss(result.well.md, result.tvdss, z * length_factor)
                block[f"{key}_md"] = None if md is None else md / length_factor


# --------------------------------------------------------------------------------------
# names: a well's files never collide with another's or with the run's own files

#: Files a project run writes once (beside its manifest).
RUN_FILES = ("run_summary.json", REPORT_NAME, "field_section.png", "field_summary.csv",
             "field_summary.parquet", "all_wells.csv", "all_wells.parquet") + HANDOVER_FILES


def well_file_names(stem: str) -> list[str]:
    """Every file name a well with output stem ``stem`` may write."""
    return [f"{stem}.las", f"{stem}.csv", f"{stem}.parquet", f"{stem}_summary.json",
            f"{stem}_tracks.png", f"{stem}_tracks.pdf", f"{stem}_tornado.png"]


def reserved_stem(stem: str) -> bool:
    """True if a well's files named ``stem`` would collide with the run's own files.

    A well named like a run file's stem (``report``, ``run_summary``, ``field_section``)
    or whose files take a run file's name (``run`` -> ``run_summary.json``) is refused.
    """
    run = {n.casefold() for n in RUN_FILES}
    return (stem.casefold() in {Path(n).stem.casefold() for n in RUN_FILES}
            or any(n.casefold() in run for n in well_file_names(stem)))


def check_wells(project: Project) -> None:
    """Refuse, before any well runs, a LAS file listed twice and clashing well names.

    Raises
    ------
    ProjectFileError
        Two ``[[wells]]`` name one LAS file (under two names it would be counted twice);
        two wells have one output name (ignoring case, as some file systems do); a
        well's name collides with a file of the run (see :func:`reserved_stem`).
    """
    seen_las: dict[tuple[int, int], str] = {}
    seen_names: dict[str, str] = {}
    for spec in project.wells:
        label = spec.name or spec.las.name
        try:
            st = os.stat(spec.las)
        except OSError:
            st = None                      # reported by the input check
        if st is not None:
            key = (st.st_dev, st.st_ino)
            if key in seen_las:
                raise ProjectFileError(f"wells {seen_las[key]!r} and {label!r} name the same LAS "
                                       f"file ({spec.las}); it would be counted twice",
                                       where=str(project.path), hint="list each LAS file once")
            seen_las[key] = label
        if spec.name is None:
            continue
        stem = safe_name(spec.name)
        if reserved_stem(stem):
            raise ProjectFileError(f"well name {spec.name!r} collides with the run's own files "
                                   f"({', '.join(RUN_FILES)})", where=str(project.path),
                                   hint="rename the well in the project file")
        if stem.casefold() in seen_names:
            raise ProjectFileError(f"wells {seen_names[stem.casefold()]!r} and {spec.name!r} would "
                                   "write files of the same name", where=str(project.path),
                                   hint="give each well a distinct name in the project file")
        seen_names[stem.casefold()] = spec.name


# --------------------------------------------------------------------------------------
# what is read: checked and its checksums taken before the run starts

def open_project(path) -> Project:
    """Read a project file after checking it is a regular file (one clear error otherwise)."""
    check_input_file(path, "project file")
    try:
        return load_project(path)
    except RecursionError:
        raise ProjectFileError("the file nests tables or arrays too deeply to be read",
                               where=str(path), hint="write the project file with flat tables "
                                                     "as in the README") from None
    except RuntimeError as exc:
        # pathlib (Python < 3.13) raises RuntimeError("Symlink loop from ...") in resolve()
        if not str(exc).startswith("Symlink loop"):
            raise
        raise InputFileError(f"a path of the project file is a symbolic-link loop ({exc})",
                             where=str(path), hint="point each path at a real file") from None


def project_inputs(project: Project, inputs: InputFiles | None = None) -> InputFiles:
    """Every file a project reads (project file, tops, core and pressure files, model files,
    LAS, surveys), checked and checksummed into ``inputs`` (a new :class:`InputFiles` if None)."""
    inputs = inputs if inputs is not None else InputFiles()
    inputs.add(project.path, "project file")
    if project.tops_file is not None:
        inputs.add(project.tops_file, "tops file")
    measured = project.measured
    for path in () if measured is None else measured.core_files:
        inputs.add(path, "core file")
    if measured is not None and measured.pressure_file is not None:
        inputs.add(measured.pressure_file, "pressure file")
    for zs in project.zones:
        if zs.function.file is not None:
            inputs.add(zs.function.file, f"model file of zone {zs.name!r}")
    for spec in project.wells:
        label = spec.name or spec.las.name
        inputs.add(spec.las, f"LAS file of well {label!r}")
        if spec.survey is not None:
            inputs.add(spec.survey, f"survey of well {label!r}")
    return inputs


def input_record(project: Project, inputs: InputFiles) -> dict:
    """Resolved paths and SHA-256 checksums (taken before the run) of the files a run read.

    Written to ``run_summary.json`` under ``"inputs"`` so a run records exactly what
    it read (paths in the project file are relative to its folder).
    """
    proj = Path(project.path).resolve()
    others = [p for p in [project.tops_file] + [z.function.file for z in project.zones]
              + [w.survey for w in project.wells] if p is not None]
    return {"project_file": {"path": str(proj), "sha256": inputs.checksum(proj)},
            "base_folder": str(proj.parent),
            "wells": [{"name": spec.name, "las": str(Path(spec.las).resolve()),
                       "sha256": inputs.checksum(spec.las)} for spec in project.wells],
            "other_files": [{"path": str(Path(p).resolve()), "sha256": inputs.checksum(p)}
                            for p in dict.fromkeys(others)]}
