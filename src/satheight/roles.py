"""Which curve of a well plays which role, and its values in SI.

A saturation-height run needs up to four log curves, named here by *role*:

* ``porosity``     effective or total porosity [fraction]
* ``permeability`` permeability [m^2] (files usually give mD)
* ``resistivity``  deep (true) formation resistivity [ohm.m]
* ``sw``           water saturation interpreted from logs [fraction]

A role's curve is either named by the user (``curves = { porosity = "PHIE" }`` in
the well's entry of the project file) or found by trying the mnemonics of
:data:`ROLE_ALIASES` in order, case-insensitively. The mnemonics are common
LAS usage (common practice), not a standard.
"""

from __future__ import annotations

from typing import Mapping

import numpy as np

from . import units
from .errors import MissingCurveError, ProjectFileError, UnitError
from .well import Well

__all__ = ["ROLE_ALIASES", "ROLES", "detect_roles", "require_role", "role_values", "find_curve"]

#: Curve mnemonics tried for each role, most preferred first, compared
#: case-insensitively with the curves of a well (the index curve is never picked).
#: Effective porosity is preferred over total porosity, a linear permeability over
#: a log-named one, the deepest reading resistivity over shallower ones.
ROLE_ALIASES: dict[str, tuple[str, ...]] = {
    "porosity": ("PHIE", "PHI_E", "PHIT", "PHI", "POR", "PORO", "POROSITY"),
    "permeability": ("PERM", "PERM_LOG", "KLOG", "K", "KH", "PERMH", "PERMEABILITY", "KINT"),
    "resistivity": ("RT", "RDEEP", "RD", "RDEP", "RES_DEEP", "ILD", "LLD"),
    "sw": ("SW", "SW_LOG", "SWLOG", "SWE", "SWT", "SWA"),
}

#: The roles, in the order they are reported.
ROLES: tuple[str, ...] = tuple(ROLE_ALIASES)

# Unit families by role: the units.KINDS table used to convert the curve to SI.
_ROLE_KIND = {"porosity": "fraction", "sw": "fraction",
              "permeability": "permeability", "resistivity": "resistivity"}

# Fraction-like curves whose largest value exceeds this are taken to be in percent.
_PERCENT_THRESHOLD = 1.5
# ... but only if at least this share of its finite values is above 1 (else: spikes).
_PERCENT_MIN_SHARE = 0.1


def _curves_present(well: Well) -> str:
    return ", ".join(well.curves) or "(none)"


def _check_role(role: str, where: str) -> None:
    if role not in ROLE_ALIASES:
        raise ProjectFileError(f"unknown curve role {role!r}", where=where,
                               hint="use one of " + ", ".join(ROLES))


def find_curve(well: Well, mnemonic: str) -> str | None:
    """Mnemonic key of the curve of ``well`` matching ``mnemonic`` case-insensitively.

    An exact match wins; otherwise the first curve in file order whose mnemonic
    equals ``mnemonic`` ignoring case. Returns ``None`` if there is none.
    """
    if mnemonic in well.curves:
        return mnemonic
    low = mnemonic.lower()
    for key in well.curves:
        if key.lower() == low:
            return key
    return None


def _auto_detect(well: Well, aliases: tuple[str, ...]) -> str | None:
    """First alias (in preference order) that names a non-index curve of ``well``."""
    by_lower: dict[str, str] = {}
    for key in well.curves:
        if key == well.index_mnemonic:
            continue
        by_lower.setdefault(key.lower(), key)   # first curve in file order wins
    for alias in aliases:
        hit = by_lower.get(alias.lower())
        if hit is not None:
            return hit
    return None


def detect_roles(well: Well, overrides: Mapping[str, str | None] | None = None,
                 aliases: Mapping[str, tuple[str, ...]] = ROLE_ALIASES) -> dict[str, str | None]:
    """Find the curve of each role in ``well``.

    Parameters
    ----------
    well : Well
    overrides : dict[str, str], optional
        Role -> mnemonic chosen by the user (from the project file). A ``None``
        value means "detect it". Matching is case-insensitive.
    aliases : dict[str, tuple[str, ...]]
        Mnemonics to try per role, in preference order (default :data:`ROLE_ALIASES`).

    Returns
    -------
    dict[str, str or None]
        Role -> mnemonic key in ``well.curves``, or ``None`` if no curve was found.

    Raises
    ------
    MissingCurveError
        If an override names a curve the well does not have (lists the curves present).
    ProjectFileError
        If an override names an unknown role.
    """
    where = str(well.source)
    overrides = dict(overrides or {})
    for role in overrides:
        _check_role(role, where)
    found: dict[str, str | None] = {}
    for role in aliases:
        chosen = overrides.get(role)
        if chosen is not None:
            key = find_curve(well, str(chosen))
            if key is None:
                raise MissingCurveError(
                    f"curve {chosen!r} given for {role} is not in the file "
                    f"(curves present: {_curves_present(well)})",
                    where=where,
                    hint=f"correct curves = {{ {role} = \"MNEMONIC\" }} in this well's entry "
                         "of the project file",
                )
            found[role] = key
        else:
            found[role] = _auto_detect(well, tuple(aliases[role]))
    return found


