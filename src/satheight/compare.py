"""Compare the saturation-height prediction with log water saturation, per well and zone.

Hydrocarbon pore thickness: ``HCPT = sum(phi * (1 - Sw) * dh)`` over samples, with
``dh`` the true vertical thickness each sample stands for (common practice). Both
saturations are summed over the same samples so the two thicknesses compare, and
each hydrocarbon phase (oil, gas; air in an air-water column) is summed on its own:
oil and gas volumes are never added.

Samples whose porosity or permeability lies outside its plausible range
(:func:`satheight.plausible.out_of_range_samples`) are left out of the statistics and
the volumes and counted. The difference statistics use the unclipped log Sw (Archie
values above 1 in the water leg are kept: clipping them biases the mean); only the
exported curve and the volumes use the clipped one. A block without a usable sample
is ``"not computed"`` with a note, never ``"ok"`` with zeros.
"""

from __future__ import annotations

import numpy as np

from .constants import MILLIDARCY
from .errors import SatHeightError
from .plausible import out_of_range_samples
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


def _phase_of_samples(result: WellResult) -> np.ndarray:
    """Hydrocarbon phase of each sample's column (``"oil"``, ``"gas"``, ``"air"``, "" outside).

    In a zone with a gas cap, samples above its free-oil level are in the gas column.
    """
    phase = np.full(result.shm.zone.shape, "", dtype=object)
    z = np.asarray(result.tvdss, dtype=float)
    for i, zn in enumerate(result.zones):
        m = result.shm.zone == i
        phase[m] = zn.hydrocarbon
        if zn.three_phase:
            with np.errstate(invalid="ignore"):
                phase[m & (z < zn.gas_oil_level)] = "gas"
    return phase


def _not_computed_note(result: WellResult, zone_mask: np.ndarray, usable: np.ndarray) -> str:
    """Why a block has no usable sample, and where log Sw came from."""
    n = int(zone_mask.sum())
    if n == 0:
        why = "no sample of the well lies in it"
    elif not np.isfinite(result.phi[zone_mask]).any():
        why = "the porosity curve has no value in it"
    elif not np.isfinite(result.k[zone_mask]).any():
        why = "the permeability curve has no value in it"
    else:
        why = f"none of its {n} samples has usable porosity, permeability and SHM Sw"
    src = result.sw_log_source
    origin = ("log Sw from Archie on the resistivity curve" if src == "archie" else
              f"log Sw from {src.capitalize()} on the resistivity and shale curves"
              if src in ("simandoux", "indonesia") else
              f"log Sw from curve {src.split(':', 1)[1]}" if src.startswith("curve:") else
              "no log Sw")
    return f"not computed: {why} ({origin})"


def _block(result: WellResult, zone_mask: np.ndarray, net: np.ndarray, dh: np.ndarray,
           length_factor: float, phase: np.ndarray) -> dict:
    shm = result.shm
    flagged_bits = shm.flag & ~FLAG_NO_ZONE
    bad = out_of_range_samples(result.phi, result.k)
    mask = zone_mask & net & ~bad
    out = {"samples": int(zone_mask.sum()),
           "samples_net": int(mask.sum()),
           "samples_flagged": int((zone_mask & (flagged_bits != 0)).sum()),
           "samples_bad_porosity_or_permeability": int(
               (zone_mask & ((shm.flag & (FLAG_BAD_POROSITY | FLAG_BAD_PERMEABILITY)) != 0)).sum()),
           "samples_out_of_range": int((zone_mask & bad).sum()),
           "vertical_thickness": float(dh[zone_mask].sum()) / length_factor,
           "net_vertical_thickness": float(dh[mask].sum()) / length_factor}
    sw_shm = np.where(mask, shm.sw, np.nan)
    usable = np.isfinite(sw_shm) & np.isfinite(result.phi)
    sw_log = None
    if result.sw_log is not None:
        sw_log = np.where(mask, result.sw_log, np.nan)
        usable &= np.isfinite(sw_log)
        # statistics on the unclipped log Sw (clipping biases the mean in the water leg)
        raw = result.sw_log if result.sw_log_unclipped is None else result.sw_log_unclipped
        out.update(difference_stats(sw_shm[usable], raw[usable]))
    else:
        out.update({"mean_difference": None, "rms_difference": None, "samples_compared": 0})
    out["samples_sw_log_clipped"] = _clipped(result, zone_mask)
    out.update(_hcpt(result.phi, sw_shm, sw_log, dh, usable, np.where(zone_mask, phase, ""),
                     length_factor))
    ok = bool(usable.any())
    out["status"] = "ok" if ok else "not computed"
    out["note"] = None if ok else _not_computed_note(result, zone_mask, usable)
    return out


