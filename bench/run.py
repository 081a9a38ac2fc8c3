#!/usr/bin/env python3
"""Benchmarks of satheight on logs of real size, each figure a ratio measured in this run.

    python bench/run.py [--quick] [--only read,well,...] [--json FILE] [--keep DIR]

Builds its own invented inputs in a temporary folder (a synthetic LAS 2.0 well of
500,000 rows x 13 curves, a project of 200 wells), then measures, every case in a
fresh Python process so that peak memories do not mix:

* LAS read: ``read_las`` vs ``lasio.read`` (time and peak memory);
* LAS write of the same well with 5 added curves: ``write_las`` vs ``LASFile.write``;
* engine on 10 million samples: ``compute_shm`` vs a bare numpy evaluation of the
  same closed-form expressions (no zones, no flags): the practical floor;
* one well end to end (load, compute, write LAS/Parquet/JSON; no plots) vs load
  alone and vs load + write;
* a 200-well project end to end with 2 worker processes vs 1 (wall time, peak memory).
* the demo run with plots vs without, and the bench well's track plot vs lasio's read;
* the 2-worker gain over a pure CPU task's gain in the same run (``project.efficiency``);
* with Dask installed, the project on a local Dask cluster vs the process pool, outputs
  compared byte by byte (``dask.ratio``, ``dask.identical``).

Times are the best of a few repeats (``--quick``: one, smaller sizes, well under a
minute). Peak memory is the growth of the process's peak resident set during the
measured call over its resident set just before (Linux ``/proc/self/status``
``VmHWM``, reset through ``/proc/self/clear_refs``; elsewhere ``ru_maxrss``).
Absolute seconds are printed beside each ratio; only the ratios are meant to be
compared between machines. ``--only`` measures some groups of figures (see :data:`GROUPS`;
``well`` and ``plots`` also measure ``read``, whose lasio time they are divided by).
Nothing here is part of the test suite.
"""

from __future__ import annotations

import argparse
import importlib.util
import json
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path
from types import SimpleNamespace

ROOT = Path(__file__).resolve().parents[1]
if (ROOT / "src" / "satheight").is_dir():
    sys.path.insert(0, str(ROOT / "src"))

import numpy as np  # noqa: E402

sys.path.insert(0, str(Path(__file__).resolve().parent))
from bench_measure import _measure, _peak_mb  # noqa: E402
from bench_scale import case_dask, case_plots  # noqa: E402

FULL = {"rows": 500_000, "engine": 10_000_000, "wells": 200, "well_rows": 20_000, "repeat": 3,
        "mc_rows": 20_000, "mc_realisations": 1000}
QUICK = {"rows": 50_000, "engine": 1_000_000, "wells": 20, "well_rows": 5_000, "repeat": 1,
         "mc_rows": 20_000, "mc_realisations": 1000}

#: Synthetic curves: mnemonic, unit, decimals, description.
CURVES = [("GR", "gAPI", 2, "Gamma ray"), ("PHIE", "v/v", 4, "Effective porosity"),
          ("PERM", "mD", 3, "Permeability"), ("RT", "ohm.m", 4, "Deep resistivity"),
          ("SW", "v/v", 4, "Water saturation"), ("NPHI", "v/v", 4, "Neutron porosity"),
          ("RHOB", "g/cm3", 4, "Bulk density"), ("DT", "us/ft", 2, "Sonic slowness"),
          ("CALI", "in", 3, "Caliper"), ("SP", "mV", 2, "Spontaneous potential"),
          ("VSH", "v/v", 4, "Shale volume"), ("PEF", "b/e", 3, "Photoelectric factor")]

PROJECT_HEAD = """# Invented benchmark project (bench/run.py): no real field.
[project]
name = "bench"
units = "metric"

[log_sw]
method = "archie"
rw = "0.045 ohm.m"
"""

