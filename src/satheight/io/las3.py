"""LAS 3.0 input: the log definition and data sections, read into the same record as LAS 2.0.

LAS 3.0 (an open standard of the same society as LAS 2.0) groups channels in *data
sets*: a definition section (``~Log_Definition``, ``~Core_Definition``...) and its data
section (``~Log_Data | Log_Definition``), values delimited by blanks, commas or tabs
as the ``DLM`` item of ``~Version`` says (``SPACE`` by default). ``~Curve`` and ``~A``
stand for the log set. This reader:

* reads ``~Version``, ``~Well``, ``~Parameter`` and ``~Log_Parameter`` items (the text
  after ``{`` in a description, a format, and after ``|``, an association, is dropped);
* takes one depth-indexed data set: the log set when its first channel has a depth
  unit, else the first set whose first channel has one; every section not read is
  named in a note;
* refuses, naming the line, a data line with another number of values than its
  definition has channels, a decimal comma in blank- or tab-delimited data, wrapped
  data (LAS 3.0 does not allow it), a section given twice, and a file with no
  depth-indexed data set.

Nulls, units, depth order and curve roles are then handled by
:func:`satheight.io.las.read_las` exactly as for LAS 2.0.
"""

from __future__ import annotations

import io
import re
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from .. import units
from ..errors import InputFileError, UnitError
from ..well import HeaderItem
from .las_checks import check_data_lines
from .las_header import RawLas

__all__ = ["declares_las3", "parse_las3"]

_VERS = re.compile(r"^[ \t]*VERS[ \t]*\.[^\s]*[ \t]+([0-9]+(?:\.[0-9]*)?)", re.M | re.I)
_TITLE = re.compile(r"^[ \t]*~([^\n|]*)(?:\|([^\n]*))?$")
# MNEM.UNIT  VALUE : DESCRIPTION  (unit right after the first dot; value up to the last colon)
_ITEM = re.compile(r"^[ \t]*([^.#\s][^.]*?)[ \t]*\.([^\s:]*)[ \t]*(.*):(.*)$")
_LEADING_ZERO = re.compile(r"[+-]?0\d+")
_DELIMITERS = {"SPACE": " ", "COMMA": ",", "TAB": "\t"}


def declares_las3(head: str) -> bool:
    """Whether the ``VERS`` item of ``head`` (the start of a file's text) is 3.0 or above."""
    m = _VERS.search(head)
    if not m:
        return False
    try:
        return float(m.group(1)) >= 3.0
    except ValueError:
        return False


@dataclass
class _Section:
    name: str                   # title without "~", e.g. "Log_Data"
    association: str            # text after "|" in the title, e.g. "Log_Definition"
    line: int                   # 1-based line of the title
    body: str = ""              # the lines after the title, up to the next title


_TITLE_LINE = re.compile(r"^[ \t]*~[^\n]*", re.M)


def _sections(text: str, path: Path) -> list[_Section]:
    """The file's sections in order; titles found by one regular-expression pass (the
    data lines are not looked at one by one)."""
    out: list[_Section] = []
    seen: dict[str, int] = {}
    titles = list(_TITLE_LINE.finditer(text))
    line = 1
    pos = 0
    for i, t in enumerate(titles):
        line += text.count("\n", pos, t.start())
        pos = t.start()
        m = _TITLE.match(t.group(0))
        name = m.group(1).strip()
        key = name.upper()
        if key in seen:
            raise InputFileError(f"section ~{name} appears twice (lines {seen[key]} and "
                                 f"{line}); the second would hide the first",
                                 where=f"{path}, line {line}",
                                 hint="keep one section of each kind; merge or remove the other")
        seen[key] = line
        end = titles[i + 1].start() if i + 1 < len(titles) else len(text)
        body = text[t.end() + 1:end] if t.end() < end else ""
        out.append(_Section(name, (m.group(2) or "").strip(), line, body.rstrip("\n")))
    return out