def _clipped(result: WellResult, zone_mask: np.ndarray) -> int:
    """Samples of the block whose log Sw (Archie) was outside [0, 1] and clipped for export."""
    if result.sw_log_unclipped is None:
        return 0
    with np.errstate(invalid="ignore"):
        outside = (result.sw_log_unclipped < 0.0) | (result.sw_log_unclipped > 1.0)
    return int((zone_mask & outside).sum())


def _hcpt(phi, sw_shm, sw_log, dh, usable, phase, length_factor) -> dict:
    """Hydrocarbon pore thickness per phase present, SHM and log, in the output length unit.

    ``None`` for the phases of a block without a usable sample (not computed, not 0).
    """
    out = {}
    for ph in sorted(set(phase.tolist()) - {""}):
        m = usable & (phase == ph)
        if not usable.any():
            out[f"hcpt_{ph}_shm"] = out[f"hcpt_{ph}_log"] = None
            continue
        out[f"hcpt_{ph}_shm"] = hydrocarbon_pore_thickness(phi[m], sw_shm[m], dh[m]) / length_factor
        out[f"hcpt_{ph}_log"] = (None if sw_log is None else
                                 hydrocarbon_pore_thickness(phi[m], sw_log[m], dh[m]) / length_factor)
    return out


def net_mask(phi, k, min_porosity: float = 0.0, min_permeability: float = 0.0,
             vsh=None, max_shale: float | None = None):
    """Samples that count as reservoir: porosity >= cutoff [fraction], k >= cutoff [m^2]
    and, with ``max_shale``, shale volume <= cutoff [fraction] (common practice).

    Parameters
    ----------
    phi : array_like
        Porosity [fraction]; NaN is never net.
    k : array_like
        Permeability [m^2]; NaN is never net.
    vsh : array_like, optional
        Shale volume [fraction]; NaN is never net when ``max_shale`` is given.
    max_shale : float, optional
        Shale-volume cutoff [fraction]; ``None``: no shale cutoff. Given without
        ``vsh`` it is an error (the cutoff is never silently skipped).
    """
    with np.errstate(invalid="ignore"):
        net = (np.asarray(phi, float) >= min_porosity) & (np.asarray(k, float) >= min_permeability)
        if max_shale is None:
            return net
        if vsh is None:
            raise SatHeightError("a shale-volume cutoff (max_shale) is set but the well has no "
                                 "shale-volume curve",
                                 hint='name it with curves = { shale = "VSH" } in the well\'s entry '
                                      "of the project file, or remove [comparison] max_shale")
        return net & (np.asarray(vsh, float) <= max_shale)


def summarise(result: WellResult, length_unit: str = "m", length_factor: float = 1.0,
              min_porosity: float = 0.0, min_permeability: float = 0.0,
              max_shale: float | None = None) -> dict:
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
    max_shale : float, optional
        Shale-volume cutoff [fraction] on ``result.vsh`` (see :func:`net_mask`).

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
    try:
        net = net_mask(result.phi, result.k, min_porosity, min_permeability, result.vsh, max_shale)
    except SatHeightError as exc:
        raise SatHeightError(exc.what, where=str(result.well.source), hint=exc.hint) from None
    phase = _phase_of_samples(result)
    zones = {}
    for i, zn in enumerate(result.zones):
        m = result.shm.zone == i
        block = _block(result, m, net, dh, length_factor, phase)
        # one phase per two-phase zone: its HCPT also under the plain keys
        hc = None if zn.three_phase else zn.hydrocarbon
        block["hcpt_shm"] = block.get(f"hcpt_{hc}_shm")
        block["hcpt_log"] = block.get(f"hcpt_{hc}_log")
        block.update({"top_tvdss": zn.top / length_factor, "base_tvdss": zn.base / length_factor,
                      "fwl_tvdss": zn.fwl / length_factor, "fwl_source": zn.fwl_source,
                      "hydrocarbon": zn.hydrocarbon,
                      "function": zn.function.name, "parameters": dict(zn.function.params_)})
        zones[zn.name] = block
    all_zones = result.shm.zone >= 0
    return {"well": result.well.name,
            "source": str(result.well.source),
            "sw_log_source": result.sw_log_source,
            "units": {"thickness": length_unit, "depth": length_unit, "saturation": "fraction"},
            "datum": {"elevation": result.datum_elevation / length_factor,
                      "source": result.datum_source},
            "cutoffs": {"min_porosity": min_porosity,
                        "min_permeability_mD": min_permeability / MILLIDARCY,
                        **({} if max_shale is None else {"max_shale": max_shale})},
            "whole_well": _block(result, all_zones, net, dh, length_factor, phase),
            "zones": zones}
