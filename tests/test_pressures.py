"""FWL from formation pressures: reader, gradient fits, intersections, command.

The worked example is a closed form worked by hand (pressure lines linear in depth,
dake1978; units nist2008): water line p = 14.7 + 0.45 D psia, oil line through 4400 psia at
9500 ft with 0.33 psi/ft -> FWL 10,419.17 ft, Pc at 9500 ft 110.30 psi,
densities 0.7612 and 1.0380 g/cc.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from satheight.constants import FOOT, PSI, STANDARD_GRAVITY
from satheight.errors import InputFileError, SatHeightError
from satheight.io.pressures import read_pressure_points, resolve_tvdss
from satheight.pressures import analyse_pressures, compare_levels, fit_gradient, intersect

ROOT = Path(__file__).resolve().parents[1]


def reference_csv(tmp_path, extra_rows=()):
    rows = ["# the worked example of the module docstring", "well,tvdss [ft],pressure [psia],fluid,quality"]
    for d in (10450, 10550, 10650, 10750):
        rows.append(f"A,{d},{14.7 + 0.45 * d:.6f},water,good")
    for d in (9200, 9400, 9500, 9700, 9900):
        rows.append(f"B,{d},{4400 + 0.33 * (d - 9500):.6f},oil,good")
    rows += list(extra_rows)
    p = tmp_path / "points.csv"
    p.write_text("\n".join(rows) + "\n", encoding="utf-8")
    return p


def test_reference_example_exactly(tmp_path):
    pts = read_pressure_points(reference_csv(tmp_path))
    res = analyse_pressures(pts)[""]
    # closed form (docstring): FWL 10,419.17 ft
    assert res.fwl.depth / FOOT == pytest.approx(10419.1667, abs=1e-3)
    assert round(res.fwl.depth / FOOT, 2) == 10419.17
    # exact data: no uncertainty, no rejection
    # closed form: data exactly on two lines leave no residual, hence no uncertainty
    assert res.fwl.se == pytest.approx(0.0, abs=1e-6)
    assert res.lines["water"].rejected.size == 0 and res.lines["oil"].rejected.size == 0
    # closed form (docstring): Pc at 9500 ft = 110.30 psi; densities 1.0380 and 0.7612 g/cc
    assert float(res.capillary_pressure_at(9500 * FOOT)) / PSI == pytest.approx(110.30, abs=1e-6)
    assert res.lines["water"].density / 1000 == pytest.approx(1.0380, abs=5e-5)
    assert res.lines["oil"].density / 1000 == pytest.approx(0.7612, abs=5e-5)
    # the gradient the rows were made with (0.45 psi/ft); no third fluid given
    assert res.lines["water"].gradient / (PSI / FOOT) == pytest.approx(0.45, rel=1e-10)
    assert res.free_oil_level is None


def test_uncertainty_propagation_matches_monte_carlo():
    # the first-order FWL standard error against a direct simulation of the two fits
    rng = np.random.default_rng(5)
    zw = np.linspace(2110, 2150, 6)
    zo = np.linspace(2020, 2090, 7)
    sd = 5e3

    def lines(noise_w, noise_o):
        pw = 1e5 + 1080 * STANDARD_GRAVITY * zw + noise_w
        po = 1e5 + 1080 * STANDARD_GRAVITY * 2100 + 780 * STANDARD_GRAVITY * (zo - 2100) + noise_o
        return (fit_gradient(zw, pw, "water", reject=False),
                fit_gradient(zo, po, "oil", reject=False))

    w, o = lines(rng.normal(0, sd, zw.size), rng.normal(0, sd, zo.size))
    se = intersect(w, o).se
    sims = []
    for _ in range(2000):
        w2, o2 = lines(rng.normal(0, sd, zw.size), rng.normal(0, sd, zo.size))
        sims.append(intersect(w2, o2).depth)
    # the fitted residual spread scatters, so allow 35 % (first-order propagation)
    # simulation (common practice: Monte Carlo of the same two fits checks first-order
    # propagation); known truth FWL 2100 m, mean within 3 standard errors of the simulation
    assert se == pytest.approx(np.std(sims), rel=0.35)
    assert abs(np.mean(sims) - 2100) < 3 * np.std(sims) / np.sqrt(len(sims)) + 0.05


def test_outlier_is_rejected_and_others_kept():
    z = np.linspace(2000, 2090, 8)
    p = 2e7 + 7650 * (z - 2000) + np.random.default_rng(2).normal(0, 2e3, z.size)
    p_bad = p.copy()
    p_bad[-1] += 2e5                    # supercharged point at the end of the range
    fit = fit_gradient(z, p_bad, "oil")
    # known truth: point 7 was moved by 2e5 Pa (40 sd); gradient 7650 Pa/m put in
    assert list(fit.rejected) == [7]
    assert fit.gradient == pytest.approx(7650, rel=0.01)
    clean = fit_gradient(z, p, "oil")
    # known truth: no outlier put in (cook1982 studentised residuals, 8 points, noise 2e3 Pa)
    assert clean.rejected.size == 0


def test_fixed_gradient_for_a_single_point():
    g = 1050 * STANDARD_GRAVITY
    fit = fit_gradient([2100.0], [2.2e7], "water", gradient=g)
    # closed form: the line through one point with the given gradient
    assert fit.fixed and fit.gradient == g
    assert float(fit.pressure_at(2200.0)) == pytest.approx(2.2e7 + g * 100)
    with pytest.raises(SatHeightError, match="needed"):
        fit_gradient([2100.0], [2.2e7], "water")
    with pytest.raises(SatHeightError, match="one depth"):
        fit_gradient([2100.0, 2100.0], [2.2e7, 2.21e7], "water")


def test_parallel_lines_have_no_level():
    a = fit_gradient([0, 10, 20], [0, 100, 200], "water")
    b = fit_gradient([0, 10, 20], [50, 150, 250], "oil")
    with pytest.raises(SatHeightError, match="parallel"):
        intersect(a, b)


def test_gas_oil_water_three_lines(tmp_path):
    g = STANDARD_GRAVITY
    rows = ["well,tvdss [m],pressure [Pa],fluid,quality,zone"]
    fwl, gol = 2100.0, 2050.0
    p_fwl = 2.1e7
    p_gol = p_fwl - 750 * g * (fwl - gol)
    for z in (2110, 2120, 2130):
        rows.append(f"A,{z},{p_fwl + 1040 * g * (z - fwl)!r},water,good,Z")
    for z in (2060, 2075, 2090):
        rows.append(f"A,{z},{p_fwl + 750 * g * (z - fwl)!r},oil,good,Z")
    for z in (2000, 2020, 2040):
        rows.append(f"A,{z},{p_gol + 200 * g * (z - gol)!r},gas,good,Z")
    rows.append(f"A,2045,{p_gol + 200 * g * (2045 - gol)!r},unknown,good,Z")
    rows.append(f"A,2080,{p_fwl!r},oil,bad,Z")           # bad quality: never fitted
    path = tmp_path / "three.csv"
    path.write_text("\n".join(rows) + "\n")
    res = analyse_pressures(read_pressure_points(path))["Z"]
    # known truth: the rows were made from FWL 2100 m, GOL 2050 m and densities 1040, 750,
    # 200 kg/m3 (closed form, exact lines)
    assert res.fwl.depth == pytest.approx(fwl, abs=1e-6)
    assert res.fwl.lines == ("water", "oil")
    assert res.free_oil_level.depth == pytest.approx(gol, abs=1e-6)
    assert res.lines["gas"].density == pytest.approx(200, rel=1e-9)
    assert res.unknown_nearest[0][1] == "gas"
    assert res.lines["oil"].used.size == 3


def test_md_points_resolved_with_datum(tmp_path):
    path = tmp_path / "md.csv"
    path.write_text("well,tvdss [m],md [ft],pressure [bar],fluid,quality\n"
                    "A,,7000,210,water,good\nA,2100,,211,water,good\n")
    pts = read_pressure_points(path)
    # the file's values: 210 bar = 210e5 Pa (nist2008); MD 7000 ft - datum 30 m
    assert np.isnan(pts.tvdss[0]) and pts.pressure[0] == pytest.approx(210e5)
    done = resolve_tvdss(pts, {"A": 30.0})
    assert done.tvdss[0] == pytest.approx(7000 * FOOT - 30.0)
    # common practice (the project's rule): inputs are never modified
    assert np.isnan(pts.tvdss[0])                       # the input object is unchanged


def test_point_with_md_and_no_way_to_convert_it_is_skipped_with_a_note(tmp_path):
    # one point of well B has only MD and B has no datum: that point is left out and
    # named, the rest of the file is used (1 bar = 1e5 Pa, NIST SP 811)
    path = tmp_path / "md.csv"
    path.write_text("well,tvdss [m],md [m],pressure [bar],fluid,quality\n"
                    "A,2000,,200,water,good\nB,,2100,210,water,good\nA,2050,,205,water,good\n")
    pts = read_pressure_points(path)
    done = resolve_tvdss(pts, {"A": 30.0})
    assert list(done.line) == [2, 4] and list(done.tvdss) == [2000.0, 2050.0]
    assert len(done.notes) == 1 and "line(s) 3" in done.notes[0] and "'B'" in done.notes[0]
    assert len(pts) == 3 and pts.notes == []                 # the input object is unchanged
    # nothing left at all: a clear error naming the file
    only_md = tmp_path / "only_md.csv"
    only_md.write_text("well,md [m],pressure [bar],fluid\nB,2100,210,water\n")
    with pytest.raises(InputFileError, match="only MD") as ei:
        resolve_tvdss(read_pressure_points(only_md), {})
    assert str(only_md) in str(ei.value)


def test_quality_column_is_optional(tmp_path):
    path = tmp_path / "noq.csv"
    path.write_text("well,tvdss [m],pressure [bar],fluid\nA,2000,200,water\nA,2010,201,water\n")
    pts = read_pressure_points(path)
    assert list(pts.quality) == ["good", "good"]             # every point is fitted
    assert any("no quality column" in n for n in pts.notes)
    # 1 bar over 10 m = 1e4 Pa/m (NIST SP 811: 1 bar = 1e5 Pa)
    line = analyse_pressures(pts)[""].lines["water"]
    assert line.gradient == pytest.approx(1e4)


@pytest.mark.parametrize("text, words", [
    ("well,tvdss [m],pressure,fluid,quality\nA,1,2,water,good\n", "no unit"),
    ("well,tvdss [m],pressure [psi],water\nA,1,2,water\n", "'fluid' is missing"),
    ("well,pressure [psi],fluid,quality\nA,2,water,good\n", "no depth column"),
    ("well,tvdss [m],pressure [furlong],fluid,quality\nA,1,2,water,good\n", "pressure"),
    ("well,tvdss [m],pressure [psi],fluid,quality\nA,1,2,brine,good\n", "fluid 'brine'"),
    ("well,tvdss [m],pressure [psi],fluid,quality\nA,1,2,water,great\n", "quality 'great'"),
    ("well,tvdss [m],pressure [psi],fluid,quality\nA,x,2,water,good\n", "not a number"),
    ("well,tvdss [m],pressure [psi],fluid,quality\nA,1,-2,water,good\n", "not positive"),
    ("well,tvdss [m],pressure [psi],fluid,quality\n", "no data rows"),
])
def test_reader_errors_name_file_and_line(tmp_path, text, words):
    path = tmp_path / "bad.csv"
    path.write_text(text)
    with pytest.raises(InputFileError) as ei:
        read_pressure_points(path)
    # README (Bad input, CSV files): pressure points errors name the file and line
    assert words in str(ei.value) and str(path) in str(ei.value)


def test_reader_missing_file(tmp_path):
    with pytest.raises(InputFileError, match="not found"):
        read_pressure_points(tmp_path / "none.csv")


def test_compare_levels():
    # closed form: intervals [99, 101] and [100.2, 100.8] overlap; [103, 105] is 2 m from
    # [99, 101] and its centre 4 m from 100
    assert compare_levels(100, 99, 101, 100.5, 100.2, 100.8)["consistent"]
    c = compare_levels(100, 99, 101, 104, 103, 105)
    assert not c["consistent"] and c["gap_m"] == pytest.approx(2.0)
    assert c["difference_m"] == pytest.approx(4.0)


def test_pressures_command_on_demo(tmp_path):
    out = tmp_path / "out"
    r = subprocess.run([sys.executable, str(ROOT / "cli.py"), "pressures",
                        str(ROOT / "demo_wells" / "demo_pressures.csv"), "--project",
                        str(ROOT / "demo_wells" / "demo_project.toml"), "--out", str(out)],
                       capture_output=True, text=True, timeout=120)
    assert r.returncode == 0, r.stderr
    doc = json.loads((out / "pressures_summary.json").read_text())
    # the demo points were made from FWLs 2105 m and 2290 m (demo_wells/README.md)
    for zone, fwl in (("Upper Sand", 2105.0), ("Lower Sand", 2290.0)):
        z = doc["zones"][zone]
        # known truth: demo_wells/make_demo.py made the points from these FWLs
        lo, hi = z["fwl"]["interval"]
        assert lo <= fwl <= hi
        assert z["versus_project_fwl"]["consistent"]
        assert "versus_log_fwl" in z
    # the supercharged demo point (fair quality, +180 kPa) is rejected
    # known truth: one supercharged point put in by demo_wells/make_demo.py
    assert doc["zones"]["Upper Sand"]["lines"]["oil"]["points_rejected"] == 1
    assert (out / "pressures_Upper_Sand.png").stat().st_size > 10000
    assert "FWL" in r.stdout


def test_pressures_command_bad_file_exit_code(tmp_path):
    r = subprocess.run([sys.executable, str(ROOT / "cli.py"), "pressures",
                        str(tmp_path / "none.csv"), "--out", str(tmp_path / "o")],
                       capture_output=True, text=True, timeout=60)
    # README (Bad input): a missing file is an error (exit code 2)
    assert r.returncode == 2 and "not found" in r.stderr


def test_md_points_of_a_deviated_well_follow_its_survey(tmp_path):
    # VANTREL-5 (invented demo) is deviated: an MD-only point must get the TVDSS of the
    # survey (minimum curvature), the same TVDSS the log samples of that MD get.
    import lasio

    from satheight.workflows.well import depth_maps

    demo = Path(__file__).resolve().parents[1] / "demo_wells"
    from satheight.project.reader import load_project
    from satheight.workflows.run import run_project

    project = load_project(demo / "demo_project.toml")
    conv = depth_maps(project, {"VANTREL-5"})["VANTREL-5"]
    # README (Contacts): MD-only points need the well's survey and datum
    assert callable(conv)
    report = run_project(project, tmp_path / "o", plot=False)
    las = lasio.read(next(f for w in report.wells if w.name == "VANTREL-5"
                          for f in w.files if f.suffix == ".las"))
    md = las.index[[500, 1500, 2500]]
    path = tmp_path / "dev.csv"
    path.write_text("well,md [m],pressure [bar],fluid,quality\n"
                    + "".join(f"VANTREL-5,{m:.4f},210,water,good\n" for m in md))
    done = resolve_tvdss(read_pressure_points(path), {"VANTREL-5": conv})
    # known generator values: demo_wells/make_demo.py places VANTREL-5 on a closed-form
    # build-and-hold (its own code, no minimum curvature); atol 1e-3 m as in
    # test_deviated_well (LAS text rounding and survey station spacing)
    import importlib.util

    spec_ = importlib.util.spec_from_file_location("make_demo_for_test", demo / "make_demo.py")
    mk = importlib.util.module_from_spec(spec_)
    spec_.loader.exec_module(mk)
    _, md_true, tvdss_true, _ = mk.depth_axis(next(w for w in mk.WELLS if w["name"] == "VANTREL-5"))
    # known generator values, linearly interpolated by numpy at the sample MDs (every MD is a sample)
    np.testing.assert_allclose(done.tvdss, np.interp(md, md_true, tvdss_true), atol=1e-3)
    # closed form: a deviated hole's TVDSS is less than MD minus the datum elevation
    assert np.all(done.tvdss < md - 29.0)               # deviated: shallower than MD - KB
