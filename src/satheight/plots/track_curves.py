"""The curves of the track plot, one function per track kind."""

from __future__ import annotations

import numpy as np

from .. import constants as C
from ..results import FLAG_NO_ZONE
from .style import BLACK, BLUE, GREEN, ORANGE, PURPLE, SKY, VERMILLION, YELLOW
from .text import hydrocarbon_label, log_sw_label, safe_text, unit_label
from .track_frame import (NO_ZONE, ZONE_EDGE, Frame, finite_range, header, int_array, positive,
                          twin)

# Track scales (display units). Porosity [fraction], permeability [mD],
# resistivity [ohm.m], saturation [fraction], J [-] (the same in every well).
PHI_RANGE = (0.0, 0.4)
K_RANGE_MD = (0.01, 1.0e4)
RT_RANGE = (0.2, 2000.0)
J_RANGE = (1.0e-3, 1.0e2)
_GR_DEFAULT_MAX = 150.0

_HC_FILLS = {"oil": ORANGE, "gas": PURPLE, "air": YELLOW}
_HC_OTHER = "#BBBBBB"
_HC_ALPHA = 0.35
_WETTER = SKY          # log Sw above SHM Sw
_DRIER = VERMILLION    # log Sw below SHM Sw
_FLAG = "#333333"
#: The Monte Carlo band of SHM Sw: a grey (no hue, so it reads the same to every eye) fill
#: with thin grey edges, under the SHM Sw line and over the hydrocarbon shading.
_BAND = "#555555"
_BAND_ALPHA = 0.35
#: Legend text of the band: the percentile convention as the run's files state it.
BAND_LABEL = ("SHM Sw P10–P90 band (Monte Carlo; P90 = high Sw:\n"
              "volume exceeded with 90 % probability)")


def draw_gr(f: Frame, gr) -> None:
    from matplotlib.lines import Line2D

    curve, data = gr
    data = f.take(data)
    r = finite_range(data)
    gmax = _GR_DEFAULT_MAX
    if r is not None and r[1] > gmax:
        gmax = float(np.ceil(np.nanpercentile(data, 99.5) / 50.0) * 50.0) or gmax
    mnem = safe_text(curve.mnemonic, 12)
    header(f.axes["gr"], unit_label(curve.mnemonic, curve.unit, 12), GREEN, 0.0, gmax)
    f.line(f.axes["gr"], data, color=GREEN, lw=0.8, zorder=3)
    f.handles.append(Line2D([], [], color=GREEN, lw=1, label=f"{mnem} (gamma ray)"))


def draw_phik(f: Frame, phi, k) -> None:
    """Porosity [fraction] and permeability [m^2, drawn in mD on a log scale]."""
    from matplotlib.lines import Line2D

    ax = f.axes["phik"]
    tw = twin(ax)  # before the header: twiny moves the original scale to the bottom
    header(ax, "Porosity [fraction]", BLUE, *PHI_RANGE, ticks=[0.0, 0.1, 0.2, 0.3, 0.4])
    f.line(ax, f.take(phi), color=BLUE, lw=0.8, zorder=3, label="Porosity")
    header(tw, "Permeability [mD]", VERMILLION, *K_RANGE_MD, log=True,
           ticks=[0.01, 1.0, 100.0, 1.0e4], outward=34)
    f.line(tw, positive(f.take(k) / C.MILLIDARCY), color=VERMILLION, lw=0.8, zorder=3,
           label="Permeability")
    f.handles.append(Line2D([], [], color=BLUE, lw=1, label="Porosity"))
    f.handles.append(Line2D([], [], color=VERMILLION, lw=1, label="Permeability"))


