"""Choosing one J-Sw family among several fitted to the same points.

Akaike's criterion ranks least-squares fits of different families on the same
points (``AIC = n ln(RSS/n) + 2 p``, Akaike 1974). Fits within
:data:`EQUIVALENT_AIC` of the lowest have substantial support and are not told
apart by the data (Burnham and Anderson 2002, section 2.6: Delta_i <= 2). Among
those the family with fewer parameters is chosen, then the one listed first in
:data:`satheight.models.FAMILIES` (the simpler closed form: the power law before
Brooks-Corey, which with its entry J below the data is the same curve). Every
family's Delta AIC is reported so the choice is visible.

References
----------
Akaike, H., 1974. A new look at the statistical model identification. IEEE
Transactions on Automatic Control 19(6), 716-723.
Burnham, K. P. and Anderson, D. R., 2002. Model Selection and Multimodel
Inference, 2nd ed. Springer (section 2.6).
"""

from __future__ import annotations

__all__ = ["select_family", "EQUIVALENT_AIC"]

#: Fits within this AIC [-] of the lowest are taken as equally supported
#: (Burnham and Anderson 2002, section 2.6).
EQUIVALENT_AIC = 2.0


def select_family(reports: dict, order=()) -> tuple[str | None, dict[str, float]]:
    """The chosen family and every family's Delta AIC.

    Parameters
    ----------
    reports : dict[str, FitReport]
        Family name -> fit report (``aic`` and ``params``), all on the same points.
    order : sequence of str
        Family names in order of preference for ties (e.g. the registry order).

    Returns
    -------
    (str or None, dict[str, float])
        The chosen family (None without reports) and ``AIC - lowest AIC`` per family.
    """
    if not reports:
        return None, {}
    low = min(r.aic for r in reports.values())
    delta = {f: float(r.aic - low) for f, r in reports.items()}
    rank = {f: i for i, f in enumerate(order)}
    near = [f for f in reports if delta[f] <= EQUIVALENT_AIC]
    chosen = min(near, key=lambda f: (len(reports[f].params), rank.get(f, len(rank)), delta[f]))
    return chosen, delta
