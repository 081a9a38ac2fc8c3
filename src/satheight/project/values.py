"""Reading single values of a project file: types, units, keys named in every error.

:class:`ValueReader` carries the file path and the unit system through the
validation of one file; the section readers (:mod:`.reader`, :mod:`.functions`,
:mod:`.wells`, :mod:`.fluid_keys`) call its methods.
"""

from __future__ import annotations

import datetime as _dt
import difflib
import math
from pathlib import Path
from typing import Any, Iterable

import numpy as np

from ..errors import ProjectFileError, UnitError
from ..plausible import RANGES, fwl_outside_logs, outside_message
from ..units import UNIT_SYSTEMS, from_si, in_unit, parse_quantity, split_quantity

#: Key of every table that holds physical values: names of its values allowed outside
#: their plausible range (:data:`satheight.plausible.RANGES`).
ALLOW_KEY = "allow_unusual"

_EXAMPLES = {
    "length": '"2060 m" or "6758 ft"',
    "density": '"1.08 g/cm3", "1080 kg/m3" or a gradient "0.468 psi/ft"',
    "tension": '"26 mN/m", "26 dyn/cm" or "0.026 N/m"',
    "resistivity": '"0.045 ohm.m"',
}


def _type_name(value: Any) -> str:
    if isinstance(value, bool):
        return "a true/false value"
    if isinstance(value, (int, float)):
        return "a number"
    if isinstance(value, str):
        return "text"
    if isinstance(value, dict):
        return "a table"
    if isinstance(value, list):
        return "a list"
    if isinstance(value, (_dt.date, _dt.time, _dt.datetime)):
        return "a date/time"
    return type(value).__name__


def _show(value: Any) -> str:
    """Short description of a found value: ``'abc' (text)``."""
    r = repr(value)
    if len(r) > 60:
        r = r[:57] + "..."
    return f"{r} ({_type_name(value)})"



def did_you_mean(name, known) -> str:
    """``"did you mean 'X'? "`` for the closest of ``known`` to ``name``, or ``""``."""
    close = difflib.get_close_matches(str(name), list(known), n=1)
    return f"did you mean {close[0]!r}? " if close else ""

def _join(prefix: str, key: str) -> str:
    return f"{prefix}.{key}" if prefix else key


def _label(raw: Any, keys: Iterable[str], index: int) -> str:
    """How an array-of-tables entry is named in keys: first usable text key, else #position."""
    if isinstance(raw, dict):
        for k in keys:
            v = raw.get(k)
            if isinstance(v, str) and v.strip():
                return v
    return f"#{index + 1}"