ZONES = """
[[zones]]
name = "Upper"
top = "{t1} m"
base = "{b1} m"
fwl = "{f1} m"
hydrocarbon = "oil"
water_density = "1.08 g/cm3"
hydrocarbon_density = "0.78 g/cm3"
sigma_cos_theta = "26 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.3
b = 1.2
j_min = 0.1
j_max = 15

[[zones]]
name = "Lower"
top = "{b1} m"
base = "{b2} m"
fwl = "{f2} m"
hydrocarbon = "gas"
water_density = "1.07 g/cm3"
hydrocarbon_density = "0.22 g/cm3"
sigma_cos_theta = "50 mN/m"
[zones.function]
family = "brooks_corey"
swirr = 0.08
jd = 0.25
lam = 1.8
"""


#: Monte Carlo keys of the benchmark: every kind of uncertain input (invented spreads).
UNCERTAINTY = """
[uncertainty]
realisations = {realisations}
seed = 1
memory_mb = {memory_mb}
"""
ZONE_UNCERTAINTY = {"Upper": """[zones.uncertainty]
fwl = { distribution = "normal", sd = "5 m" }
water_density = { distribution = "uniform", low = "1.07 g/cm3", high = "1.09 g/cm3" }
hydrocarbon_density = { distribution = "triangular", low = "0.74 g/cm3", high = "0.82 g/cm3" }
sigma_cos_theta = { distribution = "truncated_normal", sd = "3 mN/m", low = "18 mN/m", high = "34 mN/m" }
porosity_error = { distribution = "normal", sd = 0.01, correlation_length = "2 m" }
permeability_error = { distribution = "normal", sd = 0.2, correlation_length = "2 m" }
[zones.uncertainty.function]
swirr = { distribution = "uniform", low = 0.05, high = 0.15 }
b = { distribution = "truncated_normal", sd = 0.1, low = 0.9, high = 1.5 }
""", "Lower": """[zones.uncertainty]
fwl = { distribution = "normal", sd = "3 m" }
porosity_error = { distribution = "normal", sd = 0.01, correlation_length = "2 m" }
permeability_error = { distribution = "normal", sd = 0.2, correlation_length = "2 m" }
"""}
#: Bound on the Monte Carlo's working arrays in the benchmark [MB].
MC_MEMORY_MB = 256


# ---------------------------------------------------------------------------
# inputs
# ---------------------------------------------------------------------------

def depth_step(n: int) -> float:
    """Sample step [m]: 0.1524 m (half a foot), or 0.01524 m where ``n`` samples at 0.1524 m
    would go deeper than the plausible depths (500,000 samples: 7.6 km, not 76 km)."""
    return 0.1524 if n * 0.1524 <= 7700.0 else 0.01524


def synthetic_well(n: int, seed: int, name: str, top: float = 1500.0):
    """An invented well of ``n`` samples (:func:`depth_step`) with the CURVES above."""
    from satheight.well import Curve, HeaderItem, Well

    rng = np.random.default_rng(seed)
    depth = np.round(top + depth_step(n) * np.arange(n), 5)

    def walk(lo, hi, step):
        x = np.cumsum(rng.normal(0, step, n))
        x = (x - x.min()) / max(np.ptp(x), 1e-9)
        return lo + (hi - lo) * x + rng.normal(0, (hi - lo) * 0.01, n)

    phie = np.clip(walk(0.02, 0.30, 1.0), 0.01, 0.35)
    values = {"GR": walk(20, 150, 1.0), "PHIE": phie,
              "PERM": np.clip(10 ** (phie * 16 - 1.5), 0.01, 5000), "RT": walk(0.5, 200, 1.0),
              "SW": np.clip(walk(0.1, 1.0, 1.0), 0.05, 1.0), "NPHI": walk(0.05, 0.45, 1.0),
              "RHOB": walk(2.0, 2.7, 1.0), "DT": walk(55, 140, 1.0), "CALI": walk(8.4, 12.0, 1.0),
              "SP": walk(-80, 10, 1.0), "VSH": np.clip(walk(0, 1, 1.0), 0, 1),
              "PEF": walk(1.8, 5.5, 1.0)}
    curves = {"DEPT": Curve("DEPT", "M", "Measured depth", depth)}
    for mn, unit, dec, descr in CURVES:
        v = np.round(np.abs(values[mn]) if mn != "SP" else values[mn], dec)
        gaps = rng.random(n) < 0.002                        # short null runs
        v[np.convolve(gaps, np.ones(5), "same") > 0] = np.nan
        curves[mn] = Curve(mn, unit, descr, v)
    header = {k: HeaderItem(k, u, v, d) for k, u, v, d in [
        ("WELL", "", name, "Well"), ("COMP", "", "Invented benchmark data", "Company"),
        ("EKB", "M", 25.0, "Kelly bushing elevation")]}
    return Well(name=name, source=Path(name + ".las"), md=depth.copy(), depth_unit="m",
                index_mnemonic="DEPT", curves=curves, well_header=header,
                other="INVENTED benchmark data written by bench/run.py.")


