"""LAS 2.0 writer: the tool's own, vectorised, through :mod:`satheight.io.atomic`.

Every input curve is written back with its mnemonic, unit and description and
with enough decimals (at most :data:`MAX_DECIMALS`) that its values read back
exactly; number text comes from :func:`satheight.io.las_numbers.format_fixed`.
"""

from __future__ import annotations

import math
import re
from pathlib import Path
from typing import Any, Mapping, Sequence

import numpy as np

from ..errors import InputFileError
from ..well import Curve, HeaderItem, Well
from .atomic import atomic_open
from .las_header import num, plain
from .las_numbers import format_fixed

__all__ = ["write_las", "MAX_DECIMALS", "NEW_CURVE_MAX_DECIMALS"]

#: Largest number of decimals the writer uses for an input curve.
MAX_DECIMALS = 10

#: Largest number of decimals chosen automatically for a new curve.
NEW_CURVE_MAX_DECIMALS = 6

# ~Well items the writer keeps in step with the data it writes.
_DEPTH_ITEMS = ("STRT", "STOP", "STEP")

# A header or curve mnemonic the writer can put in a LAS 2.0 line.
_MNEMONIC_OK = re.compile(r"^[^\s.:~#]+$")
# lasio renames repeated mnemonics GR, GR -> GR:1, GR:2.
_DUPLICATE_SUFFIX = re.compile(r"^(.+):(\d+)$")


def decimals_for(values: np.ndarray, cap: int) -> int:
    """Fewest decimals d in 0..cap with ``round(x, d) == x`` for every finite x (else cap)."""
    finite = values[np.isfinite(values)]
    if finite.size == 0:
        return 0
    with np.errstate(over="ignore", invalid="ignore"):
        # a sample needs at most as many decimals as the whole curve: start there
        start = 0
        sample = finite[:256]
        for d in range(cap + 1):
            if np.array_equal(np.round(sample, d), sample):
                start = d
                break
        else:
            return cap
        for d in range(start, cap + 1):
            if np.array_equal(np.round(finite, d), finite):
                return d
    return cap


def _format_column(values: np.ndarray, decimals: int, null_text: str) -> np.ndarray:
    """Fixed-point text of each value (no exponent); non-finite values as ``null_text``.

    Returns a ``(n, width)`` uint8 array of right-aligned ASCII text, ``width`` the
    longest text (see :func:`satheight.io.las_fast.format_fixed`).
    """
    return format_fixed(values, decimals, null_text)


def _text_at(column: np.ndarray, row: int) -> str:
    """Text of one row of a :func:`_format_column` result, without padding."""
    return column[row].tobytes().decode("ascii").strip()


#: Data rows assembled and written per step (bounds the writer's memory).
_WRITE_ROWS = 65536


def _write_rows(f, columns: Sequence[np.ndarray], widths: Sequence[int]) -> None:
    """Write the data lines: columns right-aligned in ``widths``, one blank between."""
    line = widths[0] + sum(1 + w for w in widths[1:]) + 1
    n = columns[0].shape[0]
    for a in range(0, n, _WRITE_ROWS):
        b = min(n, a + _WRITE_ROWS)
        buf = np.full((b - a, line), ord(" "), dtype=np.uint8)
        end = 0
        for i, (col, w) in enumerate(zip(columns, widths)):
            end += w if i == 0 else 1 + w
            buf[:, end - col.shape[1]:end] = col[a:b]
        buf[:, -1] = ord("\n")
        f.write(buf)                    # the array's own bytes (C order), not a copy


def _file_mnemonic(key: str, all_keys: Sequence[str]) -> str:
    """Mnemonic to write: lasio's ``GR:2`` back to ``GR`` when ``GR`` was repeated."""
    m = _DUPLICATE_SUFFIX.match(key)
    if m and sum(1 for k in all_keys if k.startswith(m.group(1) + ":")) > 1:
        return m.group(1)
    return key


def _header_value(value: Any) -> str:
    """Text of a header value; floats without exponent."""
    value = plain(value)
    if isinstance(value, bool):
        return str(value)
    if isinstance(value, float):
        return num(value) if math.isfinite(value) else str(value)
    return str(value)


