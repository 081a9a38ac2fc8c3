"""van Genuchten retention function (for air-water systems), in J or in height.

van Genuchten (1980) wrote the volumetric water content of a soil at suction head h:

.. math::

    \\theta(h) = \\theta_r + \\frac{\\theta_s - \\theta_r}{\\left[1 + (\\alpha h)^n\\right]^m},
    \\qquad m = 1 - 1/n

:func:`van_genuchten_theta` is that equation. As a J-Sw family
(:class:`VanGenuchten`) the normalised saturation follows the same form in J:

.. math::

    S_w = S_{wirr} + (1 - S_{wirr}) \\left[1 + (\\alpha J)^n\\right]^{-(1 - 1/n)}

It suits air-water systems above a water table (vadose zone), where saturation
falls smoothly without a sharp entry pressure.

References
----------
van Genuchten, M. Th., 1980. A closed-form equation for predicting the hydraulic
conductivity of unsaturated soils. Soil Science Society of America Journal 44(5),
892-898.
"""

from __future__ import annotations

import numpy as np

from .base import JSwFunction


def van_genuchten_theta(h, theta_r, theta_s, alpha, n):
    """Volumetric water content at suction head ``h`` (van Genuchten 1980, m = 1 - 1/n).

    Parameters
    ----------
    h : array_like
        Suction (pressure) head [m], >= 0 (height above the water table).
    theta_r, theta_s : float
        Residual and saturated volumetric water content [fraction of bulk volume].
    alpha : float
        Inverse of a characteristic head [1/m], > 0.
    n : float
        Shape parameter [-], > 1.

    Returns
    -------
    numpy.ndarray
        Water content [fraction of bulk volume]; ``theta_s`` at and below h = 0.
    """
    h = np.asarray(h, dtype=float)
    m = 1.0 - 1.0 / n
    with np.errstate(invalid="ignore", over="ignore"):
        se = np.power(1.0 + np.power(alpha * np.maximum(h, 0.0), n), -m)
    return theta_r + (theta_s - theta_r) * se


class VanGenuchten(JSwFunction):
    """``Sw = swirr + (1 - swirr) * (1 + (alpha J)^n)^-(1 - 1/n)``.

    Parameters (``params_``)
    ------------------------
    swirr : float
        Residual water saturation [fraction].
    alpha : float
        Inverse characteristic J [-], > 0.
    n : float
        Shape parameter [-], > 1.
    """

    name = "van_genuchten"
    param_names = ("swirr", "alpha", "n")
    bounds = {"swirr": (0.0, 0.99), "alpha": (1e-6, 1e4), "n": (1.0001, 20.0)}
    description = "Sw = swirr + (1 - swirr) * (1 + (alpha J)^n)^-(1 - 1/n)"

    @staticmethod
    def equation(j, swirr, alpha, n):
        """Sw [fraction] from J [-]."""
        se = np.power(1.0 + np.power(alpha * j, n), -(1.0 - 1.0 / n))
        return swirr + (1.0 - swirr) * se

    def initial_guess(self, j, sw):
        swirr = max(0.0, float(np.nanmin(sw)) * 0.8)
        half = swirr + 0.5 * (1.0 - swirr)
        near = j[np.argmin(np.abs(sw - half))]
        return {"swirr": swirr, "alpha": 1.0 / float(near), "n": 2.0}
