"""Filled areas between two curves along depth, drawn as one compound path.

matplotlib's ``fill_betweenx`` builds one polygon per run of samples where its
``where`` holds, in a Python loop over the runs through masked arrays; a long log with
a few thousand short gaps (null runs, flagged samples) spends seconds there.
:func:`fill_outline` builds the same polygons (the same vertices in the same order:
start on the second curve, down the first, back up the second, closed) for every
run at once with numpy, as one path of many closed parts, and :func:`fill_depth`
adds that path to an axes as a single patch. The renderer then draws it in one call,
and the picture is that of the separate polygons (Agg renders each part alike).

Differences from separate polygons: two parts that share a pixel row (a gap
narrower than a pixel between them) add their coverage of that pixel, where
separate transparent polygons each blend their own edge and leave a pale line on the
screen that the data do not hold; and where two parts overlap, the path fills the
overlap once (the non-zero rule), where separate polygons would darken it. Parts of
a depth-ordered log never overlap (one run ends before the next starts); when the
depths go back up (a well plotted against TVDSS that climbs), :func:`fill_depth`
leaves the drawing to ``fill_betweenx``.
"""

from __future__ import annotations

import numpy as np

__all__ = ["fill_outline", "fill_depth"]


def fill_outline(y, x1, x2, where=None) -> tuple[np.ndarray, np.ndarray]:
    """Vertices ``(x, y)`` and path codes of the area between ``x1`` and ``x2`` along ``y``.

    Parameters
    ----------
    y : array_like
        Depth of each sample (plot units).
    x1, x2 : array_like or float
        The two curves (a float stands for a constant curve).
    where : array_like of bool, optional
        Samples to fill; as in ``fill_betweenx``, the area between samples ``i`` and
        ``i + 1`` is filled when both hold, and samples with a non-finite ``y``,
        ``x1`` or ``x2`` never do.

    Returns
    -------
    (numpy.ndarray, numpy.ndarray)
        Vertices, shape (M, 2), and matplotlib path codes (M,): for each run of
        ``n`` samples, ``2 n + 3`` vertices: ``(x2, y)`` at the run's first sample,
        ``x1`` down the run, ``x2`` at its last sample, ``x2`` back up the run, and
        the closing vertex.
    """
    from matplotlib.path import Path

    y = np.asarray(y, dtype=float)
    x1 = np.broadcast_to(np.asarray(x1, dtype=float), y.shape)
    x2 = np.broadcast_to(np.asarray(x2, dtype=float), y.shape)
    ok = np.isfinite(y) & np.isfinite(x1) & np.isfinite(x2)
    if where is not None:
        ok &= np.asarray(where, dtype=bool)
    edges = np.diff(np.concatenate(([0], ok.view(np.int8), [0])))
    starts, ends = np.flatnonzero(edges == 1), np.flatnonzero(edges == -1)
    n = ends - starts
    size = 2 * n + 3
    first = np.cumsum(size) - size               # first vertex of each part
    total = int(size.sum())
    run = np.repeat(np.arange(n.size), size)
    p = np.arange(total) - first[run]         # position of each vertex inside its part
    s, m, last = starts[run], n[run], ends[run] - 1
    idx = np.where(p == 0, s, np.where(p <= m, s + p - 1, np.where(
        p == m + 1, last, np.where(p <= 2 * m + 1, last - (p - m - 2), s))))
    on_x1 = (p >= 1) & (p <= m)
    verts = np.column_stack([np.where(on_x1, x1[idx], x2[idx]), y[idx]])
    codes = np.full(total, Path.LINETO, dtype=Path.code_type)
    codes[first] = Path.MOVETO
    codes[first + size - 1] = Path.CLOSEPOLY
    return verts, codes


def fill_depth(ax, y, x1, x2, where=None, **kw):
    """Fill between ``x1`` and ``x2`` along depth ``y`` where ``where`` holds; the artist.

    The picture of ``ax.fill_betweenx(y, x1, x2, where=where, **kw)`` (see
    :func:`fill_outline`) as one patch (in ``ax.patches``); ``kw`` are patch properties
    (``color``, ``alpha``, ``lw``, ``zorder``, ``transform``...). The axes limits are
    not changed: set them before or after. Between two constant edges (a strip) the
    parts are snapped to the pixel grid, as Agg does with a short straight-edged polygon.
    """
    from matplotlib.patches import PathPatch
    from matplotlib.path import Path

    y = np.asarray(y, dtype=float)
    steps = np.diff(y[np.isfinite(y)])
    if (steps < 0).any() and (steps > 0).any():      # depths go back: parts may overlap
        return ax.fill_betweenx(y, x1, x2, where=where, **kw)
    if np.ndim(x1) == 0 and np.ndim(x2) == 0:
        # parts with straight edges only: Agg snaps such a polygon to the pixel grid when
        # it has up to 1024 vertices, so a part thinner than a pixel shows as a whole pixel
        # row or not at all; the compound path is longer, so ask for the same snapping
        kw.setdefault("snap", True)
    verts, codes = fill_outline(y, x1, x2, where)
    patch = PathPatch(Path(verts, codes), **{"transform": ax.transData, **kw})
    ax.add_artist(patch)        # not add_patch: its limit update walks every vertex in Python
    return patch
