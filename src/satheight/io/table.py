"""Small CSV tables with a header row and units: the shared reader of survey and tops files.

Layout (our own):

* Lines whose first non-blank character is ``#`` are comments; blank lines are skipped.
* The first other line is the header: comma-separated column names. A name may
  carry its unit in square brackets or parentheses: ``MD [m]``, ``INC (deg)``.
* Optionally the next line is a units row: when none of its cells is a number and
  at least one is not empty, it gives the unit of each column (``m,deg,deg``).
  A unit in the header wins over the units row.
* Column names are matched case-insensitively, surrounding blanks ignored.
"""

from __future__ import annotations

import csv
import re
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from ..errors import InputFileError

_NAME_UNIT = re.compile(r"^\s*(.*?)\s*(?:\[(.*?)\]|\((.*?)\))\s*$")
_NUMBER = re.compile(r"^\s*[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?\s*$")


@dataclass
class Table:
    """Text cells of a CSV table.

    Attributes
    ----------
    path : pathlib.Path
    names : list[str]
        Column names, upper case, units removed.
    units : list[str]
        Unit text of each column ('' if none given).
    rows : list[list[str]]
        Cells of each data row (padded with '' to the header length).
    lines : numpy.ndarray of int
        File line number (1-based) of each data row, for messages.
    header_line : int
        File line number of the header.
    """

    path: Path
    names: list[str]
    units: list[str]
    rows: list[list[str]]
    lines: np.ndarray
    header_line: int
    original: list[str] = field(default_factory=list)

    def find(self, aliases) -> int | None:
        """Index of the first column whose name is one of ``aliases`` (upper case), else None."""
        for a in aliases:
            if a in self.names:
                return self.names.index(a)
        return None

    def column(self, i: int) -> list[str]:
        return [r[i] for r in self.rows]

    def numbers(self, i: int, allow_blank: bool = False) -> np.ndarray:
        """Column ``i`` as float64; an unreadable cell raises naming the file, line and column.

        Blank cells give NaN when ``allow_blank``, else an error.
        """
        cells = np.array([c.strip() for c in self.column(i)], dtype=object)
        blank = cells == ""
        ok = np.array([bool(_NUMBER.match(c)) for c in cells], dtype=bool) if cells.size else blank
        bad = ~ok & ~(blank & allow_blank)
        if np.any(bad):
            k = int(np.argmax(bad))
            what = "is empty" if blank[k] else f"holds {cells[k]!r}, not a number"
            raise InputFileError(f"column {self.original[i]!r} {what}",
                                 where=f"{self.path}, line {int(self.lines[k])}",
                                 hint="write a plain number such as 1234.5")
        out = np.full(cells.size, np.nan)
        out[ok] = np.array([float(c) for c in cells[ok]], dtype=float)
        huge = np.isinf(out)
        if np.any(huge):
            k = int(np.argmax(huge))
            raise InputFileError(f"column {self.original[i]!r} holds {cells[k]!r}, too large a number",
                                 where=f"{self.path}, line {int(self.lines[k])}",
                                 hint="write a number below 1e308")
        return out

    def first_number(self, i: int) -> float:
        """Column ``i`` on the first data row only (the other rows are not read); errors as
        :meth:`numbers`; a blank cell gives NaN."""
        first = Table(self.path, self.names, self.units, self.rows[:1], self.lines[:1],
                      self.header_line, self.original)
        return float(first.numbers(i, allow_blank=True)[0])


