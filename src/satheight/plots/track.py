"""Track plot of one well: logs, saturation-height results and zones against depth.

:func:`track_plot` draws, left to right, gamma ray (when the well has a ``GR``
curve), porosity with permeability, deep resistivity (when present), water
saturation (log Sw and the saturation-height Sw with the hydrocarbon shaded) and
height above the free-water level with the Leverett J. Zone windows are shaded
across every track, each zone's FWL is drawn as a line, and flagged samples are
marked in the saturation track.

Figures are built on :class:`matplotlib.figure.Figure` with the Agg canvas, so no
global matplotlib state (pyplot, backend choice) is touched. The figure is
returned; writing it is the caller's job.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure
from matplotlib.lines import Line2D
from matplotlib.patches import Patch
from matplotlib.ticker import FixedLocator, FuncFormatter, LogLocator, NullFormatter

from .. import constants as C
from ..errors import DepthError, SatHeightError, UnitError
from ..results import FLAG_NO_ZONE, WellResult
from ..units import UNIT_SYSTEMS, factor
from .style import (BLACK, BLUE, DPI, GREEN, GREY, GRID, LIGHT_GREY, ORANGE, PURPLE, SKY,
                    VERMILLION, YELLOW)
from .depths import level_crossings, mapping, monotone_pairs, zone_intervals
from .text import hydrocarbon_label, log_sw_label, safe_text, unit_label

__all__ = ["track_plot", "DPI"]


_DEPTH_AXES = ("md", "tvdss")

_COLOURS = {
    "gr": GREEN, "phi": BLUE, "k": VERMILLION, "rt": BLACK,
    "sw_log": BLUE, "sw_shm": BLACK, "sw_diff": "#4D4D4D",
    "hafwl": BLUE, "j": VERMILLION, "fwl": SKY, "gol": PURPLE,
    "flag": "#333333", "no_zone": LIGHT_GREY, "zone_edge": "#A0A0A0", "grid": GRID,
}
_ZONE_FILLS = ("#F3F3F3", "#E6E6E6")  # alternate so neighbouring zones stay apart
_HC_FILLS = {"oil": ORANGE, "gas": PURPLE, "air": YELLOW}
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


@dataclass
class _Frame:
    """What every track-drawing step needs: the figure, its axes and the depth scale."""

    fig: Figure
    axes: dict
    y: np.ndarray            # plot depth of each sample [display unit]
    scale: float             # display unit -> m
    length_unit: str
    depth_axis: str
    y_top: float
    y_base: float
    md: np.ndarray
    tvdss: np.ndarray
    have_tvdss: bool
    handles: list = field(default_factory=list)

    @property
    def last(self):
        return list(self.axes.values())[-1]


# ------------------------------------------------------------------------ helpers


def _positive(a: np.ndarray) -> np.ndarray:
    """Copy of ``a`` with non-positive and non-finite values as NaN (for log axes)."""
    a = np.asarray(a, dtype=float)
    return np.where(np.isfinite(a) & (a > 0.0), a, np.nan)


def _number(v) -> float:
    """``v`` as a float, NaN when None or not a number."""
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


def _level_depths(f: _Frame, level: float) -> np.ndarray:
    """Plot depths [display unit] where the well passes TVDSS ``level`` [m]."""
    if f.depth_axis == "tvdss":
        inside = f.y_top * f.scale <= level <= f.y_base * f.scale
        ys = np.array([level]) if inside else np.empty(0)
    else:
        ys = level_crossings(f.md, f.tvdss, level) if f.have_tvdss else np.empty(0)
    return ys / f.scale


def _hline_all(f: _Frame, yy: float, label: str, colour: str, lw: float, ls) -> None:
    """A level across every track, labelled at the right of the last track."""
    for ax in f.axes.values():
        ax.axhline(yy, color=colour, lw=lw, ls=ls, zorder=3.5)
    f.last.text(0.97, yy, label, transform=f.last.get_yaxis_transform(), ha="right",
                va="bottom", fontsize=8, color=BLUE if colour == _COLOURS["fwl"] else colour,
                zorder=6, bbox=dict(facecolor="white", edgecolor="none", alpha=0.7, pad=0.5))


# ------------------------------------------------------------------- checking


def _checked_depths(result: WellResult, depth_axis: str, units: str):
    """Validate the arguments and the result's shapes; MD and TVDSS arrays [m]."""
    if depth_axis not in _DEPTH_AXES:
        raise DepthError(f"unknown depth axis {depth_axis!r}", where="depth_axis",
                         hint="use 'md' or 'tvdss'")
    if units not in UNIT_SYSTEMS:
        raise UnitError(f"unknown unit system {units!r}", where="units",
                        hint="use 'metric' (m) or 'field' (ft)")
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
    if depth_axis == "tvdss" and monotone_pairs(md, tvdss)[0].size == 0:
        raise DepthError("TVDSS is missing at every sample, cannot plot against TVDSS",
                         where=where, hint="give a deviation survey or plot with depth_axis='md'")
    return md, tvdss