def _header_lines(rows: Sequence[tuple[str, str, str, str]]) -> list[str]:
    """Aligned ``MNEM.UNIT  VALUE : DESCRIPTION`` lines."""
    if not rows:
        return []
    rows = [(_one_line(m), _one_line(u), _one_line(v), d) for m, u, v, d in rows]
    w_m = max(len(r[0]) for r in rows)
    w_u = max(len(r[1]) for r in rows)
    w_v = max(len(r[2]) for r in rows)
    return [f" {m:<{w_m}}.{u:<{w_u}}  {v:<{w_v}} : {_description(d)}".rstrip()
            for m, u, v, d in rows]


#: Control characters (C0, DEL, C1) and the Unicode line and paragraph separators: text from
#: input files (a zone or project name) must not start a new header line or a terminal escape.
_CONTROL = re.compile("[\x00-\x1f\x7f-\x9f\u2028\u2029]+")


def _one_line(text) -> str:
    """``text`` on one line: every run of control characters becomes one blank."""
    return _CONTROL.sub(" ", str(text))


def _description(text: str) -> str:
    """Description text safe for a LAS line: one line, no colon.

    A LAS 2.0 header line splits value and description at its last colon, so a
    colon inside a description is written as a semicolon.
    """
    # inner blanks are kept as read; line breaks and other control characters become blanks
    return _one_line(text).strip().replace(":", ";")


def depth_step(index: np.ndarray, decimals: int) -> float:
    """Constant sampling step of ``index`` at ``decimals`` decimals, or 0 if irregular."""
    if index.size < 2:
        return 0.0
    steps = np.round(np.diff(index), decimals)
    return float(steps[0]) if np.all(steps == steps[0]) else 0.0


def _out_error(path: Path, what: str, hint: str) -> InputFileError:
    return InputFileError(what, where=str(path), hint=hint)


def _check_new_curves(path: Path, well: Well, new_curves: Sequence[Curve],
                      decimals: Mapping[str, int]) -> list[np.ndarray]:
    """Validate new curves and decimals; return their data as float64 arrays."""
    taken = {k.upper() for k in well.curves}
    taken |= {_file_mnemonic(k, list(well.curves)).upper() for k in well.curves}
    arrays = []
    for c in new_curves:
        if not _MNEMONIC_OK.match(c.mnemonic or ""):
            raise _out_error(path, f"new curve mnemonic {c.mnemonic!r} cannot be written to LAS",
                             "use a mnemonic without blanks, dots or colons")
        if c.mnemonic.upper() in taken:
            raise _out_error(path, f"new curve {c.mnemonic!r} has the name of a curve already in "
                             "the well", "rename the new curve (e.g. add a suffix) or drop the "
                             "input curve of that name")
        if any(ch.isspace() for ch in c.unit or ""):
            raise _out_error(path, f"unit {c.unit!r} of new curve {c.mnemonic!r} contains a blank",
                             "write units without blanks (e.g. 'ohm.m')")
        taken.add(c.mnemonic.upper())
        data = np.asarray(c.data, dtype=np.float64).ravel()
        if data.size != well.n_samples:
            raise _out_error(path, f"new curve {c.mnemonic!r} has {data.size} values but the well "
                             f"has {well.n_samples} depth samples",
                             "compute new curves on the well's own depth samples")
        arrays.append(data)
    new_names = {c.mnemonic for c in new_curves}
    for key, d in decimals.items():
        if key not in new_names:
            raise _out_error(path, f"decimals given for {key!r}, which is not a new curve",
                             "input curves are always written with the decimals they were read "
                             "with; give decimals for new curves only")
        if isinstance(d, bool) or not isinstance(d, (int, np.integer)) or not 0 <= d <= MAX_DECIMALS:
            raise _out_error(path, f"decimals for {key!r} must be a whole number 0..{MAX_DECIMALS}, "
                             f"got {d!r}", "fix the decimals argument")
    return arrays


