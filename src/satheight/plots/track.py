"""Track plot of one well: logs, saturation-height results and zones against depth.

:func:`track_plot` draws, left to right, gamma ray (when the well has a ``GR``
curve), porosity with permeability, deep resistivity (when present), water
saturation (log Sw and the saturation-height Sw with the hydrocarbon shaded) and
height above the free-water level with the Leverett J. Zone windows are shaded
across every track, each zone's FWL is drawn as a line, and flagged samples are
marked in the saturation track.

Figures are built on :class:`matplotlib.figure.Figure` with the Agg canvas, so no
global matplotlib state (pyplot, backend choice) is touched. Files are written to
a temporary file in the target folder and renamed into place.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Callable

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure
from matplotlib.lines import Line2D
from matplotlib.patches import Patch
from matplotlib.ticker import FixedLocator, FuncFormatter, LogLocator, NullFormatter

from .. import constants as C
from ..errors import DepthError, InputFileError, SatHeightError, UnitError
from ..io.atomic import atomic_save_figure
from ..results import FLAG_NO_ZONE, WellResult
from ..units import UNIT_SYSTEMS, factor

__all__ = ["track_plot", "section_plot", "section_positions"]

#: Resolution of the written PNG [dots per inch].
DPI = 110

_DEPTH_AXES = ("md", "tvdss")

# Colour-blind-safe colours: the eight-colour set of Okabe & Ito (2008),
# "Color Universal Design", plus greys. Roles are our own choice.
_BLACK = "#000000"
_ORANGE = "#E69F00"
_SKY = "#56B4E9"
_GREEN = "#009E73"
_YELLOW = "#F0E442"
_BLUE = "#0072B2"
_VERMILLION = "#D55E00"
_PURPLE = "#CC79A7"

#: Line colour of the free-oil (gas-oil) level (reddish purple of the Okabe & Ito set).
_GOL_COLOUR = "#CC79A7"

_COLOURS = {
    "gr": _GREEN,
    "phi": _BLUE,
    "k": _VERMILLION,
    "rt": _BLACK,
    "sw_log": _BLUE,
    "sw_shm": _BLACK,
    "sw_diff": "#4D4D4D",
    "hafwl": _BLUE,
    "j": _VERMILLION,
    "fwl": _SKY,
    "flag": "#333333",
    "no_zone": "#BDBDBD",
    "zone_edge": "#A0A0A0",
    "grid": "#D9D9D9",
}
_ZONE_FILLS = ("#F3F3F3", "#E6E6E6")  # alternate so neighbouring zones stay apart
_HC_FILLS = {"oil": _ORANGE, "gas": _PURPLE, "air": _YELLOW}
_HC_OTHER = "#BBBBBB"

# Track scales (display units). Porosity [fraction], permeability [mD],
# resistivity [ohm.m], saturation [fraction].
_PHI_RANGE = (0.0, 0.4)
_K_RANGE_MD = (0.01, 1.0e4)
_RT_RANGE = (0.2, 2000.0)
_GR_DEFAULT_MAX = 150.0

# Layout [inch].
_LEFT = 1.65        # room for the two depth scales
_RIGHT = 1.35       # room for zone names
_TOP = 1.75         # title and the two stacked scale headers of each track
_BOTTOM = 0.95      # legend
_GAP = 0.22
_HEIGHT_LIMITS = (10.0, 30.0)
_METRES_PER_INCH = 25.0
_NAME_MAX = 40


@dataclass
class _Track:
    key: str
    width: float  # [inch]


# --------------------------------------------------------------------------- text


def safe_text(value, max_len: int = _NAME_MAX) -> str:
    """Text from input files made safe to draw.

    matplotlib reads text between two unescaped ``$`` as mathtext (and fails on
    unknown ``\\commands`` inside it). Escaping every ``$`` as ``\\$`` keeps the text
    out of math mode; matplotlib then shows ``\\$`` as ``$`` and every other
    backslash as it is, so the text is drawn exactly as written. Line breaks and
    tabs become blanks and very long text is shortened.
    """
    s = "" if value is None else str(value)
    s = " ".join(s.split())
    if len(s) > max_len:
        s = s[: max_len - 1] + "\u2026"
    return s.replace("$", r"\$")


# ------------------------------------------------------------------------- depths


def _monotone_pairs(x: np.ndarray, y: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Finite (x, y) pairs with x strictly increasing, keeping the first of repeats."""
    ok = np.isfinite(x) & np.isfinite(y)
    x, y = x[ok], y[ok]
    if x.size == 0:
        return x, y
    # drop samples that do not go deeper than every earlier one (flat or upturned parts)
    prev_max = np.maximum.accumulate(np.concatenate(([-np.inf], x[:-1])))
    keep = x > prev_max
    return x[keep], y[keep]


