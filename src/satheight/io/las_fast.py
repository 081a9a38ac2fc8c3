"""Compiled-speed pieces of LAS input and output: the ``~A`` data section and number text.

Reading a large LAS 2.0 file with lasio costs seconds and hundreds of MB because
lasio splits every line in Python. :mod:`satheight.io.las` therefore keeps lasio
for the header sections only and hands the ``~A`` section to the functions here:

* :func:`split_data_section` finds the ``~A`` line in the raw bytes;
* :func:`scan_data_section` checks, in one vectorised pass over the bytes, that the
  section holds nothing lasio would treat specially (see below), and counts its
  whitespace-separated tokens and comment lines;
* :func:`parse_data_section` reads the numbers with pandas' C parser (one column per
  curve) and returns ``None`` whenever the result could differ from lasio's, so
  the caller falls back to lasio for that file.

For speed :func:`read_las` calls :func:`scan_data_section` with
``count=False`` and :func:`parse_data_section` does the byte checks itself: a
large section is cut at line starts into parts (one per free CPU, see
:func:`_threads`); each part is first scanned (bytes checked, tokens and lines
counted) and then parsed in steps of :data:`ROWS_PER_STEP` rows written straight
into one preallocated float64 array per curve, the parts in threads (numpy and
pandas' tokenizer release the GIL). The result is that of one read in file order.

The fast path takes a data section only when it is plain: ASCII printable
characters, blanks, tabs and line ends (LF or CRLF); no quotes, commas or ``~``;
``#`` only at the start of a line (a whole-line comment, as lasio skips it).
Every line must hold exactly one value per curve: the number of tokens in the
file is compared with rows x curves, so a dropped or short row is never missed.
Text in a numeric column is read as null exactly as the lasio path does, unless
the text is something lasio rewrites (run-on numbers ``1.5-2.3``, ``1.2.3``,
decimal commas), in which case the whole file goes to lasio.

:func:`format_fixed`, :func:`format_general` and :func:`csv_rows` (number text of the
writers) live in :mod:`satheight.io.las_numbers` and are imported here for the
callers that know them under this module.
"""

from __future__ import annotations

import functools
import io
import os
import re
from dataclasses import dataclass

import numpy as np

from .las_numbers import FIXED_MAX, csv_rows, format_fixed, format_general

__all__ = ["split_data_section", "scan_data_section", "parse_data_section", "DataScan",
           "format_fixed", "format_general", "csv_rows", "FIXED_MAX"]

#: Bytes handled per step of the vectorised scan: small enough that the temporaries stay
#: in the CPU cache (256 KB measured twice as fast as 4 MB); bounds the extra memory.
_CHUNK = 1 << 18

#: Token text lasio's default read policy rewrites before splitting a data line
#: (lasio.defaults.READ_SUBS: decimal comma, run-on minus, run-on dots / NaN).
_LASIO_REWRITES = re.compile(r"\d,\d|\d-\d|\d*\.\d*\.|NaN[.-]\d")


def split_data_section(raw: bytes) -> tuple[int, int] | None:
    """Byte offsets ``(start, end)`` of the ``~A`` title line, or None.

    ``start`` is the first byte of the title line and ``end`` the first byte after
    it (the first data byte). None when the file has no ``~A`` line at the start
    of a line, or when a section line starts with other blank characters than
    spaces and tabs (left to lasio).
    """
    pos = 0
    while True:
        k = raw.find(b"~", pos)
        if k < 0:
            return None
        start = raw.rfind(b"\n", 0, k) + 1
        lead = raw[start:k]
        if lead.strip(b" \t") == b"":
            if raw[k:k + 2] == b"~A":
                nl = raw.find(b"\n", k)
                return start, (len(raw) if nl < 0 else nl + 1)
        elif lead.isspace():
            return None
        pos = k + 1


@dataclass
class DataScan:
    """What one pass over the data bytes found."""

    tokens: int | None          # whitespace-separated tokens outside comment lines
    has_comments: bool          # whole-line ``#`` comments present (none indented)
    comment_tokens: int = 0     # tokens inside those comment lines
    checked: bool = True        # False: made with count=False, nothing checked yet