def require_role(well: Well, role: str, mnemonic: str | None,
                 aliases: Mapping[str, tuple[str, ...]] = ROLE_ALIASES) -> str:
    """The curve of ``role``, or a clear error if there is none.

    Parameters
    ----------
    well : Well
    role : str
        One of :data:`ROLES`.
    mnemonic : str or None
        The curve found by :func:`detect_roles` (or chosen by the user).
    aliases : dict[str, tuple[str, ...]]
        The aliases that were tried, quoted in the error message.

    Returns
    -------
    str
        Mnemonic key of the curve in ``well.curves``.

    Raises
    ------
    MissingCurveError
        Naming the file, the role, the aliases tried and the curves present, with a
        hint to name the curve in the project file.
    """
    where = str(well.source)
    _check_role(role, where)
    if mnemonic is not None:
        key = find_curve(well, mnemonic)
        if key is not None:
            return key
        what = (f"curve {mnemonic!r} for {role} is not in the file "
                f"(curves present: {_curves_present(well)})")
    else:
        tried = ", ".join(aliases.get(role, ())) or "(none)"
        what = (f"no {role} curve found: tried {tried}; "
                f"curves present: {_curves_present(well)}")
    raise MissingCurveError(
        what, where=where,
        hint=f"add curves = {{ {role} = \"MNEMONIC\" }} to this well's entry in the project file, "
             "with MNEMONIC one of the curves present",
    )


def role_values(well: Well, role: str, mnemonic: str) -> tuple[np.ndarray, list[str]]:
    """Values of a role's curve converted to SI, and the fix-ups applied.

    Porosity and ``sw`` become fractions: units ``%``, ``PU``, ``percent`` are
    divided by 100; an empty or fraction-like unit whose largest finite value is
    above 1.5 is also taken as percent (with a warning). Permeability becomes
    [m^2]: unit ``mD`` (assumed when empty), ``D``/``darcy`` or ``m2``.
    Resistivity becomes [ohm.m]: ``ohmm``, ``ohm.m``, ``ohm-m`` or empty.

    Parameters
    ----------
    well : Well
    role : str
        One of :data:`ROLES`.
    mnemonic : str
        Curve of ``well`` (case-insensitive).

    Returns
    -------
    values : numpy.ndarray
        A new float64 array in SI; NaN where the curve is null. The well is not modified.
    warnings : list[str]
        Fix-ups applied (percent detected from the value range).

    Raises
    ------
    MissingCurveError
        If the curve is not in the well.
    UnitError
        If the curve's unit is not known for the role (names file, curve and unit).
    """
    where = str(well.source)
    _check_role(role, where)
    key = require_role(well, role, mnemonic)
    curve = well.curves[key]
    kind = _ROLE_KIND[role]
    unit = curve.unit
    lookup = unit
    if kind == "permeability" and units.normalise_unit(unit) == "":
        lookup = "mD"                       # usual unit of log permeability (common practice)
    elif kind == "resistivity" and units.normalise_unit(unit) == "":
        lookup = "ohm.m"
    try:
        f = units.factor(lookup, kind)
    except UnitError as exc:
        raise UnitError(f"unit {unit!r} of {role} curve {key!r} is not known",
                        where=where, hint=exc.hint) from exc
    data = np.asarray(curve.data, dtype=np.float64)
    out = data * f                         # always a new array
    warnings: list[str] = []
    if kind == "fraction" and f == 1.0:
        finite = data[np.isfinite(data)]
        share_above_one = float(np.mean(finite > 1.0)) if finite.size else 0.0
        if (finite.size and float(finite.max()) > 1.0
                and not (float(finite.max()) > _PERCENT_THRESHOLD
                         and share_above_one >= _PERCENT_MIN_SHARE)):
            # a fraction curve with a few spikes: keep it; the spikes are flagged downstream
            warnings.append(
                f"{where}: {role} curve {key!r} has unit {unit or '(none)'!r} and "
                f"{int(np.sum(finite > 1.0))} of {finite.size} values above 1 (up to "
                f"{float(finite.max()):g}); read as fractions, the values above 1 are unusable "
                "(give the curve unit % if it is in percent)"
            )
        elif finite.size and float(finite.max()) > _PERCENT_THRESHOLD:
            out = out / 100.0
            warnings.append(
                f"{where}: {role} curve {key!r} has unit {unit or '(none)'!r} but values up to "
                f"{float(finite.max()):g}; read as percent and divided by 100 "
                "(give the curve unit % in the LAS file to silence this)"
            )
    elif kind == "fraction" and f == 0.01:
        finite = data[np.isfinite(data)]
        if finite.size and 0.0 < float(finite.max()) <= 1.0:
            warnings.append(
                f"{where}: {role} curve {key!r} has unit {unit!r} (percent) but no value above "
                f"1 (largest {float(finite.max()):g}); read as percent as the unit says "
                "(if the values are fractions, give the curve unit V/V)"
            )
    return out, warnings
