"""Messy LAS files, one case per row of the README table "Bad input: what happens" (LAS part):
each loads with the documented behaviour and note, or raises the tool's own error naming the
file (and the line where one line is at fault). Behavioural checks only: no values of our own.
"""

import os
import threading
import time

import numpy as np
import pytest

from satheight.errors import DepthError, InputFileError
from satheight.io.las import describe_las, read_las, write_las

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
    "odd_null_text": (BASE.replace("NULL. -999.25", "NULL. none"), (OK, "only the common null codes", lambda w: w.null_value is None)),
    "no_well_name": (BASE.replace("WELL. W-1 : well name\n", ""), (OK, "the file name 'no_well_name' is used", lambda w: w.name == "no_well_name")),
    "common_null_code": (BASE.replace("0.21", "-9999"), (OK, "read as null", lambda w: np.isnan(w.curves["PHIE"].data[2]))),
    "huge_value": (BASE.replace("0.21", "1e30"), (OK, "read as null", lambda w: np.isnan(w.curves["PHIE"].data[2]))),
    "overflow": (BASE.replace("0.21", "1e400"), (OK, "read as null", lambda w: np.isnan(w.curves["PHIE"].data[2]))),
    "tiny_value": (BASE.replace("0.21", "1e-300"), (OK, None, lambda w: w.curves["PHIE"].data[2] == 1e-300)),
    "duplicate_mnemonic": (BASE.replace("PERM.MD", "PHIE.MD"), (OK, "'PHIE' appears 2 times", lambda w: list(w.curves) == ["DEPT", "PHIE:1", "PHIE:2"])),
    "empty_mnemonic": (BASE.replace("PERM.MD", ".MD"), (OK, "has no mnemonic", lambda w: "UNKNOWN" in w.curves)),
    "wrapped": (BASE.replace("WRAP. NO", "WRAP. YES").split("~A")[0] + "~A\n1000.0\n0.2 10\n1000.1\n0.2 11\n",
                (OK, None, lambda w: w.n_samples == 2 and w.curves["PERM"].data[1] == 11)),
    "wrapped_missing_value": (BASE.replace("WRAP. NO", "WRAP. YES").split("~A")[0] + "~A\n1000.0\n0.2 10\n1000.1\n0.2\n",
                              (ERR, InputFileError, "whole rows")),
    "too_few_columns": (BASE.split("~A")[0] + "~A\n1000.0 0.2\n1000.1 0.3\n", (ERR, InputFileError, "line 15: every data line has 2 values")),
    # one value too many, then one too few: lasio would re-flow the values into whole rows
    "long_row_then_short_row": (BASE.replace("1000.1 0.2 11", "1000.1 0.2 11 5").replace("1000.2 0.21 12", "1000.2 0.21"),
                                (ERR, InputFileError, "line 16")),
    # a ~Curve line missing: every column after it would shift by one
    "curve_line_missing": (BASE.replace("PHIE.V/V : porosity\n", ""), (ERR, InputFileError, "columns would shift")),
    "decimal_comma": (BASE.replace("1000.2 0.21 12", "1000.2 0.21 1,500"), (ERR, InputFileError, "line 17: a number is written with a comma ('1,500')")),
    # lasio splits 12-5 into two values, which would then re-flow into the next row
    "run_on_numbers": (BASE.replace("1000.2 0.21 12", "1000.2 0.21 12-5"), (ERR, InputFileError, "line 17: two numbers run together")),
    "wrapped_line_crosses_rows": (BASE.replace("WRAP. NO", "WRAP. YES").split("~A")[0] + "~A\n1000.0\n0.2 10 1000.1\n0.2 11\n",
                                  (ERR, InputFileError, "line 16")),
    "wrapped_row_without_depth_alone": (BASE.replace("WRAP. NO", "WRAP. YES").split("~A")[0] + "~A\n1000.0 0.2\n10\n",
                                        (ERR, InputFileError, "line 15")),
    "depth_beyond_plausible": (BASE.replace("1000.3 0.22", "1e308 0.22"), (ERR, DepthError, "data row 4")),
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
    # LAS 3.0 with ~Curve/~A titles (they stand for the log set) and blank-delimited data
    "las_3_0": (BASE.replace("VERS. 2.0", "VERS. 3.0"), (OK, "LAS 3.0: read the data set LOG", lambda w: w.curves["PERM"].data[3] == 13)),
    "las_3_0_wrapped": (BASE.replace("VERS. 2.0", "VERS. 3.0").replace("WRAP. NO", "WRAP. YES"), (ERR, InputFileError, "WRAP YES")),
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


