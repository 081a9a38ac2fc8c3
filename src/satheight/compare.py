"""Compare the saturation-height prediction with log water saturation, per well and zone.

Hydrocarbon pore thickness: ``HCPT = sum(phi * (1 - Sw) * dh)`` over samples, with
``dh`` the true vertical thickness each sample stands for (common practice). Both
saturations are summed over the same samples so the two thicknesses compare.
"""

from __future__ import annotations

import numpy as np

from .constants import MILLIDARCY
from .results import FLAG_BAD_PERMEABILITY, FLAG_BAD_POROSITY, FLAG_NO_ZONE, WellResult


def sample_thickness(tvdss):
    """True vertical thickness each sample stands for [m].

    Half the vertical distance to each neighbour (the end samples take their one
    neighbour's half-distance twice), so the thicknesses add up to the vertical
    length of the log plus one step.

    Parameters
    ----------
    tvdss : array_like
        TVDSS of the samples [m], in sample order.
    """
    z = np.asarray(tvdss, dtype=float)
    if z.size < 2:
        return np.zeros_like(z)
    d = np.abs(np.diff(z))
    dh = np.empty_like(z)
    dh[1:-1] = 0.5 * (d[:-1] + d[1:])
    dh[0] = d[0]
    dh[-1] = d[-1]
    return dh


def hydrocarbon_pore_thickness(phi, sw, dh):
    """``sum(phi * (1 - Sw) * dh)`` [m] over samples where all three are finite.

    Parameters
    ----------
    phi : array_like
        Porosity [fraction].
    sw : array_like
        Water saturation [fraction].
    dh : array_like
        True vertical thickness per sample [m].
    """
    v = np.asarray(phi, float) * (1.0 - np.asarray(sw, float)) * np.asarray(dh, float)
    return float(np.nansum(v))


def difference_stats(sw_model, sw_log):
    """Mean and RMS of ``sw_model - sw_log`` [fraction] and the number of samples used."""
    d = np.asarray(sw_model, float) - np.asarray(sw_log, float)
    d = d[np.isfinite(d)]
    if d.size == 0:
        return {"mean_difference": None, "rms_difference": None, "samples_compared": 0}
    return {"mean_difference": float(d.mean()),
            "rms_difference": float(np.sqrt(np.mean(d * d))),
            "samples_compared": int(d.size)}


def _block(result: WellResult, zone_mask: np.ndarray, net: np.ndarray, dh: np.ndarray,
           length_factor: float) -> dict:
    shm = result.shm
    flagged_bits = shm.flag & ~FLAG_NO_ZONE
    mask = zone_mask & net
    out = {"samples": int(zone_mask.sum()),
           "samples_net": int(mask.sum()),
           "samples_flagged": int((zone_mask & (flagged_bits != 0)).sum()),
           "samples_bad_porosity_or_permeability": int(
               (zone_mask & ((shm.flag & (FLAG_BAD_POROSITY | FLAG_BAD_PERMEABILITY)) != 0)).sum()),
           "vertical_thickness": float(dh[zone_mask].sum()) / length_factor,
           "net_vertical_thickness": float(dh[mask].sum()) / length_factor}
    sw_shm = np.where(mask, shm.sw, np.nan)
    if result.sw_log is not None:
        sw_log = np.where(mask, result.sw_log, np.nan)
        both = np.isfinite(sw_shm) & np.isfinite(sw_log) & np.isfinite(result.phi)
        out.update(difference_stats(sw_shm[both], sw_log[both]))
        out["hcpt_shm"] = hydrocarbon_pore_thickness(result.phi[both], sw_shm[both], dh[both]) / length_factor
        out["hcpt_log"] = hydrocarbon_pore_thickness(result.phi[both], sw_log[both], dh[both]) / length_factor
    else:
        ok = np.isfinite(sw_shm) & np.isfinite(result.phi)
        out.update({"mean_difference": None, "rms_difference": None,
                    "samples_compared": 0})
        out["hcpt_shm"] = hydrocarbon_pore_thickness(result.phi[ok], sw_shm[ok], dh[ok]) / length_factor
        out["hcpt_log"] = None
    return out


def net_mask(phi, k, min_porosity: float = 0.0, min_permeability: float = 0.0):
    """Samples that count as reservoir: porosity >= cutoff [fraction] and k >= cutoff [m^2].

    Parameters
    ----------
    phi : array_like
        Porosity [fraction]; NaN is never net.
    k : array_like
        Permeability [m^2]; NaN is never net.
    """
    with np.errstate(invalid="ignore"):
        return (np.asarray(phi, float) >= min_porosity) & (np.asarray(k, float) >= min_permeability)


def summarise(result: WellResult, length_unit: str = "m", length_factor: float = 1.0,
              min_porosity: float = 0.0, min_permeability: float = 0.0) -> dict:
    """Per-well and per-zone comparison of SHM Sw with log Sw, JSON-ready.

    Parameters
    ----------
    result : WellResult
    length_unit : str
        Unit name reported for thicknesses (``"m"`` or ``"ft"``).
    length_factor : float
        Metres per ``length_unit`` (1 for m, 0.3048 for ft).
    min_porosity, min_permeability : float
        Net-reservoir cutoffs [fraction], [m^2]: only samples at or above both enter
        the difference statistics and the hydrocarbon pore thickness.

    Returns
    -------
    dict
        ``{"well", "sw_log_source", "units", "whole_well": {...}, "zones": {name: {...}}}``
        where each block holds samples (in the zone), samples_net (passing the cutoffs),
        samples_flagged, samples_compared,
        mean_difference and rms_difference (SHM minus log, fraction), hcpt_shm and
        hcpt_log (hydrocarbon pore thickness in ``length_unit``) and vertical_thickness.
    """
    dh = sample_thickness(result.tvdss)
    net = net_mask(result.phi, result.k, min_porosity, min_permeability)
    zones = {}
    for i, zn in enumerate(result.zones):
        m = result.shm.zone == i
        block = _block(result, m, net, dh, length_factor)
        block.update({"top_tvdss": zn.top / length_factor, "base_tvdss": zn.base / length_factor,
                      "fwl_tvdss": zn.fwl / length_factor, "hydrocarbon": zn.hydrocarbon,
                      "function": zn.function.name, "parameters": dict(zn.function.params_)})
        zones[zn.name] = block
    all_zones = result.shm.zone >= 0
    return {"well": result.well.name,
            "source": str(result.well.source),
            "sw_log_source": result.sw_log_source,
            "units": {"thickness": length_unit, "depth": length_unit, "saturation": "fraction"},
            "datum_elevation": result.datum_elevation / length_factor,
            "cutoffs": {"min_porosity": min_porosity,
                        "min_permeability_mD": min_permeability / MILLIDARCY},
            "whole_well": _block(result, all_zones, net, dh, length_factor),
            "zones": zones}