def _well_rows(well: Well, index_unit: str, strt: str, stop: str, step: str,
               null_text: str) -> list[tuple[str, str, str, str]]:
    """~Well rows: the input items with STRT/STOP/STEP/NULL set from the data written."""
    updates = {"STRT": (index_unit, strt), "STOP": (index_unit, stop),
               "STEP": (index_unit, step), "NULL": (None, null_text)}
    defaults = {"STRT": "first depth", "STOP": "last depth", "STEP": "depth step, 0 if irregular",
                "NULL": "null value", "WELL": "well name"}
    keys = list(well.well_header)
    rows, seen = [], set()
    for key, it in well.well_header.items():
        mn = _file_mnemonic(key, keys)
        up = mn.upper()
        unit, value = it.unit, _header_value(it.value)
        if up in updates and up not in seen:
            new_unit, value = updates[up]
            unit = it.unit if new_unit is None else new_unit
        seen.add(up)
        rows.append((mn, unit, value, it.description))
    missing = [(m, updates[m][0] or "", updates[m][1], defaults[m])
               for m in ("STRT", "STOP", "STEP", "NULL") if m not in seen]
    if "WELL" not in seen:
        missing.append(("WELL", "", well.name, defaults["WELL"]))
    return missing + rows


def write_las(path, well: Well, new_curves: Sequence[Curve] = (),
              parameters: Sequence[HeaderItem] = (), null_value: float = -999.25,
              extra_other: str = "", decimals: Mapping[str, int] | None = None) -> None:
    """Write ``well`` and new curves to a LAS 2.0 file, atomically.

    Parameters
    ----------
    path : str or os.PathLike
        Output file; replaced in one step (temporary file + rename).
    well : Well
        The well as read by :func:`read_las`. Every input curve is written with its
        mnemonic, unit and description unchanged and in order, and its values as
        read (smallest number of decimals, at most 10, that gives back the same
        numbers; NaN as ``null_value``). All ``~Well`` items are kept; STRT, STOP,
        STEP (in the index unit) and NULL are set from the data written.
    new_curves : sequence of Curve
        Curves to add after the input ones, one value per depth sample of ``well``.
        Mnemonics must not repeat an input curve (case-insensitive).
    parameters : sequence of HeaderItem
        Written to ``~Parameter`` after the input parameters (e.g. the run settings).
    null_value : float
        Null value written for NaN and declared as NULL.
    extra_other : str
        Text appended to the input ``~Other`` section.
    decimals : dict[str, int], optional
        Decimals (0..10) per new curve mnemonic; by default the fewest that
        round-trip, at most 6.

    Raises
    ------
    InputFileError
        If a new curve clashes with an input curve, has the wrong length or a bad
        mnemonic, a written value would equal ``null_value``, or the file cannot be
        written. An existing file at ``path`` is then left as it was.
    """
    path = Path(path)
    decimals = dict(decimals or {})
    new_curves = list(new_curves)
    new_data = _check_write_args(path, well, new_curves, parameters, null_value, extra_other,
                                 decimals)
    in_curves = list(well.curves.values())
    in_data = [np.asarray(c.data, dtype=np.float64) for c in in_curves]
    if any(d.size != well.n_samples for d in in_data):
        raise _out_error(path, "the well's curves do not all have one value per depth sample",
                         "this is a program error: report it")
    all_curves = in_curves + new_curves
    all_data = in_data + new_data
    dec = [decimals_for(d, MAX_DECIMALS) for d in in_data]
    dec += [int(decimals[c.mnemonic]) if c.mnemonic in decimals
            else decimals_for(d, NEW_CURVE_MAX_DECIMALS) for c, d in zip(new_curves, new_data)]

    null = float(null_value)
    null_text = num(null)
    for c, d, k in zip(all_curves, all_data, dec):
        if np.any(np.round(d, k) == null):
            raise _out_error(path, f"curve {c.mnemonic!r} has values equal to the null value "
                             f"{null_text}; they would read back as missing",
                             "choose another null_value")

    index_text = _format_column(all_data[0], dec[0], null_text)
    keys = list(well.curves)
    labels = [_file_mnemonic(c.mnemonic, keys) if i < len(in_curves) else c.mnemonic
              for i, c in enumerate(all_curves)]
    header = _header_text(well, all_curves, labels, parameters, extra_other, index_text,
                          depth_step(all_data[0], dec[0]), dec[0], null_text)

    with atomic_open(path, "wb") as f:          # bytes: the rows are ASCII arrays already
        f.write(header.encode("utf-8"))
        columns = [index_text] + [_format_column(d, k, null_text)
                                  for d, k in zip(all_data[1:], dec[1:])]
        widths = [max(col.shape[1], len(lab)) for col, lab in zip(columns, labels)]
        widths[0] = max(widths[0], len(labels[0]) + 3)      # room for "~A " before the first label
        f.write(("~A" + f"{labels[0]:>{widths[0] - 2}}"
                 + "".join(f" {lab:>{w}}" for lab, w in zip(labels[1:], widths[1:]))
                 + "\n").encode("utf-8"))
        _write_rows(f, columns, widths)


