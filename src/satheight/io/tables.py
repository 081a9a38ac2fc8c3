"""Column tables as Parquet and CSV (pyarrow): the field summary and the all-wells long table.

pyarrow (a dependency of satheight) is imported when a table is written, not at import time,
and a missing pyarrow is one clear error. Every file is written
through :mod:`satheight.io.atomic` (temporary file, then rename).

* :func:`write_table` writes one table (ordered columns of numbers or text) as Parquet
  and/or CSV. Numbers are float64 with NaN written as null (an empty CSV cell); text
  from input files is made safe for spreadsheets (:func:`safe_cell`).
* :func:`merge_tables` concatenates per-well Parquet files into one Parquet and one
  CSV, one well at a time (memory of one well), with the union of their columns in
  order of first appearance (a column a well lacks is null there).
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Sequence

import numpy as np

from ..errors import InputFileError, SatHeightError
from .atomic import atomic_open

#: Characters that make a spreadsheet read a cell as a formula (common practice: such
#: cells are prefixed with an apostrophe so they stay text).
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


@dataclass(frozen=True)
class CodedText:
    """A text column given as its distinct values (``labels``) and, per row, the index of its
    value (``codes``): a well or zone name per sample without a string per sample."""

    labels: Sequence[str]
    codes: np.ndarray

    def __len__(self) -> int:
        return len(self.codes)


def _pyarrow():
    try:
        import pyarrow as pa
        import pyarrow.csv as pacsv
        import pyarrow.parquet as pq
    except ImportError:  # pragma: no cover - depends on the installation
        raise SatHeightError("writing Parquet and table CSV files needs pyarrow, which is not "
                             "installed", hint="pip install pyarrow") from None
    return pa, pacsv, pq


def safe_cell(text) -> str:
    """Text from an input file made safe for a CSV or Parquet cell.

    Control characters and line breaks become blanks, runs of blanks one blank, and a
    cell that would start a spreadsheet formula (``= + - @``) gets a leading apostrophe
    (common practice against formula injection). Numbers never pass through here.
    """
    s = "" if text is None else str(text)
    s = " ".join("".join(ch if ch.isprintable() else " " for ch in s).split())
    if s.startswith(_FORMULA_START):
        s = "'" + s
    return s


def _column(pa, values):
    """A pyarrow array: float64 with NaN as null for numbers, safe strings for text.

    Text is made safe once per distinct value and expanded by index (vectorised), so a
    column of one well or zone name per sample costs no Python call per sample; the
    distinct values of a numpy text column are found by pyarrow's hashing (no sort).
    """
    if isinstance(values, CodedText):
        return pa.array([safe_cell(u) for u in values.labels],
                        type=pa.string()).take(pa.array(np.asarray(values.codes)))
    arr = np.asarray(values)
    if arr.dtype.kind in "fiub":
        a = np.asarray(arr, dtype=np.float64)     # float64 as it is: no copy of the samples
        finite = np.isfinite(a)
        if finite.all():
            return pa.array(a, type=pa.float64())
        return pa.array(a, type=pa.float64(), mask=~finite)
    if arr.dtype.kind == "U":
        coded = pa.array(arr.ravel(), type=pa.string()).dictionary_encode()
        return pa.array([safe_cell(u) for u in coded.dictionary.to_pylist()],
                        type=pa.string()).take(coded.indices)
    none = np.equal(arr, None) if arr.dtype == object else None
    text = np.where(none, "", arr.astype(str)) if none is not None else arr.astype(str)
    uniq, inv = np.unique(text, return_inverse=True)
    out = pa.array([safe_cell(u) for u in uniq], type=pa.string()).take(pa.array(inv.ravel()))
    if none is not None and none.any():
        out = pa.array(out.to_pylist(), type=pa.string(), mask=none)
    return out


def to_arrow(columns: dict, metadata: dict | None = None):
    """A pyarrow Table of ordered ``{name: values}`` (one length) with text ``metadata``."""
    pa, _, _ = _pyarrow()
    lengths = {len(v) for v in columns.values()}
    if len(lengths) > 1:
        raise SatHeightError(f"table columns have different lengths {sorted(lengths)}")
    names = [safe_cell(n) for n in columns]
    table = pa.table([_column(pa, v) for v in columns.values()], names=names)
    if metadata:
        table = table.replace_schema_metadata({safe_cell(k): safe_cell(v) for k, v in metadata.items()})
    return table


def _parquet_options(pa, schema) -> dict:
    """Dictionary encoding for text columns only (float columns gain nothing from it and
    cost time), snappy compression (pyarrow's default: on the benchmark well it wrote in
    about half the time of zstd, for a file about 1.45 times larger)."""
    text = [f.name for f in schema if pa.types.is_string(f.type)]
    return {"use_dictionary": text, "compression": "snappy"}


def _write_csv(pacsv, table, f) -> None:
    pacsv.write_csv(table, f, pacsv.WriteOptions(include_header=True, quoting_style="needed"))


def write_table(columns: dict, parquet_path: Path | None = None, csv_path: Path | None = None,
                metadata: dict | None = None) -> list[Path]:
    """Write ordered columns as Parquet and/or CSV; return the files written.

    Parameters
    ----------
    columns : dict[str, array_like or CodedText]
        Column name (with its unit, e.g. ``"HCPT_SHM [m]"``) -> values of one length.
    parquet_path, csv_path : pathlib.Path or None
    metadata : dict[str, str], optional
        Key-value text stored in the Parquet schema (units, program, caution).
    """
    pa, pacsv, pq = _pyarrow()
    table = to_arrow(columns, metadata)
    out = []
    try:
        if parquet_path is not None:
            with atomic_open(parquet_path, "wb") as f:
                pq.write_table(table, f, **_parquet_options(pa, table.schema))
            out.append(Path(parquet_path))
        if csv_path is not None:
            with atomic_open(csv_path, "wb") as f:
                _write_csv(pacsv, table, f)
            out.append(Path(csv_path))
    except OSError as exc:
        raise InputFileError(f"cannot write a table: {exc.strerror or exc}",
                             where=str(parquet_path or csv_path),
                             hint="check that the output folder is writable") from exc
    return out


def _unified(pa, pq, parts: Sequence[Path]):
    """The union schema of the parts (columns in order of first appearance)."""
    fields, seen = [], set()
    for p in parts:
        for fld in pq.read_schema(p):
            if fld.name not in seen:
                seen.add(fld.name)
                fields.append(fld)
    return pa.schema(fields)


def merge_tables(parts: Sequence[Path], parquet_path: Path | None, csv_path: Path | None,
                 metadata: dict | None = None) -> list[Path]:
    """Concatenate Parquet files (one per well) into one Parquet and one CSV, part by part.

    A column missing from a part is null in its rows; a column whose type differs
    between parts (a number in one, text in another) is refused.
    """
    pa, pacsv, pq = _pyarrow()
    parts = [Path(p) for p in parts]
    if not parts:
        return []
    schema = _unified(pa, pq, parts)
    if metadata:
        schema = schema.with_metadata({safe_cell(k): safe_cell(v) for k, v in metadata.items()})
    out = []
    try:
        if parquet_path is not None:
            with atomic_open(parquet_path, "wb") as f, \
                    pq.ParquetWriter(f, schema, **_parquet_options(pa, schema)) as writer:
                for p in parts:
                    writer.write_table(_conform(pa, pq.read_table(p), schema, p))
            out.append(Path(parquet_path))
        if csv_path is not None:
            with atomic_open(csv_path, "wb") as f:
                with pacsv.CSVWriter(f, schema, write_options=pacsv.WriteOptions(
                        include_header=True, quoting_style="needed")) as writer:
                    for p in parts:
                        writer.write_table(_conform(pa, pq.read_table(p), schema, p))
            out.append(Path(csv_path))
    except OSError as exc:
        raise InputFileError(f"cannot write a merged table: {exc.strerror or exc}",
                             where=str(parquet_path or csv_path),
                             hint="check that the output folder is writable") from exc
    return out


def _conform(pa, table, schema, source: Path):
    """``table`` with the columns of ``schema`` in its order (nulls where it has none)."""
    cols = []
    for fld in schema:
        if fld.name in table.column_names:
            col = table.column(fld.name)
            if col.type != fld.type:
                raise SatHeightError(f"column {fld.name!r} is {col.type} here but {fld.type} in "
                                     "another well's table", where=str(source),
                                     hint="a curve mnemonic holds text in one well and numbers "
                                          "in another; rename one of them")
            cols.append(col)
        else:
            cols.append(pa.nulls(table.num_rows, type=fld.type))
    return pa.table(cols, schema=schema.remove_metadata())
