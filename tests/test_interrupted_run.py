"""Nothing is lost: a run killed at a random moment (SIGKILL) leaves every output file either
the old complete file or the new complete file, never a half file; inputs are opened only for
reading and their checksums do not change.

Independent readers: lasio (LAS), json (standard library), pandas (CSV).
"""

import hashlib
import json
import os
import random
import signal
import subprocess
import sys
import time
from pathlib import Path

import lasio
import numpy as np
import pandas as pd
import pytest

from satheight.cli import main

ROOT = Path(__file__).resolve().parents[1]
pytestmark = pytest.mark.skipif(os.name != "posix", reason="needs SIGKILL")

N_WELLS, N_SAMPLES = 6, 5000

PROJECT = """[project]
units = "metric"
[log_sw]
rw = "0.05 ohm.m"
{wells}
[[zones]]
name = "S"
top = "900 m"
base = "5000 m"
fwl = "{fwl} m"
hydrocarbon = "oil"
water_density = "1.05 g/cm3"
hydrocarbon_density = "0.8 g/cm3"
sigma_cos_theta = "26 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.2
b = 1.5
"""


def make_project(folder: Path, fwl: float, name: str = "p.toml", n: int = N_SAMPLES) -> Path:
    """N_WELLS invented vertical wells of N_SAMPLES samples and a project file naming them."""
    rng = np.random.default_rng(1)
    for w in range(N_WELLS):
        las = folder / f"w{w}.las"
        if las.exists():
            continue
        d = 1000 + 0.1 * np.arange(n)
        cols = np.column_stack([d, rng.uniform(0.05, 0.3, n), 10 ** rng.uniform(-1, 3, n),
                                10 ** rng.uniform(0, 2, n)])
        head = ("~Version\nVERS. 2.0 :\nWRAP. NO :\n~Well\nSTRT.M 1000 :\n"
                f"STOP.M {d[-1]:.1f} :\nSTEP.M 0.1 :\nNULL. -999.25 :\nWELL. W{w} :\nEKB.M 25 :\n"
                "~Curve\nDEPT.M : depth\nPHIE.V/V : porosity\nPERM.MD : permeability\n"
                "RT.OHMM : resistivity\n~A\n")
        with open(las, "w") as f:
            f.write(head)
            np.savetxt(f, cols, fmt=["%.1f", "%.4f", "%.3f", "%.3f"])
    wells = "".join(f'[[wells]]\nlas = "w{w}.las"\n' for w in range(N_WELLS))
    p = folder / name
    p.write_text(PROJECT.format(wells=wells, fwl=fwl))
    return p


def _digest(p: Path) -> str:
    return hashlib.sha256(p.read_bytes()).hexdigest()


def check_complete(out: Path, old: dict[str, bytes], new_fwl: float) -> int:
    """Every visible output is the old file or a complete new one; return how many are new."""
    n_new = 0
    for f in sorted(out.iterdir()):
        # README (Outputs): each output is the old complete file or the new complete one; a killed
        # run may leave a hidden .<name>.<random>.tmp. New files are checked whole with independent
        # readers (library: lasio, json, pandas): every row, the new FWL given, a closed </html>
        if f.name.startswith("."):
            # a killed run leaves its lock, its work folder or a temporary file (cleaned by
            # the next run), never a visible half file
            assert (f.name.endswith(".tmp") or f.name == ".satheight.lock"
                    or (f.name.startswith(".satheight-work-") and f.is_dir())), \
                f"unexpected hidden file {f.name}"
            continue
        if f.name == "satheight-manifest-run.sha256":
            # sha256sum format: 64 hex digits, two spaces, a file name of the folder
            for line in f.read_text().splitlines():
                digest, _, name = line.partition("  ")
                assert len(digest) == 64 and int(digest, 16) >= 0 and "/" not in name, line
            continue
        data = f.read_bytes()
        if old.get(f.name) == data:
            continue
        n_new += 1
        if f.suffix == ".las":
            las = lasio.read(f)
            assert las.data.shape[0] == N_SAMPLES, f.name
            assert float(las.params["Z1_FWL"].value) == new_fwl, f.name
            assert np.all(np.isfinite(las["SW_SHM"])), f.name
        elif f.suffix == ".json":
            json.loads(data)
        elif f.stem in ("contacts", "shf_table"):     # hand-over tables: complete CSV text
            assert len(pd.read_csv(f)) > 0, f.name
        elif f.suffix in (".csv", ".parquet"):    # per well, field summary (1 zone), all wells
            rows = {"field_summary": N_WELLS, "all_wells": N_WELLS * N_SAMPLES}.get(f.stem, N_SAMPLES)
            assert len(pd.read_csv(f) if f.suffix == ".csv" else pd.read_parquet(f)) == rows, f.name
        elif f.suffix == ".html":
            assert data.rstrip().endswith(b"</html>"), f.name
        else:
            raise AssertionError(f"unexpected output {f.name}")
    return n_new


