"""Messy LAS files, one case per row of the README table "Bad input: what happens" (LAS part):
each loads with the documented behaviour and note, or raises the tool's own error naming the
file (and the line where one line is at fault). Behavioural checks only: no values of our own.
"""

import numpy as np
import pytest

from satheight.errors import DepthError, InputFileError
from satheight.io.las import read_las, write_las

BASE = """~Version
VERS. 2.0 :
WRAP. NO :
~Well
STRT.M 1000.0 :
STOP.M 1000.3 :
STEP.M 0.1 :
NULL. -999.25 :
WELL. W-1 : well name
~Curve
DEPT.M : depth
PHIE.V/V : porosity
PERM.MD : permeability
~A
1000.0 0.2 10
1000.1 0.2 11
1000.2 0.21 12
1000.3 0.22 13
"""

# name: (text, expected) with expected ("ok", note substring or None, check) or
# ("error", error class, message substring)
OK, ERR = "ok", "error"
CASES = {
    "short_row": (BASE.replace("1000.1 0.2 11", "1000.1 0.2"), (ERR, InputFileError, "line 16")),
    "long_row": (BASE.replace("1000.1 0.2 11", "1000.1 0.2 11 5"), (ERR, InputFileError, "line 16")),
    "truncated": (BASE[:-6], (ERR, InputFileError, "line 18")),
    "text_in_number": (BASE.replace("0.21", "abc"), (OK, "not numbers", lambda w: np.isnan(w.curves["PHIE"].data[2]))),
    "odd_null_text": (BASE.replace("NULL. -999.25", "NULL. none"), (OK, None, lambda w: w.null_value is None)),
    "common_null_code": (BASE.replace("0.21", "-9999"), (OK, "read as null", lambda w: np.isnan(w.curves["PHIE"].data[2]))),
    "huge_value": (BASE.replace("0.21", "1e30"), (OK, "read as null", lambda w: np.isnan(w.curves["PHIE"].data[2]))),
    "overflow": (BASE.replace("0.21", "1e400"), (OK, "read as null", lambda w: np.isnan(w.curves["PHIE"].data[2]))),
    "tiny_value": (BASE.replace("0.21", "1e-300"), (OK, None, lambda w: w.curves["PHIE"].data[2] == 1e-300)),
    "duplicate_mnemonic": (BASE.replace("PERM.MD", "PHIE.MD"), (OK, None, lambda w: list(w.curves) == ["DEPT", "PHIE:1", "PHIE:2"])),
    "empty_mnemonic": (BASE.replace("PERM.MD", ".MD"), (OK, None, lambda w: "UNKNOWN" in w.curves)),
    "wrapped": (BASE.replace("WRAP. NO", "WRAP. YES").split("~A")[0] + "~A\n1000.0\n0.2 10\n1000.1\n0.2 11\n",
                (OK, None, lambda w: w.n_samples == 2 and w.curves["PERM"].data[1] == 11)),
    "wrapped_missing_value": (BASE.replace("WRAP. NO", "WRAP. YES").split("~A")[0] + "~A\n1000.0\n0.2 10\n1000.1\n0.2\n",
                              (ERR, InputFileError, "whole rows")),
    "too_few_columns": (BASE.split("~A")[0] + "~A\n1000.0 0.2\n1000.1 0.3\n", (ERR, InputFileError, "fewer columns")),
    "crlf": (BASE.replace("\n", "\r\n"), (OK, None, lambda w: w.n_samples == 4)),
    "cr_only": (BASE.replace("\n", "\r"), (OK, None, lambda w: w.n_samples == 4)),
    "no_version_section": (BASE.replace("~Version\nVERS. 2.0 :\nWRAP. NO :\n", ""), (OK, None, lambda w: w.n_samples == 4)),
    "no_curve_section": (BASE.split("~Curve")[0] + "~A" + BASE.split("~A")[1], (OK, None, lambda w: "UNKNOWN:1" in w.curves)),
    "no_data_section": (BASE.split("~A")[0], (ERR, InputFileError, "no data rows")),
    "empty_data": (BASE.split("~A")[0] + "~A\n", (ERR, InputFileError, "no data rows")),
    "repeated_section": (BASE + "~A\n1000.4 0.2 1\n", (ERR, InputFileError, "line 19")),
    "decreasing_depths": ("".join(BASE.split("~A\n")[0]) + "~A\n" + "\n".join(BASE.split("~A\n")[1].strip().split("\n")[::-1]) + "\n",
                          (OK, "reversed", lambda w: np.all(np.diff(w.md) > 0))),
    "repeated_depth": (BASE.replace("1000.1 0.2 11", "1000.0 0.2 11"), (ERR, DepthError, "data row 2")),
    "depth_out_of_order": (BASE.replace("1000.2 0.21", "999.0 0.21"), (ERR, DepthError, "data row 3")),
    "missing_depth": (BASE.replace("1000.2 0.21", "-999.25 0.21"), (ERR, DepthError, "data row 3")),
    "las_1_2": (BASE.replace("VERS. 2.0", "VERS. 1.2"), (OK, None, lambda w: w.n_samples == 4)),
    "las_3_0": (BASE.replace("VERS. 2.0", "VERS. 3.0"), (ERR, InputFileError, "line 2")),
    "binary": (BASE.replace("0.21", "\x00"), (ERR, InputFileError, "binary")),
    "not_las": ("hello\n", (ERR, InputFileError, "cannot read as LAS")),
    "empty_file": ("", (ERR, InputFileError, "cannot read as LAS")),
    "depth_unit_unknown": (BASE.replace("DEPT.M", "DEPT.S"), (ERR, InputFileError, "depth unit")),
    "depth_unit_missing": (BASE.replace("DEPT.M", "DEPT.").replace("STRT.M", "STRT."), (ERR, InputFileError, "no unit")),
    "numeric_well_name": (BASE.replace("W-1", "007"), (OK, None, lambda w: w.name == "007")),
}


