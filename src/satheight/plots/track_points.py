"""Measured points on the track plot: core plugs and formation pressures.

Core plugs sit on the tracks of the quantity they measure, as filled markers with a
black edge so they stand out from the curve of the same colour: plug porosity (blue
triangles) and permeability (vermilion squares) on the porosity-permeability track,
plug Sw (yellow diamonds) on the saturation track. Formation pressures sit on their
own narrow track, coloured by the fluid the file names (water blue, oil orange, gas
purple as the hydrocarbon fills, unknown grey); points the pressure fit leaves out
(quality poor or bad, or rejected as outliers) are hollow; points without a fluid
are green. The free-water level the pressures imply is a
dash-dot sky-blue line across the pressure track with its interval shaded. Points
outside the plotted depths are counted in a note on the figure, never dropped
silently. Colours are those of :mod:`satheight.plots.style`.
"""

from __future__ import annotations

import numpy as np

from .. import constants as C
from .style import BLACK, BLUE, GREEN, GREY, ORANGE, PURPLE, VERMILLION, YELLOW
from .text import safe_text
from .track_curves import K_RANGE_MD, draw_pressure_header
from .track_frame import FWL_COLOUR, Frame

__all__ = ["FLUID_COLOURS", "draw_core", "draw_pressures", "count_outside"]

#: Marker colour of a pressure point by the fluid of the file's ``fluid`` column.
FLUID_COLOURS = {"water": BLUE, "oil": ORANGE, "gas": PURPLE, "unknown": GREY}
_MS = 5.0


def count_outside(f: Frame, y) -> int:
    """How many points have no plot depth or one outside the plotted window."""
    y = np.asarray(y, dtype=float)
    return int(np.count_nonzero(~(np.isfinite(y) & (y >= f.y_top) & (y <= f.y_base))))


def _marks(f: Frame, ax, x, y, colour: str, marker: str, label: str, *, transform=None,
           hollow=False) -> None:
    """Markers at (x, y) with a black edge, and one legend entry (only if any is drawn)."""
    from matplotlib.lines import Line2D

    x, y = np.asarray(x, dtype=float), np.asarray(y, dtype=float)
    ok = np.isfinite(x) & np.isfinite(y)
    if not ok.any():
        return
    face = "white" if hollow else colour
    kw = dict(ls="none", marker=marker, ms=_MS, mfc=face, mec=colour if hollow else BLACK,
              mew=1.0 if hollow else 0.6)
    ax.plot(x[ok], y[ok], zorder=5, clip_on=True, label=label,
            **({} if transform is None else {"transform": transform}), **kw)
    f.handles.append(Line2D([], [], label=label, **kw))


def draw_core(f: Frame, sw=None, porosity=None, permeability=None) -> None:
    """Plug Sw [fraction], porosity [fraction] and permeability [m^2]: each ``None`` or
    (plot depths, values, legend text).

    Permeability is placed on the log scale of the permeability curve
    (:data:`satheight.plots.track_curves.K_RANGE_MD`) in the track's axes fraction,
    so it needs no handle on the curve's twin scale.
    """
    if sw is not None:
        y, v, label = sw
        _marks(f, f.axes["sw"], v, y, YELLOW, "D", label or "Core plug Sw")
    ax = f.axes["phik"]
    if porosity is not None:
        y, v, label = porosity
        _marks(f, ax, v, y, BLUE, "^", label or "Core plug porosity")
    if permeability is not None:
        y, v, label = permeability
        k_md = np.asarray(v, dtype=float) / C.MILLIDARCY
        with np.errstate(divide="ignore", invalid="ignore"):
            frac = (np.log10(k_md) - np.log10(K_RANGE_MD[0])) / np.log10(K_RANGE_MD[1] / K_RANGE_MD[0])
        frac = np.where(np.isfinite(frac), frac, np.nan)
        _marks(f, ax, frac, y, VERMILLION, "s", label or "Core plug permeability",
               transform=ax.get_yaxis_transform())


def draw_pressures(f: Frame, y, p, unit: str, fluid=None, unused=None, levels=(),
                   label: str = "") -> None:
    """Pressure points [display unit] at plot depths ``y`` on the pressure track.

    Each level's line carries its label as the artist's label (not drawn: the legend
    entry "FWL from pressures" names the lines).

    ``fluid``: the fluid word of each point (colour; without it all points are green,
    in the legend as ``label`` or "Formation pressure"); ``unused``: True where the fit
    leaves the point out (hollow). ``levels``: (label, plot depths, band top, band
    base) of each free-water level the pressures imply, drawn across the track.
    """
    from matplotlib.lines import Line2D
    from matplotlib.patches import Patch

    y, p = np.asarray(y, dtype=float), np.asarray(p, dtype=float)
    shown = np.isfinite(y) & (y >= f.y_top) & (y <= f.y_base)
    draw_pressure_header(f, p[shown], unit)
    ax = f.axes["p"]
    unused = np.zeros(y.shape, bool) if unused is None else np.asarray(unused, bool)
    if fluid is None:
        _marks(f, ax, p[~unused], y[~unused], GREEN, "o", label or "Formation pressure")
        _marks(f, ax, p[unused], y[unused], GREEN, "o", "Not fitted", hollow=True)
        fluid = np.empty(0, dtype=object)
    fluid = np.asarray(fluid, dtype=object)
    for name in sorted(set(fluid.tolist()), key=lambda n: list(FLUID_COLOURS).index(n)
                       if n in FLUID_COLOURS else 9):
        m = fluid == name
        colour = FLUID_COLOURS.get(name, GREY)
        text = f"{label or 'Pressure'}, {safe_text(name, 12)}"
        _marks(f, ax, p[m & ~unused], y[m & ~unused], colour, "o", text)
        _marks(f, ax, p[m & unused], y[m & unused], colour, "o", text + ", not fitted",
               hollow=True)
    drawn = False
    for text, ys, top, base in levels:   # unlabelled on the narrow track: the legend names it
        for yy in ys:
            ax.axhline(yy, color=FWL_COLOUR, lw=1.4, ls="-.", zorder=4, label=text)
            drawn = True
        if np.isfinite(top) and np.isfinite(base) and base > top:
            ax.axhspan(top, base, color=FWL_COLOUR, alpha=0.25, lw=0, zorder=0.8)
    if drawn:
        f.handles.append(Line2D([], [], color=FWL_COLOUR, lw=1.4, ls="-.",
                                label="FWL from pressures"))
        if any(np.isfinite(t) and np.isfinite(b) and b > t for _, _, t, b in levels):
            f.handles.append(Patch(color=FWL_COLOUR, alpha=0.25,
                                   label="FWL from pressures: interval"))