def _mapping(x: np.ndarray, y: np.ndarray) -> Callable[[np.ndarray], np.ndarray]:
    """Piecewise-linear map x -> y through the samples, extended linearly past the ends.

    ``x`` must be strictly increasing with at least one sample. Extension past the
    ends keeps a secondary axis readable when matplotlib asks for ticks just
    outside the data.
    """
    if x.size >= 2:
        s0 = (y[1] - y[0]) / (x[1] - x[0])
        s1 = (y[-1] - y[-2]) / (x[-1] - x[-2])
    else:
        s0 = s1 = 1.0

    def f(v):
        v = np.asarray(v, dtype=float)
        out = np.interp(v, x, y)
        out = np.where(v < x[0], y[0] + (v - x[0]) * s0, out)
        return np.where(v > x[-1], y[-1] + (v - x[-1]) * s1, out)

    return f


def _level_crossings(depth: np.ndarray, tvdss: np.ndarray, level: float) -> np.ndarray:
    """Plot depths where the well passes TVDSS ``level`` [m] (interpolated between samples).

    Parameters
    ----------
    depth : numpy.ndarray
        Plot depth of each sample [m] (MD or TVDSS).
    tvdss : numpy.ndarray
        TVDSS of each sample [m], positive down.
    level : float
        TVDSS of the level [m].
    """
    d = tvdss - level
    ok = np.isfinite(d) & np.isfinite(depth)
    depth, d = depth[ok], d[ok]
    if d.size == 0:
        return np.empty(0)
    exact = depth[d == 0.0]
    i = np.flatnonzero(d[:-1] * d[1:] < 0.0)
    frac = d[i] / (d[i] - d[i + 1])
    between = depth[i] + frac * (depth[i + 1] - depth[i])
    return np.unique(np.concatenate((exact, between)))


def _zone_intervals(depth: np.ndarray, tvdss: np.ndarray, top: float,
                    base: float) -> list[tuple[float, float]]:
    """Plot-depth intervals [m] where the well lies inside TVDSS window [top, base] [m].

    Ends are interpolated to the exact top or base between the samples either side;
    where the window runs past the log, the interval stops at the end of the log.
    A deviated well that leaves and re-enters the window gives several intervals.
    """
    ok = np.isfinite(depth) & np.isfinite(tvdss)
    depth, t = depth[ok], tvdss[ok]
    if t.size == 0 or not (np.isfinite(top) and np.isfinite(base)):
        return []
    lo, hi = min(top, base), max(top, base)
    inside = (t >= lo) & (t <= hi)
    edges = np.diff(np.concatenate(([0], inside.astype(np.int8), [0])))
    starts = np.flatnonzero(edges == 1)
    ends = np.flatnonzero(edges == -1) - 1
    out = []
    for i0, i1 in zip(starts, ends):  # one pass per interval, not per sample
        a, b = depth[i0], depth[i1]
        if i0 > 0:
            level = lo if t[i0 - 1] < lo else hi
            a = depth[i0 - 1] + (level - t[i0 - 1]) / (t[i0] - t[i0 - 1]) * (depth[i0] - depth[i0 - 1])
        if i1 < t.size - 1:
            level = lo if t[i1 + 1] < lo else hi
            b = depth[i1] + (level - t[i1]) / (t[i1 + 1] - t[i1]) * (depth[i1 + 1] - depth[i1])
        out.append((float(min(a, b)), float(max(a, b))))
    return out


# ------------------------------------------------------------------------ helpers


def _positive(a: np.ndarray) -> np.ndarray:
    """Copy of ``a`` with non-positive and non-finite values as NaN (for log axes)."""
    a = np.asarray(a, dtype=float)
    return np.where(np.isfinite(a) & (a > 0.0), a, np.nan)


def _number(obj, attr: str) -> float:
    """``obj.attr`` as a float, NaN when missing, None or not a number."""
    v = getattr(obj, attr, None)
    try:
        return float(v) if v is not None else float("nan")
    except (TypeError, ValueError):
        return float("nan")


def _int_array(a, missing: int) -> np.ndarray:
    """Integer copy of ``a`` with non-finite entries set to ``missing``."""
    a = np.asarray(a)
    if a.dtype.kind == "f":
        a = np.where(np.isfinite(a), a, missing)
    return a.astype(np.int64)


def _finite_range(a: np.ndarray) -> tuple[float, float] | None:
    a = np.asarray(a, dtype=float)
    a = a[np.isfinite(a)]
    if a.size == 0:
        return None
    return float(a.min()), float(a.max())


def _gr_curve(result: WellResult):
    """The well's GR curve (any case) or None when absent or of the wrong length."""
    for key, curve in result.well.curves.items():
        if key.strip().lower() == "gr":
            data = np.asarray(curve.data, dtype=float)
            if data.shape == result.well.md.shape:
                return curve, data
    return None


def _plain_log_format(v, _pos=None) -> str:
    return f"{v:g}"


