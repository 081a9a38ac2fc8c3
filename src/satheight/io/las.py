"""LAS well-log files: read into a :class:`~satheight.well.Well`, write LAS 2.0.

Reading goes through the ``lasio`` library, kept behind this module: nothing
outside :mod:`satheight.io` imports it. For speed on large files lasio parses only
the header sections of a plain LAS 1.2/2.0 unwrapped file and the ``~A`` section is
read by pandas' C parser (:mod:`satheight.io.las_fast`); any other file is read by
lasio as a whole, with the same result. The reader turns what was parsed into the
tool's own :class:`~satheight.well.Well` and applies the tool's rules:

* the depth index unit must be metres or feet (from the index curve's unit, else
  the unit of the ``~Well`` item ``STRT``); ``Well.md`` is in metres
  (1 ft = 0.3048 m, NIST SP 811);
* the header NULL value and common null codes (-999.25, -999, -9999, -99999, and
  any magnitude >= 1e30) become NaN in every curve except the index; replacing a
  code other than the header NULL is reported in ``Well.warnings``;
* depths must be strictly monotonic: a file whose depths all decrease is reversed
  (reported in ``Well.warnings``); missing, repeated or out-of-order depths raise
  :class:`~satheight.errors.DepthError` naming the data row;
* every problem with the file raises :class:`~satheight.errors.InputFileError`
  naming the file; no lasio or OS exception escapes.

Writing uses the tool's own LAS 2.0 writer (vectorised fixed-point number text,
:func:`satheight.io.las_fast.format_fixed`), through :mod:`satheight.io.atomic`. Every input curve is written back with
enough decimals that its values read back exactly.
"""

from __future__ import annotations

import io
import logging
import math
import re
from contextlib import contextmanager
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Iterable, Iterator, Mapping, Sequence

import numpy as np

from .. import units
from ..errors import DepthError, InputFileError, SatHeightError
from ..roles import ROLE_ALIASES, detect_roles
from ..well import Curve, HeaderItem, Well
from .atomic import atomic_open

__all__ = ["read_las", "write_las", "describe_las", "EXTRA_NULL_CODES", "HUGE_NULL"]

#: Null codes replaced by NaN besides the file's own NULL value (common practice).
EXTRA_NULL_CODES: tuple[float, ...] = (-999.25, -999.0, -9999.0, -99999.0)

#: Values of at least this magnitude are taken as nulls (common practice).
HUGE_NULL = 1e30

#: Largest number of decimals the writer uses for an input curve.
MAX_DECIMALS = 10

#: Largest number of decimals chosen automatically for a new curve.
NEW_CURVE_MAX_DECIMALS = 6

_METRE_UNITS = frozenset({"m", "meter", "meters", "metre", "metres"})
_FOOT_UNITS = frozenset({"f", "ft", "feet", "foot"})

# ~Well items the writer keeps in step with the data it writes.
_DEPTH_ITEMS = ("STRT", "STOP", "STEP")

# Header items shown by describe_las when present (~Well and ~Parameter).
_INTERESTING_ITEMS = ("WELL", "COMP", "FLD", "LOC", "CTRY", "STAT", "PROV", "CNTY", "SRVC",
                      "DATE", "UWI", "API", "LIC", "EKB", "EDF", "EGL", "EREF", "ELEV", "APD",
                      "PDAT", "LMF", "DMF", "TDD", "TDL")

# A header or curve mnemonic the writer can put in a LAS 2.0 line.
_MNEMONIC_OK = re.compile(r"^[^\s.:~#]+$")
# lasio renames repeated mnemonics GR, GR -> GR:1, GR:2.
_DUPLICATE_SUFFIX = re.compile(r"^(.+):(\d+)$")

_HINT_LAS = ("check that it is a LAS 1.2 or 2.0 text file; open it in a text editor and "
             "look at the line named")


# ---------------------------------------------------------------------------
# Reading
# ---------------------------------------------------------------------------

@dataclass
class _RawLas:
    """What a parser hands over: header items and raw data columns, file order."""

    version: str
    well_items: list[HeaderItem]
    param_items: list[HeaderItem]
    curve_defs: list[tuple[str, str, str, str]]   # (unique mnemonic, unit, description, value)
    columns: list[np.ndarray]                # one per curve, any dtype, same length
    other: str
    messages: list[str] = field(default_factory=list)
    owned: bool = False                      # columns are fresh arrays nobody else holds