def write_well(path: Path, n: int, seed: int, name: str) -> None:
    from satheight.io.las import write_las

    write_las(path, synthetic_well(n, seed, name))


def write_project(folder: Path, files: list[str], rows: int) -> Path:
    top, bottom = 1500.0 - 25.0, 1500.0 + depth_step(rows) * rows - 25.0   # TVDSS of the wells
    mid = top + 0.55 * (bottom - top)
    zones = ZONES.format(t1=round(top + 0.05 * (bottom - top), 2), b1=round(mid, 2),
                         f1=round(top + 0.45 * (bottom - top), 2), b2=round(bottom + 1, 2),
                         f2=round(top + 0.9 * (bottom - top), 2))
    wells = "".join(f'\n[[wells]]\nlas = "{f}"\n' for f in files)
    path = folder / "project.toml"
    path.write_text(PROJECT_HEAD + wells + zones)
    return path


def build_mc_inputs(folder: Path, sizes: dict) -> dict:
    """A well of ``mc_rows`` samples and two projects on it: deterministic, and with the
    Monte Carlo keys of every zone (``mc_realisations`` realisations)."""
    mc = folder / "mc"
    mc.mkdir(parents=True, exist_ok=True)
    write_well(mc / "mc.las", sizes["mc_rows"], 7, "BENCH-MC")
    det = write_project(mc, ["mc.las"], sizes["mc_rows"])
    text = det.read_text()
    head, lower = text.split("[[zones]]\nname = \"Lower\"")
    text = (head.replace("[[wells]]", UNCERTAINTY.format(realisations=sizes["mc_realisations"],
                                                         memory_mb=MC_MEMORY_MB) + "\n[[wells]]", 1)
            + ZONE_UNCERTAINTY["Upper"] + "\n[[zones]]\nname = \"Lower\"" + lower
            + ZONE_UNCERTAINTY["Lower"])
    unc = mc / "project_mc.toml"
    unc.write_text(text)
    return {"mc_project": det, "mc_unc_project": unc}


def build_inputs(folder: Path, sizes: dict, field: bool = True) -> dict:
    folder.mkdir(parents=True, exist_ok=True)
    big = folder / "big.las"
    write_well(big, sizes["rows"], 1, "BENCH-1")
    write_well(folder / "small.las", 200, 2, "WARM-1")
    one = folder / "one"
    one.mkdir(exist_ok=True)
    os.link(big, one / "big.las") if not (one / "big.las").exists() else None
    one_project = write_project(one, ["big.las"], sizes["rows"])
    warm = folder / "warm"
    warm.mkdir(exist_ok=True)
    os.link(folder / "small.las", warm / "small.las")
    warm_project = write_project(warm, ["small.las"], 200)
    if not field:                                          # no project figures asked for
        return {"big": big, "small": folder / "small.las", "one_project": one_project,
                "warm_project": warm_project, "field_project": None}
    field = folder / "field"
    field.mkdir(exist_ok=True)
    names = []
    for i in range(sizes["wells"]):
        f = f"W{i + 1:03d}.las"
        write_well(field / f, sizes["well_rows"], 100 + i, f"BENCH-W{i + 1:03d}")
        names.append(f)
    field_project = write_project(field, names, sizes["well_rows"])
    return {"big": big, "small": folder / "small.las", "one_project": one_project,
            "warm_project": warm_project, "field_project": field_project}