# --------------------------------------------------------------------- layout


def _track_list(result: WellResult, gr) -> list[tuple[str, float]]:
    """(key, width [inch]) of each track, left to right."""
    tracks = [("gr", 1.45)] if gr is not None else []
    tracks.append(("phik", 1.9))
    if result.rt is not None:
        tracks.append(("rt", 1.55))
    tracks += [("sw", 1.9), ("h", 1.8)]
    return tracks


def _frame(result: WellResult, md, tvdss, depth_axis: str, units: str, tracks) -> _Frame:
    """The figure with one axes per track sharing the depth scale (depth down)."""
    length_unit = UNIT_SYSTEMS[units]["length"]
    scale = factor(length_unit, "length")  # display unit -> m
    y = (md if depth_axis == "md" else tvdss) / scale
    y_top, y_base = _finite_range(y)
    if y_base - y_top <= 0.0:
        y_top, y_base = y_top - 1.0, y_base + 1.0
    length_m = (y_base - y_top) * scale
    widths = [w for _, w in tracks]
    fig_w = _LEFT + sum(widths) + _GAP * (len(tracks) - 1) + _RIGHT
    fig_h = float(np.clip(_TOP + _BOTTOM + length_m / _METRES_PER_INCH, *_HEIGHT_LIMITS))
    fig = Figure(figsize=(fig_w, fig_h), dpi=DPI)
    FigureCanvasAgg(fig)
    plot_h = (fig_h - _TOP - _BOTTOM) / fig_h
    axes, x, first = {}, _LEFT, None
    for key, width in tracks:
        ax = fig.add_axes((x / fig_w, _BOTTOM / fig_h, width / fig_w, plot_h), sharey=first)
        if first is None:
            first = ax
        else:
            ax.tick_params(axis="y", labelleft=False)
        ax.grid(True, axis="both", which="major", color=_COLOURS["grid"], lw=0.6, zorder=0.5)
        ax.tick_params(axis="y", labelsize=8)
        axes[key] = ax
        x += width + _GAP
    first.set_ylim(y_base, y_top)  # depth increases downwards
    md_fin, _ = monotone_pairs(md, tvdss)
    return _Frame(fig=fig, axes=axes, y=y, scale=scale, length_unit=length_unit,
                  depth_axis=depth_axis, y_top=y_top, y_base=y_base, md=md, tvdss=tvdss,
                  have_tvdss=md_fin.size >= 1)


