"""FWL fitted together with chosen J-Sw parameters, and their trade-off.

The mean robust misfit of :mod:`satheight.fwlmisfit` is minimised over the FWL
and the chosen parameters within bounds (:func:`scipy.optimize.minimize`,
Powell). The curvature of the misfit at the optimum (central-difference
Hessian) gives the parameters' correlation and the change of each parameter per
metre of FWL along the valley of the misfit.

Why fit the shape with the FWL: the FWL and the J-Sw function trade off. A
function taken from core plugs (other rock samples, lab corrections) that is a
few per cent off the rock the logs see moves the best FWL by a metre or more,
far outside an interval that only counts the scatter of the log samples. With
the shape parameters free, the logs fix both; the FWL's interval then follows
the misfit along its valley (:func:`valley_functions`), where each candidate FWL
gets the parameters that best go with it (to first order:
``theta(FWL) = theta* + d theta / d FWL * (FWL - FWL*)``, the conditional
minimum of a quadratic misfit).
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass, field
from typing import Sequence

import numpy as np

from .errors import SatHeightError
from .blockboot import auto_block_length, block_weights, bootstrap_interval, grid_minima
from .fwlmisfit import MISFITS, WellFwl, ZoneSamples, predict_sw, profile_value
from .models import build_function

__all__ = ["fit_fwl_with_parameters", "fit_point", "joint_search", "JointResult", "shape_bounds",
           "valley_functions", "valley_matrix", "block_length_at", "DEFAULT_SEED"]

#: Seed of the bootstrap (fixed: runs are repeatable).
DEFAULT_SEED = 20240611

#: A well gets its own fit of FWL and parameters with at least this many usable
#: samples per fitted quantity (a rule of our own).
MIN_OWN_SAMPLES_PER_PARAMETER = 10


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


def fit_point(samples: Sequence[ZoneSamples], params: dict[str, tuple[float, float]],
              *, fwl_bounds: tuple[float, float], fwl_start: float | None = None,
              misfit: str = "huber", delta: float = 0.05) -> dict:
    """Best FWL and J-Sw parameters within bounds (no interval; see :func:`fit_fwl_with_parameters`).

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
        As in :func:`satheight.fwlsearch.search_fwl`.

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
    from scipy.optimize import minimize  # lazily: scipy costs ~0.4 s at start

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


def fit_fwl_with_parameters(samples: Sequence[ZoneSamples], params: dict[str, tuple[float, float]],
                            *, fwl_bounds: tuple[float, float], fwl_start: float | None = None,
                            misfit: str = "huber", delta: float = 0.05, step: float = 0.25,
                            n_boot: int = 200, block_length: int | None = None,
                            seed: int = DEFAULT_SEED, level: float = 0.95,
                            tolerance: float = 0.0) -> dict:
    """Fit the FWL together with chosen J-Sw parameters, with intervals and per-well results.

    Parameters
    ----------
    samples : sequence of ZoneSamples
    params : dict[str, (float, float)]
        Parameter name of the zone's J-Sw family -> (low, high) bounds.
    fwl_bounds : (float, float)
        FWL bounds, TVDSS [m]; also the window of the interval's candidate grid.
    fwl_start : float, optional
        Starting FWL [m] (default: the middle of the bounds).
    misfit, delta, step, n_boot, block_length, seed, level, tolerance :
        As in :func:`satheight.fwlsearch.search_fwl`.

    Returns
    -------
    dict
        The keys of :func:`fit_point` (``fwl`` [m], ``values``, ``bounds``,
        ``misfit``, ``names``, ``correlation``, ``per_metre_of_fwl``,
        ``converged``) plus ``interval`` [m] and ``standard_error`` [m] of the FWL
        (moving-block bootstrap along the misfit's valley, as in the search with a
        fixed function), ``confidence_level``, ``block_length``, and ``wells``:
        per well its own FWL and parameters, interval, offset from the joint FWL
        [m] and whether it is flagged as a separate compartment.
    """
    lo, hi = (float(v) for v in fwl_bounds)
    grid = np.linspace(lo, hi, int(round((hi - lo) / max(step, (hi - lo) / 1999))) + 1)
    res = joint_search(samples, params, grid, fwl_start=fwl_start, misfit=misfit, delta=delta,
                       n_boot=n_boot, block_length=block_length, seed=seed, level=level,
                       tolerance=tolerance)
    out = dict(res.fit)
    out.update({"interval": [res.low, res.high], "standard_error": res.se,
                "confidence_level": level, "block_length": res.block_length,
                "wells": [{"well": w.well, "samples": w.n_samples, "fwl": w.best,
                           "interval": [w.low, w.high], "offset": w.offset,
                           "values": w.params, "flagged": w.flagged} for w in res.wells],
                "notes": list(res.notes)})
    return out