# ---------------------------------------------------------------------------
# measured cases (each run in its own process by the parent)
# ---------------------------------------------------------------------------

def _new_curves(n: int):
    from satheight.well import Curve

    rng = np.random.default_rng(5)
    return [Curve(f"NEW{i}", "v/v", f"added curve {i}", rng.uniform(0, 1, n)) for i in range(5)]


def case_read(args) -> dict:
    import lasio

    from satheight.io.las import read_las

    read_las(args.small)                                   # imports and first-call costs
    lasio.read(str(args.small))
    if args.which == "ours":
        return _measure(lambda: read_las(args.file), args.repeat)
    return _measure(lambda: lasio.read(str(args.file)), args.repeat)


def case_write(args) -> dict:
    import lasio

    from satheight.io.las import read_las, write_las

    out = Path(args.out)
    if args.which == "ours":
        well = read_las(args.file)
        new = _new_curves(well.n_samples)
        write_las(out, read_las(args.small), [])
        decimals = {c.mnemonic: 5 for c in new}
        return _measure(lambda: write_las(out, well, new, decimals=decimals), args.repeat)
    las = lasio.read(str(args.file))
    for c in _new_curves(len(las.index)):
        las.append_curve(c.mnemonic, c.data, unit=c.unit, descr=c.description)
    lasio.read(str(args.small)).write(str(out))
    return _measure(lambda: las.write(str(out)), args.repeat)


def floor_numpy(z, phi, k, fwl, drho, sct, swirr, a, b):
    """Bare numpy: h, Pc, J, Sw of one zone, no masks, no flags, no zones."""
    g = 9.80665
    h = fwl - z
    pc = drho * g * h
    j = pc * np.sqrt(k / phi) / sct
    sw = np.clip(swirr + (1.0 - swirr) * a * np.power(j, -b), 0.0, 1.0)
    return h, pc, j, sw


def case_engine(args) -> dict:
    from satheight.engine import ZoneModel, compute_shm
    from satheight.models import build_function

    n = args.n
    rng = np.random.default_rng(3)
    z = np.linspace(2000.0, 2000.0 + 0.1524 * n / 100, n)  # a column well above the FWL
    phi = rng.uniform(0.05, 0.3, n)
    k = rng.uniform(0.1, 2000.0, n) * 9.869233e-16
    fn = build_function("power_law", {"swirr": 0.1, "a": 0.3, "b": 1.2}, (0.1, 15.0))
    fwl = float(z[-1]) + 50.0
    zone = ZoneModel("A", float(z[0]), fwl + 100.0, fwl, 1080.0, 780.0, "oil", 0.026, fn)
    res = {}
    for name, call in (("floor", lambda: floor_numpy(z, phi, k, fwl, 300.0, 0.026, 0.1, 0.3, 1.2)),
                       ("ours", lambda: compute_shm(z, phi, k, [zone]))):
        call()
        res[name] = _measure(call, max(args.repeat, 2))
    # same numbers in both (a check of the benchmark itself, not a test)
    f, o = floor_numpy(z[:1000], phi[:1000], k[:1000], fwl, 300.0, 0.026, 0.1, 0.3, 1.2), \
        compute_shm(z[:1000], phi[:1000], k[:1000], [zone])
    assert np.allclose(f[3], o.sw, rtol=1e-12), "engine and floor disagree"
    return res


