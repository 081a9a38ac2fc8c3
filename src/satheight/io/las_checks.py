"""Checks on a LAS file's bytes and text that run before any parser sees them.

Each check refuses, with the line named, what a parser would otherwise read
wrongly without a word, or read for minutes:

* :func:`check_regular_file`: a device, a named pipe or a socket given as a LAS
  path is refused before it is opened (``/dev/zero`` never ends; a pipe blocks);
  a symbolic-link loop is named as such;
* :func:`check_header_lines`: a header line longer than :data:`MAX_HEADER_LINE`
  characters (lasio's header parser does quadratic work on it);
* :func:`check_data_rows`: every data line of an unwrapped ``~A`` section holds one
  value per ``~Curve`` line (lasio would re-flow a long row into the next short
  one, or shift every column when the ``~Curve`` section lacks a line); a wrapped
  section (``WRAP YES``) holds the depth alone on the first line of each row and
  no line crosses into the next row; no number is written with a decimal comma
  (``1,500``), which lasio reads as ``1.5``, and no two numbers run together
  (``12-5``, ``1.2.3``), which lasio splits into two values.

The counts are vectorised over the bytes of the data section (numpy); only lines
holding quoted text are looked at one by one.
"""

from __future__ import annotations

import errno
import os
import re
import stat
from pathlib import Path

import numpy as np

from ..errors import InputFileError

__all__ = ["check_regular_file", "check_header_lines", "check_data_rows", "check_data_lines",
           "MAX_HEADER_LINE"]

#: Longest header line accepted [characters]. LAS 2.0 header lines are short (a
#: mnemonic, a unit, a value and a description); 64 Ki characters leaves room for any
#: long description or ~Other paragraph (common practice).
MAX_HEADER_LINE = 1 << 16

# a digit, a comma, a digit: a decimal comma (1,500) or comma-separated values
_DECIMAL_COMMA = re.compile(r"\d,\d")
# numbers run together (12-5, 1.2.3, NaN-1): lasio splits them into two values
_RUN_ON = re.compile(r"\d-\d|\d\.\d*\.|\.\d+\.|NaN[.-]\d", re.I)
# a token of a data line as lasio splits it: quoted text stays one token
_TOKEN = re.compile(r'"[^"\n]*"|\S+')


def _line_of(text: str, pos: int) -> int:
    return text.count("\n", 0, pos) + 1


def check_regular_file(path: Path) -> None:
    """Refuse a path that is not a regular file (device, pipe, socket, link loop, folder).

    Raises
    ------
    InputFileError
        Naming the path and what it is instead.
    """
    try:
        st = os.stat(path)
    except OSError as exc:
        if exc.errno == errno.ELOOP:
            raise InputFileError("symbolic link loop: the path points back to itself",
                                 where=str(path),
                                 hint="replace the link by the path of the LAS file itself") from None
        if exc.errno in (errno.ENOENT, errno.ENOTDIR):
            raise InputFileError("file not found", where=str(path),
                                 hint="check the file name and folder (a relative path is taken "
                                      "from the folder of the project file)") from None
        raise InputFileError(f"cannot read the file: {exc.strerror or exc}", where=str(path),
                             hint="check that the file is readable by you") from None
    if stat.S_ISDIR(st.st_mode):
        raise InputFileError("is a folder, not a LAS file", where=str(path),
                             hint="give the path of the .las file itself")
    if not stat.S_ISREG(st.st_mode):
        kind = ("a named pipe (FIFO)" if stat.S_ISFIFO(st.st_mode)
                else "a device" if stat.S_ISCHR(st.st_mode) or stat.S_ISBLK(st.st_mode)
                else "a socket" if stat.S_ISSOCK(st.st_mode) else "not a regular file")
        raise InputFileError(f"is {kind}, not a regular file; it is not read", where=str(path),
                             hint="save the log as a .las file and give that file's path")


