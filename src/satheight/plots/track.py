"""Track plot of one well: logs, saturation-height results and zones against depth.

:func:`track_plot` draws, left to right, gamma ray (when the well has a ``GR``
curve), porosity with permeability (and core plug porosity and permeability when
given), deep resistivity (when present), formation pressures (when given, with the
FWL they imply), water saturation (log Sw over the saturation-height Sw, their
difference and the hydrocarbon shaded, core plug Sw when given) and height above
the free-water level with the Leverett J on a fixed scale (:mod:`satheight.plots.track_points`
draws the measured points). Zone windows are shaded
across every track, each zone's FWL is drawn as a line, and flagged samples are
marked in the saturation track. By default only the zones with a margin are shown.

Curves and fills are thinned to the figure's resolution with a min/max envelope
(:mod:`satheight.plots.decimate`). Figures are built on
:class:`matplotlib.figure.Figure` with the Agg canvas, so no global matplotlib
state (pyplot, backend choice) is touched. The figure is returned; writing it is
the caller's job.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

if TYPE_CHECKING:  # matplotlib is imported where a figure is drawn (~0.3 s at start)
    from matplotlib.figure import Figure

from ..errors import DepthError, SatHeightError, UnitError
from ..results import WellResult
from ..units import SHOWN_DECIMALS, UNIT_SYSTEMS, factor
from .depth_scale import OTHER_TITLE_GID, draw_scale, multiples, title_position
from .depths import level_crossings, mapping, monotone_pairs
from .style import DPI, GREY, PAGES
from .text import safe_text
from .track_curves import (J_RANGE, draw_flags, draw_gr, draw_height, draw_phik, draw_rt,
                           draw_sw, draw_sw_band, hydrocarbon_kind)
from .track_frame import GRID_COLOUR, Frame, finite_range, number
from .track_levels import draw_free_oil_levels, draw_fwls, draw_zones, zone_depths
from .track_points import count_outside, draw_core, draw_pressures

__all__ = ["track_plot", "DepthPoints", "DPI", "depth_ticks"]

_DEPTH_AXES = ("md", "tvdss")
_INTERVALS = ("zones", "all")

# Layout [inch].
_LEFT = 1.75        # room for the two depth scales
_RIGHT = 1.35       # room for zone names
_TOP = 1.75         # title and the two stacked scale headers of each track
_BOTTOM = {"screen": 1.05, "a4": 1.5}   # legend
_GAP = 0.22
_HEIGHT_LIMITS = (10.0, 30.0)
_METRES_PER_INCH = 25.0
#: Margin above and below the zones of interest [m].
MARGIN_M = 20.0
#: Smallest distance between two labelled depths [inch]; closer ones take a coarser step.
_MIN_LABEL_GAP = 0.3


@dataclass(frozen=True)
class DepthPoints:
    """Values measured at points: core plug Sw [fraction] or formation pressure [Pa].

    Attributes
    ----------
    depth : numpy.ndarray
        Depth of each point [m], positive down.
    value : numpy.ndarray
        The measured value (Sw [fraction] or pressure [Pa]).
    reference : {"md", "tvdss"}
        Which depth ``depth`` is: measured depth or TVDSS.
    label : str
        Legend text (escaped when drawn).
    kind : numpy.ndarray of str, optional
        Fluid of each pressure point (``water``, ``oil``, ``gas``, ``unknown``): its colour.
    unused : numpy.ndarray of bool, optional
        True where a pressure point is left out of the gradient fit (drawn hollow).
    """

    depth: np.ndarray
    value: np.ndarray
    reference: str = "md"
    label: str = ""
    kind: np.ndarray | None = None
    unused: np.ndarray | None = None


def depth_ticks(units: str, span: float, height: float) -> tuple[float, float]:
    """(minor, major) depth tick steps [display unit] for a window of ``span`` on ``height`` inches.

    Ticks every 10 m with labels every 50 m (metric), every 50 ft with labels every
    100 ft (field) (common practice); when the labels would fall closer than 0.3 inch
    both steps grow by 2, 5, 10, ... times.
    """
    minor, major = (10.0, 50.0) if units == "metric" else (50.0, 100.0)
    per_inch = span / height if height > 0 else 0.0
    for k in (1, 2, 5, 10, 20, 50, 100, 200, 500, 1000):
        if major * k >= _MIN_LABEL_GAP * per_inch:
            return minor * k, major * k
    return minor * 1000, major * 1000


# ------------------------------------------------------------------- checking


def _checked_depths(result: WellResult, depth_axis: str, units: str, interval: str, page: str):
    """Validate the arguments and the result's shapes; MD and TVDSS arrays [m]."""
    for value, allowed, name, err in ((depth_axis, _DEPTH_AXES, "depth axis", DepthError),
                                      (units, tuple(UNIT_SYSTEMS), "unit system", UnitError),
                                      (interval, _INTERVALS, "interval", SatHeightError),
                                      (page, tuple(PAGES), "page size", SatHeightError)):
        if value not in allowed:
            raise err(f"unknown {name} {value!r}", where=name.replace(" ", "_"),
                      hint="use one of " + ", ".join(map(repr, allowed)))
    md = np.asarray(result.well.md, dtype=float)
    tvdss = np.asarray(result.tvdss, dtype=float)
    n = md.size
    shm = result.shm
    where = f"well {result.well.name!r}"
    for name, arr in (("tvdss", tvdss), ("phi", result.phi), ("k", result.k),
                      ("shm.sw", shm.sw), ("shm.hafwl", shm.hafwl), ("shm.j", shm.j),
                      ("shm.flag", shm.flag), ("shm.zone", shm.zone),
                      ("rt", result.rt), ("sw_log", result.sw_log)):
        if arr is not None and np.shape(arr) != (n,):
            raise SatHeightError(f"result array {name} has shape {np.shape(arr)}, expected ({n},)",
                                 where=where, hint="rebuild the result from one well's samples")
    if n == 0 or not np.isfinite(md).any():
        raise DepthError("the well has no depth samples to plot", where=where,
                         hint="check the depth index of the LAS file")
    if depth_axis == "tvdss" and not _any_pair(md, tvdss):
        raise DepthError("TVDSS is missing at every sample, cannot plot against TVDSS",
                         where=where, hint="give a deviation survey or plot with depth_axis='md'")
    return md, tvdss