@dataclass
class JointResult:
    """What :func:`joint_search` found (depths TVDSS [m], misfits in Sw units)."""

    fit: dict
    grid: np.ndarray
    profile: np.ndarray
    well_profiles: dict
    boot: np.ndarray
    low: float
    high: float
    se: float
    block_length: int
    wells: list
    misfit_at_project: float
    notes: list = field(default_factory=list)


def block_length_at(samples, best: float, function=None) -> int:
    """Longest of the wells' block lengths [samples] from their residuals at ``best`` [m]."""
    bl = [auto_block_length(predict_sw(s.zone, best, s.tvdss, s.phi, s.k, function) - s.sw_log)
          for s in samples if s.n >= 4]
    return max(bl) if bl else 1


def joint_search(samples, params, grid, *, fwl_start, misfit, delta, n_boot, block_length,
                 seed, level, tolerance) -> JointResult:
    """Joint fit of FWL and parameters, its bootstrap interval along the valley, and
    each well's own fit (flagged when its interval misses the joint one)."""
    base = samples[0].zone.function
    fit = fit_point(samples, params, fwl_bounds=(grid[0], grid[-1]), fwl_start=fwl_start,
                    misfit=misfit, delta=delta)
    funcs = valley_functions(fit, base, grid)
    mats = [valley_matrix(s, grid, funcs, misfit, delta) for s in samples]
    n_tot = sum(s.n for s in samples)
    best = fit["fwl"]
    at_best = valley_functions(fit, base, [best])[0]
    if block_length is None:
        block_length = block_length_at(samples, best, at_best)
    block_length = int(max(1, block_length))
    rng = np.random.default_rng(seed)
    weights = [block_weights(s.n, block_length, n_boot, rng) for s in samples]
    boot = grid_minima(np.sum([w @ m.T for w, m in zip(weights, mats)], axis=0) / n_tot, grid)
    low, high = bootstrap_interval(boot, best, level)
    wells, notes = [], []
    for s, w in zip(samples, weights):
        alone = (fit, mats[0]) if len(samples) == 1 else None      # one well: its own fit
        own, note = _own_joint(s, params, grid, w, best, (low, high), alone, misfit, delta, level,
                               tolerance)
        wells.append(own)
        notes += [note] if note else []
    base_fwl = samples[0].zone.fwl
    at_project = valley_functions(fit, base, [base_fwl])[0]
    return JointResult(fit=fit, grid=grid, profile=np.sum([m.sum(axis=1) for m in mats], axis=0)
                       / n_tot, well_profiles={s.well: m.mean(axis=1) if s.n else
                                               np.full(grid.size, np.nan)
                                               for s, m in zip(samples, mats)},
                       boot=boot, low=low, high=high,
                       se=float(np.sqrt(np.mean((boot - best) ** 2))), block_length=block_length,
                       wells=wells, notes=notes,
                       misfit_at_project=profile_value(samples, base_fwl, misfit, delta,
                                                       at_project))


