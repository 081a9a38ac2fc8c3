"""The command line end to end on generated and mutated LAS files: never a traceback, never
exit code 1, one-line errors naming the file; when a run succeeds, every input curve comes
back from the output LAS unchanged (round trip through our writer, re-read with lasio).

Independent reader for the round trip: lasio (general-purpose LAS library).
"""

import contextlib
import io
import json
import re
from pathlib import Path

import lasio
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fuzzkit import LAS_MUTATIONS, LasSpec, fuzz_examples, render_las
from satheight.cli import main
from satheight.io.las import read_las

PROJECT = """[project]
units = "metric"
[log_sw]
rw = "0.05 ohm.m"
[[wells]]
las = "w.las"
[[zones]]
name = "Sand"
top = "900 m"
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
j_min = 0.05
j_max = 5
"""


@st.composite
def run_las(draw):
    """A LAS file with porosity, permeability and resistivity, good and bad values mixed."""
    n = draw(st.integers(1, 60))
    start = draw(st.integers(9000, 11000)) / 10
    depth = np.round(start + 0.1 * np.arange(n), 1)
    bad_floats = st.sampled_from([float("nan"), -0.1, 0.0, 1.5, 35.0, -5.0, 1e-12, 1e12])

    def column(lo, hi, k):
        vals = draw(st.lists(st.one_of(st.floats(lo, hi), bad_floats), min_size=n, max_size=n))
        v = np.round(np.asarray(vals, dtype=float), k)
        v[np.isin(v, (-999.25, -999.0, -9999.0, -99999.0))] = np.nan
        v[v == 0] = 0.0
        return v

    phi_unit = draw(st.sampled_from(["V/V", "%", "", "PU"]))
    curves = [("PHIE", phi_unit, "porosity", column(0.0, 0.4, 4), 4),
              ("PERM", draw(st.sampled_from(["MD", "", "D"])), "permeability",
               column(0.001, 5000, 3), 3),
              ("RT", "OHMM", "deep resistivity", column(0.1, 2000, 3), 3)]
    if draw(st.booleans()):
        curves.append(("GR", "GAPI", "gamma ray", column(0, 150, 2), 2))
    spec = LasSpec(version=draw(st.sampled_from(["1.2", "2.0"])), well="FZ-1", depth_unit="M",
                   null=-999.25, depth=depth, depth_decimals=1, curves=curves,
                   wrap=draw(st.booleans()),
                   extra_well=[("EKB", "M", "25.0", "kelly bushing elevation")])
    return render_las(spec)


@pytest.fixture(scope="module")
def project_dir(tmp_path_factory):
    d = tmp_path_factory.mktemp("clifuzz")
    (d / "p.toml").write_text(PROJECT)
    return d


def _run(args):
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(args)
    return code, out.getvalue(), err.getvalue()


@settings(max_examples=fuzz_examples(120))
@given(text=run_las(), mutate=st.booleans(), data=st.data())
def test_cli_never_crashes_and_round_trips(project_dir, text, mutate, data):
    content = text
    if mutate:
        name = data.draw(st.sampled_from(sorted(LAS_MUTATIONS)), label="mutation")
        content = LAS_MUTATIONS[name](text, data)
    las = project_dir / "w.las"
    las.write_bytes(content.encode("utf-8") if isinstance(content, str) else content)
    out_dir = project_dir / "out"
    code, out, err = _run(["run", str(project_dir / "p.toml"), "--out", str(out_dir),
                           "--no-plots", "--overwrite"])
    # README (Bad input): never a traceback; a LAS error fails that well only (exit code 3)
    assert "Traceback" not in err and "Traceback" not in out
    assert code in (0, 3), (code, err)           # the project file is fine: only the well may fail
    # inspect: listing or a one-line error, never a traceback
    icode, iout, ierr = _run(["inspect", str(las), "--json"])
    assert icode in (0, 2) and "Traceback" not in ierr and ierr.count("\n") <= 1, ierr
    if icode == 0:
        json.loads(iout)
    else:
        assert "w.las" in ierr
    summary = json.loads((out_dir / "run_summary.json").read_text())
    (well,) = summary["wells"]
    if code == 3:
        assert not well["ok"] and "w.las" in well["error"], well
        assert "internal error" not in well["error"], well["error"]
        return
    assert well["ok"]
    # round trip: every input curve back unchanged (values, units, descriptions, order)
    src = read_las(las)
    las_out = next(f for f in well["files"] if f.endswith(".las"))   # named after the well
    written = lasio.read(out_dir / las_out, encoding="utf-8")        # outputs are UTF-8
    for c in src.curves.values():
        got = written.curves[c.mnemonic]
        # README (Outputs): text from inputs is written on one line, each run of control
        # characters (C0, DEL, C1, line and paragraph separators) as one blank
        descr = re.sub("[\x00-\x1f\x7f-\x9f\u2028\u2029]+", " ", c.description).strip()
        assert got.unit == c.unit and got.descr == descr, c.mnemonic
        values = np.asarray(got.data, dtype=float)
        if not mutate:      # generated values have at most 4 decimals: exact
            np.testing.assert_array_equal(values, c.data, err_msg=c.mnemonic)
        else:               # the writer keeps at most 10 decimals (io/las.py MAX_DECIMALS)
            np.testing.assert_array_equal(np.isnan(values), np.isnan(c.data))
            np.testing.assert_allclose(values, c.data, rtol=1e-15, atol=0.51e-10,
                                       err_msg=c.mnemonic)


def test_cli_bad_las_one_line_error_and_exit_code(project_dir):
    """A LAS file that cannot be read: the well fails (exit 3) with one line naming the file."""
    (project_dir / "w.las").write_text("~Version\nVERS. 2.0 :\n~Curve\nDEPT.M :\nPHIE.V/V :\n"
                                       "~A\n1 0.2\n2\n")
    out_dir = project_dir / "out_bad"
    code, out, err = _run(["run", str(project_dir / "p.toml"), "--out", str(out_dir),
                           "--no-plots"])
    # README (Bad input): a LAS error fails that well only (exit code 3), naming the file and line
    assert code == 3
    line = next(ln for ln in err.splitlines() if "FAILED" in ln)  # failures on stderr
    assert "w.las" in line and "line" in line
