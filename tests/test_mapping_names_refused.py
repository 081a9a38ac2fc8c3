"""A misspelt name in an option that maps fluids or models to names of the data is refused
with the known names listed, never silently unused."""

from __future__ import annotations

from pathlib import Path

import pytest

from satheight.cli import main

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"
CORE = [str(DEMO / n) for n in ("core_plugs.csv", "core_pc_steps.csv", "core_plate_steps.csv",
                                "core_plug_V12.csv")]


def test_fit_refuses_a_lab_system_no_curve_uses(tmp_path, capsys):
    # "mercury_iar" is no system of the demo core files (they use mercury_air, air_brine...)
    code = main(["fit", *CORE, "--out", str(tmp_path / "o"), "--no-plots",
                 "--lab", "mercury_iar=480 mN/m,140 deg"])
    err = capsys.readouterr().err
    assert code == 2 and "--lab" in err and "mercury_iar" in err
    assert "'mercury_air'" in err                        # the known names are listed
    assert not (tmp_path / "o").exists()


def test_fit_takes_a_lab_system_the_curves_use(tmp_path, capsys):
    assert main(["fit", *CORE, "--out", str(tmp_path / "o"), "--no-plots",
                 "--lab", "mercury_air=485 mN/m,140 deg"]) == 0


@pytest.mark.parametrize("args", [["--group-by", "rock_tpye"]])
def test_fit_refuses_a_misspelt_grouping_column(tmp_path, capsys, args):
    code = main(["fit", *CORE, "--out", str(tmp_path / "o"), "--no-plots", *args])
    err = capsys.readouterr().err
    assert code == 2 and "rock_tpye" in err and "Traceback" not in err
