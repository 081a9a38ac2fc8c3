"""Writing the figures that plots/ returns: every file through satheight.io.atomic."""

from __future__ import annotations

from pathlib import Path

from ..errors import InputFileError
from ..io.atomic import atomic_save_figure
from ..plots import DPI

__all__ = ["save_figure"]


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
    return atomic_save_figure(fig, targets, dpi=DPI)