def _header(ax, label: str, colour: str, lo: float, hi: float, log: bool = False,
            ticks=None, outward: float = 0.0) -> None:
    """Put a track's scale at the top: label, limits and ticks in the curve colour."""
    if log:
        ax.set_xscale("log")
    ax.set_xlim(lo, hi)
    ax.xaxis.set_ticks_position("top")
    ax.xaxis.set_label_position("top")
    ax.spines["top"].set_position(("outward", outward))
    ax.set_xlabel(label, color=colour, fontsize=9, labelpad=3)
    ax.tick_params(axis="x", colors=colour, labelsize=7, pad=1, length=3)
    if ticks is not None:
        ax.xaxis.set_major_locator(FixedLocator(ticks))
        ax.xaxis.set_major_formatter(FuncFormatter(_plain_log_format))
    elif log:
        ax.xaxis.set_major_locator(LogLocator(base=10, numticks=5))
        ax.xaxis.set_major_formatter(FuncFormatter(_plain_log_format))
    if log:
        ax.xaxis.set_minor_formatter(NullFormatter())


def _twin(ax):
    tw = ax.twiny()
    tw.patch.set_visible(False)
    for side in ("bottom", "left", "right"):
        tw.spines[side].set_visible(False)
    return tw


# --------------------------------------------------------------------- figure