def _depth_scales(f: _Frame, first_width: float) -> None:
    """Main depth scale on the first track, the other one as a second scale to its left."""
    first = next(iter(f.axes.values()))
    primary = "MD" if f.depth_axis == "md" else "TVDSS"
    other = "TVDSS" if f.depth_axis == "md" else "MD"
    first.set_ylabel(f"{primary} [{f.length_unit}]", fontsize=9)
    md_fin, tv_fin = monotone_pairs(f.md, f.tvdss)
    if not (f.have_tvdss and md_fin.size >= 2):
        return
    if f.depth_axis == "md":
        fwd_si, inv_si = mapping(md_fin, tv_fin), mapping(tv_fin, md_fin)
    else:
        fwd_si, inv_si = mapping(tv_fin, md_fin), mapping(md_fin, tv_fin)
    scale = f.scale
    sec = first.secondary_yaxis(
        -0.72 / first_width,
        functions=(lambda v: fwd_si(np.asarray(v) * scale) / scale,
                   lambda v: inv_si(np.asarray(v) * scale) / scale))
    sec.yaxis.set_ticks_position("left")  # labels outside, clear of the primary scale
    sec.yaxis.set_label_position("left")
    sec.set_ylabel(f"{other} [{f.length_unit}]", fontsize=9, color=GREY)
    sec.tick_params(axis="y", labelsize=8, colors=GREY)


# ------------------------------------------------------------------ zones, levels


def _zone_depths(f: _Frame, zone) -> list[tuple[float, float]]:
    """Plot-depth intervals [m] of one zone window."""
    top, base = _number(zone.top), _number(zone.base)
    if f.depth_axis == "tvdss":
        if not (np.isfinite(top) and np.isfinite(base)):
            return []
        lo = max(min(top, base), f.y_top * f.scale)
        hi = min(max(top, base), f.y_base * f.scale)
        return [(lo, hi)] if hi > lo else []
    return zone_intervals(f.md, f.tvdss, top, base) if f.have_tvdss else []


def _draw_zones(f: _Frame, zones) -> dict[float, list[str]]:
    """Zone bands on every track with names at the right; FWL -> names of its zones."""
    fwl_groups: dict[float, list[str]] = {}
    drawn = False
    for iz, zone in enumerate(zones):  # one pass per zone, not per sample
        zname = safe_text(zone.name)
        for a_si, b_si in _zone_depths(f, zone):
            a, b = a_si / f.scale, b_si / f.scale
            for ax in f.axes.values():
                ax.axhspan(a, b, color=_ZONE_FILLS[iz % 2], zorder=0.2, lw=0)
                ax.axhline(a, color=_COLOURS["zone_edge"], lw=0.6, zorder=0.6)
                ax.axhline(b, color=_COLOURS["zone_edge"], lw=0.6, zorder=0.6)
            f.last.text(1.04, 0.5 * (a + b), zname, transform=f.last.get_yaxis_transform(),
                        ha="left", va="center", fontsize=8, clip_on=False)
            drawn = True
        fwl = _number(zone.fwl)
        if np.isfinite(fwl):
            fwl_groups.setdefault(fwl, []).append(zname)
    if drawn:
        f.handles.append(Patch(facecolor=_ZONE_FILLS[1], edgecolor=_COLOURS["zone_edge"],
                               label="Zone"))
    return fwl_groups


def _draw_fwls(f: _Frame, fwl_groups: dict[float, list[str]]) -> list[str]:
    """FWL lines across every track; notes for levels outside the plotted interval."""
    notes = []
    for fwl, names in fwl_groups.items():
        label = "FWL " + ", ".join(names)
        ys = _level_depths(f, fwl)
        for yy in ys:
            _hline_all(f, yy, label, _COLOURS["fwl"], 1.6, (0, (6, 2)))
        if ys.size == 0:
            side = "below" if (f.have_tvdss and fwl > np.nanmax(f.tvdss)) else "above"
            notes.append(f"{label} {side} the log ({fwl / f.scale:.1f} {f.length_unit} TVDSS)")
    if fwl_groups:
        f.handles.append(Line2D([], [], color=_COLOURS["fwl"], lw=1.6, ls=(0, (6, 2)),
                                label="Free-water level"))
    return notes