def case_well(args) -> dict:
    from satheight.io.las import read_las
    from satheight.workflows import outputs as O
    from satheight.workflows import well as P
    from satheight.project import load_project

    warm = load_project(args.warm_project)
    out = Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    r, _ = P.compute_well(warm, warm.wells[0])             # imports and first-call costs
    O.write_outputs(r, warm, out, O.NO_PLOTS)
    project = load_project(args.project)
    spec = project.wells[0]
    res = {"load": _measure(lambda: read_las(spec.las), args.repeat)}
    result, _ = P.compute_well(project, spec)
    res["write"] = _measure(lambda: O.write_outputs(result, project, out, O.NO_PLOTS), args.repeat)
    del result

    def e2e():
        res_, _ = P.compute_well(project, spec)
        return O.write_outputs(res_, project, out, O.NO_PLOTS)

    res["e2e"] = _measure(e2e, args.repeat)
    return res


def case_project(args) -> dict:
    from satheight.workflows.run import run_project

    out = Path(args.out)
    t = time.perf_counter()
    report = run_project(args.project, out, plot=False, workers=args.workers)
    seconds = time.perf_counter() - t
    assert not report.failed, [w.error for w in report.failed]
    children = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024.0
    return {"seconds": seconds, "peak_mb": _peak_mb(), "child_peak_mb": children,
            "wells": len(report.wells)}


def _burn(n: int) -> float:
    s = 0
    for i in range(n):
        s += i
    return float(s)


def case_cores(args) -> dict:
    """The same pure-Python CPU task 4 times, one after the other and in 2 processes.

    Says how much a second process can gain on this machine at this moment (other
    jobs may hold a core), to read the project figure against.
    """
    from concurrent.futures import ProcessPoolExecutor

    n = args.n
    t = time.perf_counter()
    for _ in range(4):
        _burn(n)
    serial = time.perf_counter() - t
    with ProcessPoolExecutor(2) as pool:
        list(pool.map(_burn, [1000, 1000]))                # start the workers
        t = time.perf_counter()
        list(pool.map(_burn, [n] * 4))
        parallel = time.perf_counter() - t
    return {"serial": serial, "parallel": parallel}


def case_montecarlo(args) -> dict:
    """Monte Carlo of one well (``well_uncertainty``: realisations and tornado) against one
    deterministic no-plot run of the same well (compute, write LAS, Parquet, JSON)."""
    from satheight.project.reader import load_project
    from satheight.workflows import outputs as O
    from satheight.workflows import well as W
    from satheight.workflows.uncertainty import well_uncertainty

    det = load_project(args.project)
    unc = load_project(args.mc_project)
    out = Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    spec = det.wells[0]
    result, _ = W.compute_well(det, spec)                  # imports and first-call costs
    O.write_outputs(result, det, out, O.NO_PLOTS)

    def e2e():
        res_, _ = W.compute_well(det, spec)
        return O.write_outputs(res_, det, out, O.NO_PLOTS)

    res = {"deterministic": _measure(e2e, args.repeat)}
    result, _ = W.compute_well(unc, spec)
    res["montecarlo"] = _measure(lambda: well_uncertainty(unc, result), args.repeat)
    s = unc.uncertainty.settings
    res.update(realisations=s.realisations, samples=int(result.tvdss.size), memory_mb=s.memory_mb)
    return res


CASES = {"montecarlo": case_montecarlo, "cores": case_cores, "read": case_read,
         "write": case_write, "engine": case_engine, "well": case_well, "project": case_project,
         "plots": case_plots, "dask": case_dask}


def _run_case(name: str, **kw) -> dict:
    cmd = [sys.executable, str(Path(__file__).resolve()), "--case", name]
    for k, v in kw.items():
        cmd += [f"--{k.replace('_', '-')}", str(v)]
    proc = subprocess.run(cmd, capture_output=True, text=True)
    if proc.returncode != 0:
        raise SystemExit(f"benchmark case {name} failed:\n{proc.stderr}")
    return json.loads(proc.stdout.strip().splitlines()[-1])


# ---------------------------------------------------------------------------
# the run
# ---------------------------------------------------------------------------

def machine() -> str:
    import platform

    cpu = platform.processor() or platform.machine()
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                cpu = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    return f"{os.cpu_count()} CPUs, {cpu}, Python {platform.python_version()}, {platform.system()}"