class _ListHandler(logging.Handler):
    """Collects log records of lasio so the library never prints them."""

    def __init__(self) -> None:
        super().__init__(level=logging.WARNING)
        self.messages: list[str] = []

    def emit(self, record: logging.LogRecord) -> None:
        self.messages.append(record.getMessage())


@contextmanager
def _lasio_messages() -> Iterator[list[str]]:
    """Catch lasio's warnings (it logs them) into a list for ``Well.warnings``."""
    logger = logging.getLogger("lasio")
    handler = _ListHandler()
    logger.addHandler(handler)
    try:
        yield handler.messages
    finally:
        logger.removeHandler(handler)


def _plain(value: Any) -> Any:
    """numpy scalars to Python scalars, ``None`` to ``""``."""
    if value is None:
        return ""
    if isinstance(value, np.generic):
        return value.item()
    return value


def _num(x: float) -> str:
    """Shortest text of a float without an exponent (``1000.25``, ``-999``)."""
    return np.format_float_positional(float(x), trim="-")


def _decode(raw: bytes) -> str:
    """Text of LAS bytes: UTF-8 (a leading byte-order mark dropped), else Latin-1.

    Old Mac (CR only) and Windows (CRLF) line ends are turned into LF.
    """
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        text = raw.decode("latin-1")
    if "\r" in text:
        text = text.replace("\r\n", "\n").replace("\r", "\n")
    return text


def _read_bytes(path: Path) -> bytes:
    """The file's bytes, or an InputFileError saying why they cannot be read as LAS text."""
    if not path.exists():
        raise InputFileError("file not found", where=str(path),
                             hint="check the file name and folder (a relative path is taken from "
                                  "the folder of the project file)")
    if path.is_dir():
        raise InputFileError("is a folder, not a LAS file", where=str(path),
                             hint="give the path of the .las file itself")
    try:
        raw = path.read_bytes()
    except OSError as exc:
        raise InputFileError(f"cannot read the file: {exc.strerror or exc}", where=str(path),
                             hint="check that the file is readable by you") from exc
    if b"\x00" in raw:
        raise InputFileError("the file holds binary data, not LAS text", where=str(path),
                             hint="give a LAS 1.2 or 2.0 text file")
    return raw


def _lasio_error_text(exc: Exception) -> str:
    """One informative line from a lasio exception (some carry a whole traceback)."""
    if isinstance(exc, KeyError) and exc.args:
        text = str(exc.args[0])
    else:
        text = str(exc)
    lines = [ln.strip() for ln in text.strip().splitlines() if ln.strip()]
    return lines[-1] if lines else type(exc).__name__


def _parse_with_lasio(path: Path, text: str) -> _RawLas:
    """Parse LAS text with lasio into a :class:`_RawLas` (the only lasio call)."""
    import lasio  # kept local: lasio is an implementation detail of this module

    with _lasio_messages() as messages:
        try:
            las = lasio.read(io.StringIO(text), mnemonic_case="preserve", engine="normal")
        except Exception as exc:  # lasio raises KeyError, ValueError, LASHeaderError...
            raise _located_error(path, text, exc) from exc
    return _raw_from_lasio(path, las, [np.asarray(c.data) for c in las.curves], messages, text)


