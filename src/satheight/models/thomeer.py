"""Thomeer hyperbola, in capillary pressure or in Leverett J.

Thomeer (1960) described a mercury-injection curve by a hyperbola in log-log space:

.. math::

    \\frac{B_v}{B_{v\\infty}} = \\exp\\left(\\frac{-G}{\\log_{10}(P_c / P_d)}\\right)
    \\quad (P_c > P_d), \\qquad B_v = 0 \\quad (P_c \\le P_d)

with ``Bv`` the bulk volume occupied by mercury [% or fraction of bulk volume],
``Bv_inf`` its value at infinite pressure, ``Pd`` the extrapolated displacement
pressure and ``G`` the pore geometrical factor. :func:`thomeer_bulk_volume` is that
equation in any pressure unit.

As a J-Sw family (:class:`Thomeer`) the same form is written in J with an entry J
``jd`` and in pore-volume saturation: the non-wetting saturation at infinite J is
``1 - swirr`` (``swirr = 1 - Bv_inf / phi``), so

.. math::

    S_w = 1 - (1 - S_{wirr}) \\exp\\left(\\frac{-G}{\\log_{10}(J / J_d)}\\right) \\quad (J > J_d),
    \\qquad S_w = 1 \\quad (J \\le J_d)

For one plug J is proportional to Pc, so the class also fits a single plug's curve
in pressure: pass ``Pc`` in psi as the variable, and ``jd`` is then ``Pd`` in psi
(:func:`fit_thomeer_pc`).

References
----------
Thomeer, J. H. M., 1960. Introduction of a pore geometrical factor defined by the
capillary pressure curve. Journal of Petroleum Technology 12(3), 73-77.
"""

from __future__ import annotations

import numpy as np

from .. import constants as C
from .base import JSwFunction


def thomeer_bulk_volume(pc, pd, g, bv_inf):
    """Thomeer (1960) mercury bulk volume at capillary pressure ``pc``.

    Parameters
    ----------
    pc : array_like
        Capillary pressure, any unit (the same as ``pd``), e.g. [psi] or [Pa].
    pd : float
        Extrapolated displacement pressure, same unit as ``pc``, > 0.
    g : float
        Pore geometrical factor [-], > 0.
    bv_inf : float
        Bulk volume occupied by mercury at infinite pressure [% or fraction of bulk
        volume]; the result has the same unit.

    Returns
    -------
    numpy.ndarray
        Bulk volume occupied by mercury; 0 at and below ``pd``.
    """
    pc = np.asarray(pc, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        x = np.log10(pc / pd)
        bv = bv_inf * np.exp(-g / np.where(x > 0, x, 1.0))
    return np.where(np.isnan(pc), np.nan, np.where(x > 0, bv, 0.0))


class Thomeer(JSwFunction):
    """``Sw = 1 - (1 - swirr) * exp(-g / log10(J / jd))`` above ``jd``, 1 at and below.

    Parameters (``params_``)
    ------------------------
    swirr : float
        Water saturation at infinite J [fraction] (``1 - Bv_inf / phi``).
    jd : float
        Entry (displacement) J [-], > 0 (or Pd [psi] when fitted in pressure).
    g : float
        Thomeer pore geometrical factor [-], > 0.
    """

    name = "thomeer"
    param_names = ("swirr", "jd", "g")
    bounds = {"swirr": (0.0, 0.99), "jd": (1e-6, 1e5), "g": (1e-3, 50.0)}
    description = "Sw = 1 - (1 - swirr) * exp(-g / log10(J/jd)) for J > jd, else 1"

    @staticmethod
    def equation(j, swirr, jd, g):
        """Sw [fraction] from J [-]."""
        return 1.0 - thomeer_bulk_volume(j, jd, g, 1.0 - swirr)

    def initial_guess(self, j, sw):
        wet = sw < 0.98
        jd = float(np.nanmin(j[wet])) * 0.7 if wet.any() else float(np.nanmin(j))
        return {"swirr": max(0.0, float(np.nanmin(sw)) * 0.8), "jd": jd, "g": 0.5}


def fit_thomeer_pc(pc, sw) -> Thomeer:
    """Fit the Thomeer hyperbola to one plug's curve in capillary pressure.

    Parameters
    ----------
    pc : array_like
        Capillary pressure of each step [Pa].
    sw : array_like
        Wetting-phase saturation [fraction].

    Returns
    -------
    Thomeer
        Fitted with the pressure in psi as the variable: ``params_["jd"]`` is the
        displacement pressure Pd [psi], ``1 - params_["swirr"]`` the non-wetting
        saturation at infinite pressure (``Bv_inf / phi``), ``params_["g"]`` G.
    """
    return Thomeer().fit(np.asarray(pc, dtype=float) / C.PSI, sw)
