"""Which curve of a well plays which role, and its values in SI.

A saturation-height run needs up to five log curves, named here by *role*:

* ``porosity``     effective or total porosity [fraction]
* ``permeability`` permeability [m^2] (files usually give mD)
* ``resistivity``  deep (true) formation resistivity [ohm.m]
* ``sw``           water saturation interpreted from logs [fraction]
* ``shale``        shale volume Vsh [fraction] (shaly-sand log Sw, shale cutoff)

A role's curve is either named by the user (``curves = { porosity = "PHIE" }`` in
the well's entry of the project file) or found by trying the mnemonics of
:data:`ROLE_ALIASES` in order, case-insensitively. The mnemonics are common
LAS usage (common practice), not a standard. When no alias names a permeability
curve, a curve named ``K...`` or ``PERM...`` (a direction or method suffix: ``KH``,
``KLOGH``, ``PERM_H``) is taken if its unit is a permeability unit (mD, D, darcy)
and it is the only such curve; two such curves are refused, never guessed between.
:func:`explain_roles` gives, per role, the curve taken and why (shown by ``inspect``).
"""

from __future__ import annotations

import re
from typing import Mapping

import numpy as np

from . import units
from .errors import MissingCurveError, ProjectFileError, UnitError
from .well import Well

__all__ = ["ROLE_ALIASES", "ROLES", "detect_roles", "explain_roles", "require_role",
           "role_values", "find_curve", "PERMEABILITY_PATTERN"]

#: Curve mnemonics tried for each role, most preferred first, compared
#: case-insensitively with the curves of a well (the index curve is never picked).
#: Effective porosity is preferred over total porosity, a linear permeability over
#: a log-named one, the deepest reading resistivity over shallower ones.
ROLE_ALIASES: dict[str, tuple[str, ...]] = {
    "porosity": ("PHIE", "PHI_E", "PHIT", "PHI", "POR", "PORO", "POROSITY"),
    "permeability": ("PERM", "PERM_LOG", "KLOG", "K", "KH", "PERMH", "PERMEABILITY", "KINT"),
    "resistivity": ("RT", "RDEEP", "RD", "RDEP", "RES_DEEP", "ILD", "LLD"),
    "sw": ("SW", "SW_LOG", "SWLOG", "SWE", "SWT", "SWA"),
    "shale": ("VSH", "VSHALE", "VCL", "VCLAY", "VSH_GR"),
}

#: Mnemonics of permeability curves with a direction or method suffix (KH, KLOGH, PERM_H),
#: taken only with a permeability unit as evidence (K alone with unit % is potassium).
PERMEABILITY_PATTERN = re.compile(r"^(K|PERM)[A-Z0-9_]*$", re.I)

#: The roles, in the order they are reported.
ROLES: tuple[str, ...] = tuple(ROLE_ALIASES)

