"""The demo run through the command line, outputs re-read with lasio, physics checked.

Independent reader: lasio (general-purpose LAS library from the package registry).
Physics checks: Pc = (rho_w - rho_hc) g h with g = 9.80665 m/s^2 (3rd CGPM, via
scipy.constants.g); Sw = 1 at and below the FWL (common practice); Sw does not
increase with height (J) for one rock (common practice: drainage curve).
"""

import hashlib
import json
import subprocess
import sys
from pathlib import Path

import lasio
import numpy as np
import pytest
import scipy.constants as sc

from satheight.cli import main
from satheight.project import load_project

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_wells"
DEMO_PROJECT = DEMO / "demo_project.toml"


def _md5(p: Path) -> str:
    return hashlib.md5(p.read_bytes()).hexdigest()


@pytest.fixture(scope="module")
def demo_run(tmp_path_factory):
    out = tmp_path_factory.mktemp("demo")
    before = {p.name: _md5(p) for p in DEMO.iterdir() if p.is_file()}
    code = main(["demo", "--out", str(out), "--pdf", "--csv"])
    after = {p.name: _md5(p) for p in DEMO.iterdir() if p.is_file()}
    return code, out, before, after


def test_demo_exits_ok_and_writes_every_file(demo_run):
    # README (Outputs, Demo field): every well ok; LAS, Parquet, CSV (--csv), summary, track PNG
    # and PDF (--pdf) written; no temporary file left
    code, out, _, _ = demo_run
    assert code == 0
    project = load_project(DEMO_PROJECT)
    summary = json.loads((out / "run_summary.json").read_text())
    assert len(summary["wells"]) == len(project.wells) >= 3
    for w in summary["wells"]:
        assert w["ok"], w
        for suffix in (".las", ".parquet", ".csv", "_summary.json", "_tracks.png", "_tracks.pdf"):
            assert any(f.endswith(suffix) for f in w["files"]), (w["name"], suffix)
        for f in w["files"]:
            assert (out / f).stat().st_size > 0
    assert not list(out.glob(".*tmp*"))


def test_inputs_untouched(demo_run):
    _, _, before, after = demo_run
    # README (Outputs): inputs are only read, never written (checksums before and after)
    assert before == after


def _outputs(out):
    summary = json.loads((out / "run_summary.json").read_text())
    for w in summary["wells"]:
        las = next(f for f in w["files"] if f.endswith(".las"))
        yield w, lasio.read(out / las)


def test_output_las_keeps_input_curves(demo_run):
    _, out, _, _ = demo_run
    project = load_project(DEMO_PROJECT)
    by_name = {}
    for spec in project.wells:
        src = lasio.read(spec.las)
        by_name[spec.name or src.well["WELL"].value] = src
    for w, las in _outputs(out):
        src = by_name[w["name"]]
        for c in src.curves:
            got = las[c.mnemonic]
            # library: lasio reads input and output: the input file's values come back exactly
            np.testing.assert_array_equal(np.isnan(got), np.isnan(c.data), err_msg=c.mnemonic)
            np.testing.assert_allclose(got, c.data, rtol=0, atol=0, equal_nan=True, err_msg=c.mnemonic)
            assert las.curves[c.mnemonic].unit == c.unit
        for mn in ("TVDSS", "HAFWL", "PC_RES", "J", "SW_SHM", "SHM_FLAG"):
            assert mn in las.keys(), mn
        assert "SHM_VERSION" in las.params
        assert "Z1_FWL" in las.params


