"""Elevation of a well's log depth reference above the TVDSS datum, from its LAS header.

``TVDSS = TVD - elevation`` [m], positive down: the elevation is that of the point
the log depths are measured from (kelly bushing, drill floor) above the datum
(mean sea level). LAS 2.0 headers carry it in items of the ``~Well`` or the
``~Parameter`` section (common practice, not a standard): ``EKB``/``KB`` (kelly
bushing), ``EDF`` (drill floor), ``EREF``/``ELEV`` (depth reference), ``EGL``
(ground level); ``LMF`` ("log measured from": ``KB``, ``DF``, ``GL``) says which
of them the log depths use.

:func:`datum_from_header` searches both sections and never guesses silently:

* items meaning the same point (``EKB`` and ``KB``, the same item in both
  sections) must agree within :data:`AGREE_TOLERANCE`, else it refuses;
* the point is the one ``LMF`` names when its elevation is given, else the first
  present of kelly bushing, drill floor, depth reference, ground level;
* a depth-reference item (``EREF``, ``ELEV``) is the log depth reference by its
  name: when present it must agree with the chosen point, else it refuses;
* ground level as the datum is a note: log depths are usually measured from the
  kelly bushing or drill floor, metres above the ground;
* an elevation outside :data:`PLAUSIBLE_ELEVATION` is refused.

Pure function: no I/O. The project file's ``datum_elevation`` overrides all of it
(the caller checks that first).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from . import units
from .errors import InputFileError, SatHeightError
from .well import HeaderItem, Well

__all__ = ["datum_from_header", "DATUM_GROUPS", "AGREE_TOLERANCE", "PLAUSIBLE_ELEVATION"]

#: Header mnemonics by the point whose elevation they give, in order of preference.
DATUM_GROUPS: tuple[tuple[str, tuple[str, ...]], ...] = (
    ("kelly bushing", ("EKB", "KB")),
    ("drill floor", ("EDF",)),
    ("depth reference", ("EREF", "ELEV")),
    ("ground level", ("EGL",)),
)

#: Values of ``LMF`` (log measured from) and the point they name (LAS 2.0 practice).
_LMF_POINT = {"KB": "kelly bushing", "KELLY BUSHING": "kelly bushing", "RKB": "kelly bushing",
              "DF": "drill floor", "DRILL FLOOR": "drill floor",
              "GL": "ground level", "GROUND LEVEL": "ground level"}

#: Two items giving the same point's elevation agree when they differ by at most this [m]:
#: headers carry elevations to 0.01 ft or 0.01 m (common practice).
AGREE_TOLERANCE = 0.01

#: Elevations accepted [m]: from below the lowest land surface (Dead Sea shore, about
#: -430 m) with room for offshore rigs, to above the highest drilled ground (recalled
#: from memory: about 4,500 m); anything else is a unit or typing error.
PLAUSIBLE_ELEVATION = (-1000.0, 6000.0)

_HINT = 'give datum_elevation = "<elevation> m" for this well in the project file'


@dataclass(frozen=True)
class _Found:
    mnemonic: str
    section: str
    value_m: float
    text: str           # value and unit as written
    unit: str = "m"     # the unit as written (the file's depth unit if none)

    def label(self) -> str:
        return f"{self.mnemonic} = {self.text} (~{self.section})"


def _items(well: Well) -> list[tuple[str, HeaderItem]]:
    return ([("Well", it) for it in well.well_header.values()]
            + [("Parameter", it) for it in well.parameters.values()])


def _collect(well: Well, notes: list[str]) -> dict[str, list[_Found]]:
    """Numeric datum items per point, in ``~Well`` then ``~Parameter`` order."""
    where = str(well.source)
    wanted = {mn: point for point, mns in DATUM_GROUPS for mn in mns}
    found: dict[str, list[_Found]] = {}
    for section, it in _items(well):
        mn = it.mnemonic.split(":")[0].upper()
        if mn not in wanted:
            continue
        try:
            value = float(it.value)
        except (TypeError, ValueError):
            notes.append(f"{where}: datum item {mn} (~{section}) is {str(it.value)!r}, not a "
                         "number; not used")
            continue
        if not math.isfinite(value):
            notes.append(f"{where}: datum item {mn} (~{section}) is not a finite number; not used")
            continue
        unit = it.unit or well.depth_unit
        try:
            value_m = float(units.to_si(value, unit, "length"))
        except SatHeightError as exc:
            raise InputFileError(f"datum item {mn} (~{section}) has unit {it.unit!r}: {exc.what}",
                                 where=where, hint=_HINT) from None
        text = f"{value:g} {unit}".strip()
        found.setdefault(wanted[mn], []).append(_Found(mn, section, value_m, text, unit))
    return found


def _check_agree(well: Well, a: _Found, b: _Found, why: str) -> None:
    if abs(a.value_m - b.value_m) > AGREE_TOLERANCE:
        raise InputFileError(f"datum items disagree: {a.label()} and {b.label()} ({why}); "
                             "which one the log depths use is unknown",
                             where=str(well.source),
                             hint=_HINT + ", or correct the LAS header")


def _lmf_point(well: Well) -> tuple[str | None, str]:
    """The point ``LMF`` names (or None) and the item's text for the notes."""
    for section, it in _items(well):
        if it.mnemonic.split(":")[0].upper() == "LMF":
            text = str(it.value).strip()
            return _LMF_POINT.get(text.upper()), f"LMF = {text} (~{section})"
    return None, ""