def _track_figure(result: WellResult, depth_axis: str = "md", units: str = "metric",
                  title: str | None = None) -> Figure:
    """Build the track-plot figure (see :func:`track_plot`) without writing it."""
    if depth_axis not in _DEPTH_AXES:
        raise DepthError(f"unknown depth axis {depth_axis!r}", where="depth_axis",
                         hint="use 'md' or 'tvdss'")
    if units not in UNIT_SYSTEMS:
        raise UnitError(f"unknown unit system {units!r}", where="units",
                        hint="use 'metric' (m) or 'field' (ft)")
    length_unit = UNIT_SYSTEMS[units]["length"]
    scale = factor(length_unit, "length")  # display unit -> m

    well = result.well
    md = np.asarray(well.md, dtype=float)
    tvdss = np.asarray(result.tvdss, dtype=float)
    n = md.size
    shm = result.shm
    where = f"well {well.name!r}"
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

    md_fin, tv_fin = _monotone_pairs(md, tvdss)
    have_tvdss = md_fin.size >= 1
    if depth_axis == "tvdss" and not have_tvdss:
        raise DepthError("TVDSS is missing at every sample, cannot plot against TVDSS",
                         where=where, hint="give a deviation survey or plot with depth_axis='md'")

    primary_si = md if depth_axis == "md" else tvdss
    y = primary_si / scale
    rng = _finite_range(y)
    y_top, y_base = rng
    if y_base - y_top <= 0.0:
        y_top, y_base = y_top - 1.0, y_base + 1.0
    length_m = (y_base - y_top) * scale

    # -- which tracks
    gr = _gr_curve(result)
    tracks = []
    if gr is not None:
        tracks.append(_Track("gr", 1.45))
    tracks.append(_Track("phik", 1.9))
    if result.rt is not None:
        tracks.append(_Track("rt", 1.55))
    tracks.append(_Track("sw", 1.9))
    tracks.append(_Track("h", 1.8))

    widths = [t.width for t in tracks]
    fig_w = _LEFT + sum(widths) + _GAP * (len(tracks) - 1) + _RIGHT
    fig_h = float(np.clip(_TOP + _BOTTOM + length_m / _METRES_PER_INCH, *_HEIGHT_LIMITS))
    fig = Figure(figsize=(fig_w, fig_h), dpi=DPI)
    FigureCanvasAgg(fig)

    plot_h = (fig_h - _TOP - _BOTTOM) / fig_h
    bottom = _BOTTOM / fig_h
    axes = {}
    x = _LEFT
    first = None
    for t in tracks:
        ax = fig.add_axes((x / fig_w, bottom, t.width / fig_w, plot_h), sharey=first)
        if first is None:
            first = ax
        else:
            ax.tick_params(axis="y", labelleft=False)
        ax.grid(True, axis="both", which="major", color=_COLOURS["grid"], lw=0.6, zorder=0.5)
        ax.tick_params(axis="y", labelsize=8)
        axes[t.key] = ax
        x += t.width + _GAP
    first.set_ylim(y_base, y_top)  # depth increases downwards

    handles: list = []

    # -- depth scales
    primary_name = "MD" if depth_axis == "md" else "TVDSS"
    other_name = "TVDSS" if depth_axis == "md" else "MD"
    first.set_ylabel(f"{primary_name} [{length_unit}]", fontsize=9)
    if have_tvdss and md_fin.size >= 2:
        if depth_axis == "md":
            fwd_si, inv_si = _mapping(md_fin, tv_fin), _mapping(tv_fin, md_fin)
        else:
            fwd_si, inv_si = _mapping(tv_fin, md_fin), _mapping(md_fin, tv_fin)
        sec = first.secondary_yaxis(
            -0.72 / tracks[0].width,
            functions=(lambda v: fwd_si(np.asarray(v) * scale) / scale,
                       lambda v: inv_si(np.asarray(v) * scale) / scale))
        sec.yaxis.set_ticks_position("left")  # labels outside, clear of the primary scale
        sec.yaxis.set_label_position("left")
        sec.set_ylabel(f"{other_name} [{length_unit}]", fontsize=9, color="#555555")
        sec.tick_params(axis="y", labelsize=8, colors="#555555")

    # -- zones: bands on every track, names at the right, FWL lines
    zones = list(result.zones or [])
    last = axes[tracks[-1].key]
    fwl_groups: dict[float, list[str]] = {}
    zone_drawn = False
    for iz, zone in enumerate(zones):  # one pass per zone, not per sample
        zname = safe_text(getattr(zone, "name", f"zone {iz + 1}"))
        top, base = _number(zone, "top"), _number(zone, "base")
        if depth_axis == "tvdss":
            ivs = []
            if np.isfinite(top) and np.isfinite(base):
                lo, hi = max(min(top, base), y_top * scale), min(max(top, base), y_base * scale)
                if hi > lo:
                    ivs = [(lo, hi)]
        else:
            ivs = _zone_intervals(md, tvdss, top, base) if have_tvdss else []
        fill = _ZONE_FILLS[iz % 2]
        for a_si, b_si in ivs:
            a, b = a_si / scale, b_si / scale
            for ax in axes.values():
                ax.axhspan(a, b, color=fill, zorder=0.2, lw=0)
                ax.axhline(a, color=_COLOURS["zone_edge"], lw=0.6, zorder=0.6)
                ax.axhline(b, color=_COLOURS["zone_edge"], lw=0.6, zorder=0.6)
            last.text(1.04, 0.5 * (a + b), zname, transform=last.get_yaxis_transform(),
                      ha="left", va="center", fontsize=8, clip_on=False)
            zone_drawn = True
        fwl = _number(zone, "fwl")
        if np.isfinite(fwl):
            fwl_groups.setdefault(fwl, []).append(zname)
    if zone_drawn:
        handles.append(Patch(facecolor=_ZONE_FILLS[1], edgecolor=_COLOURS["zone_edge"],
                             label="Zone"))

    outside_notes = []
    for fwl, names in fwl_groups.items():
        label = "FWL " + ", ".join(names)
        if depth_axis == "tvdss":
            ys = np.array([fwl]) if y_top * scale <= fwl <= y_base * scale else np.empty(0)
        else:
            ys = _level_crossings(md, tvdss, fwl) if have_tvdss else np.empty(0)
        for yy in ys / scale:
            for ax in axes.values():
                ax.axhline(yy, color=_COLOURS["fwl"], lw=1.6, ls=(0, (6, 2)), zorder=3.5)
            last.text(0.97, yy, label, transform=last.get_yaxis_transform(), ha="right",
                      va="bottom", fontsize=8, color=_BLUE, zorder=6,
                      bbox=dict(facecolor="white", edgecolor="none", alpha=0.7, pad=0.5))
        if ys.size == 0:
            side = "below" if (have_tvdss and fwl > np.nanmax(tvdss)) else "above"
            outside_notes.append(f"{label} {side} the log "
                                 f"({fwl / scale:.1f} {length_unit} TVDSS)")
    if fwl_groups:
        handles.append(Line2D([], [], color=_COLOURS["fwl"], lw=1.6, ls=(0, (6, 2)),
                              label="Free-water level"))
    # free-oil (gas-oil) level of zones with a gas cap over an oil leg
    gol_drawn = False
    for zone in zones:
        gol = _number(zone, "gas_oil_level")
        if not np.isfinite(gol):
            continue
        if depth_axis == "tvdss":
            ys = np.array([gol]) if y_top * scale <= gol <= y_base * scale else np.empty(0)
        else:
            ys = _level_crossings(md, tvdss, gol) if have_tvdss else np.empty(0)
        label = "Free-oil level " + safe_text(getattr(zone, "name", ""))
        for yy in ys / scale:
            for ax in axes.values():
                ax.axhline(yy, color=_GOL_COLOUR, lw=1.4, ls=(0, (2, 2)), zorder=3.5)
            last.text(0.97, yy, label, transform=last.get_yaxis_transform(), ha="right",
                      va="bottom", fontsize=8, color=_GOL_COLOUR, zorder=6,
                      bbox=dict(facecolor="white", edgecolor="none", alpha=0.7, pad=0.5))
            gol_drawn = True
    if gol_drawn:
        handles.append(Line2D([], [], color=_GOL_COLOUR, lw=1.4, ls=(0, (2, 2)),
                              label="Free-oil (gas-oil) level"))

    # -- (1) gamma ray
    if gr is not None:
        ax = axes["gr"]
        curve, data = gr
        unit = safe_text(curve.unit, 12)
        r = _finite_range(data)
        gmax = _GR_DEFAULT_MAX
        if r is not None and r[1] > gmax:
            gmax = float(np.ceil(np.nanpercentile(data, 99.5) / 50.0) * 50.0) or gmax
        mnem = safe_text(curve.mnemonic, 12)
        _header(ax, f"{mnem} [{unit}]" if unit else mnem, _COLOURS["gr"], 0.0, gmax)
        ax.plot(data, y, color=_COLOURS["gr"], lw=0.8, zorder=3)
        handles.append(Line2D([], [], color=_COLOURS["gr"], lw=1, label=f"{mnem} (gamma ray)"))

    # -- (2) porosity and permeability
    ax = axes["phik"]
    tw = _twin(ax)  # before the header: twiny moves the original scale to the bottom
    _header(ax, "Porosity [fraction]", _COLOURS["phi"], *_PHI_RANGE,
            ticks=[0.0, 0.1, 0.2, 0.3, 0.4])
    ax.plot(np.asarray(result.phi, dtype=float), y, color=_COLOURS["phi"], lw=0.8, zorder=3,
            label="Porosity")
    _header(tw, "Permeability [mD]", _COLOURS["k"], *_K_RANGE_MD, log=True,
            ticks=[0.01, 1.0, 100.0, 1.0e4], outward=34)
    k_md = _positive(np.asarray(result.k, dtype=float) / C.MILLIDARCY)
    tw.plot(k_md, y, color=_COLOURS["k"], lw=0.8, zorder=3, label="Permeability")
    handles.append(Line2D([], [], color=_COLOURS["phi"], lw=1, label="Porosity"))
    handles.append(Line2D([], [], color=_COLOURS["k"], lw=1, label="Permeability"))

    # -- (3) resistivity
    if result.rt is not None:
        ax = axes["rt"]
        rt_name = (result.roles or {}).get("resistivity") or "RT"
        _header(ax, f"Resistivity {safe_text(rt_name, 12)} [ohm.m]", _COLOURS["rt"],
                *_RT_RANGE, log=True, ticks=[0.2, 2.0, 20.0, 200.0, 2000.0])
        ax.grid(True, axis="x", which="minor", color=_COLOURS["grid"], lw=0.3, zorder=0.5)
        ax.plot(_positive(result.rt), y, color=_COLOURS["rt"], lw=0.8, zorder=3,
                label="Resistivity")
        handles.append(Line2D([], [], color=_COLOURS["rt"], lw=1, label="Resistivity"))

    # -- (4) water saturation
    ax = axes["sw"]
    _header(ax, "Water saturation [fraction]", _COLOURS["sw_shm"], 0.0, 1.0,
            ticks=[0.0, 0.25, 0.5, 0.75, 1.0])
    sw = np.asarray(shm.sw, dtype=float)
    sw_ok = np.isfinite(sw) & np.isfinite(y)
    zone_idx = _int_array(shm.zone, -1)
    kinds = np.array([str(getattr(z, "hydrocarbon", "")).lower() for z in zones] + [""],
                     dtype=object)
    valid_idx = (zone_idx >= 0) & (zone_idx < len(zones))
    kind = kinds[np.where(valid_idx, zone_idx, len(zones))]
    for hc in sorted(set(kind[sw_ok & (sw < 1.0)].tolist())):
        colour = _HC_FILLS.get(hc, _HC_OTHER)
        ax.fill_betweenx(y, sw, 1.0, where=sw_ok & (kind == hc), color=colour, alpha=0.55,
                         lw=0, zorder=1)
        handles.append(Patch(facecolor=colour, alpha=0.55,
                             label=f"{safe_text(hc.capitalize(), 12) or 'Hydrocarbon'} "
                                   f"(1 \u2212 SHM Sw)"))
    if result.sw_log is not None:
        sw_log = np.asarray(result.sw_log, dtype=float)
        both = sw_ok & np.isfinite(sw_log)
        if both.any():
            ax.fill_betweenx(y, sw_log, sw, where=both, facecolor="none",
                             edgecolor=_COLOURS["sw_diff"], hatch="////", lw=0, zorder=2)
            handles.append(Patch(facecolor="none", edgecolor=_COLOURS["sw_diff"], hatch="////",
                                 label="Log Sw \u2212 SHM Sw"))
        src = result.sw_log_source or ""
        src_txt = ("Archie" if src == "archie" else
                   safe_text(src.split(":", 1)[1], 12) if src.startswith("curve:") else "")
        log_label = f"Log Sw ({src_txt})" if src_txt else "Log Sw"
        ax.plot(sw_log, y, color=_COLOURS["sw_log"], lw=0.9, zorder=3)
        handles.append(Line2D([], [], color=_COLOURS["sw_log"], lw=1, label=log_label))
    ax.plot(sw, y, color=_COLOURS["sw_shm"], lw=1.1, zorder=3.2)
    handles.append(Line2D([], [], color=_COLOURS["sw_shm"], lw=1.2, label="SHM Sw"))
    # flag strip at the left edge: x in axes fraction, y in data
    flag = _int_array(shm.flag, 0)
    only_no_zone = flag == FLAG_NO_ZONE
    other_flags = (flag != 0) & ~only_no_zone
    strip = ax.get_yaxis_transform()
    if only_no_zone.any():
        ax.fill_betweenx(y, 0.0, 0.035, where=only_no_zone, transform=strip,
                         color=_COLOURS["no_zone"], lw=0, zorder=4)
        handles.append(Patch(color=_COLOURS["no_zone"], label="Outside every zone"))
    if other_flags.any():
        ax.fill_betweenx(y, 0.0, 0.035, where=other_flags, transform=strip,
                         color=_COLOURS["flag"], lw=0, zorder=4.1)
        handles.append(Patch(color=_COLOURS["flag"],
                             label="Flagged (bad input or J outside range)"))

    # -- (5) height above FWL and J
    ax = axes["h"]
    tw = _twin(ax)
    h = np.asarray(shm.hafwl, dtype=float) / scale
    hr = _finite_range(h)
    if hr is None:
        hlo, hhi = (-10.0, 100.0) if units == "metric" else (-30.0, 300.0)
    else:
        hlo, hhi = min(hr[0], 0.0), max(hr[1], 0.0)
        pad = 0.05 * (hhi - hlo) or 1.0
        hlo, hhi = hlo - pad, hhi + pad
    _header(ax, f"Height above FWL [{length_unit}]", _COLOURS["hafwl"], hlo, hhi)
    ax.axvline(0.0, color=_COLOURS["zone_edge"], lw=0.8, zorder=0.7)
    ax.plot(h, y, color=_COLOURS["hafwl"], lw=1.0, zorder=3)
    handles.append(Line2D([], [], color=_COLOURS["hafwl"], lw=1, label="Height above FWL"))
    jpos = _positive(shm.j)
    jr = _finite_range(jpos)
    if jr is None:
        jlo, jhi = 0.01, 10.0
    else:
        jlo = 10.0 ** np.floor(np.log10(jr[0]))
        jhi = 10.0 ** np.ceil(np.log10(jr[1]))
        if jhi <= jlo:
            jhi = jlo * 10.0
    _header(tw, "J [-]", _COLOURS["j"], jlo, jhi, log=True, outward=34)
    tw.plot(jpos, y, color=_COLOURS["j"], lw=0.8, zorder=3)
    handles.append(Line2D([], [], color=_COLOURS["j"], lw=1, label="J"))
    if outside_notes:
        ax.text(0.03, 0.005, "\n".join(outside_notes), transform=ax.transAxes, ha="left",
                va="bottom", fontsize=7, color=_BLUE, zorder=6,
                bbox=dict(facecolor="white", edgecolor="none", alpha=0.8, pad=1.0))

    # -- title and legend
    name = safe_text(title if title is not None else well.name, 80)
    fig.text(0.5, 1.0 - 0.18 / fig_h, name, ha="center", va="top", fontsize=13,
             fontweight="bold")
    sub = f"Depth: {primary_name} [{length_unit}]"
    if result.datum_elevation:
        sub += f"; depth datum {result.datum_elevation / scale:.6g} {length_unit} above sea level"
    fig.text(0.5, 1.0 - 0.48 / fig_h, sub, ha="center", va="top", fontsize=8, color="#444444")
    ncol = max(1, min(5, int((fig_w - 0.4) // 2.1)))
    fig.legend(handles=handles, loc="lower center", bbox_to_anchor=(0.5, 0.05 / fig_h),
               ncol=ncol, fontsize=8, frameon=False, handlelength=2.2)
    return fig


# --------------------------------------------------------------------- writing


def _save_atomic(fig: Figure, targets: list[tuple[Path, str]]) -> list[Path]:
    """Save ``fig`` to each (path, format) through :func:`satheight.io.atomic.atomic_save_figure`.

    Every target gets a flushed and fsynced temp file in its folder; all are renamed into
    place only after all saved. If any save fails, the targets are untouched.
    """
    return atomic_save_figure(fig, targets, dpi=DPI)


def _target(path, fmt: str, key: str) -> Path:
    p = Path(path)
    if not p.parent.is_dir():
        raise InputFileError(f"folder {str(p.parent)!r} for the {fmt.upper()} plot does not exist",
                             where=key, hint="create the folder or choose another output path")
    return p


def track_plot(result: WellResult, png_path, pdf_path=None, depth_axis: str = "md",
               units: str = "metric", title: str | None = None) -> list[Path]:
    """Draw one well's track plot and write it as PNG (and PDF if asked).

    Tracks, left to right: gamma ray (only if the well has a curve named ``GR``, any
    case) in the file's unit; porosity [fraction] on 0-0.4 with permeability [mD]
    on a log scale 0.01-10,000; deep resistivity [ohm.m] on a log scale 0.2-2000
    (only if ``result.rt`` is given); water saturation [fraction] with log Sw (if
    any), saturation-height Sw, the hydrocarbon between SHM Sw and 1 shaded by
    fluid, the gap between log and SHM Sw hatched and flagged samples marked at the
    left edge; height above FWL [m or ft] with J [-] on a log scale. Zone windows
    are shaded across all tracks with their names at the right, and each zone's
    FWL is a dashed line labelled ``FWL <zone>`` (or a note when it lies outside
    the logged interval). The whole log is shown, depth increasing downwards.

    Parameters
    ----------
    result : WellResult
        Computed results of one well; not modified. ``result.zones`` items need
        ``name``, ``top``, ``base`` and ``fwl`` (TVDSS [m], positive down) and
        ``hydrocarbon`` (``"oil"``, ``"gas"`` or ``"air"``).
    png_path : str or pathlib.Path
        PNG file to write; an existing file is replaced.
    pdf_path : str or pathlib.Path, optional
        PDF file to write as well.
    depth_axis : {"md", "tvdss"}
        Main depth scale; the other is shown as a second scale on the left. TVDSS
        is ``result.tvdss`` [m]; MD <-> TVDSS is interpolated between samples.
    units : {"metric", "field"}
        Depth and height shown in m (metric) or ft (field).
    title : str, optional
        Title text; the well name by default. ``$`` in it is shown as written.

    Returns
    -------
    list of pathlib.Path
        The files written: the PNG, then the PDF if asked.

    Raises
    ------
    DepthError
        Unknown ``depth_axis``; no depth samples; TVDSS asked but all missing.
    UnitError
        Unknown ``units``.
    InputFileError
        The folder of an output path does not exist.
    SatHeightError
        A result array does not match the well's number of samples.
    """
    targets = [(_target(png_path, "png", "png_path"), "png")]
    if pdf_path is not None:
        targets.append((_target(pdf_path, "pdf", "pdf_path"), "pdf"))
    fig = _track_figure(result, depth_axis=depth_axis, units=units, title=title)
    return _save_atomic(fig, targets)


# ------------------------------------------------------------------ field section


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
    pts = []
    for r in results:
        n = np.zeros(r.tvdss.shape) if getattr(r, "north", None) is None else np.asarray(r.north, float)
        e = np.zeros(r.tvdss.shape) if getattr(r, "east", None) is None else np.asarray(r.east, float)
        pts.append(np.stack([e, n], axis=-1))
    mapped = bool(results) and all(locations.get(r.well.name) is not None for r in results)
    if mapped:
        xy = [p + np.asarray(locations[r.well.name], float) for p, r in zip(pts, results)]
        allp = np.concatenate([x[np.all(np.isfinite(x), axis=1)] for x in xy])
        centre = allp.mean(axis=0)
        u = np.array([1.0, 0.0])
        if allp.shape[0] >= 2 and np.ptp(allp, axis=0).max() > 0:
            _, _, vt = np.linalg.svd(allp - centre, full_matrices=False)
            u = vt[0]
        if u[0] < -1e-12 or (abs(u[0]) <= 1e-12 and u[1] < 0):
            u = -u
        d = [(x - centre) @ u for x in xy]
    else:
        u = np.array([1.0, 0.0])
        d = []
        for i, p in enumerate(pts):
            fin = np.all(np.isfinite(p), axis=1)
            far = p[fin][-1] if fin.any() else np.zeros(2)
            reach = float(np.hypot(*far))
            v = far / reach if reach > 0 else np.array([1.0, 0.0])
            d.append(p @ v)
        spans = [float(np.nanmax(x) - min(0.0, float(np.nanmin(x)))) if np.isfinite(x).any() else 0.0
                 for x in d]
        spacing = max(max(spans, default=0.0) * 1.5, 500.0)
        d = [x + i * spacing for i, x in enumerate(d)]
    low = min((float(np.nanmin(x)) for x in d if np.isfinite(x).any()), default=0.0)
    return [x - low for x in d], mapped, u


def section_plot(results, png_path, units: str = "metric", locations=None,
                 title: str | None = None, pdf_path=None) -> list[Path]:
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
    png_path : str or pathlib.Path
        PNG file to write.
    units : {"metric", "field"}
        Distances and depths shown in m or ft.
    locations : dict[str, tuple[float, float]], optional
        Well-head map position (east, north) [m] by well name. With a position for
        every well the section follows the line of best fit through the wells (see
        :func:`section_positions`); otherwise the wells are set side by side
        (schematic distances, said in the axis label).
    title : str, optional
    pdf_path : str or pathlib.Path, optional
        PDF file to write as well.

    Returns
    -------
    list of pathlib.Path
        Files written.

    Raises
    ------
    UnitError
        Unknown ``units``.
    DepthError
        No well, or no well with any finite TVDSS.
    InputFileError
        The folder of an output path does not exist.
    """
    if units not in UNIT_SYSTEMS:
        raise UnitError(f"unknown unit system {units!r}", where="section_plot units",
                        hint="use 'metric' or 'field'")
    results = list(results)
    if not results or not any(np.isfinite(np.asarray(r.tvdss, float)).any() for r in results):
        raise DepthError("no well with TVDSS to draw in the field section", where="section_plot",
                         hint="compute at least one well first")
    targets = [(_target(png_path, "png", "png_path"), "png")]
    if pdf_path is not None:
        targets.append((_target(pdf_path, "pdf", "pdf_path"), "pdf"))
    unit = UNIT_SYSTEMS[units]["length"]
    scale = factor(unit, "length")
    dist, mapped, u = section_positions(results, locations)

    fig = Figure(figsize=(11.0, 7.5), dpi=DPI)
    FigureCanvasAgg(fig)
    ax = fig.add_axes((0.08, 0.1, 0.76, 0.8))
    cax = fig.add_axes((0.87, 0.1, 0.018, 0.8))
    import matplotlib as mpl
    from matplotlib.collections import LineCollection

    cmap = mpl.colormaps["cividis_r"]
    norm = mpl.colors.Normalize(0.0, 1.0)
    zone_tops: dict[str, list[tuple[float, float]]] = {}
    fwls: dict[str, float] = {}
    for r, x in zip(results, dist):
        z = np.asarray(r.tvdss, float)
        ok = np.isfinite(x) & np.isfinite(z)
        xs, zs = x[ok] / scale, z[ok] / scale
        if xs.size == 0:
            continue
        ax.plot(xs, zs, color=_COLOURS["no_zone"], lw=1.0, zorder=2)
        sw = np.asarray(r.shm.sw, float)[ok]
        if xs.size >= 2:
            seg = np.stack([np.column_stack([xs[:-1], zs[:-1]]), np.column_stack([xs[1:], zs[1:]])], axis=1)
            swm = 0.5 * (sw[:-1] + sw[1:])
            good = np.isfinite(swm)
            lc = LineCollection(seg[good], colors=cmap(norm(swm[good])), linewidths=4.0, zorder=3)
            ax.add_collection(lc)
        ax.text(xs[0], zs[0], safe_text(r.well.name) + "\n", ha="center", va="bottom", fontsize=8)
        for zn in r.zones:
            fwls.setdefault(zn.name, float(zn.fwl))
            for level, kind in ((zn.top, "top"), (zn.base, "base")):
                xc = np.interp(level, z[ok], x[ok]) if np.all(np.diff(z[ok]) > 0) else np.nan
                if not (np.nanmin(z[ok]) <= level <= np.nanmax(z[ok])) or not np.isfinite(xc):
                    continue
                ax.plot([xc / scale], [level / scale], marker="_", ms=18, mew=2.0, color=_BLACK, zorder=5)
                if kind == "top":
                    zone_tops.setdefault(zn.name, []).append((xc / scale, level / scale))
    for name, pts in zone_tops.items():
        pts = sorted(pts)
        ax.plot([p[0] for p in pts], [p[1] for p in pts], color="#555555", lw=0.8, zorder=4)
        ax.text(pts[0][0], pts[0][1], " " + safe_text(name), ha="left", va="bottom", fontsize=8,
                color="#333333", zorder=6)
    x_all = np.concatenate([d[np.isfinite(d)] for d in dist]) / scale
    x0, x1 = float(x_all.min()), float(x_all.max())
    pad = max(0.05 * (x1 - x0), 50.0 / scale * 3.0)
    for name, fwl in fwls.items():
        ax.plot([x0 - pad, x1 + pad], [fwl / scale] * 2, ls="--", lw=1.2, color=_COLOURS["fwl"], zorder=4)
        ax.text(x1 + pad, fwl / scale, f"FWL {safe_text(name)} ", ha="right", va="bottom",
                fontsize=8, color=_BLUE, zorder=6)
    ax.set_xlim(x0 - pad, x1 + pad)
    ax.invert_yaxis()
    ax.set_ylabel(f"TVDSS [{unit}]", fontsize=9)
    if mapped:
        bearing = (np.degrees(np.arctan2(u[0], u[1])) + 360.0) % 360.0
        ax.set_xlabel(f"distance along the section line, bearing {bearing:.0f} deg [{unit}]", fontsize=9)
    else:
        ax.set_xlabel(f"wells side by side (schematic spacing; each well's own reach) [{unit}]",
                      fontsize=9)
    ax.grid(True, color=_COLOURS["grid"], lw=0.5)
    sm = mpl.cm.ScalarMappable(norm=norm, cmap=cmap)
    fig.colorbar(sm, cax=cax).set_label("Sw from the saturation-height model [fraction]", fontsize=8)
    ax.set_title(safe_text(title if title is not None else "Field section, TVDSS", 80), fontsize=12)
    return _save_atomic(fig, targets)
