"""Depth scales of the track plot drawn as a few artists, not one tick object per depth.

A labelled depth scale is a spine (for a scale beside the plot), its tick marks as
one line collection and one text per labelled depth (a figure text), all placed in
the first track's y-axis transform (x in axes fraction, y in plot depth). Matplotlib's own
tick objects cost about 2 ms each to build and draw; a long well has about 70
labelled depths on each of its two scales. Sizes follow matplotlib's default y
ticks (length 3.5 pt, width 0.8 pt, label 3.5 pt from the tick, axis label 4 pt
from the numbers), so the picture is that of an ordinary axis.
"""

from __future__ import annotations

import numpy as np

#: gid of each scale's tick marks (a line collection) and number labels (texts).
TICKS_GID = {"main": "depth ticks", "other": "second depth ticks"}
LABELS_GID = {"main": "depth labels", "other": "second depth labels"}
#: gid of the second scale's axis label (``MD [m]`` or ``TVDSS [m]``).
OTHER_TITLE_GID = "second depth scale name"

TICK_LENGTH = 3.5    # [pt]
TICK_WIDTH = 0.8     # [pt]
TICK_PAD = 3.5       # [pt] between tick and number
LABEL_PAD = 4.0      # [pt] between the numbers and the axis label
SPINE_WIDTH = 0.8    # [pt]


def multiples(lo: float, hi: float, step: float) -> np.ndarray:
    """Multiples of ``step`` from ``lo`` to ``hi`` (either order), ends included."""
    lo, hi = min(lo, hi), max(lo, hi)
    k0, k1 = np.ceil(lo / step - 1e-9), np.floor(hi / step + 1e-9)
    return np.arange(k0, k1 + 1.0) * step


def depth_text(v: float) -> str:
    """A labelled depth as written on the scale: whole units, a true minus sign."""
    s = f"{v:.0f}"
    return "0" if s == "-0" else s.replace("-", "\N{MINUS SIGN}")


def draw_scale(ax, which: str, values: np.ndarray, at: np.ndarray, x: float, colour: str,
               fontsize: float = 8.0, spine: bool = False) -> float:
    """Ticks and numbers of one depth scale at ``x`` [axes fraction] on ``ax``.

    Parameters
    ----------
    ax : matplotlib.axes.Axes
        The first track's axes (its y limits are the plot depths).
    which : {"main", "other"}
        The scale (names the gids of its artists).
    values : numpy.ndarray
        The depths written [display unit].
    at : numpy.ndarray
        Plot depth of each written depth [display unit] (``values`` on the main scale).
    x : float
        Position of the scale's line [fraction of the axes width]; ticks point left.
    colour : str
        Colour of ticks and numbers.
    fontsize : float
        Size of the numbers [pt].
    spine : bool
        Also draw the scale's vertical line (a scale beside the plot has no axes edge).

    Returns
    -------
    float
        Left edge of the widest number [fraction of the axes width], where the axis
        label goes.
    """
    from matplotlib.collections import LineCollection
    from matplotlib.lines import Line2D

    width_in = ax.get_position().width * ax.figure.get_size_inches()[0]   # [inch]
    pt = 1.0 / 72.0 / width_in                                            # 1 pt [axes fraction]
    tf = ax.get_yaxis_transform()
    at = np.asarray(at, dtype=float)
    segs = np.stack([np.column_stack([np.full_like(at, x - TICK_LENGTH * pt), at]),
                     np.column_stack([np.full_like(at, x), at])], axis=1)
    ax.add_collection(LineCollection(segs, colors=colour, linewidths=TICK_WIDTH, clip_on=False,
                                     transform=tf, gid=TICKS_GID[which], zorder=2.01,
                                     capstyle="projecting"))
    if spine:
        ax.add_line(Line2D([x, x], [0.0, 1.0], transform=ax.transAxes, color="black",
                           lw=SPINE_WIDTH, clip_on=False, zorder=2.5, solid_capstyle="projecting"))
    xl = x - (TICK_LENGTH + TICK_PAD) * pt
    texts = [depth_text(v) for v in values]
    for s, y in zip(texts, at):   # on the figure: an axes text gets a clip path (~2 ms each)
        ax.figure.text(xl, y, s, transform=tf, ha="right", va="center_baseline",
                       fontsize=fontsize, color=colour, gid=LABELS_GID[which])
    return xl - _widest(ax.figure, texts, fontsize) * pt


def _widest(fig, texts: list[str], fontsize: float) -> float:
    """Width of the widest of ``texts`` at ``fontsize`` [pt] (0 when there is none)."""
    if not texts:
        return 0.0
    from matplotlib.font_manager import FontProperties

    renderer = fig.canvas.get_renderer()
    prop = FontProperties(size=fontsize)
    # digits share one width: the longest texts and the two ends (signs) are the widest
    some = {texts[0], texts[-1], max(texts, key=len)}
    w = max(renderer.get_text_width_height_descent(s, prop, ismath=False)[0] for s in some)
    return w * 72.0 / fig.dpi


def title_position(ax, left: float) -> float:
    """x [axes fraction] of a depth scale's axis label whose numbers reach ``left``."""
    width_in = ax.get_position().width * ax.figure.get_size_inches()[0]
    return left - LABEL_PAD / 72.0 / width_in
