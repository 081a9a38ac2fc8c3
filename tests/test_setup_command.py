"""``satheight start FOLDER``: a commented project file from a folder of LAS files.

Facts about the demo files are read here with lasio (an outside reader), not with satheight.
"""

from __future__ import annotations

import json
import re
import shutil
import tomllib
from pathlib import Path

import lasio
import pytest

from satheight.cli import main
from satheight.project.reader import load_project
from satheight.workflows.setup import toml_string

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"

#: What only the user knows, per zone (the demo project file's values).
ZONE_VALUES = {
    "Upper Sand": {"top": '"2030 m"', "base": '"2120 m"', "fwl": '"2105 m"', "hydrocarbon": '"oil"',
                   "water_density": '"1.08 g/cm3"', "hydrocarbon_density": '"0.78 g/cm3"',
                   "sigma_cos_theta": '"26 mN/m"', "swirr": "0.1", "a": "0.3", "b": "1.2"},
    "Lower Sand": {"top": '"2200 m"', "base": '"2310 m"', "fwl": '"2290 m"', "hydrocarbon": '"gas"',
                   "water_density": '"1.08 g/cm3"', "hydrocarbon_density": '"0.22 g/cm3"',
                   "sigma_cos_theta": '"50 mN/m"', "swirr": "0.1", "a": "0.3", "b": "1.2"},
}


@pytest.fixture()
def folder(tmp_path):
    """A copy of the demo folder without its project file (inputs are never written)."""
    f = tmp_path / "field data"
    shutil.copytree(DEMO, f, ignore=shutil.ignore_patterns("*.toml", "*.py", "*.json", "*.md"))
    return f


def _start(capsys, *args) -> dict:
    assert main(["start", *map(str, args), "--json"]) == 0
    return json.loads(capsys.readouterr().out)


def _fill(text: str) -> str:
    """Replace every FILL IN placeholder as a user would (demo values; VANTREL-4's KB 31.2 m)."""
    text = text.replace('datum_elevation = "?"', 'datum_elevation = "31.2 m"')
    head, *zones = text.split("[[zones]]")
    out = [head]
    for z in zones:
        name = re.search(r'^name = "(.*)"$', z, flags=re.M).group(1)
        for key, value in ZONE_VALUES[name].items():
            z = re.sub(rf'^{key} = "\?"', f"{key} = {value}", z, flags=re.M)
        out.append(z)
    return "[[zones]]".join(out)


def test_start_finds_wells_roles_depth_units_datum_and_files(folder, capsys):
    rec = _start(capsys, folder)
    assert rec["schema_version"] == 1 and rec["command"] == "start"
    wells = {w["name"]: w for w in rec["wells"]}
    assert sorted(wells) == [f"VANTREL-{i}" for i in range(1, 6)]
    for name, w in wells.items():
        las = lasio.read(folder / f"{name}.las")
        unit = las.curves[0].unit.lower()
        assert w["depth_unit"].lower() == {"f": "ft"}.get(unit, unit)   # LAS practice: F = feet
        mnemonics = {c.mnemonic.upper() for c in las.curves}
        assert (w["roles"]["sw"] == "SW") == ("SW" in mnemonics)
        assert w["roles"]["porosity"] in mnemonics and w["roles"]["permeability"] in mnemonics
        assert "first of" in w["why"]["porosity"]          # says why it picked the curve
        if "EKB" in las.well:
            assert w["datum"].startswith(f"EKB = {float(las.well['EKB'].value):g}")
        else:
            assert w["datum"] is None
    assert wells["VANTREL-3"]["depth_unit"].lower() == "ft"
    assert Path(wells["VANTREL-5"]["survey"]).name == "VANTREL-5_survey.csv"
    assert {Path(p).name for p in rec["files"]["tops"]} == {"demo_tops.csv"}
    assert {Path(p).name for p in rec["files"]["pressures"]} == {"demo_pressures.csv"}
    assert len(rec["files"]["core"]) == 5      # four fitted core files and the Dean-Stark table
    assert rec["zones"] == ["Upper Sand", "Lower Sand"]     # from the tops file