def _draw_free_oil_levels(f: _Frame, zones) -> None:
    """Free-oil (gas-oil) level of zones with a gas cap over an oil leg."""
    drawn = False
    for zone in zones:
        gol = _number(zone.gas_oil_level)
        if not np.isfinite(gol):
            continue
        for yy in _level_depths(f, gol):
            _hline_all(f, yy, "Free-oil level " + safe_text(zone.name), _COLOURS["gol"],
                       1.4, (0, (2, 2)))
            drawn = True
    if drawn:
        f.handles.append(Line2D([], [], color=_COLOURS["gol"], lw=1.4, ls=(0, (2, 2)),
                                label="Free-oil (gas-oil) level"))


# ------------------------------------------------------------------------ tracks


def _draw_gr(f: _Frame, gr) -> None:
    curve, data = gr
    r = _finite_range(data)
    gmax = _GR_DEFAULT_MAX
    if r is not None and r[1] > gmax:
        gmax = float(np.ceil(np.nanpercentile(data, 99.5) / 50.0) * 50.0) or gmax
    mnem = safe_text(curve.mnemonic, 12)
    _header(f.axes["gr"], unit_label(curve.mnemonic, curve.unit, 12), _COLOURS["gr"], 0.0, gmax)
    f.axes["gr"].plot(data, f.y, color=_COLOURS["gr"], lw=0.8, zorder=3)
    f.handles.append(Line2D([], [], color=_COLOURS["gr"], lw=1, label=f"{mnem} (gamma ray)"))


def _draw_phik(f: _Frame, result: WellResult) -> None:
    ax = f.axes["phik"]
    tw = _twin(ax)  # before the header: twiny moves the original scale to the bottom
    _header(ax, "Porosity [fraction]", _COLOURS["phi"], *_PHI_RANGE,
            ticks=[0.0, 0.1, 0.2, 0.3, 0.4])
    ax.plot(np.asarray(result.phi, dtype=float), f.y, color=_COLOURS["phi"], lw=0.8, zorder=3,
            label="Porosity")
    _header(tw, "Permeability [mD]", _COLOURS["k"], *_K_RANGE_MD, log=True,
            ticks=[0.01, 1.0, 100.0, 1.0e4], outward=34)
    k_md = _positive(np.asarray(result.k, dtype=float) / C.MILLIDARCY)
    tw.plot(k_md, f.y, color=_COLOURS["k"], lw=0.8, zorder=3, label="Permeability")
    f.handles.append(Line2D([], [], color=_COLOURS["phi"], lw=1, label="Porosity"))
    f.handles.append(Line2D([], [], color=_COLOURS["k"], lw=1, label="Permeability"))


def _draw_rt(f: _Frame, result: WellResult) -> None:
    ax = f.axes["rt"]
    rt_name = (result.roles or {}).get("resistivity") or "RT"
    _header(ax, f"Resistivity {safe_text(rt_name, 12)} [ohm.m]", _COLOURS["rt"],
            *_RT_RANGE, log=True, ticks=[0.2, 2.0, 20.0, 200.0, 2000.0])
    ax.grid(True, axis="x", which="minor", color=_COLOURS["grid"], lw=0.3, zorder=0.5)
    ax.plot(_positive(result.rt), f.y, color=_COLOURS["rt"], lw=0.8, zorder=3,
            label="Resistivity")
    f.handles.append(Line2D([], [], color=_COLOURS["rt"], lw=1, label="Resistivity"))


def _hydrocarbon_kind(result: WellResult) -> np.ndarray:
    """Hydrocarbon name of each sample's zone (``""`` outside zones)."""
    zones = result.zones or []
    kinds = np.array([str(z.hydrocarbon).lower() for z in zones] + [""], dtype=object)
    zone_idx = _int_array(result.shm.zone, -1)
    valid = (zone_idx >= 0) & (zone_idx < len(zones))
    return kinds[np.where(valid, zone_idx, len(zones))]


