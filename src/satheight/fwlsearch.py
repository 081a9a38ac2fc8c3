"""Free-water level from log saturation: the search over candidate FWLs.

For one zone, in one well or jointly in several wells of one pressure
compartment, the FWL that best matches the saturation-height Sw to the log Sw:

1. samples and misfit: :mod:`satheight.fwlmisfit` (cutoffs, mask; Huber or
   absolute misfit of every sample for every candidate FWL);
2. by default the J-Sw function's shape parameters are fitted with the FWL
   (:mod:`satheight.fwljoint`, within :func:`~satheight.fwljoint.shape_bounds`),
   because a function from core that is a few per cent off the rock the logs
   see moves the FWL by more than the log scatter does; with ``shape=None`` the
   function is kept as given and the grid minimum of the misfit profile is
   refined with a bounded 1-D search (:func:`scipy.optimize.minimize_scalar`);
3. confidence interval: moving-block bootstrap of the samples within each well
   (:mod:`satheight.blockboot`, Kuensch 1989); each resample's profile is a
   weighted sum of the same misfit array (along the valley of the joint fit when
   the shape is fitted); the interval is the union of the percentile interval
   of the resampled minima and the best FWL +- z times their root-mean-square
   distance from it (reported as the standard error);
4. per-well best FWLs and intervals from each well's own samples (and own shape
   when fitted); a well whose interval does not overlap the joint interval is
   flagged (another compartment, a bad log or a bad zone pick).

References
----------
Kuensch, H. R., 1989. The jackknife and the bootstrap for general stationary
observations. Annals of Statistics 17(3), 1217-1241 (moving-block bootstrap).
"""

from __future__ import annotations

from dataclasses import dataclass, field
import math
from typing import Sequence

import numpy as np

from .blockboot import block_weights, bootstrap_interval, grid_minima
from .errors import SatHeightError
from .fwljoint import (DEFAULT_SEED, MIN_OWN_SAMPLES_PER_PARAMETER, block_length_at,
                       joint_search, shape_bounds)
from .fwlmisfit import (WellFwl, ZoneSamples, default_window, misfit_matrix, profile_value,
                        zone_samples)

__all__ = ["FwlSearch", "WellFwl", "ZoneSamples", "search_fwl", "zone_samples",
           "misfit_matrix"]


@dataclass
class FwlSearch:
    """Result of an FWL search for one zone (see :func:`search_fwl`).

    Depths are TVDSS [m]; misfits are mean losses in Sw units (Huber: Sw^2/2
    scale; absolute: Sw). ``se`` is the root-mean-square distance of the
    bootstrap minima from the best FWL [m]; ``shape_fitted`` tells whether the
    J-Sw parameters were fitted with the FWL (then ``parameters`` holds them).
    """

    zone: str
    project_fwl: float
    best: float
    low: float
    high: float
    level: float
    misfit: str
    delta: float
    misfit_at_best: float
    misfit_at_project: float
    n_samples: int
    block_length: int
    block_length_m: float
    n_boot: int
    seed: int
    candidates: np.ndarray
    profile: np.ndarray
    well_profiles: dict[str, np.ndarray]
    wells: list[WellFwl]
    bootstrap: np.ndarray
    warnings: list[str] = field(default_factory=list)
    parameters: dict | None = None
    se: float | None = None
    shape_fitted: bool = False

    @property
    def flagged_wells(self) -> list[str]:
        return [w.well for w in self.wells if w.flagged]

    def to_dict(self, length_factor: float = 1.0, length_unit: str = "m") -> dict:
        """JSON-ready summary with depths in ``length_unit`` (``length_factor`` metres each)."""
        def d(v):  # None: no value (a zone without a project FWL has none to compare with)
            return None if v is None or not math.isfinite(v) else float(v) / length_factor

        def m(v):
            return None if v is None or not math.isfinite(v) else v

        return {
            "zone": self.zone, "depth_unit": length_unit,
            "project_fwl": d(self.project_fwl), "best_fwl": d(self.best),
            "interval": [d(self.low), d(self.high)], "confidence_level": self.level,
            "standard_error": d(self.se), "shape_fitted_with_fwl": self.shape_fitted,
            "misfit": self.misfit, "huber_delta": self.delta if self.misfit == "huber" else None,
            "misfit_at_best": self.misfit_at_best,
            "misfit_at_project_fwl": m(self.misfit_at_project),
            "samples": self.n_samples, "bootstrap_resamples": self.n_boot,
            "block_length_samples": self.block_length, "block_length": d(self.block_length_m),
            "seed": self.seed,
            "window": [d(self.candidates[0]), d(self.candidates[-1])],
            "wells": [{"well": w.well, "samples": w.n_samples, "best_fwl": d(w.best),
                       "interval": [d(w.low), d(w.high)], "misfit_at_best": w.misfit_at_best,
                       "misfit_at_project_fwl": m(w.misfit_at_project), "flagged": w.flagged,
                       "offset_from_joint": d(w.offset), "parameters": w.params}
                      for w in self.wells],
            "flagged_wells": self.flagged_wells,
            "parameters": _param_dict(self.parameters, length_factor, length_unit),
            "warnings": _flag_notes_in(list(self.warnings),
                                       [(w.well, w.best, w.low, w.high) for w in self.wells
                                        if w.flagged], self.shape_fitted,
                                       (self.low, self.high), length_factor, length_unit),
        }


