"""LAS well-log files: read into a :class:`~satheight.well.Well`, write LAS 2.0.

Before any parser sees a file, :mod:`satheight.io.las_checks` refuses what would be
read wrongly without a word or for minutes (a device or pipe as the path, an overlong
header line, data rows that do not match ``~Curve``, decimal commas, numbers run
together). LAS 3.0 files are read by :mod:`satheight.io.las3`. LAS 1.2/2.0 reading goes through the ``lasio`` library, kept behind this module: nothing
outside :mod:`satheight.io` imports it. For speed on large files lasio parses only
the header sections of a plain LAS 1.2/2.0 unwrapped file and the ``~A`` section is
read by pandas' C parser (:mod:`satheight.io.las_fast`); any other file is read by
lasio as a whole, with the same result. The reader turns what was parsed into the
tool's own :class:`~satheight.well.Well` and applies the tool's rules:

* the depth index unit must be metres, feet or tenths of an inch (from the index
  curve's unit, else, with a note, the unit of the ``~Well`` item ``STRT``);
  ``Well.md`` is in metres (1 ft = 0.3048 m, 1 in = 0.0254 m, NIST SP 811) and
  within :data:`MAX_MD`;
* the header NULL value and common null codes (-999.25, -999, -9999, -99999, and
  any magnitude >= 1e30) become NaN in every curve except the index; replacing a
  code other than the header NULL is reported in ``Well.warnings``;
* depths must be strictly monotonic: a file whose depths all decrease is reversed
  (reported in ``Well.warnings``); missing, repeated or out-of-order depths raise
  :class:`~satheight.errors.DepthError` naming the data row;
* every problem with the file raises :class:`~satheight.errors.InputFileError`
  naming the file (and line where one is at fault); no lasio or OS exception escapes;
* whatever the reader fills in (a unit, a name, a renamed mnemonic) is a note in
  ``Well.warnings``.

Writing (:func:`write_las`, imported here from :mod:`satheight.io.las_write`) uses the
tool's own LAS 2.0 writer through :mod:`satheight.io.atomic`. Every input curve is
written back with enough decimals that its values read back exactly. The header
sections and the checks on the raw text live in :mod:`satheight.io.las_header`.
"""

from __future__ import annotations

import io
import math
import re
from pathlib import Path
from typing import Iterable

import numpy as np

from .. import units
from ..errors import DepthError, InputFileError, SatHeightError
from ..datum import datum_from_header
from ..roles import ROLE_ALIASES, explain_roles
from ..well import Curve, HeaderItem, Well
from . import las_fast
from .las3 import declares_las3, parse_las3
from .las_checks import check_data_rows, check_header_lines
from .las_header import (HINT_LAS, RawLas, check_structure, decode, lasio_messages, num, plain,
                         raw_from_lasio, read_bytes, parse_with_lasio, text_warning)
from .las_write import MAX_DECIMALS, decimals_for, depth_step, write_las

__all__ = ["read_las", "write_las", "describe_las", "EXTRA_NULL_CODES", "HUGE_NULL"]

#: Null codes replaced by NaN besides the file's own NULL value (common practice).
EXTRA_NULL_CODES: tuple[float, ...] = (-999.25, -999.0, -9999.0, -99999.0)

#: Values of at least this magnitude are taken as nulls (common practice).
HUGE_NULL = 1e30

_METRE_UNITS = frozenset({"m", "meter", "meters", "metre", "metres"})
_FOOT_UNITS = frozenset({"f", "ft", "feet", "foot"})
# Depth units of older files: tenths of an inch (1 in = 0.0254 m, NIST SP 811), and the
# metre and foot in other languages where the word means nothing else (read with a note).
# ("DEPT .1IN": the unit starts after the first dot, so lasio gives "1IN")
_TENTH_INCH_UNITS = frozenset({".1in", "0.1in", ".1 in", "0.1 in", "1in"})
_OTHER_LANGUAGE = {**dict.fromkeys(("metro", "metros", "mètre", "mètres", "metri", "metr",
                                    "meetri"), "m"),
                   **dict.fromkeys(("pie", "pies", "pied", "pieds", "fuss", "fuß", "voet",
                                    "piedi", "pé", "pés"), "ft")}

