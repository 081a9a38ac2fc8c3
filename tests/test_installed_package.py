"""The built package holds every module of the source tree (a wheel without a subpackage gives a
command that fails on start). Checked with the standard library's zipfile on a wheel that pip
(a general-purpose tool) builds from this checkout, without installing it."""

from __future__ import annotations

import subprocess
import sys
import zipfile
from pathlib import Path

import pytest

pytestmark = pytest.mark.slow   # run by .ci/run's second step (README: tests)
ROOT = Path(__file__).resolve().parents[1]


def test_wheel_ships_every_module_and_the_report_template(tmp_path):
    r = subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps",
                        "-q", "-w", str(tmp_path), str(ROOT)], capture_output=True, text=True)
    if r.returncode != 0:
        pytest.skip(f"pip could not build a wheel here: {r.stderr.strip()[-300:]}")
    wheel = next(tmp_path.glob("satheight-*.whl"))
    names = set(zipfile.ZipFile(wheel).namelist())
    source = {str(p.relative_to(ROOT / "src")) for p in (ROOT / "src" / "satheight").rglob("*.py")}
    assert source - names == set()
    assert "satheight/templates/report.html.j2" in names
    assert "satheight/demo_data/demo_project.toml" in names
