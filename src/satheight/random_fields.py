"""Random streams per realisation and stationary random fields with an exponential correlation.

Pure numpy (no I/O). Realisation ``r`` of a Monte Carlo draws from its own streams,
``numpy.random.SeedSequence(seed, spawn_key=(r, stream))``, so its numbers do not depend
on how many realisations run, nor in which order or process.

A stationary unit-variance normal field along depth with covariance ``exp(-|dz| / L)``
is sampled exactly at any (irregular) spacing by the first-order autoregression of the
Ornstein-Uhlenbeck process (gillespie1996), ``g_i = a_i g_(i-1) + sqrt(1 - a_i^2) w_i``,
``a_i = exp(-(z_i - z_(i-1)) / L)``, evaluated on fixed blocks of :data:`BLOCK` samples as
a parallel prefix scan of the affine maps ``g -> a g + u`` (blelloch1990), vectorised over
realisations; the field carries from one block to the next.
"""

from __future__ import annotations

import zlib

import numpy as np

#: Samples per block of the correlated fields (and of the Monte Carlo's partial sums).
BLOCK = 256


def generator(seed: int, realisation: int, *keys: int) -> np.random.Generator:
    """The random stream ``keys`` of realisation ``realisation``: a PCG64 generator seeded by
    ``SeedSequence(seed, spawn_key=(realisation, *keys))``."""
    return np.random.Generator(np.random.PCG64(
        np.random.SeedSequence(int(seed), spawn_key=(int(realisation), *(int(k) for k in keys)))))


def text_key(text: str) -> int:
    """A stable whole number for a name (CRC-32 of its UTF-8 bytes), for stream keys."""
    return zlib.crc32(text.encode("utf-8"))


def open_uniforms(gen: np.random.Generator, n: int) -> np.ndarray:
    """``n`` uniforms in the open interval (0, 1): 53-bit grid shifted by half a step."""
    return (gen.integers(0, 2**53, size=n, dtype=np.int64).astype(float) + 0.5) / 2.0**53


def ar1_coefficients(tvdss_sorted, lengths) -> np.ndarray:
    """Lag-one correlation of each sample with the one before it, ``exp(-dz / L)`` [-].

    Parameters
    ----------
    tvdss_sorted : array_like
        TVDSS [m], non-decreasing (NaN last).
    lengths : array_like
        Correlation length [m] at each sample; 0 (or NaN) gives 0 (independent).

    Returns
    -------
    numpy.ndarray
        ``a_0 = 0`` (the field starts at its stationary law), NaN depths give 0.
        Exact discretisation of the exponential covariance (gillespie1996).
    """
    z = np.asarray(tvdss_sorted, dtype=float)
    L = np.asarray(lengths, dtype=float)
    a = np.zeros(z.shape)
    if z.size > 1:
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            r = np.exp(-np.diff(z) / L[1:])
        a[1:] = np.where(np.isfinite(r) & (L[1:] > 0), r, 0.0)
    return a


def ar1_scan(a, w, carry) -> np.ndarray:
    """``g_i = a_i g_(i-1) + sqrt(1 - a_i^2) w_i`` along the last axis, from ``g_(-1) = carry``.

    Parameters
    ----------
    a : numpy.ndarray
        ``(S,)`` lag-one correlations in [0, 1].
    w : numpy.ndarray
        ``(R, S)`` white standard normal draws.
    carry : numpy.ndarray
        ``(R,)`` field value just before the first sample.

    Returns
    -------
    numpy.ndarray
        ``(R, S)``: unit-variance stationary field with the exponential correlation.
        Evaluated as an inclusive prefix scan of the affine maps ``g -> a g + u``
        in ``log2(S)`` vectorised steps (blelloch1990).
    """
    u = w * np.sqrt(1.0 - a * a)
    coef = a.copy()
    d = 1
    while d < a.size:
        u[:, d:] += coef[d:] * u[:, :-d]
        coef[d:] = coef[d:] * coef[:-d]
        d *= 2
    u += coef * carry[:, None]
    return u


class FieldStream:
    """Standard normal fields of one log error for all realisations, chunk by chunk."""

    def __init__(self, seed, realisations, a, *keys):
        self.gens = [generator(seed, r, *keys) for r in range(realisations)]
        self.a = a
        self.carry = np.zeros(realisations)

    def chunk(self, lo: int, hi: int) -> np.ndarray:
        """``(R, hi - lo)`` field values; chunks must be asked for in order, whole blocks."""
        w = np.stack([g.standard_normal(hi - lo) for g in self.gens])
        out = np.empty_like(w)
        for b in range(lo, hi, BLOCK):
            e = min(b + BLOCK, hi)
            out[:, b - lo:e - lo] = ar1_scan(self.a[b:e], w[:, b - lo:e - lo], self.carry)
            self.carry = out[:, e - lo - 1].copy()
        return out