def test_killed_run_leaves_old_or_new_files_never_half(tmp_path):
    src = tmp_path / "in"
    src.mkdir()
    out = tmp_path / "out"
    first = make_project(src, 2000.0)
    t0 = time.monotonic()
    # README (Outputs): per well LAS, Parquet, CSV (--csv), JSON, plus run_summary.json and
    # report.html
    assert main(["run", str(first), "--out", str(out), "--no-plots", "--csv"]) == 0
    full = time.monotonic() - t0
    old = {f.name: f.read_bytes() for f in out.iterdir()}
    assert len(old) == 4 * N_WELLS + 10  # per well LAS, CSV, Parquet, JSON; run summary; report; 4 tables; manifest
    # ... and the 3 hand-over files (contacts.csv, shf_models.json, shf_table.csv)
    inputs = {f.name: _digest(f) for f in src.iterdir()}

    second = make_project(src, 1500.0, "p2.toml")
    rnd = random.Random()
    delays = []
    for _ in range(3):
        delay = rnd.uniform(0.2, max(0.5, 1.5 * full))
        delays.append(round(delay, 3))
        proc = subprocess.Popen([sys.executable, str(ROOT / "cli.py"), "run", str(second),
                                 "--out", str(out), "--no-plots", "--csv", "--overwrite"],
                                stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        time.sleep(delay)
        proc.send_signal(signal.SIGKILL)
        proc.wait()
        check_complete(out, old, 1500.0)
    # README (Outputs): inputs are only read, never written (SHA-256 before and after)
    # the inputs were only read
    assert {f.name: _digest(f) for f in src.iterdir() if f.name != "p2.toml"} == inputs, delays


def test_killed_first_run_leaves_only_complete_files(tmp_path):
    src = tmp_path / "in"
    src.mkdir()
    p = make_project(src, 1800.0)
    out = tmp_path / "out"
    proc = subprocess.Popen([sys.executable, str(ROOT / "cli.py"), "run", str(p), "--out",
                             str(out), "--no-plots", "--csv"],
                            stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    time.sleep(random.uniform(1.0, 2.5))
    proc.send_signal(signal.SIGKILL)
    proc.wait()
    if out.exists():
        check_complete(out, {}, 1800.0)


def test_rerun_is_refused_without_overwrite(tmp_path, capsys):
    src = tmp_path / "in"
    src.mkdir()
    p = make_project(src, 1800.0, n=300)
    out = tmp_path / "out"
    # README (Usage): a folder holding an earlier run is refused (exit code 2) unless
    # --overwrite is given; other files in the folder are left alone
    assert main(["run", str(p), "--out", str(out), "--no-plots"]) == 0
    before = {f.name: f.read_bytes() for f in out.iterdir()}
    capsys.readouterr()
    assert main(["run", str(p), "--out", str(out), "--no-plots"]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "--overwrite" in err and str(out) in err
    assert {f.name: f.read_bytes() for f in out.iterdir()} == before
    assert main(["run", str(p), "--out", str(out), "--no-plots", "--overwrite"]) == 0
    # an empty or unrelated folder needs no --overwrite
    other = tmp_path / "other"
    other.mkdir()
    (other / "notes.txt").write_text("mine")
    assert main(["run", str(p), "--out", str(other), "--no-plots"]) == 0
    assert (other / "notes.txt").read_text() == "mine"


def test_inputs_opened_read_only(tmp_path):
    """Audit every open() of the run: input files are never opened for writing."""
    src = tmp_path / "in"
    src.mkdir()
    p = make_project(src, 1800.0, n=300)
    inputs = {str(f.resolve()) for f in src.iterdir()}
    before = {f.name: _digest(f) for f in src.iterdir()}
    events = []
    active = [True]

    def hook(event, args):
        if active[0] and event == "open" and args and isinstance(args[0], (str, bytes, os.PathLike)):
            events.append((os.fsdecode(args[0]), args[1], args[2]))

    # README (Outputs): inputs are only read, never written; library: sys.addaudithook (standard
    # library) sees every open
    sys.addaudithook(hook)          # audit hooks cannot be removed: the flag turns it off
    try:
        assert main(["run", str(p), "--out", str(tmp_path / "out"), "--no-plots"]) == 0
    finally:
        active[0] = False
    opened = [(path, mode, flags) for path, mode, flags in events
              if str(Path(path).resolve()) in inputs]
    assert len(opened) >= N_WELLS + 1           # every input was read
    write_flags = os.O_WRONLY | os.O_RDWR | os.O_APPEND | os.O_CREAT | os.O_TRUNC
    for path, mode, flags in opened:
        assert mode is None or not any(c in str(mode) for c in "wax+"), (path, mode)
        assert not (flags or 0) & write_flags, (path, flags)
    assert {f.name: _digest(f) for f in src.iterdir()} == before
