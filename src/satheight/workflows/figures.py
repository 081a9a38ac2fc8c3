"""Writing the figures that plots/ returns: every file through satheight.io.atomic."""

from __future__ import annotations

import re
from pathlib import Path

from ..errors import InputFileError
from ..io.atomic import atomic_save_figure
from ..plots import DPI
from ..plots.crossplot import zone_crossplots

__all__ = ["save_figure", "save_crossplots", "file_stem"]

#: zlib compression level of the PNG files (0-9).
PNG_COMPRESS_LEVEL = 3


def save_figure(fig, png_path, pdf_path=None) -> list[Path]:
    """Write ``fig`` as PNG (and PDF if asked) atomically; return the files written.

    Every target is written to a flushed and fsynced temporary file in its folder
    and all are renamed into place only after all saved, so a failure leaves every
    target as it was (:func:`satheight.io.atomic.atomic_save_figure`).

    Raises
    ------
    InputFileError
        The folder of an output path does not exist.
    """
    targets = [(Path(png_path), "png")]
    if pdf_path is not None:
        targets.append((Path(pdf_path), "pdf"))
    for path, fmt in targets:
        if not path.parent.is_dir():
            raise InputFileError(f"folder {str(path.parent)!r} for the {fmt.upper()} plot does "
                                 "not exist", where=str(path),
                                 hint="create the folder or choose another output path")
    # zlib level 3 instead of the default 6: the same pixels, about 10 % larger files,
    # about a quarter less time spent compressing; print_pdf takes no pil_kwargs
    png = {"pil_kwargs": {"compress_level": PNG_COMPRESS_LEVEL}} if pdf_path is None else {}
    return atomic_save_figure(fig, targets, dpi=DPI, **png)


def file_stem(name: str) -> str:
    """A file-name part from input text: letters, digits, ``._-`` kept, the rest ``_``."""
    stem = re.sub(r"[^A-Za-z0-9._-]+", "_", str(name)).strip("._")
    return stem[:60] or "unnamed"


def save_crossplots(wells, out_dir, units: str = "metric") -> list[Path]:
    """Write ``crossplot_<zone>.png`` for every zone with log Sw; return the files.

    ``wells`` are :func:`satheight.plots.crossplot.crossplot_data` items (None for a
    well without log Sw). Two zones whose names give the same file name get
    ``_2``, ``_3``, ... after the second.
    """
    files: list[Path] = []
    used: set[str] = set()
    for zone_name, fig in zone_crossplots(wells, units=units):
        stem = base = f"crossplot_{file_stem(zone_name)}"
        i = 1
        while stem.lower() in used:
            i += 1
            stem = f"{base}_{i}"
        used.add(stem.lower())
        files += save_figure(fig, Path(out_dir) / f"{stem}.png")
    return files