def _raw_from_lasio(path: Path, las, columns: list[np.ndarray], messages: list[str],
                    text: str) -> _RawLas:
    """A :class:`_RawLas` from lasio's header objects and the given data columns.

    ``text`` is the file's text (at least up to the ``~A`` line): header values
    lasio would change (well names, identifiers with leading zeros) are kept as written.
    """

    def items(section, letter) -> list[HeaderItem]:
        raw_values = _raw_header_values(text, letter, las12=(letter == "W" and
                                                             str(_plain(las.version["VERS"].value)
                                                                 if "VERS" in las.version else "")
                                                             .startswith("1")))
        return [HeaderItem(it.mnemonic, str(it.unit or ""),
                           _keep_text(it.mnemonic, _plain(it.value), raw_values),
                           str(it.descr or ""))
                for it in section]

    version = "2.0"
    for it in las.version:
        if it.mnemonic.upper() == "VERS":
            v = _plain(it.value)
            version = str(float(v)) if isinstance(v, (int, float)) else str(v)
    curve_defs = [(c.mnemonic, str(c.unit or ""), str(c.descr or ""),
                   "" if c.value is None else str(c.value)) for c in las.curves]
    other = las.other if isinstance(las.other, str) else ""
    keep = [m for m in messages if not m.startswith("Could not convert curve")]
    no_data = [m for m in keep if "but there is no data in ~A" in m]
    if no_data and any(np.asarray(c.data).size for c in las.curves):                         # robustness: lasio would fill the curve with NaN
        raise InputFileError(f"the ~A section has fewer columns than the ~Curve section has "
                             f"curves ({no_data[0]})", where=str(path),
                             hint="every ~A row needs one value per ~Curve line; for wrapped "
                                  "data (WRAP YES) put the depth alone on the first line of "
                                  "each row")
    return _RawLas(version, items(las.well, "W"), items(las.params, "P"), curve_defs, columns, other,
                   [f"{path}: LAS reader: {m}" for m in keep])


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
        warnings.append(_text_warning(path, mnemonic, int(bad.sum()), str(text[first]), first + 1))
    return values


def _text_warning(path: Path, mnemonic: str, count: int, first_text: str, first_row: int) -> str:
    """Warning for entries of a curve that are not numbers (read as null)."""
    return (f"{path}: curve {mnemonic!r} has {count} entries that are not numbers "
            f"(first {first_text!r} at data row {first_row}); read as null")


def _index_unit(path: Path, mnemonic: str, curve_unit: str, strt_unit: str) -> str:
    """``"m"`` or ``"ft"`` from the index curve unit, else the STRT unit."""
    given = curve_unit.strip() or strt_unit.strip()
    u = units.normalise_unit(given)
    if u in _METRE_UNITS:
        return "m"
    if u in _FOOT_UNITS:
        return "ft"
    if not u:
        raise InputFileError(f"the depth index {mnemonic!r} has no unit (neither the ~Curve line "
                             "nor STRT in ~Well gives one)", where=str(path),
                             hint=f"write the unit after the dot, e.g. '{mnemonic}.M' or "
                                  f"'{mnemonic}.FT' in the ~Curve section")
    raise InputFileError(f"unknown depth unit {given!r} of index curve {mnemonic!r}",
                         where=str(path), hint="the depth index must be in M (metres) or FT (feet)")


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
    labels = [f"{_num(code)}" for code in EXTRA_NULL_CODES if code != header_null]
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
    null_text = _num(header_null) if header_null is not None else "not given"
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
    depth, before = _num(index[bad + 1]), _num(index[bad])
    if step[bad] == 0:
        what = f"depth {depth} at data row {row} repeats the depth of data row {row - 1}"
    else:
        what = (f"depths are out of order: depth {depth} at data row {row} follows {before} "
                f"at data row {row - 1}")
    raise DepthError(what, where=str(path), hint=hint)


def _build_well(path: Path, raw: _RawLas) -> Well:
    """Apply the tool's rules (units, nulls, depth order) to parsed LAS content."""
    if not raw.curve_defs or not raw.columns:
        raise InputFileError("no curves found (the ~Curve section is missing or empty)",
                             where=str(path), hint=_HINT_LAS)
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
    depth_unit = _index_unit(path, index_mnemonic, index_curve_unit, strt.unit if strt else "")

    header_null = _null_of(_header_lookup(raw.well_items, "NULL"))
    rest = columns[1:]
    warnings += _replace_nulls(rest, names[1:], header_null, path)
    columns = [columns[0]] + rest

    if _check_depths(columns[0], index_mnemonic, path):
        columns = [c[::-1].copy() for c in columns]
        warnings.append(f"{path}: depths decrease down the file; all rows were reversed so that "
                        f"depth increases ({_num(columns[0][0])} to {_num(columns[0][-1])} "
                        f"{depth_unit})")
    md = np.asarray(units.to_si(columns[0], depth_unit, "length"), dtype=np.float64)

    curves = {name: Curve(name, unit, descr, col, value)
              for (name, unit, descr, value), col in zip(raw.curve_defs, columns)}
    well_item = _header_lookup(raw.well_items, "WELL")
    name = str(well_item.value).strip() if well_item is not None else ""
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


