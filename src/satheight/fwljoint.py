"""FWL fitted together with chosen J-Sw parameters, and their trade-off.

The mean robust misfit of :mod:`satheight.fwlsearch` is minimised over the FWL
and the chosen parameters within bounds (:func:`scipy.optimize.minimize`,
Powell). The curvature of the misfit at the optimum (central-difference
Hessian) gives the parameters' correlation and the change of each parameter per
metre of FWL along the valley of the misfit.
"""

from __future__ import annotations

import warnings
from typing import Sequence

import numpy as np
from scipy.optimize import minimize

from .errors import SatHeightError
from .fwlsearch import ZoneSamples, profile_value
from .models import build_function

__all__ = ["fit_fwl_with_parameters"]


def _check_parameter_bounds(cls, params: dict[str, tuple[float, float]]) -> None:
    for p, (lo, hi) in params.items():
        if p not in cls.param_names:
            raise SatHeightError(f"{cls.name} has no parameter {p!r}",
                                 hint="its parameters are " + ", ".join(cls.param_names))
        blo, bhi = cls.bounds[p]
        if not (blo <= lo < hi <= bhi):
            raise SatHeightError(f"bounds of {p} [{lo}, {hi}] must lie within [{blo}, {bhi}] "
                                 "with low < high")


def _hessian(objective, x: np.ndarray, hstep: np.ndarray) -> np.ndarray:
    """Central-difference Hessian of ``objective`` at ``x`` with steps ``hstep``."""
    k = x.size
    hess = np.empty((k, k))
    for a in range(k):
        for b in range(a, k):
            ea = np.zeros(k); ea[a] = hstep[a]
            eb = np.zeros(k); eb[b] = hstep[b]
            v = (objective(x + ea + eb) - objective(x + ea - eb) - objective(x - ea + eb)
                 + objective(x - ea - eb)) / (4 * hstep[a] * hstep[b])
            hess[a, b] = hess[b, a] = v
    return hess


def _trade_off(hess: np.ndarray, names: list[str]):
    """(correlation matrix, change of each parameter per metre of FWL), or (None, None)."""
    try:
        np.linalg.cholesky(hess)
    except np.linalg.LinAlgError:
        warnings.warn("the misfit's curvature at the joint optimum is not positive definite: "
                      "no correlation reported (a parameter may sit on its bound)", stacklevel=3)
        return None, None
    cov = np.linalg.inv(hess)
    sd = np.sqrt(np.diag(cov))
    corr = (cov / np.outer(sd, sd)).tolist()
    per_m = {p: float(cov[i + 1, 0] / cov[0, 0]) for i, p in enumerate(names)}
    return corr, per_m


def fit_fwl_with_parameters(samples: Sequence[ZoneSamples], params: dict[str, tuple[float, float]],
                            *, fwl_bounds: tuple[float, float], fwl_start: float | None = None,
                            misfit: str = "huber", delta: float = 0.05) -> dict:
    """Fit the FWL together with chosen J-Sw parameters, within bounds.

    Parameters
    ----------
    samples : sequence of ZoneSamples
    params : dict[str, (float, float)]
        Parameter name of the zone's J-Sw family -> (low, high) bounds.
    fwl_bounds : (float, float)
        FWL bounds, TVDSS [m].
    fwl_start : float, optional
        Starting FWL [m] (default: the middle of the bounds).
    misfit, delta :
        As in :func:`search_fwl`.

    Returns
    -------
    dict
        ``fwl`` [m], ``values`` (fitted parameters), ``misfit``, ``names``
        (``["fwl", ...]``), ``correlation`` (matrix as nested lists, or None when
        the misfit's curvature is not positive definite), and
        ``per_metre_of_fwl``: change of each parameter per metre of FWL along the
        valley of the misfit (``cov[p, fwl] / var[fwl]``).

    Notes
    -----
    Minimised with :func:`scipy.optimize.minimize` (Powell, bounded); the
    curvature is a central-difference Hessian of the mean misfit.
    """
    fn = samples[0].zone.function
    cls = type(fn)
    _check_parameter_bounds(cls, params)
    names = list(params)
    base = dict(fn.params_)

    def objective(x):
        pv = dict(base)
        pv.update(zip(names, map(float, x[1:])))
        try:
            f = build_function(cls.name, pv)
        except SatHeightError:
            return 1e9
        return profile_value(samples, float(x[0]), misfit, delta, f)

    bounds = [tuple(map(float, fwl_bounds))] + [tuple(map(float, params[p])) for p in names]
    x0 = np.array([fwl_start if fwl_start is not None else 0.5 * sum(fwl_bounds)]
                  + [float(np.clip(base[p], *params[p])) for p in names])
    res = minimize(objective, x0, method="Powell", bounds=bounds,
                   options={"xtol": 1e-4, "ftol": 1e-10, "maxfev": 4000})
    x = np.asarray(res.x, float)
    spans = np.array([b[1] - b[0] for b in bounds])
    f0 = objective(x)
    corr, per_m = _trade_off(_hessian(objective, x, 1e-3 * spans), names)
    return {"fwl": float(x[0]), "values": {p: float(v) for p, v in zip(names, x[1:])},
            "bounds": {p: list(params[p]) for p in names}, "misfit": float(f0),
            "names": ["fwl"] + names, "correlation": corr, "per_metre_of_fwl": per_m,
            "converged": bool(res.success)}