def test_long_header_line_is_refused_naming_the_line(tmp_path):
    """A 5 MB header line: lasio's header parser would take minutes; refused at once."""
    p = tmp_path / "long.las"
    p.write_text(BASE.replace("WELL. W-1", "WELL. W-" + "x" * 5_000_000))
    with pytest.raises(InputFileError) as e:
        read_las(p)
    assert "long.las, line 9" in str(e.value) and "characters long" in str(e.value)


def test_pathological_data_row_fails_before_lasio_reads_the_data(tmp_path, monkeypatch):
    """Thousands of values on one line: the row check refuses it before lasio's data reader
    (which would re-flow them, slowly) is ever called."""
    from satheight.io import las_header

    def never(*args, **kwargs):
        raise AssertionError("lasio's data reader was called")

    monkeypatch.setattr(las_header, "parse_with_lasio", never)
    from satheight.io import las as las_mod
    monkeypatch.setattr(las_mod, "parse_with_lasio", never)
    p = tmp_path / "wide.las"
    p.write_text(BASE.replace("1000.1 0.2 11", "1000.1 0.2 11" + " 1" * 20000))
    with pytest.raises(InputFileError) as e:
        read_las(p)
    assert "wide.las, line 16" in str(e.value) and "20003 values" in str(e.value)


@pytest.mark.skipif(not os.path.exists("/dev/zero"), reason="no /dev/zero")
def test_device_given_as_las_path_is_refused_before_reading():
    with pytest.raises(InputFileError) as e:
        read_las("/dev/zero")
    assert "/dev/zero" in str(e.value) and "device" in str(e.value)


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="no named pipes here")
def test_fifo_given_as_las_path_is_refused_without_blocking(tmp_path):
    """read_las and describe_las (inspect) refuse a named pipe; opening it would block."""
    fifo = tmp_path / "pipe.las"
    os.mkfifo(fifo)
    # if a regression opened the pipe, this writer unblocks it (and the checks below fail)
    def unblock():
        time.sleep(3)
        try:
            fd = os.open(fifo, os.O_WRONLY | os.O_NONBLOCK)
            os.close(fd)
        except OSError:
            pass
    threading.Thread(target=unblock, daemon=True).start()
    for reader in (read_las, describe_las):
        with pytest.raises(InputFileError) as e:
            reader(fifo)
        assert "pipe.las" in str(e.value) and "named pipe" in str(e.value)


def test_symlink_loop_is_a_clean_error(tmp_path):
    a, b = tmp_path / "a.las", tmp_path / "b.las"
    a.symlink_to(b)
    b.symlink_to(a)
    with pytest.raises(InputFileError) as e:
        read_las(a)
    assert "a.las" in str(e.value) and "link loop" in str(e.value)


# ---------------------------------------------------------------------------
# LAS 3.0: the depth-indexed data set, comma, blank or tab delimited
# ---------------------------------------------------------------------------

LAS3 = """~Version
VERS.   3.0 : CWLS LOG ASCII STANDARD - VERSION 3.0
WRAP.   NO  : one line per depth step
DLM .   COMMA : delimiting character
~Well
STRT.M  1500.0 : first depth
STOP.M  1501.0 : last depth
STEP.M  0.5 : step
NULL.   -999.25 : null value
WELL.   TEST 3-0 : well
~Parameter
EKB .M  25.0 : kelly bushing {F}
~Log_Definition
DEPT .M    : depth {F}
PHIE .V/V  : effective porosity {F}
KLOGH.mD   : horizontal permeability {F}
LITH .     : lithology {S}
~Log_Data | Log_Definition
1500.0, 0.20, 10.5, "sand stone"
1500.5, -999.25, 11.0, shale
1501.0, 0.22, 12.0, sand
~Core_Definition
CORET.M : core top {F}
CPOR .% : core porosity {F}
~Core_Data | Core_Definition
1500.2, 21.0
"""


