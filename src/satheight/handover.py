"""What the next tools need: depths of levels along a well, parameter covariances, and the
saturation-height function tabulated over height and permeability for a 3D model.

Pure functions on numpy arrays; the files are written by :mod:`satheight.workflows.handover`.
"""

from __future__ import annotations

import numpy as np

from .constants import MILLIDARCY, STANDARD_GRAVITY
from .contacts import entry_j
from .engine import column_pc_j

__all__ = ["md_at_tvdss", "covariance", "height_grid", "permeability_grid", "shf_grid",
           "entry_heights",
           "significant"]


def md_at_tvdss(md, tvdss, level: float) -> float | None:
    """Measured depth [m] where the well path first reaches TVDSS ``level`` [m].

    Linear interpolation between the two samples that bracket ``level`` (both finite);
    where TVDSS is not monotone (a well that turns up), the shallowest-MD crossing is
    taken. None if the path never reaches ``level`` within its samples.

    Parameters
    ----------
    md, tvdss : array_like
        Measured depth [m] and TVDSS [m] (positive down) of each sample, MD increasing.
    level : float
        TVDSS of the level [m].
    """
    md = np.asarray(md, dtype=float)
    d = np.asarray(tvdss, dtype=float) - float(level)
    ok = np.isfinite(md) & np.isfinite(d)
    md, d = md[ok], d[ok]
    if md.size == 0 or not np.isfinite(level):
        return None
    exact = np.flatnonzero(d == 0.0)
    cross = np.flatnonzero(np.sign(d[:-1]) * np.sign(d[1:]) < 0)
    first_exact = exact[0] if exact.size else md.size
    first_cross = cross[0] if cross.size else md.size
    if first_exact == md.size and first_cross == md.size:
        return None
    if first_exact <= first_cross:
        return float(md[first_exact])
    i = first_cross
    t = d[i] / (d[i] - d[i + 1])
    return float(md[i] + t * (md[i + 1] - md[i]))


def covariance(stderr, correlation) -> np.ndarray:
    """Covariance matrix ``C_ij = r_ij s_i s_j`` from standard errors ``s`` and the
    correlation matrix ``r`` (definition of the correlation coefficient)."""
    s = np.asarray(stderr, dtype=float)
    r = np.asarray(correlation, dtype=float)
    c = r * np.outer(s, s)
    return 0.5 * (c + c.T)          # exactly symmetric, as a covariance is


def height_grid(length_factor: float = 1.0) -> np.ndarray:
    """Heights above the FWL of the table, in the output length unit: fine near the FWL
    (where Sw changes fastest), coarser above. ``length_factor``: metres per unit (the
    field grid has the same number of nodes over about three times the numbers, in feet)."""
    scale = 1.0 if length_factor == 1.0 else 3.0
    parts = [np.arange(0, 50) * 0.1, 5.0 + np.arange(0, 30) * 0.5, 20.0 + np.arange(0, 40) * 2.0,
             100.0 + np.arange(0, 41) * 10.0]
    return np.round(np.concatenate(parts) * scale, 6)


def permeability_grid(low_md: float = 1e-2, high_md: float = 1e4, per_decade: int = 20) -> np.ndarray:
    """Permeabilities of the table [mD], evenly spaced in log10 k, ``per_decade`` a decade."""
    n = int(round(np.log10(high_md / low_md) * per_decade)) + 1
    return significant(np.logspace(np.log10(low_md), np.log10(high_md), n), 6)


def significant(x, digits: int = 6) -> np.ndarray:
    """``x`` rounded to ``digits`` significant digits (vectorised; 0 and NaN kept)."""
    x = np.asarray(x, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        mag = np.where(np.isfinite(x) & (x != 0), np.floor(np.log10(np.abs(x))), 0.0)
    scale = 10.0 ** (digits - 1 - mag)
    return np.round(x * scale) / scale


def entry_heights(zone, function, porosity: float, k_md) -> np.ndarray:
    """Height above the FWL [m] where Sw leaves 1, for each permeability [mD].

    ``h_e = J_e sigma cos theta / (sqrt(k/phi) (rho_w - rho_hc) g)`` with ``J_e`` the
    entry J of the function (:func:`satheight.contacts.entry_j`); for a height function
    the entry height itself. NaN where it lies above the oil leg of a gas cap (the
    column is no longer two-phase there). A table with these heights as nodes has the
    kink of Sw at a node, so interpolation in height is exact there.
    """
    k = np.asarray(k_md, dtype=float) * MILLIDARCY
    je = entry_j(function)
    if function.variable == "height":
        return np.full(k.shape, je)
    he = je * zone.sigma_cos_theta / (np.sqrt(k / porosity) * zone.delta_rho * STANDARD_GRAVITY)
    if zone.gas_oil_level is not None:
        he = np.where(he <= zone.fwl - zone.gas_oil_level, he, np.nan)
    return he


def shf_grid(zone, function, porosity: float, heights_m, k_md) -> tuple[np.ndarray, np.ndarray]:
    """J [-] and Sw [fraction] of one zone's function over heights x permeabilities.

    Same column physics as the engine (:func:`satheight.engine.column_pc_j`: Pc from the
    density difference and height, a gas cap over an oil leg where the zone has one; J =
    Pc sqrt(k/phi)/(sigma cos theta), Leverett 1941), Sw from ``function`` (its J, or the
    height for a height function).

    Parameters
    ----------
    zone : satheight.engine.Zone
    function : JSwFunction
        Ready to predict.
    porosity : float
        Porosity of the table [fraction].
    heights_m : array_like
        Heights above the FWL [m]: one column (the same for every permeability) or one
        column per permeability, shape ``(n, len(k_md))``.
    k_md : array_like
        Permeabilities [mD] (columns).

    Returns
    -------
    (numpy.ndarray, numpy.ndarray)
        ``J`` and ``Sw`` of shape ``(len(heights_m), len(k_md))``.
    """
    h = np.asarray(heights_m, dtype=float)
    h = h[:, None] if h.ndim == 1 else h
    k = np.asarray(k_md, dtype=float)[None, :] * MILLIDARCY
    _, j = column_pc_j(h, k, porosity, zone)
    x = np.broadcast_to(h, j.shape) if function.variable == "height" else j
    sw = function.predict(x)
    return j, np.where(np.broadcast_to(h, j.shape) > 0, sw, 1.0)