def draw_rt(f: Frame, rt, name: str) -> None:
    from matplotlib.collections import LineCollection
    from matplotlib.lines import Line2D

    ax = f.axes["rt"]
    header(ax, f"Resistivity {safe_text(name, 12)} [ohm.m]", BLACK, *RT_RANGE, log=True,
           ticks=[0.2, 2.0, 20.0, 200.0, 2000.0])
    decades = np.arange(np.floor(np.log10(RT_RANGE[0])), np.ceil(np.log10(RT_RANGE[1])))
    xs = (10.0 ** decades[:, None] * np.arange(2, 10)[None, :]).ravel()
    xs = xs[(xs > RT_RANGE[0]) & (xs < RT_RANGE[1])]
    ax.add_collection(LineCollection(  # minor grid of the log scale, without tick objects
        np.stack([np.column_stack([xs, np.zeros_like(xs)]),
                  np.column_stack([xs, np.ones_like(xs)])], axis=1),
        colors="#D9D9D9", linewidths=0.3, zorder=0.5, transform=ax.get_xaxis_transform()))
    f.line(ax, positive(f.take(rt)), color=BLACK, lw=0.8, zorder=3, label="Resistivity")
    f.handles.append(Line2D([], [], color=BLACK, lw=1, label="Resistivity"))


def hydrocarbon_kind(zones, zone) -> np.ndarray:
    """Hydrocarbon name of each sample's zone (``""`` outside zones)."""
    kinds = np.array([str(z.hydrocarbon).lower() for z in zones] + [""], dtype=str)
    zone_idx = int_array(zone, -1)
    valid = (zone_idx >= 0) & (zone_idx < len(zones))
    return kinds[np.where(valid, zone_idx, len(zones))]


def draw_sw(f: Frame, sw, sw_log, source: str, kind) -> None:
    """SHM Sw (thick, under) and log Sw (thin, over it), hydrocarbon and difference fills.

    ``sw``, ``sw_log`` [fraction] and ``kind`` are the drawn samples. The hydrocarbon
    (1 - SHM Sw) is shaded pale by fluid; where log Sw lies above SHM Sw the gap is
    shaded sky blue (log wetter than the model), where below, vermilion (log drier).
    """
    from matplotlib.lines import Line2D
    from matplotlib.patches import Patch

    ax = f.axes["sw"]
    header(ax, "Water saturation [fraction]", BLACK, 0.0, 1.0, ticks=[0.0, 0.25, 0.5, 0.75, 1.0])
    sw_ok = np.isfinite(sw) & np.isfinite(f.y)
    for hc in sorted(set(kind[sw_ok & (sw < 1.0)].tolist())):
        colour = _HC_FILLS.get(hc, _HC_OTHER)
        f.fill(ax, sw, 1.0, sw_ok & (kind == hc), color=colour, alpha=_HC_ALPHA, lw=0, zorder=1)
        f.handles.append(Patch(facecolor=colour, alpha=_HC_ALPHA, label=hydrocarbon_label(hc)))
    if sw_log is not None:
        both = sw_ok & np.isfinite(sw_log)
        # one fill each between SHM Sw and max / min of the two curves: zero width where
        # the other side holds, so a noisy log gives one shape, not one per crossing
        if (both & (sw_log > sw)).any():
            f.fill(ax, sw, np.fmax(sw, sw_log), both, color=_WETTER, alpha=0.75, lw=0, zorder=2)
            f.handles.append(Patch(color=_WETTER, alpha=0.75, label="Log Sw above SHM Sw"))
        if (both & (sw_log < sw)).any():
            f.fill(ax, np.fmin(sw, sw_log), sw, both, color=_DRIER, alpha=0.6, lw=0, zorder=2)
            f.handles.append(Patch(color=_DRIER, alpha=0.6, label="Log Sw below SHM Sw"))
    f.line(ax, sw, color=BLACK, lw=2.0, zorder=3.0, label="SHM Sw")
    f.handles.append(Line2D([], [], color=BLACK, lw=2.0, label="SHM Sw"))
    if sw_log is not None:
        f.line(ax, sw_log, color=BLUE, lw=0.9, zorder=3.3, label="Log Sw")
        f.handles.append(Line2D([], [], color=BLUE, lw=0.9, label=log_sw_label(source)))


