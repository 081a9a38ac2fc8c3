"""Power law in J with an irreducible water saturation.

.. math::

    S_w = S_{wirr} + (1 - S_{wirr})\\, a\\, J^{-b}, \\qquad \\text{clipped to } [S_{wirr}, 1]

The normalised saturation ``(Sw - Swirr)/(1 - Swirr)`` follows a power of J, the
form Leverett (1941) used to collapse capillary-pressure curves, and the usual
shape of saturation-height functions fitted to J in practice (common practice).

References
----------
Leverett, M. C., 1941. Capillary behavior in porous solids. Trans. AIME 142, 152-169.
"""

from __future__ import annotations

import numpy as np

from .base import JSwFunction


class PowerLaw(JSwFunction):
    """``Sw = swirr + (1 - swirr) * a * J**(-b)``.

    Parameters (``params_``)
    ------------------------
    swirr : float
        Irreducible water saturation [fraction], 0 <= swirr < 1.
    a : float
        Coefficient [-], > 0: normalised saturation at J = 1.
    b : float
        Exponent [-], > 0.
    """

    name = "power_law"
    param_names = ("swirr", "a", "b")
    bounds = {"swirr": (0.0, 0.99), "a": (1e-6, 100.0), "b": (1e-3, 20.0)}
    description = "Sw = swirr + (1 - swirr) * a * J^-b"

    @staticmethod
    def equation(j, swirr, a, b):
        """Sw [fraction] from J [-] (unclipped)."""
        return swirr + (1.0 - swirr) * a * np.power(j, -b)

    def initial_guess(self, j, sw):
        swirr = max(0.0, float(np.nanmin(sw)) * 0.8)
        return {"swirr": swirr, "a": 0.5, "b": 1.0}
