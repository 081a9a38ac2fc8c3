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


#: Relative tolerance of the symmetry and positive semi-definiteness checks of a covariance
#: (a matrix stored to six significant digits stays inside it).
COVARIANCE_RTOL = 1e-5


@dataclass(frozen=True)
class JointNormal:
    """Parameters drawn together: a multivariate normal around their deterministic values.

    ``names`` are the parameters (in the order of the rows of ``covariance``), and
    ``covariance`` [parameter units squared] their covariance matrix, e.g. the one a
    least-squares fit estimates (scipy.optimize.curve_fit's ``pcov``). ``source``
    names where the matrix came from (a model file and its fit, or a project key) for
    the messages. The mean is the deterministic value of each parameter (the fit's).

    Draws use inversion for the standard normals and the factor ``A = V sqrt(L)`` of
    the eigendecomposition ``C = V L V^T``, so ``x = mean + A z`` has covariance ``C``
    also when ``C`` is singular (a zero matrix gives the mean itself). Reference:
    Devroye (1986), chapter 11 (devroye1986); numpy.linalg.eigh.
    """

    names: tuple
    covariance: tuple          # rows of floats (hashable, frozen)
    source: str = ""

    def matrix(self) -> np.ndarray:
        """The covariance as a ``(p, p)`` float array (symmetrised)."""
        c = np.asarray(self.covariance, dtype=float)
        return 0.5 * (c + c.T) if c.ndim == 2 and c.shape[0] == c.shape[1] else c

    def check(self, where: str) -> None:
        """Refuse a covariance of the wrong size, not finite, not symmetric or not positive
        semi-definite (eigenvalues below ``-COVARIANCE_RTOL`` times the largest)."""
        c = np.asarray(self.covariance, dtype=float)
        p = len(self.names)
        src = f" ({self.source})" if self.source else ""
        if c.shape != (p, p):
            raise SatHeightError(f"the covariance{src} is {c.shape[0] if c.ndim else 0} x "
                                 f"{c.shape[1] if c.ndim == 2 else 0}, but {p} parameters "
                                 f"({', '.join(self.names)}) are drawn together", where=where,
                                 hint=f"give a {p} x {p} matrix in the order of the parameters")
        if not np.all(np.isfinite(c)):
            raise SatHeightError(f"the covariance{src} has values that are not finite numbers",
                                 where=where, hint="refit, or give a covariance of numbers")
        sd = np.sqrt(np.abs(np.diag(c)))
        scale = np.outer(sd, sd)
        if np.any(np.abs(c - c.T) > COVARIANCE_RTOL * scale):
            i, j = np.unravel_index(np.argmax(np.abs(c - c.T) - COVARIANCE_RTOL * scale), c.shape)
            raise SatHeightError(f"the covariance{src} is not symmetric: row {i + 1} column "
                                 f"{j + 1} is {c[i, j]!r} but row {j + 1} column {i + 1} is "
                                 f"{c[j, i]!r}", where=where,
                                 hint="a covariance matrix equals its transpose")
        lam = np.linalg.eigvalsh(self.matrix())
        top = max(float(lam[-1]), 0.0)
        if lam[0] < -COVARIANCE_RTOL * top or (top == 0.0 and lam[0] < 0):
            raise SatHeightError(f"the covariance{src} is not positive semi-definite: its "
                                 f"smallest eigenvalue is {lam[0]:.6g} (largest {top:.6g})",
                                 where=where, hint="a covariance needs variances >= 0 and "
                                 "correlations between -1 and 1 that fit together; check the "
                                 "values or refit")

    def factor(self) -> np.ndarray:
        """``A`` with ``A A^T = C`` (eigenvalues below zero by rounding set to zero)."""
        lam, vec = np.linalg.eigh(self.matrix())
        return vec * np.sqrt(np.clip(lam, 0.0, None))[None, :]

    def marginal(self, i: int, mean: float) -> Distribution:
        """The normal distribution of parameter ``i`` alone."""
        return Distribution(kind="normal", mean=float(mean),
                            sd=float(np.sqrt(max(self.matrix()[i, i], 0.0))))

    def draw(self, means, q) -> np.ndarray:
        """Values ``(R, p)`` from uniforms ``q`` ``(R, p)`` in (0, 1): ``mean + A ndtri(q)``.

        The product is summed term by term in a fixed order (no BLAS), so a row's
        values do not depend on how many rows are drawn together.
        """
        from scipy.special import ndtri

        z = ndtri(np.asarray(q, dtype=float))
        a = self.factor()
        out = np.repeat(np.asarray(means, dtype=float)[None, :], z.shape[0], axis=0)
        for k in range(a.shape[1]):
            out = out + z[:, k:k + 1] * a[None, :, k]
        return out

    def conditional(self, i: int, value: float, means) -> np.ndarray:
        """All parameters with parameter ``i`` at ``value`` and the others at their mean
        given it, ``mean_j + C_ji / C_ii (value - mean_i)`` (the normal's conditional mean)."""
        c = self.matrix()
        m = np.asarray(means, dtype=float)
        if c[i, i] <= 0:
            return m.copy()
        return m + c[:, i] / c[i, i] * (float(value) - m[i])
