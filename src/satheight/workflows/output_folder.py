"""Where a command writes: its inputs checked and kept, its outputs placed together.

Every command (``run``, ``demo``, ``fit``, ``fwl``, ``pressures``) writes through an
:class:`OutputSession`:

1. Before anything is written, every input file is checked (a regular file: not a
   folder, FIFO or device; no symbolic-link loop) and its SHA-256 recorded
   (:class:`InputFiles`).
2. The output folder is created. A lock file ``.satheight.lock`` holding the process
   id makes a second run into the same folder fail at once; a lock left by a process
   that no longer runs (on this machine) is removed.
3. Work folders ``.satheight-work-*`` left behind by a run that was killed (SIGKILL,
   power loss) are removed: the lock guarantees that no live run owns one.
4. Every output is written into a fresh work folder ``.satheight-work-<id>`` inside
   the output folder.
5. At the end (:meth:`OutputSession.commit`) the inputs' checksums are verified (an
   input that changed during the run is an error naming it), and the output names are
   checked: no two outputs share a name, none is an input file, and none replaces a
   file that satheight did not write: only files listed in the previous manifest of
   the same command may be replaced, only with ``overwrite``, and only if they are
   unchanged since. Then the files are moved into place together, the files of the
   previous manifest that this run did not write are removed, and the manifest
   ``satheight-manifest-<command>.sha256`` lists what the run wrote (one
   ``<sha256>  <file name>`` line per file, the format ``sha256sum -c`` checks).

Anything else in the output folder is left alone. A run killed while moving its files
leaves each file complete (old or new); the manifest written just before the move
lists both runs' files, so the next run with ``overwrite`` may replace them.
"""

from __future__ import annotations

import contextlib
import errno
import os
import shutil
import socket
import stat
import uuid
from pathlib import Path

from ..coreplugs import sha256_of
from ..errors import InputFileError, OutputExistsError, OutputWriteError, SatHeightError
from ..io.atomic import atomic_write_text

__all__ = ["InputFiles", "OutputSession", "check_input_file", "manifest_name",
           "check_output_folder", "LOCK_NAME", "WORK_PREFIX"]

LOCK_NAME = ".satheight.lock"
WORK_PREFIX = ".satheight-work-"
#: Files that mark a folder as holding an earlier run's results when it has no manifest
#: (folders written before manifests existed).
LEGACY_MARKERS = {"run": ("run_summary.json",)}


def manifest_name(command: str) -> str:
    """File name of a command's manifest in its output folder."""
    return f"satheight-manifest-{command}.sha256"


# --------------------------------------------------------------------------------------
# inputs

def _kind(mode: int) -> str:
    if stat.S_ISDIR(mode):
        return "a folder"
    if stat.S_ISFIFO(mode):
        return "a FIFO (named pipe)"
    if stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        return "a device"
    if stat.S_ISSOCK(mode):
        return "a socket"
    return "not a regular file"


def check_input_file(path, what: str = "input file") -> Path:
    """``path`` if it names a readable regular file; else one clear :class:`InputFileError`.

    Checked before the file is opened: a folder, FIFO, device or socket is refused (reading
    ``/dev/zero`` or a FIFO would never end), and so is a symbolic-link loop.
    """
    p = Path(path)
    try:
        st = os.stat(p)                       # follows symbolic links
    except OSError as exc:
        if exc.errno == errno.ELOOP:
            raise InputFileError(f"{what} is a symbolic-link loop", where=str(p),
                                 hint="point the path at a real file") from None
        if exc.errno in (errno.ENOENT, errno.ENOTDIR):
            raise InputFileError(f"{what} not found", where=str(p),
                                 hint="check the path (relative paths in a project file are "
                                      "relative to the project file)") from None
        raise InputFileError(f"{what} cannot be read: {exc.strerror or exc}", where=str(p),
                             hint="check the path and its permissions") from None
    if not stat.S_ISREG(st.st_mode):
        raise InputFileError(f"{what} is {_kind(st.st_mode)}, not a regular file", where=str(p),
                             hint="give the path of a file")
    return p