def _checked_band(sw_band, result: WellResult) -> dict | None:
    """The SW_P10 / SW_P90 curves of a Monte Carlo as float arrays of the well's length."""
    if sw_band is None:
        return None
    n = np.asarray(result.well.md).size
    out = {}
    for name in ("SW_P10", "SW_P90"):
        if name not in sw_band or np.shape(sw_band[name]) != (n,):
            raise SatHeightError(f"sw_band needs {name} with one value per sample ({n})",
                                 where=f"well {result.well.name!r}",
                                 hint="pass the Monte Carlo's sw_percentiles")
        out[name] = np.asarray(sw_band[name], dtype=float)
    return out


def _any_pair(md, tvdss) -> bool:
    """True when some sample has both MD and TVDSS (``monotone_pairs`` then keeps one)."""
    return bool(np.any(np.isfinite(md) & np.isfinite(tvdss)))


def _gr_curve(result: WellResult):
    """The well's GR curve (any case) or None when absent or of the wrong length."""
    for key, curve in result.well.curves.items():
        if key.strip().lower() == "gr":
            data = np.asarray(curve.data, dtype=float)
            if data.shape == result.well.md.shape:
                return curve, data
    return None


# --------------------------------------------------------------------- layout


def _track_list(result: WellResult, gr, pressures) -> list[tuple[str, float]]:
    """(key, width [inch]) of each track, left to right."""
    tracks = [("gr", 1.45)] if gr is not None else []
    tracks.append(("phik", 1.9))
    if result.rt is not None:
        tracks.append(("rt", 1.55))
    if pressures is not None:
        tracks.append(("p", 1.45))
    tracks += [("sw", 1.9), ("h", 1.8)]
    return tracks


def _window(y_si, md, tvdss, have_tvdss, zones, depth_axis, interval, margin):
    """Plot-depth window [m]: the whole log, or the zones and their levels with a margin."""
    lo, hi = finite_range(y_si)
    if interval == "all" or not zones:
        return lo, hi
    ends = []
    for z in zones:  # one pass per zone
        for a, b in zone_depths(depth_axis, md, tvdss, have_tvdss, z):
            ends += [a, b]
        for level in (number(z.fwl), number(z.gas_oil_level)):
            if not np.isfinite(level):
                continue
            if depth_axis == "tvdss":
                ends.append(level)
            elif have_tvdss:
                ends += level_crossings(md, tvdss, level).tolist()
    ends = [e for e in ends if lo - margin <= e <= hi + margin]
    if not ends:
        return lo, hi
    a, b = max(lo, min(ends) - margin), min(hi, max(ends) + margin)
    return (a, b) if b > a else (lo, hi)


