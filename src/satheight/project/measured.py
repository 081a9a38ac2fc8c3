"""Measured points a project file names: core plug tables and a formation-pressure file.

``[project] core_files`` (one path or a list) names core-data files in the layouts of
:mod:`satheight.io.core_data`; their plugs (well, MD, porosity, permeability and, when
given, the Sw measured on the plug) are drawn on the track plots of the wells they
name. ``[project] pressure_file`` names a pressure-points file
(:mod:`satheight.io.pressures`); its points are drawn on those wells' track plots, with
the free-water levels they imply. Paths are relative to the project file. The files are
read here, once, so a bad file stops the run before any well, naming the key and the
file's line.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from ..errors import SatHeightError
from ..io.core_data import read_core_files
from ..io.pressures import read_pressure_points
from .values import _show

__all__ = ["MEASURED_KEYS", "Measured", "read_measured"]

#: Keys of ``[project]`` read here.
MEASURED_KEYS = ("core_files", "pressure_file")


@dataclass(frozen=True)
class Measured:
    """What ``core_files`` and ``pressure_file`` of a project file hold.

    Attributes
    ----------
    core_files : tuple[pathlib.Path, ...]
        The core-data files, absolute.
    plugs : dict[str, satheight.coreplugs.Plug]
        Every plug of those files by plug id (depth MD [m], SI values).
    pressure_file : pathlib.Path or None
    pressures : satheight.pressures.PressurePoints or None
        The points as read (TVDSS NaN where the file gives only MD).
    """

    core_files: tuple = ()
    plugs: dict = field(default_factory=dict)
    pressure_file: Path | None = None
    pressures: object | None = None


def read_measured(reader, t: dict) -> Measured:
    """Read ``core_files`` and ``pressure_file`` of the ``[project]`` table ``t``.

    ``reader`` is the project's :class:`satheight.project.values.ValueReader`
    (paths relative to the project file; errors naming the key).

    Raises
    ------
    ProjectFileError
        A key of the wrong type, a missing file, or a file the reader refuses (the
        message names the key, then the file and line as the file reader gave them).
    """
    core_files: tuple = ()
    plugs: dict = {}
    if "core_files" in t:
        raw: Any = t["core_files"]
        items = [raw] if isinstance(raw, str) else raw
        if not isinstance(items, list) or not items:
            raise reader.error("project.core_files", f"expected a file name or a list of file "
                               f"names, found {_show(raw)}",
                               hint='write core_files = ["core_plugs.csv"]')
        core_files = tuple(reader.existing_file(v, f"project.core_files[{i}]", "core-data")
                           for i, v in enumerate(items))
        try:
            plugs = dict(read_core_files(core_files).plugs)
        except SatHeightError as exc:
            raise reader.error("project.core_files", f"{exc.where}: {exc.what}",
                               hint=exc.hint) from None
    pressure_file, pressures = None, None
    if "pressure_file" in t:
        pressure_file = reader.existing_file(t["pressure_file"], "project.pressure_file",
                                             "pressure")
        try:
            pressures = read_pressure_points(pressure_file)
        except SatHeightError as exc:
            raise reader.error("project.pressure_file", f"{exc.where}: {exc.what}",
                               hint=exc.hint) from None
    return Measured(core_files, plugs, pressure_file, pressures)