def _flag_notes_in(notes: list[str], flagged, own_params: bool, joint, length_factor: float,
                   unit: str) -> list[str]:
    """``notes`` with each flagged well's note (written in metres by the search) rewritten
    with depths in ``unit`` (``length_factor`` metres each), to 0.01.

    ``flagged``: (well, best FWL, low, high) [m] of each flagged well; ``joint``: the joint
    interval [m].
    """
    def d(v):
        return v / length_factor

    out = list(notes)
    for name, best, lo, hi in flagged:
        text = (f"{name}: own best FWL {d(best):.2f} {unit} [{d(lo):.2f}, {d(hi):.2f}]"
                + (" (its own J-Sw parameters)" if own_params else "")
                + f" does not overlap the joint interval [{d(joint[0]):.2f}, {d(joint[1]):.2f}]:"
                " a separate compartment, a different rock or fluid behaviour, or a log or "
                "depth problem?")
        old = [i for i, n in enumerate(out) if n.startswith(f"{name}: own best FWL ")]
        if old:
            out[old[0]] = text
        else:
            out.append(text)
    return out


def _param_dict(p, length_factor, length_unit: str = "m"):
    if p is None:
        return None
    out = dict(p)
    if p.get("wells") is not None and p.get("interval") is not None:
        flagged = [(w["well"], w["fwl"], *w["interval"]) for w in p["wells"] if w["flagged"]]
        out["notes"] = _flag_notes_in(list(p.get("notes", [])), flagged, True, p["interval"],
                                      length_factor, length_unit)
    out["fwl"] = p["fwl"] / length_factor
    for key in ("interval",):
        if out.get(key) is not None:
            out[key] = [v / length_factor for v in out[key]]
    if out.get("standard_error") is not None:
        out["standard_error"] = out["standard_error"] / length_factor
    if out.get("wells") is not None:
        out["wells"] = [{**w, "fwl": _div(w["fwl"], length_factor),
                         "interval": [_div(v, length_factor) for v in w["interval"]],
                         "offset": _div(w["offset"], length_factor)} for w in out["wells"]]
    if p.get("per_metre_of_fwl") is not None:
        out["per_unit_of_fwl"] = {k: v * length_factor for k, v in p["per_metre_of_fwl"].items()}
    out.pop("per_metre_of_fwl", None)
    return out


def _div(v, f):
    return None if v is None else v / f


# ----------------------------------------------------------------------------------
# the search
# ----------------------------------------------------------------------------------
def _candidate_grid(samples, window, step, max_candidates) -> np.ndarray:
    """Candidate FWLs, TVDSS [m]: the window (default :func:`default_window`) at ``step``."""
    lo, hi = window if window is not None else default_window(samples)
    if not hi > lo:
        raise SatHeightError(f"FWL search window [{lo}, {hi}] m is empty",
                             hint="give the window as shallow, deep (TVDSS)")
    step = max(float(step), (hi - lo) / (max_candidates - 1))
    return np.linspace(lo, hi, int(round((hi - lo) / step)) + 1)


def _refine(grid, fun_profile, fun_point) -> tuple[float, float]:
    """Grid minimum of ``fun_profile`` refined by a bounded 1-D search of ``fun_point``."""
    i = int(np.nanargmin(fun_profile))
    a, b = grid[max(i - 1, 0)], grid[min(i + 1, grid.size - 1)]
    if b <= a:
        return float(grid[i]), float(fun_profile[i])
    from scipy.optimize import minimize_scalar  # lazily: scipy costs ~0.4 s at start

    r = minimize_scalar(fun_point, bounds=(a, b), method="bounded", options={"xatol": 1e-3})
    if r.fun <= fun_profile[i]:
        return float(r.x), float(r.fun)
    return float(grid[i]), float(fun_profile[i])