def _draw_sw(f: _Frame, result: WellResult) -> None:
    ax = f.axes["sw"]
    _header(ax, "Water saturation [fraction]", _COLOURS["sw_shm"], 0.0, 1.0,
            ticks=[0.0, 0.25, 0.5, 0.75, 1.0])
    sw = np.asarray(result.shm.sw, dtype=float)
    sw_ok = np.isfinite(sw) & np.isfinite(f.y)
    kind = _hydrocarbon_kind(result)
    for hc in sorted(set(kind[sw_ok & (sw < 1.0)].tolist())):
        colour = _HC_FILLS.get(hc, _HC_OTHER)
        ax.fill_betweenx(f.y, sw, 1.0, where=sw_ok & (kind == hc), color=colour, alpha=0.55,
                         lw=0, zorder=1)
        f.handles.append(Patch(facecolor=colour, alpha=0.55, label=hydrocarbon_label(hc)))
    if result.sw_log is not None:
        sw_log = np.asarray(result.sw_log, dtype=float)
        both = sw_ok & np.isfinite(sw_log)
        if both.any():
            ax.fill_betweenx(f.y, sw_log, sw, where=both, facecolor="none",
                             edgecolor=_COLOURS["sw_diff"], hatch="////", lw=0, zorder=2)
            f.handles.append(Patch(facecolor="none", edgecolor=_COLOURS["sw_diff"],
                                   hatch="////", label="Log Sw \u2212 SHM Sw"))
        ax.plot(sw_log, f.y, color=_COLOURS["sw_log"], lw=0.9, zorder=3)
        f.handles.append(Line2D([], [], color=_COLOURS["sw_log"], lw=1,
                                label=log_sw_label(result.sw_log_source)))
    ax.plot(sw, f.y, color=_COLOURS["sw_shm"], lw=1.1, zorder=3.2)
    f.handles.append(Line2D([], [], color=_COLOURS["sw_shm"], lw=1.2, label="SHM Sw"))
    _draw_flags(f, ax, result.shm.flag)


def _draw_flags(f: _Frame, ax, flag) -> None:
    """Flag strip at the left edge of the Sw track: x in axes fraction, y in data."""
    flag = _int_array(flag, 0)
    only_no_zone = flag == FLAG_NO_ZONE
    other_flags = (flag != 0) & ~only_no_zone
    strip = ax.get_yaxis_transform()
    if only_no_zone.any():
        ax.fill_betweenx(f.y, 0.0, 0.035, where=only_no_zone, transform=strip,
                         color=_COLOURS["no_zone"], lw=0, zorder=4)
        f.handles.append(Patch(color=_COLOURS["no_zone"], label="Outside every zone"))
    if other_flags.any():
        ax.fill_betweenx(f.y, 0.0, 0.035, where=other_flags, transform=strip,
                         color=_COLOURS["flag"], lw=0, zorder=4.1)
        f.handles.append(Patch(color=_COLOURS["flag"],
                               label="Flagged (bad input or J outside range)"))


def _draw_height(f: _Frame, result: WellResult, units: str, notes: list[str]) -> None:
    """Height above the FWL and J (log scale) in the last track."""
    ax = f.axes["h"]
    tw = _twin(ax)
    h = np.asarray(result.shm.hafwl, dtype=float) / f.scale
    hr = _finite_range(h)
    if hr is None:
        hlo, hhi = (-10.0, 100.0) if units == "metric" else (-30.0, 300.0)
    else:
        hlo, hhi = min(hr[0], 0.0), max(hr[1], 0.0)
        pad = 0.05 * (hhi - hlo) or 1.0
        hlo, hhi = hlo - pad, hhi + pad
    _header(ax, f"Height above FWL [{f.length_unit}]", _COLOURS["hafwl"], hlo, hhi)
    ax.axvline(0.0, color=_COLOURS["zone_edge"], lw=0.8, zorder=0.7)
    ax.plot(h, f.y, color=_COLOURS["hafwl"], lw=1.0, zorder=3)
    f.handles.append(Line2D([], [], color=_COLOURS["hafwl"], lw=1, label="Height above FWL"))
    jpos = _positive(result.shm.j)
    jr = _finite_range(jpos)
    if jr is None:
        jlo, jhi = 0.01, 10.0
    else:
        jlo = 10.0 ** np.floor(np.log10(jr[0]))
        jhi = 10.0 ** np.ceil(np.log10(jr[1]))
        if jhi <= jlo:
            jhi = jlo * 10.0
    _header(tw, "J [-]", _COLOURS["j"], jlo, jhi, log=True, outward=34)
    tw.plot(jpos, f.y, color=_COLOURS["j"], lw=0.8, zorder=3)
    f.handles.append(Line2D([], [], color=_COLOURS["j"], lw=1, label="J"))
    if notes:
        ax.text(0.03, 0.005, "\n".join(notes), transform=ax.transAxes, ha="left",
                va="bottom", fontsize=7, color=BLUE, zorder=6,
                bbox=dict(facecolor="white", edgecolor="none", alpha=0.8, pad=1.0))


