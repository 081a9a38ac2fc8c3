"""Input LAS files that already hold curves this tool computes (a folder of its own output).

A LAS file written by a run holds the input curves and the computed ones (TVDSS,
HAFWL, SW_SHM...). Run again on it, the computed curves would clash with the new ones.
Two ways out, chosen by ``--existing``:

* ``replace`` (default): the input curves named like a computed curve are dropped
  before the well is computed, with a note per well, and written again, newly
  computed. The ``~Parameter`` items a previous run wrote (``SHM_*``, ``Zn_*``...) are
  dropped likewise when this run writes an item of the same name. In a file not
  written by this tool, a TVD, NORTH or EAST curve is the user's own and kept as read
  (the computed one is then not written), as before.
* ``suffix``: every input curve is kept; each new curve whose name is taken gets the
  first free suffix ``_2``, ``_3``... (``TVDSS_2``), with a note.

In both modes the curves a previous run computed are never picked by the automatic
curve roles (SW_LOG of a previous run is not log Sw from a file): name one under
``curves`` in the project file to use it (a curve named there is never dropped). In a
file not written by this tool, a curve SW_LOG is the user's log Sw and kept as well,
unless ``[log_sw] method`` computes log Sw (archie, simandoux, indonesia).
"""

from __future__ import annotations

import dataclasses

from ..well import Curve, HeaderItem, Well

#: The choices of ``--existing``.
EXISTING_MODES = ("replace", "suffix")

#: Computed curves that a user's own LAS file commonly holds: kept as read unless the file
#: was written by this tool.
USER_CURVES = frozenset({"TVD", "NORTH", "EAST"})


def _mnemonic(key: str) -> str:
    """Upper-case mnemonic of a curve key (a repeated mnemonic is read as ``NAME:2``)."""
    return key.split(":", 1)[0].upper()


def written_by_satheight(well: Well) -> bool:
    """True when the file's ``~Parameter`` section carries a run's ``SHM_VERSION`` item."""
    item = {k.upper(): v for k, v in well.parameters.items()}.get("SHM_VERSION")
    return item is not None and str(item.value).strip().lower().startswith("satheight")


def computed_in_input(well: Well, computed, keep=()) -> list[str]:
    """Keys of the input curves named like a curve of ``computed`` (mnemonics), except
    those of ``keep`` (mnemonics the project names for a role, which are input)."""
    names = {c.upper() for c in computed} - {k.upper() for k in keep}
    if not written_by_satheight(well):
        names -= USER_CURVES
    return [k for k in well.curves if k != well.index_mnemonic and _mnemonic(k) in names]


def role_aliases(aliases: dict, well: Well, computed) -> dict:
    """``aliases`` without the computed curves of a previous run of this tool."""
    if not written_by_satheight(well):
        return aliases
    taken = {c.upper() for c in computed}
    return {role: tuple(a for a in names if a.upper() not in taken)
            for role, names in aliases.items()}


def prepare_input(well: Well, computed, mode: str = "replace",
                  keep=()) -> tuple[Well, list[str]]:
    """The well to compute on and the notes, for ``mode`` (:data:`EXISTING_MODES`).

    ``replace``: a copy without the input curves named like ``computed`` (but those of
    ``keep``); ``suffix``: the well itself (the new curves are renamed by
    :func:`suffixed`). The input is never modified.
    """
    if mode not in EXISTING_MODES:
        raise ValueError(f"existing must be one of {EXISTING_MODES}, got {mode!r}")
    clash = computed_in_input(well, computed, keep)
    if not clash or mode == "suffix":
        return well, []
    origin = ("written by a previous run of this tool" if written_by_satheight(well)
              else "already in the LAS file")
    kept = {k: c for k, c in well.curves.items() if k not in clash}
    note = (f"{well.source}: curve(s) {', '.join(clash)} {origin}: replaced by the newly "
            "computed ones (use --existing suffix to keep both)")
    return dataclasses.replace(well, curves=kept), [note]


def suffixed(new_curves: list[Curve], well: Well) -> tuple[list[Curve], dict[str, str], list[str]]:
    """New curves renamed where the name is taken: ``(curves, new name by old name, notes)``."""
    taken = {_mnemonic(k) for k in well.curves}
    out, names, moved = [], {}, []
    for c in new_curves:
        name = c.mnemonic
        n = 2
        while name.upper() in taken:
            name, n = f"{c.mnemonic}_{n}", n + 1
        taken.add(name.upper())
        names[c.mnemonic] = name
        if name != c.mnemonic:
            moved.append(f"{c.mnemonic} -> {name}")
            c = dataclasses.replace(c, mnemonic=name)
        out.append(c)
    notes = ([f"{well.source}: curve name(s) already in the LAS file, new curves renamed: "
              + ", ".join(moved)] if moved else [])
    return out, names, notes


def new_parameters(well: Well, params: list[HeaderItem],
                   mode: str) -> tuple[Well, list[HeaderItem]]:
    """The well and this run's ``~Parameter`` items, so that no name is written twice.

    ``replace``: a file satheight wrote loses the input items this run writes again.
    ``suffix``: the input is kept whole and each new item whose name is taken gets the first
    free suffix ``_2``, ``_3``... (as the new curves do).
    """
    if mode == "suffix":
        taken = {_mnemonic(k) for k in well.parameters}
        out = []
        for p in params:
            name, n = p.mnemonic, 2
            while name.upper() in taken:
                name, n = f"{p.mnemonic}_{n}", n + 1
            taken.add(name.upper())
            out.append(p if name == p.mnemonic else dataclasses.replace(p, mnemonic=name))
        return well, out
    if not written_by_satheight(well):
        return well, params
    again = {p.mnemonic.upper() for p in params}
    kept = {k: v for k, v in well.parameters.items() if _mnemonic(k) not in again}
    return dataclasses.replace(well, parameters=kept), params