# Header items shown by describe_las when present (~Well and ~Parameter).
_INTERESTING_ITEMS = ("WELL", "COMP", "FLD", "LOC", "CTRY", "STAT", "PROV", "CNTY", "SRVC",
                      "DATE", "UWI", "API", "LIC", "EKB", "EDF", "EGL", "EREF", "ELEV", "APD",
                      "PDAT", "LMF", "DMF", "TDD", "TDL")


def _to_float(column: np.ndarray, mnemonic: str, path: Path, warnings: list[str],
              owned: bool = False) -> np.ndarray:
    """A new float64 copy of a data column; text entries become NaN with a warning.

    With ``owned`` a writable float64 column is taken as it is (no copy).
    """
    if owned and column.dtype == np.float64 and column.flags.writeable:
        return column
    if column.dtype.kind in "fiub":
        return column.astype(np.float64, copy=True)
    import pandas as pd

    text = np.asarray(column, dtype=str)
    values = pd.to_numeric(pd.Series(text), errors="coerce").to_numpy(dtype=np.float64, copy=True)
    bad = np.isnan(values) & (np.char.lower(np.char.strip(text)) != "nan")
    if bad.any():
        first = int(np.flatnonzero(bad)[0])
        warnings.append(text_warning(path, mnemonic, int(bad.sum()), str(text[first]), first + 1))
    return values


def _index_unit(path: Path, mnemonic: str, curve_unit: str, strt_unit: str,
                warnings: list[str]) -> str:
    """``"m"``, ``"ft"`` or ``".1in"`` from the index curve unit, else the STRT unit
    (with a note); a metre or foot written in another language is read with a note."""
    given = curve_unit.strip() or strt_unit.strip()
    u = units.normalise_unit(given)
    if u and not curve_unit.strip():
        warnings.append(f"{path}: the depth index {mnemonic!r} has no unit in ~Curve; the unit "
                        f"of STRT ({given!r}) is used")
    if u in _OTHER_LANGUAGE:
        warnings.append(f"{path}: depth unit {given!r} read as "
                        f"{'metres' if _OTHER_LANGUAGE[u] == 'm' else 'feet'}")
        u = _OTHER_LANGUAGE[u]
    if u in _METRE_UNITS:
        return "m"
    if u in _FOOT_UNITS:
        return "ft"
    if u in _TENTH_INCH_UNITS:
        return ".1in"
    if not u:
        raise InputFileError(f"the depth index {mnemonic!r} has no unit (neither the ~Curve line "
                             "nor STRT in ~Well gives one)", where=str(path),
                             hint=f"write the unit after the dot, e.g. '{mnemonic}.M' or "
                                  f"'{mnemonic}.FT' in the ~Curve section")
    raise InputFileError(f"unknown depth unit {given!r} of index curve {mnemonic!r}",
                         where=str(path),
                         hint="the depth index must be in M (metres), FT (feet) or .1IN (tenths "
                              "of an inch)")


def _header_lookup(items: Iterable[HeaderItem], mnemonic: str) -> HeaderItem | None:
    """First item whose mnemonic equals ``mnemonic`` ignoring case."""
    for it in items:
        if it.mnemonic.upper() == mnemonic:
            return it
    return None


def _null_of(item: HeaderItem | None) -> float | None:
    """The NULL item's value as a finite float, or None."""
    if item is None:
        return None
    try:
        value = float(item.value)
    except (TypeError, ValueError):
        return None
    return value if math.isfinite(value) else None