# --- robustness checks: damaged files fail here with a line number, before lasio --

# A section title line: "~" as the first non-blank character of a line.
_SECTION_LINE = re.compile(r"^[ \t]*~(\S?)", re.M)
# The VERS item of the ~Version section, e.g. "VERS.   2.0 : ..."
_VERS_LINE = re.compile(r"^[ \t]*VERS[ \t]*\.[^\s]*[ \t]+([0-9]+(?:\.[0-9]*)?)", re.M | re.I)
# lasio's message when the data do not fill whole rows.
_RESHAPE = re.compile(r"into (\d+) columns")
# Sections a LAS file may hold only once (first letter of the title).
_SINGLE_SECTIONS = {"V": "~Version", "W": "~Well", "C": "~Curve", "P": "~Parameter",
                    "A": "~A (data)"}


# A ~Curve line whose mnemonic is DLM (inside the ~Curve section: see _check_structure).
_RESERVED_CURVE = re.compile(r"^[ \t]*~C[^\n]*\n(?:(?![ \t]*~)[^\n]*\n)*?[ \t]*(DLM)[ \t]*\.",
                             re.M | re.I)


def _line_of(text: str, pos: int) -> int:
    """1-based line number of character offset ``pos`` in ``text``."""
    return text.count("\n", 0, pos) + 1


def _check_structure(path: Path, text: str) -> None:
    """Refuse LAS 3.0 files and repeated sections, naming the line.

    lasio reads a second ``~Curve`` or ``~A`` section over the first one, and
    reads LAS 3.0 comma-separated data as if it were LAS 2.0; both would load
    wrong values silently.
    """
    m = _VERS_LINE.search(text)
    if m:
        try:
            version = float(m.group(1))
        except ValueError:
            version = 0.0
        if version >= 3.0:
            raise InputFileError(f"LAS version {m.group(1)} is not supported",
                                 where=f"{path}, line {_line_of(text, m.start())}",
                                 hint="save the file as LAS 2.0 (or 1.2) from the program "
                                      "that wrote it")
    dlm = _RESERVED_CURVE.search(text)
    if dlm:
        raise InputFileError("a curve is named DLM, which the LAS reader takes for the LAS 3.0 "
                             "delimiter item", where=f"{path}, line {_line_of(text, dlm.start(1))}",
                             hint="rename that curve (e.g. DLM_1) in the ~Curve section")
    seen: dict[str, int] = {}
    for sm in _SECTION_LINE.finditer(text):
        letter = sm.group(1).upper()
        if letter not in _SINGLE_SECTIONS:
            continue
        line = _line_of(text, sm.start())
        if letter in seen:
            raise InputFileError(
                f"section {_SINGLE_SECTIONS[letter]} appears twice (lines {seen[letter]} and "
                f"{line}); the second would hide the first", where=f"{path}, line {line}",
                hint="keep one section of each kind; merge or remove the other")
        seen[letter] = line


def _located_error(path: Path, text: str, exc: Exception) -> InputFileError:
    """An InputFileError for a lasio failure, naming the first bad data line when it can."""
    what = f"cannot read as LAS: {_lasio_error_text(exc)}"
    m = _RESHAPE.search(str(exc))
    if m:
        ncols = int(m.group(1))
        line, count = _bad_data_line(text, ncols)
        if line is not None:
            return InputFileError(
                f"data line has {count} values but the ~Curve section defines {ncols} curves",
                where=f"{path}, line {line}",
                hint="every ~A row needs one value per ~Curve line; fix or remove that row "
                     "(a truncated file ends in a short row)")
        return InputFileError(f"the ~A data do not fill whole rows of {ncols} values (wrapped "
                              "data with a value missing or extra)", where=str(path),
                              hint="check the ~A section; every depth needs one value per "
                                   "~Curve line")
    return InputFileError(what, where=str(path), hint=_HINT_LAS)


