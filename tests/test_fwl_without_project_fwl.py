"""A zone may leave out its fwl: the fwl and pressures commands look for it; run refuses it
with one clear error naming the key."""

from __future__ import annotations

import json
import re
import shutil
from pathlib import Path

import pytest

from satheight.cli import main
from satheight.errors import ProjectFileError
from satheight.project import load_project
from tiny_field import make_field

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"


def _demo_without_fwl(tmp_path) -> Path:
    folder = tmp_path / "demo"
    shutil.copytree(DEMO, folder)
    p = folder / "demo_project.toml"
    text = p.read_text(encoding="utf-8")
    text, n = re.subn(r'(?m)^fwl = "2290 m".*\n', "", text)
    assert n == 1                                    # the Lower Sand's fwl line is gone
    p.write_text(text, encoding="utf-8")
    return p


def test_fwl_command_runs_without_a_project_fwl(tmp_path, capsys):
    p = _demo_without_fwl(tmp_path)
    out = tmp_path / "o"
    assert main(["fwl", str(p), "--zone", "Lower Sand", "--resamples", "40", "--no-plots",
                 "--out", str(out)]) == 0
    doc = json.loads((out / "fwl_Lower_Sand.json").read_text(encoding="utf-8"))
    assert doc["project_fwl"] is None and doc["misfit_at_project_fwl"] is None
    # known truth: the demo logs were made with FWL 2290 m TVDSS (demo_wells/README.md)
    assert doc["interval"][0] <= 2290.0 <= doc["interval"][1]
    assert "no project FWL" in capsys.readouterr().out


def test_pressures_run_without_a_project_fwl(tmp_path):
    p = _demo_without_fwl(tmp_path)
    out = tmp_path / "o"
    assert main(["pressures", str(p.parent / "demo_pressures.csv"), "--project", str(p),
                 "--no-plots", "--no-logs", "--out", str(out)]) == 0
    z = json.loads((out / "pressures_summary.json").read_text(encoding="utf-8"))["zones"]
    assert "project_fwl" not in z["Lower Sand"] and z["Upper Sand"]["project_fwl"] == 2105.0
    # known truth: the demo points were made from FWL 2290 m (demo_wells/README.md)
    lo, hi = z["Lower Sand"]["fwl"]["interval"]
    assert lo <= 2290.0 <= hi


def test_run_refuses_a_zone_without_fwl_naming_the_key(tmp_path, capsys):
    p = make_field(tmp_path, wells=(("w0.las", "W0"),))
    p.write_text(re.sub(r'(?m)^fwl = .*\n', "", p.read_text(encoding="utf-8")), encoding="utf-8")
    assert main(["run", str(p), "--no-plots", "--out", str(tmp_path / "o")]) == 2
    err = capsys.readouterr().err
    assert "zones[S].fwl" in err and "satheight fwl" in err and "internal" not in err
    assert not (tmp_path / "o" / "W0.las").exists()


def test_gas_oil_level_without_fwl_is_refused(tmp_path):
    p = make_field(tmp_path, wells=(("w0.las", "W0"),))
    text = re.sub(r'(?m)^fwl = .*\n', 'gas_oil_level = "990 m"\ngas_density = "0.2 g/cm3"\n',
                  p.read_text(encoding="utf-8"))
    p.write_text(text, encoding="utf-8")
    with pytest.raises(ProjectFileError) as e:
        load_project(p)
    assert "zones[S].gas_oil_level" in str(e.value) and "fwl" in str(e.value)