class InputFiles:
    """The input files of one command, with their SHA-256 taken before the run starts."""

    def __init__(self) -> None:
        self._files: dict[str, tuple[str, Path, str, tuple[int, int]]] = {}

    def add(self, path, what: str = "input file") -> str:
        """Check ``path`` (:func:`check_input_file`), record its checksum; return the checksum."""
        p = check_input_file(path, what)
        key = os.path.realpath(p)
        if key not in self._files:
            st = os.stat(p)
            self._files[key] = (what, p, _checksum(p, what), (st.st_dev, st.st_ino))
        return self._files[key][2]

    def checksum(self, path) -> str | None:
        """The checksum recorded for ``path``, or None if it is not an input."""
        entry = self._files.get(os.path.realpath(path))
        return None if entry is None else entry[2]

    def which(self, path) -> str | None:
        """What input ``path`` is (e.g. ``"LAS file"``), or None if it is none of them."""
        entry = self._files.get(os.path.realpath(path))
        if entry is not None:
            return entry[0]
        try:
            st = os.stat(path)
        except OSError:
            return None
        ident = (st.st_dev, st.st_ino)
        return next((w for w, _, _, i in self._files.values() if i == ident), None)

    def verify(self) -> None:
        """Raise :class:`InputFileError` naming the first input whose bytes changed since :meth:`add`."""
        for what, p, digest, _ in self._files.values():
            try:
                now = sha256_of(p)
            except OSError:
                now = None
            if now != digest:
                raise InputFileError(f"{what} changed (or disappeared) while satheight was running",
                                     where=str(p),
                                     hint="nothing was placed in the output folder; rerun when no "
                                          "other program writes to the inputs")


def _checksum(p: Path, what: str) -> str:
    try:
        return sha256_of(p)
    except OSError as exc:
        raise InputFileError(f"{what} cannot be read: {exc.strerror or exc}", where=str(p),
                             hint="check the file's permissions") from None


# --------------------------------------------------------------------------------------
# the output folder

def _make_folder(out_dir: Path) -> Path:
    """Create ``out_dir`` (and parents); every failure is one :class:`OutputWriteError`."""
    try:
        st = os.stat(out_dir)
    except OSError as exc:
        if exc.errno == errno.ELOOP:
            raise OutputWriteError("output path is a symbolic-link loop", where=str(out_dir),
                                   hint="choose another --out") from None
        st = None
    if st is not None and not stat.S_ISDIR(st.st_mode):
        raise OutputWriteError("output path exists and is not a folder", where=str(out_dir),
                               hint="choose another --out")
    try:
        out_dir.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        below = next((p for p in out_dir.parents if p.is_file()), None)
        if below is not None:
            raise OutputWriteError(f"output path lies below a regular file ({below})",
                                   where=str(out_dir), hint="choose another --out") from None
        raise OutputWriteError(f"output folder cannot be created: {exc.strerror or exc}",
                               where=str(out_dir),
                               hint="choose a folder you can write to (--out)") from None
    return out_dir


def _pid_alive(pid: int) -> bool:
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except (PermissionError, OSError):
        return True
    return True


def _lock_owner(lock: Path) -> tuple[int | None, str]:
    try:
        pid, host = (lock.read_text(encoding="utf-8").split() + ["", ""])[:2]
        return int(pid), host
    except (OSError, ValueError):
        return None, ""


