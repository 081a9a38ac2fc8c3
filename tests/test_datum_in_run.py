"""The run takes the datum elevation the way the LAS header reader does: ~Well and ~Parameter
searched, disagreement refused, a ground-level datum noted, the item used recorded.

Closed forms worked by hand: a vertical well has TVD = MD, so TVDSS = MD - elevation
(common practice: TVDSS = TVD - elevation of the depth reference above sea level).
"""

from __future__ import annotations

import json

import numpy as np
import pytest

from satheight.cli import main
from satheight.errors import SatHeightError
from satheight.project import load_project
from satheight.workflows.contacts import run_pressures
from satheight.workflows.well import compute_well
from tiny_field import make_field


def _field(tmp_path, well_items: str = "", parameter_items: str = "", datum_line: str = ""):
    """The tiny field's first well with its EKB replaced by ``well_items`` / ``parameter_items``."""
    p = make_field(tmp_path, wells=(("w0.las", "W0"),))
    las = tmp_path / "w0.las"
    text = las.read_text(encoding="utf-8").replace("EKB.M 25 :\n", well_items)
    if parameter_items:
        text = text.replace("~Curve\n", "~Parameter\n" + parameter_items + "~Curve\n")
    las.write_text(text, encoding="utf-8")
    if datum_line:
        p.write_text(p.read_text(encoding="utf-8").replace('las = "w0.las"\n',
                                                           f'las = "w0.las"\n{datum_line}\n'),
                     encoding="utf-8")
    project = load_project(p)
    return project, project.wells[0]


def test_run_takes_the_datum_from_the_parameter_section(tmp_path):
    project, spec = _field(tmp_path, parameter_items="EKB.M 31.5 : kelly bushing\n")
    result, notes = compute_well(project, spec)
    # worked by hand: vertical well, TVDSS = MD - 31.5 m
    assert np.allclose(result.tvdss, result.well.md - 31.5, atol=1e-9)
    assert "EKB" in result.datum_source and "~Parameter" in result.datum_source


def test_run_refuses_datum_items_that_disagree(tmp_path):
    project, spec = _field(tmp_path, well_items="EKB.M 25 :\n", parameter_items="KB.M 30 :\n")
    with pytest.raises(SatHeightError) as e:
        compute_well(project, spec)
    assert "disagree" in str(e.value)                  # 25 m and 30 m for the same point


def test_run_notes_a_ground_level_datum(tmp_path):
    project, spec = _field(tmp_path, well_items="EGL.M 12 :\n")
    result, notes = compute_well(project, spec)
    assert np.allclose(result.tvdss, result.well.md - 12.0, atol=1e-9)   # TVDSS = MD - 12 m
    assert any("ground level" in n for n in notes)


def test_project_datum_wins_and_a_different_header_value_is_noted(tmp_path):
    project, spec = _field(tmp_path, well_items="EKB.M 25 :\n",
                           datum_line='datum_elevation = "20 m"')
    result, notes = compute_well(project, spec)
    assert np.allclose(result.tvdss, result.well.md - 20.0, atol=1e-9)   # TVDSS = MD - 20 m
    assert "project file" in result.datum_source
    assert any("EKB" in n and "project file" in n for n in notes)


def test_well_summary_json_records_which_datum_item_was_used(tmp_path):
    project, _ = _field(tmp_path, parameter_items="EDF.M 27 : drill floor\n")
    out = tmp_path / "out"
    assert main(["run", str(project.path), "--no-plots", "--quiet", "--out", str(out)]) == 0
    summary = json.loads((out / "W0_summary.json").read_text(encoding="utf-8"))
    assert summary["datum"]["elevation"] == pytest.approx(27.0)     # as written in the header
    assert summary["datum"]["source"].startswith("EDF = 27")


def test_pressures_use_the_parameter_section_datum_for_md_points(tmp_path):
    project, _ = _field(tmp_path, parameter_items="EKB.M 31.5 :\n")
    csv = tmp_path / "p.csv"
    # two water points by MD; TVDSS = MD - 31.5 m (vertical well, worked by hand)
    csv.write_text("well,md [m],pressure [kPa],fluid,zone\nW0,1010,10000,water,S\n"
                   "W0,1020,10100,water,S\n", encoding="utf-8")
    res = run_pressures(csv, tmp_path / "pout", project_path=project.path, with_logs=False,
                        plot=False)
    assert res["analysis"]["S"].points.tvdss.tolist() == pytest.approx([978.5, 988.5], abs=1e-9)


def test_implausible_header_elevation_is_told_in_the_item_unit(tmp_path):
    # EKB 30000 ft = 9144 m, above the plausible 6000 m (datum.PLAUSIBLE_ELEVATION, common
    # practice); the item as read and the range in its unit: -1000 m = -3280.84 ft and
    # 6000 m = 19685 ft (1 ft = 0.3048 m, nist2008)
    project, spec = _field(tmp_path, well_items="EKB.FT 30000 :\n")
    with pytest.raises(SatHeightError) as e:
        compute_well(project, spec)
    assert "EKB = 30000 FT (~Well) is outside the plausible -3280.84 to 19685 FT" in e.value.what
    assert " m" not in e.value.what
