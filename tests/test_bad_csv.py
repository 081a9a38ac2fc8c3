"""Damaged CSV inputs (survey, tops, core data, pressure points): rows of the README table
"Bad input: what happens" (CSV part), in particular the cases the fuzz suite found. Each file
either loads with the documented behaviour or raises the tool's own error naming the file and
line or row. Behavioural checks only: no values of our own code.

Independent facts used: 1 psi = 6894.757 Pa (NIST SP 811); 1 ft = 0.3048 m (NIST SP 811).
"""

import math

import numpy as np
import pytest

from satheight.errors import SatHeightError
from satheight.io.core_data import read_plug_table, read_pressure_steps, read_single_plug
from satheight.io.pressures import read_pressure_points
from satheight.io.survey import read_survey
from satheight.io.tops import read_tops

SURVEY = "MD [m],INC,AZI,TVD\n0,0,0,0\n100,1,10,\n200,2,20,\n"
TOPS = "well,zone,top [m],base [m]\nA-1,Z1,1000,1100\nA-1,Z2,1100,1200\n"
STEPS = "plug,system,pc [psi],sw\nP1,air_brine,1,1.0\nP1,air_brine,5,0.6\nP1,air_brine,20,0.3\n"
PLUGS = ("plug,well,depth [m],porosity,permeability,grain_density [g/cm3]\n"
         "P1,A-1,2000,0.2,100,2.65\nP2,A-1,2001,0.25,300,2.66\n")
SINGLE = ("# plug = P1\n# system = air_brine\n# depth = 2000 m\n# porosity = 0.2\n# permeability = 100 mD\n"
          "pc [psi],sw\n1,1.0\n5,0.6\n")
POINTS = "well,tvdss [m],pressure [psi],fluid,quality\nA-1,2000,3000,oil,good\nA-1,2100,3050,water,good\n"


def write(tmp_path, text, name="f.csv"):
    p = tmp_path / name
    p.write_bytes(text.encode("utf-8") if isinstance(text, str) else text)
    return p


def refused(load, path, *where):
    with pytest.raises(SatHeightError) as info:
        load(path)
    msg = str(info.value)
    # README (Bad input, CSV files): one line naming the file
    assert path.name in msg and "\n" not in msg
    for w in where:
        assert w in msg, msg
    return msg


def test_survey_tie_in_reads_the_first_row_only(tmp_path):
    s = read_survey(write(tmp_path, SURVEY.replace("100,1,10,", "100,1,10,not computed")))
    # closed form: the first row's tie-in (a vertical well head at the origin); the file's MDs
    assert s.tie_in == (0.0, 0.0, 0.0)
    np.testing.assert_array_equal(s.md, [0, 100, 200])


@pytest.mark.parametrize("load,text,old,new,where", [
    (read_survey, SURVEY, "100,1,10", "1e400,1,10", "line 3"),
    (read_tops, TOPS, "1100,1200", "1100,1e400", "line 3"),
    (read_pressure_steps, STEPS.replace("[psi]", "[MPa]"), ",5,", ",1e308,", "row 3"),
    (read_plug_table, PLUGS.replace("[g/cm3]", "[g/cm3]"), "2.66", "1e308", "row 3"),
    (read_pressure_points, POINTS.replace("[psi]", "[MPa]"), "3050", "1e308", "line 3"),
])
def test_numbers_too_large_for_the_unit_are_errors(tmp_path, load, text, old, new, where):
    refused(load, write(tmp_path, text.replace(old, new)), where)


@pytest.mark.parametrize("load,text", [(read_survey, SURVEY), (read_tops, TOPS),
                                       (read_pressure_steps, STEPS), (read_plug_table, PLUGS),
                                       (read_pressure_points, POINTS)])
def test_a_cell_the_csv_parser_refuses_names_the_line(tmp_path, load, text):
    lines = text.split("\n")
    lines[2] += "," + "9" * 200_000                  # csv module: field limit 131,072 characters
    refused(load, write(tmp_path, "\n".join(lines)), "3")


@pytest.mark.parametrize("newline", ["\r\n", "\r"])
@pytest.mark.parametrize("load,text", [(read_pressure_steps, STEPS), (read_plug_table, PLUGS),
                                       (read_single_plug, SINGLE), (read_survey, SURVEY),
                                       (read_pressure_points, POINTS)])
