"""Moving-block bootstrap of a misfit profile's minimum.

Residuals of neighbouring log samples are correlated (beds are thicker than the
sample step), so samples are resampled in blocks of consecutive depths
(moving-block bootstrap, Kuensch 1989). A resample is a vector of counts per
sample, so the resampled misfit profile of a (candidates x samples) misfit array
is one matrix product; its minimum is refined by a parabola through the three
grid points around it.

References
----------
Kuensch, H. R., 1989. The jackknife and the bootstrap for general stationary
observations. Annals of Statistics 17(3), 1217-1241 (moving-block bootstrap).
"""

from __future__ import annotations

import numpy as np

__all__ = ["auto_block_length", "block_weights", "grid_minima", "bootstrap_interval"]


def auto_block_length(residuals, max_fraction: float = 0.25) -> int:
    """Block length [samples] for the moving-block bootstrap from residual correlation.

    Three times the first lag at which the autocorrelation of ``residuals``
    falls below 1/e, and at least the cube root of the number of samples (the
    order of the optimal block length, Kuensch 1989), between 1 and
    ``max_fraction`` of the samples (blocks a few correlation lengths long).
    """
    r = np.asarray(residuals, float)
    n = r.size
    if n < 4:
        return 1
    r = r - r.mean()
    var = float(r @ r)
    if var <= 0:
        return 1
    max_lag = max(1, int(n * max_fraction))
    spec = np.fft.rfft(r, 2 * n)
    acf = np.fft.irfft(spec * np.conj(spec))[: max_lag + 1] / var
    below = np.flatnonzero(acf < np.exp(-1.0))
    lag = int(below[0]) if below.size else max_lag
    return int(np.clip(max(3 * lag, int(np.ceil(n ** (1 / 3)))), 1, max_lag))


def block_weights(n: int, block: int, n_boot: int, rng) -> np.ndarray:
    """Moving-block bootstrap counts: how often each of ``n`` samples is drawn.

    Parameters
    ----------
    n : int
        Number of samples (in depth order).
    block : int
        Block length [samples].
    n_boot : int
        Number of resamples.
    rng : numpy.random.Generator

    Returns
    -------
    numpy.ndarray
        (n_boot, n) float counts, each row summing to ``n``.
    """
    if n == 0:
        return np.zeros((n_boot, 0))
    block = int(min(max(block, 1), n))
    nb = -(-n // block)
    starts = rng.integers(0, n - block + 1, size=(n_boot, nb))
    idx = (starts[:, :, None] + np.arange(block)).reshape(n_boot, nb * block)[:, :n]
    flat = (idx + n * np.arange(n_boot)[:, None]).ravel()
    return np.bincount(flat, minlength=n_boot * n).reshape(n_boot, n).astype(float)


def grid_minima(profiles: np.ndarray, grid: np.ndarray) -> np.ndarray:
    """Minimum of each row of ``profiles`` over ``grid``, refined by a parabola."""
    i = np.argmin(profiles, axis=1)
    best = grid[i].astype(float)
    inner = (i > 0) & (i < grid.size - 1)
    if grid.size < 3 or not inner.any():
        return best
    rows = np.flatnonzero(inner)
    ii = i[rows]
    y0, y1, y2 = profiles[rows, ii - 1], profiles[rows, ii], profiles[rows, ii + 1]
    den = y0 - 2 * y1 + y2
    with np.errstate(invalid="ignore", divide="ignore"):
        off = np.where(den > 0, 0.5 * (y0 - y2) / den, 0.0)
    off = np.clip(off, -0.5, 0.5)
    step = grid[ii + 1] - grid[ii]
    best[rows] = grid[ii] + off * step
    return best


def bootstrap_interval(boot: np.ndarray, best: float, level: float) -> tuple[float, float]:
    """Interval [m] from bootstrap minima: the union of the percentile interval and
    ``best +- z * rms(boot - best)`` (a normal interval whose spread includes the
    bootstrap bias). Minima of a misfit profile are not smooth statistics and a
    block bootstrap under-states the spread of correlated data; the union keeps
    the coverage near the nominal level in simulations with AR(1) noise."""
    alpha = (1 - level) / 2
    lo, hi = (float(v) for v in np.quantile(boot, [alpha, 1 - alpha]))
    from scipy.stats import norm  # lazily: scipy.stats costs ~0.4 s at start

    half = float(norm.ppf(1 - alpha)) * float(np.sqrt(np.mean((boot - best) ** 2)))
    return min(lo, best - half), max(hi, best + half)