def check_header_lines(path: Path, raw: bytes, end: int) -> None:
    """Refuse a line longer than :data:`MAX_HEADER_LINE` in ``raw[:end]`` (the header).

    ``end`` is the offset of the first data byte (or the file size).
    """
    if end <= MAX_HEADER_LINE:
        return
    b = np.frombuffer(raw, dtype=np.uint8, count=end)
    breaks = np.flatnonzero((b == 10) | (b == 13))
    bounds = np.concatenate(([-1], breaks, [end]))
    lengths = np.diff(bounds) - 1
    long = np.flatnonzero(lengths > MAX_HEADER_LINE)
    if long.size:
        k = int(long[0])
        line = int(np.count_nonzero(b[:bounds[k] + 1] == 10)) + 1 if k else 1
        raise InputFileError(f"line {line} is {int(lengths[k]):,} characters long "
                             f"(at most {MAX_HEADER_LINE:,} are read)",
                             where=f"{path}, line {line}",
                             hint="a LAS header line holds one item (MNEM.UNIT VALUE : "
                                  "DESCRIPTION); the file is damaged or not LAS: open it in a text "
                                  "editor at that line")


def _tokens_per_line(data: str) -> np.ndarray:
    """Whitespace-separated tokens on each line of ``data`` (quoted text one token);
    lines whose first token starts with ``#`` (comments) count -1."""
    raw = data.encode("utf-8", "surrogateescape")
    b = np.frombuffer(raw, dtype=np.uint8)
    n_lines = int(np.count_nonzero(b == 10)) + 1
    if b.size == 0:
        return np.zeros(n_lines, dtype=np.int64)
    line = np.concatenate(([0], np.cumsum(b == 10)[:-1]))
    word = b > 32
    starts = np.flatnonzero(word & ~np.concatenate(([False], word[:-1])))
    counts = np.bincount(line[starts], minlength=n_lines).astype(np.int64)
    first_line, first_at = np.unique(line[starts], return_index=True)
    comment = b[starts[first_at]] == ord("#")
    counts[first_line[comment]] = -1
    if b'"' in raw:
        lines = data.split("\n")
        quoted = np.unique(line[b == ord('"')])
        for i in quoted[counts[quoted] > 0].tolist():        # only the lines holding quotes
            counts[i] = len(_TOKEN.findall(lines[i]))
    return counts


def _token_at(data: str, pos: int) -> str:
    """The blank-separated token of ``data`` holding character ``pos``."""
    return (re.search(r"\S*$", data[:pos + 1]).group(0)
            + re.match(r"\S*", data[pos + 1:]).group(0))


def _fields_per_line(data: str, delimiter: str) -> np.ndarray:
    """Fields between ``delimiter`` on each line (quoted text one field); -1 for blank or
    comment lines."""
    raw = data.encode("utf-8", "surrogateescape")
    b = np.frombuffer(raw, dtype=np.uint8)
    n_lines = int(np.count_nonzero(b == 10)) + 1
    if b.size == 0:
        return np.full(n_lines, -1, dtype=np.int64)
    line = np.concatenate(([0], np.cumsum(b == 10)[:-1]))
    counts = np.bincount(line[b == ord(delimiter)], minlength=n_lines).astype(np.int64) + 1
    word = (b > 32) & (b != ord(delimiter))
    has_word = np.bincount(line[word], minlength=n_lines) > 0
    starts = np.flatnonzero(word)
    first_line, first_at = np.unique(line[starts], return_index=True)
    comment = np.zeros(n_lines, dtype=bool)
    comment[first_line] = b[starts[first_at]] == ord("#")
    counts[~has_word & (counts == 1)] = -1                  # blank line
    counts[comment] = -1
    if b'"' in raw:
        import csv

        lines = data.split("\n")
        quoted = np.unique(line[b == ord('"')])
        for i in quoted[counts[quoted] > 0].tolist():        # only the lines holding quotes
            counts[i] = len(next(csv.reader([lines[i]], delimiter=delimiter, quotechar='"',
                                               skipinitialspace=True)))
    return counts


def _data_span(text: str) -> tuple[int, int] | None:
    """Character offsets (first data character, end) of the ``~A`` section's data."""
    m = re.search(r"^[ \t]*~A[^\n]*(\n|$)", text, re.M)
    if m is None:
        return None
    nxt = re.compile(r"^[ \t]*~", re.M).search(text, m.end())
    return m.end(), (nxt.start() if nxt else len(text))


def check_data_rows(path: Path, text: str, n_curves: int, wrapped: bool) -> None:
    """Refuse data lines that do not hold one value per ``~Curve`` line, and decimal commas.

    Parameters
    ----------
    path : Path
        Named in the error.
    text : str
        The whole file's text (LF line ends).
    n_curves : int
        Number of ``~Curve`` lines (0: no ``~Curve`` section; only the commas are checked).
    wrapped : bool
        ``WRAP YES``: rows are spread over lines, the depth alone on the first.

    Raises
    ------
    InputFileError
        Naming the first line at fault (1-based line of the file).
    """
    span = _data_span(text)
    if span is None:
        return
    start, end = span
    check_data_lines(path, text[start:end], _line_of(text, start), n_curves, wrapped)