def _bad_data_line(text: str, ncols: int) -> tuple[int | None, int]:
    """(line number, value count) of the first unwrapped ~A row without ``ncols`` values.

    Only used on the error path. Returns ``(None, 0)`` for wrapped files
    (WRAP YES) or when no single row is at fault.
    """
    if re.search(r"^[ \t]*WRAP[ \t]*\.[^\s]*[ \t]+YES", text, re.M | re.I):
        return None, 0
    sm = None
    for sm in _SECTION_LINE.finditer(text):
        if sm.group(1).upper() == "A":
            break
    else:
        return None, 0
    start = text.find("\n", sm.start())
    if start < 0:
        return None, 0
    first_line = _line_of(text, start) + 1
    for i, raw in enumerate(text[start + 1:].split("\n")):
        s = raw.strip()
        if not s or s.startswith("#"):
            continue
        count = len(s.split())
        if count != ncols:
            return first_line + i, count
    return None, 0


# A header item line: MNEM.UNIT  VALUE : DESCRIPTION (value up to the last colon).
_ITEM_LINE = re.compile(r"^[ \t]*([^.#~\s][^.\n]*?)[ \t]*\.(\S*)[ \t]+([^\n]*):([^:\n]*)$", re.M)
# An identifier that looks like a number but is not one (leading zero: 007, 0012345).
_LEADING_ZERO = re.compile(r"[+-]?0\d+")


def _raw_header_values(text: str, letter: str, las12: bool = False) -> dict[str, str]:
    """Value text of each item of the header section titled ``~<letter>...``, as written.

    lasio turns header values into numbers ("007" -> 7, "1E5" -> 100000.0); the
    well name and identifiers with leading zeros are kept as written instead.
    """
    out: dict[str, str] = {}
    sections = list(_SECTION_LINE.finditer(text))
    for i, sm in enumerate(sections):
        if sm.group(1).upper() == "A":
            break
        if sm.group(1).upper() != letter:
            continue
        end = sections[i + 1].start() if i + 1 < len(sections) else len(text)
        for im in _ITEM_LINE.finditer(text, sm.end(), end):
            mn = im.group(1).strip()
            # LAS 1.2 ~Well items other than the depth range and NULL carry their value
            # after the colon (lasio reads them so)
            late = las12 and mn.upper() not in ("STRT", "STOP", "STEP", "NULL")
            out.setdefault(mn, im.group(4 if late else 3).strip())
    return out


def _keep_text(mnemonic: str, value: Any, raw_values: Mapping[str, str]) -> Any:
    """The header value, or its text as written when lasio's number would change it."""
    if not isinstance(value, (int, float)) or isinstance(value, bool):
        return value
    raw = raw_values.get(mnemonic)
    if raw is None or not raw:
        return value
    if mnemonic.upper() == "WELL" or _LEADING_ZERO.fullmatch(raw):
        return raw
    return value


def read_las(path, engine: str = "auto") -> Well:
    """Read a LAS 1.2 or 2.0 file into a :class:`~satheight.well.Well`.

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
        If the file is missing, unreadable, not LAS, has no curves or data, or its
        depth unit is not metres or feet.
    DepthError
        If a depth is missing, repeated or out of order (names the data row).
    """
    path = Path(path)
    if engine not in ("auto", "lasio"):
        raise SatHeightError(f"unknown LAS reading engine {engine!r}", where="read_las",
                             hint="use engine='auto' or engine='lasio'")
    data = _read_bytes(path)
    parsed = _parse_fast(path, data) if engine == "auto" else None
    if parsed is None:
        text = _decode(data)
        del data
        _check_structure(path, text)
        parsed = _parse_with_lasio(path, text)
    else:
        del data
    return _build_well(path, parsed)


# Header items that make the fast path step aside (lasio handles them).
_FAST_VERSIONS = (1.2, 2.0)