# Unit families by role: the units.KINDS table used to convert the curve to SI.
_ROLE_KIND = {"porosity": "fraction", "sw": "fraction", "shale": "fraction",
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


def _by_lower(well: Well) -> dict[str, str]:
    """Lower-case mnemonic -> key of the non-index curves (first in file order wins)."""
    by_lower: dict[str, str] = {}
    for key in well.curves:
        if key != well.index_mnemonic:
            by_lower.setdefault(key.lower(), key)
    return by_lower


def _is_permeability_unit(unit: str) -> bool:
    if not units.normalise_unit(unit):
        return False
    try:
        units.factor(unit, "permeability")
    except UnitError:
        return False
    return True


def _pattern_candidates(well: Well, aliases: tuple[str, ...]) -> list[str]:
    """Non-index curves named K*/PERM* with a permeability unit, not in ``aliases``."""
    tried = {a.lower() for a in aliases}
    return [key for key in _by_lower(well).values()
            if key.lower() not in tried and PERMEABILITY_PATTERN.match(key.split(":")[0])
            and _is_permeability_unit(well.curves[key].unit)]


def _auto_detect(well: Well, role: str, aliases: tuple[str, ...]) -> tuple[str | None, str, list[str]]:
    """(curve, reason, ambiguous candidates) for one role without a user choice."""
    by_lower = _by_lower(well)
    hits = [by_lower[a.lower()] for a in aliases if a.lower() in by_lower]
    skipped = ""
    if role == "permeability":
        # K in % is potassium (spectral gamma ray): an alias needs no unit or a permeability unit
        wrong = [k for k in hits if units.normalise_unit(well.curves[k].unit)
                 and not _is_permeability_unit(well.curves[k].unit)]
        hits = [k for k in hits if k not in wrong]
        skipped = "".join(f"; {k} skipped: unit {well.curves[k].unit!r} is not a permeability "
                          "unit" for k in wrong)
    if hits:
        reason = f"{hits[0]} is the first of the {role} aliases ({', '.join(aliases)}) in the file"
        if len(hits) > 1:
            reason += f"; also present, later in that list: {', '.join(hits[1:])}"
        return hits[0], reason + skipped, []
    if role != "permeability":
        return None, f"no curve named {', '.join(aliases)}", []
    cands = _pattern_candidates(well, aliases)
    if len(cands) == 1:
        key = cands[0]
        return key, (f"{key} matches K*/PERM* and its unit {well.curves[key].unit!r} is a "
                     "permeability unit (the only such curve)"), []
    if cands:
        return None, (f"{len(cands)} curves match K*/PERM* with a permeability unit: "
                      f"{', '.join(cands)}; not guessed"), cands
    return None, (f"no curve named {', '.join(aliases)}, and none named K*/PERM* with a "
                  f"permeability unit (mD, D, darcy){skipped}"), []


def explain_roles(well: Well, overrides: Mapping[str, str | None] | None = None,
                  aliases: Mapping[str, tuple[str, ...]] = ROLE_ALIASES
                  ) -> dict[str, tuple[str | None, str, list[str]]]:
    """Per role: the curve taken (or None), the reason in words, and the candidates
    when the choice was refused as ambiguous (else an empty list).

    Never raises for an ambiguous choice (``inspect`` shows it); :func:`detect_roles`
    does. Raises as :func:`detect_roles` for an override naming no curve.
    """
    where = str(well.source)
    overrides = dict(overrides or {})
    for role in overrides:
        _check_role(role, where)
    out: dict[str, tuple[str | None, str, list[str]]] = {}
    for role in aliases:
        chosen = overrides.get(role)
        if chosen is None:
            out[role] = _auto_detect(well, role, tuple(aliases[role]))
            continue
        key = find_curve(well, str(chosen))
        if key is None:
            raise MissingCurveError(
                f"curve {chosen!r} given for {role} is not in the file "
                f"(curves present: {_curves_present(well)})",
                where=where,
                hint=f"correct curves = {{ {role} = \"MNEMONIC\" }} in this well's entry "
                     "of the project file",
            )
        out[role] = (key, f"{key} is named for {role} in the project file", [])
    return out


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
        Mnemonics to try per role, in preference order (default :data:`ROLE_ALIASES`);
        then, for permeability only, :data:`PERMEABILITY_PATTERN` with a permeability unit.

    Returns
    -------
    dict[str, str or None]
        Role -> mnemonic key in ``well.curves``, or ``None`` if no curve was found.

    Raises
    ------
    MissingCurveError
        If an override names a curve the well does not have (lists the curves
        present), or two curves match the permeability pattern and none is named
        (lists them and how to choose).
    ProjectFileError
        If an override names an unknown role.
    """
    found: dict[str, str | None] = {}
    for role, (key, reason, cands) in explain_roles(well, overrides, aliases).items():
        if cands:
            raise MissingCurveError(
                f"which curve is {role} is ambiguous: {reason}", where=str(well.source),
                hint=f"name it in this well's entry of the project file, e.g. "
                     f"curves = {{ {role} = \"{cands[0]}\" }}")
        found[role] = key
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
        if role == "permeability":
            tried += " and K*/PERM* with a permeability unit"
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
    warnings: list[str] = []
    if kind in _EMPTY_UNIT_MEANS and units.normalise_unit(unit) == "":
        lookup = _EMPTY_UNIT_MEANS[kind]    # usual unit of such logs (common practice)
        warnings.append(f"{where}: {role} curve {key!r} has no unit; read as {lookup} "
                        f"(give the unit in the ~Curve line to silence this)")
    try:
        f = units.factor(lookup, kind)
    except UnitError as exc:
        raise UnitError(f"unit {unit!r} of {role} curve {key!r} is not known",
                        where=where, hint=exc.hint) from exc
    data = np.asarray(curve.data, dtype=np.float64)
    out = data * f                         # always a new array
    if kind == "fraction":
        out, more = _fraction_fixups(data, out, f, f"{where}: {role} curve {key!r}", unit)
        warnings += more
    return out, warnings


# Unit read for a curve without one, by kind (common practice for log curves).
_EMPTY_UNIT_MEANS = {"permeability": "mD", "resistivity": "ohm.m"}


def _fraction_fixups(data: np.ndarray, out: np.ndarray, f: float, label: str,
                     unit: str) -> tuple[np.ndarray, list[str]]:
    """Percent read from the value range, or a unit of percent whose values look like
    fractions: the values (new array when divided) and the notes."""
    warnings: list[str] = []
    finite = data[np.isfinite(data)]
    if not finite.size:
        return out, warnings
    top = float(finite.max())
    if f == 1.0 and top > 1.0:
        share_above_one = float(np.mean(finite > 1.0))
        if not (top > _PERCENT_THRESHOLD and share_above_one >= _PERCENT_MIN_SHARE):
            # a fraction curve with a few spikes: keep it; the spikes are flagged downstream
            warnings.append(
                f"{label} has unit {unit or '(none)'!r} and {int(np.sum(finite > 1.0))} of "
                f"{finite.size} values above 1 (up to {top:g}); read as fractions, the values "
                "above 1 are unusable (give the curve unit % if it is in percent)")
        elif top > _PERCENT_THRESHOLD:
            out = out / 100.0
            warnings.append(
                f"{label} has unit {unit or '(none)'!r} but values up to {top:g}; read as "
                "percent and divided by 100 (give the curve unit % in the LAS file to silence "
                "this)")
    elif f == 0.01 and 0.0 < top <= 1.0:
        warnings.append(
            f"{label} has unit {unit!r} (percent) but no value above 1 (largest {top:g}); read "
            "as percent as the unit says (if the values are fractions, give the curve unit V/V)")
    return out, warnings
