"""The Monte Carlo inside a project run: curves in LAS/CSV, a JSON section, a tornado chart."""

from __future__ import annotations

import json
import re
import shutil
from pathlib import Path

import lasio
import numpy as np
import pytest

from satheight.workflows.run import run_project

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"

UPPER = """
[zones.uncertainty]
fwl = {{ distribution = "normal", sd = "{fwl_sd}" }}
porosity_error = {{ distribution = "normal", sd = {phi_sd}, correlation_length = "2 m" }}
[zones.uncertainty.function]
swirr = {{ distribution = "truncated_normal", sd = {swirr_sd}, low = 0.0, high = 0.5 }}
"""
LOWER = """
[zones.uncertainty]
hydrocarbon_density = {{ distribution = "triangular", low = "{rho_lo} g/cm3", high = "{rho_hi} g/cm3" }}
permeability_error = {{ distribution = "normal", sd = {k_sd}, correlation_length = "5 m" }}
"""
SETTINGS = """
[uncertainty]
realisations = 200
seed = 12
"""


def _project(tmp: Path, spread: bool, wells=("VANTREL-1", "VANTREL-2")) -> Path:
    """The demo project with an uncertainty table per zone, on two of its wells."""
    folder = tmp / ("spread" if spread else "zero")
    shutil.copytree(DEMO, folder)
    text = (folder / "demo_project.toml").read_text(encoding="utf-8")
    # the demo's own Monte Carlo tables are replaced by this test's
    text = re.sub(r"^\[(zones\.)?uncertainty\][^\n]*\n(?:(?!\[).*\n)*", "", text, flags=re.M)
    values = (dict(fwl_sd="4 m", phi_sd=0.01, swirr_sd=0.03, rho_lo=0.18, rho_hi=0.26, k_sd=0.2)
              if spread else
              dict(fwl_sd="0 m", phi_sd=0.0, swirr_sd=0.0, rho_lo=0.22, rho_hi=0.22, k_sd=0.0))
    i = text.index("[[zones]]")
    pre, zones = text[:i], text[i:]
    head, lower = zones.split('[[zones]]\nname = "Lower Sand"')
    zones = head + UPPER.format(**values) + '[[zones]]\nname = "Lower Sand"' + lower + LOWER.format(**values)
    blocks = pre.split("[[wells]]")
    keep = [b for b in blocks[1:] if any(f'"{w}.las"' in b for w in wells)]
    text = blocks[0] + SETTINGS + "".join("[[wells]]" + b for b in keep) + zones
    path = folder / "demo_project.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_zero_spread_run_writes_percentiles_equal_to_the_shm_curve(tmp_path):
    # SW_SHM comes from engine.compute_shm in the run: the independent deterministic path
    report = run_project(_project(tmp_path, spread=False), tmp_path / "out", plot=False, csv=True)
    assert not report.failed
    for name in ("VANTREL-1", "VANTREL-2"):
        las = lasio.read(tmp_path / "out" / f"{name}.las")
        for curve in ("SW_P10", "SW_P50", "SW_P90"):
            np.testing.assert_allclose(las[curve], las["SW_SHM"], atol=1e-5, equal_nan=True)
        header = (tmp_path / "out" / f"{name}.csv").read_text().splitlines()[0]
        assert "SW_P10 [v/v]" in header and "SW_P90 [v/v]" in header
        summary = json.loads((tmp_path / "out" / f"{name}_summary.json").read_text())
        hcpt = summary["uncertainty"]["hcpt"]["zones"]["Upper Sand"]
        # zero spread: every percentile is the comparison's SHM pore thickness
        # (the run's compare.summarise, independent of the Monte Carlo)
        want = summary["zones"]["Upper Sand"]["hcpt_shm"]
        if summary["sw_log_source"] == "none":
            pytest.skip("no log Sw: the comparison's HCPT uses every finite sample")
        assert hcpt["P90"] == pytest.approx(hcpt["P10"], rel=1e-12)
        assert hcpt["P50"] == pytest.approx(want, rel=0.02)