def _parse_fast(path: Path, data: bytes) -> _RawLas | None:
    """Header with lasio, ``~A`` with pandas; None when the file is not plain enough.

    Returns None (the caller then reads the whole file with lasio) for: no ``~A``
    line, more than one data section or LAS 3.0 sections, VERS other than 1.2 or
    2.0, WRAP other than NO, a DLM item, and every data-section case
    :func:`satheight.io.las_fast.parse_data_section` declines.
    """
    import lasio

    from . import las_fast

    found = las_fast.split_data_section(data)
    if found is None:
        return None
    start, end = found
    header_text = _decode(data[:end])             # the header sections and the ~A line
    _check_structure(path, header_text)
    for line in _decode(data[:start]).split("\n"):   # every line before the ~A line
        t = line.strip()
        if t.startswith("~") and (t[:2] == "~A" or "_Data" in t or "~Log_" in t):
            return None
    # the quick checks now; the byte checks and token count run beside the parser
    scan = las_fast.scan_data_section(data, end, count=False)
    if scan is None:
        return None
    with _lasio_messages() as messages:
        try:
            las = lasio.read(io.StringIO(header_text), mnemonic_case="preserve", engine="normal",
                             ignore_data=True)
        except Exception:  # noqa: BLE001 - the lasio path reports the problem
            return None
    items = [it for sect in (las.version, las.well, las.params) for it in sect]
    vers = next((_plain(it.value) for it in las.version if it.mnemonic.upper() == "VERS"), None)
    wrap = next((_plain(it.value) for it in las.version if it.mnemonic.upper() == "WRAP"), None)
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
    raw = _raw_from_lasio(path, las, block, messages, header_text)
    raw.owned = True
    names = [d[0] for d in raw.curve_defs]
    raw.messages += [_text_warning(path, names[t.column], t.count, t.first_text, t.first_row)
                     for t in texts]
    return raw


# ---------------------------------------------------------------------------
# Writing
# ---------------------------------------------------------------------------

def _decimals_for(values: np.ndarray, cap: int) -> int:
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
    from .las_fast import format_fixed

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
        f.write(buf.tobytes().decode("ascii"))


def _file_mnemonic(key: str, all_keys: Sequence[str]) -> str:
    """Mnemonic to write: lasio's ``GR:2`` back to ``GR`` when ``GR`` was repeated."""
    m = _DUPLICATE_SUFFIX.match(key)
    if m and sum(1 for k in all_keys if k.startswith(m.group(1) + ":")) > 1:
        return m.group(1)
    return key


def _header_value(value: Any) -> str:
    """Text of a header value; floats without exponent."""
    value = _plain(value)
    if isinstance(value, bool):
        return str(value)
    if isinstance(value, float):
        return _num(value) if math.isfinite(value) else str(value)
    return str(value)


def _header_lines(rows: Sequence[tuple[str, str, str, str]]) -> list[str]:
    """Aligned ``MNEM.UNIT  VALUE : DESCRIPTION`` lines."""
    if not rows:
        return []
    w_m = max(len(r[0]) for r in rows)
    w_u = max(len(r[1]) for r in rows)
    w_v = max(len(r[2]) for r in rows)
    return [f" {m:<{w_m}}.{u:<{w_u}}  {v:<{w_v}} : {_description(d)}".rstrip()
            for m, u, v, d in rows]


def _description(text: str) -> str:
    """Description text safe for a LAS line: one line, no colon.

    A LAS 2.0 header line splits value and description at its last colon, so a
    colon inside a description is written as a semicolon.
    """
    # inner blanks are kept as read (they are the user's text); only line breaks are joined
    return " ".join(str(text).splitlines()).strip().replace(":", ";")