def scan_data_section(raw: bytes, offset: int, count: bool = True) -> DataScan | None:
    """Check and count the data section ``raw[offset:]``; None if it is not plain.

    Plain means: only printable ASCII, blank, tab, LF and CR-LF; no ``~`` (a later
    section), no quotes (lasio joins quoted text into one token), no commas; ``#``
    only as the first character of a line (lasio and pandas both skip such a
    line; an indented or trailing ``#`` is handled differently by the two).

    With ``count=False`` nothing is checked yet and ``tokens`` is None:
    :func:`parse_data_section` then checks the bytes and counts the tokens itself,
    part by part in threads, before it parses them.
    """
    if not count:
        return DataScan(tokens=None, has_comments=False, checked=False)
    for ch in (b"~", b'"', b"'", b","):
        if raw.find(ch, offset) >= 0:
            return None
    comment_tokens = 0
    has_comments = False
    k = raw.find(b"#", offset)
    while k >= 0:
        start = raw.rfind(b"\n", offset, k) + 1 if k > offset else offset
        if start < offset:
            start = offset
        if k != start:                      # '#' not the first character of its line
            return None
        nl = raw.find(b"\n", k)
        end = len(raw) if nl < 0 else nl
        comment_tokens += len(raw[k:end].split())
        has_comments = True
        k = raw.find(b"#", end)
    tokens = _count_tokens(raw, offset, len(raw))
    if tokens is None:
        return None
    return DataScan(tokens=tokens - comment_tokens, has_comments=has_comments,
                    comment_tokens=comment_tokens)


def _count_tokens(raw: bytes, begin: int, end: int) -> int | None:
    """Whitespace-separated tokens in ``raw[begin:end]`` (comment lines included).

    None when a byte is not plain (see :func:`scan_data_section`). ``begin`` must
    be the start of a line.
    """
    found = _scan_part(raw, begin, end)
    return None if found is None else found[0]


def _scan_part(raw: bytes, begin: int, end: int) -> tuple[int, int, bool] | None:
    """``(tokens, lines, hashes)`` of ``raw[begin:end]``, or None when a byte is not plain.

    ``lines`` counts line ends, plus one for a last line without one: no more
    data rows than that can be in the part. ``hashes`` says whether a ``#`` occurs
    (its place is checked by :func:`scan_data_section`). Bytes ``~``, quotes and
    commas make the part not plain. numpy releases the GIL here, so parts of a
    section can be scanned in threads.
    """
    tokens = 0
    lines = 0
    hashes = False
    prev_blank = True
    for s in range(begin, end, _CHUNK):
        c = np.frombuffer(raw, np.uint8, count=min(_CHUNK, end - s), offset=s)
        if int(c.max(initial=0)) > 125:                      # '~' (126), DEL, non-ASCII
            return None
        if np.count_nonzero((c - np.uint8(33)) < 12):        # one of !"#$%&'()*+, here
            piece = raw[s:s + c.size]
            if b'"' in piece or b"'" in piece or b"," in piece:
                return None
            hashes = hashes or b"#" in piece
        n_low = int(np.count_nonzero(c < 32))
        n_lf = int(np.count_nonzero(c == 10))
        lines += n_lf
        if n_low != n_lf:
            n_tab = int(np.count_nonzero(c == 9))
            n_cr = int(np.count_nonzero(c == 13))
            if n_low != n_lf + n_tab + n_cr:
                return None
            if n_cr:
                cr = np.flatnonzero(c == 13)
                last = cr[-1]
                if last == c.size - 1:
                    # CR at the end of a chunk: the LF must start the next chunk
                    if s + c.size >= len(raw) or raw[s + c.size] != 10:
                        return None
                    cr = cr[:-1]
                if np.any(c[cr + 1] != 10):
                    return None
        word = c > 32
        starts = np.count_nonzero(word[1:] > word[:-1])      # blank then non-blank
        tokens += int(starts) + int(bool(word[0]) and prev_blank)
        prev_blank = not bool(word[-1])
    if end > begin and raw[end - 1] != 10:
        lines += 1
    return tokens, lines, hashes