def _kind(name: str) -> tuple[str, str]:
    """(kind, data set) of a section title: kind one of version, well, parameter,
    definition, data, other, unknown; the set upper case ("LOG", "CORE"...)."""
    up, run = re.match(r"^(.*?)(\[\d+\])?$", name.upper().strip()).groups()
    run = run or ""                         # Log_Data[2]: the second run is a set of its own
    if up in ("CURVE", "C") or (up.startswith("C") and "_" not in up and up[:2] != "CO"):
        return "definition", "LOG" + run
    if up in ("A", "ASCII") or (up.startswith("A") and "_" not in up):
        return "data", "LOG" + run
    for kind, letter in (("version", "V"), ("well", "W"), ("other", "O")):
        if up.startswith(letter) and "_" not in up:
            return kind, ""
    if up in ("PARAMETER", "P") or (up.startswith("P") and "_" not in up):
        return "parameter", ""
    head, _, tail = up.partition("_")
    if tail in ("DEFINITION", "PARAMETER", "DATA"):
        return tail.lower(), head + run
    return "unknown", ""


def _value(mnemonic: str, text: str):
    """A header value: a number where the text is one (identifiers kept as written)."""
    if mnemonic.upper() in ("WELL", "UWI", "API") or _LEADING_ZERO.fullmatch(text):
        return text
    try:
        number = float(text)
    except ValueError:
        return text
    return int(number) if re.fullmatch(r"[+-]?\d+", text) else number


def _items(section: _Section) -> list[tuple[str, str, str, str]]:
    """(mnemonic, unit, value text, description) of each item line of a section."""
    rows = []
    for line in section.body.split("\n"):
        if not line.strip() or line.lstrip().startswith("#"):
            continue
        m = _ITEM.match(line)
        if m:
            descr = re.sub(r"\{[^}]*\}", "", m.group(4).split("|")[0]).strip()
            rows.append((m.group(1).strip(), m.group(2).strip(), m.group(3).strip(), descr))
    return rows


def _is_depth_unit(unit: str) -> bool:
    u = units.normalise_unit(unit)
    if u in ("f", "1in", ".1in"):
        return True
    try:
        units.factor(u, "length")
    except UnitError:
        return False
    return bool(u)


def _choose_set(path: Path, sets: dict[str, dict[str, _Section]]) -> str:
    """The depth-indexed data set: LOG when its index has a depth unit, else the first."""
    complete = [s for s, parts in sets.items() if "definition" in parts and "data" in parts]
    depth_sets = []
    for s in complete:
        rows = _items(sets[s]["definition"])
        if rows and _is_depth_unit(rows[0][1]):
            depth_sets.append(s)
    if "LOG" in depth_sets:
        return "LOG"
    if depth_sets:
        return depth_sets[0]
    raise InputFileError("no depth-indexed data set: no definition and data section pair whose "
                         "first channel has a depth unit (M, FT, .1IN)"
                         + (f" (sets found: {', '.join(complete)})" if complete else ""),
                         where=str(path), hint="give a ~Log_Definition section whose first "
                         "channel is the depth, and its ~Log_Data section")


def _delimiter(path: Path, version: list[tuple[str, str, str, str]]) -> str:
    dlm = next((v for m, _, v, _ in version if m.upper() == "DLM"), "SPACE").strip().upper()
    if dlm not in _DELIMITERS:
        raise InputFileError(f"unknown data delimiter DLM = {dlm!r}", where=str(path),
                             hint="LAS 3.0 allows DLM SPACE, COMMA or TAB")
    wrap = next((v for m, _, v, _ in version if m.upper() == "WRAP"), "NO").strip().upper()
    if wrap in ("YES", "Y"):
        raise InputFileError("WRAP YES in a LAS 3.0 file (LAS 3.0 data are never wrapped)",
                             where=str(path), hint="write one line per depth (WRAP NO)")
    return _DELIMITERS[dlm]


