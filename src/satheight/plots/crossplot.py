"""Per-zone crossplot: log Sw against height above the FWL and against J, all wells.

Every well's log Sw in one zone is drawn against its height above the free-water
level (left) and its Leverett J (right), coloured by well; over the points, the
zone's model: Sw(h) for a few representative sqrt(k/phi) classes (P10, P50 and P90
of the zone's samples by default) computed by the engine exactly as for a log
sample, and the zone's J-Sw function(s) against J. This is the view a reviewer
uses to judge the model and the contacts.

:func:`crossplot_data` takes what the figure needs from a well's result (thinned),
so a run keeps only that between wells; :func:`zone_crossplot` returns the figure.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

import numpy as np

if TYPE_CHECKING:  # matplotlib is imported where a figure is drawn (~0.3 s at start)
    from matplotlib.figure import Figure

from ..engine import compute_shm
from ..errors import UnitError
from ..units import UNIT_SYSTEMS, factor
from .style import BLACK, DPI, GREY, PAGES, series_style
from .text import safe_text

__all__ = ["CrossplotWell", "crossplot_data", "zone_crossplot", "zone_crossplots", "model_curves"]

#: Percentiles of sqrt(k/phi) whose model curves are drawn (P10, P50, P90).
CLASS_PERCENTILES = (10.0, 50.0, 90.0)
_CLASS_STYLES = ("--", "-", ":")
#: Most samples kept per well for the crossplot (every n-th sample beyond).
MAX_POINTS = 20_000
#: Most wells named in the legend.
_LEGEND_WELLS = 24


@dataclass
class CrossplotWell:
    """The samples of one well that the crossplots draw (SI units).

    Attributes
    ----------
    name : str
    zones : list of satheight.engine.ZoneModel
        The well's zones; ``zone`` indexes them.
    zone : numpy.ndarray of int
        Zone index of each sample (-1: none).
    hafwl : numpy.ndarray
        Height above the FWL [m].
    j : numpy.ndarray
        Leverett J [-].
    sw_log : numpy.ndarray
        Log water saturation [fraction].
    phi, k : numpy.ndarray
        Porosity [fraction] and permeability [m^2].
    """

    name: str
    zones: list
    zone: np.ndarray
    hafwl: np.ndarray
    j: np.ndarray
    sw_log: np.ndarray
    phi: np.ndarray
    k: np.ndarray


def crossplot_data(result, max_points: int = MAX_POINTS) -> CrossplotWell | None:
    """The zone samples of a well with log Sw, thinned to ``max_points``; None without log Sw."""
    if result.sw_log is None:
        return None
    zone = np.asarray(result.shm.zone)
    sw_log = np.asarray(result.sw_log, dtype=float)
    h = np.asarray(result.shm.hafwl, dtype=float)
    keep = np.flatnonzero((zone >= 0) & np.isfinite(sw_log) & np.isfinite(h))
    keep = keep[:: max(1, -(-keep.size // max_points))]

    def take(a):
        return np.asarray(a, dtype=float)[keep]

    return CrossplotWell(name=result.well.name, zones=list(result.zones),
                         zone=zone[keep].astype(np.int64), hafwl=take(h), j=take(result.shm.j),
                         sw_log=take(sw_log), phi=take(result.phi), k=take(result.k))


def _zone_samples(wells, zone_name: str):
    """Per well, the mask of its samples in the zone named ``zone_name``."""
    out = []
    for w in wells:
        idx = [i for i, z in enumerate(w.zones) if z.name == zone_name]
        out.append(np.isin(w.zone, idx))
    return out


def class_roots(wells, masks, percentiles=CLASS_PERCENTILES) -> np.ndarray:
    """sqrt(k/phi) [m] at the given percentiles of the zone's samples (all wells pooled)."""
    with np.errstate(invalid="ignore", divide="ignore"):
        roots = np.concatenate([np.sqrt(w.k[m] / w.phi[m]) for w, m in zip(wells, masks)]
                               or [np.empty(0)])
    roots = roots[np.isfinite(roots) & (roots > 0)]
    if roots.size == 0:
        return np.empty(0)
    return np.percentile(roots, percentiles)


def model_curves(zone, roots, phi: float, h) -> np.ndarray:
    """Model Sw [fraction] at heights ``h`` [m] above the FWL for each sqrt(k/phi) in ``roots``.

    The zone's saturation-height model is evaluated by the engine
    (:func:`satheight.engine.compute_shm`) at TVDSS ``fwl - h`` with porosity ``phi``
    [fraction] and permeability ``k = roots**2 * phi`` [m^2], the zone window opened
    to every height, so a rock type chosen by permeability or FZI and a gas cap are
    handled as for a log sample.

    Returns
    -------
    numpy.ndarray
        Shape ``(len(roots), len(h))``.
    """
    h = np.asarray(h, dtype=float)
    open_zone = replace(zone, top=-np.inf, base=np.inf)
    roots = np.asarray(roots, dtype=float)
    tvdss = np.tile(zone.fwl - h, roots.size)
    k = np.repeat(roots ** 2 * phi, h.size)
    res = compute_shm(tvdss, np.full(tvdss.shape, phi), k, [open_zone])
    return res.sw.reshape(roots.size, h.size)