def test_spread_run_gives_ordered_curves_distribution_and_tornado(tmp_path):
    report = run_project(_project(tmp_path, spread=True), tmp_path / "out", plot=True)
    assert not report.failed
    out = tmp_path / "out"
    las = lasio.read(out / "VANTREL-1.las")
    p10, p50, p90 = (np.asarray(las[c]) for c in ("SW_P10", "SW_P50", "SW_P90"))
    ok = np.isfinite(p10) & np.isfinite(p90)
    assert ok.sum() > 100
    assert np.all(p10[ok] <= p50[ok] + 1e-5) and np.all(p50[ok] <= p90[ok] + 1e-5)
    assert np.any(p90[ok] - p10[ok] > 0.02)
    section = json.loads((out / "VANTREL-1_summary.json").read_text())["uncertainty"]
    assert "exceeded with 90 %" in section["convention"]
    for block in section["hcpt"]["zones"].values():
        assert block["P90"] <= block["P50"] <= block["P10"]       # spe_prms2018 convention
    assert section["hcpt"]["zones"]["Lower Sand"]["phase"] == "gas"
    bars = section["tornado"]["bars"]
    assert {b["input"] for b in bars} == {"fwl", "porosity_error", "swirr", "hydrocarbon_density",
                                          "permeability_error"}
    assert [b["swing"] for b in bars] == sorted((b["swing"] for b in bars), reverse=True)
    assert (out / "VANTREL-1_tornado.png").stat().st_size > 1000
    assert "VANTREL-1_tornado.png" in json.loads((out / "run_summary.json").read_text()
                                                 )["wells"][0]["files"]


def test_same_seed_same_files_with_one_or_two_workers(tmp_path):
    project = _project(tmp_path, spread=True)
    run_project(project, tmp_path / "one", plot=False, workers=1, csv=True)
    run_project(project, tmp_path / "two", plot=False, workers=2, csv=True)
    for name in ("VANTREL-1", "VANTREL-2"):
        for suffix in (".las", ".csv", "_summary.json"):
            a = (tmp_path / "one" / f"{name}{suffix}").read_bytes()
            b = (tmp_path / "two" / f"{name}{suffix}").read_bytes()
            assert a == b, name + suffix


def test_tornado_figure_draws_each_bar_between_its_two_thicknesses():
    from satheight.plots.tornado import tornado_figure
    from satheight.uncertainty import TornadoBar

    bars = [TornadoBar("Upper $x$", "fwl", 2050.0, 2070.0, 10.0, 14.0),
            TornadoBar("Upper $x$", "swirr", 0.05, 0.15, 12.5, 11.0)]
    fig = tornado_figure(12.0, bars, title="A-1 $\\bad", length_unit="ft", length_factor=0.3048)
    fig.canvas.draw()                     # mathtext in names would fail here if not escaped
    ax = fig.axes[0]
    spans = sorted((round(min(p.get_x(), p.get_x() + p.get_width()), 6),
                    round(max(p.get_x(), p.get_x() + p.get_width()), 6)) for p in ax.patches)
    f = 0.3048                            # m per ft (NIST SP 811)
    want = sorted([(round(10 / f, 6), round(12 / f, 6)), (round(12 / f, 6), round(14 / f, 6)),
                   (round(11 / f, 6), round(12 / f, 6)), (round(12 / f, 6), round(12.5 / f, 6))])
    assert spans == want
    assert [t.get_text() for t in ax.get_yticklabels()][-1] == "Upper \\$x\\$: fwl"   # largest on top


def test_bench_montecarlo_case_runs_on_tiny_inputs(tmp_path):
    """bench/run.py's Monte Carlo case on a tiny well (no timing is checked)."""
    import argparse
    import importlib.util

    spec = importlib.util.spec_from_file_location(
        "bench_run_mc", Path(__file__).resolve().parents[1] / "bench" / "run.py")
    bench = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(bench)
    paths = bench.build_mc_inputs(tmp_path, {"mc_rows": 400, "mc_realisations": 20})
    r = bench.case_montecarlo(argparse.Namespace(project=paths["mc_project"],
                                                 mc_project=paths["mc_unc_project"],
                                                 out=tmp_path / "out", repeat=1))
    assert (r["realisations"], r["samples"]) == (20, 400)
    assert r["montecarlo"]["seconds"] > 0 and r["deterministic"]["seconds"] > 0
