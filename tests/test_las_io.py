"""Tests of the LAS reader/writer, atomic output and curve roles.

LAS files are written as text into ``tmp_path`` by each test; the data are invented.
Expected values come from the test's own input arrays, from NIST SP 811 (unit
factors) or from the lasio library reading our output independently.
"""

from __future__ import annotations

import hashlib
import os
import re
from pathlib import Path

import lasio
import numpy as np
import pytest

from satheight.datum import datum_from_header
from satheight.errors import (DepthError, InputFileError, MissingCurveError, ProjectFileError,
                              UnitError)
from satheight.io import las as las_mod
from satheight.io import las_write
from satheight.io.atomic import atomic_open, atomic_write_bytes, atomic_write_text
from satheight.io.las import describe_las, read_las, write_las
from satheight.roles import ROLE_ALIASES, detect_roles, require_role, role_values
from satheight.well import Curve, HeaderItem

FOOT_M = 0.3048          # international foot [m], NIST SP 811 (2008) Appendix B
DARCY_M2 = 9.869233e-13  # darcy [m^2], NIST SP 811 (2008) Appendix B


# ---------------------------------------------------------------------------
# helpers: build LAS 2.0 text
# ---------------------------------------------------------------------------

def las_text(curves, rows, *, null="-999.25", strt_unit="M", well="TEST-1",
             params=(), other="", extra_well=()):
    """LAS 2.0 text. ``curves``: (mnemonic, unit, description); ``rows``: lists of str/num."""
    lines = ["~Version information",
             " VERS.   2.0 : version",
             " WRAP.   NO  : no wrap",
             "~Well information"]
    first, last = rows[0][0], rows[-1][0]
    lines += [f" STRT.{strt_unit}  {first} : start", f" STOP.{strt_unit}  {last} : stop",
              f" STEP.{strt_unit}  0 : step"]
    if null is not None:
        lines.append(f" NULL.  {null} : null value")
    lines.append(f" WELL.  {well} : well name")
    lines += [f" {m}.{u}  {v} : {d}" for m, u, v, d in extra_well]
    lines.append("~Curve information")
    lines += [f" {m}.{u}  : {d}" for m, u, d in curves]
    if params:
        lines.append("~Parameter information")
        lines += [f" {m}.{u}  {v} : {d}" for m, u, v, d in params]
    if other:
        lines += ["~Other", other]
    lines.append("~A")
    lines += [" ".join(str(v) for v in row) for row in rows]
    return "\n".join(lines) + "\n"


def write(tmp_path, text, name="well.las"):
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


BASIC_CURVES = [("DEPT", "M", "measured depth"), ("GR", "GAPI", "gamma ray"),
                ("PHIE", "V/V", "effective porosity"), ("PERM", "MD", "permeability"),
                ("RT", "OHMM", "deep resistivity")]
BASIC_ROWS = [[1000.0, 45.5, 0.21, 150.0, 20.5],
              [1000.5, 50.25, 0.185, 80.0, 15.25],
              [1001.0, 62.0, 0.12, 3.5, 8.0],
              [1001.5, 70.125, 0.08, 0.4, 4.75]]


@pytest.fixture
def basic_file(tmp_path):
    return write(tmp_path, las_text(BASIC_CURVES, BASIC_ROWS,
                                    params=[("EKB", "M", "25.5", "kelly bushing elevation")],
                                    other="interpreted logs, invented for tests"))


def sha256(path):
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


# ---------------------------------------------------------------------------
# reading
# ---------------------------------------------------------------------------

def test_read_metres_file(basic_file):
    well = read_las(basic_file)
    data = np.array(BASIC_ROWS)
    # the file's values (las_text above): header items as written (cwls1992 layout)
    assert well.name == "TEST-1"
    assert well.source == basic_file
    assert well.depth_unit == "m"
    assert well.index_mnemonic == "DEPT"
    assert list(well.curves) == [c[0] for c in BASIC_CURVES]
    # the file's own values (BASIC_ROWS; cwls1992 layout); decimal text parses to the nearest
    # double on every CPU, so equality is exact
    np.testing.assert_array_equal(well.md, data[:, 0])
    for i, (m, unit, descr) in enumerate(BASIC_CURVES):
        c = well.curves[m]
        assert c.data.dtype == np.float64
        assert (c.unit, c.description) == (unit, descr)
        np.testing.assert_array_equal(c.data, data[:, i])
    # the file's NULL and ~Parameter items as written above (cwls1992)
    assert well.null_value == -999.25
    assert well.parameters["EKB"].value == 25.5
    assert well.parameters["EKB"].unit == "M"
    assert well.well_header["WELL"].value == "TEST-1"
    assert "invented for tests" in well.other
    assert well.version.startswith("2")
    assert well.warnings == []


@pytest.mark.parametrize("unit", ["F", "FT", "ft", "feet"])
def test_read_feet_file_gives_metres(tmp_path, unit):
    rows = [[5000.0, 0.2], [5000.5, 0.25], [5001.0, 0.3]]
    p = write(tmp_path, las_text([("DEPT", unit, "depth"), ("PHIE", "V/V", "")], rows,
                                 strt_unit=unit))
    well = read_las(p)
    # the file's depth unit, any spelling of feet; depths in metres by nist2008 below
    assert well.depth_unit == "ft"
    # 1 ft = 0.3048 m exactly (NIST SP 811)
    np.testing.assert_allclose(well.md, np.array([r[0] for r in rows]) * FOOT_M, rtol=0, atol=1e-12)
    # the index curve keeps the file's values
    np.testing.assert_array_equal(well.curves["DEPT"].data, [r[0] for r in rows])