def test_written_project_file_loads_and_runs_once_placeholders_are_filled(folder, capsys, tmp_path):
    rec = _start(capsys, folder)
    path = Path(rec["project_file"])
    text = path.read_text(encoding="utf-8")
    assert "FILL IN" in text and "fwl" in text
    with pytest.raises(Exception) as unfilled:            # placeholders are refused, by key
        load_project(path)
    assert "fwl" in str(unfilled.value) or "datum" in str(unfilled.value) \
        or "top" in str(unfilled.value)
    filled = path.with_name("filled.toml")
    filled.write_text(_fill(text), encoding="utf-8")
    project = load_project(filled)
    assert [z.name for z in project.zones] == ["Upper Sand", "Lower Sand"]
    assert project.zones[0].fwl == pytest.approx(2105.0)   # metres, as filled in
    assert project.zones[1].hydrocarbon_density == pytest.approx(220.0)  # 0.22 g/cm3 = 220 kg/m3
    assert len(project.wells) == 5 and project.tops_file.name == "demo_tops.csv"
    assert main(["run", str(filled), "--no-plots", "--quiet", "--out", str(tmp_path / "o")]) == 0
    # the run takes the datum the set-up reported from the header (EKB read here with lasio)
    run = json.loads((tmp_path / "o" / "run_summary.json").read_text(encoding="utf-8"))
    w1 = next(w for w in run["wells"] if w["name"] == "VANTREL-1")
    ekb = float(lasio.read(folder / "VANTREL-1.las").well["EKB"].value)
    assert w1["summary"]["datum"]["elevation"] == pytest.approx(ekb)
    assert w1["summary"]["datum"]["source"].startswith("EKB = ")   # which header item was used


def test_start_twice_never_overwrites_an_edited_project_file(folder, capsys):
    first = Path(_start(capsys, folder)["project_file"])
    edited = first.read_text(encoding="utf-8") + "# my edits\n"
    first.write_text(edited, encoding="utf-8")
    rec = _start(capsys, folder)
    assert rec["written_beside_existing_file"] is True
    assert Path(rec["project_file"]) != first and Path(rec["project_file"]).exists()
    assert first.read_text(encoding="utf-8") == edited
    third = _start(capsys, folder)
    assert len({first, Path(rec["project_file"]), Path(third["project_file"])}) == 3
    assert first.read_text(encoding="utf-8") == edited


def test_start_refuses_a_folder_without_las_files(tmp_path, capsys):
    assert main(["start", str(tmp_path)]) == 2
    err = capsys.readouterr().err
    assert "no readable LAS file" in err and str(tmp_path) in err


def test_names_from_inputs_are_written_as_valid_toml(tmp_path, capsys):
    """Quotes, backslashes and control characters in names survive the trip through TOML
    (parsed back with the standard library's tomllib, TOML 1.0)."""
    odd = 'we"ird\\name\x01\x7f\u2603'
    assert tomllib.loads(f"x = {toml_string(odd)}\n")["x"] == odd
    f = tmp_path / 'odd "folder" \\ name'
    f.mkdir()
    shutil.copy(DEMO / "VANTREL-1.las", f / "VANTREL-1.las")
    rec = _start(capsys, f)
    data = tomllib.loads(Path(rec["project_file"]).read_text(encoding="utf-8"))
    assert data["project"]["name"] == f.name
    assert data["wells"][0]["las"] == "VANTREL-1.las"


def test_start_leaves_out_result_files_and_names_wells_apart(folder, capsys, tmp_path):
    """A LAS file written by a run (it holds SW_SHM, HAFWL, SHM_FLAG) is not taken as a well;
    two files with the same well name get distinct names."""
    out = tmp_path / "o"
    assert main(["run", str(DEMO / "demo_project.toml"), "--no-plots", "--quiet",
                 "--out", str(out)]) == 0
    capsys.readouterr()
    shutil.copy(out / "VANTREL-1.las", folder / "VANTREL-1_results.las")
    shutil.copy(folder / "VANTREL-2.las", folder / "VANTREL-2b.las")
    rec = _start(capsys, folder)
    names = [w["name"] for w in rec["wells"]]
    assert "VANTREL-1_results" not in names and len(names) == 6
    assert len(set(names)) == 6 and "VANTREL-2b" in names
    assert any("VANTREL-1_results.las left out" in n for n in rec["notes"])
    data = tomllib.loads(Path(rec["project_file"]).read_text(encoding="utf-8"))
    assert [w.get("name") for w in data["wells"]].count("VANTREL-2b") == 1
