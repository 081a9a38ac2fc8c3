"""Progress on stderr only on a terminal (and not with --quiet); results on stdout; warnings and
per-well failures on stderr; ``python -m satheight`` works.

The terminal is a pseudo-terminal from the standard library's ``pty`` module: what a user's
terminal receives is read back from its other end.
"""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_wells"
ENV = dict(os.environ, PYTHONPATH=str(ROOT / "src"))

pty = pytest.importorskip("pty", reason="pseudo-terminals need a POSIX system")


def _run(args, stderr_tty=False, cwd=None):
    """Run ``python -m satheight ARGS``; return (exit code, stdout, stderr) as text."""
    cmd = [sys.executable, "-m", "satheight", *map(str, args)]
    if not stderr_tty:
        r = subprocess.run(cmd, capture_output=True, text=True, env=ENV, cwd=cwd, timeout=300)
        return r.returncode, r.stdout, r.stderr
    master, slave = pty.openpty()
    p = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=slave, env=ENV, cwd=cwd)
    os.close(slave)
    err = b""
    while True:
        try:
            chunk = os.read(master, 65536)
        except OSError:          # the other end closed (Linux raises EIO)
            break
        if not chunk:
            break
        err += chunk
    out = p.stdout.read()
    p.wait(timeout=300)
    os.close(master)
    return p.returncode, out.decode(), err.decode(errors="replace")


def test_python_m_satheight_runs_the_command_line():
    code, out, _ = _run(["--version"])
    assert code == 0 and out.startswith("satheight ")


def test_progress_on_a_terminal_shows_wells_done_current_well_and_time(tmp_path):
    code, out, err = _run(["demo", "--no-plots", "--out", tmp_path / "o"], stderr_tty=True)
    assert code == 0
    assert "wells 5/5" in err and "elapsed" in err and "remaining" in err
    assert "VANTREL-3" in err                      # the current well is named
    assert "\r" in err                             # redrawn in place on the terminal
    assert "wells 5/5" not in out and "VANTREL-1: ok" in out   # results on stdout


def test_no_progress_when_stderr_is_not_a_terminal(tmp_path):
    code, out, err = _run(["demo", "--no-plots", "--out", tmp_path / "o"])
    assert code == 0
    assert "elapsed" not in err and "\r" not in err and "wells 5/5" not in err
    assert "VANTREL-5: ok" in out


def test_quiet_silences_progress_on_a_terminal(tmp_path):
    code, out, err = _run(["demo", "--no-plots", "--quiet", "--out", tmp_path / "o"],
                          stderr_tty=True)
    assert code == 0 and "elapsed" not in err and "wells 5/5" not in err


def test_failed_well_goes_to_stderr_and_results_to_stdout(tmp_path):
    bad = tmp_path / "BROKEN-1.las"
    bad.write_text("this is not a LAS file\n", encoding="utf-8")
    text = (DEMO / "demo_project.toml").read_text(encoding="utf-8")
    for key in ("las", "survey", "file", "tops_file", "pressure_file"):
        text = text.replace(f'\n{key} = "', f'\n{key} = "{DEMO.as_posix()}/')
    text = text.replace('core_files = ["', f'core_files = ["{DEMO.as_posix()}/')
    text = text.replace('", "', f'", "{DEMO.as_posix()}/')    # the other core files
    text += f'\n[[wells]]\nlas = "{bad.as_posix()}"\n'
    (tmp_path / "p.toml").write_text(text, encoding="utf-8")
    code, out, err = _run(["run", tmp_path / "p.toml", "--no-plots", "--out", tmp_path / "o"])
    assert code == 3                               # some wells failed (README exit codes)
    assert "BROKEN-1: FAILED" in err and "FAILED" not in out
    assert "VANTREL-1: ok" in out and "VANTREL-1: ok" not in err
