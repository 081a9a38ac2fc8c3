"""Resistivity-derived water saturation.

References
----------
Archie, G. E., 1942. The electrical resistivity log as an aid in determining some
reservoir characteristics. Trans. AIME 146, 54-62.
"""

from __future__ import annotations

import numpy as np


def formation_factor(phi, a=1.0, m=2.0):
    """Formation resistivity factor ``F = a / phi**m`` [-].

    Parameters
    ----------
    phi : array_like
        Porosity [fraction].
    a : float
        Tortuosity factor [-].
    m : float
        Cementation exponent [-].
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        return a / np.power(np.asarray(phi, dtype=float), m)


def archie_sw(rt, phi, rw, a=1.0, m=2.0, n=2.0, clip=True):
    """Archie water saturation ``Sw = (a * Rw / (phi**m * Rt))**(1/n)`` [fraction].

    Parameters
    ----------
    rt : array_like
        True (deep) formation resistivity [ohm.m].
    phi : array_like
        Porosity [fraction].
    rw : float or array_like
        Formation-water resistivity at formation temperature [ohm.m].
    a, m, n : float
        Tortuosity factor, cementation exponent and saturation exponent [-].
    clip : bool
        Clip the result to [0, 1] (default). Values of Rt, phi <= 0 or NaN give NaN.

    References
    ----------
    Archie (1942), Trans. AIME 146, 54-62.
    """
    rt = np.asarray(rt, dtype=float)
    phi = np.asarray(phi, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        ok = (rt > 0) & (phi > 0)
        sw = np.power(a * rw / (np.power(phi, m) * rt), 1.0 / n)
    sw = np.where(ok, sw, np.nan)
    if clip:
        sw = np.clip(sw, 0.0, 1.0)
    return sw