def test_index_unit_taken_from_strt_when_curve_unit_empty(tmp_path):
    rows = [[100.0, 1.0], [101.0, 2.0]]
    p = write(tmp_path, las_text([("DEPT", "", "depth"), ("GR", "GAPI", "")], rows, strt_unit="FT"))
    well = read_las(p)
    # the file's depth unit, any spelling of feet; depths in metres by nist2008 below
    assert well.depth_unit == "ft"
    # nist2008: 1 ft = 0.3048 m
    np.testing.assert_allclose(well.md, [100.0 * FOOT_M, 101.0 * FOOT_M])


def test_unknown_depth_unit_names_file_and_unit(tmp_path):
    p = write(tmp_path, las_text([("TIME", "S", "time"), ("GR", "GAPI", "")],
                                 [[1.0, 2.0], [2.0, 3.0]], strt_unit="S"))
    with pytest.raises(InputFileError) as err:
        read_las(p)
    # README (Bad input, LAS files): depth unit not metres/feet is an error naming it
    assert str(p) in str(err.value) and "'S'" in str(err.value)


def test_missing_depth_unit_is_an_error(tmp_path):
    p = write(tmp_path, las_text([("DEPT", "", "depth"), ("GR", "", "")],
                                 [[1.0, 2.0], [2.0, 3.0]], strt_unit=""))
    with pytest.raises(InputFileError, match="no unit"):
        read_las(p)


def test_nulls_become_nan_except_in_index(tmp_path):
    # header NULL is -1234.5; -999.25 and 1e30 are common codes that are also replaced
    rows = [[-1000.0, 10.0, -1234.5, 1],
            [-999.25, -999.25, 0.2, 2],       # depth -999.25 must stay (index is never nulled)
            [-998.5, 1e30, 0.25, -1e31],
            [-998.0, 12.0, -999.25, 4]]
    p = write(tmp_path, las_text([("DEPT", "M", ""), ("GR", "GAPI", ""), ("PHIE", "V/V", ""),
                                  ("X", "", "")], rows, null="-1234.5"))
    well = read_las(p)
    # the file's values; the declared NULL (cwls1992) replaces only its own value, by curve
    np.testing.assert_array_equal(well.md, [-1000.0, -999.25, -998.5, -998.0])
    np.testing.assert_array_equal(np.isnan(well.curves["GR"].data), [False, True, True, False])
    np.testing.assert_array_equal(np.isnan(well.curves["PHIE"].data), [True, False, False, True])
    np.testing.assert_array_equal(np.isnan(well.curves["X"].data), [False, False, True, False])
    assert well.null_value == -1234.5
    text = "\n".join(well.warnings)
    assert "-999.25" in text and "2 value(s)" in text       # one in GR, one in PHIE
    assert "1e+30" in text                                  # GR 1e30 and X -1e31
    assert "-1234.5" not in text.split("header NULL is")[0]  # header NULL itself is not reported


@pytest.mark.parametrize("code", ["-999", "-9999", "-99999", "-999.2500"])
def test_other_common_null_codes(tmp_path, code):
    p = write(tmp_path, las_text([("DEPT", "M", ""), ("GR", "GAPI", "")],
                                 [[1.0, 5.0], [2.0, code], [3.0, 7.0]], null="-1"))
    well = read_las(p)
    # the file's values with the NULL read as missing (cwls1992)
    np.testing.assert_array_equal(np.isnan(well.curves["GR"].data), [False, True, False])
    assert any("GR 1" in w for w in well.warnings)


def test_decreasing_depths_are_reversed_with_warning(tmp_path):
    rows = [[1002.0, 3.0], [1001.0, 2.0], [1000.0, 1.0]]
    p = write(tmp_path, las_text([("DEPT", "M", ""), ("GR", "GAPI", "")], rows))
    well = read_las(p)
    # the file's values, in increasing depth (common practice)
    np.testing.assert_array_equal(well.md, [1000.0, 1001.0, 1002.0])
    np.testing.assert_array_equal(well.curves["GR"].data, [1.0, 2.0, 3.0])
    np.testing.assert_array_equal(well.curves["DEPT"].data, [1000.0, 1001.0, 1002.0])
    assert any("reversed" in w for w in well.warnings)


def test_duplicated_depth_names_row(tmp_path):
    rows = [[1000.0, 1.0], [1000.5, 2.0], [1000.5, 3.0], [1001.0, 4.0]]
    p = write(tmp_path, las_text([("DEPT", "M", ""), ("GR", "GAPI", "")], rows))
    with pytest.raises(DepthError) as err:
        read_las(p)
    msg = str(err.value)
    # README (Bad input, LAS files): a repeated, missing or out-of-order depth is an error
    # naming the data row (row 3 repeats 1000.5 in the rows above)
    assert str(p) in msg and "data row 3" in msg and "1000.5" in msg


def test_out_of_order_depth_names_row(tmp_path):
    rows = [[1000.0, 1.0], [1001.0, 2.0], [1002.0, 3.0], [1001.5, 4.0], [1003.0, 5.0]]
    p = write(tmp_path, las_text([("DEPT", "M", ""), ("GR", "GAPI", "")], rows))
    with pytest.raises(DepthError) as err:
        read_las(p)
    # README (Bad input, LAS files): out-of-order depth at data row 4 (1001.5 after 1002.0)
    assert "data row 4" in str(err.value) and "1001.5" in str(err.value)


def test_missing_depth_value_is_depth_error(tmp_path):
    rows = [[1000.0, 1.0], ["abc", 2.0], [1001.0, 3.0]]
    p = write(tmp_path, las_text([("DEPT", "M", ""), ("GR", "GAPI", "")], rows))
    with pytest.raises(DepthError) as err:
        read_las(p)
    # README (Bad input, LAS files): a missing depth (text) names the data row
    assert str(p) in str(err.value) and "data row 2" in str(err.value)