def _functions(zone) -> dict:
    """The zone's J-Sw functions by rock type (one unnamed entry without rock types)."""
    if zone.rock_functions:
        return dict(zone.rock_functions)
    return {"": zone.function}


def _rock_label(zone, phi: float, root: float) -> str:
    """`` (rock type X)`` for a class of a zone with rock types, else empty."""
    if not zone.rock_functions or zone.rock_classifier is None:
        return ""
    name = np.asarray(zone.rock_classifier(np.array([phi]), np.array([root ** 2 * phi])))[0]
    return f" ({safe_text(name, 16)})"


def _scatter(ax_h, ax_j, wells, masks, scale: float) -> list:
    """Every well's log Sw against height and J; legend handles of the wells."""
    from matplotlib.lines import Line2D

    handles = []
    for i, (w, m) in enumerate(zip(wells, masks)):  # one pass per well
        if not m.any():
            continue
        colour, marker = series_style(i)
        kw = dict(s=7, color=colour, marker=marker, alpha=0.55, linewidths=0, zorder=2)
        ax_h.scatter(w.sw_log[m], w.hafwl[m] / scale, **kw)
        j = w.j[m]
        ok = np.isfinite(j) & (j > 0)
        ax_j.scatter(w.sw_log[m][ok], j[ok], **kw)
        handles.append(Line2D([], [], ls="none", marker=marker, ms=5, color=colour,
                              label=safe_text(w.name)))
    if len(handles) > _LEGEND_WELLS:
        handles = handles[:_LEGEND_WELLS] + [Line2D([], [], ls="none",
                                                    label=f"... {len(handles)} wells")]
    return handles


def _draw_models(ax_h, ax_j, zone, wells, masks, scale: float, h_top: float, roots) -> list:
    """Model Sw(h) per sqrt(k/phi) class and Sw(J) per function; legend handles."""
    from matplotlib.lines import Line2D

    handles = []
    phis = np.concatenate([w.phi[m] for w, m in zip(wells, masks)] or [np.empty(0)])
    phis = phis[np.isfinite(phis) & (phis > 0) & (phis <= 1)]
    roots = class_roots(wells, masks) if roots is None else np.asarray(roots, float)
    if phis.size and roots.size:
        phi = float(np.median(phis))
        h = np.linspace(0.0, h_top, 301)
        sw = model_curves(zone, roots, phi, h)
        names = ([f"P{p:g}" for p in CLASS_PERCENTILES] if roots.size == len(CLASS_PERCENTILES)
                 else [f"class {i + 1}" for i in range(roots.size)])
        for i, (r, name) in enumerate(zip(roots, names)):
            ls = _CLASS_STYLES[i % len(_CLASS_STYLES)]
            label = (f"Model, {name} \u221a(k/\u03c6) = {r * 1e6:.3g} \u00b5m"
                     f"{_rock_label(zone, phi, r)}")
            ax_h.plot(sw[i], h / scale, color=BLACK, ls=ls, lw=1.6, zorder=4, label=label)
            handles.append(Line2D([], [], color=BLACK, ls=ls, lw=1.6, label=label))
    jg = np.geomspace(*ax_j.get_ylim(), 300)
    for i, (rock, fn) in enumerate(_functions(zone).items()):
        if fn.variable != "j":
            continue
        ls = _CLASS_STYLES[i % len(_CLASS_STYLES)]
        label = f"J-Sw function {safe_text(rock, 16)}".rstrip() + f" ({safe_text(fn.name, 20)})"
        ax_j.plot(fn.predict(jg), jg, color=GREY, ls=ls, lw=1.6, zorder=4)
        handles.append(Line2D([], [], color=GREY, ls=ls, lw=1.6, label=label))
    return handles


#: gid of the minor ticks drawn as one line collection.
MINOR_TICKS_GID = "minor ticks"


def _minor_ticks_as_lines(ax) -> None:
    """The y scale's minor ticks as one line collection instead of one tick object each.

    The same marks (the minor locator's values in view, less those on a major tick;
    rcParams length, width and colour, outside the left edge), drawn in one call: on
    the log J scale the tick objects were a large part of the figure's drawing time.
    Call it once the y limits are final.
    """
    from matplotlib import rcParams
    from matplotlib.collections import LineCollection
    from matplotlib.ticker import NullLocator

    axis = ax.yaxis
    lo, hi = sorted(ax.get_ylim())
    minor = np.asarray(axis.get_minor_locator()(), dtype=float)
    major = np.asarray(axis.get_major_locator()(), dtype=float)
    tr = axis.get_transform()
    t_lo, t_hi = sorted(tr.transform(np.array([lo, hi])))
    t_min, t_maj = tr.transform(minor), tr.transform(major)
    on_major = np.isclose(t_min[:, None], t_maj[None, :], atol=(t_hi - t_lo) * 1e-5,
                          rtol=0).any(axis=1) if major.size else np.zeros(minor.size, bool)
    ys = minor[~on_major & (minor >= lo) & (minor <= hi)]
    axis.set_minor_locator(NullLocator())
    width_in = ax.get_position().width * ax.figure.get_size_inches()[0]
    length = rcParams["ytick.minor.size"] / 72.0 / width_in          # [axes fraction]
    segs = np.stack([np.column_stack([np.full_like(ys, -length), ys]),
                     np.column_stack([np.zeros_like(ys), ys])], axis=1)
    ax.add_collection(LineCollection(segs, colors=rcParams["ytick.color"], clip_on=False,
                                     linewidths=rcParams["ytick.minor.width"], gid=MINOR_TICKS_GID,
                                     transform=ax.get_yaxis_transform()), autolim=False)