def _replace_nulls(columns: list[np.ndarray], names: list[str], header_null: float | None,
                   path: Path) -> list[str]:
    """Set null codes to NaN in place in ``columns`` (non-index curves); report extras."""
    if not columns:
        return []
    # one curve at a time (no stacked copy of all curves); the codes other than the
    # header NULL are counted per curve for the warning
    labels = [f"{num(code)}" for code in EXTRA_NULL_CODES if code != header_null]
    labels.append(f"magnitude >= {HUGE_NULL:g}")
    codes = [code for code in EXTRA_NULL_CODES if code != header_null]
    counts = np.zeros((len(labels), len(columns)), dtype=np.int64)
    # every value to replace is at most `top` or at least HUGE_NULL: one pass over a
    # curve finds these few candidates, and only they are looked at further
    top = max(codes + ([header_null] if header_null is not None else []) + [-HUGE_NULL])
    for i, col in enumerate(columns):
        with np.errstate(invalid="ignore"):
            cand = np.flatnonzero((col <= top) | (col >= HUGE_NULL))
        if cand.size == 0:
            continue
        sub = col[cand]
        if header_null is not None:
            sub[sub == header_null] = np.nan
        for j, code in enumerate(codes):
            hit = sub == code
            counts[j, i] = np.count_nonzero(hit)
            sub[hit] = np.nan
        with np.errstate(invalid="ignore"):
            big = np.abs(sub) >= HUGE_NULL
        counts[-1, i] = np.count_nonzero(big)
        sub[big] = np.nan
        col[cand] = sub
    warnings: list[str] = []
    null_text = num(header_null) if header_null is not None else "not given"
    for label, per_curve in zip(labels, counts):
        total = int(per_curve.sum())
        if total == 0:
            continue
        where = ", ".join(f"{names[i]} {int(n)}" for i, n in enumerate(per_curve) if n)
        warnings.append(f"{path}: {total} value(s) of {label} read as null (common null code; "
                        f"header NULL is {null_text}): {where}")
    return warnings


def _check_depths(index: np.ndarray, mnemonic: str, path: Path) -> bool:
    """Validate the depth index; return True if the rows must be reversed.

    Raises
    ------
    DepthError
        On a missing depth, a repeated depth or depths out of order, naming the
        first offending data row (1-based) and its depth.
    """
    hint = ("depths must increase (or all decrease) down the ~A section; remove or correct the "
            "row named")
    missing = np.flatnonzero(~np.isfinite(index))
    if missing.size:
        row = int(missing[0]) + 1
        raise DepthError(f"depth index {mnemonic!r} has no valid depth at data row {row}",
                         where=str(path), hint="every data row needs a depth; " + hint)
    if index.size < 2:
        return False
    step = np.diff(index)
    if np.all(step > 0):
        return False
    if np.all(step < 0):
        return True
    bad = int(np.flatnonzero(step <= 0)[0] if step[0] > 0 else np.flatnonzero(step >= 0)[0])
    row = bad + 2
    depth, before = num(index[bad + 1]), num(index[bad])
    if step[bad] == 0:
        what = f"depth {depth} at data row {row} repeats the depth of data row {row - 1}"
    else:
        what = (f"depths are out of order: depth {depth} at data row {row} follows {before} "
                f"at data row {row - 1}")
    raise DepthError(what, where=str(path), hint=hint)


#: Largest measured depth accepted [m]: no drilled well is half as long (common practice).
MAX_MD = 30_000.0


def _check_plausible_md(md: np.ndarray, index: np.ndarray, mnemonic: str, depth_unit: str,
                        path: Path) -> None:
    """Refuse a depth that is not finite in metres or deeper than :data:`MAX_MD`."""
    with np.errstate(invalid="ignore"):
        bad = np.flatnonzero(~np.isfinite(md) | (np.abs(md) > MAX_MD))
    if bad.size:
        row = int(bad[0]) + 1
        limit = units.in_unit(MAX_MD, depth_unit, "length")
        raise DepthError(f"depth {float(index[bad[0]]):.6g} {depth_unit} of {mnemonic!r} at data row "
                         f"{row} is not a plausible measured depth (beyond {limit}"
                         f"{' or not finite once converted' if not np.isfinite(md[bad[0]]) else ''})",
                         where=str(path), hint="check the depth column and its unit in ~Curve "
                                               "(M or FT); a depth this large is a damaged value")


_DUPLICATE = re.compile(r"^(.*):(\d+)$")