def test_output_physics(demo_run):
    _, out, _, _ = demo_run
    n_checked = 0
    for w, las in _outputs(out):
        p = las.params
        zone_id = las["ZONE_ID"]
        hafwl = las["HAFWL"] * (0.3048 if las.curves["HAFWL"].unit.lower() in ("ft", "f") else 1.0)
        pc_unit = las.curves["PC_RES"].unit.lower()
        pc = las["PC_RES"] * {"kpa": 1e3, "psi": sc.psi, "pa": 1.0}[pc_unit]
        sw = las["SW_SHM"]
        j = las["J"]
        i = 1
        while f"Z{i}_NAME" in p:
            m = zone_id == i
            if m.any():
                dens_unit = p[f"Z{i}_RHOW"].unit.lower()
                dens_f = {"kg/m3": 1.0, "g/cm3": 1000.0}[dens_unit]
                drho = (float(p[f"Z{i}_RHOW"].value) - float(p[f"Z{i}_RHOH"].value)) * dens_f
                above = m & (hafwl > 0.5)
                # PC_RES / HAFWL = delta rho * g in each zone (hydrostatics)
                ratio = pc[above] / hafwl[above]
                # closed form (hydrostatics, tiab2004; library: scipy.constants.g); rtol 2e-3: PC_RES and
                # HAFWL are written with a few decimals
                np.testing.assert_allclose(ratio, drho * sc.g, rtol=2e-3)
                # at and below the FWL: Sw = 1
                below = m & (hafwl <= 0)
                # closed form: Sw = 1 at and below the FWL
                assert np.all(sw[below] == 1.0)
                # Sw non-increasing with J within a zone (one function per zone)
                ok = m & np.isfinite(j) & np.isfinite(sw) & (hafwl > 0)
                order = np.argsort(j[ok], kind="stable")
                # closed form: every family's Sw falls with J; 2e-5: Sw written with 5 decimals
                assert np.all(np.diff(sw[ok][order]) <= 2e-5)
                n_checked += int(ok.sum())
            i += 1
    assert n_checked > 1000


def test_summary_json_has_per_zone_statistics(demo_run):
    _, out, _, _ = demo_run
    for f in out.glob("*_summary.json"):
        if f.name == "run_summary.json":
            continue
        s = json.loads(f.read_text())
        # README (Outputs, <WELL>_summary.json): the per-zone statistics it lists; closed form:
        # RMS >= |mean| for any set of differences
        assert s["zones"], f
        for zname, z in s["zones"].items():
            for key in ("mean_difference", "rms_difference", "hcpt_shm", "hcpt_log",
                        "samples_compared", "samples_flagged"):
                assert key in z, (f, zname, key)
            if z["samples_compared"]:
                assert z["rms_difference"] >= abs(z["mean_difference"])


def test_rerun_same_folder_is_consistent(demo_run, tmp_path):
    _, out, _, _ = demo_run
    # README (Usage): a re-run with --overwrite gives the same files (a repeat on one machine,
    # not a value check)
    code = main(["demo", "--out", str(tmp_path), "--no-plots"])
    assert code == 0
    code = main(["demo", "--out", str(tmp_path), "--no-plots", "--overwrite"])
    assert code == 0
    for f in tmp_path.glob("*.las"):
        assert (out / f.name).read_bytes() == f.read_bytes()


# --- error messages -----------------------------------------------------------------

LAS_NO_PERM = """~Version
VERS. 2.0 :
WRAP. NO :
~Well
STRT.M 1000.0 :
STOP.M 1000.3 :
STEP.M 0.1 :
NULL. -999.25 :
WELL. NOPERM-1 : well name
EKB .M 25.0 : kelly bushing elevation
~Curve
DEPT.M : depth
PHIE.V/V : porosity
RT.OHMM : resistivity
~A
1000.0 0.2 10
1000.1 0.2 11
1000.2 0.21 12
1000.3 0.22 13
"""