def test_missing_file_names_path(tmp_path):
    p = tmp_path / "nowhere" / "missing.las"
    with pytest.raises(InputFileError) as err:
        read_las(p)
    # README (Bad input): errors name the file
    assert str(p) in str(err.value)
    with pytest.raises(InputFileError):
        read_las(tmp_path)          # a folder


@pytest.mark.parametrize("content", [
    os.urandom(2000),                                            # binary garbage
    b"just some words\nnot a log file\n",                        # text without sections
    b"",                                                         # empty file
    b"~Version\n VERS. 2.0 :\n WRAP. NO :\n~Curve\n DEPT.M : d\n GR.GAPI : g\n~A\n1 2\n3 4 5\n",
    b"~Version\n VERS. 2.0 :\n~Well\n STRT.M 1 :\nthis line is bad\n~Curve\n DEPT.M : d\n~A\n1\n2\n",
    b"~Version\n VERS. 2.0 :\n WRAP. NO :\n~Curve\n DEPT.M : d\n GR.GAPI : g\n",  # no data
])
def test_garbage_file_is_input_file_error(tmp_path, content):
    p = tmp_path / "bad.las"
    p.write_bytes(content)
    with pytest.raises(InputFileError) as err:
        read_las(p)
    # README (Bad input, LAS files): binary content or not LAS text is an error
    assert type(err.value) is InputFileError
    assert str(p) in str(err.value)


def test_duplicate_mnemonics_made_unique(tmp_path):
    p = write(tmp_path, las_text([("DEPT", "M", ""), ("GR", "GAPI", "first"), ("GR", "GAPI", "second")],
                                 [[1.0, 10.0, 20.0], [2.0, 11.0, 21.0]]))
    well = read_las(p)
    # lasio's naming of repeated mnemonics (library: lasio)
    ref = lasio.read(str(p))
    assert list(well.curves) == [c.mnemonic for c in ref.curves]
    assert len(set(well.curves)) == 3
    assert well.curves[list(well.curves)[2]].description == "second"


def test_reading_does_not_print(basic_file, capfd):
    read_las(basic_file)
    out, err = capfd.readouterr()
    # README (Bad input): notes are kept with the well (printed under it by the run); the reader
    # itself prints nothing
    assert out == "" and err == ""


# ---------------------------------------------------------------------------
# roles
# ---------------------------------------------------------------------------

def make_well(tmp_path, curves, rows, name="roles.las"):
    return read_las(write(tmp_path, las_text(curves, rows), name))


def test_detect_roles_by_preference_and_case(tmp_path):
    curves = [("DEPT", "M", ""), ("PHIT", "V/V", ""), ("phie", "V/V", ""), ("perm", "MD", ""),
              ("ILD", "OHMM", ""), ("RT", "OHMM", "")]
    well = make_well(tmp_path, curves, [[1.0, 0.2, 0.18, 10, 5, 6], [2.0, 0.2, 0.18, 10, 5, 6]])
    roles = detect_roles(well)
    # README (Curve roles): aliases in the table's order, any letter case
    assert roles == {"porosity": "phie", "permeability": "perm", "resistivity": "RT", "sw": None,
                     "shale": None}


def test_role_overrides(tmp_path):
    curves = [("DEPT", "M", ""), ("PHIT", "V/V", ""), ("PHIE", "V/V", ""), ("MYK", "MD", "")]
    well = make_well(tmp_path, curves, [[1.0, 0.2, 0.18, 10], [2.0, 0.2, 0.18, 10]])
    roles = detect_roles(well, {"porosity": "phit", "permeability": "MYK"})
    # README (Curve roles): the project's curves table overrides the aliases
    assert roles["porosity"] == "PHIT" and roles["permeability"] == "MYK"
    with pytest.raises(MissingCurveError) as err:
        detect_roles(well, {"porosity": "NOPE"})
    for m in ("DEPT", "PHIT", "PHIE", "MYK"):
        assert m in str(err.value)
    assert "NOPE" in str(err.value)
    with pytest.raises(ProjectFileError):
        detect_roles(well, {"poro": "PHIE"})


def test_missing_permeability_message(tmp_path):
    curves = [("DEPT", "M", ""), ("PHIE", "V/V", ""), ("GR", "GAPI", "")]
    well = make_well(tmp_path, curves, [[1.0, 0.2, 50], [2.0, 0.2, 60]])
    found = detect_roles(well)
    with pytest.raises(MissingCurveError) as err:
        require_role(well, "permeability", found["permeability"])
    msg = str(err.value)
    assert str(well.source) in msg
    for alias in ROLE_ALIASES["permeability"]:
        assert alias in msg
    for m in ("DEPT", "PHIE", "GR"):
        assert m in msg
    assert 'curves = { permeability = "MNEMONIC" }' in msg
    assert require_role(well, "porosity", found["porosity"]) == "PHIE"


@pytest.mark.parametrize("unit", ["%", "PU", "pu", "percent"])
def test_percent_porosity_by_unit(tmp_path, unit):
    well = make_well(tmp_path, [("DEPT", "M", ""), ("PHIE", unit, "")], [[1.0, 20.0], [2.0, 5.0]])
    values, warns = role_values(well, "porosity", "PHIE")
    # closed form: percent / 100 (the file's 20 and 5); one IEEE division, exact to 1 ulp
    np.testing.assert_allclose(values, [0.20, 0.05], rtol=1e-15)
    assert warns == []


