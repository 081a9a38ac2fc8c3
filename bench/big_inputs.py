#!/usr/bin/env python3
"""Peak memory and time of whole runs on big inputs (not part of the test suite).

Cases (invented data, written to a temporary folder):

* ``big_las``: one well, 500,000 samples x 20 curves (DEPT, PHIE, PERM, RT and 16 more), run
  with and without plots;
* ``many_wells``: a project of 2,000 wells of 400 samples x 6 curves, run without plots.

Each run is ``python cli.py run ...`` in a child process; its peak resident memory is the
child's ``ru_maxrss`` from :func:`os.wait4` (Linux: KiB). Usage::

    python bench/big_inputs.py                 # both cases
    python bench/big_inputs.py big_las         # one case
    python bench/big_inputs.py many_wells --wells 500
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
FAILED: list[str] = []        # runs that ended with an error (the script then exits 1)

ZONE = """
[[zones]]
name = "S"
top = "900 m"
base = "7000 m"
fwl = "{fwl}"
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


def write_las(path: Path, name: str, n: int, n_curves: int, seed: int = 0) -> None:
    """An invented vertical well: depth from 1000 m at 0.01 m, n_curves curves in all."""
    rng = np.random.default_rng(seed)
    depth = 1000.0 + 0.01 * np.arange(n)
    cols = [depth, rng.uniform(0.05, 0.3, n), 10 ** rng.uniform(-1, 3, n), 10 ** rng.uniform(0, 2, n)]
    names = ["DEPT.M : depth", "PHIE.V/V : porosity", "PERM.MD : permeability",
             "RT.OHMM : resistivity"]
    for i in range(n_curves - 4):
        cols.append(rng.normal(50.0, 10.0, n))
        names.append(f"C{i:02d}.UNIT : invented curve {i}")
    fmt = ["%.2f", "%.4f", "%.3f", "%.3f"] + ["%.3f"] * (n_curves - 4)
    head = ("~Version\nVERS. 2.0 :\nWRAP. NO :\n~Well\n"
            f"STRT.M {depth[0]:.2f} :\nSTOP.M {depth[-1]:.2f} :\nSTEP.M 0.01 :\nNULL. -999.25 :\n"
            f"WELL. {name} :\nEKB.M 25 :\n~Curve\n" + "\n".join(names) + "\n~A\n")
    with open(path, "w") as f:
        f.write(head)
        np.savetxt(f, np.column_stack(cols), fmt=fmt)


def write_project(folder: Path, las_names: list[str], fwl: str) -> Path:
    wells = "".join(f'[[wells]]\nlas = "{n}"\n' for n in las_names)
    p = folder / "p.toml"
    p.write_text('[project]\nunits = "metric"\n[log_sw]\nrw = "0.05 ohm.m"\n' + wells + ZONE.format(fwl=fwl))
    return p


def run(project: Path, out: Path, plots: bool) -> tuple[int, float, float]:
    """Exit code, wall time [s] and peak RSS [MiB] of one command-line run."""
    args = [sys.executable, str(ROOT / "cli.py"), "run", str(project), "--out", str(out),
            "--overwrite"] + ([] if plots else ["--no-plots"])
    # stderr to a file, not a pipe: a run's warnings can fill a pipe while we wait for it
    with tempfile.TemporaryFile() as log:
        t0 = time.perf_counter()
        proc = subprocess.Popen(args, stdout=subprocess.DEVNULL, stderr=log)
        _, status, usage = os.wait4(proc.pid, 0)
        wall = time.perf_counter() - t0
        proc.returncode = os.waitstatus_to_exitcode(status)
        log.seek(0)
        err = log.read().decode(errors="replace")[-4000:]
    if proc.returncode != 0:        # 3: a well failed, 2: bad input; either way a failed case
        print(err, file=sys.stderr)
        FAILED.append(" ".join(args[2:4]))
    return proc.returncode, wall, usage.ru_maxrss / 1024.0


def baseline() -> float:
    """Peak RSS [MiB] of starting the tool and printing its version (imports only)."""
    proc = subprocess.Popen([sys.executable, str(ROOT / "cli.py"), "--version"],
                            stdout=subprocess.DEVNULL)
    _, _, usage = os.wait4(proc.pid, 0)
    return usage.ru_maxrss / 1024.0


def case_big_las(tmp: Path, n: int, n_curves: int) -> None:
    las = tmp / "big.las"
    t0 = time.perf_counter()
    write_las(las, "BIG-1", n, n_curves)
    size = las.stat().st_size / 2**20
    print(f"big_las: {n} samples x {n_curves} curves, {size:.0f} MiB file "
          f"(written in {time.perf_counter() - t0:.1f} s)")
    project = write_project(tmp, ["big.las"], "5000 m")
    for plots in (False, True):
        code, wall, rss = run(project, tmp / "out", plots)
        print(f"  run {'with' if plots else 'without'} plots: exit {code}, {wall:.1f} s, "
              f"peak RSS {rss:.0f} MiB")


def case_many_wells(tmp: Path, n_wells: int, n: int) -> None:
    names = []
    for w in range(n_wells):
        write_las(tmp / f"w{w:04d}.las", f"W{w:04d}", n, 6, seed=w)
        names.append(f"w{w:04d}.las")
    project = write_project(tmp, names, "1010 m")
    code, wall, rss = run(project, tmp / "out", plots=False)
    print(f"many_wells: {n_wells} wells x {n} samples x 6 curves, no plots: exit {code}, "
          f"{wall:.1f} s, peak RSS {rss:.0f} MiB")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("cases", nargs="*", default=["big_las", "many_wells"])
    ap.add_argument("--samples", type=int, default=500_000)
    ap.add_argument("--curves", type=int, default=20)
    ap.add_argument("--wells", type=int, default=2000)
    ap.add_argument("--well-samples", type=int, default=400)
    a = ap.parse_args()
    print(f"python {sys.version.split()[0]}, interpreter start-up peak RSS {baseline():.0f} MiB")
    with tempfile.TemporaryDirectory() as d:
        for c in a.cases:
            sub = Path(d) / c
            sub.mkdir()
            if c == "big_las":
                case_big_las(sub, a.samples, a.curves)
            elif c == "many_wells":
                case_many_wells(sub, a.wells, a.well_samples)
            else:
                raise SystemExit(f"unknown case {c!r}")
    if FAILED:
        raise SystemExit(f"{len(FAILED)} run(s) failed: " + "; ".join(FAILED))


if __name__ == "__main__":
    main()