def draw_sw_band(f: Frame, p10, p90) -> None:
    """The P10-P90 band of SHM Sw on the Sw track: a grey fill between the two drawn
    percentile curves [fraction] with thin edges, thinned like every fill; nothing
    where either curve is missing."""
    from matplotlib.patches import Patch

    ax = f.axes["sw"]
    ok = np.isfinite(p10) & np.isfinite(p90) & np.isfinite(f.y)
    if not ok.any():
        return
    f.fill(ax, p10, p90, ok, color=_BAND, alpha=_BAND_ALPHA, lw=0, zorder=2.5)
    for curve, name in ((p10, "SW_P10"), (p90, "SW_P90")):
        f.line(ax, np.where(ok, curve, np.nan), color=_BAND, lw=0.5, zorder=2.6, label=name)
    f.handles.append(Patch(facecolor=(0x55 / 255,) * 3 + (_BAND_ALPHA,), edgecolor=_BAND,
                           lw=0.5, label=BAND_LABEL))


def draw_flags(f: Frame, flag) -> None:
    """Flag strip at the left edge of the Sw track: x in axes fraction, y in data."""
    from matplotlib.patches import Patch

    ax = f.axes["sw"]
    flag = int_array(flag, 0)
    only_no_zone = flag == FLAG_NO_ZONE
    other_flags = (flag != 0) & ~only_no_zone
    strip = ax.get_yaxis_transform()
    if only_no_zone.any():
        f.fill(ax, 0.0, 0.035, only_no_zone, transform=strip, color=NO_ZONE, lw=0, zorder=4)
        f.handles.append(Patch(color=NO_ZONE, label="Outside every zone"))
    if other_flags.any():
        f.fill(ax, 0.0, 0.035, other_flags, transform=strip, color=_FLAG, lw=0, zorder=4.1)
        f.handles.append(Patch(color=_FLAG, label="Flagged (bad input or J outside range)"))


def draw_pressure_header(f: Frame, values, unit: str) -> None:
    """Scale of the pressure track from the points shown [display unit]."""
    from matplotlib.ticker import MaxNLocator

    r = finite_range(values) or (0.0, 1.0)
    pad = 0.05 * (r[1] - r[0]) or max(abs(r[0]) * 0.01, 1.0)
    ax = f.axes["p"]
    header(ax, f"Pressure [{safe_text(unit, 8)}]", BLACK, r[0] - pad, r[1] + pad)
    ax.xaxis.set_major_locator(MaxNLocator(2))


def draw_height(f: Frame, h, j, units: str, notes: list[str], j_range) -> None:
    """Height above the FWL [display unit] and J [-] on a fixed log scale in the last track."""
    from matplotlib.lines import Line2D

    ax = f.axes["h"]
    tw = twin(ax)
    hr = finite_range(h)
    if hr is None:
        hlo, hhi = (-10.0, 100.0) if units == "metric" else (-30.0, 300.0)
    else:
        hlo, hhi = min(hr[0], 0.0), max(hr[1], 0.0)
        pad = 0.05 * (hhi - hlo) or 1.0
        hlo, hhi = hlo - pad, hhi + pad
    header(ax, f"Height above FWL [{f.length_unit}]", BLUE, hlo, hhi)
    ax.axvline(0.0, color=ZONE_EDGE, lw=0.8, zorder=0.7)
    f.line(ax, h, color=BLUE, lw=1.0, zorder=3)
    f.handles.append(Line2D([], [], color=BLUE, lw=1, label="Height above FWL"))
    header(tw, "J [-]", VERMILLION, *j_range, log=True, outward=34)
    f.line(tw, positive(j), color=VERMILLION, lw=0.8, zorder=3)
    f.handles.append(Line2D([], [], color=VERMILLION, lw=1, label="J"))
    if notes:
        ax.text(0.03, 0.005, "\n".join(notes), transform=ax.transAxes, ha="left",
                va="bottom", fontsize=7, color=BLUE, zorder=6,
                bbox=dict(facecolor="white", edgecolor="none", alpha=0.8, pad=1.0))
