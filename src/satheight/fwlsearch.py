"""Free-water level from log saturation: misfit profile, search and joint fit.

For one zone, in one well or jointly in several wells of one pressure
compartment, the FWL that best matches the saturation-height Sw to the log Sw:

1. samples: in the zone, with finite porosity, permeability and log Sw, passing
   the porosity, permeability and (optional) shale cutoffs and a user mask;
2. misfit profile: for every candidate FWL on a grid over a depth window, the
   mean robust misfit of ``Sw_SHM(FWL) - Sw_log`` over the samples (Huber loss,
   or mean absolute deviation). All candidates are evaluated at once as a 2-D
   array (candidates x samples, in chunks), with the engine's
   :func:`~satheight.engine.column_pc_j` and the zone's J-Sw function;
3. the grid minimum is refined with a bounded 1-D optimiser
   (:func:`scipy.optimize.minimize_scalar`);
4. confidence interval: moving-block bootstrap of the samples within each well
   (:mod:`satheight.blockboot`, Kuensch 1989); each resample's profile is a
   weighted sum of the same misfit array; the interval is the union of the
   percentile interval of the resampled minima and the best FWL +- z times their
   root-mean-square distance from it;
5. per-well best FWLs and intervals from each well's own samples; a well whose
   interval does not overlap the joint interval is flagged (another compartment,
   a bad log or a bad zone pick);
6. the FWL fitted together with chosen J-Sw parameters is in
   :mod:`satheight.fwljoint`.

References
----------
Kuensch, H. R., 1989. The jackknife and the bootstrap for general stationary
observations. Annals of Statistics 17(3), 1217-1241 (moving-block bootstrap).
Huber, P. J., 1964. Robust estimation of a location parameter. Annals of
Mathematical Statistics 35(1), 73-101.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Sequence

import numpy as np
from scipy.optimize import minimize_scalar

from .blockboot import auto_block_length, block_weights, bootstrap_interval, grid_minima
from .compare import net_mask
from .engine import ZoneModel, column_pc_j
from .errors import SatHeightError

__all__ = ["ZoneSamples", "WellFwl", "FwlSearch", "zone_samples", "misfit_matrix",
           "search_fwl", "default_window", "profile_value", "MISFITS",
           "SW_LOG_MAX"]
#: Log Sw above this [fraction] is taken as bad and left out. Log Sw a little above 1
#: is kept (noise in Rt or Rw): dropping or clipping it would bias the FWL near the
#: water leg, where the true Sw is 1.
SW_LOG_MAX = 1.5

#: Elements per chunk of the candidates x samples misfit array (memory bound).
CHUNK_ELEMENTS = 2_000_000


# ----------------------------------------------------------------------------------
# misfits
# ----------------------------------------------------------------------------------
def huber_loss(r, delta: float = 0.05):
    """Huber loss of residuals ``r`` [fraction]: quadratic within ``delta``, linear beyond."""
    a = np.abs(r)
    return np.where(a <= delta, 0.5 * r * r, delta * (a - 0.5 * delta))


def absolute_loss(r, delta: float = 0.0):
    """Absolute residual [fraction] (mean absolute deviation when averaged)."""
    return np.abs(r)


#: Misfit functions by name: loss(residual, delta), averaged over samples.
MISFITS = {"huber": huber_loss, "absolute": absolute_loss}


# ----------------------------------------------------------------------------------
# samples
# ----------------------------------------------------------------------------------
@dataclass
class ZoneSamples:
    """The samples of one well used in an FWL search, sorted by depth.

    Attributes
    ----------
    well : str
    tvdss : numpy.ndarray
        [m].
    phi : numpy.ndarray
        Porosity [fraction].
    k : numpy.ndarray
        Permeability [m^2].
    sw_log : numpy.ndarray
        Log water saturation [fraction].
    zone : ZoneModel
        The zone as used in this well.
    """

    well: str
    tvdss: np.ndarray
    phi: np.ndarray
    k: np.ndarray
    sw_log: np.ndarray
    zone: ZoneModel

    @property
    def n(self) -> int:
        return int(self.tvdss.size)

    @property
    def spacing(self) -> float:
        """Median vertical distance between used samples [m] (0 with fewer than 2)."""
        return float(np.median(np.diff(self.tvdss))) if self.n > 1 else 0.0


def zone_samples(well: str, tvdss, phi, k, sw_log, zone: ZoneModel, *,
                 min_porosity: float = 0.0, min_permeability: float = 0.0,
                 shale=None, max_shale: float | None = None, mask=None) -> ZoneSamples:
    """Select the samples of one well and zone for an FWL search.

    Parameters
    ----------
    well : str
    tvdss : array_like
        [m], positive down.
    phi : array_like
        Porosity [fraction].
    k : array_like
        Permeability [m^2].
    sw_log : array_like
        Log water saturation [fraction].
    zone : ZoneModel
        The zone with this well's top and base.
    min_porosity : float
        Porosity cutoff [fraction]: samples below it are left out.
    min_permeability : float
        Permeability cutoff [m^2].
    shale : array_like, optional
        A shale indicator (e.g. GR [gAPI] or Vsh [fraction]); samples above
        ``max_shale`` are left out.
    max_shale : float, optional
        Shale cutoff in the unit of ``shale``.
    mask : array_like of bool, optional
        User mask: only samples where it is true are used.

    Returns
    -------
    ZoneSamples
        New arrays (inputs are not modified), sorted by TVDSS.
    """
    z = np.asarray(tvdss, float)
    phi = np.asarray(phi, float)
    k = np.asarray(k, float)
    sw = np.asarray(sw_log, float)
    with np.errstate(invalid="ignore"):
        keep = ((z >= zone.top) & (z < zone.base) & np.isfinite(sw) & (sw >= 0) & (sw <= SW_LOG_MAX)
                & (phi > 0) & (phi <= 1) & (k > 0)
                & net_mask(phi, k, min_porosity, min_permeability))
        if shale is not None and max_shale is not None:
            keep &= np.asarray(shale, float) <= max_shale
    if mask is not None:
        keep &= np.asarray(mask, bool)
    idx = np.flatnonzero(keep)
    idx = idx[np.argsort(z[idx], kind="stable")]
    return ZoneSamples(well=well, tvdss=z[idx], phi=phi[idx], k=k[idx], sw_log=sw[idx], zone=zone)


# ----------------------------------------------------------------------------------
# the misfit array
# ----------------------------------------------------------------------------------
def _predict(zone: ZoneModel, fwl, tvdss, phi, k, function=None):
    """SHM Sw [fraction] for candidate FWLs (any shape broadcasting with the samples)."""
    fwl = np.asarray(fwl, float)
    h = fwl - tvdss
    oil_column = None
    if zone.three_phase:
        oil_column = np.maximum(fwl - zone.gas_oil_level, 0.0)
    _, j = column_pc_j(h, k, phi, zone, oil_column=oil_column)
    return (function or zone.function).predict(j)


def misfit_matrix(samples: ZoneSamples, candidates, misfit: str = "huber",
                  delta: float = 0.05, function=None) -> np.ndarray:
    """Robust misfit of every sample for every candidate FWL.

    Parameters
    ----------
    samples : ZoneSamples
    candidates : array_like
        Candidate FWLs, TVDSS [m].
    misfit : str
        ``"huber"`` or ``"absolute"`` (:data:`MISFITS`).
    delta : float
        Huber threshold [fraction of Sw].
    function : JSwFunction, optional
        Replaces the zone's function.

    Returns
    -------
    numpy.ndarray
        Shape (candidates, samples); computed in chunks of candidates.
    """
    if misfit not in MISFITS:
        raise SatHeightError(f"unknown misfit {misfit!r}", hint="use one of " + ", ".join(MISFITS))
    loss = MISFITS[misfit]
    c = np.asarray(candidates, float)
    out = np.empty((c.size, samples.n))
    if samples.n == 0:
        return out
    step = max(1, CHUNK_ELEMENTS // samples.n)
    for s in range(0, c.size, step):
        f = c[s:s + step, None]
        sw = _predict(samples.zone, f, samples.tvdss, samples.phi, samples.k, function)
        out[s:s + step] = loss(sw - samples.sw_log, delta)
    return out


def profile_value(samples: Sequence[ZoneSamples], fwl: float, misfit, delta, function=None):
    """Mean misfit [Sw units] over all samples of the wells for one FWL [m] (NaN without samples)."""
    total, n = 0.0, 0
    for s in samples:
        if s.n:
            total += float(misfit_matrix(s, [fwl], misfit, delta, function).sum())
            n += s.n
    return total / n if n else np.nan


# ----------------------------------------------------------------------------------
# results
# ----------------------------------------------------------------------------------
@dataclass
class WellFwl:
    """One well's own best FWL in a search.

    Attributes
    ----------
    well : str
    n_samples : int
    best, low, high : float or None
        Best FWL and its interval, TVDSS [m] (None without samples).
    misfit_at_best, misfit_at_project : float or None
    flagged : bool
        Its interval does not overlap the joint interval.
    """

    well: str
    n_samples: int
    best: float | None
    low: float | None
    high: float | None
    misfit_at_best: float | None
    misfit_at_project: float | None
    flagged: bool = False


@dataclass
class FwlSearch:
    """Result of an FWL search for one zone (see :func:`search_fwl`).

    Depths are TVDSS [m]; misfits are mean losses in Sw units (Huber: Sw^2/2
    scale; absolute: Sw).
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

    @property
    def flagged_wells(self) -> list[str]:
        return [w.well for w in self.wells if w.flagged]

    def to_dict(self, length_factor: float = 1.0, length_unit: str = "m") -> dict:
        """JSON-ready summary with depths in ``length_unit`` (``length_factor`` metres each)."""
        def d(v):
            return None if v is None else float(v) / length_factor

        return {
            "zone": self.zone, "depth_unit": length_unit,
            "project_fwl": d(self.project_fwl), "best_fwl": d(self.best),
            "interval": [d(self.low), d(self.high)], "confidence_level": self.level,
            "misfit": self.misfit, "huber_delta": self.delta if self.misfit == "huber" else None,
            "misfit_at_best": self.misfit_at_best, "misfit_at_project_fwl": self.misfit_at_project,
            "samples": self.n_samples, "bootstrap_resamples": self.n_boot,
            "block_length_samples": self.block_length, "block_length": d(self.block_length_m),
            "seed": self.seed,
            "window": [d(self.candidates[0]), d(self.candidates[-1])],
            "wells": [{"well": w.well, "samples": w.n_samples, "best_fwl": d(w.best),
                       "interval": [d(w.low), d(w.high)], "misfit_at_best": w.misfit_at_best,
                       "misfit_at_project_fwl": w.misfit_at_project, "flagged": w.flagged}
                      for w in self.wells],
            "flagged_wells": self.flagged_wells,
            "parameters": _param_dict(self.parameters, length_factor),
            "warnings": list(self.warnings),
        }


