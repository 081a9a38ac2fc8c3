"""Field cross-section: every well's path in TVDSS against distance along one line.

:func:`section_positions` places the wells on the line (map or schematic);
:func:`section_plot` draws them and returns the figure (the caller writes it).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

if TYPE_CHECKING:  # matplotlib is imported where a figure is drawn (~0.3 s at start)
    from matplotlib.figure import Figure

from ..errors import DepthError, UnitError
from ..units import UNIT_SYSTEMS, factor
from .style import BLACK, BLUE, DPI, GREY, GRID, LIGHT_GREY, SKY
from .text import safe_text

__all__ = ["section_positions", "section_plot"]


def _offsets(r) -> np.ndarray:
    """(east, north) offset of every sample from the well head [m]; 0 where not given."""
    zeros = np.zeros(np.shape(r.tvdss))
    n = zeros if r.north is None else np.asarray(r.north, float)
    e = zeros if r.east is None else np.asarray(r.east, float)
    return np.stack([e, n], axis=-1)


def _mapped_distances(pts, results, locations):
    """Distances along the best-fitting line through the wells' map positions [m]."""
    xy = [p + np.asarray(locations[r.well.name], float) for p, r in zip(pts, results)]
    allp = np.concatenate([x[np.all(np.isfinite(x), axis=1)] for x in xy])
    centre = allp.mean(axis=0)
    u = np.array([1.0, 0.0])
    if allp.shape[0] >= 2 and np.ptp(allp, axis=0).max() > 0:
        _, _, vt = np.linalg.svd(allp - centre, full_matrices=False)
        u = vt[0]
    if u[0] < -1e-12 or (abs(u[0]) <= 1e-12 and u[1] < 0):
        u = -u
    return [(x - centre) @ u for x in xy], u


def _schematic_distances(pts):
    """Wells side by side at a fixed spacing, each with its own reach [m]."""
    d = []
    for p in pts:  # one pass per well
        fin = np.all(np.isfinite(p), axis=1)
        far = p[fin][-1] if fin.any() else np.zeros(2)
        reach = float(np.hypot(*far))
        v = far / reach if reach > 0 else np.array([1.0, 0.0])
        d.append(p @ v)
    spans = [float(np.nanmax(x) - min(0.0, float(np.nanmin(x)))) if np.isfinite(x).any() else 0.0
             for x in d]
    spacing = max(max(spans, default=0.0) * 1.5, 500.0)
    return [x + i * spacing for i, x in enumerate(d)]


def section_positions(results, locations=None) -> tuple[list[np.ndarray], bool, np.ndarray]:
    """Distance of every sample of every well along one section line [m].

    Parameters
    ----------
    results : sequence of WellResult
        Wells with ``north``/``east`` offsets from their well heads [m] (``None`` = 0).
    locations : dict[str, tuple[float, float]], optional
        Well-head map position (east, north) [m] by well name.

    Returns
    -------
    distances : list of numpy.ndarray
        Per well, distance of each sample along the line [m], the smallest being 0.
    mapped : bool
        True when every well has a location: the line is the best-fitting straight
        line (first principal axis) through the wells' horizontal positions, oriented
        west to east (south to north if it runs north-south), and distances are true
        map distances projected on it. False: the wells are set side by side at a
        fixed spacing (schematic), each keeping its own horizontal reach along the
        direction from its head to its deepest sample.
    direction : numpy.ndarray
        Unit vector (east, north) of the line (schematic: (1, 0)).
    """
    locations = locations or {}
    pts = [_offsets(r) for r in results]
    mapped = bool(results) and all(locations.get(r.well.name) is not None for r in results)
    if mapped:
        d, u = _mapped_distances(pts, results, locations)
    else:
        d, u = _schematic_distances(pts), np.array([1.0, 0.0])
    low = min((float(np.nanmin(x)) for x in d if np.isfinite(x).any()), default=0.0)
    return [x - low for x in d], mapped, u


def _draw_well(ax, r, x, scale, cmap, norm, zone_tops, fwls) -> None:
    """One well's path coloured by SHM Sw, its name, and ticks at its zone tops and bases."""
    from matplotlib.collections import LineCollection

    z = np.asarray(r.tvdss, float)
    ok = np.isfinite(x) & np.isfinite(z)
    xs, zs = x[ok] / scale, z[ok] / scale
    if xs.size == 0:
        return
    ax.plot(xs, zs, color=LIGHT_GREY, lw=1.0, zorder=2)
    sw = np.asarray(r.shm.sw, float)[ok]
    if xs.size >= 2:
        seg = np.stack([np.column_stack([xs[:-1], zs[:-1]]),
                        np.column_stack([xs[1:], zs[1:]])], axis=1)
        swm = 0.5 * (sw[:-1] + sw[1:])
        good = np.isfinite(swm)
        ax.add_collection(LineCollection(seg[good], colors=cmap(norm(swm[good])),
                                         linewidths=4.0, zorder=3))
    ax.text(xs[0], zs[0], safe_text(r.well.name) + "\n", ha="center", va="bottom", fontsize=8)
    monotone = bool(np.all(np.diff(z[ok]) > 0))
    for zn in r.zones:
        fwls.setdefault(zn.name, float(zn.fwl))
        for level, kind in ((zn.top, "top"), (zn.base, "base")):
            xc = np.interp(level, z[ok], x[ok]) if monotone else np.nan
            if not (np.nanmin(z[ok]) <= level <= np.nanmax(z[ok])) or not np.isfinite(xc):
                continue
            ax.plot([xc / scale], [level / scale], marker="_", ms=18, mew=2.0, color=BLACK,
                    zorder=5)
            if kind == "top":
                zone_tops.setdefault(zn.name, []).append((xc / scale, level / scale))


