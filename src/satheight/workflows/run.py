"""Run a project: every well loaded, computed and written, one by one or in worker processes.

This is the public entry point that the command line calls for ``run`` and ``demo``.
The per-well steps are in :mod:`satheight.workflows.well` (numbers) and
:mod:`satheight.workflows.outputs` (files).
"""

from __future__ import annotations

import contextlib
import json
import os
import shutil
import uuid
import warnings
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field
from pathlib import Path
from types import SimpleNamespace

import numpy as np

from .. import __version__
from ..errors import InputFileError, OutputWriteError, ProjectFileError, SatHeightError
from ..io.atomic import atomic_write_text
from .. import plots
from ..plots.crossplot import crossplot_data
from ..project.types import Project, WellSpec
from ..results import WellResult
from .output_folder import WORK_PREFIX, InputFiles, OutputSession
from .outputs import (CAUTION, PlotOptions, check_wells, input_record, open_project, project_inputs,
                      reserved_stem, safe_name, write_outputs)
from .field_tables import write_field_tables
from .figures import save_crossplots, save_figure
from .console import SCHEMA_VERSION, Progress
from .report import input_files, write_report
from .handover import write_handover
from .points import pressure_levels, unmatched_notes
from .well import compute_well, require_fwls, well_labels


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



def find_demo_project() -> Path:
    """The bundled demo project file: installed package data first, then the source tree."""
    package = Path(__file__).resolve().parents[1]
    candidates = [package / "demo_data" / "demo_project.toml",
                  package.parents[1] / "demo_wells" / "demo_project.toml",
                  Path.cwd() / "demo_wells" / "demo_project.toml"]
    for c in candidates:
        if c.is_file():
            return c
    raise InputFileError("the bundled demo field was not found",
                         where=", ".join(str(c) for c in candidates),
                         hint="run from the project's source folder or reinstall the package")


def run_project(project: Project | str | Path, out_dir: str | Path, pdf: bool = False,
                plot: bool = True, depth_axis: str = "tvdss", workers: int = 1,
                keep_results: bool = True, overwrite: bool = False,
                progress: bool = False, plot_interval: str = "zones",
                existing: str = "replace", scheduler: str | None = None,
                csv: bool = False) -> RunReport:
    """Run every well of a project and write its outputs into ``out_dir``.

    ``depth_axis`` (``"tvdss"`` or ``"md"``) is the main depth scale of the track
    plots and ``plot_interval`` (``"zones"``: the zones with a margin, or ``"all"``) the
    depths they show. ``existing`` (``"replace"`` or ``"suffix"``) is what happens to input
    curves named like a computed one (:mod:`satheight.workflows.existing`). With plots on, the field cross-section of all computed wells is written
    as ``field_section.png`` (a failure there is a note, not a failed run). Each well's
    samples are written as LAS and Parquet (and ``all_wells.parquet``); ``csv`` True also
    writes them as CSV (``<well>.csv``, ``all_wells.csv``).

    A well that fails (missing curve, bad file) is reported and the others still
    run. With ``keep_results=False`` the per-sample arrays of each well are released
    once its files are written (``WellOutcome.result`` is None, ``summary`` stays), so
    memory does not grow with the number of wells. The run summary
    ``run_summary.json`` lists every well, its files and errors.

    The outputs are written into a work folder inside ``out_dir`` and moved into place
    together at the end (:class:`satheight.workflows.output_folder.OutputSession`: the
    folder's lock, the inputs' checksums verified, no file replaced that satheight did
    not write, ``overwrite`` to replace an earlier run's files).

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
    scheduler : str, optional
        A Dask scheduler's address (``tcp://host:8786``; ``pip install satheight[dask]``):
        the wells run as tasks there, as with ``workers`` > 1, writing into the work
        folder in ``out_dir`` (a path every Dask worker must share); ``workers`` is unused.
    progress : bool
        Draw wells done / total, the current well and the time left on stderr
        (:class:`satheight.workflows.console.Progress`; the caller decides, e.g. only on a terminal).
    """
    if isinstance(workers, bool) or not isinstance(workers, int) or workers < 1:
        raise SatHeightError(f"workers must be a whole number >= 1, got {workers!r}",
                             hint="give --workers 1 or more")
    if not isinstance(project, Project):
        project = open_project(project)
    check_wells(project)
    require_fwls(project)
    inputs = project_inputs(project)
    out_dir = Path(out_dir)
    with OutputSession(out_dir, "run", overwrite, inputs) as session:
        work = session.work
        bar = Progress(len(project.wells), enabled=progress)  # progress on stderr
        try:
            notes: list[str] = []
            levels, rejected = pressure_levels(project, notes) if plot else ((), frozenset())
            opts = PlotOptions(draw=plot, pdf=pdf, depth_axis=depth_axis, interval=plot_interval,
                               existing=existing, pressure_levels=levels, rejected_lines=rejected,
                               csv=csv)
            outcomes, locations = _run_wells(project, work, opts, workers, keep_results, bar,
                                             scheduler)
        finally:
            bar.close()
        files, summary, section_file = _run_files(project, outcomes, locations, work, inputs,
                                                  plot, notes, csv)
        session.commit([f for o in outcomes for f in o.files] + files)
    for o in outcomes:
        o.files = [out_dir / f.name for f in o.files]
    return RunReport(project=project, out_dir=out_dir, wells=outcomes,
                     summary_file=out_dir / summary.name, notes=notes,
                     section_file=None if section_file is None else out_dir / section_file.name)