#: Groups of figures ``--only`` can pick, in the order they are measured.
GROUPS = ("read", "write", "engine", "well", "plots", "montecarlo", "project")


def _group_read(c, fig: dict) -> None:
    """The read figures into ``fig``."""
    rows, ncurves, inputs, rep, say = c.rows, c.ncurves, c.inputs, c.rep, c.say
    ours = _run_case("read", which="ours", file=inputs["big"], small=inputs["small"], repeat=rep)
    ref = _run_case("read", which="lasio", file=inputs["big"], small=inputs["small"], repeat=rep)
    fig["read"] = {"ours": ours, "lasio": ref, "speed_ratio": ref["seconds"] / ours["seconds"],
                   "memory_ratio": ours["peak_mb"] / ref["peak_mb"]}
    say(f"LAS read {rows} rows x {ncurves} curves: read_las {ours['seconds']:.2f} s, lasio.read "
        f"{ref['seconds']:.2f} s -> {fig['read']['speed_ratio']:.1f}x faster (target >= 10x)")
    say(f"LAS read peak memory: read_las +{ours['peak_mb']:.0f} MB, lasio.read "
        f"+{ref['peak_mb']:.0f} MB -> {fig['read']['memory_ratio']:.2f} of lasio's (target <= 0.5)")


def _group_write(c, fig: dict) -> None:
    """The write figures into ``fig``."""
    rows, ncurves, inputs, rep, folder, say = c.rows, c.ncurves, c.inputs, c.rep, c.folder, c.say
    out = folder / "w_out.las"
    ours = _run_case("write", which="ours", file=inputs["big"], small=inputs["small"], out=out,
                     repeat=rep)
    ref = _run_case("write", which="lasio", file=inputs["big"], small=inputs["small"], out=out,
                    repeat=1)
    fig["write"] = {"ours": ours, "lasio": ref, "speed_ratio": ref["seconds"] / ours["seconds"],
                    "memory_ratio": ours["peak_mb"] / max(ref["peak_mb"], 1e-9)}
    say(f"LAS write {rows} rows x {ncurves + 5} curves: write_las {ours['seconds']:.2f} s, "
        f"LASFile.write {ref['seconds']:.2f} s -> {fig['write']['speed_ratio']:.1f}x faster "
        f"(target >= 5x); peak memory +{ours['peak_mb']:.0f} MB vs +{ref['peak_mb']:.0f} MB")


def _group_engine(c, fig: dict) -> None:
    """The engine figures into ``fig``."""
    rep, sizes, say = c.rep, c.sizes, c.say
    eng = _run_case("engine", n=sizes["engine"], repeat=rep)
    fig["engine"] = dict(eng, ratio=eng["ours"]["seconds"] / eng["floor"]["seconds"])
    say(f"engine {sizes['engine']} samples: compute_shm {eng['ours']['seconds']:.2f} s, bare numpy "
        f"{eng['floor']['seconds']:.2f} s -> {fig['engine']['ratio']:.2f}x the floor (target <= 2x)")


def _group_well(c, fig: dict) -> None:
    """The well figures into ``fig``."""
    rows, inputs, rep, folder, say = c.rows, c.inputs, c.rep, c.folder, c.say
    well = _run_case("well", project=inputs["one_project"], warm_project=inputs["warm_project"],
                     out=folder / "well_out", repeat=rep)
    load, write, e2e = (well[k]["seconds"] for k in ("load", "write", "e2e"))
    lasio_read = fig["read"]["lasio"]["seconds"]
    fig["well"] = dict(well, ratio_load_write=e2e / (load + write), ratio_load=e2e / load,
                       ratio_lasio_read=e2e / lasio_read)
    say(f"one well end to end ({rows} rows; load, compute, write LAS+Parquet+JSON, no plots): "
        f"{e2e:.2f} s; load {load:.2f} s, write {write:.2f} s -> "
        f"{fig['well']['ratio_load_write']:.2f}x load+write (target <= 1.5x), "
        f"{fig['well']['ratio_load']:.2f}x load alone, {fig['well']['ratio_lasio_read']:.2f}x "
        f"lasio's read of the file (target <= 0.3x)")