def _selection(y: np.ndarray, top: float, base: float) -> np.ndarray:
    """Indices of samples inside [top, base] and one either side (lines reach the edges)."""
    inside = (y >= top) & (y <= base)
    near = inside.copy()
    near[:-1] |= inside[1:]
    near[1:] |= inside[:-1]
    return np.flatnonzero(near)


def _figure_size(tracks, length_m: float, page: str) -> tuple[float, float, float]:
    """(width, height [inch], track-width factor) of the figure."""
    widths = sum(w for _, w in tracks) + _GAP * (len(tracks) - 1)
    if page == "a4":
        fig_w, fig_h = PAGES["a4"]
        return fig_w, fig_h, (fig_w - _LEFT - _RIGHT) / widths
    fig_h = float(np.clip(_TOP + _BOTTOM[page] + length_m / _METRES_PER_INCH, *_HEIGHT_LIMITS))
    return _LEFT + widths + _RIGHT, fig_h, 1.0


#: gid of the minor depth ticks (one line collection, not one tick object each).
MINOR_TICKS_GID = "depth minor ticks"


def _minor_ticks(ax, top: float, base: float, minor: float, major: float) -> None:
    """Short tick marks every ``minor`` step on the depth scale, outside the track's left edge."""
    from matplotlib.collections import LineCollection

    ys = np.arange(np.ceil(top / minor) * minor, base + minor * 1e-9, minor)
    ys = ys[np.abs(np.remainder(ys + 0.5 * minor, major) - 0.5 * minor) > 1e-6 * minor]
    length = 2.0 / 72.0 / (ax.get_position().width * ax.figure.get_size_inches()[0])  # 2 pt
    segs = np.stack([np.column_stack([np.full_like(ys, -length), ys]),
                     np.column_stack([np.zeros_like(ys), ys])], axis=1)
    ax.add_collection(LineCollection(segs, colors="black", linewidths=0.6, clip_on=False,
                                     transform=ax.get_yaxis_transform(), gid=MINOR_TICKS_GID))


def _depth_grid(ax, top: float, base: float, minor: float, major: float) -> None:
    """Horizontal grid lines at every minor and major depth step, as two line collections.

    Each collection holds one path whose lines are separated by NaN gaps: one path
    object per line would cost more than drawing them (about 700 lines per track).
    The path is snapped to whole pixels as each line alone would be (matplotlib
    snaps a path by itself only up to 1024 vertices), so the pixels are the same.
    """
    from matplotlib.collections import LineCollection

    for step, lw in ((minor, 0.3), (major, 0.7)):
        ys = np.arange(np.ceil(top / step) * step, base + step * 1e-9, step)
        xs = np.tile([0.0, 1.0, np.nan], ys.size)
        path = np.column_stack([xs, np.where(np.isnan(xs), np.nan, np.repeat(ys, 3))])
        ax.add_collection(LineCollection([path], colors=GRID_COLOUR, linewidths=lw, zorder=0.5,
                                         snap=True,   # as each line alone would be
                                         transform=ax.get_yaxis_transform()))