def _own_fwl(s: ZoneSamples, well_sum, well_boot, grid, joint, level, tolerance,
             misfit, delta, project_fwl) -> tuple[WellFwl, str | None]:
    """One well's own best FWL and interval; flagged when it misses the joint interval."""
    if s.n < 3:
        return (WellFwl(s.well, s.n, None, None, None, None, None),
                f"{s.well}: fewer than 3 usable samples, no own FWL")
    low, high = joint
    wb, wm = _refine(grid, well_sum / s.n, lambda f: profile_value([s], f, misfit, delta))
    wl, wh = bootstrap_interval(grid_minima(well_boot / s.n, grid), wb, level)
    flagged = bool(wh < low - tolerance or wl > high + tolerance)
    w = WellFwl(s.well, s.n, wb, wl, wh, wm, profile_value([s], project_fwl, misfit, delta),
                flagged)
    if not flagged:
        return w, None
    return w, (f"{s.well}: own best FWL {wb:.2f} m [{wl:.2f}, {wh:.2f}] does not "
               f"overlap the joint interval [{low:.2f}, {high:.2f}]: a separate "
               "compartment, a different rock or fluid behaviour, or a log or "
               "depth problem?")


def search_fwl(samples: Sequence[ZoneSamples], *, window: tuple[float, float] | None = None,
               step: float = 0.25, misfit: str = "huber", delta: float = 0.05,
               n_boot: int = 200, block_length: int | None = None, seed: int = DEFAULT_SEED,
               level: float = 0.95, max_candidates: int = 2000,
               tolerance: float = 0.0, shape="auto") -> FwlSearch:
    """Best FWL of one zone from log Sw, jointly over the given wells, with intervals.

    Parameters
    ----------
    samples : sequence of ZoneSamples
        One per well (from :func:`zone_samples`), all of the same zone and
        compartment (one FWL). The first well's zone gives fluids and function.
    window : (float, float), optional
        Candidate FWL range, TVDSS [m]; default :func:`default_window`.
    step : float
        Grid step [m]; enlarged so that at most ``max_candidates`` candidates are used.
    misfit : str
        ``"huber"`` (default) or ``"absolute"``.
    delta : float
        Huber threshold [fraction of Sw].
    n_boot : int
        Bootstrap resamples (bounded: 10 to 5000).
    block_length : int, optional
        Block length [samples]; default from the residual autocorrelation of the
        best joint fit (the longest of the wells').
    seed : int
        Seed of the bootstrap (fixed: runs are repeatable).
    level : float
        Confidence level of the intervals.
    max_candidates : int
        Largest number of grid candidates.
    tolerance : float
        A well is flagged when its interval misses the joint interval by more
        than this [m] (default 0: any gap).
    shape : "auto", dict or None
        J-Sw parameters fitted with the FWL: ``"auto"`` every parameter of the
        zone's function within :func:`~satheight.fwljoint.shape_bounds`; a dict
        ``{name: (low, high)}``; None keeps the function as given.

    Returns
    -------
    FwlSearch

    Raises
    ------
    SatHeightError
        No usable samples, or a bad window.
    """
    samples = [s for s in samples]
    if not samples or sum(s.n for s in samples) < 3:
        raise SatHeightError("fewer than 3 usable samples for the FWL search",
                             hint="check the zone, the cutoffs, the mask and that the wells "
                                  "have log Sw")
    if not 10 <= n_boot <= 5000:
        raise SatHeightError(f"n_boot must be between 10 and 5000, got {n_boot}")
    grid = _candidate_grid(samples, window, step, max_candidates)
    mats = [misfit_matrix(s, grid, misfit, delta) for s in samples]
    opts = dict(misfit=misfit, delta=delta, n_boot=n_boot, block_length=block_length, seed=seed,
                level=level, tolerance=tolerance)
    fixed = _search_fixed(samples, grid, mats, **opts)
    if shape == "auto":
        shape = shape_bounds(samples[0].zone.function)
    if not shape:
        return fixed
    if fixed.n_samples < MIN_OWN_SAMPLES_PER_PARAMETER * (len(shape) + 1):
        fixed.warnings.append(f"{fixed.n_samples} usable samples are too few to fit the J-Sw "
                              f"shape ({len(shape)} parameter(s)) with the FWL: the function "
                              "was kept as given and the interval does not include its error")
        return fixed
    return _search_shape(samples, grid, shape, fixed, **opts)