def _param_dict(p, length_factor):
    if p is None:
        return None
    out = dict(p)
    out["fwl"] = p["fwl"] / length_factor
    if p.get("per_metre_of_fwl") is not None:
        out["per_unit_of_fwl"] = {k: v * length_factor for k, v in p["per_metre_of_fwl"].items()}
    out.pop("per_metre_of_fwl", None)
    return out


# ----------------------------------------------------------------------------------
# the search
# ----------------------------------------------------------------------------------
def default_window(samples: Sequence[ZoneSamples]) -> tuple[float, float]:
    """Search window [m]: from the shallowest zone top to the deepest base plus half the zone."""
    tops = [s.zone.top for s in samples]
    bases = [s.zone.base for s in samples]
    top, base = min(tops), max(bases)
    return float(top), float(base + 0.5 * (base - top))


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
    r = minimize_scalar(fun_point, bounds=(a, b), method="bounded", options={"xatol": 1e-3})
    if r.fun <= fun_profile[i]:
        return float(r.x), float(r.fun)
    return float(grid[i]), float(fun_profile[i])


def _block_length(samples, best: float, function=None) -> int:
    """Longest of the wells' block lengths from their residuals at ``best`` [samples]."""
    bl = []
    for s in samples:
        if s.n >= 4:
            res = _predict(s.zone, best, s.tvdss, s.phi, s.k, function) - s.sw_log
            bl.append(auto_block_length(res))
    return max(bl) if bl else 1