@pytest.mark.parametrize("unit", ["", "V/V", "frac"])
def test_percent_porosity_by_range_warns(tmp_path, unit):
    well = make_well(tmp_path, [("DEPT", "M", ""), ("PHIE", unit, ""), ("SW", unit, "")],
                     [[1.0, 20.0, 0.5], [2.0, 5.0, 0.9]])
    values, warns = role_values(well, "porosity", "PHIE")
    # closed form: percent / 100, found by range (porosity > 1 is percent: common practice)
    np.testing.assert_allclose(values, [0.20, 0.05], rtol=1e-15)
    assert len(warns) == 1 and "percent" in warns[0] and "PHIE" in warns[0]
    sw, warns_sw = role_values(well, "sw", "SW")           # already a fraction: unchanged
    # the file's values, already fractions
    np.testing.assert_array_equal(sw, [0.5, 0.9])
    assert warns_sw == []


def test_sw_percent_by_range(tmp_path):
    well = make_well(tmp_path, [("DEPT", "M", ""), ("SW", "", "")], [[1.0, 35.0], [2.0, 100.0]])
    sw, warns = role_values(well, "sw", "SW")
    # closed form: percent / 100 of the file's 35 and 100
    np.testing.assert_allclose(sw, [0.35, 1.0], rtol=1e-15)
    assert len(warns) == 1


@pytest.mark.parametrize("unit,factor", [("MD", DARCY_M2 / 1000), ("mD", DARCY_M2 / 1000),
                                         ("", DARCY_M2 / 1000), ("D", DARCY_M2),
                                         ("darcy", DARCY_M2)])
def test_permeability_to_m2(tmp_path, unit, factor):
    # darcy = 9.869233e-13 m^2 (NIST SP 811); empty unit taken as mD (common practice)
    well = make_well(tmp_path, [("DEPT", "M", ""), ("PERM", unit, "")], [[1.0, 100.0], [2.0, 0.5]])
    k, _ = role_values(well, "permeability", "PERM")
    np.testing.assert_allclose(k, np.array([100.0, 0.5]) * factor, rtol=1e-12)


def test_unknown_permeability_unit(tmp_path):
    well = make_well(tmp_path, [("DEPT", "M", ""), ("PERM", "FT", "")], [[1.0, 100.0], [2.0, 0.5]])
    with pytest.raises(UnitError) as err:
        role_values(well, "permeability", "PERM")
    msg = str(err.value)
    # README (Bad input): an unknown unit names the file, curve and unit
    assert str(well.source) in msg and "'PERM'" in msg and "'FT'" in msg


@pytest.mark.parametrize("unit", ["OHMM", "ohm.m", "ohm-m", ""])
def test_resistivity_units(tmp_path, unit):
    well = make_well(tmp_path, [("DEPT", "M", ""), ("RT", unit, "")], [[1.0, 12.5], [2.0, 3.0]])
    rt, _ = role_values(well, "resistivity", "RT")
    # the file's values: ohm.m in every spelling needs no conversion
    np.testing.assert_array_equal(rt, [12.5, 3.0])


def test_role_values_do_not_modify_well(tmp_path):
    well = make_well(tmp_path, [("DEPT", "M", ""), ("PHIE", "", "")], [[1.0, 20.0], [2.0, 5.0]])
    before = well.curves["PHIE"].data.copy()
    values, _ = role_values(well, "porosity", "PHIE")
    values[:] = -1.0
    # common practice (the project's rule): inputs are never modified
    np.testing.assert_array_equal(well.curves["PHIE"].data, before)
    rt_well = make_well(tmp_path, [("DEPT", "M", ""), ("RT", "OHMM", "")], [[1.0, 2.0], [2.0, 3.0]],
                        name="rt.las")
    rt, _ = role_values(rt_well, "resistivity", "RT")       # factor 1: still a new array
    assert not np.shares_memory(rt, rt_well.curves["RT"].data)


# ---------------------------------------------------------------------------
# writing
# ---------------------------------------------------------------------------

def test_write_round_trip_with_lasio(basic_file, tmp_path):
    well = read_las(basic_file)
    n = well.n_samples
    sw = np.linspace(0.1, 0.9, n)
    sw[1] = np.nan
    new = [Curve("SW_SHM", "V/V", "saturation from height", sw),
           Curve("HAFWL", "M", "height above FWL", np.array([12.5, 12.0, 11.5, 11.0]))]
    params = [HeaderItem("FWLZ", "M", 2034.5, "free-water level"),
              HeaderItem("MODEL", "", "power_law", "J function: power law"),
              HeaderItem("RUNTIME", "", "12:30:05", "time of run")]
    out = tmp_path / "out.las"
    write_las(out, well, new_curves=new, parameters=params, null_value=-9999.0,
              extra_other="written by the test")

    # library: lasio reads what we wrote; expected values are the test's inputs
    ref = lasio.read(str(out))                  # independent reader (library: lasio)
    data = np.array(BASIC_ROWS)
    for i, (m, unit, descr) in enumerate(BASIC_CURVES):
        np.testing.assert_array_equal(ref[m], data[:, i])
        assert ref.curves[m].unit == unit
        assert ref.curves[m].descr == descr
    assert [c.mnemonic for c in ref.curves] == [c[0] for c in BASIC_CURVES] + ["SW_SHM", "HAFWL"]
    np.testing.assert_allclose(ref["SW_SHM"], sw, atol=5e-7)        # 6 decimals by default
    assert np.isnan(ref["SW_SHM"][1])
    np.testing.assert_array_equal(ref["HAFWL"], [12.5, 12.0, 11.5, 11.0])
    assert ref.curves["HAFWL"].unit == "M"
    assert ref.params["EKB"].value == 25.5
    assert ref.params["FWLZ"].value == 2034.5 and ref.params["FWLZ"].unit == "M"
    assert ref.params["MODEL"].value == "power_law"       # a colon in the description is
    assert ref.params["MODEL"].descr.startswith("J function")  # not read as the value's end
    assert ref.params["RUNTIME"].value == "12:30:05" and ref.params["RUNTIME"].descr == "time of run"
    assert float(ref.well["NULL"].value) == -9999.0
    assert ref.well["WELL"].value == "TEST-1"
    assert float(ref.well["STRT"].value) == data[0, 0]
    assert float(ref.well["STOP"].value) == data[-1, 0]
    assert float(ref.well["STEP"].value) == 0.5
    assert ref.well["STRT"].unit == "M"
    assert "invented for tests" in ref.other and "written by the test" in ref.other
    assert str(ref.version["VERS"].value).startswith("2")
    assert str(ref.version["WRAP"].value).upper() == "NO"

    again = read_las(out)                       # and our own reader
    # the file's values as the test wrote them (BASIC_ROWS), not a second read
    for i, (m, _, _) in enumerate(BASIC_CURVES):
        np.testing.assert_array_equal(again.curves[m].data, data[:, i])


