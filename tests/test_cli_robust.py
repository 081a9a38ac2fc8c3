"""Command-line reliability: one-line errors with a hint, --verbose for details, distinct exit
codes, and a program error on one well does not cost the other wells their results."""

import json

import pytest

from satheight.workflows import run as pipeline
from satheight.cli import EXIT_BAD_INPUT, EXIT_WELLS_FAILED, main
from satheight.errors import InputFileError

LAS = """~Version
VERS. 2.0 :
WRAP. NO :
~Well
NULL. -999.25 :
WELL. {name} :
EKB.M 0 :
~Curve
DEPT.M : depth
PHIE.V/V : porosity
PERM.MD : permeability
~A
1000.0 0.2 10
1000.1 0.21 12
"""

PROJECT = """[project]
units = "metric"
[[wells]]
las = "a.las"
[[wells]]
las = "b.las"
[[zones]]
name = "Z"
top = 990
base = 1100
fwl = 1050
hydrocarbon = "oil"
water_density = "1.05 g/cm3"
hydrocarbon_density = "0.8 g/cm3"
sigma_cos_theta = "26 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.2
b = 1.5
"""


@pytest.fixture
def project(tmp_path):
    (tmp_path / "a.las").write_text(LAS.format(name="A-1"))
    (tmp_path / "b.las").write_text(LAS.format(name="B-1"))
    (tmp_path / "p.toml").write_text(PROJECT)
    return tmp_path / "p.toml"


def test_program_error_in_one_well_fails_that_well_only(project, tmp_path, monkeypatch, capsys):
    real = pipeline.compute_well

    def broken(proj, spec, *rest):
        if spec.las.name == "a.las":
            raise TypeError("simulated program error")
        return real(proj, spec, *rest)

    monkeypatch.setattr(pipeline, "compute_well", broken)
    code = main(["run", str(project), "--out", str(tmp_path / "o"), "--no-plots"])
    # README (Bad input, Outputs): a well that fails, even on an internal error, does not stop
    # the others (exit code 3)
    assert code == EXIT_WELLS_FAILED
    summary = json.loads((tmp_path / "o" / "run_summary.json").read_text())
    ok = {w["name"]: w["ok"] for w in summary["wells"]}
    assert ok == {"a": False, "B-1": True}
    err = next(w["error"] for w in summary["wells"] if not w["ok"])
    assert "a.las" in err and "internal error" in err and "TypeError" in err
    assert (tmp_path / "o" / "B-1.las").is_file()


def test_error_text_with_line_breaks_is_printed_on_one_line(project, tmp_path, monkeypatch,
                                                             capsys):
    def bad(path):
        raise InputFileError("first part\nsecond part", where=str(path), hint="do this")

    monkeypatch.setattr("satheight.workflows.outputs.load_project", bad)
    code = main(["run", str(project), "--out", str(tmp_path / "o")])
    err = capsys.readouterr().err
    # README (Bad input): a project-file error stops the run, exit code 2, one line
    assert code == EXIT_BAD_INPUT
    assert err.count("\n") == 1 and "first part second part" in err and "(do this)" in err
    assert "Traceback" not in err


@pytest.mark.parametrize("where", ["before", "after"])
def test_verbose_prints_details_before_or_after_the_command(tmp_path, capsys, where):
    missing = str(tmp_path / "nope.toml")
    args = ["--verbose", "run", missing] if where == "before" else ["run", missing, "--verbose"]
    code = main(args)
    err = capsys.readouterr().err
    # README (Usage, --verbose): the traceback only with --verbose; one line otherwise
    assert code == EXIT_BAD_INPUT
    assert "Traceback" in err and "nope.toml" in err.splitlines()[-1]
    code = main(["run", missing])
    err = capsys.readouterr().err
    assert "Traceback" not in err and err.count("\n") == 1
