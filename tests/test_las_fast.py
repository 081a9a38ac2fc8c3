"""The fast LAS path (lasio header + pandas' C parser for ~A) against the lasio path.

Every check reads the same file twice, ``read_las(p)`` and ``read_las(p,
engine="lasio")``, and requires the same well: curves, bit patterns of every value
(NaN and the sign of zero included), header items, warnings. A second check says
whether the fast path was taken (plain files) or declined (wrapped, odd text): an
equality test proves nothing if the fast path quietly stepped aside. The reference
is the lasio library (lasio.read, engine "normal"), which the whole tool relied on
before the fast path. Data are invented.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from satheight.errors import SatHeightError
from satheight.io import las as las_mod
from satheight.io import las_fast
from satheight.io.las import read_las, write_las
from satheight.well import Curve

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"

HEADER = """~Version information
 VERS.   2.0 : version
 WRAP.   {wrap}  : wrap mode
~Well information
 STRT.M  1000.0 : start
 STOP.M  1001.5 : stop
 STEP.M  0.5 : step
 NULL.   -999.25 : null value
 WELL.   FAST-1 : well name
~Curve information
 DEPT.M  : depth
 GR.GAPI : gamma ray
 PHIE.V/V : porosity
 PERM.MD : permeability
~Parameter information
 EKB.M  25.5 : kelly bushing