def _take_lock(folder: Path) -> Path:
    """Create ``folder/.satheight.lock`` (pid and host); a dead owner's lock is replaced."""
    lock = folder / LOCK_NAME
    for _ in range(3):
        try:
            fd = os.open(lock, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o644)
        except FileExistsError:
            pid, host = _lock_owner(lock)
            here = socket.gethostname()
            if pid is not None and (host != here or _pid_alive(pid)):
                raise OutputExistsError(
                    f"another satheight run (process {pid} on {host or 'this machine'}) is "
                    "writing into this folder", where=str(folder),
                    hint=f"wait for it to end, or choose another --out; if no run is going on, "
                         f"remove {LOCK_NAME}") from None
            stale = lock.with_name(f"{LOCK_NAME}.{uuid.uuid4().hex[:8]}.stale")
            with contextlib.suppress(OSError):
                os.replace(lock, stale)          # one of two racing runs gets it
                os.unlink(stale)
            continue
        except OSError as exc:
            raise OutputWriteError(f"cannot create the lock file: {exc.strerror or exc}",
                                   where=str(lock), hint="choose a folder you can write to") from None
        with os.fdopen(fd, "w", encoding="utf-8") as f:
            f.write(f"{os.getpid()} {socket.gethostname()}\n")
        return lock
    raise OutputExistsError("cannot take the lock of the output folder", where=str(folder),
                            hint=f"remove {LOCK_NAME} if no satheight run is going on")


def _read_manifest(path: Path) -> dict[str, set[str]]:
    """File name -> the checksums the manifest lists for it (empty when there is none)."""
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        return {}
    except (OSError, UnicodeDecodeError) as exc:
        raise OutputExistsError(f"the manifest cannot be read: {exc}", where=str(path),
                                hint="remove it and the files it lists, or choose another --out") from None
    out: dict[str, set[str]] = {}
    for line in text.splitlines():
        digest, sep, name = line.partition("  ")
        if sep and len(digest) == 64 and name and "/" not in name:
            out.setdefault(name, set()).add(digest)
    return out


def check_output_folder(out_dir, overwrite: bool, command: str = "run") -> None:
    """Refuse a folder holding an earlier ``command`` run's results unless ``overwrite``.

    Raises
    ------
    OutputExistsError
        If ``out_dir`` holds the command's manifest (or, for ``run``, a
        ``run_summary.json`` of a run older than manifests) and ``overwrite`` is false.
    """
    out_dir = Path(out_dir)
    if overwrite or not out_dir.is_dir():
        return
    found = [m for m in (manifest_name(command), *LEGACY_MARKERS.get(command, ()))
             if (out_dir / m).exists()]
    if found:
        raise OutputExistsError("the output folder already holds the results of an earlier run "
                                f"({found[0]})", where=str(out_dir),
                                hint="add --overwrite to replace them, or choose another --out")


def _clean_dead_work_folders(folder: Path) -> None:
    """Remove work folders of killed runs (called with the folder's lock held)."""
    for p in folder.glob(WORK_PREFIX + "*"):
        if p.is_dir() and not p.is_symlink():
            shutil.rmtree(p, ignore_errors=True)