class ValueReader:
    """Carries the file path and unit system through the validation of one file."""

    def __init__(self, path: Path):
        self.path = path
        self.units: dict[str, str] = UNIT_SYSTEMS["metric"]
        self.unit_system = "metric"

    # --- error construction ------------------------------------------------------
    def error(self, key: str, what: str, hint: str | None = None) -> ProjectFileError:
        return ProjectFileError(what, where=f"{self.path}, key {key}", hint=hint)

    # --- generic value readers ---------------------------------------------------
    def table(self, value: Any, key: str, allowed: Iterable[str],
              required: Iterable[str] = (), what: str = "a table") -> dict:
        """Check ``value`` is a table with only ``allowed`` keys and all ``required`` ones."""
        allowed = tuple(allowed)
        if not isinstance(value, dict):
            raise self.error(key, f"expected {what}, found {_show(value)}",
                             hint=f"write it as a TOML table [{key}] with keys "
                                  + ", ".join(allowed))
        for k in value:
            if k not in allowed:
                hint = did_you_mean(k, allowed) + "allowed keys: " + ", ".join(allowed)
                raise self.error(_join(key, str(k)), f"unknown key {k!r}", hint=hint)
        for k in required:
            if k not in value:
                raise self.error(_join(key, k), f"required key {k!r} is missing",
                                 hint=f"add {k} = ... to this table")
        return value

    def text(self, value: Any, key: str, choices: tuple[str, ...] | None = None) -> str:
        """Non-empty text; with ``choices``, one of them (case-insensitive, returned lower-case)."""
        if not isinstance(value, str) or not value.strip():
            expected = ("one of " + ", ".join(repr(c) for c in choices)) if choices else "non-empty text"
            raise self.error(key, f"expected {expected}, found {_show(value)}",
                             hint='put text in double quotes, e.g. name = "A-1"')
        if choices is not None:
            v = value.strip().lower()
            if v not in choices:
                raise self.error(key, f"{value!r} is not a known choice",
                                 hint="use one of " + ", ".join(repr(c) for c in choices))
            return v
        return value

    def number(self, value: Any, key: str, *, positive: bool = False) -> float:
        """A plain (unit-less) finite number, optionally > 0."""
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise self.error(key, f"expected a plain number, found {_show(value)}",
                             hint="write a number without quotes or units, e.g. 2.0")
        v = float(value)
        if not math.isfinite(v):
            raise self.error(key, f"expected a finite number, found {value!r}",
                             hint="nan and inf are not allowed")
        if positive and not v > 0:
            raise self.error(key, f"must be greater than zero, found {value!r}",
                             hint="give a positive number")
        return v

    def quantity(self, value: Any, key: str, kind: str, *, positive: bool = False) -> float:
        """A number in the project unit system or text with a unit, converted to SI."""
        unit = self.units[kind]
        try:
            v = parse_quantity(value, kind, unit)
        except UnitError as exc:
            hint = exc.hint or ""
            hint = (hint + "; " if hint else "") + \
                f"write a number (taken in {unit}) or text like {_EXAMPLES.get(kind, repr('1 ' + unit))}"
            raise self.error(key, f"expected a {kind} (a number or text with a unit), found "
                             f"{_show(value)}: {exc.what}",
                             hint=hint) from None
        if positive and not v > 0:
            raise self.error(key, f"{kind} must be greater than zero, found {value!r}",
                             hint="give a positive value")
        return v

    def length_text(self, metres: float) -> str:
        """A length [m] shown in the project's length unit, for messages."""
        unit = self.units["length"]
        return f"{from_si(metres, unit, 'length'):g} {unit}"

    def unit_text(self, value_si: float, kind: str) -> str:
        """An SI value shown in the project's unit of ``kind`` (6 significant digits)."""
        return in_unit(value_si, self.units[kind], kind)

    def existing_file(self, value: Any, key: str, what: str) -> Path:
        """A file path relative to the project file that must exist."""
        text = self.text(value, key)
        base_dir = self.path.parent.resolve()
        p = (base_dir / text).resolve()
        if not p.is_file():
            found = "a folder" if p.exists() else "nothing"
            raise self.error(key, f"{what} file {text!r} not found: looked for {p} and found {found}",
                             hint=f"paths are relative to the project file's folder {base_dir}")
        return p

    def check_overlaps(self, windows: dict[str, tuple[float, float]], key_of, depth_name: str):
        """Error if two [top, base) windows overlap (touching is fine)."""
        items = sorted(windows.items(), key=lambda kv: kv[1][0])
        for (name_a, (top_a, base_a)), (name_b, (top_b, base_b)) in zip(items, items[1:]):
            if top_b < base_a:
                raise self.error(key_of(name_b),
                                 f"zone {name_b!r} ({self.length_text(top_b)} to "
                                 f"{self.length_text(base_b)}) overlaps zone {name_a!r} "
                                 f"({self.length_text(top_a)} to {self.length_text(base_a)}) "
                                 f"in {depth_name}",
                                 hint="zone windows may touch but not overlap; "
                                      "move one top or base")

    # --- plausible ranges ---------------------------------------------------------
    def allow_list(self, t: dict, key: str, known: Iterable[str]) -> frozenset:
        """The ``allow_unusual = [...]`` names of a table; each must be one of ``known``."""
        if ALLOW_KEY not in t:
            return frozenset()
        known = tuple(known)
        raw = t[ALLOW_KEY]
        k = _join(key, ALLOW_KEY)
        if not isinstance(raw, list) or not all(isinstance(x, str) for x in raw):
            raise self.error(k, f"expected a list of key names, found {_show(raw)}",
                             hint=f'write e.g. {ALLOW_KEY} = ["{known[0]}"]')
        for name in raw:
            if name not in known:
                raise self.error(k, f"{name!r} is not a value of this table that has a "
                                 "plausible range",
                                 hint=did_you_mean(name, known) + "known: " + ", ".join(known))
        return frozenset(raw)

    def plausible(self, name: str, value_si: float, key: str, raw: Any = None, *,
                  allowed: frozenset = frozenset(), allow_as: str | None = None,
                  derived: str = "", hint: str = "") -> None:
        """Refuse ``value_si`` outside ``RANGES[name]`` unless the table allows it.

        ``raw`` is the value as written (``None`` for a derived value, described by
        ``derived``); ``allow_as`` the name to list in ``allow_unusual`` (default the
        last part of ``key``).
        """
        leaf = allow_as or key.rsplit(".", 1)[-1]
        if leaf in allowed:
            return
        kind = RANGES[name].kind
        number, unit, written, shown = self._as_read(raw, kind, leaf, derived)
        msg = outside_message(name, value_si, shown, number, unit, written,
                              display_unit=unit or self.units.get(kind))
        if msg is not None:
            raise self.error(key, msg[0], hint=msg[1] + hint + "if the value is deliberate, add "
                             f'"{leaf}" to {ALLOW_KEY} = [...] in this table')

    def _as_read(self, raw: Any, kind: str, leaf: str, derived: str):
        """(number, unit, unit written?, text) of a value as read, for messages."""
        if raw is None:
            return None, None, False, f"{leaf} {derived}".strip()
        default = self.units.get(kind, "")
        if isinstance(raw, str):
            number, unit = split_quantity(raw)
            return number, unit or default, bool(unit), f'{leaf} = "{raw}"' + (
                "" if unit else f" (taken in {default})")
        return float(raw), default, False, f"{leaf} = {raw!r} (a bare number, taken in {default})"