def _check_write_args(path: Path, well: Well, new_curves: list[Curve],
                      parameters: Sequence[HeaderItem], null_value: float, extra_other: str,
                      decimals: Mapping[str, int]) -> list[np.ndarray]:
    """Refuse what :func:`write_las` cannot write; the new curves' data as float64 arrays."""
    if not math.isfinite(float(null_value)):
        raise _out_error(path, f"null value must be a finite number, got {null_value!r}",
                         "use e.g. -999.25")
    if well.n_samples == 0:
        raise _out_error(path, "the well has no depth samples to write",
                         "read the well from a LAS file with data rows")
    new_data = _check_new_curves(path, well, new_curves, decimals)
    taken = {_file_mnemonic(k, list(well.parameters)).upper() for k in well.parameters}
    for it in parameters:
        if not _MNEMONIC_OK.match(it.mnemonic or "") or any(ch.isspace() for ch in it.unit or ""):
            raise _out_error(path, f"parameter {it.mnemonic!r} (unit {it.unit!r}) cannot be "
                             "written to LAS", "use a mnemonic without blanks, dots or colons "
                             "and a unit without blanks")
        if it.mnemonic.upper() in taken:   # a reader would see two values under one name
            raise _out_error(path, f"parameter {it.mnemonic!r} is already in ~Parameter",
                             "give the new parameter a name of its own")
        taken.add(it.mnemonic.upper())
    for line in extra_other.splitlines():
        if line.lstrip().startswith("~"):
            raise _out_error(path, "a line of the ~Other text starts with '~'",
                             "'~' at the start of a line opens a LAS section; indent or reword it")
    return new_data


def _header_text(well: Well, all_curves: Sequence[Curve], labels: Sequence[str],
                 parameters: Sequence[HeaderItem], extra_other: str, index_text: np.ndarray,
                 step: float, index_decimals: int, null_text: str) -> str:
    """The header sections (~Version to ~Other) of the file :func:`write_las` writes."""
    index_unit = all_curves[0].unit or (
        next((it.unit for it in well.well_header.values() if it.mnemonic.upper() == "STRT"), "")
        or well.depth_unit)
    lines = ["~Version",
             *_header_lines([("VERS", "", "2.0", "LAS version 2.0"),
                             ("WRAP", "", "NO", "one line per depth sample")]),
             "~Well",
             *_header_lines(_well_rows(well, index_unit, _text_at(index_text, 0),
                                       _text_at(index_text, -1), f"{step:.{index_decimals}f}",
                                       null_text)),
             "~Curve",
             *_header_lines([(lab, c.unit, c.value, c.description)
                             for lab, c in zip(labels, all_curves)])]
    params = [(_file_mnemonic(k, list(well.parameters)), it.unit, _header_value(it.value),
               it.description) for k, it in well.parameters.items()]
    params += [(it.mnemonic, it.unit, _header_value(it.value), it.description) for it in parameters]
    if params:
        lines += ["~Parameter", *_header_lines(params)]
    other = "\n".join(t.strip("\n") for t in (well.other, extra_other) if t and t.strip())
    if other:
        lines += ["~Other", *other.splitlines()]
    return "\n".join(lines) + "\n"
