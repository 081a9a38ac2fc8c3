"""Survey and tops files: reading, units, validation errors naming file and line; project keys."""

import math
import textwrap
import warnings

import numpy as np
import pytest

from satheight.errors import DepthError, InputFileError, ProjectFileError
from satheight.io.survey import read_survey, survey_trajectory
from satheight.io.tops import read_tops
from satheight.project import load_project

FT = 0.3048  # international foot [m], NIST SP 811


def _write(path, text):
    path.write_text(textwrap.dedent(text).lstrip("\n"))
    return path


def test_csv_with_units_in_header(tmp_path):
    p = _write(tmp_path / "s.csv", """
        # comment line
        MD [ft],INC [deg],AZI [deg],COMMENT
        0,0,0,surface
        1000,30,45,
        3000,90,45,
        """)
    s = read_survey(p)
    # the file's values; ft -> m (nist2008), degrees -> radians (numpy)
    np.testing.assert_allclose(s.md, np.array([0, 1000, 3000]) * FT)
    np.testing.assert_allclose(s.inc, np.radians([0, 30, 90]))
    np.testing.assert_allclose(s.azi, np.radians([0, 45, 45]))
    assert s.tie_in is None


def test_csv_with_units_row_and_aliases(tmp_path):
    p = _write(tmp_path / "s.txt", """
        Depth,Inclination,Azimuth
        m,rad,deg
        0,0,0
        100,0.1,350
        """)
    s = read_survey(p)
    # the file's values; units from the units row (m, rad, deg)
    np.testing.assert_allclose(s.md, [0, 100])
    np.testing.assert_allclose(s.inc, [0, 0.1])
    assert s.azi[1] == pytest.approx(math.radians(350))


def test_las_survey(tmp_path):
    p = _write(tmp_path / "s.las", """
        ~Version
        VERS. 2.0 :
        WRAP. NO :
        ~Well
        STRT.F 0 :
        STOP.F 2000 :
        STEP.F 1000 :
        NULL. -999.25 :
        WELL. SURV-1 :
        ~Curve
        DEPT.F : measured depth
        INCL.DEG : inclination
        AZIM.DEG : azimuth
        ~A
        0 0 0
        1000 10 90
        2000 20 90
        """)
    s = read_survey(p)
    # the file's values; ft -> m (nist2008), degrees -> radians (numpy)
    np.testing.assert_allclose(s.md, [0, 1000 * FT, 2000 * FT])
    np.testing.assert_allclose(s.inc, np.radians([0, 10, 20]))


@pytest.mark.parametrize("body,match,line", [
    ("MD,INC,AZI\n0,0,0\n", "has no unit", 1),
    ("MD [m],INC,AZI\n0,0,0\n100,0,0\n90,1,0\n", "does not increase", 4),
    ("MD [m],INC,AZI\n0,0,0\n100,190,0\n", "outside 0 to 180", 3),
    ("MD [m],INC,AZI\n0,0,0\n100,10,400\n", "outside 0 to 360", 3),
    ("MD [m],INC,AZI\n0,0,0\n100,ten,0\n", "not a number", 3),
    ("MD [m],INC,AZI\n0,0,0\n100,,0\n", "is empty", 3),
    ("MD [m],INC\n0,0\n", "no AZI column", 1),
    ("MD [furlong],INC,AZI\n0,0,0\n", "not a length unit", 1),
    ("MD [m],INC,AZI\n-5,0,0\n", "negative", 2),
])
def test_bad_survey_errors_name_file_and_line(tmp_path, body, match, line):
    p = tmp_path / "bad.csv"
    p.write_text(body)
    with pytest.raises((InputFileError, DepthError), match=match) as ei:
        read_survey(p)
    # README (Bad input, CSV files): survey errors name the file and line
    assert f"bad.csv, line {line}" in str(ei.value)


def test_unknown_format_and_ending(tmp_path):
    p = _write(tmp_path / "s.dat", "MD [m],INC,AZI\n0,0,0\n")
    with pytest.raises(InputFileError, match="file ending"):
        read_survey(p)
    # the file's values; the format given explicitly whatever the suffix
    assert read_survey(p, "csv").md[0] == 0
    with pytest.raises(InputFileError, match="unknown survey format"):
        read_survey(p, "xls")
    with pytest.raises(InputFileError, match="not found"):
        read_survey(tmp_path / "none.csv")