def _frame(result: WellResult, md, tvdss, depth_axis: str, units: str, tracks,
           interval: str, page: str) -> Frame:
    """The figure with one axes per track sharing the depth scale (depth down)."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure
    from matplotlib.ticker import NullLocator

    length_unit = UNIT_SYSTEMS[units]["length"]
    scale = factor(length_unit, "length")  # display unit -> m
    y_si = md if depth_axis == "md" else tvdss
    have_tvdss = _any_pair(md, tvdss)
    top, base = _window(y_si, md, tvdss, have_tvdss, list(result.zones or []), depth_axis,
                        interval, MARGIN_M)
    y_top, y_base = top / scale, base / scale
    if y_base - y_top <= 0.0:
        y_top, y_base = y_top - 1.0, y_base + 1.0
    fig_w, fig_h, k = _figure_size(tracks, (y_base - y_top) * scale, page)
    fig = Figure(figsize=(fig_w, fig_h), dpi=DPI)
    FigureCanvasAgg(fig)
    bottom = _BOTTOM[page]
    plot_h = fig_h - _TOP - bottom
    minor, major = depth_ticks(units, y_base - y_top, plot_h)
    axes, x = {}, _LEFT
    for i, (key, width) in enumerate(tracks):
        # no shared y axis: each track would build its own hidden tick objects, the
        # largest fixed cost of a figure; the limits are set alike instead
        ax = fig.add_axes((x / fig_w, bottom / fig_h, width * k / fig_w, plot_h / fig_h))
        ax.set_ylim(y_base, y_top)  # depth increases downwards
        ax.yaxis.set_minor_locator(NullLocator())
        ax.yaxis.set_major_locator(NullLocator())   # depth scales: see _depth_scales
        if i == 0:
            _minor_ticks(ax, y_top, y_base, minor, major)
        else:   # no depth scale: a hidden axis skips its tick update and layout when drawn
            ax.yaxis.set_visible(False)
        ax.grid(True, axis="x", which="major", color=GRID_COLOUR, lw=0.6, zorder=0.5)
        _depth_grid(ax, y_top, y_base, minor, major)
        axes[key] = ax
        x += (width + _GAP) * k
    sel = _selection(y_si / scale, y_top, y_base)
    return Frame(fig=fig, axes=axes, sel=sel, y=y_si[sel] / scale, scale=scale,
                 length_unit=length_unit, depth_axis=depth_axis, y_top=y_top, y_base=y_base,
                 md=md, tvdss=tvdss, have_tvdss=have_tvdss, plot_height=plot_h)


def _depth_scales(f: Frame, units: str) -> None:
    """Main depth scale on the first track; the other one as its own scale further left.

    Each scale carries its name and unit (``TVDSS [m]``, ``MD [m]``), ticks every 10 m
    and labels every 50 m (50 ft and 100 ft in field units) on its own values, so the
    two sets of numbers never sit between each other's ticks. The labelled ticks are
    drawn as a few artists (:mod:`satheight.plots.depth_scale`), not tick objects.
    """
    first = next(iter(f.axes.values()))
    primary = "MD" if f.depth_axis == "md" else "TVDSS"
    other = "TVDSS" if f.depth_axis == "md" else "MD"
    _, major = depth_ticks(units, f.y_base - f.y_top, f.plot_height)
    values = multiples(f.y_top, f.y_base, major)
    left = draw_scale(first, "main", values, values, 0.0, "black")
    first.set_ylabel(f"{primary} [{f.length_unit}]", fontsize=9, fontweight="bold")
    first.yaxis.set_label_coords(title_position(first, left), 0.5)
    md_fin, tv_fin = monotone_pairs(f.md, f.tvdss)
    if not (f.have_tvdss and md_fin.size >= 2):
        return
    if f.depth_axis == "md":
        fwd_si, inv_si = mapping(md_fin, tv_fin), mapping(tv_fin, md_fin)
    else:
        fwd_si, inv_si = mapping(tv_fin, md_fin), mapping(md_fin, tv_fin)
    ends = fwd_si(np.array([f.y_top, f.y_base]) * f.scale) / f.scale
    values = multiples(ends[0], ends[1], major)
    at = inv_si(values * f.scale) / f.scale
    keep = (at >= f.y_top - 1e-9 * major) & (at <= f.y_base + 1e-9 * major)
    width = first.get_position().width * f.fig.get_size_inches()[0]
    x = -0.85 / width                 # [axes fraction]: 0.85 inch left of the main scale
    left = draw_scale(first, "other", values[keep], at[keep], x, GREY, spine=True)
    f.fig.text(title_position(first, left), 0.5, f"{other} [{f.length_unit}]", fontsize=9,
               color=GREY, rotation=90, rotation_mode="anchor", ha="center", va="bottom",
               transform=first.transAxes, gid=OTHER_TITLE_GID)


def _points_depth(f: Frame, pts: DepthPoints) -> np.ndarray:
    """Plot depth [display unit] of measured points given in MD or TVDSS [m]."""
    d = np.asarray(pts.depth, dtype=float)
    if pts.reference == f.depth_axis:
        return d / f.scale
    md_fin, tv_fin = monotone_pairs(f.md, f.tvdss)
    if md_fin.size < 2:
        return np.full(d.shape, np.nan)
    to = mapping(tv_fin, md_fin) if pts.reference == "tvdss" else mapping(md_fin, tv_fin)
    inside = (d >= (tv_fin if pts.reference == "tvdss" else md_fin)[0]) & \
             (d <= (tv_fin if pts.reference == "tvdss" else md_fin)[-1])
    return np.where(inside, to(d), np.nan) / f.scale


def _points_note(f: Frame, core, pressures) -> list[str]:
    """Notes counting the plugs and pressure points outside the plotted depths."""
    notes = []
    for pts, what in ((next((c for c in core if c is not None), None), "core plug"),
                      (pressures, "pressure point")):
        n = 0 if pts is None else count_outside(f, _points_depth(f, pts))
        if n:
            notes.append(f"{n} {what}{'s' if n > 1 else ''}\noutside the plotted depths")
    return notes


def _level_marks(f: Frame, levels) -> list:
    """(label, plot depths, band top, band base) of each FWL the pressures imply."""
    out = []
    for label, depth, low, high in levels:
        ys = f.level_depths(float(depth))
        band = [np.nan, np.nan]
        if f.depth_axis == "tvdss" and low is not None and high is not None:
            band = [float(low) / f.scale, float(high) / f.scale]
        if ys.size:
            out.append((safe_text(label), ys, *band))
    return out


def _draw_measured(f: Frame, core, pressures, units: str, levels=()) -> None:
    """Core plugs (Sw, porosity, permeability) on their tracks and formation pressures
    (with the FWL they imply) on their own track."""
    draw_core(f, *(None if c is None else (_points_depth(f, c), np.asarray(c.value, float),
                                            safe_text(c.label)) for c in core))
    if pressures is not None:
        unit = UNIT_SYSTEMS[units]["pressure"]
        p = np.asarray(pressures.value, float) / factor(unit, "pressure")
        draw_pressures(f, _points_depth(f, pressures), p, unit, pressures.kind, pressures.unused,
                       _level_marks(f, levels), safe_text(pressures.label))


def _draw_results(f: Frame, result: WellResult, units: str, notes, j_range,
                  sw_band=None) -> None:
    """Saturation track (with flags and the Monte Carlo band) and the height / J track."""
    zones = list(result.zones or [])
    sw_log = None if result.sw_log is None else f.take(result.sw_log)
    draw_sw(f, f.take(result.shm.sw), sw_log, result.sw_log_source,
            hydrocarbon_kind(zones, np.asarray(result.shm.zone)[f.sel]))
    if sw_band is not None:
        draw_sw_band(f, f.take(sw_band["SW_P10"]), f.take(sw_band["SW_P90"]))
    draw_flags(f, np.asarray(result.shm.flag)[f.sel])
    draw_height(f, f.take(result.shm.hafwl) / f.scale, f.take(result.shm.j), units, notes,
                j_range)


def _title_and_legend(f: Frame, result: WellResult, title: str | None) -> None:
    fig_w, fig_h = f.fig.get_size_inches()
    name = safe_text(title if title is not None else result.well.name, 80)
    f.fig.text(0.5, 1.0 - 0.18 / fig_h, name, ha="center", va="top", fontsize=13,
               fontweight="bold")
    primary = "MD" if f.depth_axis == "md" else "TVDSS"
    sub = f"Depth: {primary} [{f.length_unit}]"
    if result.datum_elevation:
        dec = SHOWN_DECIMALS.get(f.length_unit.lower(), 2)      # 0.01 m, 0.1 ft
        sub += (f"; depth datum {result.datum_elevation / f.scale:.{dec}f} {f.length_unit} "
                "above sea level")
    f.fig.text(0.5, 1.0 - 0.48 / fig_h, sub, ha="center", va="top", fontsize=8, color="#444444")
    ncol = max(1, min(5, int((fig_w - 0.4) // 2.1))) if fig_w >= 9 else 4
    f.fig.legend(handles=f.handles, loc="lower center", bbox_to_anchor=(0.5, 0.05 / fig_h),
                 ncol=ncol, fontsize=6.5 if fig_w < 9 else 8, frameon=False,
                 handlelength=2.2 if fig_w >= 9 else 1.6, columnspacing=1.0)


def track_plot(result: WellResult, depth_axis: str = "tvdss", units: str = "metric",
               title: str | None = None, *, interval: str = "zones", page: str = "screen",
               j_range: tuple[float, float] = J_RANGE, core_sw: DepthPoints | None = None,
               pressures: DepthPoints | None = None, core_porosity: DepthPoints | None = None,
               core_permeability: DepthPoints | None = None, pressure_levels=(),
               sw_band: dict | None = None) -> Figure:
    """One well's track plot as a figure (the caller writes it).

    Tracks, left to right: gamma ray (only if the well has a curve named ``GR``, any
    case) in the file's unit; porosity [fraction] on 0-0.4 with permeability [mD]
    on a log scale 0.01-10,000; deep resistivity [ohm.m] on a log scale 0.2-2000
    (only if ``result.rt`` is given); formation pressure [kPa or psi] (only with
    ``pressures``); water saturation [fraction]: SHM Sw thick black under the log Sw
    (thin blue), the gap shaded sky blue where the log is wetter and vermilion where
    it is drier, the hydrocarbon between SHM Sw and 1 shaded pale by fluid, core plug
    Sw as diamonds, flagged samples marked at the left edge; height above FWL [m or
    ft] with J [-] on the log scale ``j_range`` (the same in every well); measured
    points as in :mod:`satheight.plots.track_points`. Zone windows are shaded across
    all tracks with their names at the right, and each zone's FWL is a dashed line
    labelled ``FWL <zone>`` (or a note when it lies outside the log). Depth increases
    downwards; ticks every 10 m with labels every 50 m (50 ft / 100 ft in field units).

    Parameters
    ----------
    result : WellResult
        Computed results of one well; not modified. ``result.zones`` items need
        ``name``, ``top``, ``base``, ``fwl`` and ``gas_oil_level`` (TVDSS [m],
        positive down, the last None for two-phase zones) and ``hydrocarbon``
        (``"oil"``, ``"gas"`` or ``"air"``).
    depth_axis : {"tvdss", "md"}
        Main depth scale; the other is shown as its own labelled scale further left.
        MD <-> TVDSS is interpolated between samples.
    units : {"metric", "field"}
        Depth and height shown in m (metric) or ft (field).
    title : str, optional
        Title text; the well name by default. ``$`` in it is shown as written.
    interval : {"zones", "all"}
        ``"zones"``: the zones, their FWL and free-oil levels with 20 m above and
        below (the whole log when there is no zone); ``"all"``: the whole log.
    page : {"screen", "a4"}
        ``"screen"``: width from the tracks, height from the interval (25 m per inch,
        10 to 30 inch); ``"a4"``: an A4 portrait page (210 x 297 mm).
    j_range : (float, float): limits of the J scale [-].
    core_sw, pressures, core_porosity, core_permeability : DepthPoints, optional
        Plug Sw, porosity [fraction], permeability [m^2]; pressures [Pa] (colour by
        ``kind``, hollow if ``unused``). Points outside the plot are counted in a note.
    pressure_levels : sequence of (label, TVDSS [m], interval top, base [m] or None)
    sw_band : dict, optional
        Monte Carlo ``"SW_P10"``, ``"SW_P90"`` [fraction] per sample: a grey band on the Sw
        track (SW_P90 the high-Sw edge: the P90 volume is exceeded with 90 % probability).

    Returns
    -------
    matplotlib.figure.Figure
        The figure, with an Agg canvas.

    Raises
    ------
    DepthError, UnitError, SatHeightError
        Unknown ``depth_axis`` (DepthError), ``units`` (UnitError), ``interval`` or ``page``;
        no depth samples, or TVDSS asked but all missing (DepthError); a result array or
        ``sw_band`` curve not of the well's number of samples.
    """
    md, tvdss = _checked_depths(result, depth_axis, units, interval, page)
    gr = _gr_curve(result)
    tracks = _track_list(result, gr, pressures)
    f = _frame(result, md, tvdss, depth_axis, units, tracks, interval, page)
    _depth_scales(f, units)
    notes = draw_fwls(f, draw_zones(f, zones := list(result.zones or [])))
    notes += _points_note(f, core := (core_sw, core_porosity, core_permeability), pressures)
    draw_free_oil_levels(f, zones)
    if gr is not None:
        draw_gr(f, gr)
    draw_phik(f, result.phi, result.k)
    if result.rt is not None:
        draw_rt(f, result.rt, (result.roles or {}).get("resistivity") or "RT")
    _draw_results(f, result, units, notes, j_range, _checked_band(sw_band, result))
    _draw_measured(f, core, pressures, units, pressure_levels)
    _title_and_legend(f, result, title)
    return f.fig