def test_write_preserves_many_decimals_and_nulls(tmp_path):
    rng = np.random.default_rng(7)
    n = 60
    depth = np.round(1500.0 + 0.1524 * np.arange(n), 4)
    cols = {"A": np.round(rng.uniform(0, 1, n), 10),
            "B": np.round(rng.uniform(-5000, 5000, n), 3),
            "C": np.round(rng.uniform(0, 1e6, n), 0),
            "D": np.round(rng.uniform(0, 1, n), 1)}
    cols["B"][[3, 7]] = -999.25                         # nulls
    rows = [[repr(float(depth[i]))] + [repr(float(cols[k][i])) for k in cols] for i in range(n)]
    curves = [("DEPT", "FT", "depth")] + [(k, "", f"curve {k}") for k in cols]
    src = write(tmp_path, las_text(curves, rows, strt_unit="FT"))
    well = read_las(src)
    out = tmp_path / "copy.las"
    write_las(out, well)
    ref = lasio.read(str(out))
    # library: lasio; expected: the values the test wrote (rounded text, exact doubles)
    np.testing.assert_array_equal(ref["DEPT"], depth)
    for k, v in cols.items():
        expected = np.where(v == -999.25, np.nan, v)
        np.testing.assert_array_equal(ref[k], expected)
    assert ref.well["STRT"].unit == "FT"
    # the step the test wrote (0.1524 ft), exact in text
    assert float(ref.well["STEP"].value) == 0.1524
    data_lines = out.read_text().split("~A", 1)[1].splitlines()[1:]
    assert len(data_lines) == n
    assert not any(re.search(r"\d[eE][-+]?\d", ln) for ln in data_lines)    # no exponents


def test_write_large_values_fixed_point(tmp_path):
    well = make_well(tmp_path, [("DEPT", "M", ""), ("GR", "", "")], [[1.0, 5.0], [2.0, 6.0]])
    out = tmp_path / "big.las"
    big = np.array([1.5e25, -2.0e20])
    write_las(out, well, new_curves=[Curve("BIG", "", "", big)])
    data_lines = out.read_text().split("~A", 1)[1].splitlines()[1:]
    # README (Bad input, LAS files): numbers are written in fixed point (no exponent)
    assert not any(re.search(r"\d[eE][-+]?\d", ln) for ln in data_lines)
    # library: lasio; the values given (1.5e25 and -2e20 are integers, exact in fixed point)
    np.testing.assert_array_equal(lasio.read(str(out))["BIG"], big)


def test_write_decimals_argument(tmp_path):
    well = make_well(tmp_path, [("DEPT", "M", ""), ("GR", "", "")], [[1.0, 5.0], [2.0, 6.0]])
    out = tmp_path / "dec.las"
    write_las(out, well, new_curves=[Curve("X", "", "", np.array([1 / 3, 2 / 3]))],
              decimals={"X": 2})
    # library: lasio; 1/3 and 2/3 rounded to 2 decimals (closed form)
    np.testing.assert_array_equal(lasio.read(str(out))["X"], [0.33, 0.67])
    with pytest.raises(InputFileError):
        write_las(out, well, new_curves=[Curve("X", "", "", np.array([1.0, 2.0]))],
                  decimals={"GR": 2})


def test_write_reversed_input_increasing(tmp_path):
    rows = [[1002.0, 3.0], [1001.0, 2.0], [1000.0, 1.0]]
    well = read_las(write(tmp_path, las_text([("DEPT", "M", ""), ("GR", "GAPI", "")], rows)))
    out = tmp_path / "inc.las"
    write_las(out, well)
    ref = lasio.read(str(out))
    # library: lasio; the input rows sorted by depth (closed form)
    np.testing.assert_array_equal(ref["DEPT"], [1000.0, 1001.0, 1002.0])
    np.testing.assert_array_equal(ref["GR"], [1.0, 2.0, 3.0])
    assert float(ref.well["STRT"].value) == 1000.0 and float(ref.well["STEP"].value) == 1.0


def test_write_keeps_duplicate_mnemonics(tmp_path):
    p = write(tmp_path, las_text([("DEPT", "M", ""), ("GR", "GAPI", "a"), ("GR", "GAPI", "b")],
                                 [[1.0, 10.0, 20.0], [2.0, 11.0, 21.0]]))
    well = read_las(p)
    out = tmp_path / "dup.las"
    write_las(out, well)
    ref, src = lasio.read(str(out)), lasio.read(str(p))
    # README (Bad input, LAS files): repeated mnemonics are written back as given; library: lasio
    assert [c.mnemonic for c in ref.curves] == [c.mnemonic for c in src.curves]
    assert [c.original_mnemonic for c in ref.curves] == ["DEPT", "GR", "GR"]


