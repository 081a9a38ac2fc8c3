"""Depth bookkeeping of well plots: MD <-> TVDSS maps, level crossings, zone intervals.

Every function takes plot depths and TVDSS in metres, positive down, and works on
whole arrays (one pass per interval, never per sample).
"""

from __future__ import annotations

from typing import Callable

import numpy as np


def monotone_pairs(x: np.ndarray, y: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Finite (x, y) pairs with x strictly increasing, keeping the first of repeats."""
    ok = np.isfinite(x) & np.isfinite(y)
    x, y = x[ok], y[ok]
    if x.size == 0:
        return x, y
    # drop samples that do not go deeper than every earlier one (flat or upturned parts)
    prev_max = np.maximum.accumulate(np.concatenate(([-np.inf], x[:-1])))
    keep = x > prev_max
    return x[keep], y[keep]


def mapping(x: np.ndarray, y: np.ndarray) -> Callable[[np.ndarray], np.ndarray]:
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


def level_crossings(depth: np.ndarray, tvdss: np.ndarray, level: float) -> np.ndarray:
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


def zone_intervals(depth: np.ndarray, tvdss: np.ndarray, top: float,
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