def check_data_lines(path: Path, data: str, first_line: int, n_curves: int, wrapped: bool,
                     delimiter: str = " ", definition: str = "~Curve") -> None:
    """:func:`check_data_rows` on the data lines themselves, ``first_line`` the file line of
    the first; ``definition`` the section that defines the curves (named in errors);
    ``delimiter`` ``","`` or ``"\\t"`` for LAS 3.0 delimited data (fields counted
    between delimiters, quoted text one field; commas then not refused)."""
    comma = _DECIMAL_COMMA.search(data) if delimiter != "," else None
    if comma:
        line = first_line + data.count("\n", 0, comma.start())
        token = _token_at(data, comma.start())
        raise InputFileError(f"a number is written with a comma ({token[:40]!r}): a decimal "
                             "comma or comma-separated values, which LAS 2.0 data do not allow",
                             where=f"{path}, line {line}",
                             hint="write numbers with a decimal point (1.5, 1500) and separate "
                                  "values with blanks")
    run_on = _RUN_ON.search(data)
    if run_on:
        line = first_line + data.count("\n", 0, run_on.start())
        raise InputFileError(f"two numbers run together ({_token_at(data, run_on.start())[:40]!r}),"
                             " which would be split into two values", where=f"{path}, line {line}",
                             hint="put a blank between the values, or correct the number")
    if n_curves <= 0:
        return
    counts = _tokens_per_line(data) if delimiter == " " else _fields_per_line(data, delimiter)
    lines = np.flatnonzero(counts > 0)
    c = counts[lines]
    if not wrapped:
        _check_unwrapped(path, c, lines + first_line, n_curves, definition)
    else:
        _check_wrapped(path, c, lines + first_line, n_curves)


def _check_unwrapped(path: Path, c: np.ndarray, line_no: np.ndarray, n: int,
                     definition: str = "~Curve") -> None:
    bad = np.flatnonzero(c != n)
    if bad.size == 0:
        return
    k = int(bad[0])
    if bad.size == c.size and np.all(c == c[0]) and c.size > 1:
        raise InputFileError(
            f"every data line has {int(c[0])} values but the {definition} section defines {n} "
            f"curves: a {definition} line is {'missing' if c[0] > n else 'extra'} and the columns "
            "would shift", where=f"{path}, line {int(line_no[0])}",
            hint=f"give the {definition} section one line per data column, in the order of the "
                 "columns")
    raise InputFileError(
        f"data line has {int(c[k])} values but the {definition} section defines {n} curves",
        where=f"{path}, line {int(line_no[k])}",
        hint=f"every data row needs one value per {definition} line; fix or remove that row (a "
             "truncated file ends in a short row); the file is not read by re-flowing values into "
             "other rows")


def _check_wrapped(path: Path, c: np.ndarray, line_no: np.ndarray, n: int) -> None:
    before = np.concatenate(([0], np.cumsum(c)[:-1]))    # values before each line
    pos = before % n                                     # place in its row of the first value
    starts_row = pos == 0
    bad = np.flatnonzero((starts_row & (c != 1)) | (~starts_row & (pos + c > n)))
    if bad.size:
        k = int(bad[0])
        what = (f"wrapped data line has {int(c[k])} values where a row starts (the depth alone)"
                if starts_row[k] else
                f"wrapped data line has {int(c[k])} values, {int(pos[k] + c[k] - n)} more than "
                f"its row has left of the {n} curves")
        raise InputFileError(what, where=f"{path}, line {int(line_no[k])}",
                             hint="in wrapped data (WRAP YES) each row starts with the depth alone "
                                  "on its line, then exactly one value per other ~Curve line")
    total = int(c.sum())
    if total % n:
        raise InputFileError(f"the wrapped ~A data do not fill whole rows of {n} values (the last "
                             f"row has {total % n})", where=f"{path}, line {int(line_no[-1])}",
                             hint="check the ~A section; every depth needs one value per ~Curve "
                                  "line (a truncated file ends in a short row)")
