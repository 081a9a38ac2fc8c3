"""Contacts versus the free-water level: entry height and contact depth per zone.

The oil-water (or gas-water) contact lies one entry height above the FWL: the
height where Pc reaches the entry pressure of the rock,
``h_e = J_e * sigma cos theta / (sqrt(k/phi) * drho * g)``, with ``J_e`` the
largest J at which the zone's J-Sw function still gives Sw = 1 (hydrostatics
of a capillary column, Leverett 1941 for J; common practice for the contact).

The FWL search from log Sw lives in :mod:`satheight.fwlsearch`.

References
----------
Leverett, M. C., 1941. Capillary behavior in porous solids. Trans. AIME 142, 152-169.
"""

from __future__ import annotations

import numpy as np

from .compare import net_mask
from .constants import MILLIDARCY, STANDARD_GRAVITY
from .engine import ZoneModel

__all__ = ["entry_j", "entry_height", "zone_contact", "contacts_summary"]


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