def _own_joint(s, params, grid, weights, best, joint, alone, misfit, delta, level, tolerance):
    """One well's own fit of FWL and parameters, its interval and offset from ``best``
    (``alone``: the joint fit and misfit array when the well is the only one)."""
    if s.n < MIN_OWN_SAMPLES_PER_PARAMETER * (len(params) + 1):
        return (WellFwl(s.well, s.n, None, None, None, None, None),
                f"{s.well}: {s.n} usable samples, too few for its own FWL and "
                f"{len(params)} parameter(s)")
    if alone is not None:
        own, mats = alone
    else:
        own = fit_point([s], params, fwl_bounds=(grid[0], grid[-1]), fwl_start=best,
                        misfit=misfit, delta=delta)
        mats = valley_matrix(s, grid, valley_functions(own, s.zone.function, grid), misfit,
                             delta)
    wboot = grid_minima(weights @ mats.T / s.n, grid)
    wl, wh = bootstrap_interval(wboot, own["fwl"], level)
    low, high = joint
    flagged = bool(wh < low - tolerance or wl > high + tolerance)
    at_project = valley_functions(own, s.zone.function, [s.zone.fwl])[0]
    w = WellFwl(s.well, s.n, own["fwl"], wl, wh, own["misfit"],
                profile_value([s], s.zone.fwl, misfit, delta, at_project), flagged,
                offset=own["fwl"] - best, params=dict(own["values"]))
    if not flagged:
        return w, None
    return w, (f"{s.well}: own best FWL {own['fwl']:.2f} m [{wl:.2f}, {wh:.2f}] (its own J-Sw "
               f"parameters) does not overlap the joint interval [{low:.2f}, {high:.2f}]: a "
               "separate compartment, or a log or depth problem?")


def shape_bounds(function) -> dict[str, tuple[float, float]]:
    """Bounds of every parameter of a fitted J-Sw function for a fit with the FWL.

    From half to double each value (at least -0.05 and +0.05 around it), within
    the family's bounds: room for the rock the logs see to differ from the core
    plugs, close enough that the fit stays on the same branch (a rule of our own).
    """
    cls = type(function)
    out = {}
    for p in cls.param_names:
        v = float(function.params_[p])
        lo, hi = cls.bounds[p]
        low = max(lo, v - max(0.5 * abs(v), 0.05))
        high = min(hi, v + max(abs(v), 0.05))
        if high > low:
            out[p] = (low, high)
    return out


def valley_functions(fit: dict, base_function, grid) -> list:
    """J-Sw function for each candidate FWL [m] along the valley of a joint fit.

    ``theta(f) = theta* + (d theta / d FWL) (f - FWL*)``, clipped to the fit's
    bounds (``fit["per_metre_of_fwl"]``; the fitted values everywhere when the
    curvature gave no trade-off). None where the family refuses the parameters.
    """
    cls = type(base_function)
    names = fit["names"][1:]
    per_m = fit["per_metre_of_fwl"] or {p: 0.0 for p in names}
    funcs = []
    for f in np.asarray(grid, float):      # loop over candidates, not samples
        pv = dict(base_function.params_)
        for p in names:
            lo, hi = fit["bounds"][p]
            pv[p] = float(np.clip(fit["values"][p] + per_m[p] * (f - fit["fwl"]), lo, hi))
        try:
            funcs.append(build_function(cls.name, pv))
        except SatHeightError:
            funcs.append(None)
    return funcs


def valley_matrix(samples: ZoneSamples, grid, funcs, misfit: str, delta: float) -> np.ndarray:
    """(candidates x samples) misfit with each candidate's own function (see
    :func:`valley_functions`); a refused function gets the loss of a residual of 1."""
    loss = MISFITS[misfit]
    out = np.empty((len(funcs), samples.n))
    for i, (f, fn) in enumerate(zip(np.asarray(grid, float), funcs)):   # candidates
        if fn is None:
            out[i] = loss(np.ones(samples.n), delta)
            continue
        sw = predict_sw(samples.zone, f, samples.tvdss, samples.phi, samples.k, fn)
        out[i] = loss(sw - samples.sw_log, delta)
    return out
