"""Clean errors, not "internal error" or a hang: each case ends in one line on stderr that names
the path, with exit status 2 (bad input or an output that cannot be written), and leaves no
half-written output.

Independent references: the file types and errors of the operating system (os.mkfifo, symbolic
links, /dev/zero, resource.RLIMIT_FSIZE: common practice on POSIX).
"""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

from satheight.cli import main
from tiny_field import make_field

ROOT = Path(__file__).resolve().parents[1]
posix = pytest.mark.skipif(os.name != "posix", reason="POSIX file types and limits")


def one_clean_line(capsys, *names: str) -> str:
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and err.startswith("satheight: error: "), err
    assert "internal error" not in err and "Traceback" not in err
    for n in names:
        assert n in err, (n, err)
    return err


@posix
def test_symlink_loop_as_input_folder(tmp_path, capsys):
    (tmp_path / "loop").symlink_to(tmp_path / "loop")
    assert main(["run", str(tmp_path / "loop" / "p.toml"), "--out", str(tmp_path / "o")]) == 2
    one_clean_line(capsys, "loop")


@posix
def test_symlink_loop_as_las_path(tmp_path, capsys):
    p = make_field(tmp_path)
    (tmp_path / "loop.las").symlink_to(tmp_path / "loop.las")
    p.write_text(p.read_text().replace('las = "w1.las"', 'las = "loop.las"'))
    assert main(["run", str(p), "--out", str(tmp_path / "o"), "--no-plots"]) == 2
    one_clean_line(capsys, "loop.las", "loop")
    assert main(["inspect", str(tmp_path / "loop.las")]) == 2
    one_clean_line(capsys, "loop.las", "symbolic-link loop")


def test_output_path_below_a_regular_file(tmp_path, capsys):
    p = make_field(tmp_path / "in")
    (tmp_path / "afile").write_text("x")
    assert main(["run", str(p), "--out", str(tmp_path / "afile" / "sub"), "--no-plots"]) == 2
    one_clean_line(capsys, "afile", "below a regular file")


def test_output_folder_that_cannot_be_created(tmp_path, capsys):
    p = make_field(tmp_path / "in")
    ro = tmp_path / "ro"
    ro.mkdir()
    ro.chmod(0o500)
    try:
        target = ro / "out"
        if os.access(ro, os.W_OK):           # root ignores permission bits: use a read-only
            target = Path("/proc/satheight-out")   # kernel file system instead (Linux)
            if not Path("/proc/self").exists():
                pytest.skip("no read-only folder available")
        assert main(["run", str(p), "--out", str(target), "--no-plots"]) == 2
        one_clean_line(capsys, str(target), "cannot be created")
    finally:
        ro.chmod(0o700)


@posix
@pytest.mark.parametrize("kind", ["fifo", "device", "folder"])
def test_device_or_fifo_as_las_is_refused_before_reading(tmp_path, capsys, kind):
    p = make_field(tmp_path)
    if kind == "fifo":
        os.mkfifo(tmp_path / "pipe.las")
        las = tmp_path / "pipe.las"
    elif kind == "device":
        las = Path("/dev/zero")
    else:
        las = tmp_path / "dir.las"
        las.mkdir()
    assert main(["inspect", str(las)]) == 2          # would block or read forever if opened
    one_clean_line(capsys, str(las), "not a regular file")
    p.write_text(p.read_text().replace('las = "w1.las"', f'las = "{las}"'))
    assert main(["run", str(p), "--out", str(tmp_path / "o"), "--no-plots"]) == 2
    one_clean_line(capsys, str(las))


@pytest.mark.parametrize("opening,closing", [("[", "]"), ("{a=", "}")])
def test_deeply_nested_toml(tmp_path, capsys, opening, closing):
    p = tmp_path / "deep.toml"
    p.write_text('[project]\nunits = "metric"\nx = ' + opening * 5000 + "1" + closing * 5000 + "\n")
    assert main(["run", str(p), "--out", str(tmp_path / "o")]) == 2
    one_clean_line(capsys, "deep.toml", "too deeply")


@posix
def test_file_size_limit_while_writing_leaves_nothing_half_written(tmp_path):
    resource = pytest.importorskip("resource")
    p = make_field(tmp_path / "in")
    out = tmp_path / "out"

    def limit():
        resource.setrlimit(resource.RLIMIT_FSIZE, (20_000, 20_000))   # smaller than one LAS

    r = subprocess.run([sys.executable, str(ROOT / "cli.py"), "run", str(p), "--out", str(out),
                        "--no-plots"], capture_output=True, text=True, preexec_fn=limit)
    assert r.returncode == 2, r.stderr
    assert r.stderr.count("\n") == 1 and "File too large" in r.stderr and "internal" not in r.stderr
    assert os.listdir(out) == []                      # no output, no work folder, no lock
