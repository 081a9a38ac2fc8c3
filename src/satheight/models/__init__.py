"""J-Sw function families, one module each, all with the same fit/predict shape.

:data:`FAMILIES` is the registry: project files name a family by its key. To add a
family, write a module with a :class:`~satheight.models.base.JSwFunction`
subclass and add it here.
"""

from __future__ import annotations

from ..errors import ModelError
from .base import JSwFunction
from .brooks_corey import BrooksCorey
from .power_law import PowerLaw
from .selection import EQUIVALENT_AIC, select_family
from .skelt_harrison import SkeltHarrison
from .thomeer import Thomeer
from .van_genuchten import VanGenuchten

#: Registry of J-Sw function families by project-file name.
FAMILIES: dict[str, type[JSwFunction]] = {
    PowerLaw.name: PowerLaw,
    BrooksCorey.name: BrooksCorey,
    Thomeer.name: Thomeer,
    VanGenuchten.name: VanGenuchten,
    SkeltHarrison.name: SkeltHarrison,
}


def get_family(name: str, where: str = "") -> type[JSwFunction]:
    """Family class by registry name; error lists the known names."""
    try:
        return FAMILIES[name]
    except KeyError:
        raise ModelError(f"unknown J-Sw function family {name!r}", where=where or None,
                         hint=f"use one of {', '.join(sorted(FAMILIES))}") from None


def build_function(family: str, params: dict, j_range=None, where: str = "") -> JSwFunction:
    """Ready-to-predict function of ``family`` with the given parameters."""
    return get_family(family, where).from_params(params, j_range=j_range, where=where)


__all__ = ["FAMILIES", "JSwFunction", "PowerLaw", "BrooksCorey", "Thomeer", "VanGenuchten",
           "SkeltHarrison", "get_family", "build_function", "select_family", "EQUIVALENT_AIC"]
