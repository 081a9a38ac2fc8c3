"""Free-water level from log saturation, and contacts versus the FWL.

FWL search
----------
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
4. confidence interval: residuals of neighbouring samples are correlated (beds
   are thicker than the sample step), so samples are resampled in blocks of
   consecutive depths within each well (moving-block bootstrap, Kuensch 1989);
   each resample's profile is a weighted sum of the same misfit array, its
   minimum refined by a parabola through the three grid points around it; the
   interval is the union of the percentile interval of those minima and the
   best FWL +- z times their root-mean-square distance from it;
5. per-well best FWLs and intervals from each well's own samples; a well whose
   interval does not overlap the joint interval is flagged (another compartment,
   a bad log or a bad zone pick);
6. optionally the FWL is fitted together with chosen J-Sw parameters within
   bounds; their trade-off is reported as the correlation matrix from the
   curvature of the misfit at the optimum and the change of each parameter per
   metre of FWL along the valley.

Contacts
--------
The oil-water (or gas-water) contact lies one entry height above the FWL: the
height where Pc reaches the entry pressure of the rock,
``h_e = J_e * sigma cos theta / (sqrt(k/phi) * drho * g)``, with ``J_e`` the
largest J at which the zone's J-Sw function still gives Sw = 1.

References
----------
Kuensch, H. R., 1989. The jackknife and the bootstrap for general stationary
observations. Annals of Statistics 17(3), 1217-1241 (moving-block bootstrap).
Huber, P. J., 1964. Robust estimation of a location parameter. Annals of
Mathematical Statistics 35(1), 73-101.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass, field
from typing import Sequence

import numpy as np
from scipy.optimize import minimize, minimize_scalar

from .compare import net_mask
from .constants import STANDARD_GRAVITY
from .engine import ZoneModel, column_pc_j
from .errors import SatHeightError
from .models import build_function

__all__ = ["ZoneSamples", "WellFwl", "FwlSearch", "zone_samples", "misfit_matrix",
           "search_fwl", "fit_fwl_with_parameters", "entry_j", "entry_height",
           "zone_contact", "contacts_summary", "MISFITS", "fwl_from_project"]

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


def _profile_value(samples: Sequence[ZoneSamples], fwl: float, misfit, delta, function=None):
    total, n = 0.0, 0
    for s in samples:
        if s.n:
            total += float(misfit_matrix(s, [fwl], misfit, delta, function).sum())
            n += s.n
    return total / n if n else np.nan


# ----------------------------------------------------------------------------------
# bootstrap
# ----------------------------------------------------------------------------------
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


def _grid_minima(profiles: np.ndarray, grid: np.ndarray) -> np.ndarray:
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


def _interval(boot: np.ndarray, best: float, level: float) -> tuple[float, float]:
    """Interval [m] from bootstrap minima: the union of the percentile interval and
    ``best +- z * rms(boot - best)`` (a normal interval whose spread includes the
    bootstrap bias). Minima of a misfit profile are not smooth statistics and a
    block bootstrap under-states the spread of correlated data; the union keeps
    the coverage near the nominal level in simulations with AR(1) noise."""
    from scipy.stats import norm

    alpha = (1 - level) / 2
    lo, hi = (float(v) for v in np.quantile(boot, [alpha, 1 - alpha]))
    half = float(norm.ppf(1 - alpha)) * float(np.sqrt(np.mean((boot - best) ** 2)))
    return min(lo, best - half), max(hi, best + half)


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
        best joint fit (:func:`auto_block_length`, the longest of the wells').
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
    lo, hi = window if window is not None else default_window(samples)
    if not hi > lo:
        raise SatHeightError(f"FWL search window [{lo}, {hi}] m is empty",
                             hint="give the window as shallow, deep (TVDSS)")
    step = max(float(step), (hi - lo) / (max_candidates - 1))
    grid = np.linspace(lo, hi, int(round((hi - lo) / step)) + 1)
    zone = samples[0].zone
    msgs: list[str] = []

    mats = [misfit_matrix(s, grid, misfit, delta) for s in samples]
    n_tot = sum(s.n for s in samples)
    sums = [m.sum(axis=1) for m in mats]
    profile = np.sum(sums, axis=0) / n_tot
    well_profiles = {s.well: (sm / s.n if s.n else np.full(grid.size, np.nan))
                     for s, sm in zip(samples, sums)}

    def refine(fun_profile, fun_point):
        i = int(np.nanargmin(fun_profile))
        a, b = grid[max(i - 1, 0)], grid[min(i + 1, grid.size - 1)]
        if b <= a:
            return float(grid[i]), float(fun_profile[i])
        r = minimize_scalar(fun_point, bounds=(a, b), method="bounded",
                            options={"xatol": 1e-3})
        if r.fun <= fun_profile[i]:
            return float(r.x), float(r.fun)
        return float(grid[i]), float(fun_profile[i])

    best, m_best = refine(profile, lambda f: _profile_value(samples, f, misfit, delta))

    # block length from the residuals at the best FWL
    if block_length is None:
        bl = []
        for s in samples:
            if s.n >= 4:
                res = _predict(s.zone, best, s.tvdss, s.phi, s.k) - s.sw_log
                bl.append(auto_block_length(res))
        block_length = max(bl) if bl else 1
    block_length = int(max(1, block_length))
    spacing = float(np.median([s.spacing for s in samples if s.n > 1])) if n_tot > 1 else 0.0

    rng = np.random.default_rng(seed)
    weights = [block_weights(s.n, block_length, n_boot, rng) for s in samples]
    boot_sums = [w @ m.T for w, m in zip(weights, mats)]           # (n_boot, n_grid) each
    boot_profiles = np.sum(boot_sums, axis=0) / n_tot
    boot = _grid_minima(boot_profiles, grid)
    low, high = _interval(boot, best, level)
    if low <= grid[0] + 1e-9 or high >= grid[-1] - 1e-9:
        msgs.append("the interval reaches the edge of the search window: widen the window")

    wells = []
    for s, sm, bs in zip(samples, sums, boot_sums):
        if s.n < 3:
            wells.append(WellFwl(s.well, s.n, None, None, None, None, None))
            msgs.append(f"{s.well}: fewer than 3 usable samples, no own FWL")
            continue
        wp = sm / s.n
        wb, wm = refine(wp, lambda f, s=s: _profile_value([s], f, misfit, delta))
        wboot = _grid_minima(bs / s.n, grid)
        wl, wh = _interval(wboot, wb, level)
        flagged = bool(wh < low - tolerance or wl > high + tolerance)
        wells.append(WellFwl(s.well, s.n, wb, wl, wh, wm,
                             _profile_value([s], zone.fwl, misfit, delta), flagged))
        if flagged:
            msgs.append(f"{s.well}: own best FWL {wb:.2f} m [{wl:.2f}, {wh:.2f}] does not "
                        f"overlap the joint interval [{low:.2f}, {high:.2f}]: a separate "
                        "compartment, a different rock or fluid behaviour, or a log or "
                        "depth problem?")
    if np.ptp(profile) <= 1e-12:
        msgs.append("the misfit does not change over the window: no information on the FWL")
    return FwlSearch(zone=zone.name, project_fwl=float(zone.fwl), best=best, low=low, high=high,
                     level=level, misfit=misfit, delta=delta, misfit_at_best=m_best,
                     misfit_at_project=_profile_value(samples, zone.fwl, misfit, delta),
                     n_samples=n_tot, block_length=block_length,
                     block_length_m=block_length * spacing, n_boot=n_boot, seed=seed,
                     candidates=grid, profile=profile, well_profiles=well_profiles,
                     wells=wells, bootstrap=boot, warnings=msgs)


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
    zone = samples[0].zone
    fn = zone.function
    cls = type(fn)
    for p, (lo, hi) in params.items():
        if p not in cls.param_names:
            raise SatHeightError(f"{cls.name} has no parameter {p!r}",
                                 hint="its parameters are " + ", ".join(cls.param_names))
        blo, bhi = cls.bounds[p]
        if not (blo <= lo < hi <= bhi):
            raise SatHeightError(f"bounds of {p} [{lo}, {hi}] must lie within [{blo}, {bhi}] "
                                 "with low < high")
    names = list(params)
    base = dict(fn.params_)

    def make(x):
        pv = dict(base)
        pv.update(zip(names, map(float, x[1:])))
        return build_function(cls.name, pv)

    def objective(x):
        try:
            f = make(x)
        except SatHeightError:
            return 1e9
        return _profile_value(samples, float(x[0]), misfit, delta, f)

    bounds = [tuple(map(float, fwl_bounds))] + [tuple(map(float, params[p])) for p in names]
    x0 = np.array([fwl_start if fwl_start is not None else 0.5 * sum(fwl_bounds)]
                  + [float(np.clip(base[p], *params[p])) for p in names])
    res = minimize(objective, x0, method="Powell", bounds=bounds,
                   options={"xtol": 1e-4, "ftol": 1e-10, "maxfev": 4000})
    x = np.asarray(res.x, float)
    spans = np.array([b[1] - b[0] for b in bounds])
    hstep = 1e-3 * spans
    k = x.size
    hess = np.empty((k, k))
    f0 = objective(x)
    for a in range(k):
        for b in range(a, k):
            ea = np.zeros(k); ea[a] = hstep[a]
            eb = np.zeros(k); eb[b] = hstep[b]
            v = (objective(x + ea + eb) - objective(x + ea - eb) - objective(x - ea + eb)
                 + objective(x - ea - eb)) / (4 * hstep[a] * hstep[b])
            hess[a, b] = hess[b, a] = v
    corr = per_m = None
    try:
        np.linalg.cholesky(hess)
        cov = np.linalg.inv(hess)
        sd = np.sqrt(np.diag(cov))
        corr = (cov / np.outer(sd, sd)).tolist()
        per_m = {p: float(cov[i + 1, 0] / cov[0, 0]) for i, p in enumerate(names)}
    except np.linalg.LinAlgError:
        warnings.warn("the misfit's curvature at the joint optimum is not positive definite: "
                      "no correlation reported (a parameter may sit on its bound)", stacklevel=2)
    return {"fwl": float(x[0]), "values": {p: float(v) for p, v in zip(names, x[1:])},
            "bounds": {p: list(params[p]) for p in names}, "misfit": float(f0),
            "names": ["fwl"] + names, "correlation": corr, "per_metre_of_fwl": per_m,
            "converged": bool(res.success)}


# ----------------------------------------------------------------------------------
# contacts versus the FWL
# ----------------------------------------------------------------------------------
def entry_j(function, j_low: float = 1e-8, j_high: float = 1e4, tol: float = 1e-9) -> float:
    """Largest J [-] at which ``function`` still gives Sw = 1 (the entry J).

    Found by bisection on log J. Returns 0 if Sw < 1 at any J > 0 (no entry
    pressure) and ``j_high`` if Sw stays 1 over the whole range.
    """
    def full(j):
        return float(function.predict(np.array([j]))[0]) >= 1.0 - tol

    if not full(j_low):
        return 0.0
    if full(j_high):
        return float(j_high)
    a, b = np.log(j_low), np.log(j_high)
    for _ in range(80):
        m = 0.5 * (a + b)
        if full(np.exp(m)):
            a = m
        else:
            b = m
    return float(np.exp(a))


def entry_height(zone: ZoneModel, k, phi) -> np.ndarray:
    """Entry height above the FWL [m]: where Pc reaches the rock's entry pressure.

    ``h_e = J_e * sigma cos theta / (sqrt(k / phi) * (rho_w - rho_hc) * g)``
    for the oil-water (or gas-water) column of the zone.

    Parameters
    ----------
    zone : ZoneModel
    k : array_like
        Permeability [m^2].
    phi : array_like
        Porosity [fraction].
    """
    je = entry_j(zone.function)
    root = np.sqrt(np.asarray(k, float) / np.asarray(phi, float))
    return je * zone.sigma_cos_theta / (root * zone.delta_rho * STANDARD_GRAVITY)


def zone_contact(zone: ZoneModel, phi, k, min_porosity: float = 0.0,
                 min_permeability: float = 0.0) -> dict:
    """Entry height and contact depth of a zone for its typical rock.

    The typical rock is the median porosity and the geometric-mean permeability
    of the samples passing the cutoffs (all finite positive samples if none pass).

    Parameters
    ----------
    zone : ZoneModel
    phi : array_like
        Porosity of the zone's samples [fraction].
    k : array_like
        Permeability of the zone's samples [m^2].
    min_porosity, min_permeability : float
        Cutoffs [fraction], [m^2].

    Returns
    -------
    dict
        ``entry_j``, ``entry_height_m``, ``contact_tvdss_m`` (= FWL - entry height),
        ``typical_porosity``, ``typical_permeability_m2``; None values without samples.
    """
    phi = np.asarray(phi, float)
    k = np.asarray(k, float)
    with np.errstate(invalid="ignore"):
        ok = (phi > 0) & (phi <= 1) & (k > 0)
        net = ok & net_mask(phi, k, min_porosity, min_permeability)
    use = net if net.any() else ok
    if not use.any():
        return {"entry_j": entry_j(zone.function), "entry_height_m": None,
                "contact_tvdss_m": None, "typical_porosity": None,
                "typical_permeability_m2": None}
    p = float(np.median(phi[use]))
    kk = float(np.exp(np.mean(np.log(k[use]))))
    he = float(entry_height(zone, kk, p))
    return {"entry_j": entry_j(zone.function), "entry_height_m": he,
            "contact_tvdss_m": zone.fwl - he, "typical_porosity": p,
            "typical_permeability_m2": kk}


def contacts_summary(result, length_factor: float = 1.0, min_porosity: float = 0.0,
                     min_permeability: float = 0.0) -> dict:
    """Per zone of a computed well: entry height and contact depth, JSON-ready.

    Parameters
    ----------
    result : satheight.results.WellResult
    length_factor : float
        Metres per output length unit.
    min_porosity, min_permeability : float
        Cutoffs of the typical rock [fraction], [m^2].

    Returns
    -------
    dict
        Zone name -> ``{"fwl_tvdss", "entry_j", "entry_height", "contact_tvdss",
        "contact_kind", "typical_porosity", "typical_permeability_mD",
        "gas_oil_level_tvdss"}`` in the output length unit.
    """
    from .constants import MILLIDARCY

    out = {}
    for i, zn in enumerate(result.zones):
        m = result.shm.zone == i
        c = zone_contact(zn, result.phi[m], result.k[m], min_porosity, min_permeability)
        kind = {"oil": "oil-water contact", "gas": "gas-water contact",
                "air": "top of the capillary fringe"}.get(zn.hydrocarbon, "contact")
        out[zn.name] = {
            "fwl_tvdss": zn.fwl / length_factor,
            "entry_j": c["entry_j"],
            "entry_height": None if c["entry_height_m"] is None else c["entry_height_m"] / length_factor,
            "contact_tvdss": None if c["contact_tvdss_m"] is None else c["contact_tvdss_m"] / length_factor,
            "contact_kind": kind,
            "typical_porosity": c["typical_porosity"],
            "typical_permeability_mD": (None if c["typical_permeability_m2"] is None
                                        else c["typical_permeability_m2"] / MILLIDARCY),
            "gas_oil_level_tvdss": (None if zn.gas_oil_level is None
                                    else zn.gas_oil_level / length_factor),
        }
    return out


# ----------------------------------------------------------------------------------
# whole project
# ----------------------------------------------------------------------------------
def fwl_from_project(project, zones: Sequence[str] | None = None, wells: Sequence[str] | None = None,
                     *, shale_curve: str | None = None, max_shale: float | None = None,
                     exclude: Sequence[tuple[str | None, float, float]] = (),
                     fit_parameters: dict[str, tuple[float, float]] | None = None,
                     **search_options) -> tuple[dict[str, FwlSearch], list[str]]:
    """FWL search of each zone of a project from its wells' log Sw.

    Parameters
    ----------
    project : satheight.project_types.Project or path
    zones : list of str, optional
        Zone names (default: every zone).
    wells : list of str, optional
        Well names to use (default: every well).
    shale_curve : str, optional
        Mnemonic of a shale indicator curve (file units) and ``max_shale`` its cutoff.
    exclude : sequence of (well or None, top, base)
        TVDSS intervals [m] left out (the user mask); ``None`` for every well.
    fit_parameters : dict, optional
        J-Sw parameter bounds for :func:`fit_fwl_with_parameters`.
    **search_options
        Passed to :func:`search_fwl` (window, step, misfit, delta, n_boot, seed...).

    Returns
    -------
    (dict[str, FwlSearch], list[str])
        Results by zone and notes (wells skipped and why).
    """
    from .workflows.run import compute_well
    from .project import load_project
    from .project.types import Project
    from .roles import find_curve

    if not isinstance(project, Project):
        project = load_project(project)
    names = [z.name for z in project.zones]
    zones = list(zones) if zones else names
    for z in zones:
        if z not in names:
            raise SatHeightError(f"zone {z!r} is not in the project",
                                 where=str(project.path), hint="zones: " + ", ".join(names))
    notes: list[str] = []
    computed = []
    for spec in project.wells:
        if wells and spec.name is not None and spec.name not in wells:
            continue
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            res, _ = compute_well(project, spec)
        if wells and res.well.name not in wells:
            continue
        if res.sw_log is None:
            notes.append(f"{res.well.name}: no log Sw (no Sw curve and no Archie inputs): skipped")
            continue
        computed.append(res)
    if wells:
        missing = set(wells) - {r.well.name for r in computed}
        for w in sorted(missing):
            notes.append(f"{w}: not found among the project's wells with log Sw")
    out = {}
    for zname in zones:
        samples = []
        for res in computed:
            idx = [i for i, zn in enumerate(res.zones) if zn.name == zname]
            if not idx:
                continue
            zn = res.zones[idx[0]]
            mask = np.ones(res.tvdss.size, bool)
            for w, top, base in exclude:
                if w is None or w == res.well.name:
                    mask &= ~((res.tvdss >= top) & (res.tvdss <= base))
            shale = None
            if shale_curve:
                key = find_curve(res.well, shale_curve)
                if key is None:
                    raise SatHeightError(f"shale curve {shale_curve!r} is not in well "
                                         f"{res.well.name}", where=str(res.well.source),
                                         hint="name a curve every well has, e.g. GR")
                shale = res.well.curves[key].data
            samples.append(zone_samples(res.well.name, res.tvdss, res.phi, res.k, res.sw_log, zn,
                                        min_porosity=project.comparison.min_porosity,
                                        min_permeability=project.comparison.min_permeability,
                                        shale=shale, max_shale=max_shale, mask=mask))
        if not samples:
            notes.append(f"zone {zname}: no well crosses it")
            continue
        result = search_fwl(samples, **search_options)
        if fit_parameters:
            lo, hi = result.candidates[0], result.candidates[-1]
            result.parameters = fit_fwl_with_parameters(
                samples, fit_parameters, fwl_bounds=(lo, hi), fwl_start=result.best,
                misfit=result.misfit, delta=result.delta)
        out[zname] = result
    return out, notes