def read_csv_text(path, what: str) -> str:
    """Text of a UTF-8 CSV file (a byte-order mark dropped), only read.

    ``what`` names the kind of file in messages (``"survey"``, ``"pressure"``).
    A missing, unreadable or non-UTF-8 file raises :class:`InputFileError` naming it.
    """
    p = Path(path)
    try:
        return p.read_bytes().decode("utf-8-sig")
    except FileNotFoundError:
        raise InputFileError(f"{what} file not found", where=str(p),
                             hint="check the path (relative paths are relative to the project file)") from None
    except UnicodeDecodeError as exc:
        raise InputFileError(f"the {what} file is not UTF-8 text (bad byte at offset {exc.start})",
                             where=str(p), hint="save it as UTF-8 CSV") from None
    except OSError as exc:
        raise InputFileError(f"cannot read the {what} file: {exc.strerror or exc}", where=str(p),
                             hint="check that it is a readable file") from None


def csv_cells(line: str, where: str) -> list[str]:
    """Cells of one CSV line; a line the csv module refuses is an error naming ``where``."""
    try:
        return next(csv.reader([line]), [])
    except csv.Error as exc:
        raise InputFileError(f"cannot read the line as CSV: {exc}", where=where,
                             hint="check quotes and very long cells") from None


def parse_number(text: str, what: str, where: str) -> float:
    """One CSV cell as a finite float, for readers that go row by row.

    ``what`` starts the message (``"column 'pc':"``, ``"porosity"``), ``where`` names
    the file and line. Text, ``nan``/``inf`` and Python-only spellings such as
    ``1_000`` raise :class:`InputFileError`.
    """
    try:
        if "_" in text:                      # Python reads "1_000" as 1000; a CSV number has no "_"
            raise ValueError(text)
        v = float(text)
    except ValueError:
        raise InputFileError(f"{what} {text!r} is not a number", where=where,
                             hint="write a plain number; the unit goes in the column header") from None
    if not np.isfinite(v):
        raise InputFileError(f"{what} {text!r} is not a finite number", where=where)
    return v


def read_table(path, what: str) -> Table:
    """Read a CSV table with a header row (see the module docstring).

    Parameters
    ----------
    path : str or pathlib.Path
        The file; only read.
    what : str
        What the file is (``"survey"``, ``"tops"``), for messages.

    Raises
    ------
    InputFileError
        Missing, unreadable or non-UTF-8 file; no header; no data rows.
    """
    p = Path(path)
    text = read_csv_text(p, what)
    raw_lines = text.splitlines()
    kept = [(n, ln) for n, ln in enumerate(raw_lines, start=1)
            if ln.strip() and not ln.lstrip().startswith("#")]
    if not kept:
        raise InputFileError(f"the {what} file has no header row", where=str(p),
                             hint="the first line that is not a comment names the columns")
    cells = [csv_cells(ln, f"{p}, line {n}") for n, ln in kept]   # one row per line, whatever the quotes
    numbers = [n for n, _ in kept]
    header_line = numbers[0]
    original = [c.strip() for c in cells[0]]
    names, units = [], []
    for c in original:
        m = _NAME_UNIT.match(c)
        if m:
            names.append(m.group(1).upper())
            units.append((m.group(2) if m.group(2) is not None else m.group(3)).strip())
        else:
            names.append(c.upper())
            units.append("")
    width = len(names)
    rows = [r + [""] * (width - len(r)) for r in cells[1:]]
    lines = numbers[1:]
    if rows and not any(_NUMBER.match(c) for c in rows[0]) and any(c.strip() for c in rows[0]):
        units = [u or r.strip() for u, r in zip(units, rows[0][:width])]
        rows, lines = rows[1:], lines[1:]
    long_rows = [ln for r, ln in zip(rows, lines) if len(r) > width and any(c.strip() for c in r[width:])]
    if long_rows:
        raise InputFileError(f"a row has more values than the header has columns ({width})",
                             where=f"{p}, line {long_rows[0]}",
                             hint="give every column a name in the header row, or remove the extra values")
    if not rows:
        raise InputFileError(f"the {what} file has a header but no data rows", where=str(p),
                             hint="add one row per entry below the header")
    return Table(path=p, names=names, units=units, rows=[r[:width] for r in rows],
                 lines=np.asarray(lines, dtype=int), header_line=header_line, original=original)