def _run_files(project: Project, outcomes: list[WellOutcome], locations: dict, work: Path,
               inputs: InputFiles, plot: bool, notes: list[str], csv: bool = False):
    """The run's own files (beside the wells'): field section, crossplots, field and
    hand-over tables (``all_wells.csv`` only when ``csv``), report and ``run_summary.json``.
    Returns ``(files, summary path, section file or None)``; what could not be drawn is a
    note in ``notes``."""
    section_file = _field_section(project, outcomes, locations, work, notes) if plot else None
    cross_files = _crossplots(project, outcomes, work, notes) if plot else []
    notes += unmatched_notes(project, well_labels([o.name for o in outcomes]
                                                  + [s.name for s in project.wells]
                                                  + [s.las.stem for s in project.wells]))
    unused = sorted(set(project.tops_pending) - {o.name for o in outcomes})
    if unused:
        notes.append(f"tops file {project.tops_file}: rows of well(s) "
                     + ", ".join(map(repr, unused)) + " match no well of the project (by "
                     "name, LAS file name or LAS WELL item) and were not used")
    summaries = [o.summary for o in outcomes if o.ok]
    tables = write_field_tables(summaries, [f for o in outcomes if o.ok for f in o.files
                                            if f.suffix == ".parquet"], work, project,
                                csv=csv)
    handover = write_handover(project, summaries, work, notes)
    report, summary = _write_summary(project, outcomes, section_file, notes, work, inputs,
                                     tables, cross_files, handover)
    files = [section_file, report, summary] + list(tables) + cross_files + handover
    return [f for f in files if f is not None], summary, section_file


def _run_wells(project: Project, out_dir: Path, opts: PlotOptions, workers: int,
               keep_results: bool, bar: Progress,
               scheduler: str | None = None) -> tuple[list[WellOutcome], dict]:
    """Every well's outcome in project order, and the map location of each computed well."""
    if scheduler is not None or (workers > 1 and len(project.wells) > 1):
        outcomes = _run_wells_parallel(project, out_dir, opts, workers, bar, scheduler)
        locations = {o.name: spec.location for spec, o in zip(project.wells, outcomes) if o.ok}
        return outcomes, locations
    outcomes, locations = [], {}
    names_seen: set[str] = set()
    for spec in project.wells:
        bar.start(spec.name or spec.las.stem)
        outcome, _ = _one_well(project, spec, out_dir, opts, names_seen)
        bar.done(outcome.name, outcome.ok, outcome.error)
        if outcome.ok:
            locations[outcome.name] = spec.location
            if not keep_results:
                # keep_results=False drops each well's arrays once written (big projects); the
                # field section then gets a thinned view of the few arrays it draws
                outcome.section = _section_view(outcome.result) if opts.draw else None
                outcome.result = None
        outcomes.append(outcome)
    return outcomes, locations


def _computed(outcomes: list[WellOutcome]) -> list:
    """The arrays (or their thinned views) of the wells that ran."""
    return [o.result if o.result is not None else o.section for o in outcomes
            if o.ok and (o.result is not None or o.section is not None)]