PROJECT = """[project]
units = "metric"
[log_sw]
rw = "0.05 ohm.m"
[[wells]]
las = "{las}"
[[zones]]
name = "Sand"
top = "970 m"
base = "980 m"
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


def test_missing_curve_message(tmp_path, capsys):
    (tmp_path / "w.las").write_text(LAS_NO_PERM)
    (tmp_path / "p.toml").write_text(PROJECT.format(las="w.las", fwl="979 m"))
    code = main(["run", str(tmp_path / "p.toml"), "--out", str(tmp_path / "o")])
    text = capsys.readouterr().err  # per-well failures go to stderr
    # README (Bad input): a missing curve fails the well (exit code 3) naming the curve, the
    # aliases tried and the file
    assert code == 3
    assert "permeability" in text and "PERM" in text and "PHIE" in text and "w.las" in text


def test_bad_project_value_message(tmp_path, capsys):
    (tmp_path / "w.las").write_text(LAS_NO_PERM)
    (tmp_path / "p.toml").write_text(PROJECT.format(las="w.las", fwl="979 parsecs"))
    code = main(["run", str(tmp_path / "p.toml")])
    err = capsys.readouterr().err
    # README (Bad input): a project-file error stops the run (exit code 2), one line naming the
    # file and key
    assert code == 2
    assert "p.toml" in err and "zones[Sand].fwl" in err
    assert err.count("\n") == 1  # one line


def test_missing_file_message(tmp_path, capsys):
    code = main(["run", str(tmp_path / "nope.toml")])
    err = capsys.readouterr().err
    # README (Bad input): a missing file is an error naming it (exit code 2)
    assert code == 2 and "nope.toml" in err
    code = main(["inspect", str(tmp_path / "nope.las")])
    err = capsys.readouterr().err
    assert code == 2 and "nope.las" in err


def test_launcher_matches_command(tmp_path):
    # top-level cli.py runs the same main()
    r = subprocess.run([sys.executable, str(ROOT / "cli.py"), "--help"], capture_output=True, text=True)
    # README (Usage): the commands listed there
    assert r.returncode == 0 and "demo" in r.stdout and "inspect" in r.stdout


def test_inspect_lists_roles(capsys):
    project = load_project(DEMO_PROJECT)
    code = main(["inspect", str(project.wells[0].las)])
    text = capsys.readouterr().out
    assert code == 0
    # README (Curve roles): inspect names each role's curve
    assert "porosity" in text and "permeability" in text and "PHIE" in text and "PERM" in text


def test_constant_rock_profile_through_files(tmp_path):
    # one rock (constant k/phi): Sw must not increase with height above the FWL and is 1 below it
    # (common practice: a drainage capillary-pressure profile)
    md = np.round(np.arange(1000.0, 1100.0, 0.1524), 4)
    rows = "\n".join(f"{d:.4f} 0.2000 100.000 20.0000" for d in md)
    las = f"""~Version
VERS. 2.0 :
WRAP. NO :
~Well
STRT.M {md[0]:.4f} :
STOP.M {md[-1]:.4f} :
STEP.M 0.1524 :
NULL. -999.25 :
WELL. FLAT-1 :
EKB .M 25.0 :
~Curve
DEPT.M : depth
PHIE.V/V : porosity
PERM.MD : permeability
RT.OHMM : deep resistivity
~A
{rows}
"""
    (tmp_path / "flat.las").write_text(las)
    (tmp_path / "p.toml").write_text(PROJECT.format(las="flat.las", fwl="1060 m")
                                     .replace('top = "970 m"', 'top = "975 m"')
                                     .replace('base = "980 m"', 'base = "1075 m"'))
    code = main(["run", str(tmp_path / "p.toml"), "--out", str(tmp_path / "o"), "--no-plots"])
    assert code == 0
    out = lasio.read(tmp_path / "o" / "FLAT-1.las")
    h, sw = out["HAFWL"], out["SW_SHM"]
    m = np.isfinite(sw)
    assert m.sum() > 500
    order = np.argsort(h[m])
    assert np.all(np.diff(sw[m][order]) <= 1e-12)
    assert np.all(sw[m & (h <= 0)] == 1.0)
    assert sw[m & (h > 50)].max() < 0.5
    # TVDSS = MD - KB elevation for a vertical well
    np.testing.assert_allclose(out["TVDSS"], out.index - 25.0, atol=1e-4)