def test_first_station_below_log_top_is_an_error(tmp_path):
    p = _write(tmp_path / "s.csv", "MD [m],INC,AZI\n1500,10,0\n2500,20,0\n")
    s = read_survey(p)
    with pytest.raises(DepthError, match="below the first log sample") as ei:
        survey_trajectory(s, 1400.0, "w.las")
    # README (Deviated wells): a survey starting below the first log sample is an error naming both
    # files
    assert "s.csv" in str(ei.value) and "w.las" in str(ei.value)


def test_added_vertical_tie_in_station(tmp_path):
    p = _write(tmp_path / "s.csv", "MD [m],INC,AZI\n500,0,0\n1500,30,0\n")
    with pytest.warns(UserWarning, match="vertical station at MD 0"):
        tr = survey_trajectory(read_survey(p), 1000.0)
    # closed form: a vertical station at MD 0 above a vertical first station: TVD = MD
    assert tr.md[0] == 0 and tr.tvd[1] == pytest.approx(500.0)


def test_given_tie_in(tmp_path):
    # the first station's position comes from the TVD, NORTH, EAST columns; no warning
    p = _write(tmp_path / "s.csv", "MD [ft],INC,AZI,TVD [ft],NORTH,EAST\n"
                                   "1000,10,90,990,0,50\n2000,10,90,,,\n")
    s = read_survey(p)
    # the file's values, ft -> m (nist2008)
    assert s.tie_in == pytest.approx((990 * FT, 0.0, 50 * FT))
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        tr = survey_trajectory(s, 1000 * FT)
    # closed form: straight 10-deg hold below the tie-in, 1000 ft cos 10 and sin 10 (nist2008 ft)
    assert tr.tvd[1] - tr.tvd[0] == pytest.approx(1000 * FT * math.cos(math.radians(10)))
    assert tr.east[1] - tr.east[0] == pytest.approx(1000 * FT * math.sin(math.radians(10)))


def test_empty_tie_in_is_an_error(tmp_path):
    p = _write(tmp_path / "s.csv", "MD [m],INC,AZI,TVD\n100,0,0,\n")
    with pytest.raises(InputFileError, match="tie-in"):
        read_survey(p)


# --- tops -----------------------------------------------------------------------------

def test_read_tops(tmp_path):
    p = _write(tmp_path / "tops.csv", """
        well,zone,top [ft],base [ft],depth
        A-1,Upper,6000,6300,MD
        A-1,Lower,2000,2100,tvdss
        A-2,Upper,6010,6310,
        """)
    rows = read_tops(p)
    # the file's values (tops.csv above)
    assert [(r.well, r.zone, r.depth_type) for r in rows] == [
        ("A-1", "Upper", "MD"), ("A-1", "Lower", "TVDSS"), ("A-2", "Upper", "MD")]
    # the file's values, ft -> m (nist2008); line numbers of the file as written
    assert rows[0].top == pytest.approx(6000 * FT) and rows[2].line == 4


def test_tops_default_unit(tmp_path):
    p = _write(tmp_path / "tops.csv", "well,zone,top,base\nA,Z,100,200\n")
    # the file's value in the default unit given (ft, nist2008)
    assert read_tops(p, "ft")[0].base == pytest.approx(200 * FT)


@pytest.mark.parametrize("body,match,line", [
    ("well,zone,top,base\nA,Z,200,100\n", "not above base", 2),
    ("well,zone,top,base\nA,Z,1,2\nA,Z,3,4\n", "given twice", 3),
    ("well,zone,top,base,depth\nA,Z,1,2,TVD\n", "not MD or TVDSS", 2),
    ("well,zone,top\nA,Z,1\n", "no 'base' column", 1),
    ("well,zone,top,base\nA,Z,x,2\n", "not a number", 2),
])
def test_bad_tops(tmp_path, body, match, line):
    p = tmp_path / "t.csv"
    p.write_text(body)
    with pytest.raises(InputFileError, match=match) as ei:
        read_tops(p)
    # README (Bad input, CSV files): tops errors name the file and line
    assert f"t.csv, line {line}" in str(ei.value)


# --- project keys ---------------------------------------------------------------------

