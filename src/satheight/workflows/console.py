"""What commands show on the terminal besides their results: progress on stderr, and the
JSON form of a command's results for scripts (``--json``) on stdout.

Progress: items done / total, the current item, elapsed and remaining time (drawn by tqdm),
shown only when stderr is a terminal and the user did not ask for quiet; results never go
through here (they go to stdout), so scripts that read stdout see no progress text. A failed
item is announced on stderr as it happens when the bar is shown.
"""

from __future__ import annotations

import json
import math
import os
import sys
from pathlib import Path

from tqdm import tqdm

#: Version of the layout of every JSON document a command prints (``--json``) or a run writes
#: (``run_summary.json``). Raised when a key is renamed or removed or its meaning changes.
SCHEMA_VERSION = 1

#: Layout of the bar: "wells 3/50 |######    | 00:41 elapsed, 10:12 remaining, VANTREL-4".
BAR_FORMAT = "{desc} {n_fmt}/{total_fmt} |{bar:20}| {elapsed} elapsed, {remaining} remaining{postfix}"


#: Seconds a command of :class:`Progress` ``slow=True`` works before its bar is drawn.
SLOW_SECONDS = 1.0


def progress_wanted(stream=None, quiet: bool = False) -> bool:
    """True when progress should be drawn: not quiet and ``stream`` (stderr) is a terminal."""
    stream = sys.stderr if stream is None else stream
    if quiet:
        return False
    try:
        return bool(stream.isatty())
    except (AttributeError, ValueError):  # closed or not a real stream
        return False


class Progress:
    """A progress bar over ``total`` items (wells), or nothing when not ``enabled``.

    Use as a context manager; call :meth:`start` with the item's name before the
    work and :meth:`done` after it (or :meth:`step` for a sequence of steps). With ``slow``
    the bar appears only once the work has taken :data:`SLOW_SECONDS` (commands that are
    usually quick stay silent).
    """

    def __init__(self, total: int, unit: str = "wells", enabled: bool = False, stream=None,
                 slow: bool = False):
        self.stream = sys.stderr if stream is None else stream
        self.enabled = bool(enabled) and total > 0
        self._current: str | None = None          # the step in hand (see step())
        cols, rows = _size(self.stream)
        self._bar = (tqdm(total=total, desc=unit, file=self.stream, bar_format=BAR_FORMAT,
                          ncols=cols, nrows=rows, leave=True, mininterval=0.2,
                          delay=SLOW_SECONDS if slow else 0.0)
                     if self.enabled else None)

    def step(self, name: str) -> None:
        """Count the item in hand as done (if any) and show ``name`` as the next one."""
        if self._bar is None:
            return
        if self._current is not None:
            self._bar.update(1)
        self._current = name
        self.start(name)

    def start(self, name: str) -> None:
        """Show ``name`` as the item being worked on."""
        if self._bar is not None:
            self._bar.set_postfix_str(_clean(name), refresh=True)

    def done(self, name: str, ok: bool = True, error: str | None = None) -> None:
        """Count one item as done; a failure is written above the bar."""
        if self._bar is None:
            return
        if not ok:
            self._bar.write(f"satheight: {_clean(name)} failed: {_clean(error or '')}",
                            file=self.stream)
        self._bar.update(1)

    def close(self) -> None:
        if self._bar is not None and self._current is not None:
            self._bar.update(1)         # the last step of step()
            self._current = None
        if self._bar is not None:
            self._bar.set_postfix_str("done", refresh=False)
            self._bar.close()
            self._bar = None

    def __enter__(self) -> "Progress":
        return self

    def __exit__(self, *exc) -> None:
        self.close()


def _size(stream) -> tuple[int, int]:
    """Columns and rows of the terminal behind ``stream``; 80 x 24 where it reports none (a
    pseudo-terminal without a size, where tqdm would otherwise draw nothing)."""
    try:
        size = os.get_terminal_size(stream.fileno())
        cols, rows = size.columns, size.lines
    except (AttributeError, OSError, ValueError):
        cols, rows = 0, 0
    return (cols if cols >= 40 else 80), (rows if rows >= 2 else 24)


def _clean(text: str) -> str:
    """Text from input files on one line without control characters (safe on a terminal)."""
    return "".join(ch if ch.isprintable() else " " for ch in str(text).replace("\n", " "))


def _plain(value):
    """JSON-ready copy: paths and other objects as text, NaN and infinities as null."""
    if isinstance(value, dict):
        return {str(k): _plain(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    if isinstance(value, bool) or value is None or isinstance(value, (int, str)):
        return value
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    if isinstance(value, Path):
        return str(value)
    try:
        f = float(value)          # numpy scalars
    except (TypeError, ValueError):
        return str(value)
    return f if math.isfinite(f) else None


def json_document(command: str, data: dict) -> dict:
    """A command's results as a JSON document: ``schema_version`` and ``command`` first."""
    body = _plain(data)
    body.pop("schema_version", None)
    return {"schema_version": SCHEMA_VERSION, "command": command, **body}


def print_json(command: str, data: dict, out=None) -> None:
    """Print :func:`json_document` of ``data`` on ``out`` (stdout), strict JSON (no NaN)."""
    out = sys.stdout if out is None else out
    print(json.dumps(json_document(command, data), indent=2, allow_nan=False), file=out)
