"""The measured points of a run's track plots: core plugs and formation pressures per well.

The project file names them (``[project] core_files`` and ``pressure_file``, read by
:mod:`satheight.project.measured`). A row belongs to a well when its ``well`` text
equals the well's name in the project, its LAS file name without the ending, or the
WELL item of its LAS file: the names a tops file is matched by. A plug's depth is its
MD in the well; it is turned into TVDSS through the well's trajectory and datum
exactly as the log samples are (:func:`satheight.workflows.well.place_plugs`, called
by ``compute_well``). Pressure points given only in MD are turned into TVDSS the same
way. The free-water levels the pressures imply are
fitted once per run from every point of the file, as ``satheight pressures`` does.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from ..errors import SatHeightError
from ..io.pressures import resolve_tvdss
from ..plots import DepthPoints
from ..pressures import DEFAULT_QUALITIES, analyse_pressures
from ..project.types import Project
from ..results import WellResult
from .well import depth_maps

__all__ = ["pressure_levels", "track_points", "unmatched_notes"]


def pressure_levels(project: Project, notes: list[str]) -> tuple[tuple, frozenset]:
    """The FWL of each zone the project's pressure file implies, and the lines of the
    points the fit left out.

    Returns
    -------
    levels : tuple of (str, float, float or None, float or None)
        Label, FWL TVDSS [m] and its interval (top, base TVDSS [m]) per zone with one.
    rejected : frozenset of int
        File lines of points the gradient fits rejected as outliers.
    """
    measured = project.measured
    if measured is None or measured.pressures is None:
        return (), frozenset()
    pts = measured.pressures
    zone = pts.zone.copy()
    if len(project.zones) == 1:     # as satheight pressures: the project's only zone
        zone[zone == ""] = project.zones[0].name
    pts = replace(pts, zone=zone, notes=list(pts.notes))
    try:
        if np.isnan(pts.tvdss).any():
            pts = resolve_tvdss(pts, depth_maps(project, set(pts.well), notes))
        analysis = analyse_pressures(pts)
    except SatHeightError as exc:
        notes.append(f"pressure file {measured.pressure_file}: no FWL drawn from it: {exc}")
        return (), frozenset()
    levels, rejected = [], set()
    for name, zp in analysis.items():
        rejected |= {int(zp.points.line[i]) for fit in zp.lines.values() for i in fit.rejected}
        if zp.fwl is not None and np.isfinite(zp.fwl.depth):
            levels.append((f"FWL {name} (pressures)" if name else "FWL (pressures)",
                           float(zp.fwl.depth), zp.fwl.low, zp.fwl.high))
    return tuple(levels), frozenset(rejected)


def track_points(result: WellResult, depth_axis: str = "tvdss", levels=(),
                 rejected=frozenset()) -> dict:
    """Keyword arguments of :func:`satheight.plots.track_plot` for the well's points.

    Plugs are placed by MD on an MD axis and by their TVDSS otherwise; pressure points
    by TVDSS. Pressure points of a quality the fit leaves out, or rejected by it
    (``rejected``: file lines), are drawn hollow. Empty for a well without points.
    """
    out: dict = {}
    plugs = result.plugs
    if plugs is not None:
        depth, ref = (plugs.md, "md") if depth_axis == "md" else (plugs.tvdss, "tvdss")
        out["core_porosity"] = DepthPoints(depth, plugs.porosity, ref, "Core plug porosity")
        out["core_permeability"] = DepthPoints(depth, plugs.permeability, ref,
                                               "Core plug permeability")
        if np.isfinite(plugs.sw).any():
            out["core_sw"] = DepthPoints(depth, plugs.sw, ref, "Core plug Sw")
    pts = result.pressures
    if pts is not None:
        unused = ~np.isin(pts.quality.astype(str), DEFAULT_QUALITIES) | \
            np.isin(pts.line, sorted(rejected))
        out["pressures"] = DepthPoints(pts.tvdss, pts.pressure, "tvdss", "Pressure",
                                       kind=pts.fluid, unused=unused)
        out["pressure_levels"] = tuple(levels)
    return out


def unmatched_notes(project: Project, labels: frozenset) -> list[str]:
    """Notes naming the wells of the core and pressure files that match no well."""
    measured = project.measured
    if measured is None:
        return []
    notes = []
    plug_wells = sorted({str(p.well).strip() for p in measured.plugs.values()} - labels)
    if plug_wells:
        files = ", ".join(str(f) for f in measured.core_files)
        notes.append(f"core files {files}: plugs of well(s) " + ", ".join(map(repr, plug_wells))
                     + " match no well of the project (by name, LAS file name or LAS WELL "
                     "item) and are not drawn")
    if measured.pressures is not None:
        p_wells = sorted({str(w).strip() for w in measured.pressures.well} - labels)
        if p_wells:
            notes.append(f"pressure file {measured.pressure_file}: points of well(s) "
                         + ", ".join(map(repr, p_wells)) + " match no well of the project "
                         "(by name, LAS file name or LAS WELL item) and are not drawn")
    return notes