def _depth_step(index: np.ndarray, decimals: int) -> float:
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
    if not math.isfinite(float(null_value)):
        raise _out_error(path, f"null value must be a finite number, got {null_value!r}",
                         "use e.g. -999.25")
    if well.n_samples == 0:
        raise _out_error(path, "the well has no depth samples to write",
                         "read the well from a LAS file with data rows")
    new_curves = list(new_curves)
    new_data = _check_new_curves(path, well, new_curves, decimals)
    for it in parameters:
        if not _MNEMONIC_OK.match(it.mnemonic or "") or any(ch.isspace() for ch in it.unit or ""):
            raise _out_error(path, f"parameter {it.mnemonic!r} (unit {it.unit!r}) cannot be "
                             "written to LAS", "use a mnemonic without blanks, dots or colons "
                             "and a unit without blanks")
    for line in extra_other.splitlines():
        if line.lstrip().startswith("~"):
            raise _out_error(path, "a line of the ~Other text starts with '~'",
                             "'~' at the start of a line opens a LAS section; indent or reword it")

    in_curves = list(well.curves.values())
    in_data = [np.asarray(c.data, dtype=np.float64) for c in in_curves]
    if any(d.size != well.n_samples for d in in_data):
        raise _out_error(path, "the well's curves do not all have one value per depth sample",
                         "this is a program error: report it")
    all_curves = in_curves + new_curves
    all_data = in_data + new_data
    dec = [_decimals_for(d, MAX_DECIMALS) for d in in_data]
    dec += [int(decimals[c.mnemonic]) if c.mnemonic in decimals
            else _decimals_for(d, NEW_CURVE_MAX_DECIMALS) for c, d in zip(new_curves, new_data)]

    null = float(null_value)
    null_text = _num(null)
    for c, d, k in zip(all_curves, all_data, dec):
        if np.any(np.round(d, k) == null):
            raise _out_error(path, f"curve {c.mnemonic!r} has values equal to the null value "
                             f"{null_text}; they would read back as missing",
                             "choose another null_value")

    index = all_data[0]
    index_text = _format_column(index, dec[0], null_text)
    index_unit = in_curves[0].unit or (
        next((it.unit for it in well.well_header.values() if it.mnemonic.upper() == "STRT"), "")
        or well.depth_unit)
    step = _depth_step(index, dec[0])

    keys = list(well.curves)
    lines = ["~Version",
             *_header_lines([("VERS", "", "2.0", "LAS version 2.0"),
                             ("WRAP", "", "NO", "one line per depth sample")]),
             "~Well",
             *_header_lines(_well_rows(well, index_unit, _text_at(index_text, 0),
                                       _text_at(index_text, -1), f"{step:.{dec[0]}f}",
                                       null_text)),
             "~Curve",
             *_header_lines([(_file_mnemonic(c.mnemonic, keys) if i < len(in_curves)
                              else c.mnemonic, c.unit, c.value, c.description)
                             for i, c in enumerate(all_curves)])]
    params = [(_file_mnemonic(k, list(well.parameters)), it.unit, _header_value(it.value),
               it.description) for k, it in well.parameters.items()]
    params += [(it.mnemonic, it.unit, _header_value(it.value), it.description) for it in parameters]
    if params:
        lines += ["~Parameter", *_header_lines(params)]
    other = "\n".join(t.strip("\n") for t in (well.other, extra_other) if t and t.strip())
    if other:
        lines += ["~Other", *other.splitlines()]
    header = "\n".join(lines) + "\n"

    with atomic_open(path, "w", encoding="utf-8", newline="\n") as f:
        f.write(header)
        columns = [index_text] + [_format_column(d, k, null_text)
                                  for d, k in zip(all_data[1:], dec[1:])]
        labels = [_file_mnemonic(c.mnemonic, keys) if i < len(in_curves) else c.mnemonic
                  for i, c in enumerate(all_curves)]
        widths = [max(col.shape[1], len(lab)) for col, lab in zip(columns, labels)]
        widths[0] = max(widths[0], len(labels[0]) + 3)      # room for "~A " before the first label
        f.write("~A" + f"{labels[0]:>{widths[0] - 2}}"
                + "".join(f" {lab:>{w}}" for lab, w in zip(labels[1:], widths[1:])) + "\n")
        _write_rows(f, columns, widths)


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
             "roles": {role: {"mnemonic": str|None, "aliases_tried": [aliases]}},
             "warnings": [...]}

        ``start``/``stop``/``step`` are in the file's depth unit (step 0 when the
        sampling is irregular); min/max are None for an all-null curve.

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
                                               "value": _plain(it.value),
                                               "description": it.description}
    found = detect_roles(well)
    roles = {role: {"mnemonic": found[role], "aliases_tried": list(ROLE_ALIASES[role])}
             for role in ROLE_ALIASES}
    return {
        "path": str(well.source),
        "well": well.name,
        "version": well.version,
        "n_samples": well.n_samples,
        "depth": {"mnemonic": well.index_mnemonic,
                  "start": float(index[0]), "stop": float(index[-1]),
                  "step": _depth_step(index, _decimals_for(index, MAX_DECIMALS)),
                  "unit": well.depth_unit,
                  "start_m": float(well.md[0]), "stop_m": float(well.md[-1])},
        "null_value": well.null_value,
        "curves": curves,
        "header": header,
        "roles": roles,
        "warnings": list(well.warnings),
    }