def _field_section(project: Project, outcomes: list[WellOutcome], locations: dict,
                   out_dir: Path, notes: list[str]) -> Path | None:
    """Draw ``field_section.png`` of the computed wells; a failure is a note in ``notes``."""
    ok_results = _computed(outcomes)
    if not ok_results:
        return None
    try:
        fig = plots.section_plot(ok_results, units=project.unit_system, locations=locations,
                                 title=f"{project.name}: field section, TVDSS")
        return save_figure(fig, out_dir / "field_section.png")[0]
    except SatHeightError as exc:
        notes.append(f"field section not drawn: {exc}")
        return None


def _crossplots(project: Project, outcomes: list[WellOutcome], out_dir: Path,
                notes: list[str]) -> list[Path]:
    """Draw ``crossplot_<zone>.png`` (log Sw against height and J, every well); a failure
    is a note in ``notes``."""
    cross = [crossplot_data(r) if isinstance(r, WellResult) else r.cross
             for r in _computed(outcomes)]
    try:
        return save_crossplots(cross, out_dir, project.unit_system)
    except SatHeightError as exc:
        notes.append(f"crossplots not drawn: {exc}")
        return []


def _write_summary(project: Project, outcomes: list[WellOutcome], section_file: Path | None,
                   notes: list[str], out_dir: Path, inputs: InputFiles,
                   tables: list[Path], cross_files: list[Path],
                   handover: list[Path] = ()) -> tuple[Path, Path]:
    """Write the HTML report and ``run_summary.json``; return their paths."""
    summary = {
        "schema_version": SCHEMA_VERSION,
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
    summary["inputs"] = input_record(project, inputs)
    summary["tables"] = [p.name for p in tables]          # field_summary.*, all_wells.*
    summary["handover"] = [p.name for p in handover]      # contacts.csv, shf_models.json...
    summary["inputs"]["files"] = input_files(project)      # every input and its checksum
    report = write_report(summary, out_dir, project.name, project)
    summary["report"] = report.name
    summary_path = out_dir / "run_summary.json"
    atomic_write_text(summary_path, json.dumps(summary, indent=2, allow_nan=False) + "\n")
    return report, summary_path


# --------------------------------------------------------------------------------------
# several wells at once (worker processes)

def _name_clash(project: Project, name: str) -> ProjectFileError:
    return ProjectFileError(f"two wells are named {name!r}; outputs would collide",
                            where=str(project.path),
                            hint="give each well a distinct name in the project file")


def _section_view(result: WellResult, max_points: int = 4000):
    """The few arrays of a well that the field section draws, thinned to ``max_points``."""
    step = max(1, result.tvdss.size // max_points)

    def thin(a):
        return None if a is None else np.asarray(a)[::step].copy()

    return SimpleNamespace(well=SimpleNamespace(name=result.well.name), zones=result.zones,
                           tvdss=thin(result.tvdss), north=thin(result.north),
                           east=thin(result.east),
                           shm=SimpleNamespace(sw=thin(result.shm.sw)),
                           cross=crossplot_data(result))


def _one_well(project: Project, spec: WellSpec, out_dir: Path, opts: PlotOptions,
              names_seen: set | None = None) -> tuple[WellOutcome, str | None]:
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
            result, msgs = compute_well(project, spec, opts.existing)
            label, safe = result.well.name, safe_name(result.well.name)
            _check_name(project, result.well.name, names_seen)
            files = _write_well(result, project, out_dir, opts)
        msgs += [str(c.message) for c in caught]
        return WellOutcome(result.well.name, True, files, None, msgs, result, result.summary), safe
    except OutputWriteError:
        raise                   # a full disk or a file-size limit stops the run, not one well
    except SatHeightError as exc:
        return WellOutcome(label, False, [], str(exc)), safe
    except OSError as exc:      # reading the well's files (writing is an OutputWriteError)
        return WellOutcome(label, False, [], f"{exc.filename or spec.las}: cannot read: "
                           f"{exc.strerror or exc} (check the file and its permissions)"), safe
    except (MemoryError, RecursionError, ArithmeticError, LookupError, TypeError,
            ValueError) as exc:
        # a program error on one well's data must not cost the other wells their results
        return WellOutcome(label, False, [], f"{spec.las}: internal error "
                           f"{type(exc).__name__}: {exc} (please report it)"), safe


def _check_name(project: Project, name: str, names_seen: set | None) -> None:
    """Refuse a well whose files would collide with the run's or (``names_seen``) another well's."""
    stem = safe_name(name)
    if reserved_stem(stem):
        raise ProjectFileError(f"well name {name!r} (from its LAS file) collides with the run's "
                               "own files", where=str(project.path),
                               hint="give the well another name in the project file")
    if names_seen is not None:
        if stem.casefold() in names_seen:
            raise _name_clash(project, name)
        names_seen.add(stem.casefold())


def _write_well(result: WellResult, project: Project, out_dir: Path,
                opts: PlotOptions) -> list[Path]:
    """:func:`write_outputs`; an OSError while writing (full disk...) is an OutputWriteError."""
    try:
        out_dir.mkdir(parents=True, exist_ok=True)
        return write_outputs(result, project, out_dir, opts)
    except InputFileError as exc:   # satheight.io.atomic's report of a failed write or rename
        raise OutputWriteError(exc.what, where=exc.where, hint=exc.hint) from exc
    except OSError as exc:
        # name the user's output folder, not the work folder inside it
        folder = next((p.parent for p in (out_dir, *out_dir.parents)
                       if p.name.startswith(WORK_PREFIX)), out_dir)
        raise OutputWriteError(f"cannot write the outputs of well {result.well.name!r}: "
                               f"{exc.strerror or exc}", where=str(exc.filename or folder),
                               hint="check free disk space, the file-size limit and permissions; "
                                    "nothing was placed in the output folder") from exc


def _well_job(project: Project, spec: WellSpec, work_dir: Path,
              opts: PlotOptions) -> tuple[WellOutcome, str | None]:
    """One well in a worker process (:func:`_one_well` into ``work_dir``).

    Returns the outcome without the arrays (``result`` None; with plots, the thinned
    view the field section needs) and the well's output name.
    """
    outcome, safe = _one_well(project, spec, work_dir, opts)
    if outcome.result is not None:
        outcome.section = _section_view(outcome.result) if opts.draw else None
        outcome.result = None
    return outcome, safe


@contextlib.contextmanager
def _dask_pool(scheduler: str):
    """A ``concurrent.futures`` executor on the Dask cluster at ``scheduler`` (closed after)."""
    try:
        from distributed import Client      # optional: pip install satheight[dask]
    except ImportError as exc:
        raise SatHeightError("running on a Dask cluster needs the 'dask' and 'distributed' "
                             "packages", where=f"scheduler {scheduler!r}",
                             hint="install them with: pip install satheight[dask]") from exc
    try:
        client = Client(scheduler, set_as_default=False)
    except (OSError, TimeoutError, ValueError) as exc:
        raise SatHeightError(f"cannot connect to the Dask scheduler: {exc}",
                             where=f"scheduler {scheduler!r}",
                             hint="check the address (e.g. tcp://host:8786) and that the "
                                  "scheduler is running") from exc
    try:
        with client.get_executor(pure=False) as pool:
            yield pool
    finally:
        client.close()


def _run_wells_parallel(project: Project, out_dir: Path, opts: PlotOptions, workers: int,
                        bar: Progress | None = None,
                        scheduler: str | None = None) -> list[WellOutcome]:
    """Run the wells in ``workers`` processes (or as tasks on the Dask cluster at
    ``scheduler``); place their files in project order."""
    work = out_dir / f".satheight-work-{uuid.uuid4().hex[:12]}"
    outcomes: list[WellOutcome] = []
    names_seen: set[str] = set()
    try:
        with (ProcessPoolExecutor(max_workers=min(workers, len(project.wells)))
              if scheduler is None else _dask_pool(scheduler)) as pool:
            futures = [pool.submit(_well_job, project, spec, work / str(i), opts)
                       for i, spec in enumerate(project.wells)]
            for fut in futures:
                outcome, safe = fut.result()
                if bar is not None:
                    bar.done(outcome.name, outcome.ok, outcome.error)
                safe = None if safe is None else safe.casefold()
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