def test_new_curve_clash_is_error(basic_file, tmp_path):
    well = read_las(basic_file)
    out = tmp_path / "x.las"
    with pytest.raises(InputFileError) as err:
        write_las(out, well, new_curves=[Curve("phie", "", "", np.zeros(well.n_samples))])
    # README (Outputs): every input curve unchanged, so a new curve may not take an input
    # curve's name (any letter case)
    assert "phie" in str(err.value)
    with pytest.raises(InputFileError):
        write_las(out, well, parameters=[HeaderItem("BAD NAME", "", 1.0, "")])
    assert not out.exists()


def test_new_curve_wrong_length_or_null_clash(basic_file, tmp_path):
    well = read_las(basic_file)
    out = tmp_path / "x.las"
    with pytest.raises(InputFileError, match="values"):
        write_las(out, well, new_curves=[Curve("NEW", "", "", np.zeros(well.n_samples + 1))])
    vals = np.zeros(well.n_samples)
    vals[0] = -999.25
    with pytest.raises(InputFileError, match="null"):
        write_las(out, well, new_curves=[Curve("NEW", "", "", vals)])
    assert not out.exists()


def test_input_unchanged_after_read_and_write(basic_file, tmp_path):
    before = sha256(basic_file)
    mtime = basic_file.stat().st_mtime_ns
    well = read_las(basic_file)
    write_las(tmp_path / "other.las", well,
              new_curves=[Curve("NEW", "", "", np.ones(well.n_samples))])
    # README (Outputs): inputs are only read, never written (SHA-256 before and after)
    assert sha256(basic_file) == before
    assert basic_file.stat().st_mtime_ns == mtime


def test_writer_failure_mid_way_leaves_old_file(basic_file, tmp_path, monkeypatch):
    well = read_las(basic_file)
    out = tmp_path / "result.las"
    out.write_text("old content\n")
    temps_at_failure = []
    real = las_write._format_column
    calls = {"n": 0}

    def failing(values, decimals, null_text):
        calls["n"] += 1
        if calls["n"] > 1:                  # after the header is in the temporary file
            temps_at_failure.extend(p.name for p in tmp_path.iterdir()
                                    if p.name.startswith(".result.las") and p.name.endswith(".tmp"))
            raise RuntimeError("simulated failure")
        return real(values, decimals, null_text)

    monkeypatch.setattr(las_write, "_format_column", failing)
    with pytest.raises(RuntimeError):
        write_las(out, well)
    # README (Outputs): written to a temporary file, then renamed; a failure leaves the old file
    assert len(temps_at_failure) == 1         # failed mid-way, with the temporary file open
    assert out.read_text() == "old content\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == sorted([basic_file.name, "result.las"])


# ---------------------------------------------------------------------------
# atomic output
# ---------------------------------------------------------------------------

def test_atomic_open_replaces_on_success(tmp_path):
    target = tmp_path / "a.txt"
    target.write_text("old")
    with atomic_open(target) as f:
        temps = [p.name for p in tmp_path.iterdir() if p.name != "a.txt"]
        # README (Outputs): the temporary file is .<name>.<random>.tmp in the output folder
        assert len(temps) == 1 and temps[0].startswith(".") and temps[0].endswith(".tmp")
        f.write("new")
        assert target.read_text() == "old"           # not visible before the block ends
    assert target.read_text() == "new"
    assert [p.name for p in tmp_path.iterdir()] == ["a.txt"]


def test_atomic_open_keeps_old_file_on_error(tmp_path):
    target = tmp_path / "a.txt"
    target.write_text("old")
    with pytest.raises(ZeroDivisionError):
        with atomic_open(target) as f:
            f.write("half")
            1 / 0
    # README (Outputs): a failed write keeps the old complete file and no temporary file
    assert target.read_text() == "old"
    assert [p.name for p in tmp_path.iterdir()] == ["a.txt"]


def test_atomic_write_text_and_bytes(tmp_path):
    atomic_write_text(tmp_path / "t.txt", "line1\nline2\n")
    # README (Bad input, LAS files): outputs are UTF-8 with LF line ends; the text given
    assert (tmp_path / "t.txt").read_bytes() == b"line1\nline2\n"
    atomic_write_bytes(tmp_path / "b.bin", b"\x00\x01\xff")
    assert (tmp_path / "b.bin").read_bytes() == b"\x00\x01\xff"


def test_atomic_write_missing_folder(tmp_path):
    with pytest.raises(InputFileError) as err:
        atomic_write_text(tmp_path / "no" / "such" / "f.txt", "x")
    # README (Bad input): errors name the file
    assert "f.txt" in str(err.value)


# ---------------------------------------------------------------------------
# describe
# ---------------------------------------------------------------------------

def test_describe_las(tmp_path):
    rows = [[1000.0, 45.0, 0.21, 20.0], [1000.5, -999.25, 0.19, 15.0],
            [1001.0, 62.0, -999.25, -999.25], [1001.5, 70.0, 0.08, 4.0]]
    p = write(tmp_path, las_text([("DEPT", "M", "depth"), ("GR", "GAPI", "gamma"),
                                  ("PHIE", "V/V", "porosity"), ("RT", "OHMM", "resistivity")],
                                 rows, params=[("EKB", "M", "30.0", "kelly")]))
    info = describe_las(p)
    data = np.array(rows)
    data[:, 1:][data[:, 1:] == -999.25] = np.nan
    # the file's values (rows above)
    assert info["well"] == "TEST-1" and info["n_samples"] == 4
    # the file's values (rows above); min/max/null counts by numpy on the same rows
    assert info["depth"]["start"] == 1000.0 and info["depth"]["stop"] == 1001.5
    assert info["depth"]["step"] == 0.5 and info["depth"]["unit"] == "m"
    by = {c["mnemonic"]: c for c in info["curves"]}
    for i, m in enumerate(["DEPT", "GR", "PHIE", "RT"]):
        assert by[m]["n_null"] == int(np.isnan(data[:, i]).sum())
        assert by[m]["min"] == np.nanmin(data[:, i]) and by[m]["max"] == np.nanmax(data[:, i])
    assert by["GR"]["unit"] == "GAPI" and by["GR"]["description"] == "gamma"
    assert info["roles"]["porosity"]["mnemonic"] == "PHIE"
    assert info["roles"]["resistivity"]["mnemonic"] == "RT"
    assert info["roles"]["permeability"]["mnemonic"] is None
    assert info["roles"]["permeability"]["aliases_tried"] == list(ROLE_ALIASES["permeability"])
    assert info["path"] == str(p)
    # the file's ~Parameter and ~Well items
    assert info["header"]["EKB"]["value"] == 30.0
    assert info["header"]["WELL"]["value"] == "TEST-1"
    assert isinstance(info["warnings"], list)