def _read_data(path: Path, data: _Section, n: int, delimiter: str,
               definition: str) -> list[np.ndarray]:
    """The data section's columns (float64, or object where some entries are text)."""
    import pandas as pd

    body = data.body
    check_data_lines(path, body, data.line + 1, n, wrapped=False, delimiter=delimiter,
                     definition=definition)
    rows = re.sub(r"^[ \t]*(#[^\n]*)?\n", "", body + "\n", flags=re.M).rstrip("\n")
    if not rows.strip():
        return [np.empty(0) for _ in range(n)]
    kwargs = dict(header=None, names=list(range(n)), na_filter=False, quotechar='"',
                  engine="c", skip_blank_lines=False)
    if delimiter != " ":
        rows = re.sub(rf"[ ]*{re.escape(delimiter)}[ ]*", delimiter, rows)
        rows = re.sub(r"^[ ]+|[ \t]+$", "", rows, flags=re.M)
    try:
        frame = pd.read_csv(io.StringIO(rows), sep=r"\s+" if delimiter == " " else delimiter,
                            **kwargs)
    except (ValueError, pd.errors.ParserError) as exc:
        frame, why = None, str(exc).strip().splitlines()[-1:] or [""]
    if frame is None or len(frame) != rows.count("\n") + 1:
        raise InputFileError("the data section cannot be split into one row per line (a quote "
                             "left open runs over the line end?)"
                             + (f": {why[0]}" if frame is None and why[0] else ""),
                             where=f"{path}, line {data.line + 1}",
                             hint="close every quoted text on its own line, or remove the quote")
    return [frame[i].to_numpy() for i in range(n)]


def parse_las3(path: Path, text: str) -> RawLas:
    """A LAS 3.0 file's text as a :class:`~satheight.io.las_header.RawLas` (see module doc).

    Raises
    ------
    InputFileError
        As listed in the module docstring, naming the file and line.
    """
    sections = _sections(text, path)
    by_kind: dict[str, list[_Section]] = {}
    sets: dict[str, dict[str, _Section]] = {}
    for sec in sections:
        kind, data_set = _kind(sec.name)
        if kind in ("definition", "data") or (kind == "parameter" and data_set):
            sets.setdefault(data_set, {})[kind] = sec
        else:
            by_kind.setdefault(kind, []).append(sec)
    chosen = _choose_set(path, sets)
    version_items = [r for sec in by_kind.get("version", []) for r in _items(sec)]
    delimiter = _delimiter(path, version_items)
    definition = _items(sets[chosen]["definition"])
    columns = _read_data(path, sets[chosen]["data"], len(definition), delimiter,
                         "~" + sets[chosen]["definition"].name)

    def header(kind: str, extra: list[_Section] = ()) -> list[HeaderItem]:
        secs = by_kind.get(kind, []) + list(extra)
        return [HeaderItem(m, u, _value(m, v), d) for sec in secs for m, u, v, d in _items(sec)]

    log_params = [sets[chosen]["parameter"]] if "parameter" in sets[chosen] else []
    seen: dict[str, int] = {}
    curve_defs = []
    for m, u, v, d in definition:
        seen[m.upper()] = seen.get(m.upper(), 0) + 1
        curve_defs.append((m, u, d, v))
    curve_defs = [(f"{m}:{k}" if seen[m.upper()] > 1 else m, u, d, v)
                  for (m, u, d, v), k in zip(curve_defs, _occurrence(curve_defs))]
    not_read = [f"~{sec.name}" for sec in sections
                if _kind(sec.name)[0] == "unknown"
                or (_kind(sec.name)[1] and _kind(sec.name)[1] != chosen)]
    note = (f"{path}: LAS 3.0: read the data set {chosen} (~{sets[chosen]['definition'].name}, "
            f"~{sets[chosen]['data'].name}, delimiter {_name_of(delimiter)})")
    if not_read:
        note += "; not read: " + ", ".join(not_read)
    other = "\n".join(sec.body.strip("\n") for sec in by_kind.get("other", []))
    return RawLas("3.0", header("well"), header("parameter", log_params), curve_defs, columns,
                  other, [note])


def _occurrence(defs: list[tuple]) -> list[int]:
    """1-based occurrence number of each mnemonic (for repeated ones: GR:1, GR:2)."""
    count: dict[str, int] = {}
    out = []
    for d in defs:
        count[d[0].upper()] = count.get(d[0].upper(), 0) + 1
        out.append(count[d[0].upper()])
    return out


def _name_of(delimiter: str) -> str:
    return next(k for k, v in _DELIMITERS.items() if v == delimiter)
