"""Refactoring guard: the demo's result files are byte-identical to those of a reference commit.

Both runs happen in this test, on this machine, with the same input files (the demo field of the
checkout): once with the package source of ``REFERENCE_COMMIT`` (taken out of git history), once
with the package source of the checkout. A change that moves code around must leave every LAS,
CSV and JSON result file identical byte for byte. A change that alters results on purpose
moves ``REFERENCE_COMMIT`` forward, and its commit message says which results changed and why.

Because both runs use the same CPU and libraries, the comparison does not depend on the machine.
The test is skipped (with the reason) where the checkout has no git history.
"""

from __future__ import annotations

import shutil
import subprocess
import sys
import tarfile
import io
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
# The last commit whose results are the expected ones (see the module docstring).
pytestmark = pytest.mark.slow   # run by .ci/run's second step (README: tests)
REFERENCE_COMMIT = "aa7d776598fc7f71aaacc08e84ff73b0e0fc8784"
COMPARED_SUFFIXES = (".las", ".csv", ".json")
# Files that carry the run's own provenance (tool version, input paths and checksums): not results.
NOT_COMPARED = {"run_summary.json"}


def _git(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run(["git", "-C", str(ROOT), *args], capture_output=True)


def _reference_source(dest: Path) -> Path:
    if shutil.which("git") is None or not (ROOT / ".git").exists():
        pytest.skip("no git history in this checkout: the reference commit cannot be taken out")
    if _git("cat-file", "-e", f"{REFERENCE_COMMIT}^{{commit}}").returncode != 0:
        pytest.skip(f"reference commit {REFERENCE_COMMIT[:10]} is not in this clone's history")
    archive = _git("archive", "--format=tar", REFERENCE_COMMIT, "src")
    # refactoring guard (module docstring): the reference commit's code is taken out with git
    assert archive.returncode == 0, archive.stderr.decode(errors="replace")
    with tarfile.open(fileobj=io.BytesIO(archive.stdout)) as tar:
        tar.extractall(dest, filter="data")
    return dest / "src"


DEMO = ROOT / "demo_wells"
PROJECT = DEMO / "demo_project.toml"
CORE_FILES = [DEMO / n for n in ("core_plugs.csv", "core_pc_steps.csv", "core_plate_steps.csv",
                                 "core_plug_V12.csv")]
# The commands whose result files are compared: the run, the core fit, the two contact jobs.
COMMANDS = {
    "run": ["run", PROJECT, "--no-plots", "--csv"],
    "fit": ["fit", *CORE_FILES, "--reservoir", "Upper Sand=26 mN/m,300 kg/m3",
            "--reservoir", "Lower Sand=50 mN/m,859.5 kg/m3"],
    "fwl": ["fwl", PROJECT, "--zone", "Lower Sand", "--resamples", "40"],
    "pressures": ["pressures", DEMO / "demo_pressures.csv", "--project", PROJECT],
}


def _run(src: Path, args: list, out: Path) -> None:
    code = ("import sys; sys.path.insert(0, sys.argv[1]); from satheight.cli import main; "
            "sys.exit(main(sys.argv[2:]))")
    out.parent.mkdir(parents=True, exist_ok=True)
    r = subprocess.run([sys.executable, "-c", code, str(src), *map(str, args), "--out", str(out)],
                       capture_output=True, text=True, cwd=out.parent)
    # refactoring guard: the command runs at the reference commit
    assert r.returncode == 0, r.stdout + r.stderr


def _result_files(folder: Path) -> dict[str, bytes]:
    return {p.name: p.read_bytes() for p in sorted(folder.iterdir())
            if p.suffix in COMPARED_SUFFIXES and p.name not in NOT_COMPARED}


@pytest.fixture(scope="module")
def reference_src(tmp_path_factory):
    return _reference_source(tmp_path_factory.mktemp("ref"))


@pytest.mark.parametrize("command", sorted(COMMANDS))
def test_demo_results_identical_to_reference_commit(command, reference_src, tmp_path):
    _run(reference_src, COMMANDS[command], tmp_path / "before" / command)
    _run(ROOT / "src", COMMANDS[command], tmp_path / "after" / command)
    before = _result_files(tmp_path / "before" / command)
    after = _result_files(tmp_path / "after" / command)
    # refactoring guard: result files byte-identical to the reference commit's, both made on
    # this machine (a comparison of two versions of the code, not a value check)
    assert before, f"{command} wrote no LAS, CSV or JSON file"
    assert sorted(after) == sorted(before)
    changed = [name for name in before if before[name] != after[name]]
    assert changed == [], f"result files differ from commit {REFERENCE_COMMIT[:10]}: {changed}"
