"""A FWL far from a well's logged depths names both the project key and the well's log file.

Found by the command-line fuzz test: a LAS file whose depth unit reads ``.1IN`` (tenths of
an inch) puts the well's 900-905 depth values at 2.29-2.30 m, and the zone's FWL at 1040 m
TVDSS is then refused for that well. The FWL may be right and the file's depth unit wrong,
so the error names the LAS file too (README: Bad input, one clear error naming the file).
"""

from __future__ import annotations

import json

import numpy as np

from satheight.cli import main

PROJECT = """[project]
units = "metric"
[log_sw]
rw = "0.05 ohm.m"
[[wells]]
las = "w.las"
[[zones]]
name = "Sand"
top = "0 m"
base = "1100 m"
fwl = "1040 m"
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


def _las(unit: str) -> str:
    depth = 900.0 + 0.1 * np.arange(48)
    rows = "".join(f"{d:.1f} 0.2000 100.000 10.000\n" for d in depth)
    return ("~Version\nVERS. 2.0 :\nWRAP. NO :\n~Well\n"
            f"STRT.{unit} 900.0 :\nSTOP.{unit} 904.7 :\nSTEP.{unit} 0.1 :\nNULL. -999.25 :\n"
            "WELL. FZ-1 :\nEKB.M 25.0 :\n~Curve\n"
            f"DEPT.{unit} : depth\nPHIE.V/V : porosity\nPERM.MD : permeability\n"
            "RT.OHMM : deep resistivity\n~A\n" + rows)


def test_fwl_far_from_a_wells_logs_names_the_log_file(tmp_path, capsys):
    (tmp_path / "p.toml").write_text(PROJECT)
    (tmp_path / "w.las").write_text(_las("1IN"))
    code = main(["run", str(tmp_path / "p.toml"), "--out", str(tmp_path / "out"), "--no-plots"])
    capsys.readouterr()
    assert code == 3                                  # the well fails, the run goes on
    (well,) = json.loads((tmp_path / "out" / "run_summary.json").read_text())["wells"]
    # 900 x 0.00254 m = 2.286 m MD (1 in = 0.0254 m exactly, nist2008), TVDSS 2.286 - 25 =
    # -22.714 m below a 25 m datum: more than the README's 1000 m margin above the FWL at 1040 m
    assert "zones[Sand].fwl" in well["error"] and "w.las" in well["error"]
    assert "-22.714" in well["error"]


def test_the_same_well_in_metres_runs(tmp_path, capsys):
    (tmp_path / "p.toml").write_text(PROJECT)
    (tmp_path / "w.las").write_text(_las("M"))
    code = main(["run", str(tmp_path / "p.toml"), "--out", str(tmp_path / "out"), "--no-plots"])
    capsys.readouterr()
    assert code == 0