def _reader_notes(path: Path, raw: RawLas, name: str) -> list[str]:
    """Notes for what the reader filled in: repeated or empty mnemonics renamed, the well
    name from the file name, no usable NULL, no VERS item."""
    notes = []
    names = [d[0] for d in raw.curve_defs]
    repeated: dict[str, list[str]] = {}
    for n in names:
        m = _DUPLICATE.match(n)
        if m:
            repeated.setdefault(m.group(1), []).append(n)
    for base, keys in repeated.items():
        if len(keys) > 1:
            what = ("~Curve lines have no mnemonic" if base == "UNKNOWN"
                    else f"curve mnemonic {base!r} appears {len(keys)} times")
            notes.append(f"{path}: {what}; read as {', '.join(keys)} (name the one to use in "
                         "the project file)")
    if "UNKNOWN" in names:
        notes.append(f"{path}: a ~Curve line has no mnemonic; read as 'UNKNOWN'")
    if not name:
        notes.append(f"{path}: no WELL name in ~Well; the file name {path.stem!r} is used")
    null_item = _header_lookup(raw.well_items, "NULL")
    if _null_of(null_item) is None:
        given = "no NULL item" if null_item is None else f"NULL is {str(null_item.value)!r}"
        notes.append(f"{path}: {given} in ~Well: only the common null codes are read as missing")
    return notes


def _build_well(path: Path, raw: RawLas) -> Well:
    """Apply the tool's rules (units, nulls, depth order) to parsed LAS content."""
    if not raw.curve_defs or not raw.columns:
        raise InputFileError("no curves found (the ~Curve section is missing or empty)",
                             where=str(path), hint=HINT_LAS)
    n = raw.columns[0].size
    if n == 0:
        raise InputFileError("no data rows (the ~A section is missing or empty)",
                             where=str(path), hint="give a LAS file with depth samples in ~A")
    if any(c.size != n for c in raw.columns):
        raise InputFileError("curves have different numbers of samples", where=str(path),
                             hint="check that every ~A row has one value per ~Curve line")
    warnings = list(raw.messages)
    names = [d[0] for d in raw.curve_defs]
    columns = [_to_float(c, m, path, warnings, raw.owned) for c, m in zip(raw.columns, names)]
    index_mnemonic, index_curve_unit = raw.curve_defs[0][0], raw.curve_defs[0][1]
    strt = _header_lookup(raw.well_items, "STRT")
    depth_unit = _index_unit(path, index_mnemonic, index_curve_unit, strt.unit if strt else "",
                             warnings)

    header_null = _null_of(_header_lookup(raw.well_items, "NULL"))
    rest = columns[1:]
    warnings += _replace_nulls(rest, names[1:], header_null, path)
    columns = [columns[0]] + rest

    if _check_depths(columns[0], index_mnemonic, path):
        columns = [c[::-1].copy() for c in columns]
        warnings.append(f"{path}: depths decrease down the file; all rows were reversed so that "
                        f"depth increases ({num(columns[0][0])} to {num(columns[0][-1])} "
                        f"{depth_unit})")
    md = np.asarray(units.to_si(columns[0], depth_unit, "length"), dtype=np.float64)
    _check_plausible_md(md, columns[0], index_mnemonic, depth_unit, path)

    curves = {name: Curve(name, unit, descr, col, value)
              for (name, unit, descr, value), col in zip(raw.curve_defs, columns)}
    well_item = _header_lookup(raw.well_items, "WELL")
    name = str(well_item.value).strip() if well_item is not None else ""
    warnings += _reader_notes(path, raw, name)
    return Well(
        name=name or path.stem,
        source=path,
        md=md,
        depth_unit=depth_unit,
        index_mnemonic=index_mnemonic,
        curves=curves,
        well_header={it.mnemonic: it for it in raw.well_items},
        parameters={it.mnemonic: it for it in raw.param_items},
        other=raw.other,
        null_value=header_null,
        version=raw.version,
        warnings=warnings,
    )

