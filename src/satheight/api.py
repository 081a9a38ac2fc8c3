"""The public Python surface of satheight: what ``import satheight`` offers.

The names in ``satheight.__all__`` (re-exported from this module) are the public,
documented and stable surface. Every other module and name of the package
(``satheight.engine``, ``satheight.workflows``, ``satheight.io`` ...) is private: it
may change between versions without notice.

Quantities given as text carry their unit (``"1990 m"``, ``"0.45 psi/ft"``,
``"26 mN/m"``), as in the project file; :func:`quantity` turns one into SI.

A typical notebook session::

    import satheight
    project = satheight.demo_project()          # or satheight.open_project("field.toml")
    well = satheight.run_well(project, "VANTREL-1")
    frame = well.frame()                        # pandas DataFrame indexed by MD
    fig = well.track_plot()                     # a matplotlib Figure
    report = satheight.run(project, "results")  # every well, every output file
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

from . import units as U
from . import plots
from .compare import summarise
from .contacts import contacts_summary
from .errors import ProjectFileError, SatHeightError
from .models import BrooksCorey, JSwFunction, PowerLaw, SkeltHarrison, Thomeer, VanGenuchten
from .models import build_function
from .plots.crossplot import crossplot_data
from .project import parse_project
from .project.types import Project
from .results import WellResult
from .workflows.fit import run_fit, settings_from_options
from .workflows.outputs import open_project as _open_project
from .workflows.points import pressure_levels, track_points
from .workflows.run import RunReport, find_demo_project, run_project
from .workflows.well import compute_well, output_curves

if TYPE_CHECKING:                       # pandas is imported when a frame is made
    import pandas as pd

__all__ = ["open_project", "project_from_dict", "demo_project", "run", "run_well", "WellRun",
           "result_frame", "track_plot", "crossplots", "section_plot", "fit_core", "CoreFit",
           "quantity", "JSwFunction", "PowerLaw", "BrooksCorey", "Thomeer", "VanGenuchten",
           "SkeltHarrison", "SatHeightError", "RunReport"]

#: Name given to a project built in code (there is no file behind it).
IN_MEMORY = "project-built-in-code.toml"


# --------------------------------------------------------------------------------------
# projects

def open_project(path) -> Project:
    """Read and validate a project file (TOML); one :class:`SatHeightError` names what is wrong."""
    return _open_project(path)


def project_from_dict(data: dict, folder=".") -> Project:
    """A project built in code: ``data`` has the project file's tables as a dict.

    Paths inside (LAS files, surveys, model files) are relative to ``folder``; quantities
    may be text with units (``{"fwl": "2105 m"}``). ``data`` is not modified. Such a
    project runs well by well (:func:`run_well`); :func:`run`, which records the
    checksum of every input file, needs a project file.
    """
    return parse_project(data, Path(folder).resolve() / IN_MEMORY)


def demo_project() -> Project:
    """The invented demo field shipped with the package (five wells, two zones)."""
    return open_project(find_demo_project())


def _project(project) -> Project:
    return project if isinstance(project, Project) else open_project(project)


# --------------------------------------------------------------------------------------
# running

def run(project, out_dir, *, plots: bool = True, pdf: bool = False, depth_axis: str = "tvdss",
        workers: int = 1, overwrite: bool = False, whole_log: bool = False,
        csv: bool = False) -> RunReport:
    """Run every well of ``project`` (a :class:`Project` or a project-file path) and write
    every output file into ``out_dir``, as ``satheight run`` does (``csv=True``: also the
    CSV tables of ``--csv``).

    Returns the run report: ``report.wells`` (per well: ``name``, ``ok``, ``files``,
    ``error``, ``warnings``, ``summary``), ``report.summary_file``, ``report.notes``.
    """
    project = _project(project)
    if not Path(project.path).is_file():
        raise ProjectFileError("a project built in code cannot be run into an output folder: "
                               "a run records the checksum of its project file",
                               where=str(project.path),
                               hint="save the project as a TOML file and give its path, or use "
                                    "run_well() for each well")
    return run_project(project, out_dir, pdf=pdf, plot=plots, depth_axis=depth_axis,
                       workers=workers, overwrite=overwrite,
                       plot_interval="all" if whole_log else "zones", csv=csv)


@dataclass
class WellRun:
    """One well computed in memory (nothing written).

    Attributes
    ----------
    result : the computed well (private record: use the methods below)
    project : Project
    notes : list of str
        What the computation noted (unit fix-ups, datum source, zones without samples).
    """

    result: WellResult
    project: Project
    notes: list[str] = field(default_factory=list)

    @property
    def name(self) -> str:
        return self.result.well.name

    @property
    def summary(self) -> dict:
        """Per-zone comparison of SHM Sw with log Sw and the contacts, in project units
        (the content of the well's ``_summary.json``)."""
        return self.result.summary

    def frame(self) -> "pd.DataFrame":
        """See :func:`result_frame`."""
        return result_frame(self)

    def track_plot(self, **options):
        """See :func:`track_plot`."""
        return track_plot(self, **options)


def _find_spec(project: Project, name: str):
    names = [s.name or s.las.stem for s in project.wells]
    for spec, label in zip(project.wells, names):
        if name in (label, spec.las.stem, spec.las.name):
            return spec
    folded = [s for s, label in zip(project.wells, names) if label.casefold() == str(name).casefold()]
    if len(folded) == 1:
        return folded[0]
    raise SatHeightError(f"the project has no well {name!r}", where=str(project.path),
                         hint="its wells: " + ", ".join(names))


def run_well(project, name: str) -> WellRun:
    """Compute one well of ``project`` by its name (or LAS file name) in memory.

    Notes of the computation are in ``WellRun.notes`` (and issued as Python warnings).
    """
    project = _project(project)
    spec = _find_spec(project, name)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        result, notes = compute_well(project, spec)
    notes = notes + [str(c.message) for c in caught]
    lu = U.UNIT_SYSTEMS[project.unit_system]["length"]
    lf = U.factor(lu, "length")
    cmp = project.comparison
    result.summary = summarise(result, lu, lf, cmp.min_porosity, cmp.min_permeability)
    zones = result.summary.get("zones", {})
    for zone, block in contacts_summary(result, lf, cmp.min_porosity,
                                        cmp.min_permeability).items():
        if zone in zones:
            zones[zone]["contact"] = block
    for n in notes:
        warnings.warn(f"{result.well.name}: {n}", stacklevel=2)
    return WellRun(result, project, notes)


def result_frame(well: WellRun) -> "pd.DataFrame":
    """The well's curves as a DataFrame indexed by MD (in the LAS file's depth unit).

    Columns: every curve of the input file (in its own unit), then the computed curves in
    the project's units: TVDSS, HAFWL, PC_RES, J, SW_SHM, SHM_FLAG, ZONE_ID (and TVD,
    NORTH, EAST, SW_LOG, ROCK_ID where made). A computed curve replaces an input curve of
    the same name. ``frame.attrs["units"]`` maps each column to its unit.
    """
    import pandas as pd                 # a dependency, loaded on first use (start-up time)

    w = well.result.well
    cols, units = {}, {}
    for c in list(w.curves.values())[1:] + output_curves(well.result, well.project):
        cols[c.mnemonic] = c.data
        units[c.mnemonic] = c.unit
    index = pd.Index(list(w.curves.values())[0].data, name="MD")
    frame = pd.DataFrame(cols, index=index)
    frame.attrs["units"] = {"MD": w.depth_unit, **units}
    frame.attrs["well"] = w.name
    return frame


# --------------------------------------------------------------------------------------
# figures (matplotlib Figures: show them in a notebook or save them with fig.savefig)

def track_plot(well: WellRun, **options):
    """The well's track plot (options: ``depth_axis="tvdss"|"md"``, ``interval="zones"|"all"``,
    ``title``, ``page="screen"|"a4"``), with its core plugs and pressure points (the project's
    ``core_files`` and ``pressure_file``) as in a run."""
    levels, rejected = ((), frozenset()) if well.result.pressures is None else \
        pressure_levels(well.project, [])
    points = track_points(well.result, options.get("depth_axis", "tvdss"), levels, rejected)
    return plots.track_plot(well.result, units=well.project.unit_system, **{**points, **options})


def crossplots(wells) -> dict:
    """Per zone, log Sw against height above FWL and J for every well, with the model
    curves: ``{zone name: Figure}``."""
    wells = list(wells)
    if not wells:
        raise SatHeightError("crossplots() needs at least one computed well",
                             hint="give the results of run_well()")
    units = wells[0].project.unit_system
    return dict(plots.zone_crossplots([crossplot_data(w.result) for w in wells], units=units))


def section_plot(wells, title: str | None = None):
    """The field cross-section of computed wells (paths in TVDSS coloured by SHM Sw)."""
    wells = list(wells)
    if not wells:
        raise SatHeightError("section_plot() needs at least one computed well",
                             hint="give the results of run_well()")
    project = wells[0].project
    where = {s.name or s.las.stem: s.location for s in project.wells}
    locations = {w.name: where.get(w.name) for w in wells if where.get(w.name) is not None}
    return plots.section_plot([w.result for w in wells], units=project.unit_system,
                              locations=locations or None, title=title)


# --------------------------------------------------------------------------------------
# core data

@dataclass
class CoreFit:
    """J-Sw functions fitted to core capillary-pressure data.

    Attributes
    ----------
    models : dict[str, dict[str, JSwFunction]]
        Rock type -> family -> ready-to-predict function (parameters in ``params_``,
        standard errors in ``stderr_``).
    selected : dict[str, str]
        Rock type -> the family chosen by AIC (fewest parameters among the tied).
    reports : dict[str, dict]
        Rock type -> family -> fit statistics (``rmse``, ``r2``, ``aic``, ``correlation``...).
    model_file : pathlib.Path
        The model file written (a project file's ``[zones.function] file``).
    files, notes : list
    """

    models: dict
    selected: dict
    reports: dict
    model_file: Path
    files: list
    notes: list


def fit_core(files, out_dir, *, families=None, reservoir=(), system=None, lab=(),
             closure="auto", k_classes=None, group_by=None, plots: bool = True,
             overwrite: bool = False) -> CoreFit:
    """Fit J-Sw families per rock type to core files, as ``satheight fit`` does.

    Options take the command's texts: ``reservoir=["26 mN/m,300 kg/m3"]`` (reservoir
    sigma*cos(theta) and density difference, optionally ``"ROCK=..."``), ``lab=
    ["mercury_air=480 mN/m,140 deg"]``, ``closure="5 psi"``, ``k_classes="1,10,100"`` (mD).
    The model file, the points table and the plots are written into ``out_dir``.
    """
    settings = settings_from_options(lab=list(lab), system=system, closure=closure,
                                     group_by=group_by, k_classes=k_classes,
                                     families=list(families) if families else None,
                                     reservoir=list(reservoir), plots=plots)
    fit = run_fit([Path(f) for f in files], out_dir, settings, overwrite=overwrite)
    models, reports = {}, {}
    for rock, entry in fit.fits.items():
        models[rock], reports[rock] = {}, {}
        for family, rep in entry["fits"].items():
            fn = build_function(family, rep.params, j_range=rep.j_range)
            fn.stderr_ = dict(rep.stderr)
            fn.rmse_ = rep.rmse
            models[rock][family] = fn
            reports[rock][family] = rep.to_dict()
    return CoreFit(models, {r: e["selected"] for r, e in fit.fits.items()}, reports,
                   fit.model_path, fit.files, fit.warnings)


def quantity(value, kind: str, default_unit: str | None = None) -> float:
    """A number or text quantity in SI: ``quantity("0.45 psi/ft", "density")`` -> kg/m^3.

    ``kind``: length, pressure, density (a pressure gradient is also accepted), tension,
    permeability, resistivity, temperature...; a bare number is in ``default_unit``
    (SI if None).
    """
    return U.parse_quantity(value, kind, default_unit)
