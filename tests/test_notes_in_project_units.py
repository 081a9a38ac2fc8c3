"""Notes and printed quantities are in the project's units, rounded to what they mean, plain
numbers (no thousands separator). 1 ft = 0.3048 m exactly (international foot, nist2008)."""

from __future__ import annotations

import re

from satheight import units as U
from satheight.fwlsearch import search_fwl
from satheight.project import load_project
from satheight.workflows.well import compute_well
from test_contacts import samples_of
from tiny_field import make_field

FT = 0.3048


def test_shown_quantities_are_plain_numbers_in_the_system_unit():
    # worked by hand: 2105 m / 0.3048 = 6906.17 ft -> 0.1 ft; 1 psi = 6894.757 Pa (nist2008)
    assert U.shown(2105.0, "length", "field") == "6906.2 ft"
    assert U.shown(2105.0, "length", "metric") == "2105.00 m"
    assert U.shown(6894.757293168, "pressure", "field") == "1.00 psi"
    assert U.shown(1050.0, "density", "field") == "1.050 g/cm3"
    assert "," not in U.shown(12345678.0, "length", "metric")


def test_run_notes_of_a_feet_project_are_in_feet(tmp_path):
    p = make_field(tmp_path, wells=(("w0.las", "W0"),), fwl=1010.0)
    p.write_text(p.read_text(encoding="utf-8").replace('units = "metric"', 'units = "field"'),
                 encoding="utf-8")
    project = load_project(p)
    result, notes = compute_well(project, project.wells[0])
    note = next(n for n in notes if "deepest sample" in n)
    # FWL 1010 m = 3313.6 ft; deepest sample MD 1029.9 m - EKB 25 m = 1004.9 m = 3296.9 ft
    assert "FWL (3313.6 ft TVDSS)" in note and "(3296.9 ft)" in note
    assert not re.search(r"\d m\b", note)


def test_flagged_well_note_of_the_fwl_search_follows_the_display_unit():
    s = [samples_of(0), samples_of(1), samples_of(2, fwl=2092.0)]
    r = search_fwl(s, n_boot=60, seed=2)
    w2 = next(w for w in r.wells if w.well == "W2")
    shown = r.to_dict(FT, "ft")["warnings"]
    note = next(n for n in shown if n.startswith("W2: own best FWL"))
    assert note.startswith(f"W2: own best FWL {w2.best / FT:.2f} ft [{w2.low / FT:.2f}, ")
    assert f"[{r.low / FT:.2f}, {r.high / FT:.2f}]" in note
    assert sum(n.startswith("W2: own best FWL") for n in shown) == 1    # replaced, not added


def test_fit_points_table_has_pc_and_height_in_one_unit_system(tmp_path, capsys):
    import pandas as pd

    from pathlib import Path

    from satheight.cli import main

    demo = Path(__file__).resolve().parents[1] / "demo_wells"
    core = [str(demo / n) for n in ("core_plugs.csv", "core_pc_steps.csv",
                                    "core_plate_steps.csv", "core_plug_V12.csv")]
    res = ["--reservoir", "Upper Sand=26 mN/m,300 kg/m3", "--reservoir",
           "Lower Sand=50 mN/m,859.5 kg/m3", "--no-plots"]
    assert main(["fit", *core, *res, "--out", str(tmp_path / "m")]) == 0
    metric_out = capsys.readouterr().out
    assert main(["fit", *core, *res, "--units", "field", "--out", str(tmp_path / "f")]) == 0
    field_out = capsys.readouterr().out
    m = pd.read_csv(tmp_path / "m" / "core_points.csv")
    f = pd.read_csv(tmp_path / "f" / "core_points.csv")
    assert {"pc_lab [kPa]", "pc_res [kPa]", "height [m]"} <= set(m.columns)
    assert {"pc_lab [psi]", "pc_res [psi]", "height [ft]"} <= set(f.columns)
    # 1 psi = 6.894757 kPa, 1 ft = 0.3048 m (nist2008); 6 significant digits written
    ok = f["pc_lab [psi]"] > 0
    assert ((m["pc_lab [kPa]"][ok] / f["pc_lab [psi]"][ok] - 6.894757).abs() < 2e-5 * 6.9).all()
    ok = f["height [ft]"] > 0
    assert ((m["height [m]"][ok] / f["height [ft]"][ok] - FT).abs() < 2e-5).all()
    # the closure note follows the unit system: kPa to 0.1, psi to 0.01
    assert re.search(r"closure per curve: V01/mercury_air \d+\.\d kPa", metric_out)
    assert re.search(r"closure per curve: V01/mercury_air \d+\.\d\d psi", field_out)


def test_track_plot_datum_is_rounded_in_the_depth_unit():
    from satheight import plots
    from test_plots import all_texts, make_result

    # 26.8 m / 0.3048 = 87.926 ft -> 87.9 ft (0.1 ft); in metres 26.80 m
    feet = " ".join(all_texts(plots.track_plot(make_result(datum=26.8), units="field")))
    assert "depth datum 87.9 ft" in feet and "87.92" not in feet
    metres = " ".join(all_texts(plots.track_plot(make_result(datum=26.8))))
    assert "depth datum 26.80 m" in metres


def test_survey_note_of_a_feet_project_is_in_feet(tmp_path):
    p = make_field(tmp_path, wells=(("w0.las", "W0"),))
    # vertical survey ending at MD 1010 m; the logs reach MD 1029.9 m
    (tmp_path / "s.csv").write_text("MD [m],INC [deg],AZI [deg]\n0,0,0\n1010,0,0\n",
                                    encoding="utf-8")
    text = p.read_text(encoding="utf-8").replace('units = "metric"', 'units = "field"')
    p.write_text(text.replace('las = "w0.las"\n', 'las = "w0.las"\nsurvey = "s.csv"\n'),
                 encoding="utf-8")
    project = load_project(p)
    result, notes = compute_well(project, project.wells[0])
    note = next(n for n in notes if "last survey station" in n)
    # 1010 m / 0.3048 = 3313.6 ft; samples at MD 1010.1 ... 1029.9 m (0.1 m step): 199 of them
    assert "(MD 3313.6 ft)" in note and ": 199 depths below" in note