~Other
invented for tests
"""


def las(rows: str, wrap="NO", title="~A  DEPT GR PHIE PERM\n", header=HEADER) -> str:
    return header.format(wrap=wrap) + title + rows


def write(tmp_path, text, name="w.las", newline="\n"):
    p = tmp_path / name
    p.write_bytes(text.replace("\n", newline).encode("utf-8"))
    return p


def took_fast(path) -> bool:
    return las_mod._parse_fast(Path(path), Path(path).read_bytes()) is not None


def bits(a):
    a = np.asarray(a, dtype=np.float64)
    return a.view(np.int64) if not np.isnan(a).any() else np.where(np.isnan(a), 0, a.view(np.int64))


def assert_same_well(a, b):
    # library: lasio (the reference path reads the file through lasio): the same well
    assert list(a.curves) == list(b.curves)
    for key in a.curves:
        x, y = a.curves[key], b.curves[key]
        assert (x.mnemonic, x.unit, x.description, x.value) == (y.mnemonic, y.unit, y.description,
                                                                 y.value)
        assert x.data.dtype == y.data.dtype == np.float64
        # library: lasio reads the same file on the reference path; decimal text parses to the
        # nearest double in both readers, so the values are equal bit for bit (-0.0 included)
        np.testing.assert_array_equal(np.isnan(x.data), np.isnan(y.data), err_msg=key)
        np.testing.assert_array_equal(bits(x.data), bits(y.data), err_msg=key)   # -0.0 too
    np.testing.assert_array_equal(a.md, b.md)
    assert a.well_header == b.well_header
    assert a.parameters == b.parameters
    assert (a.name, a.version, a.null_value, a.depth_unit, a.index_mnemonic, a.other) == \
           (b.name, b.version, b.null_value, b.depth_unit, b.index_mnemonic, b.other)
    assert a.warnings == b.warnings


def check(path, fast_expected: bool):
    """Both engines give the same well (or the same error); the fast path ran as expected."""
    # library: lasio reads the same file (engine="lasio"): the same well or the same error
    assert took_fast(path) is fast_expected
    try:
        ref = read_las(path, engine="lasio")
    except SatHeightError as exc:
        with pytest.raises(type(exc)) as err:
            read_las(path)
        assert str(err.value) == str(exc)
        return None
    well = read_las(path)
    assert_same_well(well, ref)
    return well


# ---------------------------------------------------------------------------
# files the fast path must take
# ---------------------------------------------------------------------------

@pytest.mark.parametrize("name", sorted(p.name for p in DEMO.glob("*.las")))
def test_demo_files(name):
    well = check(DEMO / name, True)
    # the demo files' sizes (demo_wells/make_demo.py writes thousands of rows per well)
    assert well.n_samples > 1000


PLAIN = ("1000.0 45.5 0.21 150.0\n"
         "1000.5 -999.25 0.185 80.0\n"
         "1001.0 62.0 -999.25 3.5\n"
         "1001.5 70.125 0.08 -999.25\n")


@pytest.mark.parametrize("newline", ["\n", "\r\n"])
def test_plain_file_and_crlf(tmp_path, newline):
    well = check(write(tmp_path, las(PLAIN), newline=newline), True)
    # the file's values (PLAIN): one NULL in GR
    np.testing.assert_array_equal(np.isnan(well.curves["GR"].data), [False, True, False, False])


@pytest.mark.parametrize("rows", [
    "   1000.0\t45.5   0.21\t\t150.0   \n \t1000.5 50 0.2 80\n",          # blanks and tabs
    "1000.0 45.5 0.21 150.0\n1000.5 50 0.2 80\n\n\n   \n",                  # trailing blank lines
    "1000.0 45.5 0.21 150.0\n\n1000.5 50 0.2 80\n",                          # blank line between
    "1000.0 45.5 0.21 150.0\n1000.5 50 0.2 80",                              # last row, no newline
    "1000.0 45.5 0.21 150.0\n1000.5 50 0.2 80\n1001.0 51 0.3 81",            # last row, 3 rows
    "# first comment\n1000.0 45.5 0.21 150.0\n#another # one\n1000.5 50 0.2 80\n#end\n",
    "1000.0 -0.0 -0 0\n1000.5 +5 .5 5.\n",                                   # signs, bare dots
    "1000.0 1.5E-03 2e2 -3.25e+1\n1000.5 1E30 -1e31 7\n",                    # exponents, huge
    "1000.0 0.30000000000000004 123456789.12345678 1e-320\n1000.5 1 2 3\n",  # 17 digits, subnormal
    "1000.0 -999 -9999 -99999\n1000.5 1 2 3\n",                              # other null codes
    "1000.0 5 6 7\n999.5 8 9 10\n999.0 11 12 13\n",                          # decreasing: reversed
])
def test_layouts_taken_by_fast_path(tmp_path, rows):
    check(write(tmp_path, las(rows)), True)


@pytest.mark.parametrize("rows", [
    "1000.0 abc 0.21 150.0\n1000.5 50 N/A 80\n1001.0 51 NULL -\n",          # text in numbers
    "1000.0 nan 0.21 inf\n1000.5 NaN -nan -inf\n",                           # nan/inf words
    "1000.0 1_0 0.21 True\n1000.5 50 0.2 False\n",                           # float() accepts 1_0
    "1000.0 x 0.21 150\n1000.5 y 0.2 80\n",                                  # a whole text column
])
def test_text_in_numbers(tmp_path, rows):
    well = check(write(tmp_path, las(rows)), True)
    # README (Bad input, LAS files): text in a number is read as missing, with a note
    assert well is not None


def test_text_warning_names_curve_and_row(tmp_path):
    well = check(write(tmp_path, las("1000.0 45 0.21 150\n1000.5 50 oops 80\n")), True)
    # README (Bad input, LAS files): the note names the curve and the data row
    assert np.isnan(well.curves["PHIE"].data[1])
    assert any("'PHIE'" in w and "'oops'" in w and "data row 2" in w for w in well.warnings)


def test_random_tables(tmp_path):
    rng = np.random.default_rng(11)
    for t in range(6):
        n = int(rng.integers(2, 400))
        depth = np.round(1500 + 0.1524 * np.arange(n), 4)
        cols = [depth]
        for d in (0, 2, 4, 7, 10):
            c = np.round(rng.normal(0, 10.0 ** rng.integers(0, 6), n), d)
            c[rng.random(n) < 0.05] = -999.25
            cols.append(c)
        lines = [" ".join(repr(float(v)) if rng.random() < 0.5 else f"{v:.{int(rng.integers(0, 12))}f}"
                          for v in row) for row in zip(*cols)]
        header = HEADER.replace(" GR.GAPI : gamma ray\n PHIE.V/V : porosity\n PERM.MD : permeability\n",
                                "".join(f" C{i}. : curve {i}\n" for i in range(5)))
        text = header.format(wrap="NO") + "~A\n" + "\n".join(lines) + "\n"
        check(write(tmp_path, text, name=f"r{t}.las"), True)


def test_written_file_reads_back_on_fast_path(tmp_path):
    src = read_las(DEMO / "VANTREL-2.las")
    out = tmp_path / "out.las"
    sw = np.linspace(0, 1, src.n_samples)
    sw[::7] = np.nan
    write_las(out, src, new_curves=[Curve("SW_NEW", "v/v", "new", sw)], decimals={"SW_NEW": 5})
    well = check(out, True)
    for key, c in src.curves.items():
        # round trip: the input curves read back as they were read (their text has fewer decimals
        # than the writer keeps)
        np.testing.assert_array_equal(well.curves[key].data, c.data)


# ---------------------------------------------------------------------------
# files the fast path must leave to lasio (same results all the same)
# ---------------------------------------------------------------------------

@pytest.mark.parametrize("rows", [
    "1000.0 45.5 0.21 150.0\n1000.5 50,5 0.2 80\n",                 # decimal comma
    "1000.0 45.5 0.21-150.0\n1000.5 50 0.2 80\n1001.0 1 2 3\n",     # run-on minus
    "1000.0 45.5 0.2.1 150.0\n1000.5 50 0.2 80\n",                   # two dots
    "1000.0 45.5 0.21 150.0\n  # indented comment\n1000.5 50 0.2 80\n",
    "1000.0 45.5 0.21 150.0 # trailing comment\n1000.5 50 0.2 80\n",
    "1000.0 45.5 0.21\n150.0 1000.5 50 0.2 80\n",                    # values across lines
    "1000.0 45.5 0.21\n1000.5 50 0.2 80\n",                          # a value missing
    "1000.0 45.5 0.21 150.0 9\n1000.5 50 0.2 80 9\n",                # one value too many
    '1000.0 "45.5" 0.21 150.0\n1000.5 50 0.2 80\n',                  # quotes
    "1000.0 45.5 0.21 150.0\n1000.5 50 0.2 80\x1a\n",               # control character
    "1000.0 45.5 0.21 150.0\r1000.5 50 0.2 80\r",                    # CR-only line ends
    "1000.0 45.5 0.21 150.0\n1000.5 50 0.2 80\n~Other\nlate section\n",
    "1000.0 45.5 0.21 150.0\n1000.5 50 0.2 8\u00e90\n",             # non-ASCII
])
def test_unusual_data_goes_to_lasio(tmp_path, rows):
    check(write(tmp_path, las(rows)), False)


def test_wrapped_file_goes_to_lasio(tmp_path):
    rows = "1000.0\n 45.5 0.21 150.0\n1000.5\n 50 0.2 80\n"
    check(write(tmp_path, las(rows, wrap="YES")), False)


def test_version_3_and_delimiter_go_to_lasio(tmp_path):
    # LAS 3.0 goes to its own reader on both engines (lasio would read its delimited data as
    # 2.0); the values equal those of the same file as LAS 2.0
    v3 = las(PLAIN).replace("VERS.   2.0", "VERS.   3.0")
    v2 = read_las(write(tmp_path, las(PLAIN), name="v2.las"))
    for engine in ("auto", "lasio"):
        w3 = read_las(write(tmp_path, v3, name="v3.las"), engine=engine)
        assert w3.version == "3.0"
        for key, c in v2.curves.items():
            np.testing.assert_array_equal(w3.curves[key].data, c.data)
    dlm = las(PLAIN).replace(" WRAP.   NO  : wrap mode\n", " WRAP.   NO  : wrap mode\n DLM . SPACE : d\n")
    check(write(tmp_path, dlm, name="dlm.las"), False)


def test_lowercase_or_missing_data_section(tmp_path):
    check(write(tmp_path, las(PLAIN, title="~a\n"), name="lower.las"), False)
    check(write(tmp_path, HEADER.format(wrap="NO"), name="none.las"), False)
    check(write(tmp_path, las(""), name="empty.las"), False)


# ---------------------------------------------------------------------------
# pieces
# ---------------------------------------------------------------------------

def test_split_data_section_finds_title_line():
    raw = b"~V\n VERS. 2.0 :\n  ~A DEPT\n1 2\n"
    start, end = las_fast.split_data_section(raw)
    # cwls1992: ~A starts the data section (the bytes written above)
    assert raw[start:end] == b"  ~A DEPT\n" and raw[end:] == b"1 2\n"
    assert las_fast.split_data_section(b"~V\n VERS. 2.0 :\n") is None


def test_scan_counts_tokens_outside_comments():
    raw = b"~A\n 1 2\t3\n#c d e\n\n4 5 6"
    scan = las_fast.scan_data_section(raw, 3)
    # closed form: 6 numbers outside the comment line (counted by hand)
    assert scan.tokens == 6 and scan.has_comments


@pytest.mark.parametrize("decimals", [0, 1, 3, 5, 10])
def test_format_fixed_equals_percent_format(decimals):
    # reference: Python's own "%.{d}f" formatting (correctly rounded, ties to even)
    rng = np.random.default_rng(decimals)
    x = np.concatenate([rng.normal(0, 1e4, 3000), np.round(rng.normal(0, 50, 500), decimals),
                        [0.0, -0.0, -1e-12, 0.5, 1.5, 2.5, -2.5, 0.125, 0.375, 1.005, 2.675,
                         1e15, -3.3e17, 1.5e25, 5e-324, np.nan, np.inf, -np.inf]])
    out = las_fast.format_fixed(x, decimals, "-999.25")
    text = [row.tobytes().decode("ascii") for row in out]
    expect = [("%.*f" % (decimals, v)) if np.isfinite(v) else "-999.25" for v in x]
    width = max(len(e) for e in expect)
    assert out.shape == (x.size, width)
    assert [t.lstrip(" ") for t in text] == expect
    assert all(len(t) == width for t in text)


def test_format_general_equals_percent_g():
    # reference: Python's own "%.10g" formatting
    rng = np.random.default_rng(3)
    x = np.concatenate([rng.normal(0, 1, 6000) * 10.0 ** rng.integers(-9, 15, 6000),
                        [0.0, -0.0, np.inf, -np.inf, 9.9999999999, 99999.999995, 1e-4, 9.99999999995e-5,
                         1e10, 9999999999.5, 0.5, 1.0, 100.0, 0.1, 0.3, 5e-324, 1.7976931348623157e308]])
    out = las_fast.format_general(x, 10)
    assert [r.tobytes().decode("ascii").strip() for r in out] == ["%.10g" % v for v in x]
    assert las_fast.format_general(np.array([np.nan, 1.0]), 10)[0].tobytes().strip() == b""


def test_csv_writer_equals_pandas(tmp_path):
    # reference: pandas DataFrame.to_csv(float_format="%.10g"), what the writer used before
    import pandas as pd

    from satheight.io.well_csv import write_csv

    src = read_las(DEMO / "VANTREL-1.las")
    rng = np.random.default_rng(4)
    n = src.n_samples
    odd = rng.normal(0, 1, n) * 10.0 ** rng.integers(-8, 12, n)
    odd[::13] = np.nan
    odd[5:9] = [np.inf, -np.inf, -0.0, 0.0]
    new = [Curve("ODD", "", "", odd), Curve("J", "", "", rng.uniform(0, 3, n))]
    out = tmp_path / "w.csv"
    write_csv(out, src, new)
    cols = {(f"{c.mnemonic} [{c.unit}]" if c.unit else c.mnemonic): c.data
            for c in list(src.curves.values()) + new}
    expect = pd.DataFrame(cols).to_csv(index=False, float_format="%.10g", lineterminator="\n")
    # library: pandas DataFrame.to_csv, the reference named above
    assert out.read_text() == expect


def test_random_layouts(tmp_path):
    # many small files mixing every layout feature; whichever path a file takes, the
    # well must equal the lasio path's (and most must take the fast path)
    rng = np.random.default_rng(21)
    odd_tokens = ["abc", "N/A", "nan", "-inf", "1_5", "NULL", "1.5-2", "1,5", "1.2.3", "--"]
    fast = 0
    for t in range(40):
        n = int(rng.integers(1, 30))
        lines = []
        for i in range(n):
            vals = [f"{1000 + 0.5 * i:.1f}"]
            for _ in range(3):
                r = rng.random()
                if r < 0.04:
                    vals.append(str(rng.choice(odd_tokens)))
                elif r < 0.1:
                    vals.append("-999.25")
                else:
                    vals.append(f"{rng.normal(0, 100):.{int(rng.integers(0, 8))}f}")
            seps = [str(rng.choice([" ", "  ", "\t", " \t "])) for _ in vals]
            lines.append(str(rng.choice(["", " ", "\t"])) + "".join(v + s for v, s in zip(vals, seps)))
            if rng.random() < 0.05:
                lines.append("# note")
            if rng.random() < 0.05:
                lines.append("")
        rows = "\n".join(lines) + str(rng.choice(["", "\n", "\n\n", "\n  \n"]))
        newline = "\r\n" if rng.random() < 0.3 else "\n"
        p = write(tmp_path, las(rows), name=f"l{t}.las", newline=newline)
        expect_fast = took_fast(p)
        fast += expect_fast
        check(p, expect_fast)
    assert fast >= 20


# ---------------------------------------------------------------------------
# a data section read in parts (threads), as large files are
# ---------------------------------------------------------------------------

def test_cuts_fall_on_line_starts():
    raw = b"~A\n" + b"".join(b"%d 1 2\n" % i for i in range(50))
    for parts in (1, 2, 3, 7):
        cuts = las_fast._cuts(raw, 3, parts)
        # closed form: cuts at line starts, from the section start to the end, one per part
        assert cuts[0] == 3 and cuts[-1] == len(raw) and cuts == sorted(set(cuts))
        assert all(raw[c - 1:c] == b"\n" for c in cuts[1:-1])
        assert len(cuts) - 1 == parts


@pytest.mark.parametrize("parts", [2, 3, 4])
@pytest.mark.parametrize("rows,fast", [
    ("".join(f"{1000 + 0.5 * i} {i % 7}.25 0.{i % 9}1 {i * 3}\n" for i in range(40)), True),
    ("".join(f"{1000 + 0.5 * i} 45 -999.25 1\r\n" for i in range(40)), True),        # CRLF
    ("# head\n" + "".join(f"{1000 + 0.5 * i} 1 2 3\n#c {i}\n\n" for i in range(30)), True),
    ("".join(f"{1000 + 0.5 * i} 1 2 3\n" for i in range(40)) + "1020.0 5 6 7", True),  # no last LF
    ("".join(f"{1000 + 0.5 * i} 1 2 3\n" for i in range(10)) + "\n" * 300, True),   # blank tail
    ("1000 1 2 3\n" + "#" * 600 + "\n" + "1000.5 4 5 6\n", True),          # long comment
    ("".join(f"{1000 + 0.5 * i} 1 {'x' if i == 33 else 2} 3\n" for i in range(40)), True),  # text
    ("".join(f"{1000 + 0.5 * i} 1 2 3{' 9' if i == 35 else ''}\n" for i in range(40)), False),
    ("".join(f"{1000 + 0.5 * i} 1 2{'' if i == 36 else ' 3'}\n" for i in range(40)), False),
    ("".join(f"{1000 + 0.5 * i} 1 2 3 9\n" for i in range(20))                    # long rows,
     + "".join(f"{1010 + 0.5 * i} 1 2\n" for i in range(20)), False),             # then short
    ("".join(f"{1000 + 0.5 * i} 1 2 3\n" for i in range(38)) + "1019 1 2 \u00e9\n", False),
])
def test_parts_give_the_same_well(tmp_path, monkeypatch, rows, fast, parts):
    # reference: the lasio path (read_las engine="lasio"), as everywhere in this file
    import threading

    calls = []
    real = las_fast._scan_part

    def spy(*args, **kwargs):
        calls.append(threading.current_thread() is threading.main_thread())
        return real(*args, **kwargs)

    monkeypatch.setattr(las_fast, "_n_parts", lambda size: parts)
    monkeypatch.setattr(las_fast, "_scan_part", spy)
    monkeypatch.setattr(las_fast, "ROWS_PER_STEP", 3)      # several parser steps per part
    monkeypatch.setattr(las_fast, "_threads", lambda: 2)   # threads whatever the machine load
    path = write(tmp_path, las(rows))
    check(path, fast)
    # library: lasio (check above) gives the same well; the spy sees the parts in threads
    assert len(calls) >= parts                      # the section was really cut
    assert not all(calls)                           # ... and scanned in threads


@pytest.mark.parametrize("chunk", [1, 2, 3, 7, 64])
def test_token_count_across_chunk_edges(monkeypatch, chunk):
    # reference: bytes.split() (Python's own whitespace split) on the same text
    monkeypatch.setattr(las_fast, "_CHUNK", chunk)
    raw = b"~A\n 1 22\t333\r\n4  55\r\n\r\n 6 7 8\r\n9"
    assert las_fast._count_tokens(raw, 3, len(raw)) == len(raw[3:].split())
    assert las_fast._count_tokens(b"~A\n1 2\r3\n", 3, 9) is None          # lone CR
    assert las_fast._count_tokens(b"~A\n1 2\r", 3, 7) is None              # CR at the end
    assert las_fast._count_tokens(b"~A\n1 \x7f\n", 3, 7) is None           # DEL byte


def test_threads_follow_the_load(monkeypatch):
    monkeypatch.setattr(las_fast.os, "sched_getaffinity", lambda pid: {0, 1}, raising=False)
    monkeypatch.setattr(las_fast.os, "getloadavg", lambda: (0.9, 0.0, 0.0))
    # closed form: one thread per free core, from the load average given
    assert las_fast._threads() == 2                 # one core free besides this process
    monkeypatch.setattr(las_fast.os, "getloadavg", lambda: (2.8, 0.0, 0.0))
    assert las_fast._threads() == 1                 # both cores busy: no second thread
    assert las_fast._n_parts(1 << 30) == 1
