"""DLIS (RP66 version 1) input through the optional library dlisio (``pip install satheight[dlis]``).

A DLIS file holds one or more logical files, each with frames of channels sampled against
an index. The first logical file's frame indexed by borehole depth (measured depth) is read
as a well; its channels become curves with their units, and the same rules as for LAS
apply (:func:`satheight.io.las.read_las`: depth unit m, ft or tenths of an inch, nulls,
depth order, the same curve-role detection afterwards). Other frames and logical files are
not read: a note says which. A file with no depth-indexed frame is refused.

The well name comes from the origin record; scalar parameters (an ``EKB`` for the datum, for
instance) are offered as header items. The absent value -999.25 is read as null (common
practice for DLIS and LAS files alike).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from ..errors import InputFileError
from ..well import HeaderItem
from .las import _build_well, read_las
from .las_checks import check_regular_file
from .las_header import RawLas

#: The index type of a frame sampled against measured depth (RP66 v1, FRAME object).
DEPTH_INDEX = "BOREHOLE-DEPTH"
#: The absent value commonly written in DLIS channels (common practice).
ABSENT = -999.25
#: File endings read as DLIS by :func:`read_log_file`.
DLIS_SUFFIXES = (".dlis",)


def _dlisio():
    try:
        from dlisio import dlis   # optional library
    except ImportError:
        raise InputFileError("reading DLIS files needs the optional library dlisio, which is "
                             "not installed", hint="pip install 'satheight[dlis]'") from None
    return dlis


def read_log_file(path):
    """A well from a LAS or (by its ending ``.dlis``) a DLIS file."""
    if Path(path).suffix.lower() in DLIS_SUFFIXES:
        return read_dlis(path)
    return read_las(path)


def _scalar(values):
    """A parameter's single value (number or text), or None for arrays and empty values."""
    v = np.asarray(values)
    if v.size != 1:
        return None
    x = v.reshape(-1)[0]
    return x.item() if hasattr(x, "item") else x


def _header(lf, path: Path) -> tuple[list[HeaderItem], list[HeaderItem]]:
    name = lf.origins[0].well_name if lf.origins else None
    well = [HeaderItem("WELL", "", (name or "").strip() or path.stem, "Well name (DLIS origin)"),
            HeaderItem("NULL", "", ABSENT, "Absent value (common practice)")]
    params = []
    for p in lf.parameters:
        value = _scalar(p.values)
        if value is not None:
            params.append(HeaderItem(p.name, p.units or "", value, p.long_name or ""))
    return well + params, params


def _depth_frame(lf, path: Path):
    frames = list(lf.frames)
    depth = [f for f in frames if (f.index_type or "").upper() == DEPTH_INDEX]
    if not depth:
        seen = ", ".join(f"{f.name} (index {f.index!r}, type {f.index_type or 'not given'})"
                         for f in frames) or "none"
        raise InputFileError(f"no frame of the DLIS file is indexed by borehole depth; frames: "
                             f"{seen}", where=str(path),
                             hint="satheight reads depth-indexed logs; export the logs against "
                                  "measured depth")
    return depth[0], [f for f in frames if f is not depth[0]]


def _columns(frame, path: Path, notes: list[str]):
    """(curve definitions, float64 columns) of a frame, index first; array channels skipped."""
    data = frame.curves()
    defs, cols, seen = [], [], {}
    for i, ch in enumerate(frame.channels):
        col = data[data.dtype.names[i + 1]]          # field 0 is the frame number
        if col.ndim != 1:
            notes.append(f"{path}: channel {ch.name!r} holds {col.shape[1:]} values per sample "
                         "(an array): not read")
            continue
        n = seen.get(ch.name, 0)
        seen[ch.name] = n + 1
        name = ch.name if n == 0 else f"{ch.name}:{n + 1}"
        defs.append((name, ch.units or "", ch.long_name or "", ""))
        cols.append(np.asarray(col, dtype=np.float64))
    return defs, cols


def read_dlis(path):
    """Read the depth-indexed frame of a DLIS file into a :class:`~satheight.well.Well`.

    Raises
    ------
    InputFileError
        dlisio not installed; the file is missing, not a regular file or not DLIS; no
        frame is indexed by borehole depth (the error lists the frames and their index).
    DepthError
        A depth missing, repeated or out of order (as for LAS).
    """
    path = Path(path)
    check_regular_file(path)
    dlis = _dlisio()
    notes: list[str] = []
    try:
        with dlis.load(str(path)) as files:
            lf = files[0]
            if len(files) > 1:
                notes.append(f"{path}: {len(files)} logical files; only the first was read")
            frame, others = _depth_frame(lf, path)
            if others:
                notes.append(f"{path}: frame {frame.name!r} read; not read: " + ", ".join(
                    f"{f.name!r} ({', '.join(c.name for c in f.channels)})" for f in others))
            defs, cols = _columns(frame, path, notes)
            well_items, params = _header(lf, path)
    except InputFileError:
        raise
    except (OSError, RuntimeError, ValueError, IndexError, TypeError) as exc:
        raise InputFileError(f"cannot read the DLIS file: {exc}", where=str(path),
                             hint="check that it is a DLIS (RP66 version 1) file") from None
    raw = RawLas(version="DLIS", well_items=well_items, param_items=params, curve_defs=defs,
                 columns=cols, other="", messages=notes, owned=True)
    return _build_well(path, raw)