PROJECT = """
[project]
units = "metric"
{project_extra}

[[wells]]
las = "w.las"
name = "W-1"
{well_extra}

[[zones]]
name = "Sand"
top = "970 m"
base = "980 m"
fwl = "975 m"
hydrocarbon = "oil"
water_density = "1.05 g/cm3"
hydrocarbon_density = "0.8 g/cm3"
sigma_cos_theta = "26 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.3
b = 1.2

[[zones]]
name = "Deep"
top = "990 m"
base = "1000 m"
fwl = "995 m"
hydrocarbon = "gas"
water_density = "1.05 g/cm3"
hydrocarbon_density = "0.2 g/cm3"
sigma_cos_theta = "50 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.3
b = 1.2
"""


def _project(tmp_path, project_extra="", well_extra=""):
    (tmp_path / "w.las").write_text("placeholder: the project reader only checks it exists\n")
    p = tmp_path / "p.toml"
    p.write_text(PROJECT.format(project_extra=project_extra, well_extra=well_extra))
    return p


def test_project_survey_keys(tmp_path):
    (tmp_path / "s.csv").write_text("MD [m],INC,AZI\n0,0,0\n")
    proj = load_project(_project(tmp_path, well_extra='survey = "s.csv"\nsurvey_format = "CSV"\n'
                                                      "location = { east = 100, north = \"2 km\" }"))
    w = proj.wells[0]
    # the values given in the project file, paths relative to it (README: Outputs)
    assert w.survey == (tmp_path / "s.csv").resolve() and w.survey_format == "csv"
    # the values given in the project file
    assert w.location == (100.0, 2000.0)


@pytest.mark.parametrize("extra,key", [
    ('survey = "missing.csv"', "wells[W-1].survey"),
    ('survey = 5', "wells[W-1].survey"),
    ('survey = "s.csv"\nsurvey_format = "xlsx"', "wells[W-1].survey_format"),
    ('survey_format = "csv"', "wells[W-1].survey_format"),
    ('location = { east = 1 }', "wells[W-1].location.north"),
    ('location = { east = 1, north = "3 parsecs" }', "wells[W-1].location.north"),
])
def test_project_survey_key_errors(tmp_path, extra, key):
    (tmp_path / "s.csv").write_text("MD [m],INC,AZI\n0,0,0\n")
    with pytest.raises(ProjectFileError) as ei:
        load_project(_project(tmp_path, well_extra=extra))
    # README (Bad input, Project file): every bad value names the file and the key
    assert "p.toml" in str(ei.value) and key in str(ei.value)


def test_tops_file_merged(tmp_path):
    (tmp_path / "tops.csv").write_text("well,zone,top [m],base [m],depth\n"
                                       "W-1,Sand,1000,1010,MD\nw,Deep,990,1001,TVDSS\n")
    proj = load_project(_project(tmp_path, project_extra='tops_file = "tops.csv"'))
    w = proj.wells[0]
    # the tops file's values, matched by well name and by LAS file name
    assert w.tops == {"Sand": (1000.0, 1010.0)}            # by well name
    assert w.tops_tvdss == {"Deep": (990.0, 1001.0)}       # by LAS file name
    assert proj.tops_file == (tmp_path / "tops.csv").resolve()


@pytest.mark.parametrize("rows,extra,match,key", [
    ("X-9,Sand,1,2,MD\n", "", "matches no", "project.tops_file"),
    ("W-1,Sandy,1,2,MD\n", "", r"not a \[\[zones\]\] name", "project.tops_file"),
    ("W-1,Sand,1,2,MD\n", '[wells.tops]\nSand = [1, 2]', "given both", "wells[W-1].tops.Sand"),
    ("W-1,Sand,1,5,MD\nW-1,Deep,4,8,MD\n", "", "overlaps", "wells[W-1].tops.Deep"),
    ("W-1,Sand,5,1,MD\n", "", "not above base", "project.tops_file"),
])
def test_tops_file_errors(tmp_path, rows, extra, match, key):
    (tmp_path / "tops.csv").write_text("well,zone,top,base,depth\n" + rows)
    with pytest.raises(ProjectFileError, match=match) as ei:
        load_project(_project(tmp_path, project_extra='tops_file = "tops.csv"', well_extra=extra))
    msg = str(ei.value)
    # README (Bad input, Project file): every bad value names the file and the key
    assert "p.toml" in msg and key in msg


def test_tops_file_missing(tmp_path):
    with pytest.raises(ProjectFileError, match="not found") as ei:
        load_project(_project(tmp_path, project_extra='tops_file = "nope.csv"'))
    # README (Bad input, Project file): a missing file names the key
    assert "project.tops_file" in str(ei.value)