def test_any_line_ends_give_the_same_result(tmp_path, load, text, newline):
    a = load(write(tmp_path, text, "lf.csv"))
    b = load(write(tmp_path, text.replace("\n", newline), "other.csv"))
    if isinstance(a, list):                       # core steps: curves
        a, b = a[0], b[0]
    elif isinstance(a, dict):                     # plug table
        a, b = a["P2"], b["P2"]
    elif isinstance(a, tuple):                    # single plug: (plug, curve)
        a, b = a[1], b[1]
    for key in ("pc", "sw", "md", "inc", "pressure", "tvdss", "porosity", "depth"):
        if hasattr(a, key):
            # closed form: line ends carry no data (common practice), so both files give the same values
            np.testing.assert_array_equal(getattr(a, key), getattr(b, key))
    for key in ("rows", "labels", "line", "source"):
        if hasattr(a, key):
            va, vb = getattr(a, key), getattr(b, key)
            if key == "source":
                va, vb = str(va).replace("lf.csv", ""), str(vb).replace("other.csv", "")
            assert np.array_equal(np.asarray(va), np.asarray(vb)), key


@pytest.mark.parametrize("load,text", [(read_pressure_steps, STEPS), (read_plug_table, PLUGS),
                                       (read_single_plug, SINGLE)])
def test_core_file_with_a_header_only_is_an_error(tmp_path, load, text):
    head = "\n".join(ln for ln in text.split("\n") if ln.startswith("#"))
    head += "\n" + next(ln for ln in text.split("\n") if ln and not ln.startswith("#")) + "\n"
    refused(load, write(tmp_path, head), "no data rows")


def test_single_plug_without_a_pc_column_is_an_error(tmp_path):
    refused(read_single_plug, write(tmp_path, SINGLE.replace("pc [psi]", "pressure_x [psi]")),
            "pc")


def test_grain_density_not_positive_is_an_error(tmp_path):
    refused(read_plug_table, write(tmp_path, PLUGS.replace("2.66", "-2.66")), "row 3",
            "grain density")


@pytest.mark.parametrize("load,text,old,where", [(read_pressure_steps, STEPS, ",20,", "row 4"),
                                                 (read_plug_table, PLUGS, ",300,", "row 3"),
                                                 (read_pressure_points, POINTS, ",3050,", "line 3"),
                                                 (read_survey, SURVEY, ",20,", "line 4"),
                                                 (read_tops, TOPS, ",1200", "line 3")])
def test_digit_separators_are_not_numbers(tmp_path, load, text, old, where):
    new = old.replace("20", "2_0").replace("300", "3_00").replace("3050", "3_050").replace(
        "1200", "1_200")
    assert new != old
    refused(load, write(tmp_path, text.replace(old, new)), where, "_")


def test_valid_files_load_with_the_values_written(tmp_path):
    """The fixtures above are valid: the refusals are caused by the change alone."""
    (plug, curve) = read_single_plug(write(tmp_path, SINGLE))
    # the file's values (SINGLE) and its line numbers
    assert plug.porosity == 0.2 and curve.rows == (7, 8)
    # NIST SP 811: 1 psi = 6894.757 Pa
    np.testing.assert_allclose(read_pressure_steps(write(tmp_path, STEPS))[0].pc,
                               np.array([1, 5, 20]) * 6894.757, rtol=1e-6)
    pp = read_pressure_points(write(tmp_path, POINTS))
    assert list(pp.line) == [2, 3] and math.isclose(pp.pressure[0], 3000 * 6894.757, rel_tol=1e-6)
    assert [t.line for t in read_tops(write(tmp_path, TOPS))] == [2, 3]
    assert len(read_plug_table(write(tmp_path, PLUGS))) == 2


def test_core_steps_out_of_order_are_shown_as_read_in_psi(tmp_path):
    # steps 5 psi then 2.5 psi: the message gives the file's numbers in the file's unit
    # (not Pa: 5 psi = 34473.8 Pa, NIST SP 811)
    text = STEPS.replace("P1,air_brine,20,0.3", "P1,air_brine,2.5,0.3")
    with pytest.raises(SatHeightError) as info:
        read_pressure_steps(write(tmp_path, text))
    assert "(5 psi then 2.5 psi)" in info.value.what and "Pa" not in info.value.what