def read_las(path, engine: str = "auto") -> Well:
    """Read a LAS 1.2, 2.0 or 3.0 file into a :class:`~satheight.well.Well`.

    LAS 3.0 files (``VERS 3.0``) are read by :mod:`satheight.io.las3` (the depth-indexed
    data set; a note names what was not read), then the same rules apply.

    Parameters
    ----------
    path : str or os.PathLike
        The LAS file. It is only read, never changed.
    engine : {"auto", "lasio"}
        ``"auto"`` (default): header sections with lasio, a plain unwrapped ``~A``
        section with pandas' compiled parser (see :mod:`satheight.io.las_fast`),
        anything else (wrapped, LAS 3.0, quotes, commas, lines with another
        number of values...) with lasio. ``"lasio"``: the whole file with lasio.
        Both give the same well.

    Returns
    -------
    Well
        ``md`` in metres, strictly increasing; every curve in file order (index
        first) as float64 in the file's units with nulls as NaN (the index keeps
        its values); repeated mnemonics made unique as ``GR:1``, ``GR:2``;
        ``~Well`` and ``~Parameter`` items; ``~Other`` text; the NULL value; the
        fix-ups applied in ``warnings``.

    Raises
    ------
    InputFileError
        If the file is missing, not a regular file, unreadable, not LAS, has no
        curves or data, a data line that does not match ``~Curve`` (names the line),
        or its depth unit is not metres, feet or tenths of an inch.
    DepthError
        If a depth is missing, repeated or out of order (names the data row), or
        beyond :data:`MAX_MD`.
    """
    path = Path(path)
    if engine not in ("auto", "lasio"):
        raise SatHeightError(f"unknown LAS reading engine {engine!r}", where="read_las",
                             hint="use engine='auto' or engine='lasio'")
    data = read_bytes(path)
    found = las_fast.split_data_section(data)
    check_header_lines(path, data, found[1] if found else len(data))
    if declares_las3(decode(data[:found[1]] if found else data)):
        text = decode(data)
        del data
        return _build_well(path, parse_las3(path, text))
    parsed = _parse_fast(path, data) if engine == "auto" else None
    if parsed is None:
        text = decode(data)
        del data
        check_structure(path, text)
        n_curves, wrapped = _curves_and_wrap(text)
        check_data_rows(path, text, n_curves, wrapped)
        parsed = parse_with_lasio(path, text)
    else:
        del data
    return _build_well(path, parsed)


def _curves_and_wrap(text: str) -> tuple[int, bool]:
    """Number of ~Curve lines and whether WRAP is YES, from the header sections only.

    ``(0, False)`` when the header cannot be parsed (the full parse then says why).
    """
    import lasio

    m = re.search(r"^[ \t]*~A", text, re.M)
    header = text[:m.start()] if m else text
    with lasio_messages():
        try:
            las = lasio.read(io.StringIO(header), mnemonic_case="preserve", engine="normal",
                             ignore_data=True)
        except Exception:  # noqa: BLE001 - the full parse reports the problem
            return 0, False
    wrap = next((plain(it.value) for it in las.version if it.mnemonic.upper() == "WRAP"), "NO")
    return len(las.curves), str(wrap).strip().upper() in ("YES", "Y", "TRUE")


# Header items that make the fast path step aside (lasio handles them).
_FAST_VERSIONS = (1.2, 2.0)


def _parse_fast(path: Path, data: bytes) -> RawLas | None:
    """Header with lasio, ``~A`` with pandas; None when the file is not plain enough.

    Returns None (the caller then reads the whole file with lasio) for: no ``~A``
    line, more than one data section or LAS 3.0 sections, VERS other than 1.2 or
    2.0, WRAP other than NO, a DLM item, and every data-section case
    :func:`satheight.io.las_fast.parse_data_section` declines.
    """
    import lasio

    found = las_fast.split_data_section(data)
    if found is None:
        return None
    start, end = found
    header_text = decode(data[:end])             # the header sections and the ~A line
    check_structure(path, header_text)
    for line in decode(data[:start]).split("\n"):   # every line before the ~A line
        t = line.strip()
        if t.startswith("~") and (t[:2] == "~A" or "_Data" in t or "~Log_" in t):
            return None
    # the quick checks now; the byte checks and token count run beside the parser
    scan = las_fast.scan_data_section(data, end, count=False)
    if scan is None:
        return None
    with lasio_messages() as messages:
        try:
            las = lasio.read(io.StringIO(header_text), mnemonic_case="preserve", engine="normal",
                             ignore_data=True)
        except Exception:  # noqa: BLE001 - the lasio path reports the problem
            return None
    items = [it for sect in (las.version, las.well, las.params) for it in sect]
    vers = next((plain(it.value) for it in las.version if it.mnemonic.upper() == "VERS"), None)
    wrap = next((plain(it.value) for it in las.version if it.mnemonic.upper() == "WRAP"), None)
    if not isinstance(vers, (int, float)) or float(vers) not in _FAST_VERSIONS:
        return None
    if str(wrap).strip().upper() != "NO" or any(it.mnemonic.upper() == "DLM" for it in items):
        return None
    n = len(las.curves)
    if n == 0:
        return None
    parsed = las_fast.parse_data_section(data, end, n, scan)
    if parsed is None:
        return None
    block, texts = parsed
    raw = raw_from_lasio(path, las, block, messages, header_text)
    raw.owned = True
    names = [d[0] for d in raw.curve_defs]
    raw.messages += [text_warning(path, names[t.column], t.count, t.first_text, t.first_row)
                     for t in texts]
    return raw


