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


# --------------------------------------------------------------------------------------
# messages of a feet project: each depth in feet, equal to the metre value / 0.3048
# (international foot, nist2008); a file's own values as read, in the file's unit

def _feet_field(tmp_path, fwl: str = "3313.6", survey: str | None = None, tops: str = ""):
    """tiny_field's one well (MD 1000-1029.9 m, EKB 25 m) in a project of units "field"."""
    p = make_field(tmp_path, wells=(("w0.las", "W0"),))
    text = p.read_text(encoding="utf-8").replace('units = "metric"', 'units = "field"')
    text = re.sub(r'fwl = "[^"]*"', f"fwl = {fwl}", text)
    if survey is not None:
        (tmp_path / "s.csv").write_text(survey, encoding="utf-8")
        text = text.replace('las = "w0.las"\n', 'las = "w0.las"\nsurvey = "s.csv"\n' + tops)
    p.write_text(text, encoding="utf-8")
    return load_project(p)


def _numbers(text: str) -> list[float]:
    return [float(x) for x in re.findall(r"-?\d+(?:\.\d+)?", text)]


def test_fwl_outside_the_logs_of_a_feet_project_is_told_in_feet(tmp_path):
    import pytest

    from satheight.errors import ProjectFileError

    project = _feet_field(tmp_path, fwl="9842.5")           # bare number: feet
    with pytest.raises(ProjectFileError) as ei:
        compute_well(project, project.wells[0])
    what = ei.value.what
    assert "outside the logged TVDSS range" in what and not re.search(r"\d m\b", what)
    # FWL 9842.5 ft as given; margin 1000 m (plausible.RANGES fwl_margin, common practice);
    # logged TVDSS 1000 - 25 = 975 m to 1029.9 - 25 = 1004.9 m (tiny_field, by hand)
    expected_m = [9842.5 * FT, 1000.0, 975.0, 1004.9]
    shown = _numbers(what.split("(")[0])
    assert len(shown) == 4
    for v, m in zip(shown, expected_m):
        assert abs(v - m / FT) <= 1e-5 * m / FT           # 6 significant digits (:g)
    assert what.count(" ft") == 3                          # FWL, margin, range


def test_survey_md_order_error_shows_the_file_values_as_read(tmp_path):
    import pytest

    from satheight.errors import DepthError

    survey = "MD [ft],INC [deg],AZI [deg]\n0,0,0\n3400.5,1,0\n3390.25,1,0\n"
    project = _feet_field(tmp_path, survey=survey)
    with pytest.raises(DepthError) as ei:
        compute_well(project, project.wells[0])
    # the two MDs as written in the file, in its unit (ft), and the lines
    assert "(3400.5 ft at line 3 then 3390.25 ft)" in ei.value.what


def test_survey_tie_in_note_and_start_error_in_the_file_units(tmp_path):
    import pytest

    from satheight.errors import DepthError

    # no tie-in columns, first station at MD 500 ft: a vertical station at MD 0 is added
    project = _feet_field(tmp_path / "a", survey="MD [ft],INC,AZI\n500,0,0\n4000,0,0\n")
    _, notes = compute_well(project, project.wells[0])
    note = next(n for n in notes if "without a tie-in" in n)
    assert "starts at MD 500 ft without a tie-in" in note and not re.search(r"\d m\b", note)
    # first station at 3500 ft, below the log's first sample at MD 1000 m (the LAS file's
    # unit, as read): each MD in its own file's unit
    project = _feet_field(tmp_path / "b", survey="MD [ft],INC,AZI\n3500,0,0\n4000,0,0\n")
    with pytest.raises(DepthError) as ei:
        compute_well(project, project.wells[0])
    assert "starts at MD 3500 ft, below the first log sample at MD 1000 m" in ei.value.what


def _feet_project_error(tmp_path, old: str, new: str, extra: str = "") -> str:
    """The project reader's error for tiny_field's project in units "field" with ``old``
    replaced by ``new`` in the zone (and ``extra`` appended)."""
    import pytest

    from satheight.errors import ProjectFileError

    p = make_field(tmp_path, wells=(("w0.las", "W0"),))
    text = p.read_text(encoding="utf-8").replace('units = "metric"', 'units = "field"')
    assert old in text
    p.write_text(text.replace(old, new) + extra, encoding="utf-8")
    with pytest.raises(ProjectFileError) as ei:
        load_project(p)
    return ei.value.what