def _lasio_number(token: str) -> tuple[float, bool]:
    """The value lasio gives a token, and whether it counts as text (not a number)."""
    try:
        return float(token), False
    except ValueError:
        return np.nan, True


class _Window(io.RawIOBase):
    """Read-only file over ``raw[begin:end]`` without copying the bytes up front."""

    def __init__(self, raw: bytes, begin: int, end: int) -> None:
        super().__init__()
        self._raw = raw
        self._view = memoryview(raw)
        self._pos = begin
        self._end = end

    def readable(self) -> bool:
        return True

    def read(self, size: int = -1) -> bytes:
        stop = self._end if size is None or size < 0 else min(self._end, self._pos + size)
        out = self._raw[self._pos:stop] if stop > self._pos else b""
        self._pos = max(self._pos, stop)
        return out

    def readinto(self, buf) -> int:
        n = max(0, min(len(buf), self._end - self._pos))
        buf[:n] = self._view[self._pos:self._pos + n]
        self._pos += n
        return n


def _read(raw: bytes, offset: int, n_columns: int, comments: bool, dtype, end: int | None = None):
    import pandas as pd

    if end is None:
        buf = io.BytesIO(raw)          # shares the bytes; no copy of the file
        buf.seek(offset)
    else:
        buf = _Window(raw, offset, end)
    kwargs = dict(sep=r"\s+", header=None, names=list(range(n_columns)), engine="c",
                  na_filter=False, skip_blank_lines=True, comment="#" if comments else None,
                  dtype=dtype)
    if _pandas_before_3_1():
        kwargs["float_precision"] = "round_trip"
    return pd.read_csv(buf, **kwargs)


@functools.cache
def _pandas_before_3_1() -> bool:
    import pandas as pd

    parts = re.findall(r"\d+", pd.__version__)[:2]
    return tuple(int(p) for p in parts) < (3, 1)


@dataclass
class TextReport:
    """Entries of one column that are not numbers (read as null)."""

    column: int
    count: int
    first_text: str
    first_row: int              # 1-based data row


#: Data sections of at least this many bytes are read in parts, one thread per part
#: (pandas' C parser and the numpy byte checks release the GIL).
PARALLEL_MIN_BYTES = 1 << 22

#: Most parts a data section is cut into.
MAX_PARTS = 16

#: Parts per thread (more parts than threads evens out a thread slowed by other work).
PARTS_PER_THREAD = 1


def _threads() -> int:
    """Threads worth using: CPUs this process may run on, less those other work keeps busy.

    The busy CPUs are read from the 1-minute load average (which counts this
    process's own running thread). On a machine whose cores are all busy a second
    thread was measured to slow the read down (it waits for the slower part), so
    it is only used when the load leaves a core free.
    """
    try:
        cpus = max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):
        cpus = os.cpu_count() or 1
    try:
        load = os.getloadavg()[0]
    except (AttributeError, OSError):
        load = 0.0
    return max(1, min(cpus, int(cpus - load + 1.5)))