@pytest.mark.parametrize("dlm,sep", [("COMMA", ", "), ("SPACE", " "), ("TAB", "\t")])
def test_las3_log_data_read_with_roles_nulls_and_a_note(tmp_path, dlm, sep):
    """Values as written in the file above; -999.25 is the file's NULL."""
    from satheight.io.las import describe_las
    from satheight.roles import detect_roles

    text = LAS3.replace("COMMA", dlm).replace(", ", sep).replace('"sand stone"', '"sandstone"'
                                                                  if dlm != "COMMA" else '"sand stone"')
    p = tmp_path / "v3.las"
    p.write_text(text)
    well = read_las(p)
    assert well.version == "3.0" and well.name == "TEST 3-0"
    np.testing.assert_array_equal(well.md, [1500.0, 1500.5, 1501.0])
    np.testing.assert_array_equal(well.curves["PHIE"].data, [0.20, np.nan, 0.22])
    np.testing.assert_array_equal(well.curves["KLOGH"].data, [10.5, 11.0, 12.0])
    assert detect_roles(well)["permeability"] == "KLOGH"          # same role detection as 2.0
    note = next(w for w in well.warnings if "LAS 3.0" in w)
    assert "~Core_Definition" in note and "~Core_Data" in note and dlm in note
    assert any("'LITH'" in w and "not numbers" in w for w in well.warnings)
    assert describe_las(p)["datum"]["elevation_m"] == 25.0         # EKB in ~Parameter


def test_las3_short_data_line_names_the_line(tmp_path):
    p = tmp_path / "v3.las"
    p.write_text(LAS3.replace("1500.5, -999.25, 11.0, shale", "1500.5, -999.25, 11.0"))
    with pytest.raises(InputFileError) as e:
        read_las(p)
    assert "v3.las, line 20" in str(e.value) and "~Log_Definition" in str(e.value)


def test_las3_without_depth_indexed_set_is_refused(tmp_path):
    p = tmp_path / "v3.las"
    p.write_text(LAS3.replace("DEPT .M    : depth", "TIME .S    : time").replace("CORET.M", "CORET.S"))
    with pytest.raises(InputFileError, match="no depth-indexed data set"):
        read_las(p)


def test_las3_core_set_used_when_no_log_set(tmp_path):
    """Only a core set (depth-indexed): it is read, with CPOR in percent as written."""
    start = LAS3.index("~Log_Definition")
    end = LAS3.index("~Core_Definition")
    p = tmp_path / "v3.las"
    p.write_text(LAS3[:start] + LAS3[end:])
    well = read_las(p)
    assert list(well.curves) == ["CORET", "CPOR"] and well.curves["CPOR"].data[0] == 21.0


def test_las3_second_log_run_is_named_as_not_read(tmp_path):
    runs = LAS3.replace("~Log_Definition", "~Log_Definition[1]").replace(
        "~Log_Data | Log_Definition", "~Log_Data[1] | Log_Definition[1]")
    start, end = runs.index("~Log_Definition[1]"), runs.index("~Core_Definition")
    second = runs[start:end].replace("[1]", "[2]").replace("1500.", "1600.").replace("1501.", "1601.")
    p = tmp_path / "v3.las"
    p.write_text(runs[:end] + second + runs[end:])
    well = read_las(p)
    np.testing.assert_array_equal(well.md, [1500.0, 1500.5, 1501.0])      # the first run
    note = next(w for w in well.warnings if "LAS 3.0" in w)
    assert "~Log_Definition[2]" in note and "~Log_Data[2]" in note


def test_las3_quoted_text_with_the_delimiter_is_one_value(tmp_path):
    p = tmp_path / "v3.las"
    p.write_text(LAS3.replace('"sand stone"', '"sand, stone"'))
    well = read_las(p)
    np.testing.assert_array_equal(well.curves["KLOGH"].data, [10.5, 11.0, 12.0])
    assert np.isnan(well.curves["LITH"].data).all()


def test_las3_quote_left_open_is_a_clean_error(tmp_path):
    p = tmp_path / "v3.las"
    p.write_text(LAS3.replace('"sand stone"', '"sand stone'))
    with pytest.raises(InputFileError) as e:
        read_las(p)
    assert "v3.las" in str(e.value) and "\n" not in str(e.value)
