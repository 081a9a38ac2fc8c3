"""The tool's own well object: what every loader returns and every writer takes.

A :class:`Well` is independent of any LAS library. Curves keep the values and
units they had in the file (nulls turned into NaN), so that an export can write
every input curve back unchanged. The measured-depth index is also held in SI
(metres) for the engine.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np


@dataclass
class Curve:
    """One log curve as read from a file.

    Attributes
    ----------
    mnemonic : str
        Curve mnemonic as in the file (``"PHIE"``), made unique if the file repeats one.
    unit : str
        Unit text as in the file (``"V/V"``, ``"MD"``, ``"OHMM"``), may be empty.
    description : str
        Curve description from the file.
    data : numpy.ndarray
        float64 values in the file's unit, nulls replaced by NaN.
    value : str
        The value field of the curve's header line (often an API log code), may be empty.
    """

    mnemonic: str
    unit: str
    description: str
    data: np.ndarray
    value: str = ""


@dataclass
class HeaderItem:
    """One line of a LAS header section (``~Well`` or ``~Parameter``)."""

    mnemonic: str
    unit: str
    value: Any
    description: str


@dataclass
class Well:
    """A well's logs and header, in the tool's own terms.

    Attributes
    ----------
    name : str
        Well name (LAS ``WELL`` item, or the file stem if that is empty).
    source : pathlib.Path
        File the well was read from.
    md : numpy.ndarray
        Measured depth of each sample [m], strictly increasing.
    depth_unit : str
        Unit of the depth index in the file, normalised to ``"m"``, ``"ft"`` or ``".1in"``
        (tenths of an inch, older files).
    index_mnemonic : str
        Mnemonic of the depth curve in the file (``"DEPT"``, ``"DEPTH"``, ``"MD"``).
    curves : dict[str, Curve]
        Every curve of the file in file order, index curve first.
    well_header : dict[str, HeaderItem]
        ``~Well`` section items by mnemonic.
    parameters : dict[str, HeaderItem]
        ``~Parameter`` section items by mnemonic.
    other : str
        ``~Other`` section text.
    null_value : float or None
        The NULL value the file declared.
    warnings : list[str]
        Fix-ups applied while reading (reordered depths, percent porosity...).
    """

    name: str
    source: Path
    md: np.ndarray
    depth_unit: str
    index_mnemonic: str
    curves: dict[str, Curve]
    well_header: dict[str, HeaderItem] = field(default_factory=dict)
    parameters: dict[str, HeaderItem] = field(default_factory=dict)
    other: str = ""
    null_value: float | None = None
    version: str = "2.0"
    warnings: list[str] = field(default_factory=list)

    @property
    def n_samples(self) -> int:
        return int(self.md.size)

    def curve(self, mnemonic: str) -> Curve:
        """Curve by mnemonic (case-insensitive)."""
        if mnemonic in self.curves:
            return self.curves[mnemonic]
        low = mnemonic.lower()
        for key, c in self.curves.items():
            if key.lower() == low:
                return c
        raise KeyError(mnemonic)
