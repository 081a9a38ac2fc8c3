"""Samples and misfit of an FWL search from log Sw.

The samples of one well and zone (:func:`zone_samples`), and the robust misfit
of ``Sw_SHM(FWL) - Sw_log`` for candidate FWLs (:func:`misfit_matrix`, Huber loss
or mean absolute deviation). All candidates are evaluated at once as a 2-D array
(candidates x samples, in chunks) with the engine's
:func:`~satheight.engine.column_pc_j` and the zone's J-Sw function.

References
----------
Huber, P. J., 1964. Robust estimation of a location parameter. Annals of
Mathematical Statistics 35(1), 73-101.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from .compare import net_mask
from .engine import ZoneModel, column_pc_j
from .errors import SatHeightError

__all__ = ["ZoneSamples", "WellFwl", "zone_samples", "misfit_matrix", "profile_value", "predict_sw",
           "default_window", "huber_loss", "absolute_loss", "MISFITS", "SW_LOG_MAX"]

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
def predict_sw(zone: ZoneModel, fwl, tvdss, phi, k, function=None):
    """SHM Sw [fraction] for candidate FWLs [m] (any shape broadcasting with the samples).

    ``h = FWL - TVDSS`` [m], Pc and J from :func:`~satheight.engine.column_pc_j`
    (Leverett 1941), Sw from ``function`` (default: the zone's).
    """
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
        sw = predict_sw(samples.zone, f, samples.tvdss, samples.phi, samples.k, function)
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


def default_window(samples: Sequence[ZoneSamples]) -> tuple[float, float]:
    """Search window [m]: from the shallowest zone top to the deepest base plus half the zone."""
    tops = [s.zone.top for s in samples]
    bases = [s.zone.base for s in samples]
    top, base = min(tops), max(bases)
    return float(top), float(base + 0.5 * (base - top))


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
    offset : float or None
        Its best FWL minus the joint best FWL [m] (the well's residual: a
        separate compartment shows as an offset whose interval excludes 0).
    params : dict or None
        Its own J-Sw parameters, when the shape was fitted with the FWL.
    """

    well: str
    n_samples: int
    best: float | None
    low: float | None
    high: float | None
    misfit_at_best: float | None
    misfit_at_project: float | None
    flagged: bool = False
    offset: float | None = None
    params: dict | None = None
