"""The per-well CSV table: every input curve and the new ones, one row per depth sample.

Header ``MNEMONIC [unit]``, blanks for missing values, numbers as ``%.10g`` (the text
pandas' ``to_csv(float_format="%.10g")`` writes, formatted vectorised here).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from ..well import Curve, Well
from .atomic import atomic_open, atomic_write_text
from .las_fast import csv_rows


def write_csv(path: Path, well: Well, new_curves: list[Curve]) -> None:
    """CSV of every input curve and the new curves; header ``MNEMONIC [unit]``; blanks for NaN."""
    import pandas as pd

    cols = {}
    for c in list(well.curves.values()) + new_curves:
        label = f"{c.mnemonic} [{c.unit}]" if c.unit else c.mnemonic
        cols[label] = c.data
    data = [np.asarray(v) for v in cols.values()]
    if len(cols) != len(well.curves) + len(new_curves) or any(d.dtype != np.float64 for d in data):
        frame = pd.DataFrame(cols)
        atomic_write_text(path, frame.to_csv(index=False, float_format="%.10g", lineterminator="\n"))
        return
    # the same text as pandas' to_csv(float_format="%.10g"), numbers formatted vectorised
    header = pd.DataFrame(columns=list(cols)).to_csv(index=False, lineterminator="\n")
    with atomic_open(path, "wb") as f:
        f.write(header.encode("utf-8"))
        for block in csv_rows(data, precision=10):
            f.write(block)
