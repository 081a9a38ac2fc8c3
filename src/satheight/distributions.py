"""Distributions of uncertain inputs: checks, support and the inverse distribution function.

Pure numpy / scipy.special (no I/O). Used by :mod:`satheight.uncertainty` to turn each
realisation's uniform draws into input values (inverse transform sampling) and to
place an input at its 10th, 50th and 90th percentiles for the tornado.

References
----------
Devroye, L., 1986. Non-Uniform Random Variate Generation. Springer, chapter 2
(inversion method) (devroye1986).
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from .errors import SatHeightError

#: Distribution kinds.
KINDS = ("normal", "truncated_normal", "triangular", "uniform")
#: Standard deviations either side of its mean taken as the support of a normal in the checks.
NORMAL_SUPPORT_SD = 8.0


@dataclass(frozen=True)
class Distribution:
    """One uncertain input: a distribution of its value, in SI.

    ``kind`` is one of :data:`KINDS`. ``normal``: ``mean``, ``sd``; ``truncated_normal``:
    ``mean``, ``sd``, ``low``, ``high`` (the normal restricted to [low, high]);
    ``triangular``: ``low``, ``mode``, ``high``; ``uniform``: ``low``, ``high``. A
    ``mean`` or ``mode`` of None stands for the deterministic value of the input
    (see :meth:`centred`). ``sd = 0`` (or ``low = high``) gives a fixed value.
    """

    kind: str
    mean: float | None = None
    sd: float | None = None
    low: float | None = None
    mode: float | None = None
    high: float | None = None

    def centred(self, value: float) -> "Distribution":
        """This distribution with a missing ``mean`` / ``mode`` set to ``value``."""
        if self.kind in ("normal", "truncated_normal") and self.mean is None:
            return replace(self, mean=float(value))
        if self.kind == "triangular" and self.mode is None:
            return replace(self, mode=float(value))
        return self

    def check(self, where: str) -> None:
        """Refuse an incomplete or inconsistent distribution (the message names ``where``)."""
        need = {"normal": ("mean", "sd"), "truncated_normal": ("mean", "sd", "low", "high"),
                "triangular": ("low", "mode", "high"), "uniform": ("low", "high")}
        if self.kind not in need:
            raise SatHeightError(f"unknown distribution {self.kind!r}", where=where,
                                 hint="use one of " + ", ".join(KINDS))
        for name in need[self.kind]:
            v = getattr(self, name)
            if v is None or not np.isfinite(v):
                raise SatHeightError(f"{self.kind} distribution needs a finite {name}, got {v!r}",
                                     where=where, hint=f"give {', '.join(need[self.kind])}")
        if self.sd is not None and self.sd < 0:
            raise SatHeightError(f"sd must be >= 0, got {self.sd!r}", where=where)
        lo, hi = self.low, self.high
        if lo is not None and hi is not None and not lo <= hi:
            raise SatHeightError(f"low {lo!r} is above high {hi!r}", where=where)
        if self.kind == "triangular" and not lo <= self.mode <= hi:
            raise SatHeightError(f"mode {self.mode!r} is outside [low, high] = [{lo!r}, {hi!r}]",
                                 where=where)
        if self.kind == "truncated_normal" and not lo <= self.mean <= hi:
            raise SatHeightError(f"mean {self.mean!r} is outside [low, high] = [{lo!r}, {hi!r}]",
                                 where=where, hint="the mean of the untruncated normal must lie "
                                                   "between low and high")

    def support(self) -> tuple[float, float]:
        """Range of values the draws can take (a normal: mean +- NORMAL_SUPPORT_SD sd)."""
        if self.kind == "normal":
            return (self.mean - NORMAL_SUPPORT_SD * self.sd, self.mean + NORMAL_SUPPORT_SD * self.sd)
        return (self.low, self.high)

    def ppf(self, q) -> np.ndarray:
        """Inverse distribution function: the value at probability ``q`` in (0, 1), vectorised.

        Normal ``mean + sd * ndtri(q)``; truncated normal by the inverse of the normal
        distribution function restricted to [low, high]; triangular and uniform in closed
        form (scipy.stats' ``truncnorm``, ``triang`` and ``uniform`` give the same values).
        """
        from scipy.special import ndtr, ndtri   # optional at import time: only Monte Carlo needs it

        q = np.asarray(q, dtype=float)
        if self.kind == "normal":
            return self.mean + self.sd * ndtri(q)
        lo, hi = self.low, self.high
        if self.kind == "uniform":
            return lo + (hi - lo) * q
        if self.kind == "triangular":
            if hi == lo:
                return np.full(q.shape, lo)
            c = (self.mode - lo) / (hi - lo)
            left = lo + np.sqrt(q * (hi - lo) * (self.mode - lo))
            right = hi - np.sqrt((1.0 - q) * (hi - lo) * (hi - self.mode))
            return np.where(q < c, left, right)
        if self.sd == 0 or hi == lo:
            return np.full(q.shape, float(self.mean if self.sd == 0 else lo))
        a, b = ndtr((lo - self.mean) / self.sd), ndtr((hi - self.mean) / self.sd)
        return np.clip(self.mean + self.sd * ndtri(a + q * (b - a)), lo, hi)