@pytest.mark.parametrize("name", sorted(CASES))
def test_messy_las(tmp_path, name):
    text, expected = CASES[name]
    path = tmp_path / f"{name}.las"
    path.write_bytes(text.encode("utf-8"))
    if expected[0] == ERR:
        with pytest.raises(expected[1]) as info:
            read_las(path)
        msg = str(info.value)
        # README (Bad input, LAS files): one line naming the file and the cause
        assert path.name in msg and expected[2] in msg and "\n" not in msg, msg
        return
    well = read_las(path)
    if expected[1] is not None:
        # README (Bad input, LAS files): read, with the note the table names
        assert any(expected[1] in m for m in well.warnings), well.warnings
    assert expected[2](well)


def test_latin1_text_is_read_and_written_back_as_utf8(tmp_path):
    path = tmp_path / "latin.las"
    path.write_bytes(BASE.replace("well name", "Pozo Ñandú").encode("latin-1"))
    well = read_las(path)
    # README (Bad input, LAS files): Latin-1 text read; outputs are UTF-8
    assert well.well_header["WELL"].description == "Pozo Ñandú"
    write_las(tmp_path / "out.las", well)
    again = read_las(tmp_path / "out.las")
    assert again.well_header["WELL"].description == "Pozo Ñandú"
    (tmp_path / "out.las").read_bytes().decode("utf-8")


def test_leading_zero_identifier_kept_as_written(tmp_path):
    path = tmp_path / "uwi.las"
    path.write_text(BASE.replace("~Curve", "UWI. 0012345 : unique well id\n~Curve"))
    well = read_las(path)
    # README (Bad input, LAS files): identifiers that look like numbers are kept as written
    assert str(well.well_header["UWI"].value) == "0012345"
    write_las(tmp_path / "out.las", well)
    assert " 0012345 " in (tmp_path / "out.las").read_text()


def test_curve_named_dlm_is_refused_naming_the_line(tmp_path):
    # lasio takes any item named DLM for the LAS 3.0 delimiter and fails on it; we say so
    from satheight.errors import InputFileError
    from satheight.io.las import read_las

    p = tmp_path / "dlm.las"
    p.write_text("~Version\nVERS.  2.0 :\nWRAP.  NO :\n~Well\nSTRT.M 0 :\nSTOP.M 1 :\nSTEP.M 1 :\n"
                 "NULL.  -999.25 :\nWELL.  W :\n~Curve\nDEPT.M : depth\nDLM.V/V : \n~A\n0 1\n1 2\n")
    with pytest.raises(InputFileError) as e:
        read_las(p)
    # README (Bad input): errors name the file and line (line 12 holds DLM in the text above)
    assert "dlm.las, line 12" in str(e.value) and "DLM" in str(e.value)
