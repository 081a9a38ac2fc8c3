"""Brooks-Corey capillary-pressure function written in Leverett J.

.. math::

    S_e = \\frac{S_w - S_{wr}}{1 - S_{wr}} = \\left(\\frac{J}{J_d}\\right)^{-\\lambda}
    \\quad (J \\ge J_d), \\qquad S_e = 1 \\quad (J < J_d)

Brooks and Corey wrote it in capillary pressure with the displacement (entry)
pressure ``Pd`` and pore-size distribution index ``lambda``. For one rock J is
proportional to Pc, so the same form holds in J with an entry J ``jd``.

References
----------
Brooks, R. H. and Corey, A. T., 1964. Hydraulic properties of porous media.
Hydrology Paper 3, Colorado State University, Fort Collins.
"""

from __future__ import annotations

import numpy as np

from .base import JSwFunction


class BrooksCorey(JSwFunction):
    """``Sw = swirr + (1 - swirr) * (J / jd)**(-lam)`` above the entry J ``jd``, 1 below.

    Parameters (``params_``)
    ------------------------
    swirr : float
        Residual (irreducible) water saturation [fraction].
    jd : float
        Entry (displacement) J [-], > 0.
    lam : float
        Pore-size distribution index lambda [-], > 0.
    """

    name = "brooks_corey"
    param_names = ("swirr", "jd", "lam")
    bounds = {"swirr": (0.0, 0.99), "jd": (1e-6, 100.0), "lam": (1e-3, 20.0)}
    description = "Sw = swirr + (1 - swirr) * (J/jd)^-lam for J >= jd, else 1"

    @staticmethod
    def equation(j, swirr, jd, lam):
        """Sw [fraction] from J [-]."""
        se = np.where(j >= jd, np.power(j / jd, -lam), 1.0)
        return swirr + (1.0 - swirr) * se

    def initial_guess(self, j, sw):
        return {"swirr": max(0.0, float(np.nanmin(sw)) * 0.8),
                "jd": float(np.nanmin(j)), "lam": 1.0}