def datum_from_header(well: Well) -> tuple[float, str, list[str]]:
    """Elevation of the log depth reference above the TVDSS datum [m] from the LAS header.

    Parameters
    ----------
    well : Well
        As read; ``~Well`` and ``~Parameter`` items are searched. An item without a
        unit is in the well's depth unit.

    Returns
    -------
    value : float
        Elevation [m], positive above the datum.
    source : str
        Which item was used and why, e.g. ``"EKB = 28.5 M (~Well), kelly bushing"``.
    notes : list[str]
        Everything a reviewer should see: a ground-level datum, items not used,
        items that are not numbers.

    Raises
    ------
    InputFileError
        No usable item; two items for the same point that disagree; a depth-reference
        item (EREF, ELEV) that disagrees with the chosen point; an unknown unit; an
        elevation outside :data:`PLAUSIBLE_ELEVATION`.
    """
    where = str(well.source)
    notes: list[str] = []
    found = _collect(well, notes)
    for point, items in found.items():
        for other in items[1:]:
            _check_agree(well, items[0], other, f"both give the {point} elevation")
    if not found:
        names = ", ".join(mn for _, mns in DATUM_GROUPS for mn in mns)
        raise InputFileError(f"no datum elevation: neither ~Well nor ~Parameter has a number "
                             f"in any of {names}", where=where, hint=_HINT)
    lmf, lmf_text = _lmf_point(well)
    if lmf is not None and lmf in found:
        point, why = lmf, f"named by {lmf_text}"
    else:
        point = next(p for p, _ in DATUM_GROUPS if p in found)
        why = "first present of kelly bushing, drill floor, depth reference, ground level"
        if lmf_text:
            notes.append(f"{where}: {lmf_text} names no point whose elevation the header gives; "
                         f"the {point} elevation is used")
    chosen = found[point][0]
    reference = found.get("depth reference")
    if reference and point != "depth reference":
        _check_agree(well, chosen, reference[0], f"{reference[0].mnemonic} is the depth "
                                                 f"reference by its name")
    lo, hi = PLAUSIBLE_ELEVATION
    if not lo <= chosen.value_m <= hi:
        u = chosen.unit        # the range in the item's own unit, beside the value as read
        lo_u, hi_u = (float(units.from_si(v, u, "length")) for v in (lo, hi))
        raise InputFileError(f"datum elevation {chosen.label()} is outside the plausible "
                             f"{lo_u:g} to {hi_u:g} {u}", where=where,
                             hint=_HINT + " (check the item's unit)")
    if point == "ground level":
        notes.append(f"{where}: the TVDSS datum elevation is the ground level {chosen.label()}: "
                     "log depths are usually measured from the kelly bushing or drill floor, "
                     f"metres above the ground; {_HINT} if they are")
    others = [f.label() for p, items in found.items() if p != point for f in items
              if not (p == "depth reference" and abs(f.value_m - chosen.value_m)
                      <= AGREE_TOLERANCE)]
    if others:
        notes.append(f"{where}: datum elevation from {chosen.label()}; also in the header, not "
                     f"used: {', '.join(others)}")
    return chosen.value_m, f"{chosen.label()}, {point} ({why})", notes
