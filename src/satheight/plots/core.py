"""Plots of core capillary-pressure data and the fitted functions.

:func:`j_sw_plot`: J (log scale) against Sw, plug points coloured by rock type
(marker by lab system) and each rock type's fitted curves (selected family solid,
the other J families thin dashed).

:func:`pc_plot`: lab Pc against Sw for every plug, and per rock type with known
reservoir fluids the converted reservoir Pc against Sw with the equivalent height
above the FWL on a secondary axis.

Figures use :class:`matplotlib.figure.Figure` with the Agg canvas (no pyplot
state) and are returned; the caller writes them.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

if TYPE_CHECKING:  # matplotlib is imported where a figure is drawn (~0.3 s at start)
    from matplotlib.figure import Figure

from .. import constants as C
from ..coreplugs import CorePoints
from ..models import get_family
from .style import DPI, series_style
from .text import safe_text

__all__ = ["j_sw_plot", "pc_plot"]

_MARKERS = {"mercury_air": "o", "air_brine": "s", "gas_brine": "D", "oil_brine": "^", "air_oil": "v"}


def _colours(names):
    """Colour-blind-safe colour of each rock type (see :mod:`satheight.plots.style`)."""
    return {n: series_style(i)[0] for i, n in enumerate(names)}


def _figure(figsize) -> Figure:
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=figsize, dpi=DPI)
    FigureCanvasAgg(fig)
    return fig


def _rock_names(points: CorePoints):
    return list(dict.fromkeys(str(x) or "all" for x in points.rock_type))


def j_sw_plot(points: CorePoints, fits: dict) -> Figure:
    """J versus Sw with plug points coloured by rock type and the fitted curves.

    Parameters
    ----------
    points : CorePoints
    fits : dict
        Output of :func:`satheight.coreplugs.fit_rock_types`.

    Returns
    -------
    matplotlib.figure.Figure
    """
    fig = _figure((8.0, 6.0))
    ax = fig.add_subplot(1, 1, 1)
    names = _rock_names(points)
    colours = _colours(names)
    labels = np.array([str(x) or "all" for x in points.rock_type], dtype=object)
    ok = np.isfinite(points.j) & (points.j > 0)
    for rt in names:
        for system in dict.fromkeys(points.system.tolist()):
            m = ok & (labels == rt) & (points.system == system)
            if m.any():
                ax.scatter(points.sw[m], points.j[m], s=14, color=colours[rt],
                           marker=_MARKERS.get(system, "o"), alpha=0.75,
                           label=f"{safe_text(rt)} ({safe_text(system).replace('_', '-')})")
    if ok.any():
        jgrid = np.geomspace(points.j[ok].min(), points.j[ok].max(), 300)
        for rt in names:
            e = fits.get(rt)
            if not e:
                continue
            for fam, rep in e["fits"].items():
                if rep.variable != "j":
                    continue
                fn = get_family(fam).from_params(rep.params)
                selected = fam == e["selected"]
                ax.plot(fn.predict(jgrid), jgrid, color=colours[rt],
                        lw=2.0 if selected else 0.8, ls="-" if selected else "--",
                        label=f"{safe_text(rt)}: {fam}" + (" (selected)" if selected else ""))
    ax.set_yscale("log")
    ax.set_xlim(0.0, 1.0)
    ax.set_xlabel("Sw (wetting-phase saturation) [fraction]")
    ax.set_ylabel("Leverett J [-]")
    ax.set_title("Core J versus Sw by rock type, with fitted functions")
    ax.grid(True, which="both", alpha=0.3)
    ax.legend(fontsize=7, loc="upper right")
    fig.tight_layout()
    return fig


def pc_plot(points: CorePoints, reservoir: dict) -> Figure:
    """Lab Pc and converted reservoir Pc versus Sw, with height above the FWL.

    Parameters
    ----------
    points : CorePoints
    reservoir : dict
        Rock type (or ``"*"``) -> :class:`satheight.workflows.fit.ReservoirFluids`.

    Returns
    -------
    matplotlib.figure.Figure
    """
    names = _rock_names(points)
    colours = _colours(names)
    labels = np.array([str(x) or "all" for x in points.rock_type], dtype=object)
    with_res = [rt for rt in names if np.isfinite(points.pc_res[labels == rt]).any()]
    n = 1 + len(with_res)
    fig = _figure((5.0 * n, 5.0))
    ax = fig.add_subplot(1, n, 1)
    for pid in dict.fromkeys(points.plug.tolist()):  # one line per plug
        for system in dict.fromkeys(points.system[points.plug == pid].tolist()):
            m = (points.plug == pid) & (points.system == system)
            rt = labels[m][0]
            ax.plot(points.sw[m], points.pc_lab[m] / C.PSI, color=colours[rt],
                    marker=_MARKERS.get(system, "o"), ms=3, lw=0.8)
    for rt in names:
        ax.plot([], [], color=colours[rt], label=safe_text(rt))
    ax.set_yscale("log")
    ax.set_xlim(0.0, 1.0)
    ax.set_xlabel("Sw [fraction]")
    ax.set_ylabel("lab Pc [psi]")
    ax.set_title("Lab capillary pressure (closure-corrected)")
    ax.grid(True, which="both", alpha=0.3)
    ax.legend(fontsize=7)
    for i, rt in enumerate(with_res, start=2):
        a = fig.add_subplot(1, n, i)
        m = labels == rt
        for pid in dict.fromkeys(points.plug[m].tolist()):
            mm = m & (points.plug == pid)
            a.plot(points.sw[mm], points.pc_res[mm] / C.PSI, color=colours[rt], marker="o",
                   ms=3, lw=0.8)
        a.set_xlim(0.0, 1.0)
        a.set_xlabel("Sw [fraction]")
        a.set_ylabel("reservoir Pc [psi]")
        a.grid(True, alpha=0.3)
        fluids = reservoir.get(rt, reservoir.get("*"))
        title = f"{safe_text(rt)}: reservoir Pc"
        if fluids is not None:
            title += f" (σcosθ {fluids.sigma_cos_theta * 1e3:g} mN/m)"
        finite = points.pc_res[m][np.isfinite(points.pc_res[m])]
        top = np.percentile(finite, 80) / C.PSI if finite.size else 1.0
        a.set_ylim(0.0, top)
        if fluids is not None and fluids.delta_rho:
            k = C.PSI / (fluids.delta_rho * C.STANDARD_GRAVITY)   # psi -> m
            sec = a.secondary_yaxis("right", functions=(lambda p, k=k: p * k,
                                                         lambda h, k=k: h / k))
            sec.set_ylabel(f"height above FWL [m] (Δρ {fluids.delta_rho:g} kg/m³)")
        a.set_title(title, fontsize=9)
    fig.tight_layout()
    return fig
