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

__all__ = ["envelope_indices", "BINS_PER_INCH"]

#: Depth bins per inch of track: two per pixel row at 110 dots per inch (each bin keeps
#: up to four samples per curve: first, last, smallest, largest). One bin per row
#: changes about 1 % of the pixels of a spiky curve, two about 0.2 %.
BINS_PER_INCH = 220


def _extreme_index(values, starts, run_of, idx, n, pick) -> np.ndarray:
    """Index of the first sample holding the run's extreme (``pick``: min or max ufunc)."""
    ext = pick.reduceat(values, starts)
    hit = values == ext[run_of]
    return np.minimum.reduceat(np.where(hit, idx, n), starts)


def envelope_indices(y, curves, lo: float, hi: float, bins: int, categories=None) -> np.ndarray:
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
    finite = np.isfinite(y)
    for v in vals:
        finite &= np.isfinite(v)
    with np.errstate(invalid="ignore"):
        b = np.floor((y - lo) / (hi - lo) * bins)
    key = np.where(finite, np.clip(np.nan_to_num(b, nan=-1.0), -1, bins), -2).astype(np.int64)
    if categories is not None:
        key = key * 4 + np.asarray(categories).astype(np.int64) % 4
    starts = np.flatnonzero(np.concatenate(([True], key[1:] != key[:-1])))
    if 4 * (1 + len(vals)) * starts.size >= n:
        return np.arange(n)
    idx = np.arange(n)
    run_of = np.repeat(np.arange(starts.size), np.diff(np.append(starts, n)))
    keep = [starts, np.append(starts[1:], n) - 1]
    for v in vals:
        v0 = np.where(finite, v, 0.0)  # non-finite runs: their first sample stands for them
        keep.append(_extreme_index(v0, starts, run_of, idx, n, np.minimum))
        keep.append(_extreme_index(v0, starts, run_of, idx, n, np.maximum))
    chosen = np.zeros(n, dtype=bool)
    for k in keep:
        chosen[k] = True
    return np.flatnonzero(chosen)
