"""Thinning long logs to the resolution of the figure before drawing them.

A 500,000-sample well drawn on a 1,500-pixel track puts hundreds of samples in
every pixel row; the renderer draws them all (filled areas are not simplified at
all). :func:`envelope_indices` keeps, in every run of samples that fall in one
depth bin, the first and the last sample and those holding the smallest and the
largest value of each curve (a min/max envelope): every spike keeps its extreme,
lines still join the same samples across bin edges, gaps (NaN) and changes of a
category (a fill's ``where`` mask) stay where they are. Everything is vectorised.
"""

from __future__ import annotations

import numpy as np

__all__ = ["envelope_indices", "depth_bins", "BINS_PER_INCH"]

#: Depth bins per inch of track: two per pixel row at 110 dots per inch (each bin keeps
#: up to four samples per curve: first, last, smallest, largest). One bin per row
#: changes about 1 % of the pixels of a spiky curve, two about 0.2 %.
BINS_PER_INCH = 220


def depth_bins(y, lo: float, hi: float, bins: int) -> np.ndarray:
    """Depth bin of each sample over ``[lo, hi]``: 0 .. bins - 1 inside, -1 above, ``bins``
    below, -2 where ``y`` is not finite (int64). Compute it once for curves drawn
    against the same depths and give it to :func:`envelope_indices` as ``ybins``."""
    y = np.asarray(y, dtype=float)
    with np.errstate(invalid="ignore"):
        b = np.floor((y - lo) / (hi - lo) * bins)
    np.clip(b, -1, bins, out=b)
    b[~np.isfinite(y)] = -2
    return b.astype(np.int64)


def _first_extremes(v, starts, lens, pick) -> np.ndarray:
    """Index of the first sample holding each run's extreme (``pick``: min or max ufunc)."""
    hits = np.flatnonzero(v == np.repeat(pick.reduceat(v, starts), lens))
    return hits[np.searchsorted(hits, starts)]   # every run holds its own extreme


def envelope_indices(y, curves, lo: float, hi: float, bins: int, categories=None,
                     ybins=None) -> np.ndarray:
    """Sorted sample indices that draw the same picture as all samples at ``bins`` rows.

    Parameters
    ----------
    y : array_like
        Plot depth of each sample (any order; a well going up and down is fine).
    curves : sequence of array_like
        Curves drawn against ``y`` (same length); the extremes of each are kept.
    lo, hi : float
        Depth range shown; samples outside are thinned with the first bin inside.
    bins : int
        Number of depth bins over ``[lo, hi]`` (e.g. two per pixel row).
    categories : array_like of int or bool, optional
        A per-sample category (e.g. a fill mask): a change of category ends a run.
    ybins : numpy.ndarray, optional
        ``depth_bins(y, lo, hi, bins)``, when already computed.

    Returns
    -------
    numpy.ndarray of int
        Indices into the samples, increasing. All indices when thinning gains nothing.
    """
    y = np.asarray(y, dtype=float)
    n = y.size
    vals = [np.asarray(c, dtype=float) for c in curves]
    if n == 0 or bins < 1 or not (np.isfinite(lo) and np.isfinite(hi)) or hi <= lo:
        return np.arange(n)
    key = depth_bins(y, lo, hi, bins) if ybins is None else ybins
    finite = key != -2
    for v in vals:
        finite &= np.isfinite(v)
    every = bool(finite.all())
    if not every:
        key = np.where(finite, key, -2)
    if categories is not None:
        cat = np.asarray(categories)
        key = key * 4 + (cat.view(np.int8) if cat.dtype == bool else cat.astype(np.int64) % 4)
    starts = np.flatnonzero(key[1:] != key[:-1]) + 1
    starts = np.concatenate(([0], starts))
    if 4 * (1 + len(vals)) * starts.size >= n:
        return np.arange(n)
    lens = np.diff(np.append(starts, n))
    chosen = np.zeros(n, dtype=bool)
    chosen[starts] = True
    chosen[starts + lens - 1] = True
    for v in vals:
        v0 = v if every else np.where(finite, v, 0.0)  # a non-finite run: its first sample
        chosen[_first_extremes(v0, starts, lens, np.minimum)] = True
        chosen[_first_extremes(v0, starts, lens, np.maximum)] = True
    return np.flatnonzero(chosen)