def _search_shape(samples, grid, shape, fixed: FwlSearch, **opts) -> FwlSearch:
    """The search with the J-Sw parameters in ``shape`` fitted with the FWL."""
    res = joint_search(samples, shape, grid, fwl_start=fixed.best, **opts)
    msgs = list(res.notes)
    if res.low <= grid[0] + 1e-9 or res.high >= grid[-1] - 1e-9:
        msgs.append("the interval reaches the edge of the search window: widen the window")
    at_bound = [p for p, v in res.fit["values"].items()
                if min(abs(v - b) for b in shape[p]) <= 1e-6 * (shape[p][1] - shape[p][0])]
    if at_bound:
        msgs.append("J-Sw parameter(s) " + ", ".join(at_bound) + " fitted with the FWL sit on "
                    "their bounds: the logs and the function disagree; check the rock type")
    n_tot = fixed.n_samples
    spacing = fixed.block_length_m / fixed.block_length if fixed.block_length else 0.0
    return FwlSearch(zone=fixed.zone, project_fwl=fixed.project_fwl, best=res.fit["fwl"],
                     low=res.low, high=res.high, level=fixed.level, misfit=fixed.misfit,
                     delta=fixed.delta, misfit_at_best=res.fit["misfit"],
                     misfit_at_project=res.misfit_at_project, n_samples=n_tot,
                     block_length=res.block_length, block_length_m=res.block_length * spacing,
                     n_boot=fixed.n_boot, seed=fixed.seed, candidates=grid, profile=res.profile,
                     well_profiles=res.well_profiles, wells=res.wells, bootstrap=res.boot,
                     warnings=msgs, parameters=res.fit, se=res.se, shape_fitted=True)


def _search_fixed(samples, grid, mats, *, misfit, delta, n_boot, block_length, seed,
                  level, tolerance) -> FwlSearch:
    """The search with the zone's function as given, from each well's misfit array."""
    zone = samples[0].zone
    msgs: list[str] = []
    n_tot = sum(s.n for s in samples)
    sums = [m.sum(axis=1) for m in mats]
    profile = np.sum(sums, axis=0) / n_tot
    well_profiles = {s.well: (sm / s.n if s.n else np.full(grid.size, np.nan))
                     for s, sm in zip(samples, sums)}
    best, m_best = _refine(grid, profile, lambda f: profile_value(samples, f, misfit, delta))
    if block_length is None:
        block_length = block_length_at(samples, best)
    block_length = int(max(1, block_length))
    spacing = float(np.median([s.spacing for s in samples if s.n > 1])) if n_tot > 1 else 0.0

    rng = np.random.default_rng(seed)
    weights = [block_weights(s.n, block_length, n_boot, rng) for s in samples]
    boot_sums = [w @ m.T for w, m in zip(weights, mats)]           # (n_boot, n_grid) each
    boot = grid_minima(np.sum(boot_sums, axis=0) / n_tot, grid)
    low, high = bootstrap_interval(boot, best, level)
    if low <= grid[0] + 1e-9 or high >= grid[-1] - 1e-9:
        msgs.append("the interval reaches the edge of the search window: widen the window")
    wells = []
    for s, sm, bs in zip(samples, sums, boot_sums):
        w, note = _own_fwl(s, sm, bs, grid, (low, high), level, tolerance, misfit, delta,
                           zone.fwl)
        w.offset = None if w.best is None else w.best - best
        wells.append(w)
        if note:
            msgs.append(note)
    if np.ptp(profile) <= 1e-12:
        msgs.append("the misfit does not change over the window: no information on the FWL")
    return FwlSearch(zone=zone.name, project_fwl=float(zone.fwl), best=best, low=low, high=high,
                     level=level, misfit=misfit, delta=delta, misfit_at_best=m_best,
                     misfit_at_project=profile_value(samples, zone.fwl, misfit, delta),
                     n_samples=n_tot, block_length=block_length,
                     block_length_m=block_length * spacing, n_boot=n_boot, seed=seed,
                     candidates=grid, profile=profile, well_profiles=well_profiles,
                     wells=wells, bootstrap=boot, warnings=msgs,
                     se=float(np.sqrt(np.mean((boot - best) ** 2))))