def check_fwl_near_wells(path, zone, tvdss, surface_tvdss: float | None = None,
                         system: str = "metric", well_file=None) -> None:
    """Refuse a zone's FWL far outside a well's logged TVDSS or above its surface.

    Called by the run with each well's TVDSS, as the check needs the wells; the zone's
    ``allow_unusual = ["fwl"]`` lets the value through. See
    :func:`satheight.plausible.fwl_outside_logs`.

    Parameters
    ----------
    path : pathlib.Path
        The project file, named in the error.
    zone : satheight.engine.Zone
    tvdss : array_like
        The well's TVDSS [m], positive down.
    surface_tvdss : float, optional
        TVDSS of the well's depth reference [m] (minus its elevation).
    system : str
        The project's unit system: the message shows depths in its length unit.
    well_file : path, optional
        The well's log file, named in the hint (its depths, or their unit, may be what is
        wrong rather than the FWL).
    """
    z = np.asarray(tvdss, dtype=float)
    z = z[np.isfinite(z)]
    if "fwl" in zone.allow_unusual or z.size == 0:
        return
    why = fwl_outside_logs(zone.fwl, float(z.min()), float(z.max()), surface_tvdss,
                           UNIT_SYSTEMS[system]["length"])
    if why is not None:
        logs = "" if well_file is None else f", and the depths and depth unit of {well_file}"
        raise ProjectFileError(why, where=f"{path}, key zones[{zone.name}].fwl",
                               hint=f"check the FWL and its unit (TVDSS, positive down){logs}; "
                                    f'if it is deliberate, add "fwl" to {ALLOW_KEY} = [...] '
                                    "of the zone")