def test_curve_value_field_kept_on_write(tmp_path):
    # LAS 2.0 (CWLS): the value field of a ~Curve line may hold an API log code; it must survive export
    text = """~Version
VERS. 2.0 :
WRAP. NO :
~Well
STRT.M 100.0 :
STOP.M 100.2 :
STEP.M 0.1 :
NULL. -999.25 :
WELL. CODE-1 :
~Curve
DEPT.M : depth
GR  .GAPI 07 310 01 00 : gamma ray
~A
100.0 50
100.1 55
100.2 60
"""
    import lasio

    from satheight.io.las import read_las, write_las

    src = tmp_path / "in.las"
    src.write_text(text)
    w = read_las(src)
    # cwls1992: the value field of a ~Curve line (an API log code) survives export
    assert w.curve("GR").value == "07 310 01 00"
    write_las(tmp_path / "out.las", w)
    back = lasio.read(tmp_path / "out.las")
    assert back.curves["GR"].value == "07 310 01 00"


# ---------------------------------------------------------------------------
# datum elevation from the header (~Well and ~Parameter)
# ---------------------------------------------------------------------------

def _datum_well(tmp_path, extra_well=(), params=(), name="d.las"):
    p = tmp_path / name
    p.write_text(las_text([("DEPT", "M", "depth"), ("PHIE", "V/V", "por")],
                          [[1000.0, 0.2], [1000.5, 0.21]], extra_well=extra_well, params=params))
    return read_las(p)


def test_datum_found_in_parameter_section(tmp_path):
    well = _datum_well(tmp_path, params=[("EKB", "M", "31.2", "kelly bushing")])
    value, source, notes = datum_from_header(well)
    assert value == pytest.approx(31.2, abs=1e-12)            # as written, metres
    assert "EKB" in source and "~Parameter" in source and notes == []


def test_datum_in_feet_converted_to_metres(tmp_path):
    well = _datum_well(tmp_path, extra_well=[("EKB", "FT", "100", "kb")])
    assert datum_from_header(well)[0] == pytest.approx(100 * FOOT_M, rel=1e-12)   # NIST SP 811


def test_datum_same_item_in_both_sections_disagreeing_is_refused(tmp_path):
    well = _datum_well(tmp_path, extra_well=[("EKB", "M", "28.5", "kb")],
                       params=[("EKB", "M", "30.0", "kb")])
    with pytest.raises(InputFileError) as e:
        datum_from_header(well)
    assert "disagree" in str(e.value) and "28.5" in str(e.value) and "30" in str(e.value)


def test_datum_kb_and_ekb_disagreeing_is_refused(tmp_path):
    well = _datum_well(tmp_path, extra_well=[("EKB", "M", "28.5", "kb")],
                       params=[("KB", "M", "25.0", "kb")])
    with pytest.raises(InputFileError, match="disagree"):
        datum_from_header(well)


def test_datum_depth_reference_disagreeing_with_kelly_bushing_is_refused(tmp_path):
    well = _datum_well(tmp_path, extra_well=[("EKB", "M", "28.5", "kb"), ("EREF", "M", "20", "ref")])
    with pytest.raises(InputFileError, match="EREF"):
        datum_from_header(well)


def test_datum_ground_level_fallback_is_a_visible_note(tmp_path):
    well = _datum_well(tmp_path, extra_well=[("EGL", "M", "12.0", "ground")])
    value, source, notes = datum_from_header(well)
    assert value == pytest.approx(12.0, abs=1e-12) and "ground level" in source
    assert any("ground level" in n for n in notes)


def test_datum_lmf_names_the_point_used(tmp_path):
    """LMF = DF: the log depths are measured from the drill floor, so EDF is used, and the
    kelly bushing item is listed as present but not used."""
    well = _datum_well(tmp_path, extra_well=[("EKB", "M", "28.5", "kb"), ("EDF", "M", "28.1", "df")],
                       params=[("LMF", "", "DF", "log measured from")])
    value, source, notes = datum_from_header(well)
    assert value == pytest.approx(28.1, abs=1e-12) and "EDF" in source and "LMF" in source
    assert any("EKB" in n and "not used" in n for n in notes)


def test_datum_missing_is_refused_with_hint(tmp_path):
    well = _datum_well(tmp_path)
    with pytest.raises(InputFileError) as e:
        datum_from_header(well)
    assert "datum_elevation" in str(e.value) and "~Parameter" in str(e.value)


def test_datum_implausible_elevation_is_refused(tmp_path):
    # 28.5 m written in centimetres: beyond any drilled ground elevation (recalled from memory)
    well = _datum_well(tmp_path, extra_well=[("EKB", "M", "28500", "kb")])
    with pytest.raises(InputFileError, match="plausible"):
        datum_from_header(well)


# ---------------------------------------------------------------------------
# permeability curves by pattern (K*, PERM*) with a permeability unit as evidence
# ---------------------------------------------------------------------------