def _own_fwl(s: ZoneSamples, well_sum, well_boot, grid, joint, level, tolerance,
             misfit, delta, project_fwl, function=None) -> tuple[WellFwl, str | None]:
    """One well's own best FWL and interval; flagged when it misses the joint interval."""
    if s.n < 3:
        return (WellFwl(s.well, s.n, None, None, None, None, None),
                f"{s.well}: fewer than 3 usable samples, no own FWL")
    low, high = joint
    wb, wm = _refine(grid, well_sum / s.n,
                     lambda f: profile_value([s], f, misfit, delta, function))
    wl, wh = bootstrap_interval(grid_minima(well_boot / s.n, grid), wb, level)
    flagged = bool(wh < low - tolerance or wl > high + tolerance)
    w = WellFwl(s.well, s.n, wb, wl, wh, wm,
                profile_value([s], project_fwl, misfit, delta, function), flagged)
    if not flagged:
        return w, None
    return w, (f"{s.well}: own best FWL {wb:.2f} m [{wl:.2f}, {wh:.2f}] does not "
               f"overlap the joint interval [{low:.2f}, {high:.2f}]: a separate "
               "compartment, a different rock or fluid behaviour, or a log or "
               "depth problem?")


def search_fwl(samples: Sequence[ZoneSamples], *, window: tuple[float, float] | None = None,
               step: float = 0.25, misfit: str = "huber", delta: float = 0.05,
               n_boot: int = 200, block_length: int | None = None, seed: int = 20240611,
               level: float = 0.95, max_candidates: int = 2000,
               tolerance: float = 0.0) -> FwlSearch:
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
        best joint fit (:func:`~satheight.blockboot.auto_block_length`, the longest
        of the wells').
    seed : int
        Seed of the bootstrap (fixed: runs are repeatable).
    level : float
        Confidence level of the intervals.
    max_candidates : int
        Largest number of grid candidates.
    tolerance : float
        A well is flagged when its interval misses the joint interval by more
        than this [m] (default 0: any gap).

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
    return search_on_matrices(samples, grid, mats, misfit=misfit, delta=delta, n_boot=n_boot,
                               block_length=block_length, seed=seed, level=level,
                               tolerance=tolerance)


def search_on_matrices(samples, grid, mats, *, misfit, delta, n_boot, block_length, seed,
                        level, tolerance, function=None) -> FwlSearch:
    """The search of :func:`search_fwl` from each well's (candidates x samples) misfits."""
    zone = samples[0].zone
    msgs: list[str] = []
    n_tot = sum(s.n for s in samples)
    sums = [m.sum(axis=1) for m in mats]
    profile = np.sum(sums, axis=0) / n_tot
    well_profiles = {s.well: (sm / s.n if s.n else np.full(grid.size, np.nan))
                     for s, sm in zip(samples, sums)}
    best, m_best = _refine(grid, profile,
                           lambda f: profile_value(samples, f, misfit, delta, function))
    if block_length is None:
        block_length = _block_length(samples, best, function)
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
                           zone.fwl, function)
        wells.append(w)
        if note:
            msgs.append(note)
    if np.ptp(profile) <= 1e-12:
        msgs.append("the misfit does not change over the window: no information on the FWL")
    return FwlSearch(zone=zone.name, project_fwl=float(zone.fwl), best=best, low=low, high=high,
                     level=level, misfit=misfit, delta=delta, misfit_at_best=m_best,
                     misfit_at_project=profile_value(samples, zone.fwl, misfit, delta, function),
                     n_samples=n_tot, block_length=block_length,
                     block_length_m=block_length * spacing, n_boot=n_boot, seed=seed,
                     candidates=grid, profile=profile, well_profiles=well_profiles,
                     wells=wells, bootstrap=boot, warnings=msgs)
