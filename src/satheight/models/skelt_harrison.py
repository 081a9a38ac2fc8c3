"""Skelt-Harrison height function: Sw fitted directly to height above the FWL.

.. math::

    S_w = 1 - a \\exp\\left[-\\left(\\frac{b}{h + c}\\right)^d\\right]

with ``h`` the height above the free-water level [m], ``a`` the maximum
hydrocarbon saturation (``1 - a`` is the water saturation high above the FWL),
``b`` a height scale [m], ``c`` a height shift [m] (an offset of the FWL that the
data prefer) and ``d`` a shape exponent. Where ``h + c <= 0`` the rock is taken as
fully water-bearing (Sw = 1).

Variant of the shared shape: a height function takes height, not J
(``variable = "height"``): ``fit(h, sw)`` and ``predict(h)`` work in metres, the
calibrated range ``j_range_`` is a height range [m], and the engine passes the
height above the FWL instead of J to it. It does not scale with porosity and
permeability, so it is fitted per rock type and used within one zone's fluids.

References
----------
Skelt, C. and Harrison, B., 1995. An integrated approach to saturation height
analysis. SPWLA 36th Annual Logging Symposium (citation from memory).
"""

from __future__ import annotations

import numpy as np

from .base import JSwFunction


class SkeltHarrison(JSwFunction):
    """``Sw = 1 - a * exp(-(b / (h + c))**d)``, h the height above the FWL [m].

    Parameters (``params_``)
    ------------------------
    a : float
        Hydrocarbon saturation far above the FWL [fraction], 0 < a <= 1.
    b : float
        Height scale [m], > 0.
    c : float
        Height shift [m].
    d : float
        Shape exponent [-], > 0.
    """

    name = "skelt_harrison"
    variable = "height"
    param_names = ("a", "b", "c", "d")
    bounds = {"a": (1e-6, 1.0), "b": (1e-6, 1e4), "c": (-100.0, 1e3), "d": (1e-3, 20.0)}
    description = "Sw = 1 - a * exp(-(b / (h + c))^d), h height above FWL [m]"

    @staticmethod
    def equation(h, a, b, c, d):
        """Sw [fraction] from height above the FWL ``h`` [m]."""
        x = h + c
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            term = np.where(x > 0, np.exp(-np.power(b / np.where(x > 0, x, 1.0), d)), 0.0)
        return 1.0 - a * term

    def initial_guess(self, h, sw):
        a = min(1.0, max(1e-3, 1.0 - float(np.nanmin(sw)) * 0.9))
        half = 1.0 - 0.5 * a
        b = float(h[np.argmin(np.abs(sw - half))])
        return {"a": a, "b": max(b, 1e-3), "c": 0.0, "d": 1.5}