def _perm_well(tmp_path, curves, name="k.las"):
    p = tmp_path / name
    rows = [[1000.0] + [0.2] * len(curves), [1000.5] + [0.3] * len(curves)]
    p.write_text(las_text([("DEPT", "M", "depth")] + curves, rows))
    return p


@pytest.mark.parametrize("mnemonic,unit", [("KLOGH", "mD"), ("PERM_H", "md"), ("KHOR", "D"),
                                           ("KINT_CORE", "darcy")])
def test_suffixed_permeability_curve_found_with_reason(tmp_path, mnemonic, unit):
    p = _perm_well(tmp_path, [("PHIE", "V/V", "por"), (mnemonic, unit, "k")])
    assert detect_roles(read_las(p))["permeability"] == mnemonic
    info = describe_las(p)["roles"]["permeability"]
    assert info["mnemonic"] == mnemonic and "K*/PERM*" in info["reason"] and unit in info["reason"]


def test_potassium_curve_is_not_taken_for_permeability(tmp_path):
    """K in % is potassium from spectral gamma ray (common practice), KTH a gamma-ray curve:
    neither carries a permeability unit, so neither is permeability."""
    p = _perm_well(tmp_path, [("PHIE", "V/V", "por"), ("K", "%", "potassium"), ("KTH", "gAPI", "gr")])
    assert detect_roles(read_las(p))["permeability"] is None
    reason = describe_las(p)["roles"]["permeability"]["reason"]
    assert "none named K*/PERM*" in reason and "K skipped: unit '%'" in reason


def test_two_permeability_pattern_candidates_are_refused_not_guessed(tmp_path):
    p = _perm_well(tmp_path, [("PHIE", "V/V", "por"), ("KLOGH", "mD", "kh"), ("KLOGV", "mD", "kv")])
    with pytest.raises(MissingCurveError) as e:
        detect_roles(read_las(p))
    msg = str(e.value)
    assert "KLOGH" in msg and "KLOGV" in msg and "curves = { permeability" in msg
    info = describe_las(p)["roles"]["permeability"]       # inspect shows the choice, no error
    assert info["mnemonic"] is None and info["candidates"] == ["KLOGH", "KLOGV"]
    # naming one in the project file settles it
    assert detect_roles(read_las(p), {"permeability": "KLOGV"})["permeability"] == "KLOGV"


def test_alias_choice_names_the_other_curves_present(tmp_path):
    p = _perm_well(tmp_path, [("PHIE", "V/V", "por"), ("PERM", "mD", "k"), ("KH", "mD", "kh")])
    info = describe_las(p)["roles"]["permeability"]
    assert info["mnemonic"] == "PERM" and "KH" in info["reason"]


def test_permeability_without_unit_read_as_md_with_a_note(tmp_path):
    p = _perm_well(tmp_path, [("PERM", "", "k")])
    values, notes = role_values(read_las(p), "permeability", "PERM")
    # 1 mD = 9.869233e-16 m^2 (NIST SP 811 darcy / 1000)
    assert values[0] == pytest.approx(0.2 * DARCY_M2 / 1000, rel=1e-9)
    assert any("no unit; read as mD" in n for n in notes)


def test_describe_las_reports_the_datum_item_used(tmp_path):
    p = tmp_path / "d.las"
    p.write_text(las_text([("DEPT", "M", "depth"), ("PHIE", "V/V", "por")], [[1000.0, 0.2], [1001, 0.2]],
                          params=[("EKB", "M", "28.5", "kb")]))
    datum = describe_las(p)["datum"]
    assert datum["elevation_m"] == pytest.approx(28.5, abs=1e-12) and "~Parameter" in datum["source"]


# ---------------------------------------------------------------------------
# depth units of older files and other languages
# ---------------------------------------------------------------------------

def test_tenth_inch_depth_unit_read_in_metres(tmp_path):
    """.1IN: tenths of an inch; 1 in = 0.0254 m exactly (NIST SP 811), so 393700.8 tenths of an
    inch = 999.998 + 0.8 x 0.00254 = 1000.000032 m, and 393706.8 gives 999.998 + 6.8 x 0.00254
    = 1000.015272 m (worked by hand)."""
    well = make_well(tmp_path, [("DEPT", ".1IN", ""), ("PHIE", "V/V", "")],
                     [[393700.8, 0.2], [393706.8, 0.21]])
    assert well.depth_unit == ".1in"
    np.testing.assert_allclose(well.md, [1000.000032, 1000.015272], rtol=0, atol=1e-9)


@pytest.mark.parametrize("unit,factor", [("METROS", 1.0), ("PIEDS", FOOT_M)])
def test_depth_unit_in_another_language_read_with_a_note(tmp_path, unit, factor):
    well = make_well(tmp_path, [("DEPT", unit, ""), ("PHIE", "V/V", "")], [[100.0, 0.2], [101.0, 0.21]])
    np.testing.assert_allclose(well.md, [100.0 * factor, 101.0 * factor], rtol=1e-12)
    assert any(unit in w and "read as" in w for w in well.warnings)


def test_depth_unit_from_strt_is_a_visible_note(tmp_path):
    well = read_las(write(tmp_path, las_text([("DEPT", "", ""), ("PHIE", "V/V", "")],
                                             [[100.0, 0.2], [101.0, 0.21]], strt_unit="FT"), "s.las"))
    assert well.depth_unit == "ft" and any("unit of STRT" in w for w in well.warnings)


def test_datum_overflowing_after_unit_conversion_is_refused(tmp_path):
    """1e308 km is 1e311 m: beyond the largest float (about 1.8e308), inf after conversion."""
    well = _datum_well(tmp_path, extra_well=[("EKB", "KM", "1e308", "kb")])
    with pytest.raises(InputFileError) as e:
        datum_from_header(well)
    assert "EKB" in str(e.value) and "plausible" in str(e.value)
