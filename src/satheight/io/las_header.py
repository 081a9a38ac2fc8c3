"""LAS header sections and the text checks run before lasio parses a file.

Kept behind :mod:`satheight.io.las`: the one place that calls lasio on a whole
file (:func:`parse_with_lasio`), the record a parser hands over (:class:`RawLas`),
lasio's log messages caught into a list, and the checks on the raw text that
lasio would get wrong silently (repeated sections, LAS 3.0 markers, a curve
named DLM, header values lasio would turn into numbers).
"""

from __future__ import annotations

import io
import logging
import re
from contextlib import contextmanager
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Iterator, Mapping

import numpy as np

from ..errors import InputFileError
from ..well import HeaderItem
from .las_checks import check_regular_file

HINT_LAS = ("check that it is a LAS 1.2 or 2.0 text file; open it in a text editor and "
            "look at the line named")


@dataclass
class RawLas:
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
def lasio_messages() -> Iterator[list[str]]:
    """Catch lasio's warnings (it logs them) into a list for ``Well.warnings``."""
    logger = logging.getLogger("lasio")
    handler = _ListHandler()
    logger.addHandler(handler)
    try:
        yield handler.messages
    finally:
        logger.removeHandler(handler)


def plain(value: Any) -> Any:
    """numpy scalars to Python scalars, ``None`` to ``""``."""
    if value is None:
        return ""
    if isinstance(value, np.generic):
        return value.item()
    return value


def num(x: float) -> str:
    """Shortest text of a float without an exponent (``1000.25``, ``-999``)."""
    return np.format_float_positional(float(x), trim="-")


def decode(raw: bytes) -> str:
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


def read_bytes(path: Path) -> bytes:
    """The file's bytes, or an InputFileError saying why they cannot be read as LAS text."""
    check_regular_file(path)
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


def parse_with_lasio(path: Path, text: str) -> RawLas:
    """Parse LAS text with lasio into a :class:`RawLas` (the only lasio call)."""
    import lasio  # kept local: lasio is an implementation detail of this module

    with lasio_messages() as messages:
        try:
            las = lasio.read(io.StringIO(text), mnemonic_case="preserve", engine="normal")
        except Exception as exc:  # lasio raises KeyError, ValueError, LASHeaderError...
            raise _located_error(path, text, exc) from exc
    return raw_from_lasio(path, las, [np.asarray(c.data) for c in las.curves], messages, text)


def raw_from_lasio(path: Path, las, columns: list[np.ndarray], messages: list[str],
                    text: str) -> RawLas:
    """A :class:`RawLas` from lasio's header objects and the given data columns.

    ``text`` is the file's text (at least up to the ``~A`` line): header values
    lasio would change (well names, identifiers with leading zeros) are kept as written.
    """

    def items(section, letter) -> list[HeaderItem]:
        raw_values = _raw_header_values(text, letter, las12=(letter == "W" and
                                                             str(plain(las.version["VERS"].value)
                                                                 if "VERS" in las.version else "")
                                                             .startswith("1")))
        return [HeaderItem(it.mnemonic, str(it.unit or ""),
                           _keep_text(it.mnemonic, plain(it.value), raw_values),
                           str(it.descr or ""))
                for it in section]

    version = ""
    for it in las.version:
        if it.mnemonic.upper() == "VERS":
            v = plain(it.value)
            version = str(float(v)) if isinstance(v, (int, float)) else str(v)
    if not version:
        version = "2.0"
        messages = [*messages, "no VERS item in ~Version: read as LAS 2.0"]
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
    return RawLas(version, items(las.well, "W"), items(las.params, "P"), curve_defs, columns, other,
                   [f"{path}: LAS reader: {m}" for m in keep])




def text_warning(path: Path, mnemonic: str, count: int, first_text: str, first_row: int) -> str:
    """Warning for entries of a curve that are not numbers (read as null)."""
    return (f"{path}: curve {mnemonic!r} has {count} entries that are not numbers "
            f"(first {first_text!r} at data row {first_row}); read as null")



# --- checks on the raw text: small, local, run before lasio ---------------------

# A section title line: "~" as the first non-blank character of a line.
_SECTION_LINE = re.compile(r"^[ \t]*~(\S?)", re.M)
# The VERS item of the ~Version section, e.g. "VERS.   2.0 : ..."
_VERS_LINE = re.compile(r"^[ \t]*VERS[ \t]*\.[^\s]*[ \t]+([0-9]+(?:\.[0-9]*)?)", re.M | re.I)
# lasio's message when the data do not fill whole rows.
_RESHAPE = re.compile(r"into (\d+) columns")
# Sections a LAS file may hold only once (first letter of the title).
_SINGLE_SECTIONS = {"V": "~Version", "W": "~Well", "C": "~Curve", "P": "~Parameter",
                    "A": "~A (data)"}


# A ~Curve line whose mnemonic is DLM (inside the ~Curve section: see check_structure).
_RESERVED_CURVE = re.compile(r"^[ \t]*~C[^\n]*\n(?:(?![ \t]*~)[^\n]*\n)*?[ \t]*(DLM)[ \t]*\.",
                             re.M | re.I)


def _line_of(text: str, pos: int) -> int:
    """1-based line number of character offset ``pos`` in ``text``."""
    return text.count("\n", 0, pos) + 1


def check_structure(path: Path, text: str) -> None:
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
    return InputFileError(what, where=str(path), hint=HINT_LAS)


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