def _n_parts(size: int) -> int:
    """Number of parts for a data section of ``size`` bytes (1 below PARALLEL_MIN_BYTES)."""
    if size < PARALLEL_MIN_BYTES or _threads() < 2:
        return 1
    return max(1, min(PARTS_PER_THREAD * _threads(), MAX_PARTS, size // (PARALLEL_MIN_BYTES // 2)))


def _cuts(raw: bytes, offset: int, parts: int) -> list[int]:
    """Byte offsets cutting ``raw[offset:]`` into ``parts`` pieces at line starts."""
    cuts = [offset]
    size = len(raw) - offset
    for i in range(1, parts):
        nl = raw.find(b"\n", offset + size * i // parts)
        if nl < 0 or nl + 1 >= len(raw):
            break
        if nl + 1 > cuts[-1]:
            cuts.append(nl + 1)
    cuts.append(len(raw))
    return cuts


#: Rows pandas converts per step (16384: its buffers stay in the CPU cache; measured
#: faster than 4096 or 65536 and more); each step is copied straight into the result
#: columns (no chunk list joined at the end, as one pandas read would do).
ROWS_PER_STEP = 1 << 14


def _read_part(raw: bytes, begin: int, end: int, n_columns: int, comments: bool,
               out: list[np.ndarray], row0: int, capacity: int) -> int | None:
    """Parse ``raw[begin:end]`` into ``out[i][row0:row0 + capacity]``; the rows read.

    None when a step of the parser gives another number of columns or more rows
    than ``capacity``. Raises what pandas raises (ParserError; ValueError for text).
    """
    import pandas as pd

    kwargs = dict(sep=r"\s+", header=None, names=list(range(n_columns)), engine="c",
                  na_filter=False, skip_blank_lines=True, comment="#" if comments else None,
                  dtype=np.float64, chunksize=ROWS_PER_STEP, low_memory=False)
    if _pandas_before_3_1():
        kwargs["float_precision"] = "round_trip"
    from pandas.errors import EmptyDataError

    r = row0
    try:
        reader = pd.read_csv(_Window(raw, begin, end), **kwargs)
    except EmptyDataError:              # only blank or comment lines in this part
        return 0
    with reader:
        for frame in reader:
            k = len(frame)
            if frame.shape[1] != n_columns or r + k > row0 + capacity:
                return None
            for i in range(n_columns):
                out[i][r:r + k] = frame[i].to_numpy(dtype=np.float64)
            r += k
    return r - row0


def _map(fn, args: list[tuple], threads: int) -> list:
    """``[fn(*a) for a in args]``, in threads when ``threads`` > 1; all finish first,
    then the first exception in ``args`` order is raised (as one pass in order would)."""
    if threads <= 1 or len(args) <= 1:
        return [fn(*a) for a in args]
    from concurrent.futures import ThreadPoolExecutor

    with ThreadPoolExecutor(max_workers=min(threads, len(args))) as pool:
        futures = [pool.submit(fn, *a) for a in args]
        done = [f.exception() or f.result() for f in futures]
    for r in done:
        if isinstance(r, BaseException):
            raise r
    return done


def _read_parts(raw: bytes, offset: int, n_columns: int, scan: DataScan):
    """The data section as float64 columns, read part by part; and its token count.

    First every part is scanned (bytes checked, tokens and lines counted), then
    parsed into one preallocated array per column, each part at its own rows; a
    part with fewer rows than lines (blank or comment lines) is moved up after.
    Returns ``(None, None)`` when the bytes are not plain or a part does not fit.
    """
    cuts = _cuts(raw, offset, _n_parts(len(raw) - offset))
    spans = list(zip(cuts[:-1], cuts[1:]))
    threads = _threads() if len(spans) > 1 else 1
    scans = _map(_scan_part, [(raw, a, b) for a, b in spans], threads)
    if any(sc is None for sc in scans):
        return None, None
    if not scan.checked:
        if any(h for _, _, h in scans):
            scan = scan_data_section(raw, offset)        # where the '#' are (rare): serial
            if scan is None:
                return None, None
        else:
            scan = DataScan(tokens=sum(t for t, _, _ in scans), has_comments=False)
    tokens = scan.tokens
    starts = np.concatenate([[0], np.cumsum([n for _, n, _ in scans])]).tolist()
    out = [np.empty(starts[-1], dtype=np.float64) for _ in range(n_columns)]
    rows = _map(_read_part, [(raw, a, b, n_columns, scan.has_comments, out, r0, n)
                             for (a, b), r0, (_, n, _) in zip(spans, starts, scans)], threads)
    if any(r is None for r in rows):
        return None, None
    total = sum(rows)
    if total != starts[-1]:
        pos = rows[0]
        for r0, k in zip(starts[1:-1], rows[1:]):
            if r0 != pos:
                for col in out:
                    col[pos:pos + k] = col[r0:r0 + k]        # overlap-safe in numpy
            pos += k
        out = [_shrunk(col, total) for col in out]
    return out, tokens


def _shrunk(col: np.ndarray, n: int) -> np.ndarray:
    """The first ``n`` values of ``col`` as an array of its own (in place where possible)."""
    try:
        col.resize(n, refcheck=False)
        return col
    except ValueError:
        return col[:n].copy()


def parse_data_section(raw: bytes, offset: int, n_columns: int, scan: DataScan
                       ) -> tuple[list[np.ndarray], list[TextReport]] | None:
    """Numbers of the data section, one float64 array per curve.

    A large section is cut at line starts into parts read at the same time, one
    thread each (:data:`PARALLEL_MIN_BYTES`, :data:`MAX_PARTS`); the parts are
    joined in file order, so the result is that of one read of the whole section.

    Parameters
    ----------
    raw : bytes
        The whole file.
    offset : int
        First byte of the data section (after the ``~A`` line).
    n_columns : int
        Number of curves in ``~Curve``.
    scan : DataScan
        Result of :func:`scan_data_section` for the same bytes; when it was made
        with ``count=False``, the bytes are checked and the tokens counted here.

    Returns
    -------
    (list of numpy.ndarray, list of TextReport) or None
        One array per curve, in ``~Curve`` order, each contiguous. Text entries
        are NaN and reported per column. None when the section cannot be read
        exactly as lasio would (a line with another number of values, text that
        lasio rewrites, no rows, bytes that are not plain): the caller then uses lasio.
    """
    from pandas.errors import ParserError

    tokens = scan.tokens
    try:
        try:
            block, tokens = _read_parts(raw, offset, n_columns, scan)
            if block is None:
                return None
            texts: list[TextReport] = []
        except ValueError as exc:
            if isinstance(exc, ParserError):
                return None
            if not scan.checked:
                scan = scan_data_section(raw, offset)        # the full check (rare path)
                if scan is None:
                    return None
            tokens = scan.tokens
            try:
                block, texts = _read_with_text(raw, offset, n_columns, scan)
            except (ValueError, TypeError):
                # pandas' dtype guess of a text column can disagree between reads (mixed
                # chunks): the lasio path reads such a section
                return None
            if block is None:
                return None
    except (ParserError, UnicodeDecodeError, OverflowError, MemoryError):
        return None
    rows = len(block[0]) if len(block) else 0
    if rows == 0 or rows * n_columns != tokens:
        return None
    return block, texts


def _read_with_text(raw: bytes, offset: int, n_columns: int, scan: DataScan):
    """Second read when some entries are not numbers: text columns token by token."""
    probe = _read(raw, offset, n_columns, scan.has_comments, None)
    if probe.shape[1] != n_columns:
        return None, []
    numeric = [probe[i].dtype.kind in "fiu" for i in range(n_columns)]
    del probe
    frame = _read(raw, offset, n_columns, scan.has_comments,
                  {i: (np.float64 if numeric[i] else object) for i in range(n_columns)})
    rows = len(frame)
    block = [np.empty(rows, dtype=np.float64) for _ in range(n_columns)]
    texts = []
    for i in range(n_columns):
        col = frame[i].to_numpy()
        if numeric[i]:
            block[i][:] = col
            continue
        values, report = _text_column(col, i)
        if values is None:
            return None, []
        block[i] = values
        if report is not None:
            texts.append(report)
    return block, texts


def _text_column(col: np.ndarray, index: int) -> tuple[np.ndarray | None, TextReport | None]:
    """Values of a column holding some text, as lasio's path reads it.

    lasio takes every token ``float()`` accepts as that number and any other token
    as text, which becomes null. Numbers are converted in one vectorised step;
    only the entries pandas could not read as numbers are looked at one by one.
    """
    import pandas as pd

    if not all(isinstance(t, str) for t in col):
        return None, None                       # a missing field (short line)
    tokens = col.astype(str)
    if np.any(tokens == ""):
        return None, None
    values = pd.to_numeric(pd.Series(tokens), errors="coerce").to_numpy(dtype=np.float64, copy=True)
    ok = ~np.isnan(values)
    try:
        values[ok] = tokens[ok].astype(np.float64)   # exact: same rounding as float()
    except ValueError:
        return None, None
    rest = np.flatnonzero(~ok)
    bad_rows = []
    for r in rest:
        t = str(tokens[r])
        if _LASIO_REWRITES.search(t):
            return None, None                   # lasio would rewrite this line: use lasio
        values[r], is_text = _lasio_number(t)
        if is_text:
            bad_rows.append(int(r))
    if not bad_rows:
        return values, None
    first = bad_rows[0]
    return values, TextReport(index, len(bad_rows), str(tokens[first]), first + 1)


