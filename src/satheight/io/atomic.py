"""Atomic file output: write to a temporary file beside the target, then rename.

A reader of ``path`` sees either the old file or the complete new one, never a
half-written file. The temporary file lives in the same folder as ``path`` (so the
final :func:`os.replace` is a rename on one file system), its name starts with
``"."`` and ends with ``".tmp"``. If anything fails before the rename, the
temporary file is removed and an existing file at ``path`` is left untouched.
"""

from __future__ import annotations

import contextlib
import os
import stat
import uuid
from pathlib import Path
from typing import IO, Iterator

from ..errors import InputFileError, SatHeightError

__all__ = ["atomic_open", "atomic_write_text", "atomic_write_bytes", "atomic_save_figure"]

_WRITE_MODES = {"w": False, "wt": False, "tw": False, "wb": True, "bw": True}


#: Binary mode flag of os.open: exists on Windows only (0 elsewhere, where files are binary).
_O_BINARY = os.O_BINARY if hasattr(os, "O_BINARY") else 0


def _temp_path(path: Path) -> Path:
    """A fresh hidden temporary name beside ``path`` (``.name.<random>.tmp``)."""
    return path.with_name(f".{path.name}.{uuid.uuid4().hex[:12]}.tmp")


def _create_temp(path: Path) -> tuple[Path, int]:
    """Create the temporary file exclusively; permissions follow the umask (like ``open``)."""
    flags = os.O_WRONLY | os.O_CREAT | os.O_EXCL | _O_BINARY
    for _ in range(5):
        tmp = _temp_path(path)
        try:
            return tmp, os.open(tmp, flags, 0o666)
        except FileExistsError:
            continue
        except OSError as exc:
            raise InputFileError(
                f"cannot create a file in folder {str(path.parent)!r}: {exc.strerror or exc}",
                where=str(path),
                hint="check that the output folder exists and is writable",
            ) from exc
    raise InputFileError("cannot find a free temporary file name", where=str(path),
                         hint="remove stale hidden .tmp files from the output folder")


def _keep_old_mode(path: Path, tmp: Path) -> None:
    """Give the new file the permission bits of the file it replaces, if any."""
    try:
        mode = stat.S_IMODE(os.stat(path).st_mode)
    except OSError:
        return
    with contextlib.suppress(OSError):
        os.chmod(tmp, mode)


def _fsync_dir(folder: Path) -> None:
    """Flush the folder entry of the renamed file to disk (POSIX only, best effort)."""
    if os.name != "posix":
        return
    with contextlib.suppress(OSError):
        fd = os.open(folder, os.O_RDONLY)
        try:
            os.fsync(fd)
        finally:
            os.close(fd)


@contextlib.contextmanager
def atomic_open(path, mode: str = "w", encoding: str | None = "utf-8",
                newline: str | None = None) -> Iterator[IO]:
    """Open a temporary file for writing that replaces ``path`` when the block succeeds.

    Parameters
    ----------
    path : str or os.PathLike
        Final file name.
    mode : str
        ``"w"`` (text, the default) or ``"wb"`` (bytes).
    encoding : str, optional
        Text encoding; ignored for ``"wb"``.
    newline : str, optional
        As for :func:`open`.

    Yields
    ------
    file object
        Open on a temporary file ``.<name>.<random>.tmp`` in the folder of ``path``.
        On normal exit it is flushed, fsynced and renamed onto ``path``
        (:func:`os.replace`). If the block raises, the temporary file is deleted,
        ``path`` is left as it was and the exception propagates.

    Raises
    ------
    InputFileError
        If the temporary file cannot be created or renamed (missing folder, no
        permission, disk full).
    """
    if mode not in _WRITE_MODES:
        raise SatHeightError(f"atomic_open mode must be one of {sorted(_WRITE_MODES)}, got {mode!r}",
                             hint="use 'w' for text or 'wb' for bytes")
    binary = _WRITE_MODES[mode]
    path = Path(path)
    tmp, fd = _create_temp(path)
    try:
        if binary:
            fobj = os.fdopen(fd, "wb")
        else:
            fobj = os.fdopen(fd, "w", encoding=encoding, newline=newline)
    except BaseException:
        os.close(fd)
        with contextlib.suppress(OSError):
            os.unlink(tmp)
        raise
    try:
        with fobj:
            yield fobj
            try:
                fobj.flush()
                os.fsync(fobj.fileno())
            except OSError as exc:
                raise InputFileError(f"cannot write the file: {exc.strerror or exc}", where=str(path),
                                     hint="check free disk space and permissions") from exc
        _keep_old_mode(path, tmp)
        try:
            os.replace(tmp, path)
        except OSError as exc:
            raise InputFileError(f"cannot replace the file: {exc.strerror or exc}", where=str(path),
                                 hint="check that the file is not open elsewhere and the folder is "
                                      "writable") from exc
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(tmp)
        raise
    _fsync_dir(path.parent)


def atomic_write_text(path, text: str, encoding: str = "utf-8") -> None:
    """Write ``text`` to ``path`` atomically (see :func:`atomic_open`).

    Newlines are written as given (no translation), so ``"\\n"`` stays ``"\\n"``.
    """
    with atomic_open(path, "w", encoding=encoding, newline="") as f:
        f.write(text)


def atomic_write_bytes(path, data: bytes) -> None:
    """Write ``data`` to ``path`` atomically (see :func:`atomic_open`)."""
    with atomic_open(path, "wb") as f:
        f.write(data)


def atomic_save_figure(fig, targets, **savefig_kwargs) -> list[Path]:
    """Save a matplotlib figure to one or more files atomically (see :func:`atomic_open`).

    Every file is written to its own temporary file (flushed and fsynced); the
    renames onto the targets happen only after *all* of them were saved, so a
    failure in any save leaves every target as it was and no temporary file behind.

    Parameters
    ----------
    fig : matplotlib.figure.Figure
        The figure (with a canvas that can render the formats asked for, e.g. Agg).
    targets : sequence of path or of (path, format)
        Output files; a bare path takes its format from its ending (``png`` when none).
    **savefig_kwargs
        Passed to :meth:`~matplotlib.figure.Figure.savefig` (e.g. ``dpi``).

    Returns
    -------
    list[pathlib.Path]
        The files written, in the order given.

    Raises
    ------
    InputFileError
        A temporary file cannot be created, written or renamed.
    """
    pairs = []
    for t in targets:
        if isinstance(t, (tuple, list)):
            p, fmt = Path(t[0]), str(t[1])
        else:
            p = Path(t)
            fmt = p.suffix.lstrip(".").lower() or "png"
        pairs.append((p, fmt))
    with contextlib.ExitStack() as stack:       # leaving it renames every file, or none on error
        for p, fmt in pairs:
            f = stack.enter_context(atomic_open(p, "wb"))
            fig.savefig(f, format=fmt, **savefig_kwargs)
    return [p for p, _ in pairs]