# ---------------------------------------------------------------------------
# Description for the `inspect` command
# ---------------------------------------------------------------------------

def _finite_or_none(x: float) -> float | None:
    return float(x) if math.isfinite(x) else None


def describe_las(path) -> dict:
    """Summary of a LAS file for a quick look (the ``inspect`` command).

    Parameters
    ----------
    path : str or os.PathLike

    Returns
    -------
    dict
        Plain Python values (ready for JSON)::

            {"path", "well", "version", "n_samples",
             "depth": {"mnemonic", "start", "stop", "step", "unit", "start_m", "stop_m"},
             "null_value",
             "curves": [{"mnemonic", "unit", "description", "n_null", "min", "max"}, ...],
             "header": {MNEM: {"section", "unit", "value", "description"}, ...},
             "roles": {role: {"mnemonic": str|None, "reason": str,
                              "candidates": [mnemonics when ambiguous], "aliases_tried": [aliases]}},
             "datum": {"elevation_m", "source", "notes", "error"},
             "warnings": [...]}

        ``start``/``stop``/``step`` are in the file's depth unit (step 0 when the
        sampling is irregular); min/max are None for an all-null curve. ``roles``
        says per role which curve was taken and why (an ambiguous permeability
        lists its candidates instead); ``datum`` the elevation of the log depth
        reference from the header and the item used (or why there is none).

    Raises
    ------
    InputFileError, DepthError
        As :func:`read_las`.
    """
    well = read_las(path)
    curves = []
    for c in well.curves.values():
        finite = c.data[np.isfinite(c.data)]
        curves.append({
            "mnemonic": c.mnemonic, "unit": c.unit, "description": c.description,
            "n_null": int(c.data.size - finite.size),
            "min": _finite_or_none(finite.min()) if finite.size else None,
            "max": _finite_or_none(finite.max()) if finite.size else None,
        })
    index = well.curves[well.index_mnemonic].data
    header: dict[str, dict] = {}
    for section, items in (("well", well.well_header), ("parameter", well.parameters)):
        for key, it in items.items():
            if it.mnemonic.upper() in _INTERESTING_ITEMS and it.mnemonic.upper() not in header:
                header[it.mnemonic.upper()] = {"section": section, "unit": it.unit,
                                               "value": plain(it.value),
                                               "description": it.description}
    roles = {role: {"mnemonic": key, "reason": reason, "candidates": cands,
                    "aliases_tried": list(ROLE_ALIASES[role])}
             for role, (key, reason, cands) in explain_roles(well).items()}
    try:
        elevation, source, notes = datum_from_header(well)
        datum = {"elevation_m": elevation, "source": source, "notes": notes, "error": None}
    except InputFileError as exc:
        datum = {"elevation_m": None, "source": None, "notes": [], "error": exc.what}
    return {
        "path": str(well.source),
        "well": well.name,
        "version": well.version,
        "n_samples": well.n_samples,
        "depth": {"mnemonic": well.index_mnemonic,
                  "start": float(index[0]), "stop": float(index[-1]),
                  "step": depth_step(index, decimals_for(index, MAX_DECIMALS)),
                  "unit": well.depth_unit,
                  "start_m": float(well.md[0]), "stop_m": float(well.md[-1])},
        "null_value": well.null_value,
        "curves": curves,
        "header": header,
        "roles": roles,
        "datum": datum,
        "warnings": list(well.warnings),
    }
