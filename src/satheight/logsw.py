"""Resistivity-derived water saturation: Archie (clean sand), Simandoux and Indonesia (shaly sand).

References
----------
Archie, G. E., 1942. The electrical resistivity log as an aid in determining some
reservoir characteristics. Trans. AIME 146, 54-62 (``archie1942``).
Simandoux (1963) and Poupon and Leveaux (1971): keys ``simandoux1963`` and
``poupon1971`` of docs/references.md.
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


def _shaly_inputs(rt, phi, vsh):
    """Rt, phi and Vsh as float arrays and where all three are usable."""
    rt = np.asarray(rt, dtype=float)
    phi = np.asarray(phi, dtype=float)
    vsh = np.asarray(vsh, dtype=float)
    with np.errstate(invalid="ignore"):
        ok = (rt > 0) & (phi > 0) & (vsh >= 0) & (vsh <= 1)
    return rt, phi, vsh, ok


def simandoux_sw(rt, phi, vsh, rw, rsh, a=1.0, m=2.0, n=2.0, clip=True):
    """Shaly-sand water saturation, Simandoux form [fraction].

    Solves ``1/Rt = phi**m * Sw**n / (a * Rw) + Vsh * Sw / Rsh`` for Sw: Archie's
    clean-sand conductivity plus a shale conductivity ``Vsh / Rsh`` in parallel, taken
    proportional to Sw (the form in common use; Simandoux's shale term).

    For ``n = 2`` the equation is a quadratic ``A Sw^2 + B Sw - C = 0`` with
    ``A = phi**m / (a Rw)``, ``B = Vsh / Rsh``, ``C = 1 / Rt``; its one positive root is
    ``Sw = (sqrt(B**2 + 4 A C) - B) / (2 A)``. With ``a = 0.81``, ``m = 2`` this is the
    often printed ``Sw = (0.4 Rw / phi^2) [sqrt((Vsh/Rsh)^2 + 5 phi^2 / (Rw Rt)) - Vsh/Rsh]``
    (0.81/2 = 0.405, 4/0.81 = 4.94). With ``Vsh = 0`` it is Archie exactly:
    ``Sw = sqrt(C / A) = sqrt(a Rw / (phi**m Rt))``. For other ``n`` the left side is
    increasing in Sw and the root lies between 0 and the Archie Sw: it is found by
    bisection on all samples at once (60 halvings: below 1e-17 of the Archie Sw).

    Parameters
    ----------
    rt : array_like
        True (deep) formation resistivity [ohm.m].
    phi : array_like
        Porosity [fraction] (effective porosity in practice).
    vsh : array_like
        Shale volume [fraction], 0 to 1.
    rw : float
        Formation-water resistivity at formation temperature [ohm.m].
    rsh : float
        Resistivity of the shale [ohm.m].
    a, m, n : float
        Archie tortuosity factor, cementation and saturation exponents [-].
    clip : bool
        Clip the result to [0, 1] (default). Rt or phi <= 0, Vsh outside [0, 1] or NaN
        give NaN.

    References
    ----------
    simandoux1963 (the shale term), archie1942 (the clean-sand term); see docs/references.md.
    """
    rt, phi, vsh, ok = _shaly_inputs(rt, phi, vsh)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        A = np.power(phi, m) / (a * rw)
        B = vsh / rsh
        C = 1.0 / rt
        if n == 2.0:
            sw = (np.sqrt(B * B + 4.0 * A * C) - B) / (2.0 * A)
        else:
            lo = np.zeros(np.broadcast(A, B, C).shape)
            hi = np.power(C / A, 1.0 / n) + lo          # Archie Sw: the shale term only lowers Sw
            for _ in range(60):                          # halvings, all samples at once
                mid = 0.5 * (lo + hi)
                over = A * np.power(mid, n) + B * mid > C
                hi = np.where(over, mid, hi)
                lo = np.where(over, lo, mid)
            sw = 0.5 * (lo + hi)
    sw = np.where(ok, sw, np.nan)
    return np.clip(sw, 0.0, 1.0) if clip else sw


def indonesia_sw(rt, phi, vsh, rw, rsh, a=1.0, m=2.0, n=2.0, clip=True):
    """Shaly-sand water saturation, Indonesia equation [fraction].

    ``1/sqrt(Rt) = [Vsh**(1 - Vsh/2) / sqrt(Rsh) + sqrt(phi**m / (a Rw))] * Sw**(n/2)``,
    so ``Sw = ((1/sqrt(Rt)) / (Vsh**(1 - Vsh/2)/sqrt(Rsh) + sqrt(phi**m/(a Rw))))**(2/n)``.
    With ``Vsh = 0`` the shale term vanishes (``0**1 = 0``) and this is Archie exactly:
    ``Sw = (a Rw / (phi**m Rt))**(1/n)``.

    Parameters
    ----------
    rt : array_like
        True (deep) formation resistivity [ohm.m].
    phi : array_like
        Porosity [fraction] (effective porosity in practice).
    vsh : array_like
        Shale volume [fraction], 0 to 1.
    rw : float
        Formation-water resistivity at formation temperature [ohm.m].
    rsh : float
        Resistivity of the shale [ohm.m].
    a, m, n : float
        Archie tortuosity factor, cementation and saturation exponents [-].
    clip : bool
        Clip the result to [0, 1] (default). Rt or phi <= 0, Vsh outside [0, 1] or NaN
        give NaN.

    References
    ----------
    poupon1971 (the equation), archie1942 (its clean-sand limit); see docs/references.md.
    """
    rt, phi, vsh, ok = _shaly_inputs(rt, phi, vsh)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        conductance = (np.power(vsh, 1.0 - 0.5 * vsh) / np.sqrt(rsh)
                       + np.sqrt(np.power(phi, m) / (a * rw)))
        sw = np.power(1.0 / (np.sqrt(rt) * conductance), 2.0 / n)
    sw = np.where(ok, sw, np.nan)
    return np.clip(sw, 0.0, 1.0) if clip else sw


#: Log-Sw equations of the project file's ``[log_sw] method`` that need a shale volume.
SHALY_SAND = {"simandoux": simandoux_sw, "indonesia": indonesia_sw}