class OutputSession:
    """One command's writing into ``out_dir`` (see the module docstring).

    Use as a context manager; write every output into :attr:`work`, then call
    :meth:`commit` with the written files. Leaving the block removes the work folder
    and the lock whatever happened; an :class:`OSError` raised inside (a full disk, a
    file-size limit) becomes one :class:`OutputWriteError`, and nothing is placed.
    """

    def __init__(self, out_dir, command: str, overwrite: bool, inputs: InputFiles):
        self.out_dir = Path(out_dir)
        self.command = command
        self.overwrite = overwrite
        self.inputs = inputs
        self.work: Path | None = None
        self._lock: Path | None = None
        self._previous: dict[str, set[str]] = {}

    def __enter__(self) -> "OutputSession":
        _make_folder(self.out_dir)
        self._lock = _take_lock(self.out_dir)
        try:
            check_output_folder(self.out_dir, self.overwrite, self.command)
            self._previous = _read_manifest(self.out_dir / manifest_name(self.command))
            _clean_dead_work_folders(self.out_dir)
            self.work = self.out_dir / f"{WORK_PREFIX}{uuid.uuid4().hex[:12]}"
            self.work.mkdir()
        except OSError as exc:
            self._release()
            raise OutputWriteError(f"cannot write into the output folder: {exc.strerror or exc}",
                                   where=str(self.out_dir),
                                   hint="choose a folder you can write to (--out)") from None
        except BaseException:
            self._release()
            raise
        return self

    def __exit__(self, exc_type, exc, tb) -> None:
        self._release()
        if exc is not None and isinstance(exc, OSError) and not isinstance(exc, SatHeightError):
            raise OutputWriteError(f"the run stopped on a file error: {exc.strerror or exc}",
                                   where=str(exc.filename or self.out_dir),
                                   hint="check free disk space, the file-size limit and "
                                        "permissions; nothing was placed in the output "
                                        "folder") from exc

    def _release(self) -> None:
        if self.work is not None:
            shutil.rmtree(self.work, ignore_errors=True)
            self.work = None
        if self._lock is not None:
            with contextlib.suppress(OSError):
                self._lock.unlink()
            self._lock = None

    def _ours(self, target: Path) -> bool:
        """True if ``target`` is a regular file of the previous manifest, unchanged since."""
        sums = self._previous.get(target.name)
        if not sums or target.is_symlink() or not target.is_file():
            return False
        try:
            return sha256_of(target) in sums
        except OSError:
            return False

    def _check_targets(self, names: list[str]) -> list[Path]:
        seen: dict[str, str] = {}
        for n in names:
            if n.casefold() in seen:
                raise SatHeightError(f"two outputs of this run have the same name: "
                                     f"{seen[n.casefold()]!r} and {n!r}", where=str(self.out_dir),
                                     hint="give the wells, zones or files distinct names")
            seen[n.casefold()] = n
        targets = [self.out_dir / n for n in names]
        for t in targets:
            what = self.inputs.which(t)
            if what is not None:
                raise OutputExistsError(f"an output would replace an input file ({what})",
                                        where=str(t), hint="choose another --out")
        foreign = [t.name for t in targets if (t.exists() or t.is_symlink()) and not
                   (self.overwrite and self._ours(t))]
        if foreign:
            listed = ", ".join(foreign[:5]) + (f" and {len(foreign) - 5} more" if len(foreign) > 5 else "")
            raise OutputExistsError(
                f"the output folder holds file(s) this run would replace that satheight did not "
                f"write (or that changed since): {listed}", where=str(self.out_dir),
                hint="move them away or choose another --out; --overwrite replaces only files "
                     f"listed in {manifest_name(self.command)} and unchanged since")
        return targets

    def commit(self, files: list[Path]) -> list[Path]:
        """Verify the inputs, check the names, move ``files`` (in the work folder) into place.

        The last file of ``files`` is moved last (put the run's summary there).
        Returns the final paths, in the order given.
        """
        self.inputs.verify()
        files = [Path(f) for f in files]
        outside = [f for f in files if f.parent != self.work]
        if outside:
            raise SatHeightError(f"output {outside[0]} was not written into the work folder",
                                 hint="please report it")
        targets = self._check_targets([f.name for f in files])
        new = [(sha256_of(f), f.name) for f in files]
        manifest = self.out_dir / manifest_name(self.command)
        old = [(d, n) for n, ds in self._previous.items() for d in sorted(ds)]
        # listed before the move, so files of either run left by a kill are known as ours
        atomic_write_text(manifest, "".join(f"{d}  {n}\n" for d, n in old + new))
        for f, t in zip(files, targets):
            os.replace(f, t)
        written = {n for _, n in new}
        for name in sorted(set(self._previous) - written):
            stale = self.out_dir / name
            if self._ours(stale):
                stale.unlink()
        atomic_write_text(manifest, "".join(f"{d}  {n}\n" for d, n in new))
        return targets
