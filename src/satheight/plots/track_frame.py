"""The frame shared by the drawing steps of the track plot: axes, depth scale, thinning.

:class:`Frame` holds the figure, one axes per track and the samples inside the
plotted depth window; its :meth:`Frame.line` and :meth:`Frame.fill` draw a curve
or a filled area thinned to the figure's resolution with a min/max envelope
(:func:`satheight.plots.decimate.envelope_indices`); filled areas are drawn as one
compound path each (:func:`satheight.plots.fills.fill_depth`).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from typing import TYPE_CHECKING

import numpy as np

if TYPE_CHECKING:  # matplotlib is imported where a figure is drawn (~0.3 s at start)
    from matplotlib.figure import Figure

from .decimate import BINS_PER_INCH, depth_bins, envelope_indices
from .depths import level_crossings
from .fills import fill_depth
from .style import BLUE, GRID, LIGHT_GREY, SKY

#: Colour of each curve or mark of the track plot (our own choice within the palette).
FWL_COLOUR = SKY
ZONE_EDGE = "#A0A0A0"
NO_ZONE = LIGHT_GREY


@dataclass
class Frame:
    """What every track-drawing step needs: the figure, its axes and the depth window.

    ``sel`` are the indices of the samples drawn (those inside the window and one
    either side); ``y`` is their plot depth [display unit]. ``md`` and ``tvdss``
    are the whole well's arrays [m] (levels and zone edges are found on them).
    """

    fig: Figure
    axes: dict
    sel: np.ndarray
    y: np.ndarray
    scale: float             # display unit -> m
    length_unit: str
    depth_axis: str
    y_top: float
    y_base: float
    md: np.ndarray
    tvdss: np.ndarray
    have_tvdss: bool
    plot_height: float       # [inch]
    handles: list = field(default_factory=list)

    @property
    def last(self):
        return list(self.axes.values())[-1]

    def take(self, a) -> np.ndarray:
        """The drawn samples of a whole-well array, as floats."""
        return np.asarray(a, dtype=float)[self.sel]

    def _bins(self) -> int:
        return max(1, int(self.plot_height * BINS_PER_INCH))

    @cached_property
    def ybins(self) -> np.ndarray:
        """Depth bin of every drawn sample (computed once for all curves)."""
        return depth_bins(self.y, self.y_top, self.y_base, self._bins())

    def _thin(self, curves, categories=None) -> np.ndarray:
        return envelope_indices(self.y, curves, self.y_top, self.y_base, self._bins(),
                                categories=categories, ybins=self.ybins)

    def line(self, ax, x, **kw) -> None:
        """Draw curve ``x`` (drawn samples) against depth, thinned to the resolution."""
        i = self._thin([x])
        ax.plot(np.asarray(x)[i], self.y[i], **kw)

    def fill(self, ax, x1, x2, where, **kw) -> None:
        """Fill between ``x1`` and ``x2`` where ``where`` holds, thinned to the resolution.

        ``x1`` and ``x2`` are drawn samples or single numbers (a constant edge).
        """
        x1, x2 = np.asarray(x1, dtype=float), np.asarray(x2, dtype=float)
        i = self._thin([x for x in (x1, x2) if x.ndim], categories=where)
        x1, x2 = (x[i] if x.ndim else x for x in (x1, x2))
        fill_depth(ax, self.y[i], x1, x2, where=np.asarray(where)[i], **kw)

    def level_depths(self, level: float) -> np.ndarray:
        """Plot depths [display unit] where the well passes TVDSS ``level`` [m], in view."""
        if self.depth_axis == "tvdss":
            ys = np.array([level])
        else:
            ys = level_crossings(self.md, self.tvdss, level) if self.have_tvdss else np.empty(0)
        ys = ys / self.scale
        return ys[(ys >= self.y_top) & (ys <= self.y_base)]

    def hline_all(self, yy: float, label: str, colour: str, lw: float, ls) -> None:
        """A level across every track, labelled at the right of the last track."""
        for ax in self.axes.values():
            ax.axhline(yy, color=colour, lw=lw, ls=ls, zorder=3.5)
        self.last.text(0.97, yy, label, transform=self.last.get_yaxis_transform(), ha="right",
                       va="bottom", fontsize=8, color=BLUE if colour == FWL_COLOUR else colour,
                       zorder=6, bbox=dict(facecolor="white", edgecolor="none", alpha=0.7,
                                           pad=0.5))


# ------------------------------------------------------------------------ helpers


def positive(a) -> np.ndarray:
    """Copy of ``a`` with non-positive and non-finite values as NaN (for log axes)."""
    a = np.asarray(a, dtype=float)
    return np.where(np.isfinite(a) & (a > 0.0), a, np.nan)


def number(v) -> float:
    """``v`` as a float, NaN when None or not a number."""
    try:
        return float(v) if v is not None else float("nan")
    except (TypeError, ValueError):
        return float("nan")


def int_array(a, missing: int) -> np.ndarray:
    """Integer copy of ``a`` with non-finite entries set to ``missing``."""
    a = np.asarray(a)
    if a.dtype.kind == "f":
        a = np.where(np.isfinite(a), a, missing)
    return a.astype(np.int64)


def finite_range(a) -> tuple[float, float] | None:
    """(min, max) of the finite values, None when there is none."""
    a = np.asarray(a, dtype=float)
    a = a[np.isfinite(a)]
    if a.size == 0:
        return None
    return float(a.min()), float(a.max())


def _plain_format(v, _pos=None) -> str:
    return f"{v:g}"


def header(ax, label: str, colour: str, lo: float, hi: float, log: bool = False,
           ticks=None, outward: float = 0.0) -> None:
    """Put a track's scale at the top: label, limits and ticks in the curve colour."""
    from matplotlib.ticker import (FixedLocator, FuncFormatter, LogLocator, NullFormatter,
                                   NullLocator)

    if log:
        ax.set_xscale("log")
    ax.set_xlim(lo, hi)
    ax.xaxis.set_ticks_position("top")
    ax.xaxis.set_label_position("top")
    ax.spines["top"].set_position(("outward", outward))
    narrow = ax.get_position().width * ax.figure.get_size_inches()[0] < 1.3   # [inch]
    if narrow:   # a narrow track (A4 page): the unit under the name, smaller text
        label = label.replace(" [", "\n[", 1)
    ax.set_xlabel(label, color=colour, fontsize=7.5 if narrow else 9, labelpad=3)
    ax.tick_params(axis="x", colors=colour, labelsize=6 if narrow else 7, pad=1, length=3)
    if ticks is not None:
        ax.xaxis.set_major_locator(FixedLocator(ticks))
        ax.xaxis.set_major_formatter(FuncFormatter(_plain_format))
    elif log:
        ax.xaxis.set_major_locator(LogLocator(base=10, numticks=5))
        ax.xaxis.set_major_formatter(FuncFormatter(_plain_format))
    if log:
        ax.xaxis.set_minor_locator(NullLocator())   # minor ticks: many tick objects, no reading
        ax.xaxis.set_minor_formatter(NullFormatter())


def twin(ax):
    """A second x scale on the same track (transparent, top spine only)."""
    tw = ax.twiny()
    tw.patch.set_visible(False)
    for side in ("bottom", "left", "right"):
        tw.spines[side].set_visible(False)
    tw.grid(False)
    return tw


GRID_COLOUR = GRID