def _title_and_legend(f: _Frame, result: WellResult, title: str | None) -> None:
    fig_w, fig_h = f.fig.get_size_inches()
    name = safe_text(title if title is not None else result.well.name, 80)
    f.fig.text(0.5, 1.0 - 0.18 / fig_h, name, ha="center", va="top", fontsize=13,
               fontweight="bold")
    primary = "MD" if f.depth_axis == "md" else "TVDSS"
    sub = f"Depth: {primary} [{f.length_unit}]"
    if result.datum_elevation:
        sub += (f"; depth datum {result.datum_elevation / f.scale:.6g} {f.length_unit} "
                "above sea level")
    f.fig.text(0.5, 1.0 - 0.48 / fig_h, sub, ha="center", va="top", fontsize=8, color="#444444")
    ncol = max(1, min(5, int((fig_w - 0.4) // 2.1)))
    f.fig.legend(handles=f.handles, loc="lower center", bbox_to_anchor=(0.5, 0.05 / fig_h),
                 ncol=ncol, fontsize=8, frameon=False, handlelength=2.2)


# ---------------------------------------------------------------------- the plot


def track_plot(result: WellResult, depth_axis: str = "md", units: str = "metric",
               title: str | None = None) -> Figure:
    """One well's track plot as a figure (the caller writes it).

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
        ``name``, ``top``, ``base``, ``fwl`` and ``gas_oil_level`` (TVDSS [m],
        positive down, the last None for two-phase zones) and ``hydrocarbon``
        (``"oil"``, ``"gas"`` or ``"air"``).
    depth_axis : {"md", "tvdss"}
        Main depth scale; the other is shown as a second scale on the left. TVDSS
        is ``result.tvdss`` [m]; MD <-> TVDSS is interpolated between samples.
    units : {"metric", "field"}
        Depth and height shown in m (metric) or ft (field).
    title : str, optional
        Title text; the well name by default. ``$`` in it is shown as written.

    Returns
    -------
    matplotlib.figure.Figure
        The figure, with an Agg canvas.

    Raises
    ------
    DepthError
        Unknown ``depth_axis``; no depth samples; TVDSS asked but all missing.
    UnitError
        Unknown ``units``.
    SatHeightError
        A result array does not match the well's number of samples.
    """
    md, tvdss = _checked_depths(result, depth_axis, units)
    gr = _gr_curve(result)
    tracks = _track_list(result, gr)
    f = _frame(result, md, tvdss, depth_axis, units, tracks)
    _depth_scales(f, tracks[0][1])
    zones = list(result.zones or [])
    notes = _draw_fwls(f, _draw_zones(f, zones))
    _draw_free_oil_levels(f, zones)
    if gr is not None:
        _draw_gr(f, gr)
    _draw_phik(f, result)
    if result.rt is not None:
        _draw_rt(f, result)
    _draw_sw(f, result)
    _draw_height(f, result, units, notes)
    _title_and_legend(f, result, title)
    return f.fig
