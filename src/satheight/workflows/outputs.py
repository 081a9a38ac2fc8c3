"""A well's output files, and the records of what a run read.

Every file goes through :mod:`satheight.io.atomic` (a temporary file, then a rename).
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np

from .. import __version__
from .. import units as U
from ..compare import summarise
from ..contacts import contacts_summary
from ..coreplugs import sha256_of
from ..errors import OutputExistsError
from ..io.atomic import atomic_open, atomic_write_text
from ..io.las import write_las
from ..io.las_fast import csv_rows
from ..plots.track import track_plot
from ..project.types import Project
from ..results import WellResult
from ..well import Curve, Well
from .well import OUTPUT_DECIMALS, output_curves, run_parameters


#: Caution carried by every summary file.
CAUTION = ("Results are estimates for review by a qualified professional; local regulations "
           "and reserves-reporting rules govern their use.")


def safe_name(name: str) -> str:
    """``name`` as a file-name stem: letters, digits, ``-_.`` kept, anything else ``_``."""
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
    header = pd.DataFrame(columns=list(cols)).to_csv(index=False, lineterminator="\n")
    with atomic_open(path, "w", encoding="utf-8", newline="") as f:
        f.write(header)
        for block in csv_rows(data, precision=10):
            f.write(block)


def write_outputs(result: WellResult, project: Project, out_dir: Path, pdf: bool = False,
                  plot: bool = True, depth_axis: str = "md") -> list[Path]:
    """Write LAS, CSV, JSON summary and track plot(s) of one well; return the paths."""
    out_dir.mkdir(parents=True, exist_ok=True)
    stem = safe_name(result.well.name)
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
        files += track_plot(result, out_dir / f"{stem}_tracks.png",
                            pdf_path=(out_dir / f"{stem}_tracks.pdf") if pdf else None,
                            units=project.unit_system, depth_axis=depth_axis)
    return files


def _add_contacts(result: WellResult, project: Project, length_factor: float) -> None:
    """Entry height and contact depth per zone into the well's JSON summary (key ``contact``)."""
    zones = result.summary.get("zones", {})
    for name, block in contacts_summary(result, length_factor, project.comparison.min_porosity,
                                        project.comparison.min_permeability).items():
        if name in zones:
            zones[name]["contact"] = block


# --------------------------------------------------------------------------------------
# what was read, and not overwriting earlier results by accident

#: Files whose presence marks a folder as holding the results of an earlier run.
OUTPUT_MARKERS = ("run_summary.json",)


def _sha256(path: Path) -> str | None:
    """SHA-256 of a file's bytes (:func:`satheight.coreplugs.sha256_of`), or None if it cannot be read."""
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
    out_dir = Path(out_dir)
    if overwrite or not out_dir.is_dir():
        return
    found = [m for m in OUTPUT_MARKERS if (out_dir / m).exists()]
    if found:
        raise OutputExistsError("the output folder already holds the results of an earlier run "
                                f"({found[0]})", where=str(out_dir),
                                hint="add --overwrite to replace them, or choose another --out")