def _group_plots(c, fig: dict) -> None:
    """The plots figures into ``fig``."""
    rows, inputs, rep, folder, say = c.rows, c.inputs, c.rep, c.folder, c.say
    lasio_read = fig["read"]["lasio"]["seconds"]
    pl = _run_case("plots", project=inputs["one_project"], out=folder / "plots_out", repeat=rep)
    with_p, without = pl["demo_plots"]["seconds"], pl["demo_no_plots"]["seconds"]
    fig["plots"] = dict(pl, ratio=with_p / without,
                        track_ratio_lasio_read=pl["track"]["seconds"] / lasio_read)
    say(f"demo run with plots {with_p:.2f} s, without {without:.2f} s -> "
        f"{fig['plots']['ratio']:.2f}x (target <= 3x); track plot of the {rows}-row well "
        f"{pl['track']['seconds']:.2f} s -> {fig['plots']['track_ratio_lasio_read']:.2f}x "
        f"lasio's read (target <= 0.2x)")


def _group_montecarlo(c, fig: dict) -> None:
    """The montecarlo figures into ``fig``."""
    rep, folder, sizes, say = c.rep, c.folder, c.sizes, c.say
    mc_in = build_mc_inputs(folder, sizes)
    mc = _run_case("montecarlo", project=mc_in["mc_project"], mc_project=mc_in["mc_unc_project"],
                   out=folder / "mc_out", repeat=rep)
    det_s, mc_s = mc["deterministic"]["seconds"], mc["montecarlo"]["seconds"]
    fig["montecarlo"] = dict(mc, ratio=mc_s / det_s, peak_mb=mc["montecarlo"]["peak_mb"])
    say(f"Monte Carlo {mc['realisations']} realisations x {mc['samples']} samples (with tornado): "
        f"{mc_s:.2f} s, one deterministic no-plot run {det_s:.2f} s -> "
        f"{fig['montecarlo']['ratio']:.1f}x (target <= 50x); peak memory "
        f"+{fig['montecarlo']['peak_mb']:.0f} MB (bound on the working arrays {mc['memory_mb']:g} MB)")


def _group_project(c, fig: dict) -> None:
    """The project figures into ``fig``."""
    rows, inputs, folder, sizes, say = c.rows, c.inputs, c.folder, c.sizes, c.say
    cores = _run_case("cores", n=3_000_000 if sizes is FULL else 1_000_000)
    one = _run_case("project", project=inputs["field_project"], workers=1, out=folder / "p1")
    two = _run_case("project", project=inputs["field_project"], workers=2, out=folder / "p2")
    fig["cores"] = dict(cores, ratio=cores["serial"] / cores["parallel"])
    peak1 = one["peak_mb"]
    peak2 = two["peak_mb"] + 2 * two["child_peak_mb"]       # parent + two workers (upper bound)
    fig["project"] = {"workers_1": one, "workers_2": two,
                      "speed_ratio": one["seconds"] / two["seconds"],
                      "memory_ratio": peak2 / peak1,
                      "efficiency": (one["seconds"] / two["seconds"]) / fig["cores"]["ratio"]}
    say(f"project {sizes['wells']} wells x {sizes['well_rows']} rows, no plots: 2 workers "
        f"{two['seconds']:.1f} s, 1 worker {one['seconds']:.1f} s -> "
        f"{fig['project']['speed_ratio']:.2f}x faster on 2 cores (a pure CPU task gained "
        f"{fig['cores']['ratio']:.2f}x from a second process on this machine at this time) -> "
        f"efficiency {fig['project']['efficiency']:.2f} (target >= 0.8)")
    say(f"project peak memory: 2 workers {peak2:.0f} MB (parent {two['peak_mb']:.0f} + 2 x "
        f"{two['child_peak_mb']:.0f}), 1 worker {peak1:.0f} MB -> "
        f"{fig['project']['memory_ratio']:.2f}x")
    if importlib.util.find_spec("distributed") is None:   # optional extra satheight[dask]
        say("Dask not installed (pip install satheight[dask]): dask.ratio not measured")
    else:
        dk = _run_case("dask", project=inputs["field_project"], out=folder / "pd",
                       file=folder / "p2")
        fig["dask"] = dict(dk, ratio=dk["seconds"] / two["seconds"])
        say(f"same project on a local Dask cluster (2 worker processes): {dk['seconds']:.1f} s -> "
            f"{fig['dask']['ratio']:.2f}x the 2-process pool; outputs identical: {dk['identical']}")