def test_implausible_density_of_a_field_project_is_told_in_its_unit(tmp_path):
    # a bare 12.5 is taken in g/cm3 (the field system's density unit); the range 950-1250
    # kg/m3 (plausible.RANGES, common practice) is 0.95-1.25 g/cm3 (1 g/cm3 = 1000 kg/m3,
    # nist2008)
    what = _feet_project_error(tmp_path, 'water_density = "1.05 g/cm3"', "water_density = 12.5")
    assert "is 12.5 g/cm3, outside the plausible range 0.95 to 1.25 g/cm3" in what
    assert "kg/m3" not in what


def test_density_order_error_of_a_field_project_is_in_g_per_cm3(tmp_path):
    what = _feet_project_error(tmp_path, 'water_density = "1.05 g/cm3"',
                               'water_density = 0.79\nallow_unusual = ["water_density"]')
    # the two densities as given (0.79 and 0.8 g/cm3, nist2008: 790 and 800 kg/m3)
    assert "(0.79 g/cm3) is not greater than" in what and "(0.8 g/cm3)" in what
    assert "kg/m3" not in what


def test_monte_carlo_spread_of_a_feet_project_is_told_in_feet(tmp_path):
    # sd 2000 ft = 609.6 m is wider than the plausible 500 m (uncertainty_keys.PLAUSIBLE_SPREAD,
    # common practice) = 1640.42 ft (500 / 0.3048, nist2008)
    what = _feet_project_error(tmp_path, 'sigma_cos_theta = "26 mN/m"\n',
                               'sigma_cos_theta = "26 mN/m"\n'
                               'uncertainty = { fwl = { distribution = "normal", sd = 2000 } }\n')
    assert "a spread of 2000 ft is wider than the plausible 1640.42 ft" in what
    assert "(SI)" not in what


def test_monte_carlo_density_overlap_of_a_field_project_is_in_g_per_cm3(tmp_path):
    import pytest

    from satheight.errors import SatHeightError
    from satheight.workflows.uncertainty import well_uncertainty

    # water uniform 0.75 to 1.0 g/cm3 (bare numbers: the field system's unit) against the
    # oil's 0.8 g/cm3: draws may cross; the message gives both as the user wrote them
    p = make_field(tmp_path, wells=(("w0.las", "W0"),))
    text = p.read_text(encoding="utf-8").replace('units = "metric"', 'units = "field"')
    text += "[zones.uncertainty]\nwater_density = { distribution = \"uniform\", low = 0.75, high = 1.0 }\n"
    p.write_text(text, encoding="utf-8")
    project = load_project(p)
    result, _ = compute_well(project, project.wells[0])
    with pytest.raises(SatHeightError) as ei:
        well_uncertainty(project, result)
    assert "(down to 0.75 g/cm3)" in ei.value.what and "(up to 0.8 g/cm3)" in ei.value.what


def test_md_top_above_the_first_survey_station_is_told_in_feet(tmp_path):
    import pytest

    from satheight.errors import DepthError

    # the survey is tied in at MD 3280 ft (999.744 m, just above the log's first sample at
    # 1000 m); the zone's MD top 3000 ft (914.4 m) lies above it: both in feet, 0.1 ft
    survey = "MD [ft],INC [deg],AZI [deg],TVD [ft]\n3280,0,0,3280\n4000,0,0,\n"
    project = _feet_field(tmp_path, survey=survey, tops="[wells.tops]\nS = [3000, 3400]\n")
    with pytest.raises(DepthError) as ei:
        compute_well(project, project.wells[0])
    what = ei.value.what
    assert "lies above the first survey station" in what and not re.search(r"\d m\b", what)
    top, station = _numbers(what)
    # shown to 0.1 ft (units.SHOWN_DECIMALS): within 0.05 ft of metres / 0.3048
    assert abs(top - 914.4 / FT) <= 0.05 and abs(station - 999.744 / FT) <= 0.05
