"""Figures for contacts: FWL misfit profiles and pressure-depth plots.

* :func:`misfit_plot`: misfit versus candidate FWL depth, one line per well
  (each scaled to its own range, so wells of different sample counts compare)
  and the joint profile, with the chosen FWL, its interval and the project's FWL.
* :func:`pressure_plot`: pressure versus TVDSS (depth down) with the points by
  fluid (rejected and unused points hollow), the fitted lines, and the FWL and
  free-oil level with their intervals.

Figures use :class:`matplotlib.figure.Figure` with the Agg canvas (no pyplot
state) and are returned; the caller writes them.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

if TYPE_CHECKING:  # matplotlib is imported where a figure is drawn (~0.3 s at start)
    from matplotlib.figure import Figure

from ..fwlsearch import FwlSearch
from ..pressures import ZonePressures
from ..units import UNIT_SYSTEMS, factor
from .style import DPI
from .text import safe_text

__all__ = ["misfit_plot", "pressure_plot"]


# Okabe & Ito (2008) colour-blind-safe set; roles are our own choice.
_WELL_COLOURS = ("#0072B2", "#E69F00", "#009E73", "#CC79A7", "#56B4E9", "#D55E00", "#F0E442")
_FLUID_COLOURS = {"water": "#0072B2", "oil": "#009E73", "gas": "#D55E00", "unknown": "#808080"}
_FLUID_MARKERS = {"water": "o", "oil": "s", "gas": "^", "unknown": "x"}


def _figure(figsize) -> Figure:
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=figsize, dpi=DPI)
    FigureCanvasAgg(fig)
    return fig


def misfit_plot(search: FwlSearch, units: str = "metric") -> Figure:
    """Misfit versus FWL depth per well and joint; chosen FWL, interval, project FWL.

    Parameters
    ----------
    search : FwlSearch
    units : str
        ``"metric"`` or ``"field"``: depth unit of the axis.

    Returns
    -------
    matplotlib.figure.Figure
    """
    lu = UNIT_SYSTEMS[units]["length"]
    f = factor(lu, "length")
    fig = _figure((10.0, 6.0))
    depth = search.candidates / f

    def scaled(y, sel):
        y = np.asarray(y, float)
        lo, hi = np.nanmin(y[sel]), np.nanmax(y[sel])
        return (y - lo) / (hi - lo) if hi > lo else np.zeros_like(y)

    half = max(5.0, 4.0 * (search.high - search.low)) / f
    zoom = (search.best / f - half, search.best / f + half)
    panels = ((fig.add_subplot(1, 2, 1), (depth[0], depth[-1]), "whole window"),
              (fig.add_subplot(1, 2, 2), zoom, "near the best FWL"))
    for n, (ax, (top, bottom), what) in enumerate(panels):
        sel = (depth >= top) & (depth <= bottom)
        if sel.sum() < 2:
            sel = np.ones(depth.size, bool)
        ax.axhspan(search.low / f, search.high / f, color="#BBBBBB", alpha=0.6,
                   label=f"{int(round(search.level * 100))} % interval")
        for i, w in enumerate(search.wells):
            prof = search.well_profiles.get(w.well)
            if prof is None or not np.isfinite(prof).any():
                continue
            col = _WELL_COLOURS[i % len(_WELL_COLOURS)]
            label = f"{safe_text(w.well)} ({w.n_samples})" + (" flagged" if w.flagged else "")
            ax.plot(scaled(prof, sel), depth, color=col, lw=1.0, ls="--" if w.flagged else "-",
                    label=label)
            if w.best is not None:
                ax.plot([0.0], [w.best / f], marker=">", color=col, ms=7, clip_on=False)
        ax.plot(scaled(search.profile, sel), depth, color="black", lw=2.2, label="joint")
        ax.axhline(search.best / f, color="black", lw=1.2,
                   label=f"best FWL {search.best / f:.2f} {lu}")
        if np.isfinite(search.project_fwl):   # NaN: the project gives no FWL for the zone
            ax.axhline(search.project_fwl / f, color="#D55E00", lw=1.2, ls=":",
                       label=f"project FWL {search.project_fwl / f:.2f} {lu}")
        ax.set_ylim(bottom, top)
        ax.set_xlim(-0.02, 1.02)
        ax.set_xlabel(f"misfit ({search.misfit}), scaled 0-1 per curve")
        ax.set_title(what, fontsize=10)
        ax.grid(True, color="#DDDDDD", lw=0.6)
        if n == 0:
            ax.set_ylabel(f"candidate FWL, TVDSS [{lu}]")
        else:
            ax.legend(loc="lower right", fontsize=8, framealpha=0.9)
    fig.suptitle(f"FWL from log Sw: {safe_text(search.zone)}")
    fig.tight_layout()
    return fig


def pressure_plot(zp: ZonePressures, units: str = "metric",
                  log_fwl: tuple[float, float, float] | None = None) -> Figure:
    """Pressure versus TVDSS with fitted lines and free levels.

    Parameters
    ----------
    zp : ZonePressures
    units : str
        ``"metric"`` (m, kPa) or ``"field"`` (ft, psi).
    log_fwl : (best, low, high), optional
        FWL from log Sw, TVDSS [m], drawn for comparison.

    Returns
    -------
    matplotlib.figure.Figure
    """
    lu = UNIT_SYSTEMS[units]["length"]
    pu = UNIT_SYSTEMS[units]["pressure"]
    f = factor(lu, "length")
    fp = factor(pu, "pressure")
    pts = zp.points
    fig = _figure((7.0, 7.5))
    ax = fig.add_subplot(1, 1, 1)
    used = np.zeros(len(pts), bool)
    for lf in zp.lines.values():
        used[lf.used] = True
    for fluid in ("water", "oil", "gas", "unknown"):
        m = pts.fluid == fluid
        if not m.any():
            continue
        col = _FLUID_COLOURS[fluid]
        mk = _FLUID_MARKERS[fluid]
        on = m & used
        off = m & ~used
        if on.any():
            ax.plot(pts.pressure[on] / fp, pts.tvdss[on] / f, ls="none", marker=mk, color=col,
                    label=f"{fluid} points")
        if off.any():
            ax.plot(pts.pressure[off] / fp, pts.tvdss[off] / f, ls="none", marker=mk,
                    mfc="none", color=col,
                    label=f"{fluid} points not fitted" if fluid != "unknown" else "unknown fluid")
    levels = [lv for lv in (zp.fwl, zp.free_oil_level) if lv is not None]
    zs = list(pts.tvdss) + [lv.depth for lv in levels]
    zmin, zmax = min(zs), max(zs)
    pad = 0.1 * (zmax - zmin) + 1.0
    zz = np.array([zmin - pad, zmax + pad])
    for fluid, lf in zp.lines.items():
        ax.plot(lf.pressure_at(zz) / fp, zz / f, color=_FLUID_COLOURS[fluid], lw=1.2,
                label=f"{fluid}: {lf.density / 1000:.4f} g/cm3")
    for lv, ls in zip(levels, ("-", "--")):
        ax.axhline(lv.depth / f, color="black", lw=1.0, ls=ls,
                   label=f"{lv.kind} {lv.depth / f:.2f} {lu}")
        if lv.low is not None and lv.high is not None and lv.high > lv.low:
            ax.axhspan(lv.low / f, lv.high / f, color="#BBBBBB", alpha=0.5)
    if log_fwl is not None:
        b, lo, hi = log_fwl
        ax.axhline(b / f, color="#CC79A7", lw=1.2, ls=":", label=f"FWL from log Sw {b / f:.2f} {lu}")
        ax.axhspan(lo / f, hi / f, color="#CC79A7", alpha=0.2)
    ax.set_ylim(zz[1] / f, zz[0] / f)
    ax.set_xlabel(f"pressure [{pu}]")
    ax.set_ylabel(f"TVDSS [{lu}]")
    ax.set_title("Pressure versus depth" + (f": {safe_text(zp.zone)}" if zp.zone else ""))
    ax.grid(True, color="#DDDDDD", lw=0.6)
    ax.legend(loc="upper right", fontsize=8, framealpha=0.9)
    fig.tight_layout()
    return fig