def _draw_levels(ax, dist, scale, zone_tops, fwls) -> None:
    """Zone tops joined from well to well, and each zone's FWL across the section."""
    for name, pts in zone_tops.items():
        pts = sorted(pts)
        ax.plot([p[0] for p in pts], [p[1] for p in pts], color=GREY, lw=0.8, zorder=4)
        ax.text(pts[0][0], pts[0][1], " " + safe_text(name), ha="left", va="bottom", fontsize=8,
                color="#333333", zorder=6)
    x_all = np.concatenate([d[np.isfinite(d)] for d in dist]) / scale
    x0, x1 = float(x_all.min()), float(x_all.max())
    pad = max(0.05 * (x1 - x0), 50.0 / scale * 3.0)
    for name, fwl in fwls.items():
        ax.plot([x0 - pad, x1 + pad], [fwl / scale] * 2, ls="--", lw=1.2, color=SKY, zorder=4)
        ax.text(x1 + pad, fwl / scale, f"FWL {safe_text(name)} ", ha="right", va="bottom",
                fontsize=8, color=BLUE, zorder=6)
    ax.set_xlim(x0 - pad, x1 + pad)


def section_plot(results, units: str = "metric", locations=None,
                 title: str | None = None) -> Figure:
    """Field cross-section: every well's path in TVDSS against distance along a line.

    Each well is drawn as its path (distance along the section line, TVDSS positive
    down), coloured by saturation-height Sw [fraction] where it was computed and
    grey elsewhere, with its name at the top. Where a well enters and leaves each
    zone, a short tick marks the zone top and base (TVDSS of that well's zone
    window); the tops of a zone are joined from well to well by a thin line. Each
    zone's free-water level is a dashed horizontal line across the section.

    Parameters
    ----------
    results : sequence of WellResult
        Computed wells; not modified. Uses ``tvdss`` [m], ``north``/``east`` [m]
        (offsets from the well head; ``None`` = vertical), ``shm.sw`` and ``zones``.
    units : {"metric", "field"}
        Distances and depths shown in m or ft.
    locations : dict[str, tuple[float, float]], optional
        Well-head map position (east, north) [m] by well name. With a position for
        every well the section follows the line of best fit through the wells (see
        :func:`section_positions`); otherwise the wells are set side by side
        (schematic distances, said in the axis label).
    title : str, optional

    Returns
    -------
    matplotlib.figure.Figure
        The figure (Agg canvas); writing it is the caller's job.

    Raises
    ------
    UnitError
        Unknown ``units``.
    DepthError
        No well, or no well with any finite TVDSS.
    """
    from matplotlib import colormaps
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.cm import ScalarMappable
    from matplotlib.colors import Normalize
    from matplotlib.figure import Figure

    if units not in UNIT_SYSTEMS:
        raise UnitError(f"unknown unit system {units!r}", where="section_plot units",
                        hint="use 'metric' or 'field'")
    results = list(results)
    if not results or not any(np.isfinite(np.asarray(r.tvdss, float)).any() for r in results):
        raise DepthError("no well with TVDSS to draw in the field section", where="section_plot",
                         hint="compute at least one well first")
    unit = UNIT_SYSTEMS[units]["length"]
    scale = factor(unit, "length")
    dist, mapped, u = section_positions(results, locations)

    fig = Figure(figsize=(11.0, 7.5), dpi=DPI)
    FigureCanvasAgg(fig)
    ax = fig.add_axes((0.08, 0.1, 0.76, 0.8))
    cax = fig.add_axes((0.87, 0.1, 0.018, 0.8))
    cmap = colormaps["cividis_r"]
    norm = Normalize(0.0, 1.0)
    zone_tops: dict[str, list[tuple[float, float]]] = {}
    fwls: dict[str, float] = {}
    for r, x in zip(results, dist):  # one pass per well
        _draw_well(ax, r, x, scale, cmap, norm, zone_tops, fwls)
    _draw_levels(ax, dist, scale, zone_tops, fwls)
    ax.invert_yaxis()
    ax.set_ylabel(f"TVDSS [{unit}]", fontsize=9)
    if mapped:
        bearing = (np.degrees(np.arctan2(u[0], u[1])) + 360.0) % 360.0
        ax.set_xlabel(f"distance along the section line, bearing {bearing:.0f} deg [{unit}]",
                      fontsize=9)
    else:
        ax.set_xlabel(f"wells side by side (schematic spacing; each well's own reach) [{unit}]",
                      fontsize=9)
    ax.grid(True, color=GRID, lw=0.5)
    fig.colorbar(ScalarMappable(norm=norm, cmap=cmap), cax=cax).set_label(
        "Sw from the saturation-height model [fraction]", fontsize=8)
    ax.set_title(safe_text(title if title is not None else "Field section, TVDSS", 80), fontsize=12,
                 y=1.0)                         # on the top edge: no tick labels there
    return fig