def run_all(folder: Path, sizes: dict, say, only: set | None = None) -> dict:
    import lasio
    import pandas

    only = set(only or GROUPS)
    if only & {"well", "plots"}:
        only.add("read")                                  # their figures divide by lasio's read
    rows, ncurves = sizes["rows"], len(CURVES) + 1
    say(f"machine: {machine()}; numpy {np.__version__}, pandas {pandas.__version__}, "
        f"lasio {lasio.__version__}")
    t0 = time.perf_counter()
    inputs = build_inputs(folder, sizes, field="project" in only)
    say(f"inputs built in {time.perf_counter() - t0:.1f} s in {folder}")
    rep = sizes["repeat"]
    fig = {"machine": machine(), "sizes": sizes}
    c = SimpleNamespace(rows=rows, ncurves=ncurves, inputs=inputs, rep=rep, folder=folder,
                        sizes=sizes, say=say)
    groups = {"read": _group_read, "write": _group_write, "engine": _group_engine,
              "well": _group_well, "plots": _group_plots, "montecarlo": _group_montecarlo,
              "project": _group_project}
    for name in GROUPS:
        if name in only:
            groups[name](c, fig)
    say(f"total benchmark time {time.perf_counter() - t0:.0f} s")
    return fig


def _groups(text: str) -> set:
    """``--only`` value: comma-separated names of :data:`GROUPS`."""
    names = {t.strip() for t in text.split(",") if t.strip()}
    unknown = names - set(GROUPS)
    if unknown or not names:
        raise argparse.ArgumentTypeError(f"unknown group(s) {sorted(unknown)}; choose from "
                                         + ", ".join(GROUPS))
    return names


def main(argv=None) -> int:
    p = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    p.add_argument("--quick", action="store_true", help="smaller sizes, one repeat (< 1 minute)")
    p.add_argument("--json", metavar="FILE", help="also write every figure to FILE as JSON")
    p.add_argument("--keep", metavar="DIR", help="build the inputs in DIR and keep them")
    p.add_argument("--only", metavar="GROUPS", type=_groups, default=None,
                   help="measure only these groups of figures, comma-separated: "
                        + ", ".join(GROUPS) + " (well and plots also measure read)")
    p.add_argument("--case", choices=sorted(CASES), help=argparse.SUPPRESS)
    for opt in ("which", "file", "small", "out", "project", "warm-project", "mc-project"):
        p.add_argument(f"--{opt}", help=argparse.SUPPRESS)
    for opt in ("n", "repeat", "workers"):
        p.add_argument(f"--{opt}", type=int, default=1, help=argparse.SUPPRESS)
    args = p.parse_args(argv)
    if args.case:
        print(json.dumps(CASES[args.case](args)))
        return 0
    sizes = QUICK if args.quick else FULL

    def say(text):
        print(text, flush=True)

    if args.keep:
        fig = run_all(Path(args.keep), sizes, say, args.only)
    else:
        with tempfile.TemporaryDirectory(prefix="satheight-bench-") as tmp:
            fig = run_all(Path(tmp), sizes, say, args.only)
    if args.json:
        Path(args.json).write_text(json.dumps(fig, indent=2, default=str) + "\n")
    return 0


if __name__ == "__main__":
    sys.exit(main())
