"""Zones and levels of the track plot: zone bands and names, FWL and free-oil levels."""

from __future__ import annotations

import numpy as np

from .depths import zone_intervals
from .style import PURPLE
from .text import safe_text
from .track_frame import FWL_COLOUR, ZONE_EDGE, Frame, number

_ZONE_FILLS = ("#F3F3F3", "#E6E6E6")  # alternate so neighbouring zones stay apart
_GOL_COLOUR = PURPLE


def zone_depths(depth_axis: str, md, tvdss, have_tvdss: bool, zone) -> list[tuple[float, float]]:
    """Plot-depth intervals [m] of one zone window (MD intervals of a deviated well too)."""
    top, base = number(zone.top), number(zone.base)
    if not (np.isfinite(top) and np.isfinite(base)):
        return []
    if depth_axis == "tvdss":
        return [(min(top, base), max(top, base))]
    return zone_intervals(md, tvdss, top, base) if have_tvdss else []


def draw_zones(f: Frame, zones) -> dict[float, list[str]]:
    """Zone bands on every track with names at the right; FWL -> names of its zones."""
    from matplotlib.patches import Patch

    fwl_groups: dict[float, list[str]] = {}
    drawn = False
    for iz, zone in enumerate(zones):  # one pass per zone, not per sample
        zname = safe_text(zone.name)
        for a_si, b_si in zone_depths(f.depth_axis, f.md, f.tvdss, f.have_tvdss, zone):
            a, b = max(a_si / f.scale, f.y_top), min(b_si / f.scale, f.y_base)
            if b <= a:
                continue
            for ax in f.axes.values():
                ax.axhspan(a, b, color=_ZONE_FILLS[iz % 2], zorder=0.2, lw=0)
                ax.axhline(a, color=ZONE_EDGE, lw=0.6, zorder=0.6)
                ax.axhline(b, color=ZONE_EDGE, lw=0.6, zorder=0.6)
            f.last.text(1.04, 0.5 * (a + b), zname, transform=f.last.get_yaxis_transform(),
                        ha="left", va="center", fontsize=8, clip_on=False)
            drawn = True
        fwl = number(zone.fwl)
        if np.isfinite(fwl):
            fwl_groups.setdefault(fwl, []).append(zname)
    if drawn:
        f.handles.append(Patch(facecolor=_ZONE_FILLS[1], edgecolor=ZONE_EDGE, label="Zone"))
    return fwl_groups


def _where(f: Frame, level: float) -> str:
    """Where a level not drawn lies: below or above the log, or outside the window."""
    t = f.tvdss[np.isfinite(f.tvdss)]
    if t.size and level > t.max():
        return "below the log"
    if t.size and level < t.min():
        return "above the log"
    return "outside the plotted interval" if t.size else "not placed (no TVDSS)"


def draw_fwls(f: Frame, fwl_groups: dict[float, list[str]]) -> list[str]:
    """FWL lines across every track; notes for levels outside the plotted interval."""
    from matplotlib.lines import Line2D

    notes = []
    for fwl, names in fwl_groups.items():
        label = "FWL " + ", ".join(names)
        ys = f.level_depths(fwl)
        for yy in ys:
            f.hline_all(yy, label, FWL_COLOUR, 1.6, (0, (6, 2)))
        if ys.size == 0:
            notes.append(f"{label} {_where(f, fwl)} ({fwl / f.scale:.1f} {f.length_unit} TVDSS)")
    if fwl_groups:
        f.handles.append(Line2D([], [], color=FWL_COLOUR, lw=1.6, ls=(0, (6, 2)),
                                label="Free-water level"))
    return notes


def draw_free_oil_levels(f: Frame, zones) -> None:
    """Free-oil (gas-oil) level of zones with a gas cap over an oil leg."""
    from matplotlib.lines import Line2D

    drawn = False
    for zone in zones:
        gol = number(zone.gas_oil_level)
        if not np.isfinite(gol):
            continue
        for yy in f.level_depths(gol):
            f.hline_all(yy, "Free-oil level " + safe_text(zone.name), _GOL_COLOUR, 1.4,
                        (0, (2, 2)))
            drawn = True
    if drawn:
        f.handles.append(Line2D([], [], color=_GOL_COLOUR, lw=1.4, ls=(0, (2, 2)),
                                label="Free-oil (gas-oil) level"))