def zone_crossplot(zone, wells, units: str = "metric", roots=None, page: str = "screen",
                   title: str | None = None) -> Figure:
    """Log Sw against height above the FWL and against J for one zone, every well.

    Parameters
    ----------
    zone : satheight.engine.ZoneModel
        The zone's model (any well's: the function, fluids and FWL are the zone's).
    wells : sequence of CrossplotWell
        Wells with samples (those without samples in the zone are left out).
    units : {"metric", "field"}
        Height in m or ft.
    roots : sequence of float, optional
        sqrt(k/phi) [m] of the model curves; default P10, P50, P90 of the zone's samples.
    page : {"screen", "a4"}
        Screen page (13.3 x 7.5 inch) or A4 landscape.
    title : str, optional
        Default ``"<zone>: log Sw against height above the FWL and J"``.

    Returns
    -------
    matplotlib.figure.Figure
    """
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    if units not in UNIT_SYSTEMS:
        raise UnitError(f"unknown unit system {units!r}", where="units",
                        hint="use 'metric' (m) or 'field' (ft)")
    unit = UNIT_SYSTEMS[units]["length"]
    scale = factor(unit, "length")
    wells = list(wells)
    masks = _zone_samples(wells, zone.name)
    size = PAGES["screen"] if page == "screen" else PAGES["a4"][::-1]
    fig = Figure(figsize=size, dpi=DPI)
    FigureCanvasAgg(fig)
    ax_h = fig.add_axes((0.07, 0.30, 0.40, 0.60))
    ax_j = fig.add_axes((0.56, 0.30, 0.40, 0.60))
    hs = np.concatenate([w.hafwl[m] for w, m in zip(wells, masks)] or [np.empty(0)])
    h_top = float(np.nanmax(hs)) * 1.05 if hs.size and np.nanmax(hs) > 0 else 100.0 * scale
    js = np.concatenate([w.j[m] for w, m in zip(wells, masks)] or [np.empty(0)])
    js = js[np.isfinite(js) & (js > 0)]
    jlo, jhi = (js.min(), js.max()) if js.size else (1e-2, 1e2)
    ax_j.set_yscale("log")
    ax_j.set_ylim(10.0 ** np.floor(np.log10(jlo)), 10.0 ** np.ceil(np.log10(jhi) + 1e-9))
    handles = _scatter(ax_h, ax_j, wells, masks, scale)
    handles += _draw_models(ax_h, ax_j, zone, wells, masks, scale, h_top, roots)
    for ax in (ax_h, ax_j):
        ax.set_xlim(0.0, 1.0)
        ax.set_xlabel("Water saturation Sw [fraction]", fontsize=9)
        ax.grid(True, which="major", color="#D9D9D9", lw=0.6)
    ax_h.set_ylim(min(0.0, float(np.nanmin(hs)) / scale if hs.size else 0.0), h_top / scale)
    ax_h.axhline(0.0, color=GREY, lw=0.8)
    ax_h.set_ylabel(f"Height above FWL [{unit}]", fontsize=9)
    ax_j.set_ylabel("Leverett J [-]", fontsize=9)
    # y given: no tick labels at the top, so the title sits on the top edge; matplotlib
    # would otherwise measure every tick label at each draw to find that out
    ax_h.set_title("Log Sw against height above the FWL", fontsize=10, y=1.0)
    ax_j.set_title("Log Sw against J", fontsize=10, y=1.0)
    name = safe_text(zone.name)
    fig.suptitle(safe_text(title, 100) if title is not None else
                 f"{name}: log Sw against height above the FWL and J", fontsize=12)
    fig.legend(handles=handles, loc="lower center", bbox_to_anchor=(0.5, 0.01), ncol=4,
               fontsize=7, frameon=False)
    _minor_ticks_as_lines(ax_j)
    return fig


def zone_crossplots(wells, units: str = "metric", page: str = "screen"):
    """``(zone name, figure)`` for every zone with log Sw samples, in the wells' zone order.

    ``wells`` are :class:`CrossplotWell` items (None items are skipped); each zone's
    model is taken from the first well that has samples in it. One figure is built
    at a time, so a caller can write and drop each before the next.
    """
    wells = [w for w in wells if w is not None]
    order: dict[str, object] = {}
    for w in wells:  # one pass per well and zone
        present = set(np.unique(w.zone).tolist())
        for i, z in enumerate(w.zones):
            if i in present:
                order.setdefault(z.name, z)
    for name, zone in order.items():
        yield name, zone_crossplot(zone, wells, units=units, page=page)
